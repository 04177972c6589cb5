/**
 * The screen kind on the register form and in the drawings (kinds/kindForm.ts): the web's half of
 * the kind, beside the engine's server/engine/kinds/screen.ts (its schema, whose field docs this help
 * follows, and its expansion).
 */
import { memberCoefficients, memberSizes, structuralFactorDefault, tallScreenTopM } from '../../../../server/engine/kinds/memberCoefficients.ts';
import { boardRule, cf, everyDirection, overrideNote, q, recordNumber, type KindForm } from './kindForm.ts';

export const screenForm: KindForm = {
  name: 'Screen on support towers',
  intro:
    'An LED screen or projection surface on support towers with outriggers front and back, optionally under a header truss. The outrigger spread is the base depth, the ' +
    `tower spacing its width; each tower’s ballast is split between its front and back feet. ${everyDirection} The screen, towers and truss are loaded. ` +
    `With two or more towers, the element “tower at the y = 0 end” is also checked on its own outriggers: the resultant may sit ±${q.signboardEccentricityFraction}·b off centre ` +
    '(EN 1991-1-4 §7.4.3), so the near tower takes more than half. One tower: front and back only.',
  fields: [
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
  suggestedChanges: ['bottomHeightM', 'heightM'],
  baseWidthWords: 'tower spacing',
  faceLevelsM: (record) => {
    const bottom = recordNumber(record.bottomHeightM);
    const height = recordNumber(record.heightM);
    return [bottom, bottom !== null && height !== null ? bottom + height : null];
  },
};
