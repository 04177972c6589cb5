/**
 * Parsing and validation of the MQTT reading payload (design.md §3, contract). Pure apart from
 * TextDecoder: bytes in, readings in SI units or a reason out. It never throws on any payload;
 * it throws a RangeError only when the caller's own options are wrong (a programming error).
 *
 * ## Reading payloads (README)
 *
 * A sensor publishes to `<prefix>/<sensorKey>/reading`. The payload is one of:
 *
 * 1. A JSON object
 *    `{"ts": <ISO 8601 string or epoch ms>, "speed": <number>, "gust"?: <number>,
 *      "dir"?: <0–360>, "tempC"?: <number>, "pressureHpa"?: <number>, "rh"?: <percent>}`.
 *    `speed` is an instantaneous sample, or the mean when `gust` is also given. Speeds are in the
 *    unit the sensor was registered with (m/s, km/h, kn or mph). `dir` is the direction the wind
 *    blows FROM in degrees clockwise from north (360 is read as 0). Optional fields may be
 *    omitted or null. Any other field rejects the reading (`unknown-field`): a misspelt `gust`
 *    must not turn a mean into a sample. ISO 8601 times need a date, a time and a zone
 *    (`Z` or `±hh:mm`), e.g. `2024-06-01T14:03:07.250+02:00`.
 * 2. A JSON array of such objects (a gateway flushing its buffer after an outage), at most
 *    10 000 elements (for reading objects the 256 KiB limit comes first: about 8 000 with
 *    epoch-ms times; a SenML pack can carry 10 000 records). Each element is judged on its own: good ones are kept, bad ones are
 *    reported one by one with their index and reason.
 * 3. A SenML pack (RFC 8428, JSON): an array whose first record has `bn` or `n`. Our record
 *    names: the resolved name (base name + name, RFC 8428 §4.5.1) ends in one of
 *
 *    | name       | quantity                                 | units accepted (RFC 8428 §12.1)   |
 *    | ---------- | ---------------------------------------- | --------------------------------- |
 *    | `speed`    | wind speed: a sample, or the mean if a `gust` has the same time | `m/s`; none = the sensor's registered unit |
 *    | `gust`     | 3-s gust of a summary                    | `m/s`; none = the registered unit |
 *    | `dir`      | direction the wind blows from            | `deg` (also design.md), `rad`; none = `deg` |
 *    | `temp`     | air temperature                          | `Cel`, `K`; none = `Cel`          |
 *    | `pressure` | air pressure                             | `Pa`; none = `Pa`                 |
 *    | `rh`       | relative humidity                        | `%RH`; none = `%RH`               |
 *
 *    "Ends in" means the whole name, or the part after the last `:`, `/` or `.`:
 *    `urn:dev:mac:0024befffe804ff1:speed`, `mast-3/gust` and `dir` all match; `windspeed` and
 *    `max-speed` do not. Records with other names (battery, signal...) are ignored. Base fields
 *    `bn`, `bt`, `bu`, `bv` apply as RFC 8428 §4.1 says; times are seconds, `bt + t`, and a
 *    resolved time below 2^28 is relative to the time of receipt (RFC 8428 §4.5.3; no time at
 *    all means "now"). Records whose resolved times are equal (to the millisecond) form one
 *    reading; each reading needs exactly one `speed`. A label ending in `_` that we do not know
 *    rejects the pack (must-understand, RFC 8428 §4.4).
 * 4. A bare JSON number: a speed sample, in the registered unit, at the time of receipt.
 *
 * Limits: payload at most 256 KiB (checked before decoding), valid UTF-8, JSON nesting at most
 * 8 deep (our forms need 2). Plausible values, after unit conversion: 0 ≤ speed ≤ 120 m/s and
 * 0 ≤ gust ≤ 120 m/s (design.md §3); direction 0–360°; temperature −60…+60 °C; pressure
 * 500–1100 hPa (sea-level highs and sites up to about 5 km, generous); humidity 0–100 %.
 * Timestamps at most 5 minutes ahead of receipt (design.md §3) and at most 7 days behind it:
 * a gateway's buffer flushed after a long outage during a build week still counts, older stamps
 * are clocks reset to 1970 or epoch seconds sent as milliseconds (engineering judgement).
 */
import { isSpeedUnit, speedToMps, type SpeedUnit } from '../engine/units.ts';
import type { WindReading } from '../wind/index.ts';

/** Every reason a payload or one of its readings is rejected. */
export const rejectReasons = [
  /** Payload larger than maxPayloadBytes. */
  'too-large',
  /** Nothing but whitespace. */
  'empty',
  /** Not valid UTF-8. */
  'bad-utf8',
  /** Not valid JSON. */
  'not-json',
  /** JSON nested deeper than maxNestingDepth. */
  'too-deep',
  /** Valid JSON of a form we do not take (a string, null, an object inside a batch...). */
  'wrong-shape',
  /** An array of more than maxBatchElements elements or records. */
  'batch-too-large',
  /** A JSON reading object with a field that is not part of the contract. */
  'unknown-field',
  /** A JSON reading object without `ts`. */
  'missing-timestamp',
  /** A timestamp that is neither a valid ISO 8601 date-time with zone nor epoch ms. */
  'bad-timestamp',
  /** A timestamp more than maxFutureMs ahead of receipt. */
  'future-timestamp',
  /** A timestamp more than maxAgeMs behind receipt. */
  'too-old',
  /** No speed in a reading. */
  'missing-speed',
  /** A value that is not a finite JSON number. */
  'not-a-number',
  /** A number outside its plausible range. */
  'out-of-range',
  /** A direction outside 0–360°. */
  'bad-direction',
  /** A SenML pack that breaks RFC 8428 (field types, names, must-understand labels, version). */
  'bad-senml',
  /** A SenML record of ours in a unit we do not take for its quantity. */
  'bad-senml-unit',
  /** Two SenML records of the same quantity at the same time. */
  'duplicate-field',
] as const;
export type RejectReason = (typeof rejectReasons)[number];

/** One reading in SI units; null where the payload said nothing: what the wind state takes. */
export type Reading = WindReading;

/** A reading of a batch that was rejected on its own; index is the array element or record. */
export interface RejectedReading {
  readonly index: number;
  readonly reason: RejectReason;
  readonly detail: string;
}

export type ParseResult =
  | {
      readonly ok: true;
      /** In time order. */
      readonly readings: readonly Reading[];
      /** The payload carried several readings (a JSON array, or a SenML pack with several times). */
      readonly batch: boolean;
      /** Readings of a batch rejected one by one (empty otherwise). */
      readonly rejected: readonly RejectedReading[];
    }
  | {
      readonly ok: false;
      readonly reason: RejectReason;
      /** For people: names the field and the value. */
      readonly detail: string;
      /** When every reading of a batch was rejected: each of them (else empty). */
      readonly rejected: readonly RejectedReading[];
    };

export interface ParseOptions {
  /** When the message arrived (epoch ms): the time of a bare number, "now" for SenML. */
  receivedAtMs: number;
  /** The unit the sensor was registered with, for speeds given without one. */
  unit: SpeedUnit;
}

export const maxPayloadBytes = 262_144;
export const maxNestingDepth = 8;
export const maxBatchElements = 10_000;
export const maxFutureMs = 300_000;
export const maxAgeMs = 7 * 86_400_000;
export const maxSpeedMps = 120;
export const minTempC = -60;
export const maxTempC = 60;
export const minPressurePa = 50_000;
export const maxPressurePa = 110_000;

/** RFC 8428 §4.5.3: resolved times below 2^28 s are relative to now. */
const senmlRelativeTimeLimitS = 2 ** 28;
/** RFC 8428 §4.4: the version this parser implements (and the default). */
const senmlVersion = 10;

type Bad = { readonly bad: true; readonly reason: RejectReason; readonly detail: string };
const bad = (reason: RejectReason, detail: string): Bad => ({ bad: true, reason, detail });
const isBad = (value: unknown): value is Bad => typeof value === 'object' && value !== null && (value as Bad).bad === true;

const noRejections: readonly RejectedReading[] = Object.freeze([]);
const decoder = new TextDecoder('utf-8', { fatal: true });

/**
 * Readings from one MQTT payload, or why it was rejected.
 *
 * @example
 * const parsed = parseReadingPayload(message, { receivedAtMs: Date.now(), unit: 'kn' });
 * if (parsed.ok) for (const r of parsed.readings) store(r);
 * else countRejection(parsed.reason, parsed.detail);
 */
export function parseReadingPayload(payload: Uint8Array, options: ParseOptions): ParseResult {
  if (!Number.isFinite(options.receivedAtMs)) {
    throw new RangeError(`parseReadingPayload: receivedAtMs must be finite epoch ms, got ${options.receivedAtMs}`);
  }
  if (!isSpeedUnit(options.unit)) {
    throw new RangeError(`parseReadingPayload: unit must be one of m/s, km/h, kn, mph, got ${JSON.stringify(options.unit)}`);
  }
  if (!(payload instanceof Uint8Array)) return failure(bad('wrong-shape', 'payload is not a byte array'));
  if (payload.byteLength > maxPayloadBytes) {
    return failure(bad('too-large', `payload is ${payload.byteLength} bytes; at most ${maxPayloadBytes} are accepted`));
  }
  let text: string;
  try {
    text = decoder.decode(payload);
  } catch {
    // The only failure of a fatal decoder on a byte array is invalid UTF-8.
    return failure(bad('bad-utf8', 'payload is not valid UTF-8'));
  }
  if (text.trim() === '') return failure(bad('empty', 'payload is empty'));
  if (nestingDepthBeyond(text, maxNestingDepth)) return failure(bad('too-deep', `JSON is nested more than ${maxNestingDepth} levels deep`));
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    return failure(bad('not-json', `payload is not JSON (${clip(message, 120)}): ${clip(JSON.stringify(text), 60)}`));
  }

  if (typeof json === 'number') return single(bareNumberReading(json, options));
  if (Array.isArray(json)) {
    if (json.length === 0) return failure(bad('wrong-shape', 'payload is an empty array'));
    if (json.length > maxBatchElements) {
      return failure(bad('batch-too-large', `array has ${json.length} elements; at most ${maxBatchElements} are accepted`));
    }
    if (isSenmlPack(json)) return senmlReadings(json, options);
    return objectBatch(json, options);
  }
  if (isPlainObject(json)) return single(objectReading(json, options));
  return failure(bad('wrong-shape', `payload is ${describeJsonType(json)}; expected a reading object, an array, a SenML pack or a number`));
}

// ---------------------------------------------------------------------------------------------
// Results

function failure(why: Bad, rejected: readonly RejectedReading[] = noRejections): ParseResult {
  return { ok: false, reason: why.reason, detail: why.detail, rejected };
}

function single(result: Reading | Bad): ParseResult {
  if (isBad(result)) return failure(result);
  return { ok: true, readings: [result], batch: false, rejected: noRejections };
}

function batchResult(readings: Reading[], rejected: RejectedReading[], batch: boolean): ParseResult {
  if (readings.length === 0) {
    const first = rejected[0];
    if (first === undefined) return failure(bad('missing-speed', 'payload holds no reading'));
    const more = rejected.length > 1 ? `all ${rejected.length} readings rejected; first ` : '';
    return { ok: false, reason: first.reason, detail: `${more}at index ${first.index}: ${first.detail}`, rejected };
  }
  // Stable sort: equal times keep their payload order.
  readings.sort((a, b) => a.tsMs - b.tsMs);
  return { ok: true, readings, batch, rejected: rejected.length === 0 ? noRejections : rejected };
}

// ---------------------------------------------------------------------------------------------
// Form 4: a bare number

function bareNumberReading(value: number, options: ParseOptions): Reading | Bad {
  const speedMps = speedFrom(value, 'speed (bare number)', options.unit);
  if (isBad(speedMps)) return speedMps;
  return { tsMs: options.receivedAtMs, speedMps, gustMps: null, dirDeg: null, tempC: null, pressurePa: null, rhPct: null };
}

// ---------------------------------------------------------------------------------------------
// Forms 1 and 2: reading objects

const objectFields = new Set(['ts', 'speed', 'gust', 'dir', 'tempC', 'pressureHpa', 'rh']);

function objectBatch(elements: unknown[], options: ParseOptions): ParseResult {
  const readings: Reading[] = [];
  const rejected: RejectedReading[] = [];
  elements.forEach((element, index) => {
    const result = isPlainObject(element)
      ? objectReading(element, options)
      : bad('wrong-shape', `element is ${describeJsonType(element)}; expected a reading object`);
    if (isBad(result)) rejected.push({ index, reason: result.reason, detail: result.detail });
    else readings.push(result);
  });
  return batchResult(readings, rejected, true);
}

function objectReading(obj: Record<string, unknown>, options: ParseOptions): Reading | Bad {
  for (const key of Object.keys(obj)) {
    if (!objectFields.has(key)) {
      return bad('unknown-field', `field ${clip(JSON.stringify(key), 60)} is not part of a reading (fields: ts, speed, gust, dir, tempC, pressureHpa, rh)`);
    }
  }
  if (obj.ts === undefined || obj.ts === null) return bad('missing-timestamp', 'field "ts" is missing');
  const tsMs = objectTimestampMs(obj.ts);
  if (isBad(tsMs)) return tsMs;
  const when = timeWindowProblem(tsMs, '"ts"', options.receivedAtMs);
  if (when) return when;

  if (obj.speed === undefined || obj.speed === null) return bad('missing-speed', 'field "speed" is missing');
  if (!isFiniteNumber(obj.speed)) return notANumber('"speed"', obj.speed);
  const speedMps = speedFrom(obj.speed, '"speed"', options.unit);
  if (isBad(speedMps)) return speedMps;

  const gust = optionalNumber(obj.gust, '"gust"');
  if (isBad(gust)) return gust;
  const gustMps = gust === null ? null : speedFrom(gust, '"gust"', options.unit);
  if (isBad(gustMps)) return gustMps;

  const dir = optionalNumber(obj.dir, '"dir"');
  if (isBad(dir)) return dir;
  const dirDeg = dir === null ? null : directionDeg(dir, '"dir"', `${dir}`);
  if (isBad(dirDeg)) return dirDeg;

  const temp = optionalNumber(obj.tempC, '"tempC"');
  if (isBad(temp)) return temp;
  const tempC = temp === null ? null : inRange(temp, minTempC, maxTempC, '"tempC"', '°C');
  if (isBad(tempC)) return tempC;

  const pressureHpa = optionalNumber(obj.pressureHpa, '"pressureHpa"');
  if (isBad(pressureHpa)) return pressureHpa;
  const pressure = pressureHpa === null ? null : inRange(pressureHpa, minPressurePa / 100, maxPressurePa / 100, '"pressureHpa"', 'hPa');
  if (isBad(pressure)) return pressure;

  const rh = optionalNumber(obj.rh, '"rh"');
  if (isBad(rh)) return rh;
  const rhPct = rh === null ? null : inRange(rh, 0, 100, '"rh"', '%');
  if (isBad(rhPct)) return rhPct;

  return { tsMs, speedMps, gustMps, dirDeg, tempC, pressurePa: pressure === null ? null : pressure * 100, rhPct };
}

function optionalNumber(value: unknown, field: string): number | null | Bad {
  if (value === undefined || value === null) return null;
  if (!isFiniteNumber(value)) return notANumber(field, value);
  return value;
}

/** ts as epoch ms (a JSON number, fractions of a ms dropped) or an ISO 8601 string. */
function objectTimestampMs(value: unknown): number | Bad {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) return bad('bad-timestamp', `"ts" ${show(value)} is not a finite number of epoch ms`);
    return Math.floor(value);
  }
  if (typeof value === 'string') return isoTimestampMs(value);
  return bad('bad-timestamp', `"ts" ${show(value)} must be an ISO 8601 date-time string or epoch milliseconds`);
}

const isoPattern = /^(\d{4})-(\d{2})-(\d{2})[Tt](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(?:([Zz])|([+-])(\d{2}):(\d{2}))$/;

/**
 * An ISO 8601 / RFC 3339 date-time with an explicit zone, in epoch ms (sub-ms digits dropped).
 * Date.parse is not used: it accepts many non-ISO forms and reads a zone-less time as local.
 */
function isoTimestampMs(text: string): number | Bad {
  const m = text.length <= 40 ? isoPattern.exec(text) : null;
  if (!m) {
    return bad('bad-timestamp', `"ts" ${show(text)} is not an ISO 8601 date-time with a zone, e.g. 2024-06-01T14:03:07Z or 2024-06-01T16:03:07+02:00`);
  }
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const hour = Number(m[4]);
  const minute = Number(m[5]);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const ms = m[7] === undefined ? 0 : Number(m[7].slice(0, 3).padEnd(3, '0'));
  const offsetMinutes = m[8] !== undefined ? 0 : (m[9] === '-' ? -1 : 1) * (Number(m[10]) * 60 + Number(m[11]));
  const offsetValid = m[10] === undefined || (Number(m[10]) <= 23 && Number(m[11]) <= 59);
  const dateValid = month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month);
  if (!dateValid || hour > 23 || minute > 59 || second > 59 || !offsetValid) {
    return bad('bad-timestamp', `"ts" ${show(text)} is not a valid date-time`);
  }
  const utc = new Date(0);
  utc.setUTCFullYear(year, month - 1, day);
  utc.setUTCHours(hour, minute, second, ms);
  return utc.getTime() - offsetMinutes * 60_000;
}

// ---------------------------------------------------------------------------------------------
// Form 3: SenML (RFC 8428)

type Quantity = 'speed' | 'gust' | 'dir' | 'temp' | 'pressure' | 'rh';
const quantities: ReadonlySet<string> = new Set<Quantity>(['speed', 'gust', 'dir', 'temp', 'pressure', 'rh']);

/** RFC 8428 §4.1/§4.2 labels of the JSON representation. */
const senmlStringLabels = ['bn', 'bu', 'n', 'u', 'vs', 'vd'] as const;
const senmlNumberLabels = ['bt', 'bv', 'bs', 'v', 's', 't', 'ut'] as const;
const senmlValueLabels = ['v', 'vs', 'vb', 'vd', 's'] as const;
const senmlLabels: ReadonlySet<string> = new Set([...senmlStringLabels, ...senmlNumberLabels, 'bver', 'vb']);

/** RFC 8428 §4.5.1: allowed characters of a name, which starts with a letter or digit. */
const senmlNamePattern = /^[A-Za-z0-9][A-Za-z0-9\-:./_]*$/;

/** A pack is recognised by its shape: an array whose first record names itself with bn or n. */
function isSenmlPack(elements: unknown[]): boolean {
  const first = elements[0];
  return isPlainObject(first) && (Object.hasOwn(first, 'bn') || Object.hasOwn(first, 'n'));
}

interface SenmlGroup {
  readonly tsMs: number;
  /** Index of the first record at this time, for reporting. */
  readonly index: number;
  problem: Bad | null;
  problemIndex: number;
  speedMps: number | null;
  gustMps: number | null;
  dirDeg: number | null;
  tempC: number | null;
  pressurePa: number | null;
  rhPct: number | null;
}

function senmlReadings(records: unknown[], options: ParseOptions): ParseResult {
  let baseName = '';
  let baseTimeS = 0;
  let baseUnit: string | null = null;
  let baseValue = 0;
  let ours = 0;
  const groups = new Map<number, SenmlGroup>();

  for (let i = 0; i < records.length; i++) {
    const record = records[i];
    if (!isPlainObject(record)) return failure(bad('bad-senml', `SenML record ${i} is ${describeJsonType(record)}, not an object`));
    const structural = senmlRecordProblem(record, i);
    if (structural) return failure(structural);

    if (typeof record.bn === 'string') baseName = record.bn;
    if (typeof record.bt === 'number') baseTimeS = record.bt;
    if (typeof record.bu === 'string') baseUnit = record.bu;
    if (typeof record.bv === 'number') baseValue = record.bv;

    const hasValue = senmlValueLabels.some((label) => Object.hasOwn(record, label));
    const name = baseName + (typeof record.n === 'string' ? record.n : '');
    const quantity = quantityOfName(name);
    if (!hasValue && quantity === null) continue; // a record that only carries base fields
    if (!senmlNamePattern.test(name)) {
      return failure(bad('bad-senml', `SenML record ${i} has name ${show(name)}; RFC 8428 §4.5.1 names use A–Z a–z 0–9 - : . / _ and start with a letter or digit`));
    }
    if (quantity === null) continue; // a measurement that is not ours (battery, signal...)
    ours++;

    const timeS = baseTimeS + (typeof record.t === 'number' ? record.t : 0);
    const tsMs = timeS < senmlRelativeTimeLimitS ? Math.round(options.receivedAtMs + timeS * 1000) : Math.round(timeS * 1000);
    let group = groups.get(tsMs);
    if (group === undefined) {
      group = { tsMs, index: i, problem: null, problemIndex: i, speedMps: null, gustMps: null, dirDeg: null, tempC: null, pressurePa: null, rhPct: null };
      groups.set(tsMs, group);
    }
    if (group.problem !== null) continue;

    const unit = typeof record.u === 'string' ? record.u : baseUnit;
    const label = `SenML record ${i} (${clip(name, 60)})`;
    const value = typeof record.v === 'number' ? baseValue + record.v : null;
    const converted = value === null ? bad('not-a-number', `${label} has no numeric value "v"`) : senmlValue(quantity, value, unit, label, options.unit);
    if (isBad(converted)) {
      group.problem = converted;
      group.problemIndex = i;
      continue;
    }
    const field = groupField(quantity);
    if (group[field] !== null) {
      group.problem = bad('duplicate-field', `${label}: a second ${quantity} at the same time`);
      group.problemIndex = i;
      continue;
    }
    group[field] = converted;
  }

  if (ours === 0) {
    return failure(bad('missing-speed', 'SenML pack has no record named speed, gust, dir, temp, pressure or rh (after the last : / or .)'));
  }

  const readings: Reading[] = [];
  const rejected: RejectedReading[] = [];
  for (const group of groups.values()) {
    const result = senmlGroupReading(group, options.receivedAtMs);
    if (isBad(result)) rejected.push({ index: group.problem === null ? group.index : group.problemIndex, reason: result.reason, detail: result.detail });
    else readings.push(result);
  }
  return batchResult(readings, rejected, groups.size > 1);
}

function senmlGroupReading(group: SenmlGroup, receivedAtMs: number): Reading | Bad {
  if (group.problem !== null) return group.problem;
  const when = timeWindowProblem(group.tsMs, `SenML time of record ${group.index}`, receivedAtMs);
  if (when) return when;
  if (group.speedMps === null) {
    return bad('missing-speed', `SenML records at ${timeText(group.tsMs)} (from record ${group.index}) have no speed`);
  }
  return {
    tsMs: group.tsMs,
    speedMps: group.speedMps,
    gustMps: group.gustMps,
    dirDeg: group.dirDeg,
    tempC: group.tempC,
    pressurePa: group.pressurePa,
    rhPct: group.rhPct,
  };
}

function groupField(quantity: Quantity): 'speedMps' | 'gustMps' | 'dirDeg' | 'tempC' | 'pressurePa' | 'rhPct' {
  switch (quantity) {
    case 'speed':
      return 'speedMps';
    case 'gust':
      return 'gustMps';
    case 'dir':
      return 'dirDeg';
    case 'temp':
      return 'tempC';
    case 'pressure':
      return 'pressurePa';
    case 'rh':
      return 'rhPct';
  }
}

/** Our quantity for a resolved name: the whole name, or its part after the last : / or . */
function quantityOfName(name: string): Quantity | null {
  const cut = Math.max(name.lastIndexOf(':'), name.lastIndexOf('/'), name.lastIndexOf('.'));
  const tail = name.slice(cut + 1);
  return quantities.has(tail) ? (tail as Quantity) : null;
}

/** Structural check of one record against RFC 8428; null when it is well formed. */
function senmlRecordProblem(record: Record<string, unknown>, i: number): Bad | null {
  for (const key of Object.keys(record)) {
    if (!senmlLabels.has(key) && key.endsWith('_')) {
      return bad('bad-senml', `SenML record ${i} has label ${clip(JSON.stringify(key), 60)}, which must be understood (RFC 8428 §4.4) and is not`);
    }
  }
  for (const label of senmlStringLabels) {
    if (Object.hasOwn(record, label) && typeof record[label] !== 'string') {
      return bad('bad-senml', `SenML record ${i}: "${label}" must be a string, got ${show(record[label])}`);
    }
  }
  for (const label of senmlNumberLabels) {
    if (Object.hasOwn(record, label) && !isFiniteNumber(record[label])) {
      return bad('bad-senml', `SenML record ${i}: "${label}" must be a finite number, got ${show(record[label])}`);
    }
  }
  if (Object.hasOwn(record, 'vb') && typeof record.vb !== 'boolean') {
    return bad('bad-senml', `SenML record ${i}: "vb" must be true or false, got ${show(record.vb)}`);
  }
  if (Object.hasOwn(record, 'bver')) {
    const version = record.bver;
    if (!isFiniteNumber(version) || !Number.isInteger(version) || version < 1 || version > senmlVersion) {
      return bad('bad-senml', `SenML record ${i}: "bver" ${show(version)} is not a version we read (1–${senmlVersion})`);
    }
  }
  return null;
}

/** A SenML value of one of our quantities in our internal unit, checked for plausibility. */
function senmlValue(quantity: Quantity, value: number, unit: string | null, label: string, sensorUnit: SpeedUnit): number | Bad {
  const wrongUnit = (accepted: string): Bad =>
    bad('bad-senml-unit', `${label} has unit ${show(unit)}; ${quantity} takes ${accepted}`);
  switch (quantity) {
    case 'speed':
    case 'gust':
      if (unit === null) return speedFrom(value, label, sensorUnit);
      if (unit === 'm/s') return speedFrom(value, label, 'm/s');
      return wrongUnit('"m/s" (or no unit: the sensor\'s registered unit)');
    case 'dir':
      if (unit === null || unit === 'deg') return directionDeg(value, label, `${value}°`);
      if (unit === 'rad') return directionDeg((value * 180) / Math.PI, label, `${value} rad`);
      return wrongUnit('"deg" or "rad"');
    case 'temp':
      if (unit === null || unit === 'Cel') return inRange(value, minTempC, maxTempC, label, '°C');
      if (unit === 'K') return inRange(value - 273.15, minTempC, maxTempC, label, '°C');
      return wrongUnit('"Cel" or "K"');
    case 'pressure':
      if (unit === null || unit === 'Pa') return inRange(value, minPressurePa, maxPressurePa, label, 'Pa');
      return wrongUnit('"Pa"');
    case 'rh':
      if (unit === null || unit === '%RH') return inRange(value, 0, 100, label, '%RH');
      return wrongUnit('"%RH"');
  }
}

// ---------------------------------------------------------------------------------------------
// Shared checks

/** A speed in `unit` as m/s, within 0–120 m/s after conversion. */
function speedFrom(value: number, field: string, unit: SpeedUnit): number | Bad {
  if (!Number.isFinite(value)) return notANumber(field, value);
  const mps = speedToMps(value, unit);
  if (mps < 0 || mps > maxSpeedMps) {
    const given = unit === 'm/s' ? '' : ` (${value} ${unit})`;
    return bad('out-of-range', `${field} ${round3(mps)} m/s${given} is outside 0–${maxSpeedMps} m/s`);
  }
  return mps === 0 ? 0 : mps; // no −0
}

/** Degrees within 0–360 (360 is north, returned as 0). */
function directionDeg(deg: number, field: string, given: string): number | Bad {
  // 1e-9° of slack lets 2π rad come out as 360°, not as just over it.
  if (!Number.isFinite(deg) || deg < 0 || deg > 360 + 1e-9) {
    return bad('bad-direction', `${field} ${given} is outside 0–360°`);
  }
  return deg >= 360 || deg === 0 ? 0 : deg;
}

function inRange(value: number, min: number, max: number, field: string, unit: string): number | Bad {
  if (value < min || value > max) return bad('out-of-range', `${field} ${round3(value)} ${unit} is outside ${min}…${max} ${unit}`);
  return value;
}

/** Too far ahead of receipt or too far behind it; null when plausible. */
function timeWindowProblem(tsMs: number, field: string, receivedAtMs: number): Bad | null {
  if (tsMs > receivedAtMs + maxFutureMs) {
    return bad('future-timestamp', `${field} ${timeText(tsMs)} is ${Math.round((tsMs - receivedAtMs) / 1000)} s ahead of receipt; at most ${maxFutureMs / 1000} s is accepted`);
  }
  if (tsMs < receivedAtMs - maxAgeMs) {
    const hint = tsMs >= 0 && tsMs * 1000 >= receivedAtMs - maxAgeMs && tsMs * 1000 <= receivedAtMs + maxFutureMs
      ? ' (it looks like epoch seconds; epoch milliseconds are expected)'
      : '';
    return bad('too-old', `${field} ${timeText(tsMs)} is more than ${maxAgeMs / 86_400_000} days before receipt${hint}`);
  }
  return null;
}

function notANumber(field: string, value: unknown): Bad {
  return bad('not-a-number', `${field} ${show(value)} is not a finite JSON number`);
}

// ---------------------------------------------------------------------------------------------
// Small pure helpers of this module

/** True as soon as the JSON text opens more than `limit` arrays/objects at once. */
function nestingDepthBeyond(text: string, limit: number): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) {
      inString = true;
    } else if (c === 0x5b || c === 0x7b) {
      if (++depth > limit) return true;
    } else if (c === 0x5d || c === 0x7d) {
      depth--;
    }
  }
  return false;
}

/** Days in a month (1–12) of a proleptic Gregorian year. */
function daysInMonth(year: number, month: number): number {
  const lastDay = new Date(0);
  lastDay.setUTCFullYear(year, month, 0); // day 0 of the next month
  return lastDay.getUTCDate();
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function isFiniteNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

function describeJsonType(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  if (typeof value === 'string') return `a string ${show(value)}`;
  return `${typeof value} ${show(value)}`;
}

/** A value for a human message: JSON, clipped. Values here come from JSON.parse. */
function show(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  return clip(JSON.stringify(value), 60);
}

function clip(text: string, length: number): string {
  return text.length > length ? `${text.slice(0, length)}…` : text;
}

function round3(value: number): number {
  return Math.round(value * 1000) / 1000;
}

/** ISO text of an epoch-ms time, or the number when it is beyond what Date can show. */
function timeText(tsMs: number): string {
  return Math.abs(tsMs) <= 8.64e15 ? new Date(tsMs).toISOString() : `${tsMs} ms`;
}
