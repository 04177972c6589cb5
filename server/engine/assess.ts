/**
 * The calculator (design §2.5, §4): a structure record, a gust at the structure and a density
 * give loads, utilizations and the limit. This is the report people and scripts read.
 *
 * JSON has no Infinity, so wherever the engine's number is Infinity the report has null:
 * - a utilization is null when it is unbounded (its resistance is gone, e.g. the restoring moment
 *   is ≤ 0); the matching `unbounded` flag is true and the margin is null;
 * - a limit gust is null when no gust reaches it (nothing that grows with the wind loads it).
 */
import { assertAirDensity, isaSeaLevelDensityKgM3 } from './air.ts';
import { dynamicPressurePa } from './dynamicPressure.ts';
import { expandStructure, type SourceNote } from './kinds/index.ts';
import { assertInRange } from './rangeCheck.ts';
import type { StructureKind, StructureRecord } from './record.ts';
import {
  calculatedLimitGust,
  criteria,
  sideLimitGustsMps,
  stabilityAtPressure,
  stabilityCoefficients,
  type Criterion,
  type Side,
  type SideStability,
  type StabilityCoefficients,
} from './stability.ts';
import type { ExpandedStructure } from './structure.ts';

/** A number, or null for Infinity (see the module comment). */
export type Bounded = number | null;

export interface UtilizationReport {
  overturning: Bounded;
  sliding: Bounded;
  uplift: Bounded;
  governing: Bounded;
}

export interface SideReport {
  side: Side;
  horizontalForceN: number;
  upliftN: number;
  overturningMomentNm: number;
  restoringMomentNm: number;
  utilization: UtilizationReport;
  /** True where the utilization is unbounded (null above). */
  unbounded: Record<Criterion | 'governing', boolean>;
  governing: Criterion;
  /** 1 − governing utilization; null when unbounded. */
  margin: Bounded;
  /** Gust at which each criterion of this side reaches utilization 1, m/s. */
  limitGustMps: Record<Criterion, Bounded>;
}

export interface AssessmentReport extends Omit<SideReport, 'limitGustMps'> {
  name: string;
  kind: StructureKind;
  gustMps: number;
  airDensityKgM3: number;
  qPa: number;
  /** Lowest gust at which any utilization of either side reaches 1, m/s. */
  calculatedLimitGustMps: Bounded;
  /** Side and criterion of the calculated limit. */
  calculatedLimit: { side: Side; criterion: Criterion };
  /** The effective limit: the lower of the calculated limit and the rated gust, m/s. */
  limitGustMps: Bounded;
  limitGovernedBy: 'calculated' | 'rated';
  sides: Record<Side, SideReport>;
  expanded: ExpandedStructure & { referenceHeightM: number; totalMassKg: number };
  sources: SourceNote[];
  notes: string[];
}

export interface AssessmentOptions {
  /** Gust at the structure itself (no height transfer), m/s. */
  gustMps: number;
  /** kg/m³; default ISA sea level, 1.225 (design §4). */
  airDensityKgM3?: number | undefined;
}

function bounded(value: number): Bounded {
  return Number.isFinite(value) ? value : null;
}

function sideReport(stability: SideStability, coefficients: StabilityCoefficients, airDensityKgM3: number): SideReport {
  const { utilization } = stability;
  const limits = sideLimitGustsMps(coefficients, stability.side, airDensityKgM3);
  const unbounded = { overturning: false, sliding: false, uplift: false, governing: !Number.isFinite(utilization.governing) };
  for (const criterion of criteria) unbounded[criterion] = !Number.isFinite(utilization[criterion]);
  return {
    side: stability.side,
    horizontalForceN: stability.horizontalForceN,
    upliftN: stability.upliftN,
    overturningMomentNm: stability.overturningMomentNm,
    restoringMomentNm: stability.restoringMomentNm,
    utilization: {
      overturning: bounded(utilization.overturning),
      sliding: bounded(utilization.sliding),
      uplift: bounded(utilization.uplift),
      governing: bounded(utilization.governing),
    },
    unbounded,
    governing: stability.governing,
    margin: bounded(1 - utilization.governing),
    limitGustMps: { overturning: bounded(limits.overturning), sliding: bounded(limits.sliding), uplift: bounded(limits.uplift) },
  };
}

/**
 * Loads, utilizations and limits of a valid record at one gust (see `validateStructureRecord`).
 * The top-level numbers are the governing side's (design §4 contract); `sides` has both.
 *
 * @example assessStructure(screenRecord, { gustMps: 20 }).horizontalForceN // 10 584 N for a 6 × 4 m screen
 */
export function assessStructure(record: StructureRecord, options: AssessmentOptions): AssessmentReport {
  const { gustMps, airDensityKgM3 = isaSeaLevelDensityKgM3 } = options;
  assertInRange('assessStructure', 'gustMps', gustMps, 0, 120, 'm/s');
  assertAirDensity('assessStructure', airDensityKgM3);
  const expansion = expandStructure(record);
  const structure = expansion.structure;
  const coefficients = stabilityCoefficients(structure);
  const stability = stabilityAtPressure(coefficients, dynamicPressurePa(gustMps, airDensityKgM3));
  const sides = {
    front: sideReport(stability.front, coefficients, airDensityKgM3),
    back: sideReport(stability.back, coefficients, airDensityKgM3),
  };

  const calculated = calculatedLimitGust(structure, airDensityKgM3);
  const rated = structure.ratedGustMps;
  const ratedGoverns = rated !== undefined && rated < calculated.gustMps;
  const { limitGustMps: _sideLimits, ...governingNumbers } = sides[stability.governingSide];
  return {
    name: record.name,
    kind: record.kind,
    gustMps,
    airDensityKgM3,
    qPa: stability.qPa,
    ...governingNumbers,
    calculatedLimitGustMps: bounded(calculated.gustMps),
    calculatedLimit: { side: calculated.side, criterion: calculated.criterion },
    limitGustMps: bounded(ratedGoverns ? rated : calculated.gustMps),
    limitGovernedBy: ratedGoverns ? 'rated' : 'calculated',
    sides,
    expanded: {
      ...structure,
      referenceHeightM: expansion.referenceHeightM,
      totalMassKg: structure.masses.reduce((sumKg, mass) => sumKg + mass.massKg, 0),
    },
    sources: expansion.sources,
    notes: expansion.notes,
  };
}
