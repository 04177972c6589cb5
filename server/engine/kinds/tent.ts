/**
 * Tent (marquee, frame tent), design §2.4 v2: a rectangular plan `lengthM` along the ridge by
 * `widthM` across it, a pitched (duopitch) roof from the eaves to the ridge, legs in two rows
 * along the eaves, and four sides, each closed or open.
 *
 * Frame (design §2.3): the front long wall stands on x = 0 and looks to the structure's front
 * (facingDeg 0), the back long wall on x = widthM (180); the gable ends stand on y = 0 (270) and
 * y = lengthM (90). The base is widthM deep (x) and lengthM wide (y): baseDepthM = widthM,
 * baseWidthM = lengthM. Every direction is assessed (every 15° and each face normal), so nothing
 * depends on which side is the longer: lengthM is the length along the ridge (usually the long
 * side) and a record with widthM > lengthM is a short tent with a wide span, assessed the same way.
 *
 * Faces (F = c_f·q·A·ψ, normal to the face, stability.ts):
 * - each long wall lengthM × eaveHeightM at eave/2; each gable end widthM × eave plus its
 *   triangle ½·widthM·rise, at the centroid of the composite area; the roof's side elevation
 *   lengthM × rise (a pitched roof seen broadside) at eave + rise/2, both ways (facing 0, c_f on
 *   both sides).
 * - A closed tent is a closed box: its drag in a direction is the whole body's, windward pressure
 *   and leeward suction together. That drag is carried by the windward wall alone: a wall's front
 *   (outside) takes the closed-elevation c_f (1.80, a conservative stand-in: coefficients.ts), and
 *   its back (inside) takes nothing, since wind never reaches a closed tent's wall from inside.
 *   Leeward walls are not loaded again, so the body drag is counted once.
 * - An open side has no wall face (the wind passes through; the frame's members are neglected),
 *   unless `coefficients.openWallCf` gives one (mesh or scrim sides).
 * - With the side opposite a wall open, the wind enters there and pushes that wall from inside
 *   (internal pressure plus the external suction on its outside): the wall's back side then also
 *   takes the wall's c_f. So a tent with its windward side open keeps the full drag, carried by
 *   the leeward wall — conservative: about 0.9·0.8 + 0.5 ≈ 1.2 by EN 1991-1-4 §7.2.9 and Table 7.1
 *   zone E (from memory) against the 1.80 taken.
 * - The gable triangle above the eave is part of the roof cover and stays when the end wall below
 *   it is open (common practice for frame tents: the walls hang below the eave); it then takes the
 *   roof's c_f on its own, by the same rules.
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
 * Elements, the portal frames (issue 11 item 7; an engineering review found that a leg checked on
 * its tributary lift alone misses the frame's overturning couple, which is what lifts a windward
 * leg): a frame is the pair of legs across the span at one y with its rafters, standing on a strip
 * as deep as the span (its two legs at x = 0 and x = widthM). Common practice for frame tents,
 * assumed here: the roof and wall cover carry their load to the frames by tributary width (half a
 * bay either side of a frame). A frame element carries:
 * - its bay's share of the long walls and the roof's side elevation (one bay for an interior
 *   frame, half a bay for an end frame), by the body's rules, and at an end frame the whole of its
 *   gable end (with its triangle): the cover hangs from the frame and stakes are not credited, and
 *   bracing, eave rails and purlins are not credited with spreading the gable's push along the
 *   ridge to the other frames, so an end frame's own feet take it (conservative: a braced end bay
 *   would share it with the next frame's feet);
 * - the net roof lift on its tributary strip in every roof case, with the zone distribution along
 *   the ridge (the end bay under a windward gable takes the F, G and H zones), at the strip's
 *   centroid of lift;
 * - its two legs' ballast and its share of the self-weight, half at each leg.
 * A frame is checked for tipping in its own plane and uplift, not for sliding: the eave rails and
 * purlins tie it to the other frames, so the tent slides as a whole (the body's check, on the
 * vector sum of every face, the gable push included).
 * Its overturning about the leeward leg line is the windward leg's uplift: with the leeward leg as
 * the pivot, the leg's tension is (M_h + M_lift)/widthM and the check γ·(M_h + M_lift)/(W_leg·widthM)
 * is γ·T/W_leg. Its out-of-plane tipping (about a line along the span) is not checked on the
 * frame (a strip: its ends are not checked): out of plane a frame stands by the eave rails,
 * purlins and bracing that tie it to the others, so that is the whole body's tipping about its
 * gable-end edges. "portal frame (interior)" is, in each roof case, the most loaded interior frame
 * (all interior frames have the same faces and masses; where no single frame has the most lift
 * and the largest moments about both leg lines, two entries envelope them); "end frame at the
 * y = 0 end" is the end frame there, and the one at y = lengthM is the same by symmetry unless the
 * two gable ends differ, when it is assessed too. Self-weight credited: an interior frame W_s/N
 * (N frames), an end frame W_s·(bay/2)/lengthM; whatever the split of the self-weight between
 * frames (the same for every frame) and cover (by plan area), neither exceeds the frame's own share.
 */
import { z } from 'zod';
import { count, coefficient, dimensionM, massKg } from '../recordFields.ts';
import type { DirectionalUplift, Element, Face, Mass } from '../structure.ts';
import { defaultCoefficients, tentRoofSuction, type SourcedValue, type TentRoofZone } from './coefficients.ts';
import { chosenCoefficient, givenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion, type SourceNote } from './recordBase.ts';

/** The four sides of a tent, named as the base edges they stand on (stability.ts `Edge`). */
export const tentSides = ['front', 'endYW', 'back', 'endY0'] as const;
export type TentSide = (typeof tentSides)[number];
export type SideState = 'closed' | 'open';

/** Which way each side looks, relative to the front (design §2.3). */
const sideFacingDeg: Readonly<Record<TentSide, number>> = { front: 0, endYW: 90, back: 180, endY0: 270 };
const oppositeSide: Readonly<Record<TentSide, TentSide>> = { front: 'back', back: 'front', endY0: 'endYW', endYW: 'endY0' };
const sideWords: Readonly<Record<TentSide, string>> = {
  front: 'front wall',
  back: 'back wall',
  endY0: 'gable end at y = 0',
  endYW: 'gable end at y = lengthM',
};
const windWords: Readonly<Record<TentSide, string>> = {
  front: 'wind onto the front',
  back: 'wind onto the back',
  endY0: 'wind onto the y = 0 gable end',
  endYW: 'wind onto the y = lengthM gable end',
};
const ontoWords: Readonly<Record<TentSide, string>> = {
  front: 'the front',
  back: 'the back',
  endY0: 'the y = 0 gable end',
  endYW: 'the y = lengthM gable end',
};

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
/** Beyond this many legs, each row's legs are listed as one mass at the row's middle (same moments). */
const legsListedSingly = 150;
/** Below this roof pitch the roof is flat for EN 1991-1-4 (§7.2.3) and the duopitch zones do not strictly apply. */
const lowestDuopitchDeg = 5;
/** Element names (the y = baseWidthM end is the tent's y = lengthM end; caseWords names both ends by compass). */
export const tentElementNames = {
  interior: 'portal frame (interior)',
  endY0: 'end frame at the y = 0 end',
  endYW: 'end frame at the y = baseWidthM end',
} as const;

const sideState = () => z.enum(['closed', 'open']);

export const tentRecordSchema = z
  .strictObject({
    kind: z.literal('tent'),
    ...recordBaseShape,
    /**
     * Length along the ridge, m: the front and back long walls and the two rows of legs run this
     * way (the base width, from the y = 0 gable end to the y = lengthM gable end). Usually the long
     * side; every wind direction is assessed, so a span wider than the length is accepted.
     */
    lengthM: dimensionM(),
    /** Span across the ridge, m: the width of each gable end and the base depth between the two rows of legs. */
    widthM: dimensionM(),
    /** Height of the eaves (the top of the walls) above the ground, m. */
    eaveHeightM: dimensionM(),
    /** Height of the ridge above the ground, m (≥ eaveHeightM; the roof rises from the eaves to the ridge). */
    ridgeHeightM: dimensionM(),
    /**
     * All four sides closed (true) or all open (false). `sides` sets them one by one and wins
     * where both are given; between them every side must be given.
     */
    wallsClosed: z.boolean().optional(),
    /**
     * Each side closed or open: a side with its wall removed, rolled up, or a door or panel open in
     * it is open (an opening on the windward side raises the roof lift: EN 1991-1-4 §7.2.9).
     */
    sides: z
      .strictObject({
        /** The front long wall (x = 0, along the length, facing the structure's front): closed or open. */
        front: sideState().optional(),
        /** The back long wall (x = widthM, facing away from the front): closed or open. */
        back: sideState().optional(),
        /** The gable end at y = 0, whose outward normal is the front's azimuth − 90° (the west end when the front faces north): closed or open. */
        endY0: sideState().optional(),
        /** The gable end at y = lengthM, whose outward normal is the front's azimuth + 90° (the east end when the front faces north): closed or open. */
        endYW: sideState().optional(),
      })
      .optional(),
    /** Number of legs, an even number in two rows along the long walls, evenly spaced from end to end. */
    legs: count(4),
    /** Ballast on each leg (weights, water barrels), kg. */
    ballastPerLegKg: massKg(),
    /** Frame, cover and floor that move with the tent, kg: acts at the middle of the base. */
    selfWeightKg: massKg(),
    coefficients: z
      .strictObject({
        /** Force coefficient c_f of a closed wall or gable end (default 1.80, conservative). */
        wallCf: coefficient().optional(),
        /** Force coefficient c_f of an open side (mesh, scrim, the frame), on the wall's area (default 0: nothing). */
        openWallCf: coefficient().optional(),
        /** Force coefficient c_f of the roof's elevations: its side rise and the gable triangles (default 1.80). */
        roofCf: coefficient().optional(),
        /**
         * Net roof lift coefficient, area-averaged over the plan, in every direction (default: per
         * direction from the roof zones and the openings); its resultant and the frames' shares keep
         * the default model's distribution.
         */
        liftCoefficient: coefficient().optional(),
      })
      .optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    if (record.ridgeHeightM < record.eaveHeightM) {
      ctx.addIssue({ code: 'custom', path: ['ridgeHeightM'], message: `must be ≥ eaveHeightM (${record.eaveHeightM} m)` });
    }
    if (record.wallsClosed === undefined) {
      for (const side of tentSides) {
        if (record.sides?.[side] === undefined) {
          ctx.addIssue({
            code: 'custom',
            path: ['sides', side],
            message: "must be 'closed' or 'open' (or give wallsClosed for every side not listed)",
          });
        }
      }
    }
    if (record.legs % 2 !== 0) {
      ctx.addIssue({ code: 'custom', path: ['legs'], message: 'must be even: the legs stand in two rows along the long walls' });
    }
    if (record.selfWeightKg + record.legs * record.ballastPerLegKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['ballastPerLegKg'], message: 'total mass must be > 0 kg: give the self-weight or the ballast' });
    }
  });

export type TentRecord = z.infer<typeof tentRecordSchema>;

/** Each side's state: `sides` where given, else `wallsClosed` (the schema ensures one of them is). */
export function resolvedTentSides(record: Pick<TentRecord, 'sides' | 'wallsClosed'>): Record<TentSide, SideState> {
  const fallback: SideState | undefined = record.wallsClosed === undefined ? undefined : record.wallsClosed ? 'closed' : 'open';
  const resolve = (side: TentSide): SideState => {
    const state = record.sides?.[side] ?? fallback;
    if (state === undefined) throw new RangeError(`expandTent: sides.${side} is not given and neither is wallsClosed`);
    return state;
  };
  return { front: resolve('front'), endYW: resolve('endYW'), back: resolve('back'), endY0: resolve('endY0') };
}

/** A rectangle in plan, m: x from the front edge, y from the y = 0 end. */
interface Rect {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

/** A roof zone: a plan rectangle and its external suction (−c_pe, ≥ 0 lifts). */
interface RoofZone extends Rect {
  zone: TentRoofZone;
  suction: number;
}

/** The roof in plan and the ridge height (EN Figure 7.8: h, the height to the ridge; the higher h gives the wider edge zones). */
interface Plan {
  lengthM: number;
  widthM: number;
  ridgeHeightM: number;
}

function areaOf(rect: Rect): number {
  return Math.max(0, rect.x1 - rect.x0) * Math.max(0, rect.y1 - rect.y0);
}

function overlap(a: Rect, b: Rect): Rect {
  return { x0: Math.max(a.x0, b.x0), x1: Math.min(a.x1, b.x1), y0: Math.max(a.y0, b.y0), y1: Math.min(a.y1, b.y1) };
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

interface RoofCase {
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

function liftOver(roofCase: RoofCase, rect: Rect): LiftOver {
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
function upliftOf(areaM2: number, perPaM2: number): { planAreaM2: number; liftCoefficient: number } {
  if (areaM2 <= 0) return { planAreaM2: 0, liftCoefficient: 0 };
  const lift = perPaM2 / areaM2;
  return lift <= 4 ? { planAreaM2: areaM2, liftCoefficient: lift } : { planAreaM2: perPaM2 / 4, liftCoefficient: 4 };
}

function round(value: number): number {
  return Math.round(value * 1000) / 1000;
}

/** One frame's net lift per unit q (m²) at xM across the span, for the frame standing at yM. */
export interface FrameLift {
  yM: number;
  perPaM2: number;
  xM: number;
}

/**
 * The lift entries that stand for the worst of several frames with the same faces and masses (the
 * interior frames). A frame's checks grow with its lift (uplift, sliding) and with its lift's
 * moment about each leg line (overturning about the back legs: F·(widthM − x); about the front
 * legs: F·x), so the frame with the most of all three is the worst in every direction: one entry.
 * Where no single frame has the most of all three, two entries, each with the most lift and one
 * leg line's largest moment, are at least as onerous as every frame in every check (the engine
 * takes the worse of the alternatives). With the zones of Figure 7.8 the frames' strips differ only
 * along the ridge and a single frame always has the most; the envelope stands for other layouts.
 */
export function worstFrameLifts(lifts: readonly FrameLift[], widthM: number): Array<{ yM: number | null; perPaM2: number; xM: number; aboutLegs: 'front' | 'back' | null }> {
  if (lifts.length === 0) throw new RangeError('worstFrameLifts: lifts must list at least one frame');
  for (const [index, lift] of lifts.entries()) {
    if (!(lift.perPaM2 >= 0)) throw new RangeError(`worstFrameLifts: lifts.${index}.perPaM2 must be ≥ 0 m², got ${lift.perPaM2}`);
    if (!(lift.xM >= -1e-9 && lift.xM <= widthM + 1e-9)) throw new RangeError(`worstFrameLifts: lifts.${index}.xM must be within 0..${widthM} m, got ${lift.xM}`);
  }
  const clampX = (xM: number) => Math.min(widthM, Math.max(0, xM));
  const near = (value: number, best: number) => value >= best - 1e-9 * Math.max(1, Math.abs(best));
  const mostLift = Math.max(...lifts.map((lift) => lift.perPaM2));
  const mostAboutBack = Math.max(...lifts.map((lift) => lift.perPaM2 * (widthM - lift.xM)));
  const mostAboutFront = Math.max(...lifts.map((lift) => lift.perPaM2 * lift.xM));
  const worst = lifts.find(
    (lift) => near(lift.perPaM2, mostLift) && near(lift.perPaM2 * (widthM - lift.xM), mostAboutBack) && near(lift.perPaM2 * lift.xM, mostAboutFront),
  );
  if (worst !== undefined) return [{ yM: worst.yM, perPaM2: worst.perPaM2, xM: clampX(worst.xM), aboutLegs: null }];
  return [
    { yM: null, perPaM2: mostLift, xM: clampX(widthM - mostAboutBack / mostLift), aboutLegs: 'back' },
    { yM: null, perPaM2: mostLift, xM: clampX(mostAboutFront / mostLift), aboutLegs: 'front' },
  ];
}

/** Which part of the tent a face belongs to: the long walls and roof rise run along the ridge; a gable's faces stand at its end. */
type FacePart = 'alongRidge' | 'endY0' | 'endYW';

export function expandTent(record: TentRecord): Expansion {
  const { lengthM, widthM, eaveHeightM, ridgeHeightM, coefficients, coefficientSource } = record;
  const { settings, sources } = resistanceSettings(record);
  const states = resolvedTentSides(record);
  const plan: Plan = { lengthM, widthM, ridgeHeightM };
  const planAreaM2 = lengthM * widthM;
  const riseM = ridgeHeightM - eaveHeightM;
  const pitchDeg = (Math.atan2(riseM, widthM / 2) * 180) / Math.PI;
  const allOpen = tentSides.every((side) => states[side] === 'open');
  const anyOpen = tentSides.some((side) => states[side] === 'open');
  const warnings: string[] = [];

  // --- Coefficients and their sources.
  const wall = chosenCoefficient('c_f closed wall or gable end (wind on its outside; on its inside when the opposite side is open)', defaultCoefficients.tentElevation, coefficients?.wallCf, coefficientSource);
  const openWall = chosenCoefficient('c_f open side (on the wall area)', defaultCoefficients.tentOpenWall, coefficients?.openWallCf, coefficientSource);
  const roof = chosenCoefficient('c_f roof elevations (side rise lengthM × rise, gable triangles)', defaultCoefficients.tentElevation, coefficients?.roofCf, coefficientSource);
  const faceSources: SourceNote[] = [wall, roof];
  if (anyOpen) faceSources.push(openWall);
  if (anyOpen && coefficients?.wallCf !== undefined && coefficients.openWallCf === undefined) {
    warnings.push('coefficients.wallCf applies to closed sides only; the open sides carry no wall load. Give coefficients.openWallCf if they carry wind (mesh, scrim).');
  }

  // --- Faces, each tagged with the part of the tent it belongs to (for the frames' shares).
  const tagged: Array<{ face: Face; part: FacePart }> = [];
  const sideFace = (side: TentSide, areaM2: number, centroidHeightM: number, cf: number, label: string) => {
    if (areaM2 <= 0 || cf <= 0) return;
    // Front side (outside) when this side is windward; back side (inside) only when the opposite side lets the wind in.
    const inside = states[oppositeSide[side]] === 'open' ? cf : 0;
    const part: FacePart = side === 'front' || side === 'back' ? 'alongRidge' : side;
    tagged.push({ face: { label, areaM2, centroidHeightM, cfFront: cf, cfBack: inside, facingDeg: sideFacingDeg[side] }, part });
  };
  const triangleAreaM2 = (widthM * riseM) / 2;
  const triangleCentroidM = eaveHeightM + riseM / 3;
  for (const side of tentSides) {
    const closed = states[side] === 'closed';
    if (side === 'front' || side === 'back') {
      const label = `${sideWords[side]} (${closed ? 'closed' : 'open'})`;
      sideFace(side, lengthM * eaveHeightM, eaveHeightM / 2, closed ? wall.value : openWall.value, label);
      continue;
    }
    const gableWallM2 = widthM * eaveHeightM;
    if (closed) {
      // The wall and its triangle as one face, at the centroid of the composite area.
      const areaM2 = gableWallM2 + triangleAreaM2;
      const centroidM = (gableWallM2 * (eaveHeightM / 2) + triangleAreaM2 * triangleCentroidM) / areaM2;
      sideFace(side, areaM2, centroidM, wall.value, `${sideWords[side]} (closed, with its gable triangle)`);
    } else {
      sideFace(side, gableWallM2, eaveHeightM / 2, openWall.value, `${sideWords[side]} (open)`);
      sideFace(side, triangleAreaM2, triangleCentroidM, roof.value, `gable triangle above the open ${sideWords[side]}`);
    }
  }
  if (riseM > 0 && roof.value > 0) {
    // A pitched roof seen broadside projects as lengthM × rise, from either long side.
    tagged.push({
      face: { label: 'roof, side elevation', areaM2: lengthM * riseM, centroidHeightM: eaveHeightM + riseM / 2, cfFront: roof.value, cfBack: roof.value, facingDeg: 0 },
      part: 'alongRidge',
    });
  }
  const faces = tagged.map((entry) => entry.face);

  // --- Roof lift: one case per windward side, and in corner wind with both sides open, two more per corner.
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
  const whole: Rect = { x0: 0, x1: widthM, y0: 0, y1: lengthM };
  const givenLift = coefficients?.liftCoefficient;
  // A given coefficient replaces each case's area average, keeping the default model's distribution.
  const scales = cases.map((roofCase) => {
    if (givenLift === undefined) return 1;
    const resultant = liftOver(roofCase, whole);
    return resultant.perPaM2 > 0 ? (givenLift * planAreaM2) / resultant.perPaM2 : 0;
  });
  const basisOf = (roofCase: RoofCase) => (roofCase.canopyLift !== null ? 'all sides open: canopy' : roofCase.internal.text);
  const liftSources: SourceNote[] = [];
  const upliftCases: DirectionalUplift[] = cases.map((roofCase, index) => {
    const resultant = liftOver(roofCase, whole);
    const perPaM2 = resultant.perPaM2 * scales[index]!;
    const basis = basisOf(roofCase);
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

  // --- Masses: the legs at their plan points, the frame and cover at the middle.
  const legsPerRow = record.legs / 2;
  const bayM = lengthM / (legsPerRow - 1);
  const legYsM = Array.from({ length: legsPerRow }, (_, index) => (index === legsPerRow - 1 ? lengthM : index * bayM));
  const masses: Mass[] = [{ label: 'frame and cover', massKg: record.selfWeightKg, xM: widthM / 2, yM: lengthM / 2 }];
  const rows = [
    { name: 'front row', xM: 0 },
    { name: 'back row', xM: widthM },
  ];
  for (const row of rows) {
    if (record.legs <= legsListedSingly) {
      legYsM.forEach((yM, index) => masses.push({ label: `${row.name} leg ${index + 1} ballast`, massKg: record.ballastPerLegKg, xM: row.xM, yM }));
    } else {
      // Equal legs evenly spaced from end to end: their resultant is at the row's middle (same moment about every edge).
      masses.push({ label: `${row.name} ballast (${legsPerRow} legs × ${record.ballastPerLegKg} kg)`, massKg: legsPerRow * record.ballastPerLegKg, xM: row.xM, yM: lengthM / 2 });
    }
  }

  // --- Elements: the portal frames, each on a strip as deep as the span (module comment).
  const { ratedGustMps: _rated, ...elementSettings } = settings;
  const stripOf = (yM: number): Rect => ({ x0: 0, x1: widthM, y0: Math.max(0, yM - bayM / 2), y1: Math.min(lengthM, yM + bayM / 2) });
  const frameNotes: string[] = [];
  const frameElement = (name: string, framesYM: readonly number[], gable: 'endY0' | 'endYW' | null, selfShareKg: number, shareWords: string): Element => {
    const stripLengthM = framesYM.length > 0 ? stripOf(framesYM[0]!).y1 - stripOf(framesYM[0]!).y0 : 0;
    const share = stripLengthM / lengthM;
    const frameFaces: Face[] = tagged
      .filter((entry) => entry.part === 'alongRidge' || entry.part === gable)
      .map(({ face, part }) => (part === 'alongRidge' ? { ...face, label: `${face.label}, ${round(stripLengthM)} m of it`, areaM2: face.areaM2 * share } : face));
    const stripAreaM2 = widthM * stripLengthM;
    const frameCases: DirectionalUplift[] = cases.flatMap((roofCase, index) => {
      const lifts = framesYM.map((yM) => {
        const lift = liftOver(roofCase, stripOf(yM));
        return { yM, perPaM2: lift.perPaM2 * scales[index]!, xM: lift.xM };
      });
      return worstFrameLifts(lifts, widthM).map((worst) => ({
        label: `frame lift, ${roofCase.words} (${basisOf(roofCase)}; ${worst.yM === null ? `envelope of the frames: the largest moment about the ${worst.aboutLegs} legs` : `frame at y = ${round(worst.yM)} m`})`,
        ...upliftOf(stripAreaM2, worst.perPaM2),
        xM: worst.xM,
        centreDeg: roofCase.centreDeg,
        halfWidthDeg: roofCase.halfWidthDeg,
      }));
    });
    const halfShareKg = selfShareKg / 2;
    const legWords = `${record.ballastPerLegKg} kg of ballast and ${round(halfShareKg)} kg of self-weight`;
    frameNotes.push(
      `Element "${name}": ${round(stripLengthM)} m of the long walls and the roof's side elevation${gable === null ? '' : ` and the whole ${sideWords[gable]}`}, ` +
        `the roof lift on its ${round(widthM)} × ${round(stripLengthM)} m strip, and two legs, each with ${legWords} (${shareWords}).`,
    );
    return {
      name,
      baseDepthM: widthM,
      ...elementSettings,
      // Tipping in its own plane and its windward legs lifting; not sliding: the eave rails and
      // purlins tie it to the other frames, so the tent slides as a whole (the body's check).
      checks: ['overturning', 'uplift'],
      faces: frameFaces,
      upliftCases: frameCases,
      masses: [
        { label: `front leg: ${legWords}`, massKg: record.ballastPerLegKg + halfShareKg, xM: 0 },
        { label: `back leg: ${legWords}`, massKg: record.ballastPerLegKg + halfShareKg, xM: widthM },
      ],
    };
  };
  const interiorShareKg = record.selfWeightKg / legsPerRow;
  const endShareKg = (record.selfWeightKg * (bayM / 2)) / lengthM;
  const elements: Element[] = [];
  const interiorYsM = legYsM.slice(1, -1);
  if (interiorYsM.length > 0) {
    elements.push(frameElement(tentElementNames.interior, interiorYsM, null, interiorShareKg, `the self-weight over ${legsPerRow} frames`));
  }
  elements.push(frameElement(tentElementNames.endY0, [0], 'endY0', endShareKg, 'half a bay of the self-weight'));
  if (states.endY0 !== states.endYW) {
    elements.push(frameElement(tentElementNames.endYW, [lengthM], 'endYW', endShareKg, 'half a bay of the self-weight'));
  }

  // --- Sources of the roof model and the frames.
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
  roofSources.push(
    {
      item: 'bay between frames, m (a frame’s tributary width: half a bay either side)',
      value: bayM,
      source: 'common practice for frame tents: the roof and wall cover span between the frames and carry their load to them by tributary width, half a bay either side',
    },
    {
      item: 'share of its gable end’s wind taken by the end frame',
      value: 1,
      source:
        'assumed (conservative): the gable cover hangs from the end frame and stakes are not credited; bracing, eave rails and purlins are not credited with spreading the push along the ridge to the other frames',
    },
    ...(interiorYsM.length > 0
      ? [
          {
            item: 'self-weight credited to an interior frame, kg',
            value: interiorShareKg,
            source: 'assumed (conservative): the self-weight over the frames, W_s/N; no more than a frame’s own share whatever the split between frames and cover',
          },
        ]
      : []),
    {
      item: 'self-weight credited to an end frame, kg',
      value: endShareKg,
      source: 'assumed (conservative): half a bay of the self-weight by plan length, W_s·(bay/2)/lengthM; no more than the end frame’s own share whatever the split',
    },
  );

  if (pitchDeg < lowestDuopitchDeg && !allOpen) {
    warnings.push(
      `Roof pitch ${round(pitchDeg)}° is below 5°: a flat roof for EN 1991-1-4 (§7.2.3, Table 7.2), whose edge zones (F −1.8, H −0.7, from memory) are about 0.1 more onerous than the duopitch values used. Check the roof lift.`,
    );
  }

  const stateWords = tentSides.map((side) => `${sideWords[side]} ${states[side]}`).join(', ');
  const notes = [
    `Plan ${lengthM} m along the ridge (base width, y) × ${widthM} m across it (base depth, x); roof pitch ${round(pitchDeg)}°. Sides: ${stateWords}.`,
    'Closed tent = closed box: the whole body drag (c_f on the elevation) is carried by the windward wall; a wall takes wind on its inside only when the side opposite is open. Open sides carry no wall load.',
    'The gable triangles are roof cover and stay when an end wall is open.',
    allOpen
      ? `All sides open: a canopy (EN 1991-1-4 §7.3), net lift ${defaultCoefficients.tentCanopyLift.value} over the plan at its centre.`
      : 'Roof lift per windward side (within 60° of its normal): EN 1991-1-4 Figure 7.8 zones with the suctions listed, plus c_pi from the openings (§7.2.9); the resultant sits toward the windward zones.' +
          (openCorners.length > 0 ? ' In corner wind (within 15° of a corner) two adjacent open sides are both windward: their openings count together as the dominant face.' : ''),
    `${legsPerRow} legs per row, ${round(bayM)} m apart from end to end, each with ${record.ballastPerLegKg} kg; the frame and cover (${record.selfWeightKg} kg) act at the middle of the base.`,
    'Elements: the portal frames, each a pair of legs across the span on a strip as deep as the span, with its tributary share of the cover (half a bay either side) and of the roof lift. ' +
      'A frame’s overturning about its leeward legs is its windward leg’s uplift: the leg’s tension (M_h + M_lift)/widthM against its ballast and self-weight share. ' +
      'An end frame takes the whole of its gable end’s wind on its own feet (bracing not credited along the ridge: conservative); out of plane a frame stands by the eave rails, purlins and bracing, so its tipping along the ridge is the body’s.' +
      (interiorYsM.length === 0 ? ' With two legs per row there are only the end frames.' : '') +
      (states.endY0 === states.endYW ? ' The end frame at y = lengthM is the mirror of the one at y = 0.' : ''),
    ...frameNotes,
    'Only weight resists: stakes and ground anchors are not credited.',
  ];

  return {
    structure: {
      baseDepthM: widthM,
      baseWidthM: lengthM,
      ...settings,
      faces,
      upliftCases,
      masses,
      elements,
    },
    referenceHeightM: record.referenceHeightM ?? ridgeHeightM,
    sources: [...faceSources, ...roofSources, ...liftSources, ...sources],
    notes,
    ...(warnings.length > 0 ? { warnings } : {}),
  };
}
