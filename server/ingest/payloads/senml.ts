/**
 * Form 3 of the reading payload (ingest/payload.ts, where the names, units and base fields we read
 * are listed): a SenML pack (RFC 8428, JSON), recognised as an array whose first record has `bn`
 * or `n`. Records whose resolved times are equal (to the millisecond) form one reading; records
 * with names that are not ours are ignored; a label ending in `_` that we do not know rejects the
 * pack (must-understand, RFC 8428 §4.4).
 */
import type { SpeedUnit } from '../../engine/units.ts';
import { bad, batchResult, failure, isBad, type Bad, type ParseOptions, type ParseResult, type Reading, type RejectedReading } from './parseResult.ts';
import {
  clip,
  describeJsonType,
  directionDeg,
  inRange,
  isFiniteNumber,
  isPlainObject,
  maxPressurePa,
  maxTempC,
  minPressurePa,
  minTempC,
  show,
  speedFrom,
  timeText,
  timeWindowProblem,
} from './valueChecks.ts';

/** RFC 8428 §4.5.3: resolved times below 2^28 s are relative to now. */
const senmlRelativeTimeLimitS = 2 ** 28;
/** RFC 8428 §4.4: the version this parser implements (and the default). */
const senmlVersion = 10;

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
export function isSenmlPack(elements: unknown[]): boolean {
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

export function senmlReadings(records: unknown[], options: ParseOptions): ParseResult {
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
