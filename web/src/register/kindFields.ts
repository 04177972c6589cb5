/**
 * The register form's fields: those every kind has (`commonFields`), the configurations editor's
 * columns, the custom record's rows, and each kind's own as its file declares them
 * (register/kinds/<kind>.ts, listed in register/kinds/index.ts): label, unit and help text (what
 * it is, its unit, its default and where the default comes from). The help follows the field docs
 * of the record schemas (server/engine/kinds/*.ts); the default coefficients and sizes and their
 * sources are the engine's own values, imported, so the form can never quote a different number
 * than the calculator uses (the exceptions, `quotedKindValues`, are checked by
 * tests/unit/registerFields.test.ts).
 *
 * A new form starts empty: dimensions have an example in `placeholder` ("e.g. 12"), never an
 * `initial` value, so nothing is assessed on a number nobody typed. An empty field that is not
 * `optional` is reported "is required" (structureDraft.ts `draftRecord`).
 */
import { frictionBySurface } from '../../../server/engine/kinds/coefficients.ts';
import { defaultSafetyFactors, safetyFactorSources } from '../../../server/engine/stability.ts';
import type { StructureKind } from '../types.ts';
import { kindForms } from './kinds/index.ts';
import type { FieldDef } from './kinds/kindForm.ts';

export { quotedKindValues, type FieldDef, type FieldKind } from './kinds/kindForm.ts';

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

/** Each kind's name on the form (register/kinds/<kind>.ts `name`). */
export const kindNames: Readonly<Record<StructureKind, string>> = mapKinds((form) => form.name);

/** Each kind's introduction under the kind buttons (register/kinds/<kind>.ts `intro`). */
export const kindIntro: Readonly<Record<StructureKind, string>> = mapKinds((form) => form.intro);

/** Each kind's own fields in the form's order (register/kinds/<kind>.ts `fields`). */
export const kindFields: Readonly<Record<StructureKind, FieldDef[]>> = mapKinds((form) => form.fields);

function mapKinds<T>(pick: (form: (typeof kindForms)[StructureKind]) => T): Record<StructureKind, T> {
  return Object.fromEntries(Object.entries(kindForms).map(([kind, form]) => [kind, pick(form)])) as Record<StructureKind, T>;
}

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
 * the configurations editor (register/kinds/<kind>.ts `suggestedChanges`). A screen lowered, a
 * tent's sides off or on, a fence's scrim removed (its solidity), a band shell opened or closed, a
 * custom record's faces.
 */
export const suggestedChanges: Readonly<Record<StructureKind, readonly string[]>> = mapKinds((form) => form.suggestedChanges);

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
