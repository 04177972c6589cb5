/**
 * The per-structure assessment the live watch runs (design §5 v2), with the functions the
 * calculator (assess.ts) takes its headline figures from, so a card and the calculator cannot
 * disagree. A record is expanded once and its stability in every direction reduced to the
 * governing k of each part and direction (every utilization is k·q, stability.ts); at a gust
 * this gives the effective and calculated utilization and the case that governs, and at a density
 * the calculated and effective limits (design §2.3: the effective limit is the lower of the
 * calculated limit and the rated gust; the effective utilization is max(U, (v / v_rated)²)).
 *
 * Pure: no clock, no I/O. Gusts are capped at the plausible top speed (limits.ts) before use, as a
 * reading above it is refused at ingest.
 */
import { dynamicPressurePa } from './dynamicPressure.ts';
import { expandStructure } from './kinds/index.ts';
import { maxPlausibleSpeedMps } from './limits.ts';
import type { StructureRecord } from './record.ts';
import { stabilityCoefficients, type Criterion, type Edge } from './stability.ts';
import {
  calculatedLimitGustMps,
  compactGoverningCase,
  compactStability,
  effectiveLimitMps,
  effectiveUtilization,
  governingCase,
  utilizationAtPa,
  withRating,
  type AssessedDirections,
  type CompactStability,
  type Stability,
} from './utilization.ts';

/** A record made ready for assessment at any gust and density (everything that depends on the record only). */
export interface LiveStructure {
  /** Governing k of every part and direction (utilization.ts `CompactStability`). */
  stability: CompactStability;
  /** Height the gust is transferred to, m (the structure's top unless set). */
  referenceHeightM: number;
  ratedGustMps: number | null;
  /** Sentences of the engine about this record (a strip record: ends not checked). */
  warnings: readonly string[];
}

/** Expands and reduces a valid record (validateStructureRecord); throws on a record the engine cannot assess. */
export function liveStructure(record: StructureRecord): LiveStructure {
  const { structure, referenceHeightM, warnings } = expandStructure(record);
  const stability = compactStability(stabilityCoefficients(structure));
  return {
    stability,
    referenceHeightM,
    ratedGustMps: structure.ratedGustMps ?? null,
    warnings: [...(stability.strip ? ['Strip record (no base width): wind onto the ends was not checked.'] : []), ...(warnings ?? [])],
  };
}

/** The limits at one density, over every direction (sector null) or within a sector of them. */
export interface StructureLimits {
  airDensityKgM3: number;
  /** Lowest calculated limit over the directions and parts assessed, m/s (Infinity when none is reached). */
  calculatedLimitGustMps: number;
  /** The effective limit: the lower of the calculated limit and the rating, m/s. */
  limitGustMps: number;
}

export function structureLimits(stability: Stability, airDensityKgM3: number, sector: AssessedDirections = null): StructureLimits {
  return {
    airDensityKgM3,
    calculatedLimitGustMps: calculatedLimitGustMps(stability, airDensityKgM3, sector),
    limitGustMps: effectiveLimitMps(stability, airDensityKgM3, sector),
  };
}

/** The governing case at one gust. */
export interface CaseAtGust {
  /** Effective utilization, max(U, (v / v_rated)²) (Infinity when unbounded). */
  utilization: number;
  /** Calculated utilization U = k·q of the governing case (Infinity when unbounded). */
  calculatedUtilization: number;
  governing: Criterion;
  /** Direction of the governing case, degrees relative to the structure's front. */
  directionDeg: number;
  /** The part that governs: null for the body, else the element's name. */
  element: string | null;
  tippingEdge: Edge;
}

/** Effective utilization at a gust (capped at the plausible top speed), over the directions assessed. */
export function utilizationAtGust(stability: Stability, gustMps: number, airDensityKgM3: number, sector: AssessedDirections = null): number {
  return effectiveUtilization(stability, Math.min(gustMps, maxPlausibleSpeedMps), airDensityKgM3, sector);
}

/** The governing case and its utilizations at a gust (capped at the plausible top speed), over the directions assessed. */
export function caseAtGust(stability: Stability, gustMps: number, airDensityKgM3: number, sector: AssessedDirections = null): CaseAtGust {
  const gust = Math.min(gustMps, maxPlausibleSpeedMps);
  const worst =
    'k' in stability
      ? compactGoverningCase(stability, sector)
      : (() => {
          const found = governingCase(stability, sector);
          return {
            element: found.part.element,
            directionDeg: found.direction.directionDeg,
            criterion: found.direction.governing,
            tippingEdge: found.direction.tippingEdge,
            perPa: found.direction.utilizationPerPa.governing,
          };
        })();
  const calculated = utilizationAtPa(worst.perPa, dynamicPressurePa(gust, airDensityKgM3));
  return {
    utilization: withRating(calculated, gust, stability.ratedGustMps),
    calculatedUtilization: calculated,
    governing: worst.criterion,
    directionDeg: worst.directionDeg,
    element: worst.element,
    tippingEdge: worst.tippingEdge,
  };
}
