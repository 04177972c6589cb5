/**
 * The shell kind on the register form and in the drawings (kinds/kindForm.ts): the web's half of
 * the kind, beside the engine's server/engine/kinds/shell.ts (its schema, whose field docs this help
 * follows, and its expansion).
 */
import { cf, everyDirection, overrideNote, q, recordNumber, type KindForm } from './kindForm.ts';

/** A sum of coefficients as the engine prints it (1.2 + 0.2 = 1.4, not 1.4000000000000001). */
const sum = (...values: number[]): number => Math.round(values.reduce((total, value) => total + value, 0) * 1e9) / 1e9;

export const shellForm: KindForm = {
  name: 'Shell, band shell or dome',
  intro:
    'A curved shell: a band shell (a quarter sphere standing on its cut, open to the front) or a dome (a hemisphere on its circular base); the shape says what the radius means. ' +
    `${everyDirection} Drag from hemisphere and sphere coefficients with the ground as a mirror plane; uplift from crown suction and the pressure inside is on by default. ` +
    'No separate elements: the shell is checked as one body. Only weight resists: stakes and ground anchors are not credited.',
  fields: [
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
  suggestedChanges: ['form'],
  baseWidthWords: 'base width',
  faceLevelsM: (record) => [recordNumber(record.baseHeightM)],
  sideOutline: (record, { axis, spanM, u, y, scale }) => {
    const base = recordNumber(record.baseHeightM) ?? 0;
    const r = Math.min(recordNumber(record.radiusM) ?? spanM, axis === 'x' ? spanM : spanM / 2);
    return axis === 'x'
      ? `M${u(0)} ${y(base)} V${y(base + r)} A${r * scale} ${r * scale} 0 0 1 ${u(r)} ${y(base)} Z`
      : `M${u(spanM / 2 - r)} ${y(base)} A${r * scale} ${r * scale} 0 0 1 ${u(spanM / 2 + r)} ${y(base)} Z`;
  },
};
