/**
 * The fields of each structure kind as the register form shows them: label, unit and help text
 * (what it is, its unit, its default and where the default comes from). The help follows the
 * field docs of the record schemas (server/engine/kinds/*.ts); the default coefficients and sizes
 * and their sources are the engine's own values, imported, so the form can never quote a
 * different number than the calculator uses.
 *
 * Exceptions: the shell's default lift and dome drag (`shellCoefficients`), the signboard
 * eccentricity and the dome's opening sector live beside their kind's zod schema, and importing
 * them would put zod (about 0.4 MB) into the phone's app. They are quoted in `quotedKindValues`,
 * and tests/unit/registerFields.test.ts fails when one differs from the engine's.
 *
 * A new form starts empty: dimensions have an example in `placeholder` ("e.g. 12"), never an
 * `initial` value, so nothing is assessed on a number nobody typed. An empty field that is not
 * `optional` is reported "is required" (structureDraft.ts `draftRecord`).
 */
import { defaultCoefficients, frictionBySurface } from '../../../server/engine/kinds/coefficients.ts';
import { memberCoefficients, memberSizes, structuralFactorDefault, tallScreenTopM } from '../../../server/engine/kinds/memberCoefficients.ts';
import { defaultSafetyFactors, safetyFactorSources } from '../../../server/engine/stability.ts';
import type { StructureKind } from '../types.ts';

export type FieldKind = 'number' | 'int' | 'text' | 'bool' | 'select' | 'speed';

export interface FieldDef {
  /** Dotted path in the record: "widthM", "coefficients.cf", "safetyFactors.sliding", "sides.front". */
  path: string;
  label: string;
  unit?: string;
  kind: FieldKind;
  /** The record may leave it out (a default then applies, named in the help). Otherwise empty is "is required". */
  optional?: boolean;
  help: string;
  /** Choices of a select or bool: [value, words]. A '' value is the "not given" choice. */
  options?: Array<[string, string]>;
  /** Value a new record starts with (text as typed): only a true default, never a dimension. */
  initial?: string;
  /** Shown in the box when empty: an example ("e.g. 12") or the default that then applies. */
  placeholder?: string;
  /** Another way to give what the fields before it give (a fence's run length and feet): shown folded, under the others. */
  alternative?: boolean;
}

/**
 * Common fence and barrier panel sizes, for the fence form's buttons: they fill the panel width and
 * the banner height (a banner or scrim over the whole panel, the larger area). Common practice, from
 * memory, not from a standard: the form says so, and the person measures the actual panels.
 */
export const panelPresets: ReadonlyArray<{ id: string; name: string; panelWidthM: number; heightM: number }> = [
  { id: 'mesh-fence', name: 'Mesh site fence panel', panelWidthM: 3.5, heightM: 2.0 },
  { id: 'pedestrian-barrier', name: 'Pedestrian barrier', panelWidthM: 2.3, heightM: 1.1 },
  { id: 'hoarding-sheet', name: 'Hoarding sheet on edge (8 × 4 ft)', panelWidthM: 1.22, heightM: 2.44 },
];
/** Where the preset sizes come from, shown under the buttons. */
export const panelPresetsSource =
  'Common practice, from memory (no standard sets these sizes): mesh site fence panels are usually 3.5 m × 2.0 m, pedestrian barriers about 2.3 m × 1.1 m, hoarding sheets 2.44 m × 1.22 m. Measure the actual panels.';

/**
 * Engine values the help quotes that cannot be imported without zod (see the module comment);
 * each is checked against its engine constant by tests/unit/registerFields.test.ts.
 */
export const quotedKindValues = {
  /** kinds/shell.ts shellCoefficients.crownSuctionLift */
  shellCrownSuctionLift: 1.2,
  /** kinds/shell.ts shellCoefficients.cupLift */
  shellCupLift: 1.42,
  /** kinds/shell.ts shellCoefficients.enclosedInternalPressure */
  shellEnclosedInternalPressure: 0.2,
  /** kinds/shell.ts shellCoefficients.windwardOpeningInternalPressure */
  shellWindwardOpeningInternalPressure: 0.72,
  /** kinds/shell.ts shellCoefficients.domeDrag */
  shellDomeDrag: 0.47,
  /** kinds/shell.ts domeOpeningSectorHalfWidthDeg */
  domeOpeningSectorHalfWidthDeg: 60,
  /** kinds/screen.ts signboardEccentricityFraction */
  signboardEccentricityFraction: 0.25,
} as const;

const cf = defaultCoefficients;
const q = quotedKindValues;
/** A sum of coefficients as the engine prints it (1.2 + 0.2 = 1.4, not 1.4000000000000001). */
const sum = (...values: number[]): number => Math.round(values.reduce((total, value) => total + value, 0) * 1e9) / 1e9;

const boardRule =
  `Empty: the board rule — ${cf.signboard.source}; a board standing on the ground takes the EN 1991-1-4 Table 7.9 wall value averaged over zones A–D (not below 1.80); ` +
  'mesh is reduced by k(φ) = 1 − (1 − φ)^1.5 (ASCE 7-16 ch. 29, signs with openings). A value here replaces the rule (solidity is then not applied again) and needs a stated source.';

const overrideNote = 'A value here needs a stated source (below).';

const sideOptions: Array<[string, string]> = [
  ['', 'choose: closed or open'],
  ['closed', 'closed'],
  ['open', 'open (wall off or rolled up, or a door or panel open)'],
];
const sideHelp =
  'Closed, or open: a side with its wall removed or rolled up, or a door or panel open in it, is open. An open side carries no wall load; ' +
  `an opening on the windward side raises the roof lift (EN 1991-1-4 §7.2.9, from memory: c_pi = ${cf.tentDominantOpeningTwice.value}–${cf.tentDominantOpeningThrice.value} × ` +
  `the +${cf.tentWindwardWallPressure.value} at the opening, against +${cf.tentInternalPressure.value} with the windward side closed). No default: choose one.`;

export const kindNames: Readonly<Record<StructureKind, string>> = {
  tent: 'Tent or marquee',
  banner: 'Banner, fence scrim or hoarding',
  screen: 'Screen on support towers',
  shell: 'Shell, band shell or dome',
  custom: 'Other (faces and masses given directly)',
};

const everyDirection = 'Assessed for wind from every direction (every 15° and the normal of each face), the worst one governing.';

export const kindIntro: Readonly<Record<StructureKind, string>> = {
  tent:
    'A tent or marquee: a rectangular plan with a pitched roof, legs in two rows along the long walls, and four sides, each closed or open. ' +
    `${everyDirection} Loaded: the long walls, the gable ends with their triangles and the roof’s side rise; the roof lift depends on which side is windward ` +
    'and open (EN 1991-1-4 roof zones and internal pressure) and sits toward the windward side. Elements checked on their own: the portal frames (a pair of legs across the span with its share of the walls, roof and lift), whose tipping is the windward legs lifting against their ballast. ' +
    'Only weight resists: stakes and ground anchors are not credited.',
  banner:
    'A banner fence, hoarding or mesh scrim: a row of flat panels on feet, with a clearance under them; the banner and its ballast stand at the middle of the feet. ' +
    `${everyDirection} The whole run is checked as one rigid body; with two or more panels, the element “end panel at the y = 0 end” is also checked on its own feet, ` +
    'with the higher pressures at a free end (EN 1991-1-4 Table 7.9 zones A and B). Wind along the run meets the panels edge-on.',
  screen:
    'An LED screen or projection surface on support towers with outriggers front and back, optionally under a header truss. The outrigger spread is the base depth, the ' +
    `tower spacing its width; each tower’s ballast is split between its front and back feet. ${everyDirection} The screen, towers and truss are loaded. ` +
    `With two or more towers, the element “tower at the y = 0 end” is also checked on its own outriggers: the resultant may sit ±${q.signboardEccentricityFraction}·b off centre ` +
    '(EN 1991-1-4 §7.4.3), so the near tower takes more than half. One tower: front and back only.',
  shell:
    'A curved shell: a band shell (a quarter sphere standing on its cut, open to the front) or a dome (a hemisphere on its circular base); the shape says what the radius means. ' +
    `${everyDirection} Drag from hemisphere and sphere coefficients with the ground as a mirror plane; uplift from crown suction and the pressure inside is on by default. ` +
    'No separate elements: the shell is checked as one body. Only weight resists: stakes and ground anchors are not credited.',
  custom:
    'Wind-loaded faces, resisting masses, an optional uplift and the base given directly (the calculator’s custom record), for anything the other kinds do not fit. ' +
    `${everyDirection} No separate elements: the body as given. Without a base width it is a strip: only the front and back edges are checked. Every coefficient you give needs its source below.`,
};

export const kindFields: Readonly<Record<StructureKind, FieldDef[]>> = {
  tent: [
    {
      path: 'lengthM',
      label: 'Length along the ridge',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 12',
      help:
        'Length along the ridge, m: the front and back long walls and the two rows of legs run this way. It is the base width, from the y = 0 gable end to the y = length gable end. ' +
        'Usually the long side; every wind direction is assessed, so a span wider than the length is accepted.',
    },
    {
      path: 'widthM',
      label: 'Span across the ridge',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 6',
      help: 'Span across the ridge, m: the width of each gable end and the base depth between the two rows of legs (the front row on the front edge, the back row on the back edge).',
    },
    { path: 'eaveHeightM', label: 'Eave height', unit: 'm', kind: 'number', placeholder: 'e.g. 2.4', help: 'Height of the eaves (the top of the walls) above the ground, m.' },
    {
      path: 'ridgeHeightM',
      label: 'Ridge height',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 4',
      help: 'Height of the ridge above the ground, m, at least the eave height: the roof rises from the eaves to the ridge. The gust is taken at this height unless a reference height is given.',
    },
    { path: 'sides.front', label: 'Front wall', kind: 'select', options: sideOptions, help: `The front long wall (on the front edge, along the length, facing the structure’s front). ${sideHelp}` },
    { path: 'sides.back', label: 'Back wall', kind: 'select', options: sideOptions, help: `The back long wall (on the back edge, facing away from the front). ${sideHelp}` },
    { path: 'sides.endY0', label: 'Gable end at y = 0', kind: 'select', options: sideOptions, help: `The gable end at y = 0: with the front facing north, it faces west (on your right as you face the front from outside). ${sideHelp}` },
    { path: 'sides.endYW', label: 'Gable end at y = length', kind: 'select', options: sideOptions, help: `The gable end at y = length: with the front facing north, it faces east (on your left as you face the front from outside). ${sideHelp}` },
    {
      path: 'legs',
      label: 'Legs',
      unit: 'count',
      kind: 'int',
      placeholder: 'e.g. 8',
      help:
        'Number of legs, an even number in two rows along the long walls, evenly spaced from end to end. Each pair across the span is a portal frame, also checked on its own ' +
        '(its share of the walls and roof, half a bay either side, and of the roof lift, against its two legs’ ballast and a share of the self-weight).',
    },
    { path: 'ballastPerLegKg', label: 'Ballast per leg', unit: 'kg', kind: 'number', placeholder: 'e.g. 500', help: 'Ballast on each leg (weights, water barrels), kg. Pegs, stakes and ground anchors are not credited.' },
    { path: 'selfWeightKg', label: 'Self-weight', unit: 'kg', kind: 'number', placeholder: 'e.g. 800', help: 'Frame, cover and floor that move with the tent, kg: acts at the middle of the base.' },
    {
      path: 'coefficients.wallCf',
      label: 'Closed wall force coefficient c_f',
      kind: 'number',
      optional: true,
      placeholder: String(cf.tentElevation.value),
      help:
        `Force coefficient c_f of a closed wall or gable end, on its area. Empty: ${cf.tentElevation.value} — ${cf.tentElevation.source}. ` +
        `A closed tent’s whole drag is carried by its windward wall; a wall takes wind on its inside too when the side opposite is open. ${overrideNote}`,
    },
    {
      path: 'coefficients.openWallCf',
      label: 'Open side force coefficient c_f',
      kind: 'number',
      optional: true,
      placeholder: String(cf.tentOpenWall.value),
      help: `Force coefficient c_f of an open side (mesh, scrim, the frame), on the wall’s area. Empty: ${cf.tentOpenWall.value} — ${cf.tentOpenWall.source}. Give one for mesh or scrim sides. ${overrideNote}`,
    },
    {
      path: 'coefficients.roofCf',
      label: 'Roof elevation force coefficient c_f',
      kind: 'number',
      optional: true,
      placeholder: String(cf.tentElevation.value),
      help: `Force coefficient c_f of the roof’s elevations: its side rise (length × rise) and the gable triangles above the eaves. Empty: ${cf.tentElevation.value} — ${cf.tentElevation.source}. ${overrideNote}`,
    },
    {
      path: 'coefficients.liftCoefficient',
      label: 'Roof lift coefficient c_lift',
      kind: 'number',
      optional: true,
      placeholder: 'by direction and openings',
      help:
        'Net roof lift coefficient, averaged over the plan area, taken for every wind direction; its resultant and the legs’ shares keep the default model’s distribution. ' +
        'Empty: for each windward side, the roof zones of EN 1991-1-4 §7.2.5 (Figure 7.8, suctions from memory) plus the internal pressure from the openings ' +
        `(§7.2.9, from memory: +${cf.tentInternalPressure.value} with the windward side closed, ${cf.tentDominantOpeningTwice.value}–${cf.tentDominantOpeningThrice.value} × +${cf.tentWindwardWallPressure.value} with it open), ` +
        `resultant toward the windward zones; all four sides open: a canopy, ${cf.tentCanopyLift.value} at the centre — ${cf.tentCanopyLift.source}. ${overrideNote}`,
    },
  ],
  banner: [
    {
      path: 'panelWidthM',
      label: 'Panel width',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: 'e.g. 3.5',
      help:
        'Width of one panel along the run, m (a foot at every joint). Pick a common size above or measure one. ' +
        'Empty: the run’s length ÷ the number of panels (below, under “Or give the run’s length”). With the length given too, panels × panel width must equal it to within 1 cm.',
    },
    {
      path: 'panels',
      label: 'Panels',
      unit: 'count',
      kind: 'int',
      optional: true,
      placeholder: 'e.g. 3',
      help:
        'Number of panels in the run; the feet follow, one at every joint and one at each end (panels + 1). Empty: length ÷ panel width when both are given, else feet − 1. ' +
        'With two or more panels the end panel is also checked on its own feet, with the pressures of a free end (EN 1991-1-4 Table 7.9 zones A and B).',
    },
    { path: 'heightM', label: 'Banner height', unit: 'm', kind: 'number', placeholder: 'e.g. 2', help: 'Height of the banner itself, h, m (not counting the gap under it).' },
    {
      path: 'clearanceM',
      label: 'Clearance under it',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 0.1',
      help: 'Gap between the ground and the banner’s bottom edge, z_g, m (0 when it stands on the ground). Raised more than h/4 it is a signboard (EN 1991-1-4 §7.4.3).',
    },
    {
      path: 'solidity',
      label: 'Solidity φ',
      kind: 'number',
      optional: true,
      placeholder: '1',
      help: 'Solid area ÷ gross area: 1 for solid material (the default when empty), about 0.3–0.7 for mesh: take it from the material sheet. A mesh that clogs with dirt or rain acts as solid.',
    },
    { path: 'ballastPerFootKg', label: 'Ballast per foot', unit: 'kg', kind: 'number', placeholder: 'e.g. 100', help: 'Ballast on each foot, kg.' },
    {
      path: 'endFootBallastKg',
      label: 'Ballast on each end foot',
      unit: 'kg',
      kind: 'number',
      optional: true,
      placeholder: 'as the others',
      help: 'Ballast on each of the two end feet, kg. Empty: the ballast per foot. The end panels carry the most wind (EN 1991-1-4 Table 7.9 zone A at a free end): extra weight belongs here.',
    },
    {
      path: 'footDepthM',
      label: 'Foot depth',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 1',
      help: 'Depth of a foot across the run (in the direction of wind onto the front), m: the base depth that resists tipping.',
    },
    { path: 'selfWeightKg', label: 'Self-weight', unit: 'kg', kind: 'number', placeholder: 'e.g. 150', help: 'Banner, frame and feet of the whole run without the ballast, kg: spread evenly along it.' },
    { path: 'coefficients.cf', label: 'Force coefficient c_f of the run (gross area)', kind: 'number', optional: true, placeholder: 'board rule', help: boardRule },
    {
      path: 'coefficients.endPanelCf',
      label: 'End panel coefficient (gross area)',
      kind: 'number',
      optional: true,
      placeholder: 'Table 7.9 zones',
      help:
        'Coefficient of the end panel on its gross area (panel width × h), front and back. Empty: the EN 1991-1-4 Table 7.9 c_p,net (no return corners) averaged over the panel from the free end ' +
        '(zones A 0–0.3h, B 0.3h–2h, C 2h–4h, D beyond) at the run’s length/height and solidity, not below the run’s c_f; below solidity 0.8 the run’s c_f (a plane lattice, §7.11, has no end zones); ' +
        `with the run’s c_f given, that c_f × the Table 7.9 ratio of the panel’s mean to the run’s. ${overrideNote}`,
    },
    {
      path: 'widthM',
      label: 'Length of the run',
      unit: 'm',
      kind: 'number',
      optional: true,
      alternative: true,
      placeholder: 'panels × panel width',
      help:
        'Length of the whole run, b, m: the base width, from the y = 0 end to the other. Empty: panel width × panels. ' +
        'Give it instead of the panel width (or as well, when they agree) when the run is measured rather than counted.',
    },
    {
      path: 'feet',
      label: 'Feet',
      unit: 'count',
      kind: 'int',
      optional: true,
      alternative: true,
      placeholder: 'panels + 1',
      help: 'Number of feet along the run, evenly spaced from one end to the other. Empty: panels + 1 (one at every joint and one at each end). Give it when the feet are not one per joint.',
    },
  ],
  screen: [
    { path: 'widthM', label: 'Screen width', unit: 'm', kind: 'number', placeholder: 'e.g. 5', help: 'Width of the screen surface, b, m.' },
    { path: 'heightM', label: 'Screen height', unit: 'm', kind: 'number', placeholder: 'e.g. 3', help: 'Height of the screen surface, h, m.' },
    {
      path: 'bottomHeightM',
      label: 'Bottom edge height',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 3',
      help: `Height of the screen’s bottom edge above the ground, z_g, m. Raised more than h/4 it is a signboard, c_f ${cf.signboard.value} (EN 1991-1-4 §7.4.3).`,
    },
    {
      path: 'solidity',
      label: 'Solidity φ',
      kind: 'number',
      optional: true,
      placeholder: '1',
      help: 'Solid area ÷ gross area: 1 for a closed screen (the default when empty), less for a mesh LED screen (from the manufacturer).',
    },
    {
      path: 'supportTowers',
      label: 'Support towers',
      unit: 'count',
      kind: 'int',
      placeholder: 'e.g. 2',
      help:
        'Number of support towers, in a row across the screen. With two or more, one tower is also checked on its own outriggers with its ballast: EN 1991-1-4 §7.4.3 puts the resultant up to ' +
        `±${q.signboardEccentricityFraction}·b off centre, so the near tower takes more than half (0.75 with towers at the screen’s edges). One tower: only the front and back are checked.`,
    },
    { path: 'towerMassKg', label: 'Mass per tower', unit: 'kg', kind: 'number', placeholder: 'e.g. 400', help: 'Each tower with its base and outriggers, without ballast, kg.' },
    { path: 'screenMassKg', label: 'Screen mass', unit: 'kg', kind: 'number', placeholder: 'e.g. 800', help: 'Screen panels and their frame, and the header truss, kg.' },
    { path: 'outriggerDepthM', label: 'Outrigger spread', unit: 'm', kind: 'number', placeholder: 'e.g. 4', help: 'Spread of each tower’s outrigger feet from front to back, m: the base depth.' },
    { path: 'ballastPerTowerKg', label: 'Ballast per tower', unit: 'kg', kind: 'number', placeholder: 'e.g. 1000', help: 'Ballast per tower, half on its front and half on its back outrigger foot, kg.' },
    {
      path: 'towerSpacingM',
      label: 'Tower spacing',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: 'screen width',
      help:
        'Centre-to-centre distance of the two outer towers across the screen, m: the base width. Empty: the screen width b (towers at the screen’s edges). ' +
        'Towers inboard of the edges take more of the eccentric load (EN 1991-1-4 §7.4.3): give it then. Needs at least two towers.',
    },
    {
      path: 'towerWidthM',
      label: 'Tower width (seen from the front)',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: String(memberSizes.towerWidthM.value),
      help: `Width of each tower seen from the front, m (its outline; 0 to leave it out). Empty: ${memberSizes.towerWidthM.value} m — ${memberSizes.towerWidthM.source}.`,
    },
    {
      path: 'towerDepthM',
      label: 'Tower depth (seen from the side)',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: 'tower width',
      help: 'Depth of each tower seen from the side, m (its outline). Empty: the tower width (a square tower).',
    },
    {
      path: 'towerHeightM',
      label: 'Tower height',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: 'screen top + truss',
      help: 'Height of the towers, m. Empty: the top of the screen plus the header truss.',
    },
    {
      path: 'headerTrussDepthM',
      label: 'Header truss depth',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: String(memberSizes.headerTrussDepthM.value),
      help: `Depth of the header truss across the top of the screen, m (0 when there is none). Empty: ${memberSizes.headerTrussDepthM.value} m — ${memberSizes.headerTrussDepthM.source}.`,
    },
    {
      path: 'structuralFactor',
      label: 'Structural factor c_s·c_d',
      kind: 'number',
      optional: true,
      placeholder: String(structuralFactorDefault.value),
      help:
        'Structural factor c_s·c_d (EN 1991-1-4 §6) from an engineer, for a tall or slender support that responds dynamically to gusts: above 0, at most 2. It multiplies every wind force on the screen, towers and truss. ' +
        `Empty: ${structuralFactorDefault.value} — ${structuralFactorDefault.source}; the answer then warns when the top is above about ${tallScreenTopM} m or the screen hangs from a crane. ${overrideNote}`,
    },
    {
      path: 'onCrane',
      label: 'Hangs from a crane',
      kind: 'bool',
      optional: true,
      options: [
        ['', 'no (not stated)'],
        ['false', 'no: it stands on its towers'],
        ['true', 'yes: it hangs from a crane'],
      ],
      help: 'Yes when the screen hangs from a crane: a slender support, so c_s·c_d = 1 is warned about unless a structural factor is given. Empty: no.',
    },
    { path: 'coefficients.cf', label: 'Screen force coefficient c_f (gross area)', kind: 'number', optional: true, placeholder: 'board rule', help: boardRule },
    {
      path: 'coefficients.towerCf',
      label: 'Tower force coefficient c_f (outline area)',
      kind: 'number',
      optional: true,
      placeholder: String(memberCoefficients.squareSection.value),
      help: `Force coefficient of each tower on its outline area, seen from the front and from the side. Empty: ${memberCoefficients.squareSection.value} — ${memberCoefficients.squareSection.source}. ${overrideNote}`,
    },
    {
      path: 'coefficients.trussCf',
      label: 'Header truss force coefficient c_f (outline area)',
      kind: 'number',
      optional: true,
      placeholder: String(memberCoefficients.squareSection.value),
      help: `Force coefficient of the header truss on its outline area (its length × its depth), front and back. Empty: ${memberCoefficients.squareSection.value} — ${memberCoefficients.squareSection.source}. ${overrideNote}`,
    },
  ],
  shell: [
    {
      path: 'radiusM',
      label: 'Radius R',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 4',
      help:
        'Radius R of the shell, m; what it describes depends on the shape. Quarter sphere (a band shell): half a hemisphere standing on its cut, R high, R deep behind the opening and 2R wide; ' +
        'seen from the front a half disc πR²/2, from either end a quarter disc πR²/4. Hemisphere (a dome): R high and 2R across, a half disc πR²/2 from any side. The gust is taken at its top.',
    },
    {
      path: 'shape',
      label: 'Shape (what the radius means)',
      kind: 'select',
      optional: true,
      initial: 'quarterSphere',
      options: [
        ['', 'not stated: a quarter sphere (band shell)'],
        ['quarterSphere', 'quarter sphere: a band shell, half a hemisphere standing on its cut, R deep, 2R wide'],
        ['hemisphere', 'hemisphere: a dome on its circular base, 2R across'],
      ],
      help:
        'Quarter sphere: a band shell, half a hemisphere standing on its cut, its open (concave) side to the front; the cut is the front edge of the base and the shell reaches R behind it, 2R wide. ' +
        'Hemisphere: a full dome standing on its circular base, 2R across, centred on the base. Empty: quarter sphere (the meaning of records saved before shapes were offered).',
    },
    {
      path: 'form',
      label: 'Form',
      kind: 'select',
      optional: true,
      initial: 'open',
      options: [
        ['', 'not stated: open'],
        ['open', 'open: a band shell hollow and open to the front; a dome with an opening on its front side'],
        ['closed', 'closed: a flat wall across the band shell’s opening; a dome with no opening'],
      ],
      help:
        `Band shell open: c_f ${cf.hollowHemisphereConcave.value} into the cup, ${cf.hollowHemisphereConvex.value} onto the back (Munson fig. 9.20, hollow hemisphere); ` +
        `closed: ${cf.solidHemisphereFlat.value} onto the flat face, ${cf.solidHemisphereCurved.value} onto the curve (solid hemisphere). ` +
        `A dome’s opening (a door, a stage mouth) on its front side raises the lift when it is windward. Empty: open.`,
    },
    { path: 'baseHeightM', label: 'Base height', unit: 'm', kind: 'number', optional: true, placeholder: '0', help: 'Height of the shell’s base above the ground (a deck or stage), m. Empty: 0 m.' },
    {
      path: 'baseDepthM',
      label: 'Base depth',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: 'R (a dome 2R)',
      help: 'Depth of the base from the front edge to the back edge, m: at least R for a band shell, 2R for a dome. Empty: the shell’s own footprint, R (a dome 2R).',
    },
    {
      path: 'baseWidthM',
      label: 'Base width',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: '2R',
      help: 'Width of the base from end to end, m, at least 2R. Empty: the shell’s own footprint, 2R.',
    },
    {
      path: 'selfWeightKg',
      label: 'Self-weight',
      unit: 'kg',
      kind: 'number',
      placeholder: 'e.g. 2000',
      help: 'Shell and its frame, kg: acts R/2 behind the opening (a band shell) or at the centre (a dome).',
    },
    { path: 'frontBallastKg', label: 'Front ballast (band shell)', unit: 'kg', kind: 'number', optional: true, placeholder: '0', help: 'Band shell only: ballast along the opening (the front edge of the base), kg. Empty: none.' },
    { path: 'backBallastKg', label: 'Back ballast (band shell)', unit: 'kg', kind: 'number', optional: true, placeholder: '0', help: 'Band shell only: ballast at the back edge of the base, kg. Empty: none.' },
    {
      path: 'ringBallastKg',
      label: 'Ring ballast (dome)',
      unit: 'kg',
      kind: 'number',
      optional: true,
      placeholder: '0',
      help: 'Dome only: ballast spread evenly round the base ring, kg; it acts at the centre, restoring R × its weight about every tangent edge. Empty: none.',
    },
    {
      path: 'coefficients.cfFront',
      label: 'c_f wind onto the front',
      kind: 'number',
      optional: true,
      placeholder: 'by shape and form',
      help:
        `Empty: band shell open ${cf.hollowHemisphereConcave.value} — ${cf.hollowHemisphereConcave.source}; closed ${cf.solidHemisphereFlat.value} — ${cf.solidHemisphereFlat.source}; ` +
        `dome ${q.shellDomeDrag} (a subcritical sphere, White, from memory: a dome and its mirror image in the ground). ${overrideNote}`,
    },
    {
      path: 'coefficients.cfBack',
      label: 'c_f wind onto the back',
      kind: 'number',
      optional: true,
      placeholder: 'by shape and form',
      help:
        `Empty: band shell open ${cf.hollowHemisphereConvex.value} — ${cf.hollowHemisphereConvex.source}; closed ${cf.solidHemisphereCurved.value} — ${cf.solidHemisphereCurved.source}; ` +
        `dome ${q.shellDomeDrag} (a sphere, as above). ${overrideNote}`,
    },
    {
      path: 'coefficients.cfSide',
      label: 'c_f wind onto either end',
      kind: 'number',
      optional: true,
      placeholder: 'by shape and form',
      help:
        'c_f with the wind onto either end. Empty: band shell: the larger of the front and back values (no published value for a cup with the flow along its cut was found: a conservative assumption), ' +
        `on the quarter disc πR²/4; dome ${q.shellDomeDrag}. ${overrideNote}`,
    },
    {
      path: 'coefficients.liftCoefficient',
      label: 'Uplift coefficient c_lift',
      kind: 'number',
      optional: true,
      placeholder: 'by shape and form',
      help:
        'Net uplift coefficient on the plan area (πR²/2 a band shell, πR² a dome) at its centroid, replacing the default in every direction. ' +
        `Empty, uplift is on by default: band shell open — ${q.shellCupLift} with the wind into the open side (cup pressure inside, derived from Munson fig. 9.20) and ${q.shellCrownSuctionLift} ` +
        `onto the back (crown suction: EN 1991-1-4 Fig. 7.12 from memory, wind-tunnel and LES values); band shell closed — ${sum(q.shellCrownSuctionLift, q.shellEnclosedInternalPressure)} in every direction ` +
        `(crown suction plus internal pressure +${q.shellEnclosedInternalPressure}, EN 1991-1-4 §7.2.9 from memory); dome — ${sum(q.shellCrownSuctionLift, q.shellEnclosedInternalPressure)}, ` +
        `and ${sum(q.shellCrownSuctionLift, q.shellWindwardOpeningInternalPressure)} within ${q.domeOpeningSectorHalfWidthDeg}° of the front when its opening is windward (c_pi 0.90 × +0.8, §7.2.9 from memory). ${overrideNote}`,
    },
  ],
  custom: [
    {
      path: 'baseDepthM',
      label: 'Base depth',
      unit: 'm',
      kind: 'number',
      placeholder: 'e.g. 1.5',
      help: 'Depth of the base from the front edge (x = 0) to the back edge, m: the positions x of the masses and the uplift are measured from the front edge.',
    },
    {
      path: 'baseWidthM',
      label: 'Base width',
      unit: 'm',
      kind: 'number',
      optional: true,
      placeholder: 'none: a strip',
      help:
        'Width of the base from the y = 0 end to the other end, m: the positions y are measured from the y = 0 end. Empty: a strip (as records saved before base widths were offered): ' +
        'only the front and back edges are checked, and the answer warns that wind onto the ends was not checked.',
    },
  ],
};

/** Fields every kind has. */
export const commonFields: FieldDef[] = [
  {
    path: 'ratedGustMps',
    label: 'Rated gust (designer or manufacturer)',
    kind: 'speed',
    optional: true,
    placeholder: 'none',
    help: 'The designer’s or manufacturer’s rated operational gust (usually a 3-second gust). The effective limit is the lower of this and the calculated limit. Empty when there is none.',
  },
  {
    path: 'surface',
    label: 'Ground under the ballast',
    kind: 'select',
    optional: true,
    initial: 'grass',
    options: [
      ['', `not stated: grass (μ ${frictionBySurface.grass.value})`],
      ['grass', `grass (μ ${frictionBySurface.grass.value})`],
      ['hard', `hard surface (μ ${frictionBySurface.hard.value})`],
    ],
    help: `Sets the default friction coefficient. Grass: ${frictionBySurface.grass.source}. Hard: ${frictionBySurface.hard.source}. Empty: grass, the lower.`,
  },
  {
    path: 'frictionCoefficient',
    label: 'Friction coefficient μ',
    kind: 'number',
    optional: true,
    placeholder: 'from the ground',
    help: 'Base-to-ground friction, 0–1. Empty: the value of the ground chosen above. Give a measured or published value for the actual feet and surface.',
  },
  {
    path: 'referenceHeightM',
    label: 'Reference height',
    unit: 'm',
    kind: 'number',
    optional: true,
    placeholder: 'top',
    help: 'Height the measured gust is moved to (EN 1991-1-4 profile), m. Empty: the top of the structure (for “other”: twice the highest face centroid, the top of a face standing on the ground).',
  },
  {
    path: 'safetyFactors.overturning',
    label: 'Safety factor γ, overturning',
    kind: 'number',
    optional: true,
    placeholder: String(defaultSafetyFactors.overturning),
    help: `1–5. Empty: ${defaultSafetyFactors.overturning} — ${safetyFactorSources.overturning}.`,
  },
  {
    path: 'safetyFactors.sliding',
    label: 'Safety factor γ, sliding',
    kind: 'number',
    optional: true,
    placeholder: String(defaultSafetyFactors.sliding),
    help: `1–5. Empty: ${defaultSafetyFactors.sliding} — ${safetyFactorSources.sliding}.`,
  },
  {
    path: 'safetyFactors.uplift',
    label: 'Safety factor γ, uplift',
    kind: 'number',
    optional: true,
    placeholder: String(defaultSafetyFactors.uplift),
    help: `1–5. Empty: ${defaultSafetyFactors.uplift} — ${safetyFactorSources.uplift}.`,
  },
  {
    path: 'coefficientSource',
    label: 'Source of overridden coefficients',
    kind: 'text',
    optional: true,
    help:
      'Required when you give any coefficient above (or a screen’s structural factor): name the standard and clause, the handbook and figure, or the manufacturer’s sheet. ' +
      'For an “other” structure it is quoted as the source of its faces’ coefficients.',
  },
  {
    path: 'configurationName',
    label: 'Name of this configuration (as registered)',
    kind: 'text',
    optional: true,
    placeholder: 'as registered',
    help:
      'What the crew call the structure as the fields above describe it (“raised”, “sides on”, “scrim on”), at most 100 characters. ' +
      'Listed first wherever configurations are shown. Empty: “as registered”.',
  },
];

/**
 * The configurations editor's columns (design §2.5; the record's `configurations`, kinds/recordBase.ts):
 * each configuration has a name and the changes it makes to the fields above.
 */
export const configurationColumns = [
  { key: 'name', label: 'Configuration name', help: 'What the crew call it (“lowered”, “sides off”, “scrim removed”), at most 100 characters: the board’s Done button says it.' },
  {
    key: 'changes',
    label: 'Changes',
    help:
      'The fields this configuration changes, each with its value in this configuration; every other field stays as registered. ' +
      'The changed record is checked like any record of its kind and assessed by the same engine: its own limit gust and level gusts.',
  },
] as const;

/** Fields a configuration cannot change (engine/configuration.ts unchangeableFields), besides `kind` and `name`. */
export const unchangeableByConfiguration: readonly string[] = ['configurationName'];

/**
 * The fields each kind's crew typically change with a plan action (design §2.5): offered first in
 * the configurations editor. A screen lowered, a tent's sides off or on, a fence's scrim removed
 * (its solidity), a band shell opened or closed, a custom record's faces.
 */
export const suggestedChanges: Readonly<Record<StructureKind, readonly string[]>> = {
  tent: ['sides'],
  banner: ['solidity'],
  screen: ['bottomHeightM', 'heightM'],
  shell: ['form'],
  custom: ['faces'],
};

/** Names of the fields that hold several form fields, as a configuration's change. */
export const groupLabels: Readonly<Record<string, string>> = {
  sides: 'Sides: each open or closed',
  coefficients: 'Coefficients given instead of the defaults',
  safetyFactors: 'Safety factors',
  faces: 'Wind-loaded faces',
};

/** Columns of a custom record's face rows (structureDraft.ts FaceRow). */
export const faceColumns = [
  { key: 'label', label: 'Face', unit: '', placeholder: 'e.g. board', help: 'A name for the face (optional).' },
  { key: 'areaM2', label: 'Area', unit: 'm²', placeholder: 'e.g. 6', help: 'Area of the face (its projection on its own plane), m².' },
  { key: 'centroidHeightM', label: 'Centroid height', unit: 'm', placeholder: 'e.g. 2', help: 'Height of the area’s centroid above the ground, m: the lever arm of its force.' },
  { key: 'cfFront', label: 'c_f front', unit: '', placeholder: 'e.g. 1.8', help: 'Force coefficient with the wind onto the face’s front side.' },
  { key: 'cfBack', label: 'c_f back', unit: '', placeholder: 'e.g. 1.8', help: 'Force coefficient with the wind onto the face’s back side.' },
  {
    key: 'facingDeg',
    label: 'Facing',
    unit: '°',
    placeholder: '0',
    help:
      'Which way the face’s front side looks relative to the structure’s front, degrees: 0 the front, 90 the y = base width end, 180 the back, 270 the y = 0 end ' +
      '(with the front facing north: 0 north, 90 east, 180 south, 270 west). Empty: 0.',
  },
] as const;

/** Columns of a custom record's mass rows (structureDraft.ts MassRow). */
export const massColumns = [
  { key: 'label', label: 'What', unit: '', placeholder: 'e.g. ballast', help: 'A name for it: self-weight, ballast block, water barrel (optional).' },
  { key: 'massKg', label: 'Mass', unit: 'kg', placeholder: 'e.g. 1000', help: 'Mass in kilograms.' },
  { key: 'xM', label: 'Position x', unit: 'm', placeholder: 'e.g. 0.75', help: 'Position across the base from the front edge, m: 0 to the base depth.' },
  {
    key: 'yM',
    label: 'Position y',
    unit: 'm',
    placeholder: 'middle',
    help: 'Position along the base from the y = 0 end (the west end when the front faces north), m: 0 to the base width (needs the base width). Empty: the middle of the base width.',
  },
] as const;

/** Fields of a custom record's uplift (structureDraft.ts UpliftDraft; label is kept but not shown). */
export const upliftColumns = [
  { key: 'planAreaM2', label: 'Plan area', unit: 'm²', placeholder: 'e.g. 20', help: 'Area seen from above that the wind lifts, m².' },
  { key: 'liftCoefficient', label: 'Lift coefficient c_lift', unit: '', placeholder: 'e.g. 0.8', help: 'Net upward force coefficient, ≥ 0 (downforce is never credited). Needs its source below.' },
  { key: 'xM', label: 'Position x', unit: 'm', placeholder: 'middle', help: 'Where the uplift’s resultant acts, m from the front edge. Empty: the middle of the base depth.' },
  {
    key: 'yM',
    label: 'Position y',
    unit: 'm',
    placeholder: 'middle',
    help: 'Where the uplift’s resultant acts, m from the y = 0 end (needs the base width). Empty: the middle of the base width.',
  },
] as const;
