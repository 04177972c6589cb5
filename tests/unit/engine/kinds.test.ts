/**
 * Each kind expanded and assessed: a hand-worked example per kind (numbers of our own invention,
 * worked in the comments), and the default coefficients with their sources.
 */
import { describe, expect, it } from 'vitest';
import {
  assessStructure,
  defaultCoefficients,
  expandStructure,
  frictionBySurface,
} from '../../../server/engine/index.ts';
import { record } from './kindTestSupport.ts';

const g = 9.80665;

describe('default coefficients carry their sources', () => {
  it('hollow hemisphere 1.42 concave / 0.38 convex (Munson fig. 9.20)', () => {
    expect(defaultCoefficients.hollowHemisphereConcave).toEqual({ value: 1.42, source: expect.stringMatching(/Munson.*9\.20.*concave/) });
    expect(defaultCoefficients.hollowHemisphereConvex).toEqual({ value: 0.38, source: expect.stringMatching(/Munson.*9\.20.*convex/) });
  });

  it('solid hemisphere about 1.17 flat face and 0.42 curved face to the wind (common practice; Munson fig. 9.20)', () => {
    expect(defaultCoefficients.solidHemisphereFlat).toEqual({ value: 1.17, source: expect.stringMatching(/common practice/) });
    expect(defaultCoefficients.solidHemisphereCurved).toEqual({ value: 0.42, source: expect.stringMatching(/common practice/) });
  });

  it('signboard 1.80 (EN 1991-1-4 §7.4.3); tent roof lift marked common practice', () => {
    expect(defaultCoefficients.signboard).toEqual({ value: 1.8, source: expect.stringMatching(/EN 1991-1-4 §7\.4\.3/) });
    expect(defaultCoefficients.tentRoofLift.source).toMatch(/^common practice/);
  });

  it('friction defaults grass 0.3 (from memory) and hard 0.4 (HSE RR071)', () => {
    expect(frictionBySurface.grass).toEqual({ value: 0.3, source: expect.stringMatching(/from memory/) });
    expect(frictionBySurface.hard).toEqual({ value: 0.4, source: expect.stringMatching(/RR071/) });
  });
});

describe('banner, hand-worked', () => {
  const banner = record({
    kind: 'banner', name: 'Mesh fence at gate B', widthM: 10, heightM: 2, clearanceM: 0.1, solidity: 0.7,
    feet: 6, ballastPerFootKg: 25, footDepthM: 0.8, selfWeightKg: 60,
  });
  // On the ground (z_g 0.1 < h/4 = 0.5) and b/h = 5 > 1: boundary wall, EN Table 7.9 row l/h 5 over half the length (2.5h):
  // A 0.3 × 2.9 + B 1.7 × 1.8 + C 0.5 × 1.4 = 0.87 + 3.06 + 0.70 = 4.63 → mean 1.852 (> 1.80).
  // Mesh φ 0.7: k = 1 − 0.3^1.5 = 0.835683 → c_f = 1.547685 on the gross area 20 m².
  // q = ½ · 1.225 · 6² = 22.05 Pa; F = 1.547685 · 20 · 22.05 = 682.529 N at 1.1 m → M_ot = 750.782 N·m.
  // 210 kg at 0.4 m on a 0.8 m base: W = 2059.3965 N, M_w = 823.7586 N·m either way.
  // U_ot = 1.5 · 750.782 / 823.7586 = 1.36712; U_sl = 2 · 682.529 / (0.3 · 2059.3965) = 2.20948 (grass μ 0.3).
  // Sliding limit: q = 0.3 · 2059.3965 / (2 · 30.95371) = 9.97972 Pa → 4.0365 m/s.
  const result = assessStructure(banner, { gustMps: 6 });

  it('applies the solidity once, in the coefficient, on the gross area', () => {
    const face = expandStructure(banner).structure.faces[0]!;
    expect(face.areaM2).toBe(20);
    expect(face.cfFront).toBeCloseTo(1.547685, 6);
  });

  it('gives the hand-worked loads, utilizations and limit', () => {
    expect(result.horizontalForceN).toBeCloseTo(682.529, 3);
    expect(result.overturningMomentNm).toBeCloseTo(750.782, 3);
    expect(result.utilization.overturning).toBeCloseTo(1.36712, 5);
    expect(result.utilization.sliding).toBeCloseTo(2.20948, 5);
    expect(result.calculatedLimitGustMps).toBeCloseTo(4.0365, 4);
    expect(result.sources[0]!.source).toMatch(/Table 7\.9.*ASCE 7-16/);
  });
});

describe('custom, hand-worked', () => {
  const custom = record({
    kind: 'custom', name: 'Stage wing wall', baseDepthM: 3, frictionCoefficient: 0.5,
    faces: [
      { label: 'wall', areaM2: 8, centroidHeightM: 2, cfFront: 1.3, cfBack: 1.1 },
      { label: 'header', areaM2: 2, centroidHeightM: 4.2, cfFront: 1.8, cfBack: 1.8 },
    ],
    uplift: { planAreaM2: 9, liftCoefficient: 0.6 },
    masses: [{ label: 'frame', massKg: 500, xM: 1 }, { label: 'ballast', massKg: 1200, xM: 2.5 }],
    ratedGustMps: 18,
    coefficientSource: 'designer’s calculation note (invented for this test)',
  });
  // A strip record (no baseWidthM): front and back edges only; uplift at the middle of the base, factored
  // with the wind (design §2.3 v2). ρ 1.25, 14 m/s: q = 122.5 Pa.
  // Wind onto the front (θ = 0; the same from 0 to 60°, ψ = 1): A = 1.3·8 + 1.8·2 = 14 m², C = 1.3·8·2 + 1.8·2·4.2 = 35.92 m³;
  // F = 1715 N, M_h = 4400.2 N·m, F_up = 0.6 · 9 · 122.5 = 661.5 N, its moment about the back edge 661.5 · 1.5 = 992.25 N·m.
  // W = 1700 g = 16671.305 N; about the back edge M_w = g (500·2 + 1200·0.5) = 1600 g = 15690.64 N·m.
  // U_ot = 1.5 (4400.2 + 992.25) / 15690.64 = 0.515510; U_sl = 2 (1715 + 0.5 · 661.5) / (0.5 · 16671.305) = 0.490843;
  // U_up = 1.5 · 661.5 / 16671.305 = 0.059518.
  // Wind onto the back (θ = 180): A = 12.4, C = 32.72, about the front edge M_w = 3500 g:
  // U_ot = 1.5 (32.72 · 122.5 + 992.25) / 34323.275 = 0.218530; U_sl = 2 (12.4 · 122.5 + 330.75) / 8335.6525 = 0.443816.
  // Limit: k_ot = 0.515510 / 122.5 per Pa → q = 237.633 Pa → 19.4989 m/s; the rated 18 m/s is lower.
  const result = assessStructure(custom, { gustMps: 14, airDensityKgM3: 1.25 });
  const at = (deg: number) => result.directions.find((d) => d.directionDeg === deg)!;

  it('gives the hand-worked loads and utilizations, wind onto the front governing in overturning', () => {
    expect(result.governingDirectionDeg).toBe(0);
    expect(result.governingEdge).toBe('back');
    expect(result.horizontalForceN).toBeCloseTo(1715, 9);
    expect(result.overturningMomentNm).toBeCloseTo(4400.2 + 992.25, 9);
    expect(result.upliftN).toBeCloseTo(661.5, 9);
    expect(result.restoringMomentNm).toBeCloseTo(15690.64, 6);
    expect(result.utilization).toEqual({
      overturning: expect.closeTo(0.51551, 5),
      sliding: expect.closeTo(0.490843, 6),
      uplift: expect.closeTo(0.059518, 6),
      governing: expect.closeTo(0.51551, 5),
    });
    expect(at(180).utilization.overturning).toBeCloseTo(0.21853, 5);
    expect(at(180).utilization.sliding).toBeCloseTo(0.443816, 6);
    expect(result.warnings.join(' ')).toMatch(/strip/);
  });

  it('limits at the rated gust when that is lower than the calculated limit', () => {
    expect(result.calculatedLimitGustMps).toBeCloseTo(19.4989, 4);
    expect(result.limitGustMps).toBe(18);
    expect(result.limitGovernedBy).toBe('rated');
    // (14 / 18)² = 0.604938 is above the calculated 0.51551: the rating governs the margin too.
    expect(result.effectiveUtilization).toBeCloseTo((14 / 18) ** 2, 12);
  });

  it('defaults its reference height to twice the highest centroid and lists the given coefficients with their source', () => {
    expect(result.expanded.referenceHeightM).toBeCloseTo(8.4, 12);
    expect(result.expanded.totalMassKg).toBe(1700);
    expect(result.sources.find((note) => note.item.startsWith('c_f wall'))?.source).toMatch(/designer/);
  });

  it('a mass weighs g = 9.80665 m/s² per kg (standard gravity)', () => {
    expect(result.restoringMomentNm).toBeCloseTo(1600 * g, 9);
  });
});

describe('overriding a default coefficient', () => {
  it('uses the override and names the stated source', () => {
    const screen = record({
      kind: 'screen', name: 'Mesh LED', widthM: 8, heightM: 4.5, bottomHeightM: 2, supportTowers: 2, towerMassKg: 300,
      screenMassKg: 900, outriggerDepthM: 4, ballastPerTowerKg: 1000,
      coefficients: { cf: 1.2 }, coefficientSource: 'manufacturer’s wind tunnel sheet, rev. C',
    });
    const { structure, sources } = expandStructure(screen);
    expect(structure.faces[0]!.cfFront).toBe(1.2);
    expect(sources[0]!.source).toBe('given in the record: manufacturer’s wind tunnel sheet, rev. C');
  });
});
