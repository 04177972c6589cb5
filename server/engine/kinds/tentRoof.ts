/**
 * The tent's roof lift (kinds/tent.ts), design §2.4 v2.
 *
 * Roof lift depends on the direction and the openings (`upliftCases`). One case per windward
 * side, centred on its normal 0/90/180/270 with a half-width of 60°: a side counts as windward
 * within 60° of its normal, as for ψ. In corner wind, within 60° of two adjacent sides' normals
 * (45° ± 15° between them), both are windward: where both are open, their openings together are
 * the dominant windward face (a second windward opening raises c_pi, never lowers it), in two
 * more cases centred on the corner, one with each side's Figure 7.8 zones (EN gives the zones for
 * wind square onto a side only; the worse of the two governs). Several cases applying are
 * alternatives and the worst governs (stability.ts). In each case:
 * - external suction by the zones of EN 1991-1-4 §7.2.5 (Figure 7.8, Tables 7.4a/b, c_pe,10) for
 *   a duopitch roof, each zone at the envelope of the pitch rows 5°–45° (from memory:
 *   coefficients.ts `tentRoofSuction`), with e = min(b, 2h), h the ridge height;
 * - internal pressure by §7.2.9 (from memory of the clause, references.md §10): a dominant opening
 *   on the windward face (its area at least twice the other openings) gives c_pi = 0.75·c_pe, at
 *   least three times 0.90·c_pe (linear between), below twice still 0.75·c_pe (conservative), with
 *   c_pe = +0.8 at the windward wall (Table 7.1 zone D); no windward opening: c_pi = +0.2 (the more
 *   onerous of +0.2 / −0.3 for lift, Note 2);
 * - all four sides open is a canopy (§7.3): net lift 1.5 over the plan at its centre (coefficients.ts).
 * The resultant is placed at the centroid of the zones' lift, so it sits toward the windward
 * zones (F, G at the windward edge), not at the middle of the base.
 *
 * The frames (tentFrames.ts) take their strips' share of the same cases.
 */
import type { DirectionalUplift } from '../structure.ts';
import { defaultCoefficients, tentRoofSuction, type SourcedValue, type TentRoofZone } from './coefficients.ts';
import { givenCoefficient, type SourceNote } from './recordBase.ts';
import {
  areaOf,
  ontoWords,
  overlap,
  round,
  sideFacingDeg,
  sideWords,
  tentSides,
  windWords,
  type Plan,
  type Rect,
  type SideState,
  type TentSide,
} from './tentPlan.ts';

/** A side counts as windward within this angle of its normal (as ψ gives full force within 60°). */
const windwardHalfWidthDeg = 60;
/** Two adjacent sides (normals 90° apart) are both windward within this angle of their bisector: 60° − 45° = 15°. */
const cornerHalfWidthDeg = windwardHalfWidthDeg - 45;
/** The corners: two adjacent sides, in the order of their normals, and the bisector of the normals. */
const tentCorners: ReadonlyArray<{ sides: readonly [TentSide, TentSide]; centreDeg: number }> = [
  { sides: ['front', 'endYW'], centreDeg: 45 },
  { sides: ['endYW', 'back'], centreDeg: 135 },
  { sides: ['back', 'endY0'], centreDeg: 225 },
  { sides: ['endY0', 'front'], centreDeg: 315 },
];

/** A corner of the tent: two adjacent sides and the bisector of their normals. */
export type TentCorner = (typeof tentCorners)[number];

/** A roof zone: a plan rectangle and its external suction (−c_pe, ≥ 0 lifts). */
export interface RoofZone extends Rect {
  zone: TentRoofZone;
  suction: number;
}

/**
 * The roof zones of EN 1991-1-4 Figure 7.8 for wind onto `windward`, in plan coordinates. In the
 * wind's own coordinates, u runs downwind from the windward edge and v across; b is the crosswind
 * size, d the along-wind depth and e = min(b, 2h):
 * - across the ridge (onto a long wall): F in the corners e/4 × e/10 at the windward eave, G between
 *   them, H the rest of the windward slope; J a strip e/10 leeward of the ridge, I the rest;
 * - along the ridge (onto a gable end): F in the corners e/4 × e/10 at the windward gable, G
 *   between them, H from e/10 to e/2, I beyond.
 */
function roofZones(windward: TentSide, plan: Plan): RoofZone[] {
  const across = windward === 'front' || windward === 'back';
  const b = across ? plan.lengthM : plan.widthM;
  const d = across ? plan.widthM : plan.lengthM;
  const e = Math.min(b, 2 * plan.ridgeHeightM);
  const values = across ? tentRoofSuction.acrossRidge : tentRoofSuction.alongRidge;
  const inWind: Array<{ zone: TentRoofZone; u0: number; u1: number; v0: number; v1: number }> = [];
  if (across) {
    const strip = Math.min(e / 10, d / 2);
    const ridgeStrip = Math.min(e / 10, d / 2);
    inWind.push(
      { zone: 'F', u0: 0, u1: strip, v0: 0, v1: e / 4 },
      { zone: 'G', u0: 0, u1: strip, v0: e / 4, v1: b - e / 4 },
      { zone: 'F', u0: 0, u1: strip, v0: b - e / 4, v1: b },
      { zone: 'H', u0: strip, u1: d / 2, v0: 0, v1: b },
      { zone: 'J', u0: d / 2, u1: d / 2 + ridgeStrip, v0: 0, v1: b },
      { zone: 'I', u0: d / 2 + ridgeStrip, u1: d, v0: 0, v1: b },
    );
  } else {
    const strip = Math.min(e / 10, d);
    const hEnd = Math.min(e / 2, d);
    inWind.push(
      { zone: 'F', u0: 0, u1: strip, v0: 0, v1: e / 4 },
      { zone: 'G', u0: 0, u1: strip, v0: e / 4, v1: b - e / 4 },
      { zone: 'F', u0: 0, u1: strip, v0: b - e / 4, v1: b },
      { zone: 'H', u0: strip, u1: hEnd, v0: 0, v1: b },
      { zone: 'I', u0: hEnd, u1: d, v0: 0, v1: b },
    );
  }
  const { lengthM: L, widthM: w } = plan;
  return inWind
    .map(({ zone, u0, u1, v0, v1 }): RoofZone => {
      const suction = (values as Record<string, SourcedValue>)[zone]!.value;
      switch (windward) {
        case 'front':
          return { zone, suction, x0: u0, x1: u1, y0: v0, y1: v1 };
        case 'back':
          return { zone, suction, x0: w - u1, x1: w - u0, y0: v0, y1: v1 };
        case 'endYW':
          return { zone, suction, x0: v0, x1: v1, y0: L - u1, y1: L - u0 };
        case 'endY0':
          return { zone, suction, x0: v0, x1: v1, y0: u0, y1: u1 };
      }
    })
    .filter((zone) => areaOf(zone) > 0);
}

/** Net lift of one windward case over a plan rectangle: Σ (suction + c_pi) · area, and its centroid. */
interface LiftOver {
  /** Net lift per unit dynamic pressure, m² (N/Pa). */
  perPaM2: number;
  xM: number;
  yM: number;
}

export interface RoofCase {
  /** The sides counted as the windward face: one side, or two adjacent ones in corner wind. */
  windward: readonly TentSide[];
  /** The side whose Figure 7.8 zones are laid out (the wind taken square onto it). */
  zonesFrom: TentSide;
  /** The directions the case applies to: within halfWidthDeg of centreDeg. */
  centreDeg: number;
  halfWidthDeg: number;
  /** The wind in words ("wind onto the front"), for labels and notes. */
  words: string;
  /** Internal pressure coefficient, and in words how it was found. */
  internal: { cpi: number; text: string };
  /** Canopy (all sides open): a uniform net lift instead of zones plus internal pressure. */
  canopyLift: number | null;
  zones: RoofZone[];
}

/** The net lift of a roof case over a plan rectangle and the centroid of that lift. */
export function liftOver(roofCase: RoofCase, rect: Rect): LiftOver {
  const area = areaOf(rect);
  const centreX = (rect.x0 + rect.x1) / 2;
  const centreY = (rect.y0 + rect.y1) / 2;
  if (roofCase.canopyLift !== null) return { perPaM2: roofCase.canopyLift * area, xM: centreX, yM: centreY };
  let perPaM2 = roofCase.internal.cpi * area;
  let momentX = perPaM2 * centreX;
  let momentY = perPaM2 * centreY;
  for (const zone of roofCase.zones) {
    const part = overlap(zone, rect);
    const partArea = areaOf(part);
    if (partArea <= 0) continue;
    const lift = zone.suction * partArea;
    perPaM2 += lift;
    momentX += lift * ((part.x0 + part.x1) / 2);
    momentY += lift * ((part.y0 + part.y1) / 2);
  }
  return perPaM2 > 0 ? { perPaM2, xM: momentX / perPaM2, yM: momentY / perPaM2 } : { perPaM2: 0, xM: centreX, yM: centreY };
}

/** Area of the opening an open side leaves below the eave, m². */
function openingAreaM2(side: TentSide, plan: Plan, eaveHeightM: number): number {
  return (side === 'front' || side === 'back' ? plan.lengthM : plan.widthM) * eaveHeightM;
}

/**
 * c_pi for wind onto `windward` (EN 1991-1-4 §7.2.9, from memory of the clause): one side, or
 * two adjacent sides that are both windward in corner wind (their open areas then count together
 * as the dominant windward face). With a windward side open, ratio R of the windward openings to
 * all other openings: R ≥ 3 → 0.90·c_pe, 2..3 linear from 0.75, below 2 still 0.75·c_pe
 * (conservative: the clause's no-dominant-face rule would give less for flow-through); c_pe = +0.8
 * at the windward wall (Table 7.1 zone D), kept at a wall 45° off the wind too (conservative).
 * Windward side(s) closed: +0.2 (Note 2: the more onerous of +0.2 and −0.3 for lift), whatever
 * else is open.
 */
export function tentInternalPressure(
  windward: TentSide | readonly TentSide[],
  states: Record<TentSide, SideState>,
  plan: Plan,
  eaveHeightM: number,
): { cpi: number; ratio: number | null; text: string } {
  const windwardSides: readonly TentSide[] = typeof windward === 'string' ? [windward] : windward;
  const open = windwardSides.filter((side) => states[side] === 'open');
  if (open.length === 0) {
    const closedCpi = defaultCoefficients.tentInternalPressure.value;
    return { cpi: closedCpi, ratio: null, text: `${windwardSides.map((side) => sideWords[side]).join(' and ')} closed: c_pi = +${closedCpi}` };
  }
  const windwardAreaM2 = open.reduce((sum, side) => sum + openingAreaM2(side, plan, eaveHeightM), 0);
  const otherAreaM2 = tentSides
    .filter((side) => !windwardSides.includes(side) && states[side] === 'open')
    .reduce((sum, side) => sum + openingAreaM2(side, plan, eaveHeightM), 0);
  const ratio = otherAreaM2 > 0 ? windwardAreaM2 / otherAreaM2 : Infinity;
  const twice = defaultCoefficients.tentDominantOpeningTwice.value;
  const thrice = defaultCoefficients.tentDominantOpeningThrice.value;
  const factor = ratio >= 3 ? thrice : ratio <= 2 ? twice : twice + (thrice - twice) * (ratio - 2);
  const cpi = factor * defaultCoefficients.tentWindwardWallPressure.value;
  const which = open.length > 1 ? `${open.map((side) => sideWords[side]).join(' and ')} open, both windward` : `${sideWords[open[0]!]} open`;
  const ratioText = Number.isFinite(ratio) ? `${round(ratio)}× the other openings` : open.length > 1 ? 'the only openings' : 'the only opening';
  return {
    cpi,
    ratio: Number.isFinite(ratio) ? ratio : null,
    text: `${which} (${ratioText}): c_pi = ${round(factor)} · 0.8 = +${round(cpi)}`,
  };
}

/** Keep c_lift within the engine's 0..4 by widening the area where a scaled coefficient would pass 4 (same force). */
export function upliftOf(areaM2: number, perPaM2: number): { planAreaM2: number; liftCoefficient: number } {
  if (areaM2 <= 0) return { planAreaM2: 0, liftCoefficient: 0 };
  const lift = perPaM2 / areaM2;
  return lift <= 4 ? { planAreaM2: areaM2, liftCoefficient: lift } : { planAreaM2: perPaM2 / 4, liftCoefficient: 4 };
}

/**
 * The roof cases of a tent with these sides: one per windward side, and in corner wind with both
 * sides open, two more per corner (module comment).
 */
export function tentRoofCases(
  states: Record<TentSide, SideState>,
  plan: Plan,
  eaveHeightM: number,
): { cases: RoofCase[]; openCorners: TentCorner[] } {
  const allOpen = tentSides.every((side) => states[side] === 'open');
  const caseOf = (windward: readonly TentSide[], zonesFrom: TentSide, centreDeg: number, halfWidthDeg: number, words: string): RoofCase => ({
    windward,
    zonesFrom,
    centreDeg,
    halfWidthDeg,
    words,
    internal: tentInternalPressure(windward, states, plan, eaveHeightM),
    canopyLift: allOpen ? defaultCoefficients.tentCanopyLift.value : null,
    zones: allOpen ? [] : roofZones(zonesFrom, plan),
  });
  const cases: RoofCase[] = tentSides.map((side) => caseOf([side], side, sideFacingDeg[side], windwardHalfWidthDeg, windWords[side]));
  // All sides open is a canopy, whose lift does not depend on the openings: no corner cases.
  const openCorners = allOpen ? [] : tentCorners.filter((corner) => corner.sides.every((side) => states[side] === 'open'));
  for (const corner of openCorners) {
    const [first, second] = corner.sides;
    for (const zonesFrom of corner.sides) {
      cases.push(
        caseOf(corner.sides, zonesFrom, corner.centreDeg, cornerHalfWidthDeg, `corner wind onto ${ontoWords[first]} and ${ontoWords[second]}, zones as onto ${ontoWords[zonesFrom]}`),
      );
    }
  }
  return { cases, openCorners };
}

/** What a roof case's lift rests on, in words: the canopy or the internal pressure found. */
export function roofCaseBasis(roofCase: RoofCase): string {
  return roofCase.canopyLift !== null ? 'all sides open: canopy' : roofCase.internal.text;
}

/**
 * The body's roof lift in every case, at the resultant of the zones' lift, with a source for each;
 * and the scale of each case when the record gives its own area-averaged lift coefficient (which
 * the frames' shares take too).
 */
export function tentRoofLift(
  cases: readonly RoofCase[],
  plan: Plan,
  givenLift: number | undefined,
  coefficientSource: string | undefined,
): { scales: number[]; upliftCases: DirectionalUplift[]; sources: SourceNote[] } {
  const { lengthM, widthM } = plan;
  const planAreaM2 = lengthM * widthM;
  const whole: Rect = { x0: 0, x1: widthM, y0: 0, y1: lengthM };
  // A given coefficient replaces each case's area average, keeping the default model's distribution.
  const scales = cases.map((roofCase) => {
    if (givenLift === undefined) return 1;
    const resultant = liftOver(roofCase, whole);
    return resultant.perPaM2 > 0 ? (givenLift * planAreaM2) / resultant.perPaM2 : 0;
  });
  const liftSources: SourceNote[] = [];
  const upliftCases: DirectionalUplift[] = cases.map((roofCase, index) => {
    const resultant = liftOver(roofCase, whole);
    const perPaM2 = resultant.perPaM2 * scales[index]!;
    const basis = roofCaseBasis(roofCase);
    liftSources.push(
      givenLift === undefined
        ? {
            item: `net roof lift, area average, ${roofCase.words} (${basis})`,
            value: perPaM2 / planAreaM2,
            source:
              roofCase.canopyLift !== null
                ? defaultCoefficients.tentCanopyLift.source
                : 'roof zones of EN 1991-1-4 Figure 7.8 with the suctions of tentRoofSuction, plus c_pi of §7.2.9 (from memory); see the items above',
          }
        : givenCoefficient(`net roof lift, area average, ${roofCase.words}`, givenLift, coefficientSource),
    );
    return {
      label: `roof lift, ${roofCase.words} (${basis})`,
      ...upliftOf(planAreaM2, perPaM2),
      xM: resultant.xM,
      yM: resultant.yM,
      centreDeg: roofCase.centreDeg,
      halfWidthDeg: roofCase.halfWidthDeg,
    };
  });
  return { scales, upliftCases, sources: liftSources };
}

/** The sources of the roof model: the zones' suctions and the internal pressures, and the corner-wind rule when it applies. */
export function tentRoofSources(allOpen: boolean, openCorners: readonly TentCorner[]): SourceNote[] {
  const roofSources: SourceNote[] = [];
  if (!allOpen) {
    for (const [direction, values] of [
      ['across the ridge (θ = 0°)', tentRoofSuction.acrossRidge],
      ['along the ridge (θ = 90°)', tentRoofSuction.alongRidge],
    ] as const) {
      for (const [zone, value] of Object.entries(values)) {
        roofSources.push({ item: `roof suction −c_pe,10 zone ${zone}, wind ${direction}`, value: value.value, source: value.source });
      }
    }
    roofSources.push(
      { item: 'c_pe windward wall (at a windward opening)', ...defaultCoefficients.tentWindwardWallPressure },
      { item: 'c_pi / c_pe, dominant opening ≥ 2× the others (and below 2×, conservative)', ...defaultCoefficients.tentDominantOpeningTwice },
      { item: 'c_pi / c_pe, dominant opening ≥ 3× the others', ...defaultCoefficients.tentDominantOpeningThrice },
      { item: 'c_pi with the windward side closed', ...defaultCoefficients.tentInternalPressure },
    );
  }
  if (openCorners.length > 0) {
    roofSources.push({
      item: 'corner wind: two adjacent open sides together as the dominant windward face, within ± this many degrees of the corner',
      value: cornerHalfWidthDeg,
      source:
        'EN 1991-1-4 §7.2.9 dominant face (from memory of the clause), applied to two faces that are both windward (both within 60° of the wind, as for ψ): ' +
        'an interpretation on the safe side (a second windward opening raises c_pi), with c_pe +0.8 kept at both openings and each side’s Figure 7.8 zones tried',
    });
  }
  return roofSources;
}
