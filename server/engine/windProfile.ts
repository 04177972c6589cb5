/**
 * Wind profile over flat terrain, EN 1991-1-4 §4.3–4.5 (expressions 4.3–4.10, Table 4.1), and the
 * transfers of a measured wind from the anemometer's height to the structure's (design §2.2).
 *
 * The orography factor c_0 is 1 (flat terrain) unless given; the turbulence factor k_I is 1.0
 * (the recommended value). Heights run from 0 (clamped to z_min) to z_max = 200 m.
 */
import { maxDimensionM, maxPlausibleSpeedMps } from './limits.ts';
import { assertAbove, assertInRange } from './rangeCheck.ts';
import { dynamicPressurePa } from './dynamicPressure.ts';
import { recommendedAirDensityKgM3 } from './air.ts';

export const terrainCategories = ['0', 'I', 'II', 'III', 'IV'] as const;
export type TerrainCategory = (typeof terrainCategories)[number];

export interface TerrainParameters {
  /** Roughness length z0, m. */
  roughnessLengthM: number;
  /** Minimum height z_min, m: below it the profile is taken constant. */
  minimumHeightM: number;
  description: string;
}

/** EN 1991-1-4 Table 4.1 (z_max = 200 m for every category). */
export const terrainParameters: Readonly<Record<TerrainCategory, TerrainParameters>> = {
  '0': { roughnessLengthM: 0.003, minimumHeightM: 1, description: 'sea or coastal area exposed to the open sea' },
  I: { roughnessLengthM: 0.01, minimumHeightM: 1, description: 'lakes or flat land with negligible vegetation and no obstacles' },
  II: { roughnessLengthM: 0.05, minimumHeightM: 2, description: 'low vegetation such as grass, isolated obstacles at least 20 obstacle heights apart' },
  III: { roughnessLengthM: 0.3, minimumHeightM: 5, description: 'regular cover of vegetation or buildings, isolated obstacles (villages, suburbs, forest)' },
  IV: { roughnessLengthM: 1.0, minimumHeightM: 10, description: 'at least 15 % of the surface covered by buildings higher than 15 m' },
};

/** z_max of EN 1991-1-4 §4.3.2 (Table 4.1: 200 m), m; engine/limits.ts bounds every height by it. */
export const profileMaximumHeightM = maxDimensionM;
/** Roughness length of category II, the reference terrain of expression 4.5, m. */
const referenceRoughnessLengthM = 0.05;
/** Turbulence factor k_I, recommended value (EN 1991-1-4 §4.4 note 2). */
const turbulenceFactor = 1.0;

function parametersOf(caller: string, category: TerrainCategory): TerrainParameters {
  const parameters = terrainParameters[category];
  if (parameters === undefined) {
    throw new RangeError(`${caller}: terrainCategory must be one of ${terrainCategories.join(', ')}, got ${String(category)}`);
  }
  return parameters;
}

function assertHeight(caller: string, name: string, heightM: number): void {
  assertInRange(caller, name, heightM, 0, profileMaximumHeightM, 'm');
}

/** ln(z/z0) with z clamped to z_min from below: the shape shared by 4.4 and 4.7. */
function logHeightRatio(heightM: number, parameters: TerrainParameters): number {
  return Math.log(Math.max(heightM, parameters.minimumHeightM) / parameters.roughnessLengthM);
}

/** Terrain factor k_r = 0.19 (z0 / z0,II)^0.07 (EN 1991-1-4 expression 4.5). */
export function terrainFactor(category: TerrainCategory): number {
  const { roughnessLengthM } = parametersOf('terrainFactor', category);
  return 0.19 * (roughnessLengthM / referenceRoughnessLengthM) ** 0.07;
}

/** Roughness factor c_r(z) = k_r ln(z/z0), c_r(z_min) below z_min (EN 1991-1-4 expression 4.4). */
export function roughnessFactor(heightM: number, category: TerrainCategory): number {
  assertHeight('roughnessFactor', 'heightM', heightM);
  return terrainFactor(category) * logHeightRatio(heightM, parametersOf('roughnessFactor', category));
}

/** Turbulence intensity I_v(z) = k_I / (c_0 ln(z/z0)), I_v(z_min) below z_min (EN 1991-1-4 expression 4.7). */
export function turbulenceIntensity(heightM: number, category: TerrainCategory, orographyFactor = 1): number {
  assertHeight('turbulenceIntensity', 'heightM', heightM);
  assertAbove('turbulenceIntensity', 'orographyFactor', orographyFactor, 0);
  return turbulenceFactor / (orographyFactor * logHeightRatio(heightM, parametersOf('turbulenceIntensity', category)));
}

export interface ProfileInput {
  /** Basic wind velocity v_b (10-minute mean at 10 m in category II), m/s. */
  baseWindMps: number;
  heightM: number;
  terrainCategory: TerrainCategory;
  /** Orography factor c_0 (1 on flat terrain). */
  orographyFactor?: number;
}

/** Mean wind v_m(z) = c_r(z) c_0(z) v_b in m/s (EN 1991-1-4 expression 4.3). */
export function meanWindMps({ baseWindMps, heightM, terrainCategory, orographyFactor = 1 }: ProfileInput): number {
  assertInRange('meanWindMps', 'baseWindMps', baseWindMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertAbove('meanWindMps', 'orographyFactor', orographyFactor, 0);
  return roughnessFactor(heightM, terrainCategory) * orographyFactor * baseWindMps;
}

/**
 * Peak velocity pressure q_p(z) = [1 + 7 I_v(z)] ½ ρ v_m(z)² in Pa (EN 1991-1-4 expression 4.8).
 * ρ defaults to 1.25 kg/m³, the value EN 1991-1-4 §4.5 recommends.
 */
export function peakVelocityPressurePa(input: ProfileInput & { airDensityKgM3?: number }): number {
  const { heightM, terrainCategory, orographyFactor = 1, airDensityKgM3 = recommendedAirDensityKgM3 } = input;
  assertAbove('peakVelocityPressurePa', 'airDensityKgM3', airDensityKgM3, 0);
  const meanMps = meanWindMps(input);
  return (1 + 7 * turbulenceIntensity(heightM, terrainCategory, orographyFactor)) * dynamicPressurePa(meanMps, airDensityKgM3);
}

/**
 * Exposure factor c_e(z) = q_p(z)/q_b = [1 + 7 I_v(z)] c_r(z)² c_0(z)² (EN 1991-1-4 expression 4.9):
 * independent of v_b and ρ.
 */
export function exposureFactor(heightM: number, category: TerrainCategory, orographyFactor = 1): number {
  const speedRatio = roughnessFactor(heightM, category) * orographyFactor;
  return (1 + 7 * turbulenceIntensity(heightM, category, orographyFactor)) * speedRatio * speedRatio;
}

/** Whether a height is below z_min of the terrain (EN 1991-1-4 §4.3.2, Table 4.1): the sensor form warns of such a mast. */
export function isBelowMinimumHeight(heightM: number, category: TerrainCategory): boolean {
  assertHeight('isBelowMinimumHeight', 'heightM', heightM);
  return heightM < parametersOf('isBelowMinimumHeight', category).minimumHeightM;
}

/**
 * The unclamped profile is evaluated no lower than this many roughness lengths above the ground:
 * at z0 the log law gives no wind at all and below it a negative one, so nothing can be
 * transferred from there. An assumption of ours (no source): it keeps the factor finite and large
 * (5.9 from 1.1 m to 12 m in category IV), so such a mast reads high, never low.
 */
export const unclampedProfileFloorRoughnessLengths = 1.1;

/**
 * Exposure factor of the profile formulas evaluated at the true height, without the z_min clamp
 * of EN 1991-1-4 §4.3.2: c_e(z) = [1 + 7 k_I / ln(z/z0)] (k_r ln(z/z0))² = k_r² (L² + 7L) with
 * L = ln(z/z0) (expressions 4.4, 4.7, 4.9; c_0 = 1). Only for the anemometer side of a height
 * transfer (design §2.2 v2); loads keep the clamp. Heights below 1.1 z0 are taken at 1.1 z0.
 */
export function unclampedExposureFactor(heightM: number, category: TerrainCategory): number {
  assertHeight('unclampedExposureFactor', 'heightM', heightM);
  const { roughnessLengthM } = parametersOf('unclampedExposureFactor', category);
  const logRatio = Math.log(Math.max(heightM, unclampedProfileFloorRoughnessLengths * roughnessLengthM) / roughnessLengthM);
  const speedRatio = terrainFactor(category) * logRatio;
  return (1 + (7 * turbulenceFactor) / logRatio) * speedRatio * speedRatio;
}

export interface GustHeightTransfer {
  /** Height of the anemometer z_a, m. */
  fromHeightM: number;
  /** Reference height of the structure z_s (by default its top), m. */
  toHeightM: number;
  terrainCategory: TerrainCategory;
  /**
   * Whether a factor below 1 (structure lower than the anemometer) may be applied. Off by default:
   * a lower wind at the structure is credited only when the competent person says so (design §2.2).
   */
  allowReduction: boolean;
}

/**
 * Factor on a measured gust to get the gust at the structure: √(q_p(z_s)/q_p(z_a)), the peak
 * velocity pressure profile of EN 1991-1-4 4.8 (the ratio of exposure factors, so neither v_b nor
 * ρ enters). A factor above 1 is always applied; below 1 only when `allowReduction`.
 *
 * Below z_min (design §2.2 v2): the clamp of §4.3.2 is conservative for a load but not for the
 * anemometer in the denominator — a mast below z_min is credited with the wind at z_min, which it
 * does not see (2.5 m → 12 m over category IV: 1.05 clamped, 1.80 unclamped). So the factor is the
 * larger of the clamped ratio and the unclamped one (`unclampedExposureFactor` at both heights):
 *   f = max( √(c_e(z_s)/c_e(z_a)), √(c_e,u(z_s)/c_e,u(z_a)) ).
 * Above z_min both are the same; a structure below z_min is never credited with less wind than
 * the clamped profile gives it.
 */
export function gustHeightFactor({ fromHeightM, toHeightM, terrainCategory, allowReduction }: GustHeightTransfer): number {
  assertHeight('gustHeightFactor', 'fromHeightM', fromHeightM);
  assertHeight('gustHeightFactor', 'toHeightM', toHeightM);
  return heightFactorBetween(profileRoots(fromHeightM, terrainCategory), profileRoots(toHeightM, terrainCategory), allowReduction);
}

/** √c_e(z) at one height, clamped at z_min (§4.3.2) and unclamped: the two halves of a height transfer. */
export interface ProfileRoots {
  clamped: number;
  unclamped: number;
}

/**
 * The height's part of `gustHeightFactor`: √c_e(z) clamped and unclamped. The factor from one
 * height to another is their ratio (`heightFactorBetween`), so a caller that transfers between
 * many heights (the live watch: every sensor to every structure) keeps one per height.
 */
export function profileRoots(heightM: number, terrainCategory: TerrainCategory): ProfileRoots {
  assertHeight('profileRoots', 'heightM', heightM);
  return { clamped: Math.sqrt(exposureFactor(heightM, terrainCategory)), unclamped: Math.sqrt(unclampedExposureFactor(heightM, terrainCategory)) };
}

/** `gustHeightFactor` from the profile roots of the two heights: max of the clamped and unclamped ratios, and at least 1 unless `allowReduction`. */
export function heightFactorBetween(from: ProfileRoots, to: ProfileRoots, allowReduction: boolean): number {
  const ratio = Math.max(to.clamped / from.clamped, to.unclamped / from.unclamped);
  return allowReduction ? ratio : Math.max(1, ratio);
}

export interface LogLawTransfer {
  speedMps: number;
  fromHeightM: number;
  toHeightM: number;
  roughnessLengthM: number;
}

/**
 * Mean wind moved to another height over the same terrain by the log law:
 * u2 = u1 ln(z2/z0) / ln(z1/z0) (references §8). For mean winds only; gusts go with `gustHeightFactor`.
 */
export function logLawSpeedMps({ speedMps, fromHeightM, toHeightM, roughnessLengthM }: LogLawTransfer): number {
  const caller = 'logLawSpeedMps';
  assertInRange(caller, 'speedMps', speedMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertAbove(caller, 'roughnessLengthM', roughnessLengthM, 0, 5, 'm');
  assertAbove(caller, 'fromHeightM', fromHeightM, roughnessLengthM, profileMaximumHeightM, 'm');
  assertAbove(caller, 'toHeightM', toHeightM, roughnessLengthM, profileMaximumHeightM, 'm');
  return (speedMps * Math.log(toHeightM / roughnessLengthM)) / Math.log(fromHeightM / roughnessLengthM);
}

/**
 * Mean wind moved by the power law u2 = u1 (z2/z1)^α, α ≈ 1/7 over open country (from memory:
 * references §8). A cross-check of the log law, not used for assessments.
 */
export function powerLawSpeedMps(speedMps: number, fromHeightM: number, toHeightM: number, exponent = 1 / 7): number {
  const caller = 'powerLawSpeedMps';
  assertInRange(caller, 'speedMps', speedMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertAbove(caller, 'fromHeightM', fromHeightM, 0, profileMaximumHeightM, 'm');
  assertAbove(caller, 'toHeightM', toHeightM, 0, profileMaximumHeightM, 'm');
  assertAbove(caller, 'exponent', exponent, 0, 1);
  return speedMps * (toHeightM / fromHeightM) ** exponent;
}

export interface CrossTerrainTransfer {
  /** Mean wind measured at `fromHeightM` over `fromCategory`, m/s. */
  meanWindMps: number;
  fromHeightM: number;
  fromCategory: TerrainCategory;
  toHeightM: number;
  toCategory: TerrainCategory;
}

/**
 * Mean wind moved across terrains (EN form, fully developed flow, references §8): the equivalent
 * basic wind v_b,eq = v_m / c_r,A(z1), then v_m,B(z2) = c_r,B(z2) v_b,eq. c_r clamps at z_min.
 */
export function crossTerrainMeanWindMps(transfer: CrossTerrainTransfer): number {
  const { meanWindMps: measuredMps, fromHeightM, fromCategory, toHeightM, toCategory } = transfer;
  assertInRange('crossTerrainMeanWindMps', 'meanWindMps', measuredMps, 0, maxPlausibleSpeedMps, 'm/s');
  const equivalentBaseWindMps = measuredMps / roughnessFactor(fromHeightM, fromCategory);
  return roughnessFactor(toHeightM, toCategory) * equivalentBaseWindMps;
}
