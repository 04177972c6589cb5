import { describe, expect, it } from 'vitest';
import {
  crossTerrainMeanWindMps,
  exposureFactor,
  gustHeightFactor,
  logLawSpeedMps,
  meanWindMps,
  peakVelocityPressurePa,
  powerLawSpeedMps,
  roughnessFactor,
  terrainFactor,
  terrainParameters,
  turbulenceIntensity,
  type TerrainCategory,
} from '../../../server/engine/index.ts';
import { isBelowMinimumHeight, unclampedExposureFactor } from '../../../server/engine/windProfile.ts';

describe('EN 1991-1-4 terrain (Table 4.1, expression 4.5)', () => {
  it('Table 4.1 gives z0 and z_min per category', () => {
    expect(terrainParameters.II).toMatchObject({ roughnessLengthM: 0.05, minimumHeightM: 2 });
    expect(terrainParameters.IV).toMatchObject({ roughnessLengthM: 1.0, minimumHeightM: 10 });
  });

  it.each([
    ['0', 0.156],
    ['I', 0.1698],
    ['II', 0.19],
    ['III', 0.2154],
    ['IV', 0.2343],
  ] as const)('terrain factor k_r of category %s is %f (EN 4.5, references §9)', (category, expected) => {
    expect(terrainFactor(category as TerrainCategory)).toBeCloseTo(expected, 4);
  });

  it('rejects an unknown category with a RangeError', () => {
    expect(() => terrainFactor('V' as TerrainCategory)).toThrow(RangeError);
  });
});

describe('EN 1991-1-4 profile check cases (references §9)', () => {
  it('category II, 10 m, v_b 25 m/s: c_r 1.00668, v_m 25.167, I_v 0.18874, q_p 918.9 Pa, c_e 2.352 (EN 4.4–4.10, ρ 1.25)', () => {
    const input = { baseWindMps: 25, heightM: 10, terrainCategory: 'II' as const };
    expect(roughnessFactor(10, 'II')).toBeCloseTo(1.00668, 5);
    expect(meanWindMps(input)).toBeCloseTo(25.167, 3);
    expect(turbulenceIntensity(10, 'II')).toBeCloseTo(0.18874, 5);
    expect(peakVelocityPressurePa(input)).toBeCloseTo(918.9, 1);
    expect(exposureFactor(10, 'II')).toBeCloseTo(2.352, 3);
  });

  it('category III at 3 m (below z_min 5 m) takes the z_min values: c_r 0.6060, I_v 0.3554, v_m 15.15 m/s, q_p 500.3 Pa (EN 4.4, 4.7)', () => {
    const input = { baseWindMps: 25, heightM: 3, terrainCategory: 'III' as const };
    expect(roughnessFactor(3, 'III')).toBeCloseTo(0.606, 4);
    expect(roughnessFactor(3, 'III')).toBe(roughnessFactor(5, 'III'));
    expect(turbulenceIntensity(3, 'III')).toBeCloseTo(0.3554, 4);
    expect(meanWindMps(input)).toBeCloseTo(15.15, 2);
    expect(peakVelocityPressurePa(input)).toBeCloseTo(500.3, 1);
  });

  it('v_m 15 m/s at 10 m over category II: q_p 326.4 Pa; at 5 m v_m 13.04 m/s and q_p 267.7 Pa (EN 4.3, 4.8)', () => {
    const baseWindMps = 15 / roughnessFactor(10, 'II');
    expect(peakVelocityPressurePa({ baseWindMps, heightM: 10, terrainCategory: 'II' })).toBeCloseTo(326.4, 1);
    expect(meanWindMps({ baseWindMps, heightM: 5, terrainCategory: 'II' })).toBeCloseTo(13.04, 2);
    expect(peakVelocityPressurePa({ baseWindMps, heightM: 5, terrainCategory: 'II' })).toBeCloseTo(267.7, 1);
  });

  it('the implied gust factor on speed √(1 + 7 I_v) is 1.5235 at 10 m and 1.5875 at 5 m in category II (references §1)', () => {
    expect(Math.sqrt(1 + 7 * turbulenceIntensity(10, 'II'))).toBeCloseTo(1.5235, 4);
    expect(Math.sqrt(1 + 7 * turbulenceIntensity(5, 'II'))).toBeCloseTo(1.5875, 4);
  });

  it('exposure factor is q_p / q_b whatever v_b and ρ (EN 4.9)', () => {
    const qpPa = peakVelocityPressurePa({ baseWindMps: 31, heightM: 7, terrainCategory: 'I', airDensityKgM3: 1.1 });
    expect(qpPa / (0.5 * 1.1 * 31 * 31)).toBeCloseTo(exposureFactor(7, 'I'), 12);
  });

  it('rejects heights above z_max 200 m (EN 4.3.2)', () => {
    expect(() => roughnessFactor(250, 'II')).toThrow(RangeError);
  });
});

describe('gust height factor √(q_p(z_s)/q_p(z_a)) (EN 1991-1-4 4.8, design §2.2)', () => {
  // Category II, 5 m mast → 10 m structure: (1.5235 · 1.00668) / (1.5875 · 0.87498) = 1.1042.
  it('a 5 m anemometer and a 10 m structure over category II give 1.1042', () => {
    expect(gustHeightFactor({ fromHeightM: 5, toHeightM: 10, terrainCategory: 'II', allowReduction: false })).toBeCloseTo(1.1042, 4);
  });

  it('a structure lower than the mast keeps the factor 1 unless reduction is allowed (conservative default)', () => {
    const transfer = { fromHeightM: 10, toHeightM: 5, terrainCategory: 'II' as const };
    expect(gustHeightFactor({ ...transfer, allowReduction: false })).toBe(1);
    expect(gustHeightFactor({ ...transfer, allowReduction: true })).toBeCloseTo(1 / 1.1042, 4);
  });

  it('is the square root of the ratio of peak velocity pressures, whatever v_b and ρ', () => {
    const qp = (heightM: number) => peakVelocityPressurePa({ baseWindMps: 22, heightM, terrainCategory: 'III', airDensityKgM3: 1.18 });
    const factor = gustHeightFactor({ fromHeightM: 6, toHeightM: 14, terrainCategory: 'III', allowReduction: true });
    expect(factor).toBeCloseTo(Math.sqrt(qp(14) / qp(6)), 12);
  });

});

describe('gust height factor with the anemometer below z_min (design §2.2 v2, issue 11 item 6)', () => {
  // Hand-worked from EN 1991-1-4 expressions 4.4, 4.7 and 4.9 with c_0 = 1, k_I = 1: with
  // L = ln(z/z0), c_e(z) = (1 + 7/L)·(k_r L)² = k_r²·(L² + 7L), so k_r cancels in a ratio.
  // The clamp of §4.3.2 puts L at ln(z_min/z0) below z_min; the unclamped profile keeps the true z.
  //
  // Category IV (z0 1 m, z_min 10 m, Table 4.1), 2.5 m mast → 12 m structure:
  //   L(12) = ln 12 = 2.484907, L² + 7L = 6.174761 + 17.394349 = 23.569110
  //   L(10) = ln 10 = 2.302585, L² + 7L = 5.301898 + 16.118096 = 21.419994   (the clamp at z_min)
  //   L(2.5) = ln 2.5 = 0.916291, L² + 7L = 0.839589 + 6.414035 = 7.253624
  //   clamped   √(23.569110 / 21.419994) = √1.100332 = 1.048967   (the 1.05 the issue found)
  //   unclamped √(23.569110 / 7.253624) = √3.249289 = 1.802578    (the "about 1.8")
  it('a 2.5 m mast and a 12 m structure over category IV give 1.8026, not the clamped 1.0490 (EN 4.4, 4.7, 4.9)', () => {
    const transfer = { fromHeightM: 2.5, toHeightM: 12, terrainCategory: 'IV' as const };
    expect(gustHeightFactor({ ...transfer, allowReduction: false })).toBeCloseTo(1.802578, 6);
    expect(gustHeightFactor({ ...transfer, allowReduction: true })).toBeCloseTo(1.802578, 6);
    expect(Math.sqrt(exposureFactor(12, 'IV') / exposureFactor(2.5, 'IV'))).toBeCloseTo(1.048967, 6);
  });

  // references §9: category III at 3 m, clamped to z_min 5 m, has c_r 0.6060 and I_v 0.3554.
  // Unclamped at 3 m: L = ln(3/0.3) = ln 10 = 2.302585, c_r = 0.215389 · 2.302585 = 0.495952 (EN 4.4
  // without the clamp, k_r by 4.5), I_v = 1/2.302585 = 0.434294 (4.7 without the clamp).
  // 3 m mast → 10 m structure: L(10) = ln(33.3333) = 3.506558, L² + 7L = 12.295949 + 24.545906 = 36.841855;
  //   clamped  L(5) = ln 16.6667 = 2.813411, L² + 7L = 7.915280 + 19.693875 = 27.609155 → √(36.841855/27.609155) = 1.155165;
  //   unclamped L(3): L² + 7L = 21.419994 → √(36.841855/21.419994) = √1.719975 = 1.311478.
  it('category III, a 3 m mast (below z_min 5 m) and a 10 m structure: 1.3115 from the unclamped profile, not 1.1552 (references §1, §9)', () => {
    expect(roughnessFactor(3, 'III')).toBeCloseTo(0.606, 4);
    expect(Math.sqrt(unclampedExposureFactor(3, 'III') / (1 + 7 * 0.434294))).toBeCloseTo(0.495952, 5);
    expect(unclampedExposureFactor(3, 'III')).toBeCloseTo(0.215389 ** 2 * 21.419994, 5);
    expect(gustHeightFactor({ fromHeightM: 3, toHeightM: 10, terrainCategory: 'III', allowReduction: false })).toBeCloseTo(1.311478, 6);
  });

  // Both below z_min, category III: 2 m → 4 m. Clamped: 1 (the profile is constant below z_min).
  // Unclamped: L(4) = ln 13.3333 = 2.590267, L² + 7L = 24.841355; L(2) = ln 6.6667 = 1.897120,
  // L² + 7L = 16.878904 → √(24.841355/16.878904) = √1.471738 = 1.213153.
  it('between two heights below z_min the structure higher than the mast gets the unclamped 1.2132, no longer 1 (EN 4.4 without the clamp)', () => {
    expect(gustHeightFactor({ fromHeightM: 2, toHeightM: 4, terrainCategory: 'III', allowReduction: true })).toBeCloseTo(1.213153, 6);
  });

  it('a structure below z_min is never credited with less wind than the clamped profile (reduction allowed: 4 m → 2 m in III stays 1)', () => {
    expect(gustHeightFactor({ fromHeightM: 4, toHeightM: 2, terrainCategory: 'III', allowReduction: true })).toBe(1);
    // 10 m mast → 3 m structure over category III: the clamped ratio √(c_e(5)/c_e(10)) = 1/1.155165 governs.
    expect(gustHeightFactor({ fromHeightM: 10, toHeightM: 3, terrainCategory: 'III', allowReduction: true })).toBeCloseTo(1 / 1.155165, 6);
  });

  it('above z_min nothing changes: 5 m → 10 m over category II is still 1.1042 (references §9)', () => {
    expect(unclampedExposureFactor(10, 'II')).toBeCloseTo(exposureFactor(10, 'II'), 12);
    expect(gustHeightFactor({ fromHeightM: 5, toHeightM: 10, terrainCategory: 'II', allowReduction: false })).toBeCloseTo(1.104189, 6);
  });

  // At z0 the log law gives no wind: below 1.1 z0 the unclamped profile is taken at 1.1 z0 (our
  // assumption, stated in windProfile.ts). Category IV, 1.1 m: L = ln 1.1 = 0.095310,
  // L² + 7L = 0.009084 + 0.667171 = 0.676255 → to 12 m √(23.569110/0.676255) = √34.852 = 5.903591.
  it('a mast at or below the roughness length reads high, never NaN: 0.5 m and 1.1 m over category IV both give 5.9036 to 12 m', () => {
    for (const fromHeightM of [0, 0.5, 1, 1.1]) {
      expect(gustHeightFactor({ fromHeightM, toHeightM: 12, terrainCategory: 'IV', allowReduction: false })).toBeCloseTo(5.903591, 5);
    }
  });

  it('is never below either ratio, for masts and structures from 0.5 m to 30 m over every category (design §2.2 v2)', () => {
    const heights = [0.5, 1, 1.5, 2, 2.5, 3, 4, 5, 7, 10, 12, 15, 20, 30];
    for (const category of ['0', 'I', 'II', 'III', 'IV'] as const) {
      for (const fromHeightM of heights) {
        for (const toHeightM of heights) {
          const factor = gustHeightFactor({ fromHeightM, toHeightM, terrainCategory: category, allowReduction: true });
          const clamped = Math.sqrt(exposureFactor(toHeightM, category) / exposureFactor(fromHeightM, category));
          const unclamped = Math.sqrt(unclampedExposureFactor(toHeightM, category) / unclampedExposureFactor(fromHeightM, category));
          expect(factor).toBeGreaterThanOrEqual(clamped - 1e-12);
          expect(factor).toBeGreaterThanOrEqual(unclamped - 1e-12);
          expect(Number.isFinite(factor)).toBe(true);
        }
      }
    }
  });

  it.each([
    ['IV', 9.99, true],
    ['IV', 10, false],
    ['III', 4.5, true],
    ['III', 5, false],
    ['II', 1.5, true],
    ['II', 2, false],
    ['I', 0.9, true],
    ['0', 1, false],
  ] as const)('category %s: a mast at %f m is below z_min: %s (EN 1991-1-4 Table 4.1)', (category, heightM, below) => {
    expect(isBelowMinimumHeight(heightM, category)).toBe(below);
  });
});

describe('mean wind transfers (references §8)', () => {
  it('8 m/s at 3 m over z0 0.05 m is 10.35 m/s at 10 m by the log law', () => {
    expect(logLawSpeedMps({ speedMps: 8, fromHeightM: 3, toHeightM: 10, roughnessLengthM: 0.05 })).toBeCloseTo(10.35, 2);
  });

  it('the same by the power law α = 1/7 (from memory) is 9.50 m/s', () => {
    expect(powerLawSpeedMps(8, 3, 10)).toBeCloseTo(9.5, 2);
  });

  it('12 m/s at 10 m over category II is 8.43 m/s at 8 m over category III (EN form, fully developed flow)', () => {
    const moved = crossTerrainMeanWindMps({ meanWindMps: 12, fromHeightM: 10, fromCategory: 'II', toHeightM: 8, toCategory: 'III' });
    expect(moved).toBeCloseTo(8.43, 2);
  });
});
