/**
 * The register form's words for what the server names by field: an issue path ("record.lengthM",
 * "structure.faces.1.areaM2", "levels.2.trigger.gustMps") becomes the label the form shows beside
 * the field ("Length along the ridge", "Face 2: area", "Level 3: trigger") with the id of the
 * control to go to; and an engine sentence that names a field the form shows ("give
 * referenceHeightM", "must be ≥ eaveHeightM (2.4 m)", "gable end at y = lengthM") is said with the
 * form's labels instead ("give “Reference height”", "gable end at y = length").
 *
 * The API keeps its field names (an engineer scripting against it reads those); only what the form
 * shows is translated.
 */
import { commonFields, faceColumns, kindFields, massColumns, type FieldDef } from './kindFields.ts';
import type { StructureKind } from '../types.ts';
import { kindForms } from './kinds/index.ts';

/** The id of a kind field's control (structureForm.tsx builds it the same way). */
export const fieldControlId = (path: string): string => `sf-${path.replace(/\./g, '-')}`;

/** Form fields outside the kind fields: label and control id. */
export const placementFields: Readonly<Record<string, readonly [string, string]>> = {
  name: ['Name', 'sf-name'],
  orientationDeg: ['Front faces towards', 'sf-orient'],
  location: ['Location on site', 'sf-loc'],
  latDeg: ['Latitude', 'sf-lat'],
  lonDeg: ['Longitude', 'sf-lon'],
  'uplift.planAreaM2': ['Uplift plan area', 'sf-up-area'],
  'uplift.liftCoefficient': ['Uplift lift coefficient c_lift', 'sf-up-c'],
  'uplift.xM': ['Uplift position x', 'sf-up-x'],
  'uplift.yM': ['Uplift position y', 'sf-up-y'],
};

export interface NamedField {
  /** The form's label for the field. */
  label: string;
  /** The control to take the person to, or null when none matches (the record as a whole, a list). */
  controlId: string | null;
}

function fieldsOfKind(kind: StructureKind): FieldDef[] {
  return [...kindFields[kind], ...commonFields];
}

/**
 * The form's name for an issue path (with or without its "record." / "structure." prefix).
 * Unknown paths are named as they are, so nothing is ever left unnamed.
 */
export function namedField(rawPath: string, kind: StructureKind): NamedField {
  const path = rawPath.replace(/^(record|structure)(\.|$)/, '');
  const configuration = /^configurations\.(\d+)(?:\.(name|changes)(?:\.(.+))?)?$/.exec(path);
  if (configuration) return configurationField(Number(configuration[1]), configuration[2], configuration[3], kind);
  if (path === 'configurations') return { label: 'Configurations', controlId: null };
  const field = fieldsOfKind(kind).find((f) => f.path === path || path.startsWith(`${f.path}.`));
  if (field) return { label: field.label, controlId: fieldControlId(field.path) };
  const placement = placementFields[path];
  if (placement) return { label: placement[0], controlId: placement[1] };
  const row = /^(faces|masses)\.(\d+)\.?(\w+)?/.exec(path);
  if (row) {
    const i = Number(row[2]);
    const columns: ReadonlyArray<{ key: string; label: string }> = row[1] === 'faces' ? faceColumns : massColumns;
    const column = columns.find((c) => c.key === row[3]);
    const what = row[1] === 'faces' ? 'Face' : 'Mass';
    return column
      ? { label: `${what} ${i + 1}: ${column.label.toLowerCase()}`, controlId: `${row[1] === 'faces' ? 'face' : 'mass'}-${i}-${column.key}` }
      : { label: `${what} ${i + 1}`, controlId: `${row[1] === 'faces' ? 'face' : 'mass'}-${i}-${columns[1]!.key}` };
  }
  if (path === 'faces') return { label: 'Wind-loaded faces', controlId: 'face-0-areaM2' };
  if (path === 'masses') return { label: 'Resisting masses', controlId: 'mass-0-massKg' };
  if (path === 'uplift') return { label: 'Roof or canopy uplift', controlId: 'sf-up-area' };
  const level = /^levels\.(\d+)\.?(\w+)?/.exec(path);
  if (level) {
    const i = Number(level[1]);
    if (level[2] === 'moveToConfiguration') return { label: `Level ${i + 1}: moves the structure to`, controlId: `sl-${i}-move` };
    const part = level[2] === 'label' ? 'label' : level[2] === 'actionText' ? 'action' : 'trigger';
    return { label: `Level ${i + 1}: ${part}`, controlId: `sl-${i}-${part === 'trigger' ? 'value' : part}` };
  }
  if (/^levels/.test(path)) return { label: 'Levels and actions', controlId: null };
  if (/^sensorKeys/.test(path)) return { label: 'Sensors that govern', controlId: null };
  if (path === 'kind') return { label: 'Kind', controlId: null };
  return { label: path === '' ? 'The structure as a whole' : path, controlId: null };
}

/**
 * A configuration's field (configurationsEditor.tsx builds the ids the same way): "Configuration 2:
 * name", "Configuration 2: Bottom edge height", "Configuration 2: face 1 area". Configurations are
 * numbered after the one as registered (number 1), as the form shows them.
 */
function configurationField(index: number, part: string | undefined, rest: string | undefined, kind: StructureKind): NamedField {
  const what = `Configuration ${index + 2}`;
  const id = (p: string) => `cf-${index}-${p.replace(/\./g, '-')}`;
  if (part === 'name') return { label: `${what}: name`, controlId: id('name') };
  if (part !== 'changes' || rest === undefined) return { label: part === 'changes' ? `${what}: changes` : what, controlId: part === 'changes' ? id('add') : id('name') };
  const face = /^faces\.(\d+)\.?(\w+)?/.exec(rest);
  if (face) {
    const column = faceColumns.find((c) => c.key === face[2]) ?? faceColumns[1];
    return { label: `${what}: face ${Number(face[1]) + 1} ${column.label.toLowerCase()}`, controlId: id(`face.${face[1]}.${column.key}`) };
  }
  const field = fieldsOfKind(kind).find((f) => f.path === rest || rest.startsWith(`${f.path}.`)) ?? fieldsOfKind(kind).find((f) => f.path.startsWith(`${rest}.`));
  if (field) return { label: `${what}: ${field.label}`, controlId: id(field.path) };
  return { label: `${what}: ${rest}`, controlId: id('add') };
}

export interface IssueField extends NamedField {
  /** What is wrong, in the form's words; several complaints about one field joined with "; ". */
  problem: string;
}

/**
 * The fields a list of issues points at, in the form's order of appearance is not known here: in
 * the order given, each field once, its complaints joined.
 */
export function issueFields(issues: Iterable<readonly [string, string]>, kind: StructureKind): IssueField[] {
  const out: IssueField[] = [];
  for (const [path, message] of issues) {
    const named = namedField(path, kind);
    const problem = formWords(message, kind);
    const same = out.find((o) => o.label === named.label);
    if (same) {
      if (!same.problem.split('; ').includes(problem)) same.problem = `${same.problem}; ${problem}`;
    } else out.push({ ...named, problem });
  }
  return out;
}

const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** Field-name tokens of a kind and their labels, longest first so "coefficients.wallCf" wins over "wallCf". */
function tokenLabels(kind: StructureKind): Array<[RegExp, string]> {
  const pairs = new Map<string, string>();
  const add = (token: string, label: string) => {
    // Only names that cannot be ordinary words: camelCase ("widthM") or dotted ("sides.front").
    if (/[a-z][A-Z]|\./.test(token) && !pairs.has(token)) pairs.set(token, label);
  };
  for (const f of fieldsOfKind(kind)) add(f.path, f.label);
  // The last part of a nested path alone ("wallCf"), when no other field ends the same way.
  const fields = fieldsOfKind(kind);
  for (const f of fields) {
    const last = f.path.split('.').at(-1)!;
    if (last !== f.path && fields.filter((g) => g.path.split('.').at(-1) === last).length === 1) add(last, f.label);
  }
  for (const [path, [label]] of Object.entries(placementFields)) add(path, label);
  // A kind whose faces and masses are the form's rows (register/kinds/custom.ts) names their columns too.
  if (kindForms[kind].editor === 'rows') {
    for (const c of faceColumns) add(c.key, `face ${c.label.toLowerCase()}`);
    for (const c of massColumns) if (!pairs.has(c.key)) add(c.key, `mass ${c.label.toLowerCase()}`);
  }
  return [...pairs.entries()]
    .sort((a, b) => b[0].length - a[0].length)
    .map(([token, label]) => [new RegExp(`(?<![\\w.])${escapeRegExp(token)}(?![\\w])`, 'g'), `“${label}”`]);
}

const cache = new Map<StructureKind, Array<[RegExp, string]>>();

/**
 * An engine sentence in the form's words for a structure of `kind` (see the module comment):
 * "y = lengthM" and "y = baseWidthM" become the end's name on the form ("y = length"), and each
 * field name the form shows becomes its label in quotes. Text with no field name is unchanged.
 *
 * @example formWords('Give referenceHeightM.', 'custom') // → 'Give “Reference height”.'
 */
export function formWords(text: string, kind: StructureKind): string {
  let out = text.replace(/y = lengthM\b/g, 'y = length').replace(/y = baseWidthM\b/g, `y = ${kindForms[kind].baseWidthWords}`);
  if (!/[a-z][A-Z]|[a-z]\.[a-z]/.test(out)) return out;
  let tokens = cache.get(kind);
  if (!tokens) cache.set(kind, (tokens = tokenLabels(kind)));
  for (const [pattern, label] of tokens) out = out.replace(pattern, label);
  return out;
}
