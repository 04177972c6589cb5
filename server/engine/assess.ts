/**
 * The calculator (design §2.8, §4 v2): a structure record, a gust at the structure and a density
 * give loads, utilizations of every direction and every element, and the limit. This is the
 * report people and scripts read, and the one the live watch's numbers must agree with.
 *
 * The top-level figures are those of the governing case: the part (the body or an element) and
 * the direction with the highest governing utilization (design §4 v2). JSON has no Infinity, so
 * wherever the engine's number is Infinity the report has null:
 * - a utilization is null when it is unbounded (its resistance is gone, e.g. a restoring moment
 *   ≤ 0 against a positive wind moment); the matching `unbounded` flag is true and the margin null;
 * - a limit gust is null when no gust reaches it (nothing that grows with the wind loads it).
 */
import { assertAirDensity, isaSeaLevelDensityKgM3 } from './air.ts';
import { governingWords } from './caseWords.ts';
import { dynamicPressurePa } from './dynamicPressure.ts';
import { expandStructure, type SourceNote } from './kinds/index.ts';
import { maxPlausibleSpeedMps } from './limits.ts';
import { assertInRange } from './rangeCheck.ts';
import type { StructureKind, StructureRecord } from './record.ts';
import {
  criteria,
  edgeWords,
  stabilityCoefficients,
  type BodyCoefficients,
  type Criterion,
  type DirectionCoefficients,
  type Edge,
  type StabilityCoefficients,
} from './stability.ts';
import { structureLimits, utilizationAtGust } from './liveAssessment.ts';
import { directionUtilizations, governingCase, gustAtPerPaMps } from './utilization.ts';
import type { ExpandedStructure } from './structure.ts';

/** A number, or null for Infinity (see the module comment). */
export type Bounded = number | null;

export interface UtilizationReport {
  overturning: Bounded;
  sliding: Bounded;
  uplift: Bounded;
  governing: Bounded;
}

/** One direction of one part at the gust. */
export interface DirectionReport {
  directionDeg: number;
  /** The part this entry is for: null for the body, else the element's name. */
  element: string | null;
  horizontalForceN: number;
  upliftN: number;
  /** M_h,e + M_u,e about the edge the overturning check tips about, N·m. */
  overturningMomentNm: number;
  /** M_w,e about that edge, N·m. */
  restoringMomentNm: number;
  tippingEdge: Edge;
  utilization: UtilizationReport;
  governing: Criterion;
  calculatedLimitGustMps: Bounded;
  /** The uplift case assessed in this direction (tent roofs: by the windward wall), if any. */
  upliftCase: string | null;
}

/** One element of a kind: its governing direction's figures, and all of its directions. */
export interface ElementReport extends Omit<DirectionReport, 'element'> {
  name: string;
  governingDirectionDeg: number;
  directions: DirectionReport[];
}

export interface AssessmentReport {
  name: string;
  kind: StructureKind;
  gustMps: number;
  airDensityKgM3: number;
  qPa: number;
  /** |F⃗| of the governing case, N. */
  horizontalForceN: number;
  upliftN: number;
  overturningMomentNm: number;
  restoringMomentNm: number;
  utilization: UtilizationReport;
  /** True where the utilization is unbounded (null above). */
  unbounded: Record<Criterion | 'governing', boolean>;
  governing: Criterion;
  /** θ of the governing case, degrees relative to the front. */
  governingDirectionDeg: number;
  /** The governing part: null for the whole body, else the element's name. */
  governingElement: string | null;
  /** The edge the governing case tips about (for overturning). */
  governingEdge: Edge;
  /** What governs, in words ("wind onto the y = 0 end: sliding"). */
  governingText: string;
  /** max(U_governing, (v / v_rated)²): what margins, capacity and levels use (design §2.3). */
  effectiveUtilization: Bounded;
  /** 1 − effective utilization; null when unbounded. */
  margin: Bounded;
  /** Lowest gust at which any utilization of any part and direction reaches 1, m/s. */
  calculatedLimitGustMps: Bounded;
  /** The effective limit: the lower of the calculated limit and the rated gust, m/s. */
  limitGustMps: Bounded;
  limitGovernedBy: 'calculated' | 'rated';
  /** Every direction assessed, sorted; each the worst part in that direction. */
  directions: DirectionReport[];
  elements: ElementReport[];
  warnings: string[];
  expanded: ExpandedStructure & { referenceHeightM: number; totalMassKg: number };
  sources: SourceNote[];
  notes: string[];
}

export interface AssessmentOptions {
  /** Gust at the structure itself (no height transfer), m/s. */
  gustMps: number;
  /** kg/m³; default ISA sea level, 1.225 (design §4). */
  airDensityKgM3?: number | undefined;
  /** The azimuth the structure's front faces, degrees: names sides by compass point when given. */
  frontAzimuthDeg?: number | null | undefined;
}

function bounded(value: number): Bounded {
  return Number.isFinite(value) ? value : null;
}

function utilizationReport(direction: DirectionCoefficients, qPa: number): UtilizationReport {
  const u = directionUtilizations(direction, qPa);
  return { overturning: bounded(u.overturning), sliding: bounded(u.sliding), uplift: bounded(u.uplift), governing: bounded(u.governing) };
}

function directionReport(part: BodyCoefficients, direction: DirectionCoefficients, qPa: number, airDensityKgM3: number): DirectionReport {
  const edge = direction.tippingEdge;
  return {
    directionDeg: direction.directionDeg,
    element: part.element,
    horizontalForceN: direction.forcePerPaM2 * qPa,
    upliftN: direction.upliftPerPaM2 * qPa,
    overturningMomentNm: direction.windMomentPerPaM3[edge] * qPa,
    restoringMomentNm: direction.restoringMomentNm[edge],
    tippingEdge: edge,
    utilization: utilizationReport(direction, qPa),
    governing: direction.governing,
    calculatedLimitGustMps: bounded(gustAtPerPaMps(direction.utilizationPerPa.governing, 1, airDensityKgM3)),
    upliftCase: direction.upliftLabel,
  };
}

/** Per direction, the part with the highest k (the body on a tie). */
function worstPerDirection(coefficients: StabilityCoefficients, qPa: number, airDensityKgM3: number): DirectionReport[] {
  return coefficients.body.directions.map((bodyDirection, index) => {
    let part = coefficients.body;
    let direction = bodyDirection;
    for (const element of coefficients.elements) {
      const candidate = element.directions[index]!;
      if (candidate.utilizationPerPa.governing > direction.utilizationPerPa.governing) {
        part = element;
        direction = candidate;
      }
    }
    return directionReport(part, direction, qPa, airDensityKgM3);
  });
}

function elementReport(part: BodyCoefficients, qPa: number, airDensityKgM3: number): ElementReport {
  const directions = part.directions.map((direction) => directionReport(part, direction, qPa, airDensityKgM3));
  const worst = part.directions.reduce((a, b) => (b.utilizationPerPa.governing > a.utilizationPerPa.governing ? b : a));
  const { element: _element, ...figures } = directionReport(part, worst, qPa, airDensityKgM3);
  return { name: part.element!, governingDirectionDeg: worst.directionDeg, ...figures, directions };
}

/**
 * The report of a prepared structure (its coefficients) at one gust: what the calculator answers
 * and what the watch, the structure page and the log show.
 */
export function assessCoefficients(
  coefficients: StabilityCoefficients,
  gustMps: number,
  airDensityKgM3: number,
  frontAzimuthDeg: number | null = null,
): Omit<AssessmentReport, 'name' | 'kind' | 'expanded' | 'sources' | 'notes'> {
  assertInRange('assessCoefficients', 'gustMps', gustMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertAirDensity('assessCoefficients', airDensityKgM3);
  const qPa = dynamicPressurePa(gustMps, airDensityKgM3);
  const governing = governingCase(coefficients);
  const top = directionReport(governing.part, governing.direction, qPa, airDensityKgM3);
  // The headline figures come from the functions the live watch runs (liveAssessment.ts).
  const limits = structureLimits(coefficients, airDensityKgM3);
  const calculatedLimitMps = limits.calculatedLimitGustMps;
  const rated = coefficients.ratedGustMps;
  const ratedGoverns = rated !== null && rated < calculatedLimitMps;
  const effective = utilizationAtGust(coefficients, gustMps, airDensityKgM3);
  const unbounded = { overturning: false, sliding: false, uplift: false, governing: top.utilization.governing === null };
  for (const criterion of criteria) unbounded[criterion] = top.utilization[criterion] === null;
  const warnings: string[] = [];
  if (coefficients.body.strip) {
    warnings.push(
      'No baseWidthM: the record is a strip, so only the front and back edges were checked; wind onto the ends (tipping about an end edge) was not checked. Give baseWidthM.',
    );
  }
  if (unbounded.governing) {
    warnings.push(`Nothing resists ${edgeWords[top.tippingEdge]} tipping in the governing case: the utilization is unbounded. Check the mass positions.`);
  }
  return {
    gustMps,
    airDensityKgM3,
    qPa,
    horizontalForceN: top.horizontalForceN,
    upliftN: top.upliftN,
    overturningMomentNm: top.overturningMomentNm,
    restoringMomentNm: top.restoringMomentNm,
    utilization: top.utilization,
    unbounded,
    governing: top.governing,
    governingDirectionDeg: top.directionDeg,
    governingElement: governing.part.element,
    governingEdge: top.tippingEdge,
    governingText: governingWords({
      element: governing.part.element,
      directionDeg: top.directionDeg,
      criterion: top.governing,
      tippingEdge: top.tippingEdge,
      frontAzimuthDeg,
      strip: coefficients.body.strip,
    }),
    effectiveUtilization: bounded(effective),
    margin: bounded(1 - effective),
    calculatedLimitGustMps: bounded(calculatedLimitMps),
    limitGustMps: bounded(limits.limitGustMps),
    limitGovernedBy: ratedGoverns ? 'rated' : 'calculated',
    directions: worstPerDirection(coefficients, qPa, airDensityKgM3),
    elements: coefficients.elements.map((element) => elementReport(element, qPa, airDensityKgM3)),
    warnings,
  };
}

/**
 * Loads, utilizations and limits of a valid record at one gust (see `validateStructureRecord`).
 *
 * @example assessStructure(screenRecord, { gustMps: 20 }).limitGustMps
 */
export function assessStructure(record: StructureRecord, options: AssessmentOptions): AssessmentReport {
  const { gustMps, airDensityKgM3 = isaSeaLevelDensityKgM3, frontAzimuthDeg = null } = options;
  const expansion = expandStructure(record);
  const structure = expansion.structure;
  const report = assessCoefficients(stabilityCoefficients(structure), gustMps, airDensityKgM3, frontAzimuthDeg);
  return {
    name: record.name,
    kind: record.kind,
    ...report,
    warnings: [...report.warnings, ...(expansion.warnings ?? [])],
    expanded: {
      ...structure,
      referenceHeightM: expansion.referenceHeightM,
      totalMassKg: structure.masses.reduce((sumKg, mass) => sumKg + mass.massKg, 0),
    },
    sources: expansion.sources,
    notes: expansion.notes,
  };
}

