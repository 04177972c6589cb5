/**
 * Banner: a fence run, hoarding or mesh scrim (design §2.4 v2). A row of flat panels, each
 * `panelWidthM` wide and `heightM` high with a clearance under it, solid or mesh, standing on
 * feet evenly spaced along the run (by default one at every joint and one at each end:
 * panels + 1). The feet are `footDepthM` deep across the run: that is the base depth; the base
 * width is the run's length. The panels stand at the middle of the feet and the ballast sits on
 * them, so the front and back are alike.
 *
 * Frame (design §2.3): the run lies along y, from its y = 0 end to its y = baseWidthM end; its
 * faces look to the front and the back (facingDeg 0, cfFront = cfBack). Wind end-on, along the
 * run (θ = 90 or 270), meets the panels edge-on and loads nothing; wind 45° off the front loads
 * the panels fully (ψ(45°) = 1: EN 1991-1-4 §7.4 covers oblique wind on walls and boards in its
 * coefficients, not by a reduction).
 *
 * Two things are assessed:
 * - The body: the whole run as one rigid body (panels clamped together) on all its feet, loaded
 *   with the board rule of `boardCoefficient.ts`: EN 1991-1-4 Table 7.9 averaged over the zones
 *   along the length (a board on the ground), §7.4.3 c_f = 1.80 for a raised board, §7.11 for
 *   mesh (φ < 0.8) through the ASCE 7 reduction, on the gross area.
 * - The element "end panel at the y = 0 end": the panel at a free end, which carries the Table 7.9
 *   zone A and B pressures, on its own feet. A rigid-body average hides it (issue 11 item 7).
 *   Each foot's ballast is shared between the panels by its tributary length of run (from the
 *   midpoint to its neighbour on each side): the end foot serves only the end panel and counts in
 *   full; the foot at the first joint serves two panels and counts one half (common practice:
 *   tributary lengths; the neighbouring panel, loaded by zone B itself, needs its own half). The
 *   frame's self-weight is shared by length. The y = baseWidthM end is the same by symmetry, so
 *   one element stands for both. The panels' couplers are not credited with holding the end
 *   panel up: a long run twists, and its free end goes first.
 *
 * Old records (`widthM` and `feet`, no panels) keep their meaning: the run is `widthM` long on
 * `feet` feet evenly spaced from end to end, so it has feet − 1 panels of widthM / (feet − 1)
 * (one panel when there is one foot, at the middle).
 */
import { z } from 'zod';
import { defineKind } from './kindDefinition.ts';
import { count, coefficient, dimensionM, heightM, massKg } from '../recordFields.ts';
import type { Element, Mass } from '../structure.ts';
import { boardForceCoefficient, freeStandingWallStretchCpNet } from './boardCoefficient.ts';
import {
  chosenCoefficient,
  givenCoefficient,
  recordBaseShape,
  requireCoefficientSource,
  resistanceSettings,
  type Expansion,
  type SourceNote,
} from './recordBase.ts';

/** Longest run the base accepts, m (the expanded structure's bound on baseWidthM). */
const longestRunM = 200;
/** Panel count × panel width must match widthM to within this, m. */
const lengthToleranceM = 0.01;
/** Beyond this many feet the interior feet are listed as one mass at the middle (same moments). */
const feetListedSingly = 150;

export const bannerRecordSchema = z
  .strictObject({
    kind: z.literal('banner'),
    ...recordBaseShape,
    /**
     * Length of the whole run, b, m. Give it, or `panelWidthM` with `panels` (or with `feet`):
     * then b = panelWidthM × panels.
     */
    widthM: dimensionM().optional(),
    /**
     * Width of one panel along the run, m (a foot at every joint). Default: the run's length ÷ the
     * number of panels.
     */
    panelWidthM: dimensionM().optional(),
    /**
     * Number of panels in the run. Default: widthM ÷ panelWidthM when both are given, else
     * feet − 1 (a foot at every joint and at both ends; one panel when there is one foot).
     */
    panels: count(1).optional(),
    /** Height of the banner itself, h, m (not counting the gap under it). */
    heightM: dimensionM(),
    /** Gap between the ground and the banner's bottom edge, z_g, m. Raised more than h/4 it is a signboard (EN 1991-1-4 §7.4.3). */
    clearanceM: heightM(),
    /** Solid area / gross area: 1 solid (default), about 0.3–0.7 for mesh. A mesh that clogs with dirt or rain acts as solid. */
    solidity: z.number().gt(0, 'must be > 0 (0 would be no banner)').lte(1, 'must be ≤ 1').optional(),
    /**
     * Number of feet along the run, evenly spaced from one end to the other. Default: panels + 1
     * (one at every joint and one at each end).
     */
    feet: count(1).optional(),
    /** Ballast on each foot, kg. */
    ballastPerFootKg: massKg(),
    /**
     * Ballast on each of the two end feet, kg. Default: ballastPerFootKg. The end panels carry the
     * most wind (EN 1991-1-4 Table 7.9 zone A at a free end): extra weight belongs here.
     */
    endFootBallastKg: massKg().optional(),
    /** Depth of a foot across the run (in the wind direction onto the front): the base depth, m. */
    footDepthM: dimensionM(),
    /** Banner, frame and feet of the whole run, kg: spread evenly along it. */
    selfWeightKg: massKg(),
    /**
     * Coefficients replacing the default rules (each needs coefficientSource). `cf`: force
     * coefficient of the whole run on its gross area (solidity then not applied again); the end
     * panel then takes cf × the Table 7.9 ratio of its zones to the run's mean. `endPanelCf`: the
     * end panel's coefficient on its gross area, replacing that.
     */
    coefficients: z.strictObject({ cf: coefficient().optional(), endPanelCf: coefficient().optional() }).optional(),
  })
  .superRefine((record, ctx) => {
    requireCoefficientSource(record, ctx);
    const layout = bannerLayout(record);
    if (!layout.ok) {
      for (const issue of layout.issues) ctx.addIssue({ code: 'custom', path: [issue.path], message: issue.message });
      return;
    }
    const totalKg = record.selfWeightKg + layout.value.feetPositionsM.reduce((sumKg, _y, index) => sumKg + footBallastKg(record, layout.value, index), 0);
    if (totalKg <= 0) {
      ctx.addIssue({ code: 'custom', path: ['ballastPerFootKg'], message: 'total mass must be > 0 kg: give the self-weight or the ballast' });
    }
  });

export type BannerRecord = z.infer<typeof bannerRecordSchema>;

/** The run's geometry as derived from whichever of widthM, panelWidthM, panels and feet were given. */
export interface BannerLayout {
  runLengthM: number;
  panels: number;
  panelWidthM: number;
  feet: number;
  /** Each foot's position along the run from the y = 0 end, m. */
  feetPositionsM: number[];
}

type LayoutInput = Pick<BannerRecord, 'widthM' | 'panelWidthM' | 'panels' | 'feet'>;
type LayoutResult = { ok: true; value: BannerLayout } | { ok: false; issues: Array<{ path: string; message: string }> };

/**
 * Derives the run from the record (see the module comment): panels from `panels`, else
 * widthM ÷ panelWidthM (a whole number), else feet − 1; length from `widthM`, else
 * panelWidthM × panels; feet from `feet`, else panels + 1, evenly spaced from end to end.
 */
export function bannerLayout(record: LayoutInput): LayoutResult {
  const { widthM, panelWidthM } = record;
  // Values out of their own field's range are reported by that field's check: nothing to derive.
  const positive = (value: number | undefined) => value === undefined || (Number.isFinite(value) && value > 0 && value <= longestRunM);
  const wholeCount = (value: number | undefined) => value === undefined || (Number.isInteger(value) && value >= 1 && value <= 1000);
  if (!positive(widthM) || !positive(panelWidthM) || !wholeCount(record.panels) || !wholeCount(record.feet)) return { ok: false, issues: [] };
  let panels = record.panels;
  if (panels === undefined && widthM !== undefined && panelWidthM !== undefined) {
    const ratio = widthM / panelWidthM;
    panels = Math.max(1, Math.round(ratio));
  }
  if (panels === undefined && record.feet !== undefined) panels = Math.max(1, record.feet - 1);
  if (panels === undefined) {
    // Nothing about the length at all: the panel width is the natural way in (the form's first field).
    const nothing = widthM === undefined && panelWidthM === undefined;
    return {
      ok: false,
      issues: [
        nothing
          ? { path: 'panelWidthM', message: 'is required with the number of panels (the feet follow: one at every joint and one at each end); or give the run’s length, widthM, with panels or feet' }
          : { path: 'panels', message: 'is required: the number of panels (the feet follow: one at every joint and one at each end), or give the number of feet' },
      ],
    };
  }
  const runLengthM = widthM ?? (panelWidthM === undefined ? undefined : panelWidthM * panels);
  if (runLengthM === undefined) {
    return { ok: false, issues: [{ path: 'panelWidthM', message: 'is required: the width of one panel, or give the run’s length, widthM' }] };
  }
  if (widthM !== undefined && panelWidthM !== undefined && Math.abs(panels * panelWidthM - widthM) > lengthToleranceM) {
    return {
      ok: false,
      issues: [{
        path: 'panelWidthM',
        message: `${panels} panels × ${panelWidthM} m make ${(panels * panelWidthM).toFixed(3)} m, but the run’s length, widthM, is ${widthM} m: they must agree to within 1 cm (or leave one of them out)`,
      }],
    };
  }
  if (runLengthM > longestRunM) {
    return { ok: false, issues: [{ path: 'panelWidthM', message: `panels × panelWidthM make ${runLengthM} m: at most ${longestRunM} m in one record (split a longer run into several records)` }] };
  }
  const feet = record.feet ?? panels + 1;
  const feetPositionsM =
    feet === 1
      ? [runLengthM / 2]
      : Array.from({ length: feet }, (_, index) => (index === feet - 1 ? runLengthM : Math.min(runLengthM, (runLengthM * index) / (feet - 1))));
  return { ok: true, value: { runLengthM, panels, panelWidthM: panelWidthM ?? runLengthM / panels, feet, feetPositionsM } };
}

/** Ballast on foot `index`: the two end feet take endFootBallastKg when given (a single foot is not an end foot). */
function footBallastKg(record: Pick<BannerRecord, 'ballastPerFootKg' | 'endFootBallastKg'>, layout: BannerLayout, index: number): number {
  const isEnd = layout.feet >= 2 && (index === 0 || index === layout.feet - 1);
  return isEnd ? (record.endFootBallastKg ?? record.ballastPerFootKg) : record.ballastPerFootKg;
}

/**
 * The part of foot `index`'s ballast that holds the stretch [0, w] of the run: the share of its
 * tributary length (from the midpoint to its neighbour on each side, clipped at the run's ends)
 * that lies on the stretch.
 */
function tributaryShare(positionsM: readonly number[], index: number, runLengthM: number, stretchM: number): number {
  const startM = index === 0 ? 0 : (positionsM[index - 1]! + positionsM[index]!) / 2;
  const endM = index === positionsM.length - 1 ? runLengthM : (positionsM[index]! + positionsM[index + 1]!) / 2;
  const overlapM = Math.max(0, Math.min(endM, stretchM) - startM);
  return overlapM / (endM - startM);
}

const percent = (share: number) => `${Math.round(share * 1000) / 10} %`;

export function expandBanner(record: BannerRecord): Expansion {
  const layoutResult = bannerLayout(record);
  if (!layoutResult.ok) throw new RangeError(`expandBanner: ${layoutResult.issues.map((issue) => `${issue.path} ${issue.message}`).join('; ')}`);
  const layout = layoutResult.value;
  const { runLengthM, panels, panelWidthM, feet, feetPositionsM } = layout;
  const { heightM, clearanceM, footDepthM } = record;
  const solidity = record.solidity ?? 1;
  const middleXM = footDepthM / 2;
  const centroidHeightM = clearanceM + heightM / 2;
  const { settings, sources, warnings: resistanceWarnings } = resistanceSettings(record);
  const cf = chosenCoefficient(
    'c_f of the whole run on the gross area b·h (front and back)',
    boardForceCoefficient({ widthM: runLengthM, heightM, clearanceM, solidity }),
    record.coefficients?.cf,
    record.coefficientSource,
  );

  const masses: Mass[] = [{ label: 'banner, frame and feet (spread along the run)', massKg: record.selfWeightKg, xM: middleXM, yM: runLengthM / 2 }];
  if (feet <= feetListedSingly) {
    feetPositionsM.forEach((yM, index) => {
      masses.push({ label: `foot ${index + 1} ballast`, massKg: footBallastKg(record, layout, index), xM: middleXM, yM });
    });
  } else {
    // Evenly spaced equal interior feet: their resultant is at the middle (same moment about every edge).
    masses.push({ label: 'end foot ballast (y = 0)', massKg: footBallastKg(record, layout, 0), xM: middleXM, yM: 0 });
    masses.push({ label: `interior feet ballast (${feet - 2} × ${record.ballastPerFootKg} kg)`, massKg: (feet - 2) * record.ballastPerFootKg, xM: middleXM, yM: runLengthM / 2 });
    masses.push({ label: `end foot ballast (y = ${runLengthM} m)`, massKg: footBallastKg(record, layout, feet - 1), xM: middleXM, yM: runLengthM });
  }

  const elementSources: SourceNote[] = [];
  const elements: Element[] = [];
  const notes = [
    `The run is ${round(runLengthM)} m long (base width) in ${panels} panel${panels === 1 ? '' : 's'} of ${round(panelWidthM)} m on ${feet} feet evenly spaced from end to end; ` +
      `the feet are ${footDepthM} m deep (base depth), the banner and its ballast stand at their middle.`,
    `Body: the whole run as one rigid body; solidity ${solidity} is applied once, in the coefficient, on the gross area ${round(runLengthM)} × ${heightM} m.`,
    'Wind end-on (along the run) meets the panels edge-on and loads nothing here; 45° off the front they take their full normal force (ψ = 1 within 60° of the normal).',
  ];
  if (panels >= 2) {
    const endPanel = endPanelCoefficient(record, { runLengthM, panelWidthM, heightM, clearanceM, solidity }, cf);
    elementSources.push(endPanel);
    const elementMasses: Mass[] = [
      { label: 'self-weight share (by length)', massKg: (record.selfWeightKg * panelWidthM) / runLengthM, xM: middleXM, yM: panelWidthM / 2 },
    ];
    feetPositionsM.forEach((yM, index) => {
      const share = tributaryShare(feetPositionsM, index, runLengthM, panelWidthM);
      if (share <= 1e-12) return;
      elementMasses.push({
        label: `foot ${index + 1} ballast, ${percent(share)} of ${footBallastKg(record, layout, index)} kg (tributary share)`,
        massKg: share * footBallastKg(record, layout, index),
        xM: middleXM,
        yM: Math.min(yM, panelWidthM),
      });
    });
    elements.push({
      name: 'end panel at the y = 0 end',
      baseDepthM: footDepthM,
      baseWidthM: panelWidthM,
      ...omitRating(settings),
      faces: [{ label: 'end panel (Table 7.9 zones from the free end)', areaM2: panelWidthM * heightM, centroidHeightM, cfFront: endPanel.value, cfBack: endPanel.value, facingDeg: 0 }],
      masses: elementMasses,
    });
    elementSources.push({
      item: 'share of each foot holding the end panel',
      value: tributaryShare(feetPositionsM, Math.min(1, feet - 1), runLengthM, panelWidthM),
      source:
        'common practice: each foot holds the run over its tributary length (to the midpoint of its neighbours); the end foot counts in full, ' +
        'the value here is the next foot\u2019s share (one half when the feet stand at the joints)',
    });
    notes.push(
      `Element "end panel at the y = 0 end": the ${round(panelWidthM)} m panel at the free end with c = ${endPanel.value.toFixed(3)} (the run's ${cf.value.toFixed(3)}), ` +
        'on its own feet: the end foot in full, the others by the part of their tributary length on the panel; self-weight by length. ' +
        'The y = baseWidthM end is the same by symmetry. Couplers between panels are not credited.',
    );
  } else {
    notes.push('One panel: the run is its own end panel, so the body check is the whole check.');
  }
  if (record.endFootBallastKg === undefined) {
    notes.push('The end feet carry the same ballast as the others (endFootBallastKg not given).');
  }

  return {
    structure: {
      baseDepthM: footDepthM,
      baseWidthM: runLengthM,
      ...settings,
      faces: [{ label: 'banner run (gross area)', areaM2: runLengthM * heightM, centroidHeightM, cfFront: cf.value, cfBack: cf.value, facingDeg: 0 }],
      masses,
      ...(elements.length > 0 ? { elements } : {}),
    },
    referenceHeightM: record.referenceHeightM ?? clearanceM + heightM,
    sources: [cf, ...elementSources, ...sources],
    warnings: resistanceWarnings,
    notes,
  };
}

function round(valueM: number): number {
  return Math.round(valueM * 1000) / 1000;
}

function omitRating<T extends { ratedGustMps?: number | undefined }>(settings: T): Omit<T, 'ratedGustMps'> {
  const { ratedGustMps: _rated, ...rest } = settings;
  return rest;
}

interface RunShape {
  runLengthM: number;
  panelWidthM: number;
  heightM: number;
  clearanceM: number;
  solidity: number;
}

/**
 * The end panel's coefficient on its gross area (see the module comment):
 * - φ ≥ 0.8: the EN 1991-1-4 Table 7.9 c_p,net averaged over the panel (0 to w from the free
 *   end, zones A, B, … at the run's l/h and φ), never below the run's own c_f. A raised board
 *   (z_g > h/4) is a signboard in §7.4.3, whose free ends Table 7.9 describes best of the
 *   retrieved texts: it is applied there too (assumed, conservative: zone A is well above 1.80).
 * - φ < 0.8: a plane lattice (§7.11) has no end zones (Table 7.9 at φ 0.8 is 1.2 in every zone):
 *   the run's c_f.
 * - with the run's c_f given (coefficients.cf): that c_f × the Table 7.9 ratio of the panel's
 *   mean to the run's mean (1 below φ 0.8); with coefficients.endPanelCf: that value.
 */
function endPanelCoefficient(record: BannerRecord, run: RunShape, runCf: SourceNote): SourceNote {
  const item = 'c of the end panel on its gross area w·h (front and back)';
  if (record.coefficients?.endPanelCf !== undefined) return givenCoefficient(item, record.coefficients.endPanelCf, record.coefficientSource);
  const { runLengthM, panelWidthM, heightM, solidity } = run;
  const lengthToHeight = runLengthM / heightM;
  if (solidity < 0.8) {
    return {
      item,
      value: runCf.value,
      source: `the run's c_f: below solidity 0.8 the run is a plane lattice (EN 1991-1-4 §7.11) without end zones (Table 7.9 at φ 0.8 is 1.2 in every zone)`,
    };
  }
  const panelMean = freeStandingWallStretchCpNet({ lengthM: runLengthM, heightM, fromM: 0, toM: panelWidthM, solidity });
  const runMean = freeStandingWallStretchCpNet({ lengthM: runLengthM, heightM, fromM: 0, toM: runLengthM, solidity });
  const table = `EN 1991-1-4 Table 7.9 (no return corners) c_p,net averaged over the end panel, 0–${round(panelWidthM)} m from the free end ` +
    `(zones A 0–0.3h, B 0.3h–2h, C 2h–4h, D beyond; h = ${heightM} m), at l/h = ${lengthToHeight.toFixed(2)} and φ = ${solidity}: ${panelMean.toFixed(3)}`;
  const raised = run.clearanceM > heightM / 4 ? '; the board is raised (z_g > h/4, a §7.4.3 signboard): Table 7.9\u2019s free-end zones applied as well (assumed, conservative)' : '';
  if (record.coefficients?.cf !== undefined) {
    const ratio = panelMean / runMean;
    return {
      item,
      value: runCf.value * Math.max(1, ratio),
      source: `the given run c_f ${runCf.value} × ${Math.max(1, ratio).toFixed(4)}, the ratio of ${table} to the run's mean ${runMean.toFixed(3)}${raised}`,
    };
  }
  return {
    item,
    value: Math.max(panelMean, runCf.value),
    source: `${table}; not below the run's c_f ${runCf.value.toFixed(3)}${raised}`,
  };
}

/** The banner kind as the engine's kind list holds it (kinds/index.ts, kindDefinition.ts). */
export const bannerKind = defineKind({
  kind: 'banner',
  schema: bannerRecordSchema,
  recordWords: 'a banner',
  expand: expandBanner,
});
