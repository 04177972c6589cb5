import { describe, expect, it } from 'vitest';
import {
  calculatedLimitGust,
  defaultSafetyFactors,
  dynamicPressurePa,
  effectiveLimitGustMps,
  gustForUtilizationMps,
  requiredBallastKg,
  safetyFactorSources,
  sideStability,
  stabilityAtGust,
  stabilityCoefficients,
  type ExpandedStructure,
} from '../../../server/engine/index.ts';

/** A board 4 m² at 1.5 m on a 1 m base with 200 kg at the middle: no uplift. */
const board: ExpandedStructure = {
  baseDepthM: 1,
  frictionCoefficient: 0.5,
  faces: [{ areaM2: 4, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8 }],
  masses: [{ massKg: 200, xM: 0.5 }],
  safetyFactors: { ...defaultSafetyFactors },
};

/** `board` with its mass scaled so that its calculated limit is exactly `limitMps` (no uplift: limit ∝ √mass). */
function boardWithLimit(limitMps: number): ExpandedStructure {
  const scale = (limitMps / calculatedLimitGust(board, 1.225).gustMps) ** 2;
  return { ...board, masses: [{ massKg: 200 * scale, xM: 0.5 }] };
}

describe('dynamic pressure', () => {
  it('is 245 Pa at 20 m/s in ISA sea-level air, 1.225 kg/m³ (ISO 2533 density)', () => {
    expect(dynamicPressurePa(20, 1.225)).toBeCloseTo(245, 10);
  });
});

describe('default safety factors (design §2.3)', () => {
  it('are 1.5 on overturning and uplift (common practice) and 2.0 on sliding (HSE RR071)', () => {
    expect(defaultSafetyFactors).toEqual({ overturning: 1.5, sliding: 2.0, uplift: 1.5 });
    expect(safetyFactorSources.sliding).toMatch(/RR071/);
    expect(safetyFactorSources.overturning).toMatch(/common practice/);
  });
});

describe('staged triggers (Bute Park event organisers’ guide: actions at 60 % and 80 % of the maximum wind load)', () => {
  it('for a 20 m/s limit without uplift, 60 % load is reached at 15.49 m/s and 80 % at 17.89 m/s', () => {
    const structure = boardWithLimit(20);
    expect(calculatedLimitGust(structure, 1.225).gustMps).toBeCloseTo(20, 10);
    expect(gustForUtilizationMps(structure, 0.6, 1.225)).toBeCloseTo(15.49, 2);
    expect(gustForUtilizationMps(structure, 0.8, 1.225)).toBeCloseTo(17.89, 2);
  });
});

describe('worked example: the board at 15 m/s (numbers of our own)', () => {
  // q = ½ · 1.225 · 15² = 137.8125 Pa; F = 1.8 · 4 · 137.8125 = 992.25 N; M_ot = 1.5 m · F = 1488.375 N·m.
  // W = 200 · 9.80665 = 1961.33 N; both levers 0.5 m → M_res = 980.665 N·m.
  // U_ot = 1.5 · 1488.375 / 980.665 = 2.27658; U_sl = 2.0 · 992.25 / (0.5 · 1961.33) = 2.02360.
  // Limits: overturning q = 980.665 / (1.5 · 10.8) = 60.5349 Pa → 9.9415 m/s;
  //         sliding q = 980.665 / (2.0 · 7.2) = 68.1017 Pa → 10.5445 m/s. Overturning governs.
  it('gives the hand-worked loads, utilizations and limit', () => {
    const result = stabilityAtGust(board, 15, 1.225);
    expect(result.qPa).toBeCloseTo(137.8125, 10);
    expect(result.front.horizontalForceN).toBeCloseTo(992.25, 9);
    expect(result.front.overturningMomentNm).toBeCloseTo(1488.375, 9);
    expect(result.front.restoringMomentNm).toBeCloseTo(980.665, 9);
    expect(result.front.utilization.overturning).toBeCloseTo(2.27658, 5);
    expect(result.front.utilization.sliding).toBeCloseTo(2.0236, 4);
    expect(result.front.utilization.uplift).toBe(0);
    expect(result.front.governing).toBe('overturning');
    expect(calculatedLimitGust(board, 1.225)).toEqual({ gustMps: expect.closeTo(9.9415, 4), side: 'front', criterion: 'overturning' });
  });
});

describe('uplift and unbounded utilizations', () => {
  // A 20 m² canopy with lift coefficient 1.0 on the same 200 kg: at 15 m/s F_up = 20 · 137.8125 = 2756.25 N,
  // more than the weight 1961.33 N, and the uplift moment 2756.25 · 0.5 = 1378.1 N·m exceeds M_w = 980.665 N·m.
  const canopy: ExpandedStructure = { ...board, uplift: { planAreaM2: 20, liftCoefficient: 1.0 } };

  it('a restoring moment ≤ 0 makes overturning unbounded, as does a friction capacity ≤ 0 for sliding', () => {
    const front = stabilityAtGust(canopy, 15, 1.225).front;
    expect(front.restoringMomentNm).toBeCloseTo(980.665 - 1378.125, 6);
    expect(front.utilization.overturning).toBe(Infinity);
    expect(front.utilization.sliding).toBe(Infinity);
    expect(front.utilization.uplift).toBeCloseTo((1.5 * 2756.25) / 1961.33, 9);
  });

  it('in directional assessment the faces carry the normal share while uplift keeps the full gust', () => {
    const coefficients = stabilityCoefficients(canopy);
    const full = sideStability(coefficients, 'front', 50);
    const quarter = sideStability(coefficients, 'front', 50, 0.25);
    expect(quarter.horizontalForceN).toBeCloseTo(full.horizontalForceN / 4, 12);
    expect(quarter.upliftN).toBe(full.upliftN);
  });
});

describe('effective limit (design §2.3)', () => {
  it('is the rated gust when that is lower than the calculated limit, else the calculated limit', () => {
    const structure = boardWithLimit(20);
    expect(effectiveLimitGustMps({ ...structure, ratedGustMps: 16 }, 1.225)).toBe(16);
    expect(effectiveLimitGustMps({ ...structure, ratedGustMps: 25 }, 1.225)).toBeCloseTo(20, 10);
  });
});

describe('required ballast', () => {
  // At 15 m/s the board needs γ·M_ot = 1.5 · 1488.375 = 2232.5625 N·m of restoring moment; it has 980.665.
  // Extra at x = 0.5 (lever 0.5 m either way): (2232.5625 − 980.665) / (9.80665 · 0.5) = 255.316 kg.
  // Sliding needs γ·F/μ = 2 · 992.25 / 0.5 = 3969 N of weight, it has 1961.33: 204.72 kg. Overturning governs.
  it('is the hand-worked 255.316 kg for the board at 15 m/s placed at the middle', () => {
    expect(requiredBallastKg(board, 15, 1.225, 0.5)).toBeCloseTo(255.316, 3);
  });

  it('is 0 when the structure already holds at the design gust', () => {
    expect(requiredBallastKg(board, 8, 1.225, 0.5)).toBe(0);
  });

  it('is Infinity when the ballast would sit on the tipping edge of the side that needs it', () => {
    // At x = 0 the mass has no lever about the front edge, the edge wind onto the back tips it over.
    expect(requiredBallastKg(board, 15, 1.225, 0)).toBe(Infinity);
  });
});

describe('argument checks', () => {
  it('rejects a mass outside the base with a RangeError naming it', () => {
    const outside = { ...board, masses: [{ massKg: 200, xM: 1.5 }] };
    expect(() => stabilityCoefficients(outside)).toThrow(/masses\.0\.xM/);
  });

  it('rejects a NaN area, a zero base depth and a gust above 120 m/s', () => {
    expect(() => stabilityCoefficients({ ...board, faces: [{ ...board.faces[0]!, areaM2: Number.NaN }] })).toThrow(/faces\.0\.areaM2/);
    expect(() => stabilityCoefficients({ ...board, baseDepthM: 0 })).toThrow(/baseDepthM/);
    expect(() => stabilityAtGust(board, 150, 1.225)).toThrow(/gustMps/);
  });
});
