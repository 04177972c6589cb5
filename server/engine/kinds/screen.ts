/**
 * Screen: an LED screen or projection surface raised on support towers with outriggers front and
 * back. The outrigger spread is the base depth; each tower's ballast is split equally between
 * its front and back outrigger feet; screen and towers stand at the middle.
 */
import { z } from 'zod';
import { count, coefficient, dimensionM, heightM, massKg } from '../recordFields.ts';
import { boardForceCoefficient } from './boardCoefficient.ts';
import { chosenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion } from './recordBase.ts';

export const screenRecordSchema = z
  .strictObject({
    kind: z.literal('screen'),
    ...recordBaseShape,
    widthM: dimensionM(),
    heightM: dimensionM(),
    /** Height of the screen's bottom edge above the ground, z_g, m. */
    bottomHeightM: heightM(),
    /** Solid area / gross area: 1 for a closed screen (default), less for a mesh LED screen. */
    solidity: z.number().gt(0, 'must be > 0').lte(1, 'must be ≤ 1').optional(),
    supportTowers: count(1),
    /** Each tower with its base and outriggers, kg. */
    towerMassKg: massKg(),
    /** Screen panels and their frame, kg. */
    screenMassKg: massKg(),
    /** Spread of the outrigger feet in the wind direction: the base depth, m. */
    outriggerDepthM: dimensionM(),
    /** Ballast per tower, half on its front and half on its back outrigger foot, kg. */
    ballastPerTowerKg: massKg(),
    coefficients: z.strictObject({ cf: coefficient().optional() }).optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    const totalKg = record.screenMassKg + record.supportTowers * (record.towerMassKg + record.ballastPerTowerKg);
    if (totalKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['ballastPerTowerKg'], message: 'total mass must be > 0 kg: give the masses or the ballast' });
    }
  });

export type ScreenRecord = z.infer<typeof screenRecordSchema>;

export function expandScreen(record: ScreenRecord): Expansion {
  const { widthM, heightM, bottomHeightM, outriggerDepthM, supportTowers } = record;
  const solidity = record.solidity ?? 1;
  const { settings, sources } = resistanceSettings(record);
  const cf = chosenCoefficient(
    'c_f on the gross area b·h (front and back)',
    boardForceCoefficient({ widthM, heightM, clearanceM: bottomHeightM, solidity }),
    record.coefficients?.cf,
    record.coefficientSource,
  );
  const ballastPerFootRowKg = (supportTowers * record.ballastPerTowerKg) / 2;
  return {
    structure: {
      baseDepthM: outriggerDepthM,
      ...settings,
      faces: [{ label: 'screen', areaM2: widthM * heightM, centroidHeightM: bottomHeightM + heightM / 2, cfFront: cf.value, cfBack: cf.value }],
      masses: [
        { label: 'screen', massKg: record.screenMassKg, xM: outriggerDepthM / 2 },
        { label: `support towers (${supportTowers} × ${record.towerMassKg} kg)`, massKg: supportTowers * record.towerMassKg, xM: outriggerDepthM / 2 },
        { label: 'ballast on the front outrigger feet', massKg: ballastPerFootRowKg, xM: 0 },
        { label: 'ballast on the back outrigger feet', massKg: ballastPerFootRowKg, xM: outriggerDepthM },
      ],
    },
    referenceHeightM: record.referenceHeightM ?? bottomHeightM + heightM,
    sources: [cf, ...sources],
    notes: [
      `Base depth = outrigger spread ${outriggerDepthM} m; screen and towers at the middle, each tower's ballast half on each outrigger foot.`,
      `EN 1991-1-4 §7.4.3: the resultant may sit ±0.25·b = ${(0.25 * widthM).toFixed(2)} m off centre; the torsion on the towers is not assessed here.`,
      'The towers and trusses are not loaded: add them as faces of a custom record when they are large.',
    ],
  };
}
