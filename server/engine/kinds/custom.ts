/**
 * Custom: faces, masses, uplift and base given directly — the record of design §4 (contract),
 * which is the expanded structure itself plus a name. Friction may be omitted (then the `surface`
 * default, as for every kind) and safety factors given in part; both are compatible extensions.
 * First-round records (no `baseWidthM`, `facingDeg`, `yM`) stay valid: without `baseWidthM` the
 * record is a strip and the answer warns that wind onto the ends was not checked.
 */
import { z } from 'zod';
import { defineKind } from './kindDefinition.ts';
import { dimensionM } from '../recordFields.ts';
import { faceSchema, massSchema, upliftSchema } from '../structure.ts';
import { givenCoefficient, recordBaseShape, resistanceSettings, type Expansion } from './recordBase.ts';

export const customRecordSchema = z
  .strictObject({
    kind: z.literal('custom'),
    ...recordBaseShape,
    /** Depth of the base from the front edge (x = 0) to the back edge, m. */
    baseDepthM: dimensionM(),
    /** Width of the base from the y = 0 end to the other end, m. Without it only the front and back edges are checked. */
    baseWidthM: dimensionM().optional(),
    faces: z.array(faceSchema).min(1, 'must list at least one face').max(200, 'must list at most 200 faces'),
    uplift: upliftSchema.optional(),
    masses: z.array(massSchema).min(1, 'must list at least one mass').max(200, 'must list at most 200 masses'),
  })
  .superRefine((record, ctx) => {
    const within = (path: Array<string | number>, value: number | undefined, limit: number | undefined, name: string) => {
      if (value !== undefined && limit !== undefined && limit > 0 && value > limit) {
        ctx.addIssue({ code: 'custom', path, message: `must be within the base, from 0 to ${name} (${limit} m), not ${value} m` });
      }
    };
    record.masses.forEach((mass, index) => {
      within(['masses', index, 'xM'], mass.xM, record.baseDepthM, 'baseDepthM');
      within(['masses', index, 'yM'], mass.yM, record.baseWidthM, 'baseWidthM');
      if (mass.yM !== undefined && record.baseWidthM === undefined) {
        ctx.addIssue({ code: 'custom', path: ['masses', index, 'yM'], message: 'needs baseWidthM: a record without it has no ends' });
      }
    });
    if (record.uplift) {
      within(['uplift', 'xM'], record.uplift.xM, record.baseDepthM, 'baseDepthM');
      within(['uplift', 'yM'], record.uplift.yM, record.baseWidthM, 'baseWidthM');
      if (record.uplift.yM !== undefined && record.baseWidthM === undefined) {
        ctx.addIssue({ code: 'custom', path: ['uplift', 'yM'], message: 'needs baseWidthM: a record without it has no ends' });
      }
    }
    if (record.masses.length > 0 && record.masses.reduce((sumKg, mass) => sumKg + mass.massKg, 0) <= 0) {
      ctx.addIssue({ code: 'custom', path: ['masses'], message: 'total mass must be > 0 kg: nothing would hold the structure down' });
    }
  });

export type CustomRecord = z.infer<typeof customRecordSchema>;

export function expandCustom(record: CustomRecord): Expansion {
  const { settings, sources, warnings: resistanceWarnings } = resistanceSettings(record);
  const highestCentroidM = Math.max(...record.faces.map((face) => face.centroidHeightM));
  const faceSources = record.faces.flatMap((face, index) => {
    const name = face.label ?? `face ${index + 1}`;
    return [
      givenCoefficient(`c_f ${name}, wind onto its front side`, face.cfFront, record.coefficientSource),
      givenCoefficient(`c_f ${name}, wind onto its back side`, face.cfBack, record.coefficientSource),
    ];
  });
  const liftSources = record.uplift ? [givenCoefficient('c_lift on the plan area', record.uplift.liftCoefficient, record.coefficientSource)] : [];
  return {
    structure: {
      baseDepthM: record.baseDepthM,
      ...(record.baseWidthM === undefined ? {} : { baseWidthM: record.baseWidthM }),
      ...settings,
      faces: record.faces,
      ...(record.uplift ? { uplift: record.uplift } : {}),
      masses: record.masses,
    },
    // The top of a rectangular face standing on the ground is twice its centroid height.
    referenceHeightM: record.referenceHeightM ?? 2 * highestCentroidM,
    sources: [...faceSources, ...liftSources, ...sources],
    warnings: [
      ...resistanceWarnings,
      ...(record.referenceHeightM === undefined
        ? [
            `Reference height assumed ${(2 * highestCentroidM).toFixed(2)} m, twice the highest face centroid (the top of a rectangular face standing on the ground): for a gable, a raised or a tapered face the top is higher and the gust would be under-read — give referenceHeightM.`,
          ]
        : []),
    ],
    notes: [
      record.referenceHeightM === undefined
        ? 'Reference height taken as twice the highest face centroid (the top of a face standing on the ground): give referenceHeightM when the structure is taller.'
        : `Reference height ${record.referenceHeightM} m as given.`,
      'Each face loads normal to itself with ψ(δ) = min(1, 2·cos δ) at δ from its normal, in every direction assessed (every 15° and each face normal).',
    ],
  };
}

/** The custom kind as the engine's kind list holds it (kinds/index.ts, kindDefinition.ts). */
export const customKind = defineKind({
  kind: 'custom',
  schema: customRecordSchema,
  recordWords: 'a custom',
  expand: expandCustom,
});
