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
import type { LevelDefinition, StructureKind, StructureView } from '../types.ts';
import { mpsToSpeed, speedToMps, type SpeedUnit } from '../units.ts';
import { commonFields, kindFields, type FieldDef } from './kindFields.ts';

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
  kind: 'utilization' | 'gust';
  /** Percent of capacity, or a gust in the person's unit. */
  value: string;
  actionText: string;
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
    value: l.trigger.kind === 'utilization' ? String(Math.round(l.trigger.fraction * 1000) / 10) : roundSpeed(mpsToSpeed(l.trigger.gustMps, unit)),
    actionText: l.actionText,
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
  };
}

/** A new draft of another kind keeping what carries over (name, placement, levels, shared fields). */
export function switchKind(d: Draft, kind: StructureKind, siteLevels: readonly LevelDefinition[], unit: SpeedUnit): Draft {
  const fresh = newDraft(kind, siteLevels, unit);
  const kept: Record<string, string> = { ...fresh.values };
  for (const f of commonFields) if (d.values[f.path] !== undefined) kept[f.path] = d.values[f.path]!;
  return { ...d, kind, values: kept };
}

/** The tent's four side fields (kindFields.ts), filled from `wallsClosed` when a record gives that instead. */
const tentSidePaths = ['sides.front', 'sides.back', 'sides.endY0', 'sides.endYW'] as const;

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
  if (view.record.kind === 'tent' && view.record.wallsClosed !== undefined) {
    // A record with `wallsClosed` (all sides at once): each side it does not list takes that state.
    const state = view.record.wallsClosed ? 'closed' : 'open';
    for (const side of tentSidePaths) d.values[side] ??= state;
  }
  if (view.record.kind === 'custom') {
    const r = view.record;
    const text = (v: number | undefined): string => (v === undefined ? '' : String(v));
    d.faces = r.faces.map((f) => ({
      label: f.label ?? '',
      areaM2: String(f.areaM2),
      centroidHeightM: String(f.centroidHeightM),
      cfFront: String(f.cfFront),
      cfBack: String(f.cfBack),
      facingDeg: text(f.facingDeg),
    }));
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
  return d;
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

/**
 * A fence's run, asked for before the server is: the engine's layout check (kinds/banner.ts) only
 * runs once every number is there, so an empty form would not say that the panels are needed.
 * The panel width and count are the way in; the run's length and the feet are the alternatives.
 */
function bannerRunIssues(values: Readonly<Record<string, string>>, issues: LocalIssues): void {
  const given = (path: string) => (values[path] ?? '').trim() !== '';
  if (!given('panelWidthM') && !given('widthM')) issues.set('panelWidthM', 'is required, with the number of panels (or give the run’s length instead)');
  if (!given('panels') && !given('feet') && !(given('panelWidthM') && given('widthM'))) issues.set('panels', 'is required: the number of panels (the feet follow: one at every joint and one at each end)');
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
  if (d.kind === 'banner') bannerRunIssues(d.values, issues);
  if (d.kind === 'custom') {
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
  return record;
}

export function draftLevels(levels: readonly LevelRowDraft[], unit: SpeedUnit, issues: LocalIssues = new Map()): unknown[] {
  return levels.map((l, i) => {
    const n = typedNumber(l.value);
    if (n === undefined || Number.isNaN(n)) issues.set(`levels.${i}.trigger`, n === undefined ? 'is required' : 'must be a number');
    const trigger =
      l.kind === 'utilization'
        ? { kind: 'utilization', fraction: n === undefined || Number.isNaN(n) ? l.value : n / 100 }
        : { kind: 'gust', gustMps: n === undefined || Number.isNaN(n) ? l.value : speedToMps(n, unit) };
    return { label: l.label.trim(), trigger, actionText: l.actionText.trim() };
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
