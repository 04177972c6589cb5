/**
 * The register form's state as typed (strings, so half-typed numbers survive) and its conversion
 * to the API's structure input. Speeds are typed in the person's unit and sent in m/s; a speed
 * that was loaded and not touched is sent back exactly as stored, so opening and saving a record
 * never shifts a rated gust by a rounding error.
 *
 * A new draft is empty: no dimension, face or mass has a value nobody typed, and an empty field
 * the record needs is reported "is required" (`draftRecord`), never filled with a default. Empty
 * optional fields are left out of the record, so the engine's documented default applies.
 * Loading a stored record and saving it again gives the same record, with one exception: a tent
 * saved with `wallsClosed` comes back with the four `sides` it stands for (the form sets each side).
 */
import type { LevelConfigurationField, LevelDefinition, StructureKind, StructureView } from '../types.ts';
import { mpsToSpeed, speedToMps, type SpeedUnit } from '../units.ts';
import { commonFields, groupLabels, kindFields, unchangeableByConfiguration, type FieldDef } from './kindFields.ts';
import { kindForms } from './kinds/index.ts';

export interface FaceRow {
  label: string;
  areaM2: string;
  centroidHeightM: string;
  cfFront: string;
  cfBack: string;
  /** Which way the face's front side looks, relative to the structure's front, degrees; empty or absent: left out (0). */
  facingDeg?: string;
}
export interface MassRow {
  label: string;
  massKg: string;
  xM: string;
  /** From the y = 0 end, m; empty or absent: left out (the middle of the base width). */
  yM?: string;
}
/** A custom record's uplift as typed. */
export interface UpliftDraft {
  planAreaM2: string;
  liftCoefficient: string;
  /** From the front edge, m; empty or absent: left out (the middle of the base). */
  xM?: string;
  /** From the y = 0 end, m; empty or absent: left out (the middle of the base). */
  yM?: string;
  /** Kept from a loaded record so that saving keeps it; the form does not show it. */
  label?: string;
}

/** A face row with nothing typed in it. */
export const emptyFaceRow = (): FaceRow => ({ label: '', areaM2: '', centroidHeightM: '', cfFront: '', cfBack: '', facingDeg: '' });
/** A mass row with nothing typed in it. */
export const emptyMassRow = (): MassRow => ({ label: '', massKg: '', xM: '', yM: '' });
const emptyUplift = (): UpliftDraft => ({ planAreaM2: '', liftCoefficient: '', xM: '', yM: '' });
export interface LevelRowDraft {
  label: string;
  kind: 'utilization' | 'gust' | 'chance';
  /** Percent of capacity (a utilization or chance trigger), or a gust in the person's unit. */
  value: string;
  /** A chance trigger's horizon, minutes, and the chance in percent above which the level rises. */
  withinMinutes?: string;
  chancePct?: string;
  actionText: string;
  /** The configuration the level's action moves the structure to (a name of the record's configurations); empty or absent: none. */
  moveToConfiguration?: string;
}

/**
 * One of the record's configurations as typed (design §2.5): a name and the fields it changes.
 * A change replaces the record's top-level field whole (engine/configuration.ts), so a field
 * holding several form fields (a tent's `sides`, `coefficients`) is changed as a group: adding
 * it copies every one of its form fields from the record as registered, to be changed as needed.
 */
export interface ConfigurationDraft {
  name: string;
  /** The record's top-level fields it changes, in the order added ("bottomHeightM", "sides", "faces"). */
  fields: string[];
  /** What is typed for those fields, by form path ("bottomHeightM", "sides.front"); empty: removed, the default applies. */
  values: Record<string, string>;
  /** A custom record's faces in this configuration (when `fields` holds "faces"). */
  faces: FaceRow[];
  /** Changes the form has no editor for (a custom record's masses or uplift), kept exactly as loaded. */
  kept: Record<string, unknown>;
  /** Speeds as loaded: path → [text shown, exact m/s] (as `Draft.loadedSpeeds`). */
  loadedSpeeds: Record<string, [string, number]>;
}

export interface Draft {
  kind: StructureKind;
  name: string;
  values: Record<string, string>;
  faces: FaceRow[];
  masses: MassRow[];
  upliftOn: boolean;
  uplift: UpliftDraft;
  orientationDeg: string;
  location: string;
  latDeg: string;
  lonDeg: string;
  mobile: boolean;
  /** Empty: every sensor on the site governs (the highest wins). */
  sensorKeys: string[];
  ownLevels: boolean;
  levels: LevelRowDraft[];
  /** Speeds as loaded: path → [text shown, exact m/s]. */
  loadedSpeeds: Record<string, [string, number]>;
  /** The record's other configurations, in order (the one as registered is the record itself). */
  configurations: ConfigurationDraft[];
}

export function fieldsOf(kind: StructureKind): FieldDef[] {
  return [...kindFields[kind], ...commonFields];
}

/** A number typed by a person: a decimal comma is accepted; empty is undefined; junk is NaN. */
export function typedNumber(text: string): number | undefined {
  const t = text.trim().replace(',', '.');
  if (t === '') return undefined;
  return /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t) ? Number(t) : Number.NaN;
}

const roundSpeed = (v: number): string => String(Math.round(v * 100) / 100);

export function levelsToDraft(levels: readonly LevelDefinition[], unit: SpeedUnit): LevelRowDraft[] {
  return levels.map((l) => ({
    label: l.label,
    kind: l.trigger.kind,
    value: l.trigger.kind === 'gust' ? roundSpeed(mpsToSpeed(l.trigger.gustMps, unit)) : String(Math.round(l.trigger.fraction * 1000) / 10),
    ...(l.trigger.kind === 'chance' ? { withinMinutes: String(l.trigger.withinMinutes), chancePct: String(Math.round(l.trigger.probability * 1000) / 10) } : {}),
    actionText: l.actionText,
    moveToConfiguration: (l as LevelDefinition & LevelConfigurationField).moveToConfiguration ?? '',
  }));
}

export function newDraft(kind: StructureKind, siteLevels: readonly LevelDefinition[], unit: SpeedUnit): Draft {
  const values: Record<string, string> = {};
  for (const f of fieldsOf(kind)) if (f.initial !== undefined) values[f.path] = f.initial;
  return {
    kind,
    name: '',
    values,
    faces: [emptyFaceRow()],
    masses: [emptyMassRow()],
    upliftOn: false,
    uplift: emptyUplift(),
    // Which way the front faces changes which side the wind is on: nobody's guess stands in for it.
    orientationDeg: '',
    location: '',
    latDeg: '',
    lonDeg: '',
    mobile: false,
    sensorKeys: [],
    ownLevels: false,
    levels: levelsToDraft(siteLevels, unit),
    loadedSpeeds: {},
    configurations: [],
  };
}

/** A new draft of another kind keeping what carries over (name, placement, levels, shared fields). */
export function switchKind(d: Draft, kind: StructureKind, siteLevels: readonly LevelDefinition[], unit: SpeedUnit): Draft {
  const fresh = newDraft(kind, siteLevels, unit);
  const kept: Record<string, string> = { ...fresh.values };
  for (const f of commonFields) if (d.values[f.path] !== undefined) kept[f.path] = d.values[f.path]!;
  // A configuration keeps the changes the new kind can make too (its common fields, a height).
  const groups = configurableFields(kind);
  const configurations = d.configurations.map((c) => {
    const fields = c.fields.filter((field) => groups.some((g) => g.field === field));
    const values = Object.fromEntries(Object.entries(c.values).filter(([path]) => fields.includes(topField(path))));
    return { ...c, fields, values, kept: {} };
  });
  return { ...d, kind, values: kept, configurations };
}

function getPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o !== null && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

function setPath(obj: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  let o = obj;
  for (const k of keys.slice(0, -1)) {
    if (typeof o[k] !== 'object' || o[k] === null) o[k] = {};
    o = o[k] as Record<string, unknown>;
  }
  o[keys.at(-1)!] = value;
}

export function draftFromView(view: StructureView, siteLevels: readonly LevelDefinition[], unit: SpeedUnit): Draft {
  const record = view.record as unknown as Record<string, unknown>;
  const d = newDraft(view.record.kind, siteLevels, unit);
  d.name = view.record.name;
  d.values = {};
  for (const f of fieldsOf(d.kind)) {
    const v = getPath(record, f.path);
    if (v === undefined || v === null) continue;
    if (f.kind === 'speed' && typeof v === 'number') {
      const text = roundSpeed(mpsToSpeed(v, unit));
      d.values[f.path] = text;
      d.loadedSpeeds[f.path] = [text, v];
    } else d.values[f.path] = String(v);
  }
  // What the kind reads its own way (a tent's `wallsClosed` as its four sides: register/kinds/tent.ts).
  kindForms[d.kind].loadValues?.(record, d.values);
  if (kindForms[d.kind].editor === 'rows') {
    const r = view.record as unknown as RowsRecord;
    const text = (v: number | undefined): string => (v === undefined ? '' : String(v));
    d.faces = faceRowsOf(r.faces);
    d.masses = r.masses.map((m) => ({ label: m.label ?? '', massKg: String(m.massKg), xM: String(m.xM), yM: text(m.yM) }));
    d.upliftOn = r.uplift !== undefined;
    if (r.uplift) {
      d.uplift = { planAreaM2: String(r.uplift.planAreaM2), liftCoefficient: String(r.uplift.liftCoefficient), xM: text(r.uplift.xM), yM: text(r.uplift.yM) };
      if (r.uplift.label !== undefined) d.uplift.label = r.uplift.label;
    }
  }
  d.orientationDeg = String(view.orientationDeg);
  d.location = view.location;
  d.latDeg = view.latDeg === null ? '' : String(view.latDeg);
  d.lonDeg = view.lonDeg === null ? '' : String(view.lonDeg);
  d.mobile = view.mobile;
  d.sensorKeys = view.sensorKeys ?? [];
  d.ownLevels = view.levels !== null;
  d.levels = levelsToDraft(view.levels ?? siteLevels, unit);
  d.configurations = (view.record.configurations ?? []).map((c) => configurationFromRecord(view.record as unknown as Record<string, unknown>, c.name, c.changes, unit));
  return d;
}

/** A record whose faces, masses and uplift are the form's rows (a kind with `editor: 'rows'`: register/kinds/custom.ts). */
type RowsRecord = Pick<Extract<StructureView['record'], { faces: unknown; masses: unknown }>, 'faces' | 'masses' | 'uplift'>;

/** A stored record's faces as form rows. */
function faceRowsOf(faces: ReadonlyArray<{ label?: string; areaM2: number; centroidHeightM: number; cfFront: number; cfBack: number; facingDeg?: number }>): FaceRow[] {
  return faces.map((f) => ({
    label: f.label ?? '',
    areaM2: String(f.areaM2),
    centroidHeightM: String(f.centroidHeightM),
    cfFront: String(f.cfFront),
    cfBack: String(f.cfBack),
    facingDeg: f.facingDeg === undefined ? '' : String(f.facingDeg),
  }));
}

/** Problems found before asking the server (a field that is not a number), keyed like the server's. */
export type LocalIssues = Map<string, string>;

function numberOrText(text: string, path: string, issues: LocalIssues, int = false): number | string | undefined {
  const n = typedNumber(text);
  if (n === undefined) return undefined;
  if (Number.isNaN(n)) {
    issues.set(path, 'must be a number');
    return text;
  }
  if (int && !Number.isInteger(n)) issues.set(path, 'must be a whole number');
  return n;
}

/** An empty field the record needs: reported here, so no default ever stands in for it. */
const required = 'is required';

/** A row's field: the number typed, "is required" when empty and needed, left out when empty and optional. */
function rowNumber(text: string | undefined, path: string, issues: LocalIssues, optional = false): number | string | undefined {
  if ((text ?? '').trim() === '') {
    if (!optional) issues.set(path, required);
    return undefined;
  }
  return numberOrText(text!, path, issues);
}

/** Sets `target[key]` unless the value is undefined (an empty optional field is left out, not sent as null). */
function put(target: Record<string, unknown>, key: string, value: unknown): void {
  if (value !== undefined) target[key] = value;
}

/**
 * The engine record the draft describes (invalid values are passed on for the server to name).
 * Empty optional fields are left out; an empty required field is left out and reported in
 * `issues` as "is required".
 */
export function draftRecord(d: Draft, unit: SpeedUnit, issues: LocalIssues = new Map()): Record<string, unknown> {
  const record: Record<string, unknown> = { kind: d.kind, name: d.name.trim() };
  if (record.name === '') issues.set('name', required);
  for (const f of fieldsOf(d.kind)) {
    const text = d.values[f.path] ?? '';
    if (text.trim() === '') {
      if (!f.optional) issues.set(f.path, required);
      continue;
    }
    let value: unknown;
    switch (f.kind) {
      case 'bool':
        value = text === 'true';
        break;
      case 'text':
      case 'select':
        value = text.trim();
        break;
      case 'speed': {
        const loaded = d.loadedSpeeds[f.path];
        if (loaded && loaded[0] === text) value = loaded[1];
        else {
          const n = numberOrText(text, f.path, issues);
          value = typeof n === 'number' ? speedToMps(n, unit) : n;
        }
        break;
      }
      default:
        value = numberOrText(text, f.path, issues, f.kind === 'int');
    }
    if (value !== undefined) setPath(record, f.path, value);
  }
  // The kind's own checks before the server's (a fence's panels: register/kinds/banner.ts).
  kindForms[d.kind].localIssues?.(d.values, issues);
  if (kindForms[d.kind].editor === 'rows') {
    record.faces = d.faces.map((f, i) => {
      const face: Record<string, unknown> = {};
      if (f.label.trim()) face.label = f.label.trim();
      for (const k of ['areaM2', 'centroidHeightM', 'cfFront', 'cfBack'] as const) put(face, k, rowNumber(f[k], `faces.${i}.${k}`, issues));
      put(face, 'facingDeg', rowNumber(f.facingDeg, `faces.${i}.facingDeg`, issues, true));
      return face;
    });
    record.masses = d.masses.map((m, i) => {
      const mass: Record<string, unknown> = {};
      if (m.label.trim()) mass.label = m.label.trim();
      for (const k of ['massKg', 'xM'] as const) put(mass, k, rowNumber(m[k], `masses.${i}.${k}`, issues));
      put(mass, 'yM', rowNumber(m.yM, `masses.${i}.yM`, issues, true));
      return mass;
    });
    if (d.upliftOn) {
      const uplift: Record<string, unknown> = {};
      const label = d.uplift.label?.trim();
      if (label) uplift.label = label;
      put(uplift, 'planAreaM2', rowNumber(d.uplift.planAreaM2, 'uplift.planAreaM2', issues));
      put(uplift, 'liftCoefficient', rowNumber(d.uplift.liftCoefficient, 'uplift.liftCoefficient', issues));
      put(uplift, 'xM', rowNumber(d.uplift.xM, 'uplift.xM', issues, true));
      put(uplift, 'yM', rowNumber(d.uplift.yM, 'uplift.yM', issues, true));
      record.uplift = uplift;
    }
  }
  if (d.configurations.length > 0) record.configurations = d.configurations.map((c, i) => ({ name: c.name.trim(), changes: configurationChanges(d, c, i, unit, issues) }));
  return record;
}

export function draftLevels(levels: readonly LevelRowDraft[], unit: SpeedUnit, issues: LocalIssues = new Map()): unknown[] {
  return levels.map((l, i) => {
    const n = typedNumber(l.value);
    if (n === undefined || Number.isNaN(n)) issues.set(`levels.${i}.trigger`, n === undefined ? 'is required' : 'must be a number');
    const asTyped = (v: number | undefined, text: string, scale: (x: number) => number): unknown => (v === undefined || Number.isNaN(v) ? text : scale(v));
    let trigger: Record<string, unknown>;
    if (l.kind === 'chance') {
      const minutes = typedNumber(l.withinMinutes ?? '');
      const pct = typedNumber(l.chancePct ?? '');
      if (minutes === undefined || Number.isNaN(minutes)) issues.set(`levels.${i}.trigger.withinMinutes`, minutes === undefined ? 'is required' : 'must be a number');
      if (pct === undefined || Number.isNaN(pct)) issues.set(`levels.${i}.trigger.probability`, pct === undefined ? 'is required' : 'must be a number');
      trigger = { kind: 'chance', fraction: asTyped(n, l.value, (x) => x / 100), withinMinutes: asTyped(minutes, l.withinMinutes ?? '', (x) => x), probability: asTyped(pct, l.chancePct ?? '', (x) => x / 100) };
    } else if (l.kind === 'utilization') trigger = { kind: 'utilization', fraction: asTyped(n, l.value, (x) => x / 100) };
    else trigger = { kind: 'gust', gustMps: asTyped(n, l.value, (x) => speedToMps(x, unit)) };
    const moveTo = (l.moveToConfiguration ?? '').trim();
    return { label: l.label.trim(), trigger, actionText: l.actionText.trim(), ...(moveTo === '' ? {} : { moveToConfiguration: moveTo }) };
  });
}

function optionalNumber(text: string, path: string, issues: LocalIssues): number | null {
  const n = typedNumber(text);
  if (n === undefined) return null;
  if (Number.isNaN(n)) {
    issues.set(path, 'must be a number');
    return null;
  }
  return n;
}

/** The body of POST /api/structures (and PATCH): record, placement, sensors and levels. */
export function draftInput(d: Draft, unit: SpeedUnit, issues: LocalIssues = new Map()): Record<string, unknown> {
  const orientation = typedNumber(d.orientationDeg);
  if (orientation !== undefined && Number.isNaN(orientation)) issues.set('orientationDeg', 'must be a number');
  return {
    record: draftRecord(d, unit, issues),
    orientationDeg: orientation === undefined || Number.isNaN(orientation) ? 0 : orientation,
    location: d.location.trim(),
    latDeg: optionalNumber(d.latDeg, 'latDeg', issues),
    lonDeg: optionalNumber(d.lonDeg, 'lonDeg', issues),
    mobile: d.mobile,
    sensorKeys: d.sensorKeys.length > 0 ? d.sensorKeys : null,
    levels: d.ownLevels ? draftLevels(d.levels, unit, issues) : null,
  };
}

/**
 * A server message made readable for a form. The server words its own messages plainly
 * (server/engine/issueWords.ts); this catches the validation library's defaults from anything
 * that still passes them on ("Invalid input: expected number, received undefined" → "is required").
 */
export function plainMessage(message: string): string {
  if (/received undefined/.test(message)) return 'is required';
  if (/expected number, received (string|NaN)/.test(message)) return 'must be a number';
  if (/expected int, received/.test(message)) return 'must be a whole number';
  const option = /^Invalid option: expected one of (.+)$/.exec(message);
  if (option) return `must be one of ${option[1]!.split('|').join(', ')}`;
  const discriminator = /^Invalid discriminator value\. Expected (.+)$/.exec(message);
  if (discriminator) return `must be one of ${discriminator[1]!.replace(/'/g, '').split(' | ').join(', ')}`;
  return message.replace(/^Invalid input: /, '');
}

/** How a fence run comes out of what was typed: the engine's rule (kinds/banner.ts bannerLayout), for the form to say as you type. */
export interface BannerRun {
  runLengthM: number;
  panels: number;
  panelWidthM: number;
  feet: number;
}

/**
 * The run a banner draft describes, by the engine's rule (kinds/banner.ts `bannerLayout`; checked
 * against it by tests/unit/registerFields.test.ts): panels as given, else the length ÷ the panel
 * width, else feet − 1; the length as given, else panels × panel width; feet as given, else
 * panels + 1. Null while it cannot be told yet (or the numbers disagree: the calculator names that).
 */
export function bannerRun(values: Readonly<Record<string, string>>): BannerRun | null {
  const read = (path: string) => {
    const n = typedNumber(values[path] ?? '');
    return n === undefined || Number.isNaN(n) || n <= 0 ? undefined : n;
  };
  const widthM = read('widthM');
  const panelWidthM = read('panelWidthM');
  const feetGiven = read('feet');
  let panels = read('panels');
  if (panels === undefined && widthM !== undefined && panelWidthM !== undefined) panels = Math.max(1, Math.round(widthM / panelWidthM));
  if (panels === undefined && feetGiven !== undefined) panels = Math.max(1, feetGiven - 1);
  if (panels === undefined || !Number.isInteger(panels)) return null;
  const runLengthM = widthM ?? (panelWidthM === undefined ? undefined : panelWidthM * panels);
  if (runLengthM === undefined) return null;
  if (widthM !== undefined && panelWidthM !== undefined && Math.abs(panels * panelWidthM - widthM) > 0.01) return null;
  return { runLengthM, panels, panelWidthM: panelWidthM ?? runLengthM / panels, feet: feetGiven ?? panels + 1 };
}

// ---------- Configurations (design §2.5) ----------

/** A field a configuration can change: a top-level field of the record and the form fields it holds. */
export interface ConfigurableField {
  /** The record's top-level field ("bottomHeightM", "sides", "faces"). */
  field: string;
  label: string;
  /** Its form fields (none for a custom record's faces: the face rows are its editor). */
  defs: FieldDef[];
}

/** The top-level field a form path belongs to ("sides.front" → "sides"). */
export const topField = (path: string): string => path.split('.')[0]!;

/** Every field of a kind a configuration can change, in the form's order (kind fields, then the common ones). */
export function configurableFields(kind: StructureKind): ConfigurableField[] {
  const out: ConfigurableField[] = [];
  for (const def of fieldsOf(kind)) {
    const field = topField(def.path);
    if (unchangeableByConfiguration.includes(field)) continue;
    const group = out.find((g) => g.field === field);
    if (group) group.defs.push(def);
    else out.push({ field, label: def.path === field ? def.label : (groupLabels[field] ?? field), defs: [def] });
  }
  if (kindForms[kind].editor === 'rows') out.unshift({ field: 'faces', label: groupLabels.faces!, defs: [] });
  return out;
}

/** A configuration with a name and nothing changed yet. */
export function newConfiguration(name = ''): ConfigurationDraft {
  return { name, fields: [], values: {}, faces: [], kept: {}, loadedSpeeds: {} };
}

/**
 * The configuration with one more field changed, starting from the record as registered (every
 * form field of the group copied, so a tent's four sides show as they are and one is changed).
 */
export function withChangedField(c: ConfigurationDraft, d: Draft, field: string): ConfigurationDraft {
  if (c.fields.includes(field)) return c;
  const group = configurableFields(d.kind).find((g) => g.field === field);
  if (!group) return c;
  const values = { ...c.values };
  const loadedSpeeds = { ...c.loadedSpeeds };
  for (const def of group.defs) {
    if (d.values[def.path] !== undefined) values[def.path] = d.values[def.path]!;
    if (d.loadedSpeeds[def.path]) loadedSpeeds[def.path] = d.loadedSpeeds[def.path]!;
  }
  const faces = field === 'faces' ? d.faces.map((f) => ({ ...f })) : c.faces;
  return { ...c, fields: [...c.fields, field], values, loadedSpeeds, faces };
}

/** The configuration without the change to `field` (that field is then as registered). */
export function withoutChangedField(c: ConfigurationDraft, field: string): ConfigurationDraft {
  const values = Object.fromEntries(Object.entries(c.values).filter(([path]) => topField(path) !== field));
  const { [field]: _dropped, ...kept } = c.kept;
  return { ...c, fields: c.fields.filter((f) => f !== field), values, kept, faces: field === 'faces' ? [] : c.faces };
}

/**
 * A stored configuration as typed. Each change the form has fields for becomes those fields'
 * text (a speed keeps its exact m/s, as the record's own speeds do); anything else is kept as
 * loaded, so opening and saving never changes a configuration. A tent configuration that changes
 * `wallsClosed` (or gives only some sides) is written as its four sides, resolved the way the
 * engine resolves them (kinds/tent.ts resolvedTentSides): the form always saves the registered
 * record with all four sides, and a `wallsClosed` left in a change would no longer reach them.
 */
export function configurationFromRecord(record: Readonly<Record<string, unknown>>, name: string, changes: Readonly<Record<string, unknown>>, unit: SpeedUnit): ConfigurationDraft {
  const kind = record.kind as StructureKind;
  const c = newConfiguration(name);
  const groups = configurableFields(kind);
  const entries = Object.entries(changes);
  for (const [field, value] of entries) {
    if (kindForms[kind].changesReadElsewhere?.includes(field)) continue;
    if (field === 'faces' && kindForms[kind].editor === 'rows' && Array.isArray(value)) {
      c.fields.push('faces');
      c.faces = faceRowsOf(value as Parameters<typeof faceRowsOf>[0]);
      continue;
    }
    const group = groups.find((g) => g.field === field && g.defs.length > 0);
    if (!group) {
      c.kept[field] = value;
      continue;
    }
    c.fields.push(field);
    if (value === null) continue;
    const holder = { [field]: value };
    for (const def of group.defs) {
      const v = getPath(holder, def.path);
      if (v === undefined || v === null) continue;
      if (def.kind === 'speed' && typeof v === 'number') {
        const text = roundSpeed(mpsToSpeed(v, unit));
        c.values[def.path] = text;
        c.loadedSpeeds[def.path] = [text, v];
      } else c.values[def.path] = String(v);
    }
  }
  // What the kind reads its own way (a tent's `wallsClosed` as its four sides: register/kinds/tent.ts).
  kindForms[kind].loadChanges?.(record, changes, c);
  return c;
}

/**
 * The `changes` a configuration draft stands for. The record as registered with the
 * configuration's fields in place of its own is built by `draftRecord` (so numbers, speeds and
 * rows are read exactly as the registered ones are), and the changed fields are taken from it:
 * a field left empty is removed (null: its default applies). Problems go into `issues` at
 * `configurations.<i>.name` and `configurations.<i>.changes.<path>`, the server's paths.
 */
function configurationChanges(d: Draft, c: ConfigurationDraft, index: number, unit: SpeedUnit, issues: LocalIssues): Record<string, unknown> {
  if (c.name.trim() === '') issues.set(`configurations.${index}.name`, required);
  const values = Object.fromEntries(Object.entries(d.values).filter(([path]) => !c.fields.includes(topField(path))));
  for (const [path, text] of Object.entries(c.values)) if (c.fields.includes(topField(path))) values[path] = text;
  const configured: Draft = { ...d, values, loadedSpeeds: { ...d.loadedSpeeds, ...c.loadedSpeeds }, faces: c.fields.includes('faces') ? c.faces : d.faces, configurations: [] };
  const found: LocalIssues = new Map();
  const record = draftRecord(configured, unit, found);
  const changes: Record<string, unknown> = {};
  for (const field of c.fields) changes[field] = record[field] ?? null;
  for (const [field, value] of Object.entries(c.kept)) if (!(field in changes)) changes[field] = value;
  for (const [path, message] of found) if (c.fields.includes(topField(path))) issues.set(`configurations.${index}.changes.${path}`, message);
  if (c.fields.length === 0 && Object.keys(c.kept).length === 0) issues.set(`configurations.${index}.changes`, 'must change at least one field: add a change');
  return changes;
}

/** Renames a configuration in the levels that move the structure to it (a level keeps pointing at the same one). */
export function renamedInLevels(levels: readonly LevelRowDraft[], from: string, to: string): LevelRowDraft[] {
  const key = from.trim().toLowerCase();
  // Emptied while retyped: the levels keep the old name (shown as not a configuration) rather than silently losing it.
  if (key === '' || to.trim() === '') return [...levels];
  return levels.map((l) => ((l.moveToConfiguration ?? '').trim().toLowerCase() === key ? { ...l, moveToConfiguration: to } : l));
}
