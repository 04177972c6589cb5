/**
 * Properties of the stability model of design §2.3, over a few hundred seeded structures.
 * Tolerances: 1e-9 relative where the closed forms must be exact (double precision leaves
 * about 1e-15 per operation; 1e-9 keeps a wide margin without hiding a wrong formula).
 */
import { describe, expect, it } from 'vitest';
import {
  calculatedLimitGust,
  criteria,
  dynamicPressurePa,
  gustForUtilizationMps,
  requiredBallastKg,
  sideStability,
  stabilityAtPressure,
  stabilityCoefficients,
  type ExpandedStructure,
} from '../../../server/engine/index.ts';
import { between, generatedStructure, seededRandom } from './generatedStructures.ts';

const structureCount = 300;
const exact = 1e-9;

/** Governing utilization (worse side) at a gust, without the 120 m/s argument check. */
function governingUtilization(structure: ExpandedStructure, gustMps: number, airDensityKgM3: number): number {
  const result = stabilityAtPressure(stabilityCoefficients(structure), dynamicPressurePa(gustMps, airDensityKgM3));
  return Math.max(result.front.utilization.governing, result.back.utilization.governing);
}

function expectRelativelyClose(actual: number, expected: number, tolerance = exact): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

describe('stability properties over seeded structures (design §2.3)', () => {
  it('without uplift every utilization grows as v²: U(2v) = 4 U(v)', () => {
    const random = seededRandom(1);
    for (let index = 0; index < structureCount; index++) {
      const coefficients = stabilityCoefficients(generatedStructure(random, { uplift: false }));
      const qPa = dynamicPressurePa(between(random, 2, 30), 1.225);
      for (const side of ['front', 'back'] as const) {
        const at = sideStability(coefficients, side, qPa);
        const atDouble = sideStability(coefficients, side, 4 * qPa);
        for (const criterion of criteria) expectRelativelyClose(atDouble.utilization[criterion], 4 * at.utilization[criterion]);
      }
    }
  });

  it('with uplift overturning and sliding grow faster than v² (the resistance falls with v² too)', () => {
    const random = seededRandom(2);
    for (let index = 0; index < structureCount; index++) {
      const coefficients = stabilityCoefficients(generatedStructure(random, { uplift: true }));
      const qPa = dynamicPressurePa(between(random, 2, 15), 1.225);
      for (const side of ['front', 'back'] as const) {
        const at = sideStability(coefficients, side, qPa).utilization;
        const atDouble = sideStability(coefficients, side, 4 * qPa).utilization;
        // Where the resistance is already gone at v (Infinity) there is nothing to compare.
        if (Number.isFinite(at.overturning)) expect(atDouble.overturning).toBeGreaterThan(4 * at.overturning);
        if (Number.isFinite(at.sliding)) expect(atDouble.sliding).toBeGreaterThan(4 * at.sliding);
        // The uplift criterion itself is linear in q; the governing one never grows slower than v².
        expectRelativelyClose(atDouble.uplift, 4 * at.uplift);
        expect(atDouble.governing).toBeGreaterThanOrEqual(4 * at.governing * (1 - exact));
      }
    }
  });

  it('at the limit gust the governing utilization is 1 (to 1e-9), with and without uplift', () => {
    const random = seededRandom(3);
    for (let index = 0; index < structureCount; index++) {
      const structure = generatedStructure(random, { uplift: index % 2 === 0 });
      const airDensityKgM3 = between(random, 1.0, 1.4);
      const limit = calculatedLimitGust(structure, airDensityKgM3);
      expectRelativelyClose(governingUtilization(structure, limit.gustMps, airDensityKgM3), 1);
      expect(governingUtilization(structure, limit.gustMps * 0.999, airDensityKgM3)).toBeLessThan(1);
    }
  });

  it('a symmetric structure (cfFront = cfBack, masses mirrored) gives the same result from both sides', () => {
    const random = seededRandom(4);
    for (let index = 0; index < structureCount; index++) {
      const coefficients = stabilityCoefficients(generatedStructure(random, { uplift: index % 2 === 0, symmetric: true }));
      const qPa = dynamicPressurePa(between(random, 5, 40), 1.225);
      const front = sideStability(coefficients, 'front', qPa);
      const back = sideStability(coefficients, 'back', qPa);
      expectRelativelyClose(back.restoringMomentNm, front.restoringMomentNm);
      expectRelativelyClose(back.overturningMomentNm, front.overturningMomentNm);
      for (const criterion of criteria) {
        if (Number.isFinite(front.utilization[criterion])) expectRelativelyClose(back.utilization[criterion], front.utilization[criterion]);
        else expect(back.utilization[criterion]).toBe(Infinity);
      }
    }
  });

  it('adding ballast anywhere on the base never lowers the limit', () => {
    const random = seededRandom(5);
    for (let index = 0; index < structureCount; index++) {
      const structure = generatedStructure(random, { uplift: index % 2 === 0 });
      const before = calculatedLimitGust(structure, 1.225).gustMps;
      const ballasted = {
        ...structure,
        masses: [...structure.masses, { massKg: between(random, 1, 2000), xM: between(random, 0, structure.baseDepthM) }],
      };
      expect(calculatedLimitGust(ballasted, 1.225).gustMps).toBeGreaterThanOrEqual(before * (1 - exact));
    }
  });

  it('the required ballast brings the governing utilization to exactly 1 (to 1e-9), or is 0 when it is already ≤ 1', () => {
    const random = seededRandom(6);
    let helped = 0;
    for (let index = 0; index < structureCount; index++) {
      const structure = generatedStructure(random, { uplift: index % 2 === 0 });
      // Around the limit, so the answers stay within the engine's mass range (≤ 1 000 t).
      const limitMps = calculatedLimitGust(structure, 1.225).gustMps;
      const designGustMps = Math.min(120, limitMps * between(random, 0.5, 1.6));
      const xM = between(random, 0.05, 0.95) * structure.baseDepthM;
      const extraKg = requiredBallastKg(structure, designGustMps, 1.225, xM);
      if (governingUtilization(structure, designGustMps, 1.225) <= 1) {
        expect(extraKg).toBe(0);
        continue;
      }
      helped++;
      const ballasted = { ...structure, masses: [...structure.masses, { label: 'added', massKg: extraKg, xM }] };
      expectRelativelyClose(governingUtilization(ballasted, designGustMps, 1.225), 1);
    }
    expect(helped).toBeGreaterThan(structureCount / 4);
  });

  it('gustForUtilizationMps(f) gives governing utilization f (to 1e-9)', () => {
    const random = seededRandom(7);
    for (let index = 0; index < structureCount; index++) {
      const structure = generatedStructure(random, { uplift: index % 2 === 0 });
      const fraction = between(random, 0.2, 1.5);
      const gustMps = gustForUtilizationMps(structure, fraction, 1.225);
      expectRelativelyClose(governingUtilization(structure, gustMps, 1.225), fraction);
    }
  });

  it('without uplift gustForUtilizationMps(f) is limit·√f; with uplift it is above that shortcut for f < 1', () => {
    const random = seededRandom(8);
    for (let index = 0; index < structureCount; index++) {
      const withUplift = index % 2 === 0;
      const structure = generatedStructure(random, { uplift: withUplift });
      const fraction = between(random, 0.3, 0.95);
      const limitMps = calculatedLimitGust(structure, 1.225).gustMps;
      const gustMps = gustForUtilizationMps(structure, fraction, 1.225);
      if (withUplift) expect(gustMps).toBeGreaterThanOrEqual(limitMps * Math.sqrt(fraction) * (1 - exact));
      else expectRelativelyClose(gustMps, limitMps * Math.sqrt(fraction));
    }
  });
});
