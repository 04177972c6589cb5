/**
 * What a structure's stability coefficients (stability.ts) give at a gust. Every utilization is
 * U = k·q (q = ½ρv²), so everything here is closed-form in k: utilization at a dynamic pressure,
 * the governing case (the part and direction with the highest k, within a sector of directions
 * when the site assesses by direction), the compact form the live watch keeps of the coefficients,
 * calculated and effective limit gusts (the rating, design §2.3), and the gust at a fraction of
 * capacity: v_lim = √(2/(ρk)), fraction f at v_lim·√f.
 */
import { assertAirDensity } from './air.ts';
import { dynamicPressurePa, speedForDynamicPressureMps } from './dynamicPressure.ts';
import { inSector, wrappedDeg, type DirectionSector } from './directions.ts';
import { assertAbove } from './rangeCheck.ts';
import {
  criteria,
  edges,
  stabilityCoefficients,
  type BodyCoefficients,
  type Criterion,
  type DirectionCoefficients,
  type Edge,
  type StabilityCoefficients,
  type Utilizations,
} from './stability.ts';
import type { ExpandedStructure } from './structure.ts';

/** The worst direction (and part) of a structure, by k: the same at every gust, since U = k·q. */
export interface GoverningCase {
  part: BodyCoefficients;
  direction: DirectionCoefficients;
}

/** k × q, with an unbounded k giving 0 at q = 0 (no wind, no load) and Infinity above. */
export function utilizationAtPa(perPaValue: number, qPa: number): number {
  if (qPa === 0) return 0;
  return perPaValue * qPa;
}

/** Utilizations of one direction at dynamic pressure q. */
export function directionUtilizations(direction: DirectionCoefficients, qPa: number): Utilizations {
  const k = direction.utilizationPerPa;
  return {
    overturning: utilizationAtPa(k.overturning, qPa),
    sliding: utilizationAtPa(k.sliding, qPa),
    uplift: utilizationAtPa(k.uplift, qPa),
    governing: utilizationAtPa(k.governing, qPa),
  };
}

/** Relative direction of the wind, or the sector of directions to assess: null = every direction. */
export type AssessedDirections = DirectionSector | null;

/** Parts of the structure: the body first, then its elements. */
export function parts(coefficients: StabilityCoefficients): BodyCoefficients[] {
  return [coefficients.body, ...coefficients.elements];
}

/**
 * Where the highest k is: part p and direction d with the highest `kAt(p, d)`, over the directions
 * within `sector` (all when null), the first direction and then the body on a tie. A sector holds
 * at least one of the 15° directions when it is 7.5° wide or more; a narrower one falls back to the
 * direction assessed nearest its centre. One search for the calculator's full coefficients and the
 * watch's compact ones.
 */
function highestK(
  directionsDeg: ArrayLike<number>,
  partCount: number,
  kAt: (part: number, direction: number) => number,
  sector: AssessedDirections,
): { part: number; direction: number } {
  let best = { part: -1, direction: -1, k: -Infinity };
  let nearest = 0;
  for (let d = 0; d < directionsDeg.length; d++) {
    if (sector !== null && !inSector(directionsDeg[d]!, sector)) {
      if (Math.abs(wrappedDeg(directionsDeg[d]! - sector.centreDeg)) < Math.abs(wrappedDeg(directionsDeg[nearest]! - sector.centreDeg))) nearest = d;
      continue;
    }
    for (let p = 0; p < partCount; p++) {
      const k = kAt(p, d);
      if (best.part < 0 || k > best.k) best = { part: p, direction: d, k };
    }
  }
  if (best.part >= 0) return best;
  let part = 0;
  for (let p = 1; p < partCount; p++) if (kAt(p, nearest) > kAt(part, nearest)) part = p;
  return { part, direction: nearest };
}

/**
 * The governing case: the part and direction with the highest k (within `sector` when given).
 * Since every U = k·q this is the governing case at every gust.
 */
export function governingCase(coefficients: StabilityCoefficients, sector: AssessedDirections = null): GoverningCase {
  const all = parts(coefficients);
  const directions = coefficients.body.directions;
  const found = highestK(
    directions.map((direction) => direction.directionDeg),
    all.length,
    (p, d) => all[p]!.directions[d]!.utilizationPerPa.governing,
    sector,
  );
  const part = all[found.part]!;
  return { part, direction: part.directions[found.direction]! };
}

/**
 * What the live watch keeps of a structure's coefficients: per part and direction only the
 * governing k, its criterion and its tipping edge, in typed arrays (a thousand structures with
 * their elements hold tens of thousands of directions). Everything the watch shows follows from
 * these: U = k·q, limits, effective figures, and what governs in words.
 */
export interface CompactStability {
  /** Directions assessed, degrees relative to the front; the same for every part. */
  directionsDeg: Float64Array;
  /** Part names: null for the body, then the elements'. */
  parts: ReadonlyArray<string | null>;
  /** Governing k of part p in direction d at [p · directions + d], 1/Pa. */
  k: Float64Array;
  /** Index into `criteria` of that governing k. */
  criterion: Uint8Array;
  /** Index into `edges` of the edge that case tips about. */
  edge: Uint8Array;
  strip: boolean;
  ratedGustMps: number | null;
}

export function compactStability(coefficients: StabilityCoefficients): CompactStability {
  const all = parts(coefficients);
  const count = coefficients.body.directions.length;
  const k = new Float64Array(all.length * count);
  const criterion = new Uint8Array(all.length * count);
  const edge = new Uint8Array(all.length * count);
  all.forEach((part, p) =>
    part.directions.forEach((direction, d) => {
      k[p * count + d] = direction.utilizationPerPa.governing;
      criterion[p * count + d] = criteria.indexOf(direction.governing);
      edge[p * count + d] = edges.indexOf(direction.tippingEdge);
    }),
  );
  return {
    directionsDeg: Float64Array.from(coefficients.body.directions, (direction) => direction.directionDeg),
    parts: all.map((part) => part.element),
    k,
    criterion,
    edge,
    strip: coefficients.body.strip,
    ratedGustMps: coefficients.ratedGustMps,
  };
}

export interface CompactCase {
  readonly element: string | null;
  readonly directionDeg: number;
  readonly criterion: Criterion;
  readonly tippingEdge: Edge;
  readonly perPa: number;
}

/**
 * The case over every direction, kept per structure: it does not move with the wind (every
 * utilization is k·q), and the live watch asks for it for every structure whose gust moved.
 * A compact stability is never changed once built (compactStability).
 */
const allDirectionsCase = new WeakMap<CompactStability, CompactCase>();

/** The governing case of a compact structure: part, direction, criterion, edge and k (the first on a tie). */
export function compactGoverningCase(stability: CompactStability, sector: AssessedDirections = null): CompactCase {
  if (sector === null) {
    const kept = allDirectionsCase.get(stability);
    if (kept !== undefined) return kept;
  }
  const count = stability.directionsDeg.length;
  const found = highestK(stability.directionsDeg, stability.parts.length, (p, d) => stability.k[p * count + d]!, sector);
  const index = found.part * count + found.direction;
  const worst: CompactCase = {
    element: stability.parts[found.part]!,
    directionDeg: stability.directionsDeg[found.direction]!,
    criterion: criteria[stability.criterion[index]!]!,
    tippingEdge: edges[stability.edge[index]!]!,
    perPa: stability.k[index]!,
  };
  if (sector === null) allDirectionsCase.set(stability, worst);
  return worst;
}

/** The structure's coefficients, full (the calculator's) or compact (the watch's). */
export type Stability = StabilityCoefficients | CompactStability;

/** The highest governing k (1/Pa) of the structure, within the sector when given. */
export function governingPerPa(stability: Stability, sector: AssessedDirections = null): number {
  if ('k' in stability) return compactGoverningCase(stability, sector).perPa;
  return governingCase(stability, sector).direction.utilizationPerPa.governing;
}

/** The gust (m/s) at which utilization k·q reaches `fraction`: √(2f/(ρk)); Infinity when k = 0, 0 when unbounded. */
export function gustAtPerPaMps(perPaValue: number, fraction: number, airDensityKgM3: number): number {
  if (perPaValue <= 0) return Infinity;
  if (!Number.isFinite(perPaValue)) return 0;
  return speedForDynamicPressureMps(fraction / perPaValue, airDensityKgM3);
}

/** The calculated limit gust (m/s): the lowest over parts, directions and criteria (within the sector). */
export function calculatedLimitGustMps(coefficients: Stability, airDensityKgM3: number, sector: AssessedDirections = null): number {
  assertAirDensity('calculatedLimitGustMps', airDensityKgM3);
  return gustAtPerPaMps(governingPerPa(coefficients, sector), 1, airDensityKgM3);
}

/** The effective limit (design §2.3): the lower of the calculated limit and the rated gust, m/s. */
export function effectiveLimitMps(coefficients: Stability, airDensityKgM3: number, sector: AssessedDirections = null): number {
  const calculated = calculatedLimitGustMps(coefficients, airDensityKgM3, sector);
  return coefficients.ratedGustMps === null ? calculated : Math.min(calculated, coefficients.ratedGustMps);
}

/** The effective utilization from the calculated one: max(U, (v / v_rated)²) (design §2.3). */
export function withRating(calculatedUtilization: number, gustMps: number, ratedGustMps: number | null): number {
  if (ratedGustMps === null) return calculatedUtilization;
  const ratio = gustMps / ratedGustMps;
  return Math.max(calculatedUtilization, ratio * ratio);
}

/** Effective utilization at a gust: max(U, (v / v_rated)²) (design §2.3). */
export function effectiveUtilization(coefficients: Stability, gustMps: number, airDensityKgM3: number, sector: AssessedDirections = null): number {
  return withRating(utilizationAtPa(governingPerPa(coefficients, sector), dynamicPressurePa(gustMps, airDensityKgM3)), gustMps, coefficients.ratedGustMps);
}

/** The gust (m/s) at which the effective utilization reaches `fraction` of capacity: v_lim,eff·√f. */
export function gustAtFractionMps(coefficients: Stability, fraction: number, airDensityKgM3: number, sector: AssessedDirections = null): number {
  assertAbove('gustAtFractionMps', 'fraction', fraction, 0, 10);
  return effectiveLimitMps(coefficients, airDensityKgM3, sector) * Math.sqrt(fraction);
}

/** The whole-structure effective limit from an expanded structure, m/s (compute coefficients once where it matters). */
export function effectiveLimitGustMps(structure: ExpandedStructure, airDensityKgM3: number): number {
  return effectiveLimitMps(stabilityCoefficients(structure), airDensityKgM3);
}

/** The gust at which a fraction of the effective capacity is reached, from an expanded structure. */
export function gustForUtilizationMps(structure: ExpandedStructure, fraction: number, airDensityKgM3: number): number {
  return gustAtFractionMps(stabilityCoefficients(structure), fraction, airDensityKgM3);
}
