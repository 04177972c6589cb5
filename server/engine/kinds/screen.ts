/**
 * Screen: an LED screen or projection surface on support towers with outriggers front and back
 * (design §2.4 v2), optionally under a header truss.
 *
 * Frame (design §2.3): the screen faces the front (facingDeg 0, cfFront = cfBack). The towers
 * stand in a row along y, evenly spaced over `towerSpacingM` (centre to centre of the outer two;
 * default the screen width b: towers at the screen's edges), which is the base width. Each
 * tower's outrigger feet stand at the front and the back of the base, `outriggerDepthM` apart
 * (the base depth), at the tower's own y; its ballast is half on each. Screen and towers stand at
 * the middle of the depth.
 *
 * Wind loads:
 * - the screen on its gross area b·h with the board rule (`boardCoefficient.ts`: EN 1991-1-4
 *   §7.4.3 c_f = 1.80 when raised, Table 7.9 when on the ground, mesh through the ASCE 7
 *   reduction);
 * - the towers, each with its projected area seen from the front (towerWidthM × towerHeightM)
 *   and from the side (towerDepthM × towerHeightM, facing the y = baseWidthM end), and the header
 *   truss across the top (its length × headerTrussDepthM), with a member coefficient on the
 *   envelope area (`memberCoefficients.ts`: a solid square section, EN §7.6, conservative for a
 *   lattice). No shielding by the screen is credited.
 * Every wind force is multiplied by the structural factor c_s·c_d (EN 1991-1-4 §6; default 1,
 * an engineer's value in `structuralFactor`). A screen whose top is above about 15 m, or one on
 * a crane, is warned about when no factor is given: c_s·c_d = 1 is then an assumption.
 *
 * Two things are assessed:
 * - The body: the whole screen on all its towers as one rigid body.
 * - The element "tower at the y = 0 end": one tower on its own outriggers with its ballast. EN
 *   1991-1-4 §7.4.3 puts the resultant on a signboard at e = ±0.25·b from the centre (oblique
 *   wind), so the towers do not share the load equally. For two towers s apart the lever rule
 *   gives the near tower η = 0.5 + e/s of the screen's wind: 0.75 with towers at the edges
 *   (s = b), more with towers inboard. With e toward the y = baseWidthM end the other tower is
 *   the near one and the same, by symmetry; one element stands for both. The truss's load is
 *   split the same way (conservative: a uniform truss load would split equally), the tower's own
 *   faces load it in full, and it is credited with half the screen's weight. With three or more
 *   towers the split depends on the stiffness of the screen's frame: every tower is taken to
 *   carry the two-tower share η between the outer towers and none of the screen's weight
 *   (assumed; the answer warns).
 * A single tower has no tower spacing to tip across: the record is then a strip (front and back
 * only) and the answer says so.
 */
import { z } from 'zod';
import { defineKind } from './kindDefinition.ts';
import { count, coefficient, dimensionM, heightM, massKg } from '../recordFields.ts';
import type { Element, Face, Mass } from '../structure.ts';
import { boardForceCoefficient } from './boardCoefficient.ts';
import type { SourcedValue } from './coefficients.ts';
import { memberCoefficients, memberSizes, structuralFactorDefault, tallScreenTopM } from './memberCoefficients.ts';
import { chosenCoefficient, recordBaseShape, requireCoefficientSource, resistanceSettings, type Expansion, type SourceNote } from './recordBase.ts';

/** EN 1991-1-4 §7.4.3: horizontal eccentricity of a signboard's resultant, as a fraction of its width b. */
export const signboardEccentricityFraction = 0.25;
/** Beyond this many towers the ballast rows are listed as one mass each at the middle (same moments). */
const towersListedSingly = 60;
/** Highest face coefficient the expanded structure accepts (recordFields `coefficient`). */
const highestCoefficient = 4;

export const screenRecordSchema = z
  .strictObject({
    kind: z.literal('screen'),
    ...recordBaseShape,
    /** Width of the screen surface, b, m. */
    widthM: dimensionM(),
    /** Height of the screen surface, h, m. */
    heightM: dimensionM(),
    /** Height of the screen's bottom edge above the ground, z_g, m. */
    bottomHeightM: heightM(),
    /** Solid area / gross area: 1 for a closed screen (default), less for a mesh LED screen (from the manufacturer). */
    solidity: z.number().gt(0, 'must be > 0').lte(1, 'must be ≤ 1').optional(),
    /** Number of support towers, in a row across the screen. */
    supportTowers: count(1),
    /** Each tower with its base and outriggers, kg. */
    towerMassKg: massKg(),
    /** Screen panels and their frame (and the header truss), kg. */
    screenMassKg: massKg(),
    /** Spread of each tower's outrigger feet from front to back: the base depth, m. */
    outriggerDepthM: dimensionM(),
    /** Ballast per tower, half on its front and half on its back outrigger foot, kg. */
    ballastPerTowerKg: massKg(),
    /**
     * Centre-to-centre distance of the two outer towers across the screen, m: the base width.
     * Default: the screen width b (towers at the screen's edges). Towers inboard of the edges take
     * more of the eccentric load (EN 1991-1-4 §7.4.3): give it then.
     */
    towerSpacingM: dimensionM().optional(),
    /** Width of each tower seen from the front, m (its envelope; 0 to leave it out). Default 0.4 m (a 400 mm box truss). */
    towerWidthM: heightM().optional(),
    /** Depth of each tower seen from the side, m (its envelope). Default: towerWidthM (a square tower). */
    towerDepthM: heightM().optional(),
    /** Height of the towers, m. Default: the top of the screen plus the header truss. */
    towerHeightM: dimensionM().optional(),
    /** Depth of the header truss across the top of the screen, m (0 when there is none). Default 0.4 m (a 400 mm box truss). */
    headerTrussDepthM: heightM().optional(),
    /**
     * Structural factor c_s·c_d (EN 1991-1-4 §6) from an engineer, for a tall or slender support
     * that responds dynamically; default 1. Multiplies every wind force on the screen, towers and
     * truss. Needs coefficientSource.
     */
    structuralFactor: z.number().gt(0, 'must be > 0').lte(2, 'must be ≤ 2').optional(),
    /** True when the screen hangs from a crane: a slender support, so c_s·c_d = 1 is warned about unless structuralFactor is given. */
    onCrane: z.boolean().optional(),
    /**
     * Coefficients replacing the defaults (each needs coefficientSource): `cf` of the screen on its
     * gross area (solidity then not applied again), `towerCf` and `trussCf` on the members'
     * envelope areas.
     */
    coefficients: z.strictObject({ cf: coefficient().optional(), towerCf: coefficient().optional(), trussCf: coefficient().optional() }).optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    if (record.structuralFactor !== undefined && record.coefficientSource === undefined) {
      ctx.addIssue({ code: 'custom', path: ['coefficientSource'], message: 'is required when structuralFactor is given: name the engineer’s calculation or the standard and clause' });
    }
    if (record.towerSpacingM !== undefined && record.supportTowers < 2) {
      ctx.addIssue({ code: 'custom', path: ['towerSpacingM'], message: 'needs at least two support towers' });
    }
    const totalKg = record.screenMassKg + record.supportTowers * (record.towerMassKg + record.ballastPerTowerKg);
    if (totalKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['ballastPerTowerKg'], message: 'total mass must be > 0 kg: give the masses or the ballast' });
    }
    const factor = record.structuralFactor ?? 1;
    let chosen: Record<string, SourceNote>;
    try {
      chosen = screenCoefficients(record);
    } catch (error) {
      // A dimension out of range (already reported by its own field check) leaves no coefficient to compare.
      if (error instanceof RangeError) return;
      throw error;
    }
    for (const [name, value] of Object.entries(chosen)) {
      if (factor * value.value > highestCoefficient) {
        ctx.addIssue({
          code: 'custom',
          path: ['structuralFactor'],
          message: `× the ${name} coefficient ${value.value} gives ${(factor * value.value).toFixed(3)}, above ${highestCoefficient}: check both`,
        });
      }
    }
  });

export type ScreenRecord = z.infer<typeof screenRecordSchema>;

type CoefficientInput = Pick<ScreenRecord, 'widthM' | 'heightM' | 'bottomHeightM' | 'solidity' | 'coefficients' | 'coefficientSource' | 'towerWidthM' | 'towerDepthM'>;

/** The screen's, towers' and truss's coefficients, defaults or given, with their sources. */
function screenCoefficients(record: CoefficientInput): Record<'screen' | 'tower' | 'truss', SourceNote> {
  const { coefficients, coefficientSource } = record;
  return {
    screen: chosenCoefficient(
      'c_f of the screen on the gross area b·h (front and back)',
      boardForceCoefficient({ widthM: record.widthM, heightM: record.heightM, clearanceM: record.bottomHeightM, solidity: record.solidity ?? 1 }),
      coefficients?.cf,
      coefficientSource,
    ),
    tower: chosenCoefficient(
      'c_f of each tower on its envelope area (front and side)',
      record.towerDepthM !== undefined && record.towerDepthM !== (record.towerWidthM ?? memberSizes.towerWidthM.value)
        ? memberCoefficients.rectangularSection
        : memberCoefficients.squareSection,
      coefficients?.towerCf,
      coefficientSource,
    ),
    truss: chosenCoefficient('c_f of the header truss on its envelope area (front and back)', memberCoefficients.squareSection, coefficients?.trussCf, coefficientSource),
  };
}

/** A size the record gives, or its default with the default's source noted. */
function sizeM(item: string, given: number | undefined, fallback: SourcedValue, sources: SourceNote[]): number {
  if (given !== undefined) return given;
  sources.push({ item, ...fallback });
  return fallback.value;
}

function rounded(value: number, places = 3): number {
  const scale = 10 ** places;
  return Math.round(value * scale) / scale;
}

/**
 * The towers' height as the record gives it, or as derived when it does not: up to the screen's
 * top and its header truss. A configuration that lowers the screen on its towers keeps this height
 * (engine/configuration.ts): the towers stay standing.
 */
export function screenTowerHeightM(record: Pick<ScreenRecord, 'towerHeightM' | 'bottomHeightM' | 'heightM' | 'headerTrussDepthM'>): number {
  return record.towerHeightM ?? record.bottomHeightM + record.heightM + (record.headerTrussDepthM ?? memberSizes.headerTrussDepthM.value);
}

/** Changes that move a screen on its towers (lowered, raised, a deeper truss), not the towers. */
const screenOnTowerFields = ['bottomHeightM', 'heightM', 'headerTrussDepthM'];

/**
 * A screen lowered on its towers leaves the towers standing: when the record derives the towers'
 * height from the screen's top (no `towerHeightM`) and a configuration moves the screen but does
 * not set `towerHeightM`, the towers keep their registered height. Without this a lowered screen's
 * towers would be modelled shorter, with less wind on them and a lower reference height: about 5 %
 * on the limit of the demo's screen, on the unsafe side (engineering review, issue 14).
 */
function keepTowersStanding(registered: ScreenRecord, changed: Record<string, unknown>, changedFields: readonly string[]): void {
  if (registered.towerHeightM === undefined && !changedFields.includes('towerHeightM') && changedFields.some((f) => screenOnTowerFields.includes(f))) {
    changed.towerHeightM = screenTowerHeightM(registered);
  }
}

export function expandScreen(record: ScreenRecord): Expansion {
  const { widthM, heightM, bottomHeightM, outriggerDepthM, supportTowers } = record;
  const { settings, sources: resistanceSources, warnings: resistanceWarnings } = resistanceSettings(record, { steelFeet: true });
  const coefficients = screenCoefficients(record);
  const sources: SourceNote[] = [coefficients.screen, coefficients.tower, coefficients.truss];
  const towerWidthM = sizeM('tower width seen from the front, m', record.towerWidthM, memberSizes.towerWidthM, sources);
  const towerDepthM = record.towerDepthM ?? towerWidthM;
  const trussDepthM = sizeM('header truss depth, m', record.headerTrussDepthM, memberSizes.headerTrussDepthM, sources);
  const screenTopM = bottomHeightM + heightM;
  const towerHeightM = record.towerHeightM ?? screenTopM + trussDepthM;
  const topM = Math.max(towerHeightM, screenTopM + trussDepthM);

  const factor = record.structuralFactor ?? structuralFactorDefault.value;
  sources.push(
    record.structuralFactor === undefined
      ? { item: 'structural factor c_s·c_d', ...structuralFactorDefault }
      : { item: 'structural factor c_s·c_d', value: factor, source: `given in the record: ${record.coefficientSource ?? 'no source stated'}` },
  );
  const screenCf = factor * coefficients.screen.value;
  const towerCf = factor * coefficients.tower.value;
  const trussCf = factor * coefficients.truss.value;

  const towered = supportTowers >= 2;
  const spacingM = towered ? (record.towerSpacingM ?? widthM) : 0;
  const trussLengthM = Math.max(widthM, spacingM + towerWidthM);
  const towerYM = (index: number) => (index === supportTowers - 1 ? spacingM : Math.min(spacingM, (spacingM * index) / (supportTowers - 1)));
  const middleXM = outriggerDepthM / 2;
  const screenCentroidM = bottomHeightM + heightM / 2;
  const trussCentroidM = screenTopM + trussDepthM / 2;

  /** The faces of the screen and truss at a share of their load, and of `towers` towers in full. */
  const facesFor = (share: number, towers: number, what: string): Face[] => {
    const faces: Face[] = [
      { label: `screen${what}`, areaM2: share * widthM * heightM, centroidHeightM: screenCentroidM, cfFront: screenCf, cfBack: screenCf, facingDeg: 0 },
    ];
    if (trussDepthM > 0) {
      faces.push({ label: `header truss${what}`, areaM2: share * trussLengthM * trussDepthM, centroidHeightM: trussCentroidM, cfFront: trussCf, cfBack: trussCf, facingDeg: 0 });
    }
    const towersWord = towers === 1 ? 'tower' : `${towers} towers`;
    if (towerWidthM > 0) {
      faces.push({ label: `${towersWord}, seen from the front`, areaM2: towers * towerWidthM * towerHeightM, centroidHeightM: towerHeightM / 2, cfFront: towerCf, cfBack: towerCf, facingDeg: 0 });
    }
    if (towerDepthM > 0) {
      faces.push({ label: `${towersWord}, seen from the side`, areaM2: towers * towerDepthM * towerHeightM, centroidHeightM: towerHeightM / 2, cfFront: towerCf, cfBack: towerCf, facingDeg: 90 });
    }
    return faces;
  };

  const halfBallastKg = record.ballastPerTowerKg / 2;
  const masses: Mass[] = [];
  if (!towered) {
    masses.push(
      { label: 'screen', massKg: record.screenMassKg, xM: middleXM },
      { label: 'support tower', massKg: record.towerMassKg, xM: middleXM },
      { label: 'ballast on the front outrigger foot', massKg: halfBallastKg, xM: 0 },
      { label: 'ballast on the back outrigger foot', massKg: halfBallastKg, xM: outriggerDepthM },
    );
  } else if (supportTowers <= towersListedSingly) {
    masses.push({ label: 'screen', massKg: record.screenMassKg, xM: middleXM, yM: spacingM / 2 });
    for (let index = 0; index < supportTowers; index++) {
      const yM = towerYM(index);
      masses.push(
        { label: `tower ${index + 1}`, massKg: record.towerMassKg, xM: middleXM, yM },
        { label: `tower ${index + 1} ballast, front outrigger foot`, massKg: halfBallastKg, xM: 0, yM },
        { label: `tower ${index + 1} ballast, back outrigger foot`, massKg: halfBallastKg, xM: outriggerDepthM, yM },
      );
    }
  } else {
    // Evenly spaced equal towers: each row's resultant is at the middle (same moment about every edge).
    masses.push(
      { label: 'screen', massKg: record.screenMassKg, xM: middleXM, yM: spacingM / 2 },
      { label: `support towers (${supportTowers} × ${record.towerMassKg} kg)`, massKg: supportTowers * record.towerMassKg, xM: middleXM, yM: spacingM / 2 },
      { label: 'ballast on the front outrigger feet', massKg: supportTowers * halfBallastKg, xM: 0, yM: spacingM / 2 },
      { label: 'ballast on the back outrigger feet', massKg: supportTowers * halfBallastKg, xM: outriggerDepthM, yM: spacingM / 2 },
    );
  }

  const eccentricityM = signboardEccentricityFraction * widthM;
  const notes = [
    towered
      ? `Base: ${rounded(outriggerDepthM)} m deep (outrigger spread) × ${rounded(spacingM)} m wide (${supportTowers} towers evenly spaced over ${rounded(spacingM)} m, ` +
        `${record.towerSpacingM === undefined ? 'the screen width: towers at its edges' : 'as given'}); each tower's ballast half on its front and half on its back outrigger foot; screen and towers at the middle of the depth.`
      : `Base: ${rounded(outriggerDepthM)} m deep (outrigger spread) on one tower; screen and tower at the middle, the ballast half on each outrigger foot.`,
    `Loaded: the screen ${rounded(widthM)} × ${rounded(heightM)} m, ${supportTowers === 1 ? 'the tower' : `${supportTowers} towers`} ${rounded(towerWidthM)} m wide and ${rounded(towerDepthM)} m deep ` +
      `to ${rounded(towerHeightM)} m${trussDepthM > 0 ? `, a header truss ${rounded(trussLengthM)} × ${rounded(trussDepthM)} m` : ''}; every force × c_s·c_d = ${factor}. The screen is not credited with shielding the towers.`,
  ];
  const warnings: string[] = [...resistanceWarnings];
  const elements: Element[] = [];
  if (towered) {
    const nearShare = 0.5 + eccentricityM / spacingM;
    sources.push(
      { item: 'eccentricity of the resultant, fraction of the screen width b', value: signboardEccentricityFraction, source: 'EN 1991-1-4 §7.4.3: e = ±0.25·b for signboards (oblique wind)' },
      {
        item: 'share of the screen’s and truss’s wind on the tower at the y = 0 end',
        value: nearShare,
        source:
          supportTowers === 2
            ? `statics, lever rule: resultant e = ${rounded(eccentricityM)} m off centre toward the tower, towers ${rounded(spacingM)} m apart: 0.5 + e/s`
            : `assumed: the two-tower lever rule between the outer towers, 0.5 + e/s (e = ${rounded(eccentricityM)} m, s = ${rounded(spacingM)} m), taken for every tower of the ${supportTowers}`,
      },
    );
    const screenWeightShare = supportTowers === 2 ? 0.5 : 0;
    const elementMasses: Mass[] = [
      { label: 'tower', massKg: record.towerMassKg, xM: middleXM },
      { label: 'ballast on the front outrigger foot', massKg: halfBallastKg, xM: 0 },
      { label: 'ballast on the back outrigger foot', massKg: halfBallastKg, xM: outriggerDepthM },
    ];
    if (screenWeightShare > 0) elementMasses.push({ label: 'half the screen’s weight', massKg: screenWeightShare * record.screenMassKg, xM: middleXM });
    elements.push({
      name: 'tower at the y = 0 end',
      baseDepthM: outriggerDepthM,
      frictionCoefficient: settings.frictionCoefficient,
      safetyFactors: settings.safetyFactors,
      faces: facesFor(nearShare, 1, ` (${rounded(nearShare, 4)} share)`),
      masses: elementMasses,
    });
    notes.push(
      `EN 1991-1-4 §7.4.3: the resultant may sit ±0.25·b = ${eccentricityM.toFixed(2)} m off centre, so the towers do not share equally. ` +
        `Element "tower at the y = 0 end": with e toward it, ${supportTowers === 2 ? 'by the lever rule' : 'as for two towers'} it takes 0.5 + e/s = ${rounded(nearShare, 4)} ` +
        `of the screen's and truss's wind, its own tower's wind in full, on its own ${rounded(outriggerDepthM)} m outriggers with its ballast` +
        `${screenWeightShare > 0 ? ' and half the screen’s weight' : ''}. The tower at the other end is the same with e toward it (symmetry). ` +
        `The torsion on the pair is F·e.`,
    );
    if (supportTowers >= 3) {
      warnings.push(
        `${supportTowers} support towers: how the screen's wind divides between them depends on the stiffness of its frame. Each tower was checked with the ` +
          `two-tower lever-rule share ${rounded(nearShare, 4)} between the outer towers and without the screen's weight (assumed): have the tower reactions checked.`,
      );
    }
  } else {
    warnings.push(
      'One support tower: the record gives no spread across the screen, so it was assessed as a strip (front and back only); tipping toward the ends and the ' +
        'torsion from the eccentricity e = ±0.25·b (EN 1991-1-4 §7.4.3) were not checked.',
    );
  }

  if (record.structuralFactor === undefined && (topM > tallScreenTopM || record.onCrane === true)) {
    const why = record.onCrane === true ? 'the screen hangs from a crane (a slender support)' : `the top is ${rounded(topM, 2)} m above the ground, above about ${tallScreenTopM} m`;
    warnings.push(
      `c_s·c_d = 1 was assumed (EN 1991-1-4 §6, structural factor), but ${why}: its support may respond dynamically to gusts. ` +
        'Have an engineer give structuralFactor (with coefficientSource).',
    );
  }
  if (record.structuralFactor !== undefined) notes.push(`Structural factor c_s·c_d = ${factor} as given (${record.coefficientSource ?? 'no source stated'}).`);

  return {
    structure: {
      baseDepthM: outriggerDepthM,
      ...(towered ? { baseWidthM: spacingM } : {}),
      ...settings,
      faces: facesFor(1, supportTowers, ''),
      masses,
      ...(elements.length > 0 ? { elements } : {}),
    },
    referenceHeightM: record.referenceHeightM ?? topM,
    sources: [...sources, ...resistanceSources],
    notes,
    ...(warnings.length > 0 ? { warnings } : {}),
  };
}

/** The screen kind as the engine's kind list holds it (kinds/index.ts, kindDefinition.ts). */
export const screenKind = defineKind({
  kind: 'screen',
  schema: screenRecordSchema,
  recordWords: 'a screen',
  expand: expandScreen,
  configured: keepTowersStanding,
});
