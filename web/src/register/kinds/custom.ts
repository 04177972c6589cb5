/**
 * The custom kind on the register form and in the drawings (kinds/kindForm.ts): the web's half of
 * the kind, beside the engine's server/engine/kinds/custom.ts (its schema, whose field docs this help
 * follows, and its expansion).
 * Its faces, masses and uplift are the form's rows (structureForm.tsx CustomRows, `editor: 'rows'`).
 */
import { everyDirection, type KindForm } from './kindForm.ts';

export const customForm: KindForm = {
  name: 'Other (faces and masses given directly)',
  intro:
    'Wind-loaded faces, resisting masses, an optional uplift and the base given directly (the calculator’s custom record), for anything the other kinds do not fit. ' +
    `${everyDirection} No separate elements: the body as given. Without a base width it is a strip: only the front and back edges are checked. Every coefficient you give needs its source below.`,
  fields: [
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
  suggestedChanges: ['faces'],
  baseWidthWords: 'base width',
  // No level of its own: a face stands on the ground up to twice its centroid, as the record's reference height assumes.
  faceLevelsM: () => [],
  editor: 'rows',
};
