/**
 * Banner: a banner fence, hoarding or mesh scrim on feet. A flat board of width × height with a
 * clearance under it, solid or mesh, on a row of feet whose depth (in the wind direction) is the
 * base. The board stands at the middle of the feet and the ballast sits on them, so both sides
 * are alike. The whole run is taken as one rigid body (panels clamped together).
 */
import { z } from 'zod';
import { count, coefficient, dimensionM, heightM, massKg } from '../recordFields.ts';
import { boardForceCoefficient } from './boardCoefficient.ts';
import { chosenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion } from './recordBase.ts';

export const bannerRecordSchema = z
  .strictObject({
    kind: z.literal('banner'),
    ...recordBaseShape,
    /** Length of the run, b, m. */
    widthM: dimensionM(),
    /** Height of the banner itself, h, m. */
    heightM: dimensionM(),
    /** Gap between the ground and the banner's bottom edge, z_g, m. */
    clearanceM: heightM(),
    /** Solid area / gross area: 1 solid (default), about 0.3–0.7 for mesh. */
    solidity: z.number().gt(0, 'must be > 0 (0 would be no banner)').lte(1, 'must be ≤ 1').optional(),
    feet: count(1),
    ballastPerFootKg: massKg(),
    /** Depth of a foot in the wind direction: the base depth, m. */
    footDepthM: dimensionM(),
    /** Banner, frame and feet, kg. */
    selfWeightKg: massKg(),
    /** Force coefficient on the gross area, replacing the default rule (solidity then not applied again). */
    coefficients: z.strictObject({ cf: coefficient().optional() }).optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    if (record.selfWeightKg + record.feet * record.ballastPerFootKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['ballastPerFootKg'], message: 'total mass must be > 0 kg: give the self-weight or the ballast' });
    }
  });

export type BannerRecord = z.infer<typeof bannerRecordSchema>;

export function expandBanner(record: BannerRecord): Expansion {
  const { widthM, heightM, clearanceM, footDepthM } = record;
  const solidity = record.solidity ?? 1;
  const { settings, sources } = resistanceSettings(record);
  const cf = chosenCoefficient(
    'c_f on the gross area b·h (front and back)',
    boardForceCoefficient({ widthM, heightM, clearanceM, solidity }),
    record.coefficients?.cf,
    record.coefficientSource,
  );
  return {
    structure: {
      baseDepthM: footDepthM,
      ...settings,
      faces: [{ label: 'banner (gross area)', areaM2: widthM * heightM, centroidHeightM: clearanceM + heightM / 2, cfFront: cf.value, cfBack: cf.value }],
      masses: [
        { label: 'banner, frame and feet', massKg: record.selfWeightKg, xM: footDepthM / 2 },
        { label: `ballast (${record.feet} feet × ${record.ballastPerFootKg} kg)`, massKg: record.feet * record.ballastPerFootKg, xM: footDepthM / 2 },
      ],
    },
    referenceHeightM: record.referenceHeightM ?? clearanceM + heightM,
    sources: [cf, ...sources],
    notes: [
      `The whole ${widthM} m run is one rigid body on ${record.feet} feet; the banner and ballast stand at the middle of the ${footDepthM} m feet.`,
      `Solidity ${solidity} is applied once, in the coefficient, on the gross area ${widthM} × ${heightM} m.`,
      'End panels carry more than the average (EN Table 7.9 zone A): check their feet and fixings separately.',
    ],
  };
}
