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

  it('is 1 between two heights below z_min (the profile is constant there, EN 4.4)', () => {
    expect(gustHeightFactor({ fromHeightM: 2, toHeightM: 4, terrainCategory: 'III', allowReduction: true })).toBe(1);
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
