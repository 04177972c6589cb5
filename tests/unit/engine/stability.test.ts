/**
 * The v2 stability model (design §2.3): every direction, every base edge, uplift factored with
 * the wind. Hand-worked cases of our own, worked out in the comments; g = 9.80665 m/s².
 */
import { describe, expect, it } from 'vitest';
import {
  assessCoefficients,
  calculatedLimitGustMps,
  defaultSafetyFactors,
  directionUtilizations,
  dynamicPressurePa,
  effectiveLimitGustMps,
  effectiveUtilization,
  governingCase,
  gustForUtilizationMps,
  requiredBallast,
  safetyFactorSources,
  stabilityCoefficients,
  type DirectionCoefficients,
  type ExpandedStructure,
} from '../../../server/engine/index.ts';

/** A board 4 m² (2 m wide × 2 m high) at 1.5 m on a 1 m deep × 2 m wide base with 200 kg at the middle. */
const board: ExpandedStructure = {
  baseDepthM: 1,
  baseWidthM: 2,
  frictionCoefficient: 0.5,
  faces: [{ areaM2: 4, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8 }],
  masses: [{ massKg: 200, xM: 0.5 }],
  safetyFactors: { ...defaultSafetyFactors },
};

function direction(structure: ExpandedStructure, deg: number): DirectionCoefficients {
  const found = stabilityCoefficients(structure).body.directions.find((d) => Math.abs(d.directionDeg - deg) < 1e-9);
  if (!found) throw new Error(`direction ${deg} not assessed`);
  return found;
}

function utilizationAt(structure: ExpandedStructure, deg: number, gustMps: number, rho = 1.225) {
  return directionUtilizations(direction(structure, deg), dynamicPressurePa(gustMps, rho));
}

/** `board` with its mass scaled so that its calculated limit is exactly `limitMps` (no uplift: limit ∝ √mass). */
function boardWithLimit(limitMps: number): ExpandedStructure {
  const scale = (limitMps / calculatedLimitGustMps(stabilityCoefficients(board), 1.225)) ** 2;
  return { ...board, masses: [{ massKg: 200 * scale, xM: 0.5 }] };
}

describe('dynamic pressure and defaults', () => {
  it('is 245 Pa at 20 m/s in ISA sea-level air, 1.225 kg/m³ (ISO 2533 density)', () => {
    expect(dynamicPressurePa(20, 1.225)).toBeCloseTo(245, 10);
  });

  it('safety factors default to 1.5 on overturning and uplift (common practice) and 2.0 on sliding (HSE RR071)', () => {
    expect(defaultSafetyFactors).toEqual({ overturning: 1.5, sliding: 2.0, uplift: 1.5 });
    expect(safetyFactorSources.sliding).toMatch(/RR071/);
    expect(safetyFactorSources.overturning).toMatch(/common practice/);
  });
});

describe('worked example: the board front-on at 15 m/s', () => {
  // q = ½ · 1.225 · 15² = 137.8125 Pa; F = 1.8 · 4 · 137.8125 = 992.25 N; M_h = 1.5 m · F = 1488.375 N·m.
  // W = 200 g = 1961.33 N; lever to the back edge 0.5 m → M_w = 980.665 N·m.
  // U_ot = 1.5 · 1488.375 / 980.665 = 2.27658; U_sl = 2.0 · 992.25 / (0.5 · 1961.33) = 2.02360.
  // Limit: overturning k = 1.5 · 10.8 / 980.665 per Pa → q = 60.5349 Pa → 9.9415 m/s.
  it('gives the hand-worked loads, utilizations and limit, tipping about the back edge', () => {
    const coefficients = stabilityCoefficients(board);
    const report = assessCoefficients(coefficients, 15, 1.225);
    expect(report.horizontalForceN).toBeCloseTo(992.25, 9);
    expect(report.overturningMomentNm).toBeCloseTo(1488.375, 9);
    expect(report.restoringMomentNm).toBeCloseTo(980.665, 9);
    expect(report.utilization.overturning).toBeCloseTo(2.27658, 5);
    expect(report.utilization.sliding).toBeCloseTo(2.0236, 4);
    expect(report.governing).toBe('overturning');
    expect(report.calculatedLimitGustMps).toBeCloseTo(9.9415, 4);
    expect(['back', 'front']).toContain(report.governingEdge);
  });
});

describe('oblique and end-on wind (issue 11 item 1: no cosine reduction)', () => {
  // A flat board keeps its full normal force within 60° of its normal (design §2.3, ψ = min(1, 2 cos δ)).
  // The first release multiplied the load by cos² Δ: at 45° it reported half the load.
  it('at 45° the board carries the full front-on load: U_ot = 2.27658, not the cos² rule’s 1.13829', () => {
    const at45 = utilizationAt(board, 45, 15);
    expect(at45.overturning).toBeCloseTo(2.27658, 5);
    expect(at45.overturning).toBeGreaterThan(2.27658 * Math.cos(Math.PI / 4) ** 2 * 1.9);
  });

  it('at 75° ψ = 2 cos 75° = 0.51764, so U_ot = 2.27658 · 0.51764 = 1.17845; edge-on (90°) nothing', () => {
    expect(utilizationAt(board, 75, 15).overturning).toBeCloseTo(2.27658 * 2 * Math.cos((75 * Math.PI) / 180), 5);
    expect(utilizationAt(board, 90, 15).governing).toBe(0);
  });

  // A closed box 2 m wide (y) × 1 m deep (x) × 2 m high: front and back faces 2 × 2 = 4 m² facing 0 and
  // 180, end faces 1 × 2 = 2 m² facing 90 and 270, each cf 1.0 on its outer side only (0 inside), all
  // centroids at 1 m; 100 kg at the centre (x 0.5, y 1). Wind onto the y = 2 end (θ = 90): only the
  // 90° face is within 90° of the wind on its outer side. F = 1.0 · q · 2 toward −y, tipping about the
  // y = 0 edge: M_h = 1 m · 2q; lever of the mass 1 m → M_w = 100 g · 1 = 980.665 N·m.
  // At 10 m/s, q = 61.25 Pa: M_h = 122.5 N·m, U_ot = 1.5 · 122.5 / 980.665 = 0.187373;
  // U_sl = 2 · 122.5 / (0.4 · 980.665) = 0.624576.
  const box: ExpandedStructure = {
    baseDepthM: 1,
    baseWidthM: 2,
    frictionCoefficient: 0.4,
    faces: [
      { label: 'front', areaM2: 4, centroidHeightM: 1, cfFront: 1, cfBack: 0, facingDeg: 0 },
      { label: 'back', areaM2: 4, centroidHeightM: 1, cfFront: 1, cfBack: 0, facingDeg: 180 },
      { label: 'end at y = 2', areaM2: 2, centroidHeightM: 1, cfFront: 1, cfBack: 0, facingDeg: 90 },
      { label: 'end at y = 0', areaM2: 2, centroidHeightM: 1, cfFront: 1, cfBack: 0, facingDeg: 270 },
    ],
    masses: [{ massKg: 100, xM: 0.5, yM: 1 }],
    safetyFactors: { ...defaultSafetyFactors },
  };

  it('wind onto an end loads the end face and tips the box about the far end edge: the hand-worked 0.187373 and 0.624576', () => {
    const end = direction(box, 90);
    expect(end.tippingEdge).toBe('endY0');
    expect(end.forceYPerPaM2).toBeCloseTo(-2, 12);
    const u = utilizationAt(box, 90, 10);
    expect(u.overturning).toBeCloseTo(0.187373, 6);
    expect(u.sliding).toBeCloseTo(0.624576, 6);
  });

  // Front-on (θ = 0): F = 4q toward +x, tipping about the back edge with lever 0.5 m: M_w = 490.3325;
  // U_ot = 1.5 · 4 · 61.25 / 490.3325 = 0.749491 at 10 m/s; at θ = 45° both the front (δ 45°, ψ 1)
  // and the y = 2 end (δ 45°, ψ 1) carry full load: F⃗ = (4q, −2q), |F⃗| = 4.47214 q → sliding
  // 2 · 4.47214 · 61.25 / (0.4 · 980.665) = 1.396595.
  it('at 45° the front and the end both carry their full load, and sliding takes the vector sum', () => {
    expect(utilizationAt(box, 0, 10).overturning).toBeCloseTo(0.749491, 6);
    expect(utilizationAt(box, 45, 10).sliding).toBeCloseTo((2 * Math.hypot(4, 2) * 61.25) / (0.4 * 980.665), 9);
    expect(utilizationAt(box, 45, 10).sliding).toBeCloseTo(1.396595, 6);
    expect(governingCase(stabilityCoefficients(box)).direction.governing).toBe('sliding');
  });
});

describe('uplift factored with the wind (issue 11 item 2; EN 1990 Table A1.2(A) EQU)', () => {
  // The board plus a canopy: uplift 3 m² · c_lift 0.5 at the middle of the base.
  // v2: U_ot = γ (M_h + F_up · 0.5) / M_w. At q the canopy lifts 1.5 q N, moment 0.75 q about the back edge.
  // k_ot = 1.5 (10.8 + 0.75) / 980.665 = 0.0176666 per Pa → limit q = 56.6040 Pa → 9.61326 m/s.
  // The first release took U_ot = γ M_h / (M_w − F_up d/2): limit q = 980.665 / (16.2 + 0.75) = 57.856 Pa
  // → 9.71902 m/s, about 1.1 % higher; its margin on the whole wind at its own limit was below 1.5.
  const canopy: ExpandedStructure = { ...board, uplift: { planAreaM2: 3, liftCoefficient: 0.5 } };

  it('the limit is the hand-worked 9.61326 m/s, below the first release’s 9.71902 m/s', () => {
    expect(calculatedLimitGustMps(stabilityCoefficients(canopy), 1.225)).toBeCloseTo(9.61326, 5);
  });

  it('at the limit the unfactored wind (faces and uplift together) is exactly 1/1.5 of the restoring moment', () => {
    const limit = calculatedLimitGustMps(stabilityCoefficients(canopy), 1.225);
    const report = assessCoefficients(stabilityCoefficients(canopy), limit, 1.225);
    expect((1.5 * report.overturningMomentNm) / report.restoringMomentNm).toBeCloseTo(1, 12);
  });

  it('uplift at a windward point tips more than at the middle: 0.2 m from the front edge, lever 0.8 m to the back edge', () => {
    // k_ot = 1.5 (10.8 + 1.5 · 0.8) / 980.665 = 0.0183549 per Pa about the back edge.
    const windward: ExpandedStructure = { ...board, uplift: { planAreaM2: 3, liftCoefficient: 0.5, xM: 0.2 } };
    expect(direction(windward, 0).utilizationPerPa.overturning).toBeCloseTo((1.5 * (10.8 + 1.2)) / 980.665, 12);
  });

  it('nothing resists when every mass sits on the tipping edge: overturning is unbounded', () => {
    const onEdge: ExpandedStructure = { ...board, masses: [{ massKg: 200, xM: 0 }] };
    // Wind onto the back (θ = 180) tips it about the front edge, where all the mass is.
    expect(utilizationAt(onEdge, 180, 10).overturning).toBe(Infinity);
    expect(assessCoefficients(stabilityCoefficients(onEdge), 10, 1.225).utilization.governing).toBeNull();
  });
});

describe('effective capacity with the rated gust (issue 11 item 4; design §2.3)', () => {
  it('the effective limit is the lower of the calculated limit and the rating', () => {
    const structure = boardWithLimit(20);
    expect(effectiveLimitGustMps({ ...structure, ratedGustMps: 16 }, 1.225)).toBe(16);
    expect(effectiveLimitGustMps({ ...structure, ratedGustMps: 25 }, 1.225)).toBeCloseTo(20, 10);
  });

  it('at 14 m/s with a 16 m/s rating on a 20 m/s structure the effective utilization is (14/16)² = 0.765625, not (14/20)² = 0.49', () => {
    const coefficients = stabilityCoefficients({ ...boardWithLimit(20), ratedGustMps: 16 });
    expect(effectiveUtilization(coefficients, 14, 1.225)).toBeCloseTo(0.765625, 12);
    expect(assessCoefficients(coefficients, 14, 1.225).margin).toBeCloseTo(1 - 0.765625, 12);
  });

  it('60 % and 80 % of capacity (Bute Park event organisers’ guide, 2020) are reached at 15.49 and 17.89 m/s for a 20 m/s limit, and at 12.39 and 14.31 m/s when a 16 m/s rating governs', () => {
    const structure = boardWithLimit(20);
    expect(gustForUtilizationMps(structure, 0.6, 1.225)).toBeCloseTo(15.49, 2);
    expect(gustForUtilizationMps(structure, 0.8, 1.225)).toBeCloseTo(17.89, 2);
    expect(gustForUtilizationMps({ ...structure, ratedGustMps: 16 }, 0.6, 1.225)).toBeCloseTo(12.39, 2);
    expect(gustForUtilizationMps({ ...structure, ratedGustMps: 16 }, 0.8, 1.225)).toBeCloseTo(14.31, 2);
  });
});

describe('required ballast', () => {
  // At 15 m/s the board needs γ·M_h = 1.5 · 1488.375 = 2232.5625 N·m of restoring moment; it has 980.665.
  // Extra at the middle (lever 0.5 m either way): (2232.5625 − 980.665) / (g · 0.5) = 255.316 kg.
  // Sliding needs γ·F/μ = 2 · 992.25 / 0.5 = 3969 N of weight, it has 1961.33: 204.72 kg. Overturning governs.
  it('is the hand-worked 255.316 kg for the board at 15 m/s placed at the middle', () => {
    const answer = requiredBallast(stabilityCoefficients(board), 15, 1.225, { xM: 0.5 });
    expect(answer.possible).toBe(true);
    expect(answer.massKg).toBeCloseTo(255.316, 3);
  });

  it('is 0 when the structure already holds at the design gust', () => {
    expect(requiredBallast(stabilityCoefficients(board), 8, 1.225, { xM: 0.5 }).massKg).toBe(0);
  });

  it('is not possible on the edge it would have to hold down, or above the rated gust', () => {
    const onEdge = requiredBallast(stabilityCoefficients(board), 15, 1.225, { xM: 0 });
    expect(onEdge.possible).toBe(false);
    if (!onEdge.possible) expect(onEdge.reason).toMatch(/front edge/);
    const rated = requiredBallast(stabilityCoefficients({ ...board, ratedGustMps: 12 }), 15, 1.225, { xM: 0.5 });
    expect(rated.possible).toBe(false);
  });
});

describe('a strip record (first round, no baseWidthM)', () => {
  it('checks the front and back edges only and warns that the ends were not', () => {
    const { baseWidthM: _w, ...strip } = board;
    const coefficients = stabilityCoefficients(strip);
    expect(coefficients.body.strip).toBe(true);
    const report = assessCoefficients(coefficients, 15, 1.225);
    expect(report.utilization.overturning).toBeCloseTo(2.27658, 5);
    expect(report.warnings.join(' ')).toMatch(/ends.*not checked/);
  });
});

describe('directions assessed (design §2.3: every 15° and each face normal)', () => {
  it('lists every 15° and both normals of a face at 10°', () => {
    const coefficients = stabilityCoefficients({ ...board, faces: [{ ...board.faces[0]!, facingDeg: 10 }] });
    const degrees = coefficients.body.directions.map((d) => d.directionDeg);
    for (let deg = 0; deg < 360; deg += 15) expect(degrees).toContain(deg);
    expect(degrees).toContain(10);
    expect(degrees).toContain(190);
    expect([...degrees].sort((a, b) => a - b)).toEqual(degrees);
  });
});

describe('argument checks', () => {
  it('rejects a mass outside the base with a RangeError naming it', () => {
    expect(() => stabilityCoefficients({ ...board, masses: [{ massKg: 200, xM: 1.5 }] })).toThrow(/masses\.0\.xM/);
    expect(() => stabilityCoefficients({ ...board, masses: [{ massKg: 200, xM: 0.5, yM: 3 }] })).toThrow(/masses\.0\.yM/);
  });

  it('rejects a NaN area, a zero base depth and a gust above 120 m/s', () => {
    expect(() => stabilityCoefficients({ ...board, faces: [{ ...board.faces[0]!, areaM2: Number.NaN }] })).toThrow(/faces\.0\.areaM2/);
    expect(() => stabilityCoefficients({ ...board, baseDepthM: 0 })).toThrow(/baseDepthM/);
    expect(() => assessCoefficients(stabilityCoefficients(board), 150, 1.225)).toThrow(/gustMps/);
  });
});
