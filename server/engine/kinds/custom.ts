/**
 * Custom: faces and masses given directly — the record of design §4 (contract), which is the
 * expanded structure itself plus a name. Friction may be omitted (then the `surface` default, as
 * for every kind) and safety factors given in part; both are compatible extensions.
 */
import { z } from 'zod';
import { dimensionM } from '../recordFields.ts';
import { faceSchema, massSchema, upliftSchema } from '../structure.ts';
import { givenCoefficient, recordBaseShape, resistanceSettings, type Expansion } from './recordBase.ts';

export const customRecordSchema = z
  .strictObject({
    kind: z.literal('custom'),
    ...recordBaseShape,
    baseDepthM: dimensionM(),
    faces: z.array(faceSchema).min(1, 'must list at least one face').max(200, 'must list at most 200 faces'),
    uplift: upliftSchema.optional(),
    masses: z.array(massSchema).min(1, 'must list at least one mass').max(200, 'must list at most 200 masses'),
  })
  .superRefine((record, ctx) => {
    record.masses.forEach((mass, index) => {
      if (mass.xM > record.baseDepthM && record.baseDepthM > 0) {
        ctx.addIssue({
          code: 'custom',
          path: ['masses', index, 'xM'],
          message: `must be within the base, 0..baseDepthM (${record.baseDepthM} m), got ${mass.xM} m`,
        });
      }
    });
    if (record.masses.length > 0 && record.masses.reduce((sumKg, mass) => sumKg + mass.massKg, 0) <= 0) {
      ctx.addIssue({ code: 'custom', path: ['masses'], message: 'total mass must be > 0 kg: nothing would hold the structure down' });
    }
  });

export type CustomRecord = z.infer<typeof customRecordSchema>;

export function expandCustom(record: CustomRecord): Expansion {
  const { settings, sources } = resistanceSettings(record);
  const highestCentroidM = Math.max(...record.faces.map((face) => face.centroidHeightM));
  const faceSources = record.faces.flatMap((face, index) => {
    const name = face.label ?? `face ${index + 1}`;
    return [
      givenCoefficient(`c_f ${name}, wind onto the front`, face.cfFront, record.coefficientSource),
      givenCoefficient(`c_f ${name}, wind onto the back`, face.cfBack, record.coefficientSource),
    ];
  });
  const liftSources = record.uplift ? [givenCoefficient('c_lift on the plan area', record.uplift.liftCoefficient, record.coefficientSource)] : [];
  return {
    structure: {
      baseDepthM: record.baseDepthM,
      ...settings,
      faces: record.faces,
      ...(record.uplift ? { uplift: record.uplift } : {}),
      masses: record.masses,
    },
    // The top of a rectangular face standing on the ground is twice its centroid height.
    referenceHeightM: record.referenceHeightM ?? 2 * highestCentroidM,
    sources: [...faceSources, ...liftSources, ...sources],
    notes: [
      record.referenceHeightM === undefined
        ? 'Reference height taken as twice the highest face centroid (the top of a face standing on the ground): give referenceHeightM when the structure is taller.'
        : `Reference height ${record.referenceHeightM} m as given.`,
    ],
  };
}
