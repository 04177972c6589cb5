/**
 * Tent (marquee, frame tent): a rectangular plan with legs in two rows along the long sides, walls
 * closed or open, a pitched roof. Assessed for wind broadside onto the long side: for a tent at
 * least as long as wide that is the worse direction (a gable-end wind meets a smaller area and
 * tips the tent over the longer base), so the record must have widthM ≤ lengthM.
 */
import { z } from 'zod';
import { count, coefficient, dimensionM, massKg } from '../recordFields.ts';
import { defaultCoefficients } from './coefficients.ts';
import { chosenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion } from './recordBase.ts';

export const tentRecordSchema = z
  .strictObject({
    kind: z.literal('tent'),
    ...recordBaseShape,
    /** Long side, m: the wind is assessed onto this side. */
    lengthM: dimensionM(),
    /** Short side, m: the base depth between the two rows of legs. */
    widthM: dimensionM(),
    eaveHeightM: dimensionM(),
    ridgeHeightM: dimensionM(),
    /** Walls closed (the side elevation is loaded) or open/removed (the wind passes under the roof). */
    wallsClosed: z.boolean(),
    /** Number of legs, an even number in two rows along the long sides. */
    legs: count(4),
    /** Ballast on each leg (weights, water barrels), kg. */
    ballastPerLegKg: massKg(),
    /** Frame, cover and floor that move with the tent, kg: acts at the middle of the base. */
    selfWeightKg: massKg(),
    coefficients: z
      .strictObject({ wallCf: coefficient().optional(), roofCf: coefficient().optional(), liftCoefficient: coefficient().optional() })
      .optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    if (record.ridgeHeightM < record.eaveHeightM) {
      ctx.addIssue({ code: 'custom', path: ['ridgeHeightM'], message: `must be ≥ eaveHeightM (${record.eaveHeightM} m)` });
    }
    if (record.widthM > record.lengthM) {
      ctx.addIssue({
        code: 'custom',
        path: ['widthM'],
        message: `must be ≤ lengthM (${record.lengthM} m): lengthM is the long side, the one assessed broadside`,
      });
    }
    if (record.legs % 2 !== 0) {
      ctx.addIssue({ code: 'custom', path: ['legs'], message: 'must be even: the legs stand in two rows along the long sides' });
    }
    if (record.selfWeightKg + record.legs * record.ballastPerLegKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['ballastPerLegKg'], message: 'total mass must be > 0 kg: give the self-weight or the ballast' });
    }
  });

export type TentRecord = z.infer<typeof tentRecordSchema>;

export function expandTent(record: TentRecord): Expansion {
  const { lengthM, widthM, eaveHeightM, ridgeHeightM, coefficients, coefficientSource } = record;
  const { settings, sources } = resistanceSettings(record);
  const wall = chosenCoefficient(
    'c_f side wall (front and back)',
    record.wallsClosed ? defaultCoefficients.tentElevation : defaultCoefficients.tentOpenWall,
    coefficients?.wallCf,
    coefficientSource,
  );
  const roof = chosenCoefficient('c_f roof, side elevation (front and back)', defaultCoefficients.tentElevation, coefficients?.roofCf, coefficientSource);
  const lift = chosenCoefficient('c_lift roof, on the plan area', defaultCoefficients.tentRoofLift, coefficients?.liftCoefficient, coefficientSource);
  const roofRiseM = ridgeHeightM - eaveHeightM;
  const legsPerRow = record.legs / 2;
  const ballastPerRowKg = legsPerRow * record.ballastPerLegKg;

  return {
    structure: {
      baseDepthM: widthM,
      ...settings,
      faces: [
        { label: 'side wall', areaM2: lengthM * eaveHeightM, centroidHeightM: eaveHeightM / 2, cfFront: wall.value, cfBack: wall.value },
        // A pitched roof seen broadside projects as a rectangle lengthM × rise.
        { label: 'roof, side elevation', areaM2: lengthM * roofRiseM, centroidHeightM: eaveHeightM + roofRiseM / 2, cfFront: roof.value, cfBack: roof.value },
      ],
      uplift: { planAreaM2: lengthM * widthM, liftCoefficient: lift.value },
      masses: [
        { label: 'frame and cover', massKg: record.selfWeightKg, xM: widthM / 2 },
        { label: `front row ballast (${legsPerRow} legs × ${record.ballastPerLegKg} kg)`, massKg: ballastPerRowKg, xM: 0 },
        { label: `back row ballast (${legsPerRow} legs × ${record.ballastPerLegKg} kg)`, massKg: ballastPerRowKg, xM: widthM },
      ],
    },
    referenceHeightM: record.referenceHeightM ?? ridgeHeightM,
    sources: [wall, roof, lift, ...sources],
    notes: [
      `Wind assessed broadside onto the ${lengthM} m side; base depth = width ${widthM} m between the two rows of legs.`,
      'Half the legs stand on each long edge; the frame and cover act at the middle of the base.',
      record.wallsClosed
        ? 'Walls closed: the whole side elevation (walls and roof rise) is loaded.'
        : 'Walls open: the wind passes under the roof; only the roof rise is loaded horizontally.',
      'Only weight resists: stakes and ground anchors are not credited.',
    ],
  };
}
