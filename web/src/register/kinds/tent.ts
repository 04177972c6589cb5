/**
 * The tent kind on the register form and in the drawings (kinds/kindForm.ts): the web's half of
 * the kind, beside the engine's server/engine/kinds/tent.ts (its schema, whose field docs this help
 * follows, and its expansion).
 * A record saved with `wallsClosed` (all sides at once) is read as its four sides.
 */
import { cf, everyDirection, overrideNote, recordNumber, type KindForm } from './kindForm.ts';

const sideOptions: Array<[string, string]> = [
  ['', 'choose: closed or open'],
  ['closed', 'closed'],
  ['open', 'open (wall off or rolled up, or a door or panel open)'],
];
const sideHelp =
  'Closed, or open: a side with its wall removed or rolled up, or a door or panel open in it, is open. An open side carries no wall load; ' +
  `an opening on the windward side raises the roof lift (EN 1991-1-4 §7.2.9, from memory: c_pi = ${cf.tentDominantOpeningTwice.value}–${cf.tentDominantOpeningThrice.value} × ` +
  `the +${cf.tentWindwardWallPressure.value} at the opening, against +${cf.tentInternalPressure.value} with the windward side closed). No default: choose one.`;

/** The tent's four side fields, filled from `wallsClosed` when a record gives that instead. */
const tentSidePaths = ['sides.front', 'sides.back', 'sides.endY0', 'sides.endYW'] as const;

export const tentForm: KindForm = {
  name: 'Tent or marquee',
  intro:
    'A tent or marquee: a rectangular plan with a pitched roof, legs in two rows along the long walls, and four sides, each closed or open. ' +
    `${everyDirection} Loaded: the long walls, the gable ends with their triangles and the roof’s side rise; the roof lift depends on which side is windward ` +
    'and open (EN 1991-1-4 roof zones and internal pressure) and sits toward the windward side. Elements checked on their own: the portal frames (a pair of legs across the span with its share of the walls, roof and lift), whose tipping is the windward legs lifting against their ballast. ' +
    'Only weight resists: stakes and ground anchors are not credited.',
  fields: [
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
  suggestedChanges: ['sides'],
  baseWidthWords: 'length',
  faceLevelsM: (record) => [recordNumber(record.eaveHeightM)],
  sideOutline: (record, { axis, spanM, u, y }) => {
    const eave = recordNumber(record.eaveHeightM) ?? 0;
    const ridge = recordNumber(record.ridgeHeightM) ?? eave;
    return axis === 'x' ? `M${u(0)} ${y(0)} V${y(eave)} L${u(spanM / 2)} ${y(ridge)} L${u(spanM)} ${y(eave)} V${y(0)} Z` : `M${u(0)} ${y(0)} V${y(ridge)} H${u(spanM)} V${y(0)} Z`;
  },
  loadValues: (record, values) => {
    if (record.wallsClosed === undefined) return;
    // A record with `wallsClosed` (all sides at once): each side it does not list takes that state.
    const state = record.wallsClosed ? 'closed' : 'open';
    for (const side of tentSidePaths) values[side] ??= state;
  },
  changesReadElsewhere: ['wallsClosed'],
  /**
   * A configuration that changes `wallsClosed` (or gives only some sides) is written as its four
   * sides, resolved the way the engine resolves them (kinds/tent.ts resolvedTentSides): the form
   * always saves the registered record with all four sides, and a `wallsClosed` left in a change
   * would no longer reach them.
   */
  loadChanges: (record, changes, into) => {
    if (!('wallsClosed' in changes || 'sides' in changes)) return;
    const sides = ('sides' in changes ? changes.sides : record.sides) as Partial<Record<string, string>> | null | undefined;
    const wallsClosed = ('wallsClosed' in changes ? changes.wallsClosed : record.wallsClosed) as boolean | null | undefined;
    const fallback = wallsClosed === undefined || wallsClosed === null ? undefined : wallsClosed ? 'closed' : 'open';
    if (!into.fields.includes('sides')) into.fields.push('sides');
    for (const path of tentSidePaths) {
      const state = sides?.[path.slice('sides.'.length)] ?? fallback;
      if (state !== undefined) into.values[path] = state;
    }
  },
};
