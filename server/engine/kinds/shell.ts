/**
 * Shell: a curved canopy or dome (design §2.4 v2). The radius R describes one of two shapes
 * (`shape`):
 * - 'quarterSphere' (default, the first-round meaning): a band shell, half a hemisphere standing
 *   on its cut. Its OPEN (concave) side faces the FRONT; the cut is the front edge of the base
 *   (x = 0) and the shell reaches R behind it, 2R wide. Seen from the front or back it projects as
 *   a half disc (πR²/2), from either end as a quarter disc (πR²/4), from above as a half disc
 *   (πR²/2); every projection's centroid is 4R/(3π) above the base. `form: 'closed'` puts a flat
 *   wall across the opening.
 * - 'hemisphere': a dome standing on its circular base, 2R × 2R, centred on the base. Seen from
 *   any side a half disc (πR²/2, centroid 4R/(3π) up), from above a disc (πR²). `form: 'open'`
 *   means it has an opening (a door, a stage mouth) on its front side; 'closed' none.
 *
 * Drag: free-stream drag coefficients of bodies that, with their mirror image in the ground, make
 * the shell's shape (the ground as a mirror plane): a band shell and its image are a hemispherical
 * cup (Munson fig. 9.20), a dome and its image a sphere. The gust is taken at the top (R), so the
 * slower air near the ground is not credited.
 *
 * Faces and directions: a quarter sphere has a front face (facing 0) and an end face (facing 90,
 * the quarter disc). A dome is axisymmetric, but its base is modelled as the square 2R × 2R whose
 * edges are the tangents of the base circle at 0/90/180/270. It gets two faces, each with the FULL
 * half-disc projection, facing 0 and 90. With ψ(δ) = 1 within 60° of a normal, for every wind
 * direction at least one face is fully loaded along an edge normal, so the moment about the
 * tipping edge is the full drag times its height in every direction: exact for masses at the
 * centre, as a dome's tipping about the tangent of its base circle is. The price is the vector
 * sum: up to √2 × the drag at 45° (both faces full), so sliding reads high there — never low.
 * (More faces at other facings cannot help: a square edge at 45° to the wind only sees the
 * force's component along its normal, so the force must be √2 × the drag there to tip it fully.)
 *
 * Uplift (crown suction, and the pressure inside an open shell) is on by default: see
 * `shellCoefficients` for the values and their sources.
 */
import { z } from 'zod';
import { defineKind } from './kindDefinition.ts';
import { coefficient, dimensionM, heightM, massKg } from '../recordFields.ts';
import type { DirectionalUplift, Face, Mass, Uplift } from '../structure.ts';
import { defaultCoefficients, type SourcedValue } from './coefficients.ts';
import {
  chosenCoefficient,
  givenCoefficient,
  recordBaseShape,
  requireCoefficientSource,
  resistanceSettings,
  type Expansion,
  type SourceNote,
} from './recordBase.ts';

/**
 * Default coefficients of the shell kind (kept here, beside the kind: the drag values of the
 * hemisphere and the cup are in `coefficients.ts`). Lift coefficients are on the plan area.
 */
export const shellCoefficients = {
  /** Net lift of the shell's outer surface from crown suction, on its plan area. */
  crownSuctionLift: {
    value: 1.2,
    source:
      'crown c_pe of a hemispherical dome about −1.0 (Maher’s wind-tunnel data) to −1.2 (LES), as quoted by I. G. A. Susila, ' +
      '“Wind load predicting; how could CFD replaced wind tunnel test?”; about −1.2 at f/d = 0.5 in EN 1991-1-4 §7.2.8 Fig. 7.12 ' +
      '(from memory; ASCE 7-05 Fig. 6-7 reproduces that figure, its values not legible in the copy retrieved). The more onerous −1.2 is taken ' +
      'over the whole plan (conservative): by the figure’s rule (c_pe linear along arcs parallel to the wind, ASCE 7-05 Fig. 6-7 note 1) with ' +
      'the windward base’s positive pressure not credited, the plan average is 0.70 × 1.2 = 0.84',
  },
  /**
   * Net lift of a band shell with the wind blowing into its open side, on its plan area: the cup
   * pressure inside (near stagnation) and the separated suction outside.
   */
  cupLift: {
    value: 1.42,
    source:
      'derived from Munson, Fundamentals of Fluid Mechanics, fig. 9.20 (hollow hemisphere, concave side to the flow, C_D 1.42): the shell and ' +
      'its mirror image in the ground are that cup; with the pressure inside and outside taken uniform, the net pressure on the upper half ' +
      'lifts its plan projection (a half disc) as it pushes its frontal projection (the same half disc), so c_lift = C_D. ' +
      'The derivation is ours (no measured lift retrieved)',
  },
  /** Internal pressure of a closed shell, pushing the shell up from inside, on its plan area. */
  enclosedInternalPressure: {
    value: 0.2,
    source:
      'EN 1991-1-4 §7.2.9(6) Note 2: without a dominant opening c_pi is the more onerous of +0.2 and −0.3; +0.2 for uplift (from memory)',
  },
  /** Internal pressure of a dome with its opening (door) windward, on its plan area. */
  windwardOpeningInternalPressure: {
    value: 0.72,
    source:
      'EN 1991-1-4 §7.2.9(5): with a dominant opening (at least three times the rest) c_pi = 0.90 × c_pe at the opening (from memory); ' +
      'c_pe at a dome’s windward base +0.8 (EN 1991-1-4 Fig. 7.12, from memory; +0.6 measured by Maher as quoted by Susila): 0.90 × 0.8 = 0.72',
  },
  /** Drag of a dome on its half-disc projection, from any side. */
  domeDrag: {
    value: 0.47,
    source:
      'White, Fluid Mechanics, sphere (subcritical) C_D 0.47 — from memory: a dome and its mirror image in the ground are a sphere; taken ' +
      'in preference to the solid hemisphere’s 0.42 (Munson fig. 9.20, curved face to the flow) as the larger',
  },
} as const satisfies Record<string, SourcedValue>;

/** Half-width of the sector of wind directions in which a dome's front opening is windward, degrees. */
export const domeOpeningSectorHalfWidthDeg = 60;

export const shellRecordSchema = z
  .strictObject({
    kind: z.literal('shell'),
    ...recordBaseShape,
    /** Radius R of the shell, m: of the quarter sphere or of the dome (see `shape`). */
    radiusM: dimensionM(),
    /**
     * What the radius describes: 'quarterSphere' (default) a band shell, half a hemisphere
     * standing on its cut, open to the front, R deep and 2R wide; 'hemisphere' a dome standing on
     * its circular base, 2R across.
     */
    shape: z.enum(['quarterSphere', 'hemisphere']).optional(),
    /**
     * 'open' (default): a band shell hollow and open to the front, or a dome with an opening (a
     * door) on its front side; 'closed': a flat wall across the band shell's opening, or a dome
     * with no opening.
     */
    form: z.enum(['open', 'closed']).optional(),
    /** Height of the shell's base above the ground (a deck or stage), m; default 0. */
    baseHeightM: heightM().optional(),
    /** Depth of the base from the front edge to the back edge, m; default the shell's own footprint (R, a dome 2R). */
    baseDepthM: dimensionM().optional(),
    /** Width of the base from end to end, m; default the shell's own footprint, 2R. */
    baseWidthM: dimensionM().optional(),
    /** Shell and its frame, kg: acts at R/2 behind the opening (a band shell) or at the centre (a dome). */
    selfWeightKg: massKg(),
    /** Band shell: ballast along the opening (front edge of the base), kg. */
    frontBallastKg: massKg().optional(),
    /** Band shell: ballast at the back edge of the base, kg. */
    backBallastKg: massKg().optional(),
    /** Dome: ballast spread evenly round the base ring, kg (acts at the centre about every tangent edge). */
    ringBallastKg: massKg().optional(),
    /**
     * Overrides, each with `coefficientSource`. `liftCoefficient` replaces the default uplift in
     * every direction, on the plan area (πR²/2 a band shell, πR² a dome) at its centroid.
     */
    coefficients: z
      .strictObject({
        cfFront: coefficient().optional(),
        cfBack: coefficient().optional(),
        /** c_f with the wind onto either end (default: the larger of the front and back values). */
        cfSide: coefficient().optional(),
        liftCoefficient: coefficient().optional(),
      })
      .optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    const dome = record.shape === 'hemisphere';
    const footprintDepthM = dome ? 2 * record.radiusM : record.radiusM;
    if (record.baseDepthM !== undefined && record.baseDepthM < footprintDepthM) {
      ctx.addIssue({
        code: 'custom',
        path: ['baseDepthM'],
        message: dome
          ? `must be ≥ 2 × radiusM (${footprintDepthM} m): the dome stands on its base`
          : `must be ≥ radiusM (${record.radiusM} m): the shell stands on its base`,
      });
    }
    if (record.baseWidthM !== undefined && record.baseWidthM < 2 * record.radiusM) {
      ctx.addIssue({ code: 'custom', path: ['baseWidthM'], message: `must be ≥ 2 × radiusM (${2 * record.radiusM} m): the shell stands on its base` });
    }
    if (dome) {
      for (const field of ['frontBallastKg', 'backBallastKg'] as const) {
        if (record[field] !== undefined) {
          ctx.addIssue({ code: 'custom', path: [field], message: 'a dome has no front or back edge of its own: give ringBallastKg (ballast evenly round the base ring)' });
        }
      }
    } else if (record.ringBallastKg !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['ringBallastKg'], message: 'is for shape "hemisphere" (a dome): a band shell takes frontBallastKg and backBallastKg' });
    }
    const totalKg = record.selfWeightKg + (record.frontBallastKg ?? 0) + (record.backBallastKg ?? 0) + (record.ringBallastKg ?? 0);
    if (totalKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['selfWeightKg'], message: 'total mass must be > 0 kg: give the self-weight or the ballast' });
    }
  });

export type ShellRecord = z.infer<typeof shellRecordSchema>;

/** c_lift as the sum of its sourced parts, named for the sources list. */
function liftNote(item: string, parts: SourcedValue[]): SourceNote {
  const value = parts.reduce((sum, part) => sum + part.value, 0);
  const source = parts.map((part) => `${part.value}: ${part.source}`).join(' + ');
  return { item, value: Math.round(value * 1e9) / 1e9, source: parts.length > 1 ? `sum of ${source}` : source };
}

export function expandShell(record: ShellRecord): Expansion {
  return record.shape === 'hemisphere' ? expandDome(record) : expandQuarterSphere(record);
}

function expandQuarterSphere(record: ShellRecord): Expansion {
  const { radiusM, coefficients, coefficientSource } = record;
  const open = (record.form ?? 'open') === 'open';
  const baseHeightM = record.baseHeightM ?? 0;
  const baseDepthM = record.baseDepthM ?? radiusM;
  const baseWidthM = record.baseWidthM ?? 2 * radiusM;
  const middleYM = baseWidthM / 2;
  const { settings, sources, warnings: resistanceWarnings } = resistanceSettings(record);
  const front = chosenCoefficient(
    open ? 'c_f wind onto the front (into the open, concave side)' : 'c_f wind onto the front (flat face)',
    open ? defaultCoefficients.hollowHemisphereConcave : defaultCoefficients.solidHemisphereFlat,
    coefficients?.cfFront,
    coefficientSource,
  );
  const back = chosenCoefficient(
    'c_f wind onto the back (convex side)',
    open ? defaultCoefficients.hollowHemisphereConvex : defaultCoefficients.solidHemisphereCurved,
    coefficients?.cfBack,
    coefficientSource,
  );
  const side = chosenCoefficient(
    'c_f wind onto either end (quarter-disc projection)',
    {
      value: Math.max(front.value, back.value),
      source:
        'the larger of the front and back coefficients: no published value for a hemisphere or cup with the flow along its cut was found (conservative assumption)',
    },
    coefficients?.cfSide,
    coefficientSource,
  );
  const halfDiscAreaM2 = (Math.PI * radiusM * radiusM) / 2;
  const quarterDiscAreaM2 = halfDiscAreaM2 / 2;
  const centroidM = (4 * radiusM) / (3 * Math.PI);
  const centroidHeightM = baseHeightM + centroidM;
  const faces: Face[] = [
    { label: 'shell, seen from the front or back (half disc πR²/2)', areaM2: halfDiscAreaM2, centroidHeightM, cfFront: front.value, cfBack: back.value, facingDeg: 0 },
    { label: 'shell, seen from either end (quarter disc πR²/4)', areaM2: quarterDiscAreaM2, centroidHeightM, cfFront: side.value, cfBack: side.value, facingDeg: 90 },
  ];
  // Lift on the plan (a half disc, straight edge along the opening) at its centroid 4R/(3π)
  // behind the opening: the resultant of a uniform net pressure; toward the windward side for
  // wind into the opening.
  const planPoint = { xM: centroidM, yM: middleYM };
  const liftSources: SourceNote[] = [];
  let uplift: Uplift | undefined;
  let upliftCases: DirectionalUplift[] | undefined;
  const given = coefficients?.liftCoefficient;
  if (given !== undefined) {
    liftSources.push(givenCoefficient('c_lift on the plan area πR²/2 (every direction)', given, coefficientSource));
    uplift = { label: 'shell (given c_lift)', planAreaM2: halfDiscAreaM2, liftCoefficient: given, ...planPoint };
  } else if (open) {
    // Wind into the opening: the larger of two readings of the same state, the cup's drag taken as
    // lift (our derivation) and crown suction plus the internal pressure of a windward dominant
    // opening (as for a dome with its door windward): 1.2 + 0.72 = 1.92 > 1.42.
    const asCup = shellCoefficients.cupLift.value;
    const asOpening = shellCoefficients.crownSuctionLift.value + shellCoefficients.windwardOpeningInternalPressure.value;
    const cup =
      asOpening >= asCup
        ? liftNote('c_lift wind into the open side (within 90° of the front), on πR²/2: crown suction plus a windward dominant opening, above the cup reading ' + asCup, [
            shellCoefficients.crownSuctionLift,
            shellCoefficients.windwardOpeningInternalPressure,
          ])
        : liftNote('c_lift wind into the open side (within 90° of the front), on πR²/2', [shellCoefficients.cupLift]);
    const crown = liftNote(
      'c_lift wind onto the convex back (within 90° of the back), on πR²/2; the wake inside is not credited',
      [shellCoefficients.crownSuctionLift],
    );
    liftSources.push(cup, crown);
    upliftCases = [
      { label: 'wind into the open side: cup pressure inside, suction outside', planAreaM2: halfDiscAreaM2, liftCoefficient: cup.value, ...planPoint, centreDeg: 0, halfWidthDeg: 90 },
      { label: 'wind onto the convex back: crown suction', planAreaM2: halfDiscAreaM2, liftCoefficient: crown.value, ...planPoint, centreDeg: 180, halfWidthDeg: 90 },
    ];
  } else {
    const closedLift = liftNote('c_lift crown suction and internal pressure, on πR²/2 (every direction)', [
      shellCoefficients.crownSuctionLift,
      shellCoefficients.enclosedInternalPressure,
    ]);
    liftSources.push(closedLift);
    uplift = { label: 'closed shell: crown suction and internal pressure', planAreaM2: halfDiscAreaM2, liftCoefficient: closedLift.value, ...planPoint };
  }
  const masses: Mass[] = [
    { label: 'shell and frame', massKg: record.selfWeightKg, xM: radiusM / 2, yM: middleYM },
    { label: 'front ballast (along the opening)', massKg: record.frontBallastKg ?? 0, xM: 0, yM: middleYM },
    { label: 'back ballast', massKg: record.backBallastKg ?? 0, xM: baseDepthM, yM: middleYM },
  ];
  return {
    structure: {
      baseDepthM,
      baseWidthM,
      ...settings,
      faces,
      ...(uplift ? { uplift } : {}),
      ...(upliftCases ? { upliftCases } : {}),
      masses,
    },
    referenceHeightM: record.referenceHeightM ?? baseHeightM + radiusM,
    sources: [front, back, side, ...liftSources, ...sources],
    warnings: resistanceWarnings,
    notes: [
      'Shape: quarter sphere (a band shell), half a hemisphere standing on its cut; the cut is the front edge of the base.',
      open
        ? 'The open (concave) side faces the front: wind onto the front blows into the shell.'
        : 'Closed form: a flat wall across the opening faces the front.',
      `Projected area from the front or back = half disc πR²/2 = ${halfDiscAreaM2.toFixed(2)} m², from either end = quarter disc πR²/4 = ` +
        `${quarterDiscAreaM2.toFixed(2)} m², both at 4R/(3π) = ${centroidM.toFixed(3)} m above the base; the ground acts as a mirror plane for the hemisphere coefficients.`,
      `Base ${baseDepthM} m deep × ${baseWidthM} m wide; the shell and frame act R/2 = ${(radiusM / 2).toFixed(2)} m behind the opening, ballast along the front and back edges at mid-width.`,
      given !== undefined
        ? 'Uplift as given in the record, at the centroid of the plan half disc.'
        : open
          ? `Uplift on the plan half disc πR²/2 at its centroid ${centroidM.toFixed(3)} m behind the opening: c_lift ${Math.max(shellCoefficients.cupLift.value, shellCoefficients.crownSuctionLift.value + shellCoefficients.windwardOpeningInternalPressure.value).toFixed(2)} with the wind into the open side (the larger of the cup reading ${shellCoefficients.cupLift.value} and crown suction plus a windward opening), ` +
            `${shellCoefficients.crownSuctionLift.value} onto the back (both at 90° to the front: the larger governs).`
          : `Uplift on the plan half disc at its centroid: c_lift ${shellCoefficients.crownSuctionLift.value + shellCoefficients.enclosedInternalPressure.value} in every direction (crown suction and internal pressure).`,
      'Only weight resists: stakes and ground anchors are not credited.',
    ],
  };
}

function expandDome(record: ShellRecord): Expansion {
  const { radiusM, coefficients, coefficientSource } = record;
  const open = (record.form ?? 'open') === 'open';
  const baseHeightM = record.baseHeightM ?? 0;
  const baseDepthM = record.baseDepthM ?? 2 * radiusM;
  const baseWidthM = record.baseWidthM ?? 2 * radiusM;
  const centre = { xM: baseDepthM / 2, yM: baseWidthM / 2 };
  const { settings, sources, warnings: resistanceWarnings } = resistanceSettings(record);
  const front = chosenCoefficient('c_f wind onto the front', shellCoefficients.domeDrag, coefficients?.cfFront, coefficientSource);
  const back = chosenCoefficient('c_f wind onto the back', shellCoefficients.domeDrag, coefficients?.cfBack, coefficientSource);
  const side = chosenCoefficient('c_f wind onto either end', shellCoefficients.domeDrag, coefficients?.cfSide, coefficientSource);
  const halfDiscAreaM2 = (Math.PI * radiusM * radiusM) / 2;
  const planAreaM2 = Math.PI * radiusM * radiusM;
  const centroidM = (4 * radiusM) / (3 * Math.PI);
  const centroidHeightM = baseHeightM + centroidM;
  const faces: Face[] = [
    { label: 'dome, wind onto the front or back (half disc πR²/2)', areaM2: halfDiscAreaM2, centroidHeightM, cfFront: front.value, cfBack: back.value, facingDeg: 0 },
    { label: 'dome, wind onto either end (half disc πR²/2)', areaM2: halfDiscAreaM2, centroidHeightM, cfFront: side.value, cfBack: side.value, facingDeg: 90 },
  ];
  // Lift at the crown (the centre): by the figure's rule the windward base's positive pressure
  // puts the resultant at or leeward of the crown, so the crown's lever about the leeward
  // (tipping) tangent is the larger one.
  const liftSources: SourceNote[] = [];
  let uplift: Uplift;
  let upliftCases: DirectionalUplift[] | undefined;
  const given = coefficients?.liftCoefficient;
  if (given !== undefined) {
    liftSources.push(givenCoefficient('c_lift on the plan area πR² (every direction)', given, coefficientSource));
    uplift = { label: 'dome (given c_lift)', planAreaM2, liftCoefficient: given, ...centre };
  } else {
    const closedLift = liftNote(
      open ? 'c_lift with the opening not windward, on πR²: crown suction and internal pressure' : 'c_lift crown suction and internal pressure, on πR² (every direction)',
      [shellCoefficients.crownSuctionLift, shellCoefficients.enclosedInternalPressure],
    );
    liftSources.push(closedLift);
    uplift = { label: 'dome: crown suction and internal pressure', planAreaM2, liftCoefficient: closedLift.value, ...centre };
    if (open) {
      const openingLift = liftNote(
        `c_lift with the front opening windward (within ${domeOpeningSectorHalfWidthDeg}° of the front), on πR²: crown suction and internal pressure through the opening`,
        [shellCoefficients.crownSuctionLift, shellCoefficients.windwardOpeningInternalPressure],
      );
      liftSources.push(openingLift);
      upliftCases = [
        {
          label: 'front opening windward: crown suction and internal pressure through the opening',
          planAreaM2,
          liftCoefficient: openingLift.value,
          ...centre,
          centreDeg: 0,
          halfWidthDeg: domeOpeningSectorHalfWidthDeg,
        },
      ];
    }
  }
  const masses: Mass[] = [
    { label: 'dome and frame', massKg: record.selfWeightKg, ...centre },
    { label: 'ring ballast (evenly round the base ring)', massKg: record.ringBallastKg ?? 0, ...centre },
  ];
  return {
    structure: {
      baseDepthM,
      baseWidthM,
      ...settings,
      faces,
      uplift,
      ...(upliftCases ? { upliftCases } : {}),
      masses,
    },
    referenceHeightM: record.referenceHeightM ?? baseHeightM + radiusM,
    sources: [front, back, side, ...liftSources, ...sources],
    warnings: resistanceWarnings,
    notes: [
      'Shape: hemisphere (a dome) standing on its circular base, centred on the base.',
      `Projected area from any side = half disc πR²/2 = ${halfDiscAreaM2.toFixed(2)} m² at 4R/(3π) = ${centroidM.toFixed(3)} m above the base; plan area πR² = ${planAreaM2.toFixed(2)} m².`,
      'The dome is axisymmetric; its base is the square 2R × 2R whose edges are the tangents of the base circle. Two faces, each the full half disc, face the front and the ends: ' +
        'for every wind direction one of them carries the full drag onto a tipping edge, as the dome does onto the tangent it tips about; at 45° both do, so sliding is over-read by up to √2 there (conservative).',
      'The self-weight and the ring ballast act at the centre: a ring spread evenly restores R × its weight about every tangent.',
      given !== undefined
        ? 'Uplift as given in the record, at the centre.'
        : open
          ? `Uplift on the plan disc πR² at the crown (the centre): c_lift ${uplift.liftCoefficient} with the front opening not windward, ${upliftCases![0]!.liftCoefficient} within ${domeOpeningSectorHalfWidthDeg}° of the front.`
          : `Uplift on the plan disc πR² at the crown (the centre): c_lift ${uplift.liftCoefficient} in every direction.`,
      'Only weight resists: stakes and ground anchors are not credited.',
    ],
  };
}

/** The shell kind as the engine's kind list holds it (kinds/index.ts, kindDefinition.ts). */
export const shellKind = defineKind({
  kind: 'shell',
  schema: shellRecordSchema,
  recordWords: 'a shell',
  expand: expandShell,
});
