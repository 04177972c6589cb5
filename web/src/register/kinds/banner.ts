/**
 * The banner kind on the register form and in the drawings (kinds/kindForm.ts): the web's half of
 * the kind, beside the engine's server/engine/kinds/banner.ts (its schema, whose field docs this help
 * follows, and its expansion).
 * The form starts a fence from its panels (structureForm.tsx FencePanels, `editor: 'fencePanels'`).
 */
import { boardRule, everyDirection, overrideNote, recordNumber, type KindForm } from './kindForm.ts';

export const bannerForm: KindForm = {
  name: 'Banner, fence scrim or hoarding',
  intro:
    'A banner fence, hoarding or mesh scrim: a row of flat panels on feet, with a clearance under them; the banner and its ballast stand at the middle of the feet. ' +
    `${everyDirection} The whole run is checked as one rigid body; with two or more panels, the element “end panel at the y = 0 end” is also checked on its own feet, ` +
    'with the higher pressures at a free end (EN 1991-1-4 Table 7.9 zones A and B). Wind along the run meets the panels edge-on.',
  fields: [
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
  suggestedChanges: ['solidity'],
  baseWidthWords: 'length of the run',
  alternativesSummary: 'Or give the run’s length, or feet that are not one per joint',
  faceLevelsM: (record) => [recordNumber(record.clearanceM)],
  editor: 'fencePanels',
  editorFields: ['panelWidthM', 'panels'],
  /**
   * A fence's run, asked for before the server is: the engine's layout check (kinds/banner.ts) only
   * runs once every number is there, so an empty form would not say that the panels are needed.
   * The panel width and count are the way in; the run's length and the feet are the alternatives.
   */
  localIssues: (values, issues) => {
    const given = (path: string) => (values[path] ?? '').trim() !== '';
    if (!given('panelWidthM') && !given('widthM')) issues.set('panelWidthM', 'is required, with the number of panels (or give the run’s length instead)');
    if (!given('panels') && !given('feet') && !(given('panelWidthM') && given('widthM'))) issues.set('panels', 'is required: the number of panels (the feet follow: one at every joint and one at each end)');
  },
};
