/**
 * Shell: a curved canopy such as a band shell, a quarter sphere of radius R standing on its base
 * with its OPEN (concave) side to the FRONT. Wind onto the front blows into the cup; wind onto the
 * back meets the convex side. Seen along the wind it projects as a half disc, area πR²/2, centroid
 * 4R/(3π) above its base. `form: 'closed'` is the same shape with a flat wall across the opening
 * (flat face to the front).
 *
 * The coefficients are free-stream drag coefficients of a full hemisphere (Munson fig. 9.20). The
 * ground acts as a mirror plane: a half shell standing on it behaves like the full shell with its
 * image, so the same coefficient applies to the half disc. The gust is taken at the top (R), so the
 * slower air near the ground is not credited.
 */
import { z } from 'zod';
import { coefficient, dimensionM, heightM, massKg } from '../recordFields.ts';
import { defaultCoefficients } from './coefficients.ts';
import { chosenCoefficient, givenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion } from './recordBase.ts';

export const shellRecordSchema = z
  .strictObject({
    kind: z.literal('shell'),
    ...recordBaseShape,
    radiusM: dimensionM(),
    /** 'open' (default): a hollow shell open to the front; 'closed': a flat wall across the opening. */
    form: z.enum(['open', 'closed']).optional(),
    /** Height of the shell's base above the ground (a deck or stage), m; default 0. */
    baseHeightM: heightM().optional(),
    /** Depth of the base from the opening to the back, m; default the radius (the shell's own footprint). */
    baseDepthM: dimensionM().optional(),
    /** Shell and its frame, kg: acts at R/2 behind the opening (the centroid of a hemispherical surface). */
    selfWeightKg: massKg(),
    /** Ballast along the opening (front edge of the base), kg. */
    frontBallastKg: massKg().optional(),
    /** Ballast at the back edge of the base, kg. */
    backBallastKg: massKg().optional(),
    /** Overrides; `liftCoefficient` adds uplift on the plan area πR²/2 (none by default: no source). */
    coefficients: z
      .strictObject({ cfFront: coefficient().optional(), cfBack: coefficient().optional(), liftCoefficient: coefficient().optional() })
      .optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    if (record.baseDepthM !== undefined && record.baseDepthM < record.radiusM) {
      ctx.addIssue({ code: 'custom', path: ['baseDepthM'], message: `must be ≥ radiusM (${record.radiusM} m): the shell stands on its base` });
    }
    if (record.selfWeightKg + (record.frontBallastKg ?? 0) + (record.backBallastKg ?? 0) <= 0) {
      ctx.addIssue({ code: 'custom', path: ['selfWeightKg'], message: 'total mass must be > 0 kg: give the self-weight or the ballast' });
    }
  });

export type ShellRecord = z.infer<typeof shellRecordSchema>;

export function expandShell(record: ShellRecord): Expansion {
  const { radiusM, coefficients, coefficientSource } = record;
  const open = (record.form ?? 'open') === 'open';
  const baseHeightM = record.baseHeightM ?? 0;
  const baseDepthM = record.baseDepthM ?? radiusM;
  const { settings, sources } = resistanceSettings(record);
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
  const halfDiscAreaM2 = (Math.PI * radiusM * radiusM) / 2;
  const lift = coefficients?.liftCoefficient;
  const liftNotes = lift === undefined ? [] : [givenCoefficient('c_lift on the plan area πR²/2', lift, coefficientSource)];
  return {
    structure: {
      baseDepthM,
      ...settings,
      faces: [
        {
          label: 'shell (half-disc projection)',
          areaM2: halfDiscAreaM2,
          centroidHeightM: baseHeightM + (4 * radiusM) / (3 * Math.PI),
          cfFront: front.value,
          cfBack: back.value,
        },
      ],
      ...(lift === undefined ? {} : { uplift: { planAreaM2: halfDiscAreaM2, liftCoefficient: lift } }),
      masses: [
        { label: 'shell and frame', massKg: record.selfWeightKg, xM: radiusM / 2 },
        { label: 'front ballast (along the opening)', massKg: record.frontBallastKg ?? 0, xM: 0 },
        { label: 'back ballast', massKg: record.backBallastKg ?? 0, xM: baseDepthM },
      ],
    },
    referenceHeightM: record.referenceHeightM ?? baseHeightM + radiusM,
    sources: [front, back, ...liftNotes, ...sources],
    notes: [
      open
        ? 'The open (concave) side faces the front: wind onto the front blows into the shell.'
        : 'Closed form: a flat wall across the opening faces the front.',
      `Projected area = half disc πR²/2 = ${halfDiscAreaM2.toFixed(2)} m²; the ground acts as a mirror plane for the full-hemisphere coefficient.`,
      lift === undefined ? 'No uplift is applied: no source gives one for a shell; add liftCoefficient with its source when the designer does.' : 'Uplift as given in the record.',
    ],
  };
}
