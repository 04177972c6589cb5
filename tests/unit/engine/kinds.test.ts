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
  validateStructureRecord,
  type StructureRecord,
} from '../../../server/engine/index.ts';

const g = 9.80665;

/** Parses a record as the route would, so the examples are valid records. */
function record(input: unknown): StructureRecord {
  const result = validateStructureRecord(input);
  if (!result.ok) throw new Error(JSON.stringify(result.issues));
  return result.record;
}

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

describe('tent, hand-worked', () => {
  const tent = record({
    kind: 'tent', name: 'Catering marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 3.6,
    wallsClosed: true, legs: 8, ballastPerLegKg: 150, selfWeightKg: 900, surface: 'hard',
  });
  // q = ½ · 1.225 · 12² = 88.2 Pa. Broadside: wall 12 × 2.4 = 28.8 m² at 1.2 m, roof rise 12 × 1.2 = 14.4 m² at 3.0 m, c_f 1.8.
  // F = 1.8 · 43.2 · 88.2 = 6858.432 N; M_ot = 1.8 · (28.8·1.2 + 14.4·3.0) · 88.2 = 1.8 · 77.76 · 88.2 = 12345.1776 N·m.
  // Uplift 1.0 · 12 · 6 · 88.2 = 6350.4 N at the middle (3 m).
  // Masses: 900 kg at 3 m, 4 × 150 = 600 kg at 0 and at 6 m: W = 2100 g = 20593.965 N.
  // Front (tips about x = 6): M_w = g (900·3 + 600·6) = 6300 g = 61781.895 N·m; M_res = 61781.895 − 6350.4·3 = 42730.695 N·m.
  // U_ot = 1.5 · 12345.1776 / 42730.695 = 0.43336; U_sl = 2 · 6858.432 / (0.4 · (20593.965 − 6350.4)) = 2.40755;
  // U_up = 1.5 · 6350.4 / 20593.965 = 0.46254. Sliding governs.
  // Sliding limit: q = 0.4 · 20593.965 / (2 · 77.76 + 0.4 · 72) = 44.6918 Pa → v = √(2 · 44.6918 / 1.225) = 8.5420 m/s.
  const result = assessStructure(tent, { gustMps: 12 });

  it('expands to a side wall, a roof elevation, roof uplift and two rows of leg ballast on a 6 m base', () => {
    const { structure, referenceHeightM } = expandStructure(tent);
    expect(structure.baseDepthM).toBe(6);
    expect(structure.faces.map((face) => [face.areaM2, face.centroidHeightM])).toEqual([[expect.closeTo(28.8, 12), 1.2], [expect.closeTo(14.4, 12), expect.closeTo(3.0, 12)]]);
    expect(structure.uplift).toEqual({ planAreaM2: 72, liftCoefficient: 1 });
    expect(structure.masses.map((mass) => [mass.massKg, mass.xM])).toEqual([[900, 3], [600, 0], [600, 6]]);
    expect(referenceHeightM).toBe(3.6);
  });

  it('gives the hand-worked loads, utilizations and limit', () => {
    expect(result.qPa).toBeCloseTo(88.2, 10);
    expect(result.horizontalForceN).toBeCloseTo(6858.432, 6);
    expect(result.overturningMomentNm).toBeCloseTo(12345.1776, 6);
    expect(result.upliftN).toBeCloseTo(6350.4, 6);
    expect(result.restoringMomentNm).toBeCloseTo(42730.695, 6);
    expect(result.utilization.overturning).toBeCloseTo(0.43336, 5);
    expect(result.utilization.sliding).toBeCloseTo(2.40755, 5);
    expect(result.utilization.uplift).toBeCloseTo(0.46254, 5);
    expect(result.governing).toBe('sliding');
    expect(result.margin).toBeCloseTo(1 - 2.40755, 5);
    expect(result.calculatedLimitGustMps).toBeCloseTo(8.542, 3);
  });

  it('with its walls open only the roof rise is loaded', () => {
    const open = expandStructure(record({ ...tent, wallsClosed: false })).structure;
    expect(open.faces[0]!.cfFront).toBe(0);
    expect(open.faces[1]!.cfFront).toBe(1.8);
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

describe('screen, the references §9 worked case', () => {
  const screen = record({
    kind: 'screen', name: 'Main stage LED', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2,
    towerMassKg: 400, screenMassKg: 600, outriggerDepthM: 5, ballastPerTowerKg: 1500, surface: 'hard',
  });
  // 6 m × 4 m raised 3 m (z_g > h/4 → c_f 1.8, EN §7.4.3), 20 m/s, ρ 1.225: q 245 Pa, F = 1.8 · 24 · 245 = 10 584 N,
  // M = 10 584 · (3 + 2) = 52 920 N·m; torsion from e = 0.25 · 6 = 1.5 m: 15 876 N·m (references §9).
  // Masses ours: screen 600 + towers 800 kg at 2.5 m, 1500 kg at 0 and at 5 m: W = 4400 g = 43149.26 N,
  // M_w = g (1400 · 2.5 + 1500 · 5) = 11000 g = 107873.15 N·m.
  // U_ot = 1.5 · 52920 / 107873.15 = 0.735864; U_sl = 2 · 10584 / (0.4 · 43149.26) = 1.226440.
  // Sliding limit q = 0.4 · 43149.26 / (2 · 43.2) = 199.7651 Pa → 18.0595 m/s.
  const result = assessStructure(screen, { gustMps: 20, airDensityKgM3: 1.225 });

  it('gives q 245 Pa, F 10 584 N and M 52.92 kN·m (references §9)', () => {
    expect(result.qPa).toBeCloseTo(245, 10);
    expect(result.horizontalForceN).toBeCloseTo(10_584, 8);
    expect(result.overturningMomentNm).toBeCloseTo(52_920, 7);
    // The eccentricity of EN §7.4.3 gives the torsion on the supports (not assessed, stated in the notes).
    expect(result.horizontalForceN * 0.25 * 6).toBeCloseTo(15_876, 6);
    expect(result.notes.join(' ')).toMatch(/±0\.25·b = 1\.50 m/);
  });

  it('gives the hand-worked utilizations and limit', () => {
    expect(result.utilization.overturning).toBeCloseTo(0.735864, 6);
    expect(result.utilization.sliding).toBeCloseTo(1.22644, 5);
    expect(result.governing).toBe('sliding');
    expect(result.calculatedLimitGustMps).toBeCloseTo(18.0595, 4);
  });
});

describe('shell, hand-worked', () => {
  const shell = record({ kind: 'shell', name: 'Band shell', radiusM: 4, selfWeightKg: 1200, frontBallastKg: 1000, backBallastKg: 600 });
  // Half disc πR²/2 = 25.13274 m², centroid 4R/(3π) = 1.697653 m. q = ½ · 1.225 · 15² = 137.8125 Pa.
  // Front (into the open, concave side, c_f 1.42): F = 1.42 · 25.13274 · 137.8125 = 4918.320 N, M = 8349.600 N·m.
  // Masses 1200 kg at 2 m, 1000 at 0, 600 at 4 (base 4 m): W = 2800 g = 27458.62 N.
  // Front lever d − x: M_w = g (1200·2 + 1000·4) = 6400 g = 62762.56 N·m → U_ot = 1.5 · 8349.6 / 62762.56 = 0.199552.
  // U_sl = 2 · 4918.320 / (0.3 · 27458.62) = 1.194117 (grass). Back (convex, 0.38): U_sl = 0.319552.
  // Front sliding limit: q = 0.3 · 27458.62 / (2 · 35.688493) = 115.4096 Pa → 13.7268 m/s.
  const result = assessStructure(shell, { gustMps: 15 });

  it('puts the open, concave side to the front: 1.42 front, 0.38 back (Munson fig. 9.20)', () => {
    const face = expandStructure(shell).structure.faces[0]!;
    expect([face.cfFront, face.cfBack]).toEqual([1.42, 0.38]);
    expect(face.areaM2).toBeCloseTo(25.13274, 5);
    expect(face.centroidHeightM).toBeCloseTo(1.697653, 6);
  });

  it('gives the hand-worked loads, utilizations and limit, the front governing', () => {
    expect(result.side).toBe('front');
    expect(result.horizontalForceN).toBeCloseTo(4918.32, 2);
    expect(result.overturningMomentNm).toBeCloseTo(8349.6, 6);
    expect(result.utilization.overturning).toBeCloseTo(0.199552, 6);
    expect(result.utilization.sliding).toBeCloseTo(1.194117, 6);
    expect(result.sides.back.utilization.sliding).toBeCloseTo(0.319552, 6);
    expect(result.calculatedLimitGustMps).toBeCloseTo(13.7268, 4);
  });

  it('closed, it takes the solid hemisphere values about 1.17 and 0.42 (common practice)', () => {
    // A closed pod of our own: R 1.5 m, 350 kg at 0.75 m on its 1.5 m base, hard ground, 18 m/s.
    // q = ½ · 1.225 · 18² = 198.45 Pa; half disc 3.534292 m²; F = 1.17 · 3.534292 · 198.45 = 820.615 N;
    // U_sl = 2 · 820.615 / (0.4 · 350 g) = 1641.230 / 1372.931 = 1.195420. Back: F = 0.42 · 3.534292 · 198.45 = 294.580 N.
    const pod = assessStructure(record({ kind: 'shell', name: 'Closed pod', radiusM: 1.5, form: 'closed', selfWeightKg: 350, surface: 'hard' }), { gustMps: 18 });
    expect(pod.sides.front.horizontalForceN).toBeCloseTo(820.615, 3);
    expect(pod.sides.back.horizontalForceN).toBeCloseTo(294.58, 3);
    expect(pod.utilization.sliding).toBeCloseTo(1.19542, 5);
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
  // ρ 1.25, 14 m/s: q = 122.5 Pa. Front: A = 1.3·8 + 1.8·2 = 14 m², C = 1.3·8·2 + 1.8·2·4.2 = 35.92 m³.
  // F = 1715 N, M_ot = 4400.2 N·m, F_up = 0.6 · 9 · 122.5 = 661.5 N. W = 1700 g = 16671.305 N.
  // Front lever d − x: M_w = g (500·2 + 1200·0.5) = 1600 g = 15690.64 N·m; M_res = 15690.64 − 661.5·1.5 = 14698.39 N·m.
  // U_ot = 1.5 · 4400.2 / 14698.39 = 0.449049; U_sl = 2 · 1715 / (0.5 · (16671.305 − 661.5)) = 0.428487;
  // U_up = 1.5 · 661.5 / 16671.305 = 0.059518. Back: A = 12.4, C = 32.72, M_w = 3500 g: U_ot 0.180381, U_sl 0.379517.
  // Limit (front overturning): q = 15690.64 / (1.5 · 35.92 + 5.4 · 1.5) = 15690.64 / 61.98 = 253.1565 Pa → 20.1259 m/s;
  // rated 18 m/s is lower, so the effective limit is 18 m/s.
  const result = assessStructure(custom, { gustMps: 14, airDensityKgM3: 1.25 });

  it('gives the hand-worked loads and utilizations, the front governing in overturning', () => {
    expect(result.side).toBe('front');
    expect(result.horizontalForceN).toBeCloseTo(1715, 9);
    expect(result.overturningMomentNm).toBeCloseTo(4400.2, 9);
    expect(result.upliftN).toBeCloseTo(661.5, 9);
    expect(result.restoringMomentNm).toBeCloseTo(14698.39, 6);
    expect(result.utilization).toEqual({
      overturning: expect.closeTo(0.449049, 6),
      sliding: expect.closeTo(0.428487, 6),
      uplift: expect.closeTo(0.059518, 6),
      governing: expect.closeTo(0.449049, 6),
    });
    expect(result.sides.back.utilization.overturning).toBeCloseTo(0.180381, 6);
    expect(result.sides.back.utilization.sliding).toBeCloseTo(0.379517, 6);
  });

  it('limits at the rated gust when that is lower than the calculated limit', () => {
    expect(result.calculatedLimitGustMps).toBeCloseTo(20.1259, 4);
    expect(result.calculatedLimit).toEqual({ side: 'front', criterion: 'overturning' });
    expect(result.limitGustMps).toBe(18);
    expect(result.limitGovernedBy).toBe('rated');
  });

  it('defaults its reference height to twice the highest centroid and lists the given coefficients with their source', () => {
    expect(result.expanded.referenceHeightM).toBeCloseTo(8.4, 12);
    expect(result.expanded.totalMassKg).toBe(1700);
    expect(result.sources.find((note) => note.item.startsWith('c_f wall'))?.source).toMatch(/designer/);
  });

  it('a mass weighs g = 9.80665 m/s² per kg (standard gravity)', () => {
    expect(result.sides.front.restoringMomentNm + 661.5 * 1.5).toBeCloseTo(1600 * g, 9);
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
