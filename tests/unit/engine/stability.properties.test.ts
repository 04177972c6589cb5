/**
 * Properties of the v2 stability model of design §2.3, over a few hundred seeded structures.
 * Tolerances: 1e-9 relative where the closed forms must be exact (double precision leaves
 * about 1e-15 per operation; 1e-9 keeps a wide margin without hiding a wrong formula).
 */
import { describe, expect, it } from 'vitest';
import {
  assessCoefficients,
  bodyCoefficients,
  caseAtGust,
  structureLimits,
  utilizationAtGust,
  compactGoverningCase,
  compactStability,
  governingCase,
  calculatedLimitGustMps,
  criteria,
  directionUtilizations,
  dynamicPressurePa,
  effectiveLimitMps,
  effectiveUtilization,
  governingPerPa,
  gustAtFractionMps,
  parts,
  requiredBallast,
  stabilityCoefficients,
  standardGravityMps2,
  utilizationAtPa,
  type ExpandedStructure,
} from '../../../server/engine/index.ts';
import { between, generatedStructure, seededRandom } from './generatedStructures.ts';

const structureCount = 300;
const exact = 1e-9;
const rho = 1.25;

/** The compact form's governing case is the full coefficients' (k, direction, part, criterion, edge). */
function expectSameCase(compact: ReturnType<typeof compactStability>, full: ReturnType<typeof stabilityCoefficients>, sector: Parameters<typeof governingCase>[1]): void {
  const a = governingCase(full, sector);
  const b = compactGoverningCase(compact, sector);
  expect(b.perPa).toBe(a.direction.utilizationPerPa.governing);
  expect(b.directionDeg).toBe(a.direction.directionDeg);
  expect(b.element).toBe(a.part.element);
  expect(b.criterion).toBe(a.direction.governing);
  expect(b.tippingEdge).toBe(a.direction.tippingEdge);
}

function expectRelativelyClose(actual: number, expected: number, tolerance = exact): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

function structures(options: Parameters<typeof generatedStructure>[1], seed: number): ExpandedStructure[] {
  const random = seededRandom(seed);
  return Array.from({ length: structureCount }, () => generatedStructure(random, options));
}

/** The first release's front/back formulas (uplift unfactored, subtracted from the resistance), computed here independently. */
function firstReleaseLimitMps(structure: ExpandedStructure): number {
  const g = standardGravityMps2;
  const d = structure.baseDepthM;
  const W = g * structure.masses.reduce((sum, m) => sum + m.massKg, 0);
  const B = structure.uplift ? structure.uplift.planAreaM2 * structure.uplift.liftCoefficient : 0;
  const mu = structure.frictionCoefficient;
  const { overturning: gOt, sliding: gSl, uplift: gUp } = structure.safetyFactors;
  let lowestQ = B > 0 ? W / (gUp * B) : Infinity;
  for (const side of ['front', 'back'] as const) {
    const A = structure.faces.reduce((sum, f) => sum + (side === 'front' ? f.cfFront : f.cfBack) * f.areaM2, 0);
    const C = structure.faces.reduce((sum, f) => sum + (side === 'front' ? f.cfFront : f.cfBack) * f.areaM2 * f.centroidHeightM, 0);
    const Mw = g * structure.masses.reduce((sum, m) => sum + m.massKg * (side === 'front' ? d - m.xM : m.xM), 0);
    if (gOt * C + (B * d) / 2 > 0) lowestQ = Math.min(lowestQ, Mw / (gOt * C + (B * d) / 2));
    if (gSl * A + mu * B > 0) lowestQ = Math.min(lowestQ, (mu * W) / (gSl * A + mu * B));
  }
  return Math.sqrt((2 * lowestQ) / rho);
}

describe('stability properties over seeded structures (design §2.3 v2)', () => {
  it('every utilization of every part, direction and criterion is k·v²: U(2v) = 4 U(v) exactly', () => {
    for (const structure of structures({ uplift: true, elements: true }, 11)) {
      for (const part of parts(stabilityCoefficients(structure))) {
        for (const direction of part.directions) {
          const at5 = directionUtilizations(direction, dynamicPressurePa(5, rho));
          const at10 = directionUtilizations(direction, dynamicPressurePa(10, rho));
          for (const criterion of criteria) {
            if (!Number.isFinite(at5[criterion])) continue;
            expectRelativelyClose(at10[criterion], 4 * at5[criterion]);
          }
        }
      }
    }
  });

  it('at the effective limit the effective utilization is 1, with and without a rating', () => {
    const random = seededRandom(12);
    for (const structure of structures({ uplift: true, elements: true }, 12)) {
      const rated = random() < 0.5 ? { ...structure, ratedGustMps: between(random, 5, 40) } : structure;
      const coefficients = stabilityCoefficients(rated);
      const limit = effectiveLimitMps(coefficients, rho);
      if (!Number.isFinite(limit) || limit === 0 || limit > 120) continue;
      expectRelativelyClose(effectiveUtilization(coefficients, limit, rho), 1);
    }
  });

  it('a fraction f of the effective capacity is reached at v_lim·√f (f = 0.6, 0.8)', () => {
    for (const structure of structures({ uplift: true, elements: true }, 13)) {
      const coefficients = stabilityCoefficients({ ...structure, ratedGustMps: 25 });
      for (const fraction of [0.6, 0.8]) {
        const gust = gustAtFractionMps(coefficients, fraction, rho);
        if (!Number.isFinite(gust) || gust === 0 || gust > 120) continue;
        expectRelativelyClose(gust, effectiveLimitMps(coefficients, rho) * Math.sqrt(fraction));
        expectRelativelyClose(effectiveUtilization(coefficients, gust, rho), fraction);
      }
    }
  });

  it('no direction is missed: the governing utilization is at least that of wind square onto the front and the back', () => {
    for (const structure of structures({ uplift: true }, 14)) {
      const coefficients = stabilityCoefficients(structure);
      const square = coefficients.body.directions.filter((d) => d.directionDeg === 0 || d.directionDeg === 180);
      expect(square).toHaveLength(2);
      for (const direction of square) expect(governingPerPa(coefficients)).toBeGreaterThanOrEqual(direction.utilizationPerPa.governing);
    }
  });

  it('no direction between those assessed is worse: faces at any angle, against a 0.25° sweep (to 0.1 %)', () => {
    // A review found faces at angles that are not multiples of 15° under-loaded by up to 10 % with
    // the 15° grid and face normals alone; ψ's corners, edge-on directions and the search between
    // them close that.
    const random = seededRandom(19);
    const sweep = Array.from({ length: 1440 }, (_, i) => i / 4);
    for (let n = 0; n < 120; n++) {
      const structure = generatedStructure(random, { uplift: true });
      structure.faces = structure.faces.map((face) => ({ ...face, facingDeg: between(random, 0, 359.99) }));
      const assessed = governingPerPa(stabilityCoefficients(structure));
      const swept = Math.max(...bodyCoefficients(structure, null, { exactDeg: sweep, refine: false }).directions.map((d) => d.utilizationPerPa.governing));
      expect(assessed).toBeGreaterThanOrEqual(swept * (1 - 1e-3));
    }
  });

  it('the limit is never above the first release’s front/back limit of the same strip record (its uplift was unfactored)', () => {
    for (const structure of structures({ uplift: true, rectangle: false }, 15)) {
      const v2 = calculatedLimitGustMps(stabilityCoefficients(structure), rho);
      const v1 = firstReleaseLimitMps(structure);
      expect(v2).toBeLessThanOrEqual(v1 * (1 + exact));
    }
  });

  it('the watch’s compact form gives the same governing k, direction and part as the full coefficients, over every sector', () => {
    const random = seededRandom(20);
    for (const structure of structures({ uplift: true, elements: true }, 20)) {
      const full = stabilityCoefficients(structure);
      const compact = compactStability(full);
      for (const sector of [null, { centreDeg: between(random, 0, 360), halfWidthDeg: between(random, 15, 90) }]) expectSameCase(compact, full, sector);
    }
  });

  it('the compact form’s case over every direction, kept per structure, stays right when sectors are asked for in between (sector, all, sector, all)', () => {
    const random = seededRandom(22);
    for (const structure of structures({ uplift: true, elements: true }, 22)) {
      const full = stabilityCoefficients(structure);
      const compact = compactStability(full);
      const sectors = [
        { centreDeg: between(random, 0, 360), halfWidthDeg: between(random, 15, 90) },
        null,
        { centreDeg: between(random, 0, 360), halfWidthDeg: between(random, 5, 40) },
        null,
        null,
      ];
      for (const sector of sectors) expectSameCase(compact, full, sector);
    }
  });

  it('the live assessment (engine/liveAssessment.ts) on the compact form gives the calculator’s utilization, limit and case (assessCoefficients), with and without a rating', () => {
    const random = seededRandom(21);
    for (const structure of structures({ uplift: true, elements: true }, 21)) {
      for (const ratedGustMps of [null, between(random, 8, 30)]) {
        const full = { ...stabilityCoefficients(structure), ratedGustMps };
        const compact = compactStability(full);
        const gustMps = between(random, 2, 40);
        const report = assessCoefficients(full, gustMps, rho);
        const live = caseAtGust(compact, gustMps, rho);
        const limits = structureLimits(compact, rho);
        // Effective utilization max(U, (v / v_rated)²) and the effective limit (design §2.3).
        const utilization = Number.isFinite(live.utilization) ? live.utilization : null;
        expect(utilization).toBe(report.effectiveUtilization);
        expect(utilizationAtGust(compact, gustMps, rho)).toBe(live.utilization);
        expect(Number.isFinite(limits.limitGustMps) ? limits.limitGustMps : null).toBe(report.limitGustMps);
        expect(Number.isFinite(limits.calculatedLimitGustMps) ? limits.calculatedLimitGustMps : null).toBe(report.calculatedLimitGustMps);
        expect(live.governing).toBe(report.governing);
        expect(live.directionDeg).toBe(report.governingDirectionDeg);
        expect(live.element).toBe(report.governingElement);
        expect(live.tippingEdge).toBe(report.governingEdge);
        // The full and the compact form give the same case.
        expect(caseAtGust(full, gustMps, rho)).toEqual(live);
      }
    }
  });

  it('the governing utilization is the worst of the body and its elements', () => {
    for (const structure of structures({ uplift: true, elements: true }, 16)) {
      const coefficients = stabilityCoefficients(structure);
      const worst = Math.max(...parts(coefficients).flatMap((part) => part.directions.map((d) => d.utilizationPerPa.governing)));
      expect(governingPerPa(coefficients)).toBe(worst);
    }
  });

  it('adding ballast anywhere on the base never lowers the limit', () => {
    const random = seededRandom(17);
    for (const structure of structures({ uplift: true }, 17)) {
      const before = calculatedLimitGustMps(stabilityCoefficients(structure), rho);
      const heavier = {
        ...structure,
        masses: [...structure.masses, { massKg: between(random, 10, 1000), xM: between(random, 0, structure.baseDepthM), yM: between(random, 0, structure.baseWidthM!) }],
      };
      expect(calculatedLimitGustMps(stabilityCoefficients(heavier), rho)).toBeGreaterThanOrEqual(before * (1 - exact));
    }
  });

  it('the required ballast brings the governing utilization to exactly 1, or is 0 when it is already ≤ 1', () => {
    const random = seededRandom(18);
    let checked = 0;
    for (const structure of structures({ uplift: true }, 18)) {
      const designGustMps = between(random, 8, 30);
      const point = { xM: between(random, 0.1, 0.9) * structure.baseDepthM, yM: between(random, 0.1, 0.9) * structure.baseWidthM! };
      const answer = requiredBallast(stabilityCoefficients(structure), designGustMps, rho, point);
      if (!answer.possible) continue;
      const withBallast = { ...structure, masses: [...structure.masses, { massKg: answer.massKg, ...point }] };
      const after = utilizationAtPa(governingPerPa(stabilityCoefficients(withBallast)), dynamicPressurePa(designGustMps, rho));
      if (answer.massKg === 0) expect(after).toBeLessThanOrEqual(1 + exact);
      else {
        expectRelativelyClose(after, 1, 1e-7);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(100);
  });
});
