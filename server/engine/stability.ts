/**
 * Stability of a ballasted structure in wind: overturning, sliding and uplift (design §2.3).
 *
 * Everything the wind does is proportional to q = ½ρv², so the structure reduces to a few sums
 * per side that do not depend on the wind (`stabilityCoefficients`, computed once per structure):
 *   A = Σ cf·A_i (m², force per unit q),  C = Σ cf·A_i·h_i (m³, overturning moment per unit q),
 *   B = c_lift·A_plan (m², uplift per unit q),  W = gΣm (N),  M_w = gΣm·lever (N·m).
 * Then F = A q, M_ot = C q, F_up = B q and, with d the base depth, μ the friction coefficient:
 *   U_ot = γ_ot C q / (M_w − B q d/2),  U_sl = γ_sl A q / (μ (W − B q)),  U_up = γ_up B q / W.
 * A resistance ≤ 0 makes that utilization unbounded (Infinity): the structure has nothing left.
 *
 * Sides: wind onto the front tips the structure about the back edge (lever of a mass = d − x);
 * wind onto the back tips it about the front edge (lever = x). Both are assessed; the worse governs.
 *
 * Limits are solved in closed form per criterion (design §2.3), in q and then v = √(2q/ρ):
 *   overturning q = M_w / (γ_ot C + B d/2),  sliding q = μW / (γ_sl A + μB),  uplift q = W / (γ_up B).
 * With uplift the resistance falls with q too, so scaling a utilization by U^−½ would be wrong.
 */
import { assertAirDensity } from './air.ts';
import { dynamicPressurePa, speedForDynamicPressureMps } from './dynamicPressure.ts';
import { standardGravityMps2 } from './gravity.ts';
import { assertAbove, assertInRange } from './rangeCheck.ts';
import type { ExpandedStructure, SafetyFactors } from './structure.ts';

export const sides = ['front', 'back'] as const;
export type Side = (typeof sides)[number];
export const criteria = ['overturning', 'sliding', 'uplift'] as const;
export type Criterion = (typeof criteria)[number];

/** Defaults for γ_ot, γ_sl, γ_up, each with its source (design §2.3). */
export const defaultSafetyFactors: Readonly<SafetyFactors> = { overturning: 1.5, sliding: 2.0, uplift: 1.5 };
export const safetyFactorSources: Readonly<Record<Criterion, string>> = {
  overturning: 'common practice for ballasted temporary structures (EN 1997-1 Table A.1 EQU gives about 1.67 effective)',
  sliding: 'HSE research report RR071 "Friction in temporary works" (2003): at least 2.0 on lateral load carried by friction',
  uplift: 'common practice for ballasted temporary structures',
};

/** Sums of one side that do not depend on the wind. */
export interface SideCoefficients {
  /** Σ cf·A: horizontal force per unit q, m² (N/Pa). */
  forceAreaM2: number;
  /** Σ cf·A·h: overturning moment per unit q, m³ (N·m/Pa). */
  momentVolumeM3: number;
  /** g Σ m·lever about this side's tipping edge, N·m. */
  weightMomentNm: number;
}

/** A structure reduced to what its stability depends on: compute once, evaluate per gust. */
export interface StabilityCoefficients {
  front: SideCoefficients;
  back: SideCoefficients;
  /** c_lift·A_plan: uplift per unit q, m² (N/Pa); 0 without uplift. */
  upliftAreaM2: number;
  /** g Σ m, N. */
  weightN: number;
  baseDepthM: number;
  frictionCoefficient: number;
  safetyFactors: SafetyFactors;
}

export type Utilizations = Record<Criterion, number> & { governing: number };

/** One side at one gust. Utilizations are Infinity when that resistance is gone (≤ 0). */
export interface SideStability {
  side: Side;
  horizontalForceN: number;
  upliftN: number;
  overturningMomentNm: number;
  /** g Σ m·lever − F_up·d/2, N·m: may be ≤ 0 (then overturning is unbounded). */
  restoringMomentNm: number;
  utilization: Utilizations;
  /** The criterion with the highest utilization (first of overturning, sliding, uplift on a tie). */
  governing: Criterion;
}

export interface LimitGust {
  /** Lowest gust at which a utilization reaches 1 (Infinity when no load grows with the wind), m/s. */
  gustMps: number;
  side: Side;
  criterion: Criterion;
}

function checkedNumber(caller: string, name: string, value: number, min: number, max: number, unit = ''): number {
  assertInRange(caller, name, value, min, max, unit);
  return value;
}

/**
 * The wind-independent sums of a structure (see the module comment). Checks every number and
 * throws a RangeError naming the offending field: a NaN here would hide a failure.
 */
export function stabilityCoefficients(structure: ExpandedStructure): StabilityCoefficients {
  const caller = 'stabilityCoefficients';
  const baseDepthM = structure.baseDepthM;
  assertAbove(caller, 'baseDepthM', baseDepthM, 0, 200, 'm');
  assertAbove(caller, 'frictionCoefficient', structure.frictionCoefficient, 0, 1);
  for (const criterion of criteria) {
    assertInRange(caller, `safetyFactors.${criterion}`, structure.safetyFactors[criterion], 1, 5);
  }
  if (structure.faces.length === 0) throw new RangeError(`${caller}: faces must list at least one face, got none`);

  const front = { forceAreaM2: 0, momentVolumeM3: 0, weightMomentNm: 0 };
  const back = { forceAreaM2: 0, momentVolumeM3: 0, weightMomentNm: 0 };
  structure.faces.forEach((face, index) => {
    const areaM2 = checkedNumber(caller, `faces.${index}.areaM2`, face.areaM2, 0, 40_000, 'm²');
    const heightM = checkedNumber(caller, `faces.${index}.centroidHeightM`, face.centroidHeightM, 0, 200, 'm');
    const cfFront = checkedNumber(caller, `faces.${index}.cfFront`, face.cfFront, 0, 4);
    const cfBack = checkedNumber(caller, `faces.${index}.cfBack`, face.cfBack, 0, 4);
    front.forceAreaM2 += cfFront * areaM2;
    front.momentVolumeM3 += cfFront * areaM2 * heightM;
    back.forceAreaM2 += cfBack * areaM2;
    back.momentVolumeM3 += cfBack * areaM2 * heightM;
  });

  let weightN = 0;
  structure.masses.forEach((mass, index) => {
    const massKg = checkedNumber(caller, `masses.${index}.massKg`, mass.massKg, 0, 1e6, 'kg');
    const xM = checkedNumber(caller, `masses.${index}.xM`, mass.xM, 0, baseDepthM, 'm (within the base)');
    const massWeightN = standardGravityMps2 * massKg;
    weightN += massWeightN;
    front.weightMomentNm += massWeightN * (baseDepthM - xM);
    back.weightMomentNm += massWeightN * xM;
  });

  let upliftAreaM2 = 0;
  if (structure.uplift) {
    const planAreaM2 = checkedNumber(caller, 'uplift.planAreaM2', structure.uplift.planAreaM2, 0, 40_000, 'm²');
    upliftAreaM2 = planAreaM2 * checkedNumber(caller, 'uplift.liftCoefficient', structure.uplift.liftCoefficient, 0, 4);
  }
  if (structure.ratedGustMps !== undefined) assertAbove(caller, 'ratedGustMps', structure.ratedGustMps, 0, 120, 'm/s');

  return {
    front,
    back,
    upliftAreaM2,
    weightN,
    baseDepthM,
    frictionCoefficient: structure.frictionCoefficient,
    safetyFactors: { ...structure.safetyFactors },
  };
}

/** demand/capacity, unbounded (Infinity) when the capacity is gone (≤ 0), as design §2.3 says. */
function utilizationRatio(demand: number, capacity: number): number {
  return capacity > 0 ? demand / capacity : Infinity;
}

function governingCriterion(utilization: Record<Criterion, number>): Criterion {
  let governing: Criterion = 'overturning';
  for (const criterion of criteria) if (utilization[criterion] > utilization[governing]) governing = criterion;
  return governing;
}

/**
 * One side of a structure at dynamic pressure `qPa`. `horizontalShare` (0..1, default 1) scales
 * the load on the faces only: in directional assessment the faces see the normal component
 * ((v_n/v)², see direction.ts) while roof uplift keeps the full gust.
 */
export function sideStability(coefficients: StabilityCoefficients, side: Side, qPa: number, horizontalShare = 1): SideStability {
  const { upliftAreaM2, weightN, baseDepthM, frictionCoefficient, safetyFactors } = coefficients;
  const sums = coefficients[side];
  const faceQPa = qPa * horizontalShare;
  const horizontalForceN = sums.forceAreaM2 * faceQPa;
  const overturningMomentNm = sums.momentVolumeM3 * faceQPa;
  const upliftN = upliftAreaM2 * qPa;
  const restoringMomentNm = sums.weightMomentNm - (upliftN * baseDepthM) / 2;
  // Runs per reading and structure: two objects, nothing else allocated.
  const utilization: Utilizations = {
    overturning: utilizationRatio(safetyFactors.overturning * overturningMomentNm, restoringMomentNm),
    sliding: utilizationRatio(safetyFactors.sliding * horizontalForceN, frictionCoefficient * (weightN - upliftN)),
    uplift: utilizationRatio(safetyFactors.uplift * upliftN, weightN),
    governing: 0,
  };
  const governing = governingCriterion(utilization);
  utilization.governing = utilization[governing];
  return { side, horizontalForceN, upliftN, overturningMomentNm, restoringMomentNm, utilization, governing };
}

export interface StabilityAtPressure {
  qPa: number;
  front: SideStability;
  back: SideStability;
  /** The side with the higher governing utilization (front on a tie). */
  governingSide: Side;
}

/** Both sides at dynamic pressure `qPa`, and which governs. */
export function stabilityAtPressure(coefficients: StabilityCoefficients, qPa: number): StabilityAtPressure {
  const front = sideStability(coefficients, 'front', qPa);
  const back = sideStability(coefficients, 'back', qPa);
  const governingSide: Side = back.utilization.governing > front.utilization.governing ? 'back' : 'front';
  return { qPa, front, back, governingSide };
}

/** Both sides of a structure at one gust (m/s) in air of density `airDensityKgM3`. */
export function stabilityAtGust(structure: ExpandedStructure, gustMps: number, airDensityKgM3: number): StabilityAtPressure {
  assertInRange('stabilityAtGust', 'gustMps', gustMps, 0, 120, 'm/s');
  assertAirDensity('stabilityAtGust', airDensityKgM3);
  return stabilityAtPressure(stabilityCoefficients(structure), dynamicPressurePa(gustMps, airDensityKgM3));
}

/** numerator/denominator for a limit q: 0 when there is no resistance, Infinity when nothing loads it. */
function limitQuotient(resistance: number, loadPerQ: number): number {
  if (resistance <= 0) return 0;
  return loadPerQ > 0 ? resistance / loadPerQ : Infinity;
}

/**
 * The dynamic pressure (Pa) at which each criterion of one side reaches utilization `fraction`
 * (1 for the limit): the closed forms of the module comment with every γ divided by `fraction`.
 * Where a utilization jumps (a side with no face load: U_ot goes from 0 to unbounded when uplift
 * eats the restoring moment) this is the pressure of the jump, the lowest q with U ≥ fraction.
 */
export function criterionPressuresPa(
  coefficients: StabilityCoefficients,
  side: Side,
  fraction = 1,
  horizontalShare = 1,
): Record<Criterion, number> {
  const { upliftAreaM2: b, weightN, baseDepthM, frictionCoefficient: mu, safetyFactors } = coefficients;
  const sums = coefficients[side];
  const scale = 1 / fraction;
  return {
    overturning: limitQuotient(
      sums.weightMomentNm,
      safetyFactors.overturning * scale * sums.momentVolumeM3 * horizontalShare + (b * baseDepthM) / 2,
    ),
    sliding: limitQuotient(mu * weightN, safetyFactors.sliding * scale * sums.forceAreaM2 * horizontalShare + mu * b),
    uplift: limitQuotient(weightN, safetyFactors.uplift * scale * b),
  };
}

/** Lowest entry over both sides and all criteria (front before back, criteria in order, on a tie). */
function lowestPressure(coefficients: StabilityCoefficients, fraction: number): { qPa: number; side: Side; criterion: Criterion } {
  let lowest = { qPa: Infinity, side: 'front' as Side, criterion: 'overturning' as Criterion };
  for (const side of sides) {
    const pressures = criterionPressuresPa(coefficients, side, fraction);
    for (const criterion of criteria) {
      if (pressures[criterion] < lowest.qPa) lowest = { qPa: pressures[criterion], side, criterion };
    }
  }
  return lowest;
}

/** The calculated limit: the lowest gust at which any utilization of either side reaches 1. */
export function calculatedLimitGust(structure: ExpandedStructure, airDensityKgM3: number): LimitGust {
  assertAirDensity('calculatedLimitGust', airDensityKgM3);
  const { qPa, side, criterion } = lowestPressure(stabilityCoefficients(structure), 1);
  return { gustMps: speedForDynamicPressureMps(qPa, airDensityKgM3), side, criterion };
}

/** Per-side limit gusts (m/s) of each criterion: for the report. */
export function sideLimitGustsMps(coefficients: StabilityCoefficients, side: Side, airDensityKgM3: number): Record<Criterion, number> {
  const pressures = criterionPressuresPa(coefficients, side);
  return {
    overturning: speedForDynamicPressureMps(pressures.overturning, airDensityKgM3),
    sliding: speedForDynamicPressureMps(pressures.sliding, airDensityKgM3),
    uplift: speedForDynamicPressureMps(pressures.uplift, airDensityKgM3),
  };
}

/** Effective limit gust, m/s: the lower of the calculated limit and the rated gust (design §2.3). */
export function effectiveLimitGustMps(structure: ExpandedStructure, airDensityKgM3: number): number {
  const calculatedMps = calculatedLimitGust(structure, airDensityKgM3).gustMps;
  return structure.ratedGustMps === undefined ? calculatedMps : Math.min(calculatedMps, structure.ratedGustMps);
}

/**
 * The gust (m/s) at which the governing utilization first reaches `fraction` (level triggers,
 * design §2.4), solved exactly per criterion. Without uplift it is limit·√fraction (60 % →
 * 0.7746·limit); with uplift it is higher than that shortcut says, as the resistance falls too.
 */
export function gustForUtilizationMps(structure: ExpandedStructure, fraction: number, airDensityKgM3: number): number {
  assertAbove('gustForUtilizationMps', 'fraction', fraction, 0, 10);
  assertAirDensity('gustForUtilizationMps', airDensityKgM3);
  const { qPa } = lowestPressure(stabilityCoefficients(structure), fraction);
  return speedForDynamicPressureMps(qPa, airDensityKgM3);
}

/**
 * Extra mass (kg) at `xM` across the base that brings the governing utilization at the design
 * gust to exactly 1; 0 when it is already ≤ 1. Every criterion improves with mass, so each is
 * solved for the mass it needs and the largest governs:
 *   overturning Δm = (γ_ot C q + B q d/2 − M_w) / (g·lever),  sliding Δm = (γ_sl A q/μ + B q − W) / g,
 *   uplift Δm = (γ_up B q − W) / g.
 * Infinity when no mass at `xM` can help: a side that needs more restoring moment while `xM` sits
 * on its tipping edge (lever 0) — put the ballast elsewhere.
 */
export function requiredBallastKg(structure: ExpandedStructure, designGustMps: number, airDensityKgM3: number, xM: number): number {
  const caller = 'requiredBallastKg';
  assertInRange(caller, 'designGustMps', designGustMps, 0, 120, 'm/s');
  assertAirDensity(caller, airDensityKgM3);
  assertInRange(caller, 'xM', xM, 0, structure.baseDepthM, 'm (within the base)');
  const coefficients = stabilityCoefficients(structure);
  const { upliftAreaM2: b, weightN, baseDepthM, frictionCoefficient: mu, safetyFactors } = coefficients;
  const qPa = dynamicPressurePa(designGustMps, airDensityKgM3);
  const upliftN = b * qPa;

  let neededWeightN = Math.max(
    (safetyFactors.sliding * coefficients.front.forceAreaM2 * qPa) / mu + upliftN - weightN,
    (safetyFactors.sliding * coefficients.back.forceAreaM2 * qPa) / mu + upliftN - weightN,
    safetyFactors.uplift * upliftN - weightN,
    0,
  );
  for (const side of sides) {
    const leverM = side === 'front' ? baseDepthM - xM : xM;
    const sums = coefficients[side];
    const momentDeficitNm = safetyFactors.overturning * sums.momentVolumeM3 * qPa + (upliftN * baseDepthM) / 2 - sums.weightMomentNm;
    if (momentDeficitNm <= 0) continue;
    if (leverM <= 0) return Infinity;
    neededWeightN = Math.max(neededWeightN, momentDeficitNm / leverM);
  }
  return neededWeightN / standardGravityMps2;
}
