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
 * Roof lift by direction and openings: tentRoof.ts. The elements, the portal frames: tentFrames.ts.
 * The sides and the plan rectangles they share: tentPlan.ts.
 */
import { z } from 'zod';
import { defineKind } from './kindDefinition.ts';
import { count, coefficient, dimensionM, massKg } from '../recordFields.ts';
import type { Mass } from '../structure.ts';
import { defaultCoefficients } from './coefficients.ts';
import { chosenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion, type SourceNote } from './recordBase.ts';
import { tentFrames } from './tentFrames.ts';
import { oppositeSide, round, sideFacingDeg, sideWords, tentSides, type FacePart, type Plan, type SideState, type TaggedFace, type TentSide } from './tentPlan.ts';
import { tentRoofCases, tentRoofLift, tentRoofSources } from './tentRoof.ts';

export { tentSides, type SideState, type TentSide } from './tentPlan.ts';
export { tentElementNames, worstFrameLifts, type FrameLift } from './tentFrames.ts';
export { tentInternalPressure } from './tentRoof.ts';

/** Beyond this many legs, each row's legs are listed as one mass at the row's middle (same moments). */
const legsListedSingly = 150;
/** Below this roof pitch the roof is flat for EN 1991-1-4 (§7.2.3) and the duopitch zones do not strictly apply. */
const lowestDuopitchDeg = 5;

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

export function expandTent(record: TentRecord): Expansion {
  const { lengthM, widthM, eaveHeightM, ridgeHeightM, coefficients, coefficientSource } = record;
  const { settings, sources } = resistanceSettings(record);
  const states = resolvedTentSides(record);
  const plan: Plan = { lengthM, widthM, ridgeHeightM };
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
  const tagged: TaggedFace[] = [];
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

  // --- Roof lift: one case per windward side, and in corner wind with both sides open, two more per corner (tentRoof.ts).
  const { cases, openCorners } = tentRoofCases(states, plan, eaveHeightM);
  const { scales, upliftCases, sources: liftSources } = tentRoofLift(cases, plan, coefficients?.liftCoefficient, coefficientSource);

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

  // --- Elements: the portal frames (tentFrames.ts).
  const { elements, notes: frameNotes, sources: frameSources } = tentFrames({ record, lengthM, widthM, states, settings, tagged, cases, scales, legYsM, legsPerRow, bayM });

  // --- Sources of the roof model (the frames' come with them).
  const roofSources = tentRoofSources(allOpen, openCorners);

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
    sources: [...faceSources, ...roofSources, ...frameSources, ...liftSources, ...sources],
    notes,
    ...(warnings.length > 0 ? { warnings } : {}),
  };
}

/** The tent kind as the engine's kind list holds it (kinds/index.ts, kindDefinition.ts). */
export const tentKind = defineKind({
  kind: 'tent',
  schema: tentRecordSchema,
  recordWords: 'a tent',
  expand: expandTent,
});
