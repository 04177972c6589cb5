/**
 * What the board and the structure page say of a structure's foresight (design §2.7, issue 17):
 * the server's estimates (server/watch/structureForesight.ts) in words, always as an estimate,
 * never as a measurement, and the inputs behind each figure.
 *
 * Rules (ours):
 * - Chances: "< 1 %" below 0.5 %, "> 99 %" from 99.5 % (rounding would print "100 %": certainty
 *   an estimate never has), whole percent between; a chance that is not a number 0–1 is
 *   "unknown", never 0 %.
 * - No figures (null) or an unknown answer is "no estimate yet (why, in plain words)". Every field
 *   is read and checked: the stream's compact frame can hold nulls, and a figure that is not a
 *   number makes the whole estimate unknown rather than half shown.
 * - Speeds in the unit chosen on the device (units.ts), numbers joined to their units by a
 *   no-break space, so "12 %" never splits across lines on a phone.
 * - The one line a card shows: the next level's chance within 30 min, the limit's within 30 min,
 *   the expected peak in 10 min, and the time to the next level when the trend gives one. When the
 *   next level is triggered at the limit itself they are said once.
 *
 * The formulas named beside the inputs are the server's (server/foresight): Rice's up-crossing
 * count (S. O. Rice, Bell System Technical Journal 23-24, 1944-45), Davenport's peak factor
 * (A. G. Davenport, Proc. ICE 28, 1964), the Theil–Sen slope of the 10-minute mean.
 */
import type { ForesightView, StructureForesight, TriggerChance } from '../../server/watch/structureForesight.ts';
import { speed, unitSpace, type SpeedUnit } from './units.ts';

const _ = unitSpace;

/** A chance in words: "< 1 %", "12 %", "> 99 %", or "unknown". */
export function chanceText(p: number | null | undefined): string {
  if (typeof p !== 'number' || !Number.isFinite(p) || p < 0 || p > 1) return 'unknown';
  if (p < 0.005) return `<${_}1${_}%`;
  if (p >= 0.995) return `>${_}99${_}%`;
  return `${Math.round(p * 100)}${_}%`;
}

/** "about 25 min" for a time ahead in seconds (at least "about 1 min"). */
export function aboutMinutes(seconds: number): string {
  return `about ${Math.max(1, Math.round(seconds / 60))}${_}min`;
}

const within = (minutes: number): string => `within ${minutes}${_}min`;

/** The figures checked, or why there are none. */
export type ForesightReading = { known: true; view: ForesightView } | { known: false; reason: string };

const isNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const isChance = (v: unknown): v is number => isNumber(v) && v >= 0 && v <= 1;
const isSpeed = (v: unknown): v is number => isNumber(v) && v >= 0;

/** A structure's state as far as its foresight goes. */
export interface ForesightSubject {
  foresight?: StructureForesight | null | undefined;
  noData: boolean;
  error: string | null;
  /** The structure's levels: the stream's compact foresight frame does not carry the next level's label, its own levels do. */
  levels?: ReadonlyArray<{ level: number; label: string }>;
}

/**
 * The structure's foresight, checked. `reason` is the server's unknown answer as sent
 * ("mast-a: too-few-samples"), or one of ours: 'no-data', 'not-assessed', 'none-yet', 'unreadable'.
 */
export function readForesight(s: ForesightSubject): ForesightReading {
  if (s.error !== null && s.error !== undefined) return { known: false, reason: 'not-assessed' };
  if (s.noData) return { known: false, reason: 'no-data' };
  const f = s.foresight as unknown;
  if (f === null || f === undefined) return { known: false, reason: 'none-yet' };
  if (typeof f !== 'object') return { known: false, reason: 'unreadable' };
  const v = f as Record<string, unknown>;
  if ('unknown' in v) return { known: false, reason: typeof v.unknown === 'string' && v.unknown !== '' ? v.unknown : 'unreadable' };
  const hasNext = v.nextLevel !== null && v.nextLevel !== undefined;
  const ok =
    typeof v.sensorKey === 'string' &&
    isSpeed(v.meanMps) &&
    isNumber(v.sigmaMps) &&
    v.sigmaMps > 0 &&
    isNumber(v.upcrossingRateHz) &&
    v.upcrossingRateHz > 0 &&
    isNumber(v.heightFactor) &&
    v.heightFactor > 0 &&
    isSpeed(v.expectedPeak10Mps) &&
    isSpeed(v.limitGustMps) &&
    isChance(v.limitChance10) &&
    isChance(v.limitChance30) &&
    typeof v.trend === 'string' &&
    (v.nextLevelInS === null || (isNumber(v.nextLevelInS) && v.nextLevelInS >= 0)) &&
    (!hasNext || (isNumber(v.nextLevel) && isSpeed(v.nextTriggerGustMps) && isChance(v.nextChance10) && isChance(v.nextChance30)));
  if (!ok) return { known: false, reason: 'unreadable' };
  const view = v as unknown as ForesightView;
  if (hasNext && (typeof view.nextLabel !== 'string' || view.nextLabel === '')) {
    const label = s.levels?.find((l) => l.level === view.nextLevel)?.label;
    return { known: true, view: { ...view, nextLabel: typeof label === 'string' && label !== '' ? label : null } };
  }
  return { known: true, view };
}

/** Names sensors by key for the words (the key itself when the sensor is not known). */
export type SensorNamer = (key: string) => string;

/** Why there is no estimate, in plain words (the part in brackets). */
export function unknownWhy(reason: string, sensorName: SensorNamer = (k) => k): string {
  switch (reason) {
    case 'no-data':
      return 'no live wind reaches this structure';
    case 'not-assessed':
      return 'this structure cannot be assessed';
    case 'none-yet':
      return 'no wind figures for this structure yet';
    case 'unreadable':
      return 'the figures from the server could not be read';
    case 'no height factor':
      return 'the height factor from the sensor to this structure is unknown';
  }
  // The server's statistics answer: "<sensor key>: <reason>" (keys have no colon).
  const at = reason.indexOf(': ');
  const key = at > 0 ? reason.slice(0, at) : null;
  const why = at > 0 ? reason.slice(at + 2) : reason;
  const name = key === null ? 'the sensor' : sensorName(key);
  switch (why) {
    case 'too-few-samples':
      return `not enough readings at ${name} yet: it needs at least 100 over 5${_}min`;
    case 'no-fluctuation':
      return `the wind at ${name} does not vary: a calm, or a stuck or iced sensor`;
    case 'too-few-crossings':
      return `the wind at ${name} swung about its mean fewer than 5 times in 10${_}min: too few to tell how often gusts come`;
    case 'gust-not-above-mean':
      return `${name} sends a gust no higher than its mean: nothing to tell the gustiness from`;
    default:
      return key === null ? why : `${name}: ${why}`;
  }
}

/** "no estimate yet (…)" — never a chance of 0 %. */
export function noEstimateText(reason: string, sensorName?: SensorNamer): string {
  const settled = reason === 'no-data' || reason === 'not-assessed';
  return `${settled ? 'no estimate' : 'no estimate yet'} (${unknownWhy(reason, sensorName)})`;
}

const levelName = (v: ForesightView): string => v.nextLabel ?? (v.nextLevel !== null ? `Level ${v.nextLevel}` : 'the next level');

/** The next level is triggered at the limit itself (to 0.05 m/s): one figure, said once. */
export const nextIsLimit = (v: ForesightView): boolean => v.nextTriggerGustMps !== null && Math.abs(v.nextTriggerGustMps - v.limitGustMps) < 0.05;

/**
 * Why there is (or is not) a time to the next level, in plain words. With a time: "in about
 * 25 min at this trend".
 */
export function trendText(v: Pick<ForesightView, 'trend' | 'nextLevelInS'> & Partial<Pick<ForesightView, 'nextLabel' | 'nextLevel'>>, unit: SpeedUnit): string {
  const name = v.nextLabel ?? (typeof v.nextLevel === 'number' ? `Level ${v.nextLevel}` : 'the next level');
  switch (v.trend) {
    case 'ahead':
      return v.nextLevelInS === null ? 'no time given' : `in ${aboutMinutes(v.nextLevelInS)} at this trend`;
    case 'reached':
      return `the usual 10-min peak at the present gust factor already reaches ${name}: it may come at any time`;
    case 'too-few-points':
      return 'not enough history yet (needs 30 min)';
    case 'flat':
      return `the mean wind is steady (changing by less than ${speed(0.5, unit)} an hour): no time to give`;
    case 'falling':
      return 'the mean wind is falling: no time to give';
    case 'too-noisy':
      return 'the mean wind goes up and down too much to call a trend';
    case 'beyond-horizon':
      return 'not within the time the trend was measured over (up to an hour): no time given that far ahead';
    case 'no gust factor':
      return 'the gust factor at the sensor is unknown: no time to give';
    case 'top level':
      return 'already at the top level';
    default:
      return `no time to give (${v.trend})`;
  }
}

/** The card's one line, without the "Estimate" tag it always carries. */
export function foresightLineParts(v: ForesightView, unit: SpeedUnit): string[] {
  const parts: string[] = [];
  // The next level on a chance trigger: its own chance is what raises it, so that is what the line says.
  const nextOnChance = (v.triggerChances ?? []).find((c) => c.level === v.nextLevel);
  if (nextOnChance !== undefined) {
    parts.push(`${nextOnChance.label}: ${chanceText(nextOnChance.chance)} ${within(nextOnChance.withinMinutes)} (rises over ${chanceText(nextOnChance.probability)})`);
    parts.push(`limit: ${chanceText(v.limitChance30)} ${within(30)}`);
  } else if (v.nextLevel !== null && nextIsLimit(v)) {
    parts.push(`${levelName(v)} (the limit): ${chanceText(v.nextChance30)} ${within(30)}`);
  } else {
    if (v.nextLevel !== null) parts.push(`${levelName(v)}: ${chanceText(v.nextChance30)} ${within(30)}`);
    parts.push(`limit: ${chanceText(v.limitChance30)} ${within(30)}`);
  }
  parts.push(`expected peak in 10${_}min ${speed(v.expectedPeak10Mps, unit)}`);
  if (v.nextLevel !== null && v.trend === 'ahead' && v.nextLevelInS !== null) parts.push(`${levelName(v)} in ${aboutMinutes(v.nextLevelInS)} at this trend`);
  else if (v.nextLevel !== null && v.trend === 'reached') parts.push(`${levelName(v)} may come at any time`);
  return parts;
}

/** The line as one string ("Estimate: …"), for labels and tests. */
export function foresightLineText(s: ForesightSubject, unit: SpeedUnit, sensorName?: SensorNamer): string {
  const r = readForesight(s);
  return `Estimate: ${r.known ? foresightLineParts(r.view, unit).join(' · ') : noEstimateText(r.reason, sensorName)}`;
}

/** One of the inputs behind the figures: what it is, its values (a line each), and the rule or source behind them. */
export interface ForesightInputRow {
  key: string;
  label: string;
  lines: string[];
  rule: string;
}

/** ν in words: "0.017 per second". */
export const rateText = (hz: number): string => `${hz < 1 ? hz.toFixed(3) : hz.toFixed(2)} per second`;

/** Where ν came from, in plain words. */
export function rateSourceText(v: Pick<ForesightView, 'upcrossingRateSource' | 'upcrossingRateHz'>): string {
  switch (v.upcrossingRateSource) {
    case 'counted':
      return `counted from the readings: the wind rose through its mean about once every ${Math.round(1 / v.upcrossingRateHz)}${_}s`;
    case 'default':
      return 'a stated default for a sensor that sends summaries (the low end of the usual range, from memory: the safe side)';
    case 'given':
      return 'as given with the summaries';
    default:
      return 'source not stated';
  }
}

/**
 * The inputs behind each figure, in the order a person checks them: the wind used (U, σ, ν and
 * where ν came from), the height factor, the chances (Rice), the expected peak (Davenport), the
 * time to the next level (Theil–Sen).
 */
export function foresightInputs(v: ForesightView, unit: SpeedUnit, sensorName: SensorNamer = (k) => k): ForesightInputRow[] {
  const f = v.heightFactor;
  const name = sensorName(v.sensorKey);
  const sensor = name === v.sensorKey ? name : `${name} (${v.sensorKey})`;
  const rows: ForesightInputRow[] = [
    {
      key: 'wind',
      label: 'Wind used',
      lines: [`${sensor}, last 10${_}min: mean U ${speed(v.meanMps, unit)}, spread σ ${speed(v.sigmaMps, unit)}`],
      rule: v.source === 'summary' ? "σ worked back from its gust and mean through Davenport's peak factor (it sends 10-min summaries)" : 'σ of its 3-s mean speeds about the 10-min mean',
    },
    { key: 'rate', label: 'Gust rate ν', lines: [rateText(v.upcrossingRateHz)], rule: rateSourceText(v) },
    {
      key: 'height',
      label: 'Height factor',
      lines: [`×${f.toFixed(2)} to this structure: here U ${speed(v.meanMps * f, unit)}, σ ${speed(v.sigmaMps * f, unit)}`],
      rule: "from the sensor's height to the structure's, as for the gust",
    },
  ];
  const chanceLine = (what: string, x: number, c10: number | null, c30: number | null): string =>
    `${what} at ${speed(x, unit)}: ${chanceText(c10)} ${within(10)} · ${chanceText(c30)} ${within(30)}`;
  const chances: string[] = [];
  if (v.nextLevel !== null && v.nextTriggerGustMps !== null && !nextIsLimit(v)) chances.push(chanceLine(levelName(v), v.nextTriggerGustMps, v.nextChance10, v.nextChance30));
  chances.push(chanceLine(v.nextLevel !== null && nextIsLimit(v) ? `${levelName(v)} (the limit)` : 'The limit', v.limitGustMps, v.limitChance10, v.limitChance30));
  rows.push({
    key: 'chance',
    label: 'Chance of a gust here reaching x within T (Rice)',
    lines: chances,
    rule: 'N = ν·T·exp(−(x − U)²/(2σ²)) expected up-crossings of x in T, P = 1 − e^(−N)',
  });
  const triggers = v.triggerChances ?? [];
  if (triggers.length > 0) {
    rows.push({
      key: 'triggers',
      label: 'Levels on a chance',
      lines: triggers.map((c) => triggerChanceText(c, unit)),
      rule: 'the same formula with x the gust at the level’s fraction of capacity and T its minutes; it rises when the chance is over its trigger and falls back after the hold time under the trigger less the dead band',
    });
  }
  const nuT = v.upcrossingRateHz * 600;
  const g = (v.expectedPeak10Mps - v.meanMps * f) / (v.sigmaMps * f);
  rows.push({
    key: 'peak',
    label: 'Expected peak in 10 min (Davenport peak factor)',
    lines: [`${speed(v.expectedPeak10Mps, unit)} = U + g·σ${Number.isFinite(g) ? `, g = ${g.toFixed(2)}` : ''}`],
    rule: `g = √(2 ln νT) + 0.5772/√(2 ln νT), νT = ${nuT.toFixed(0)} (taken as at least 4)`,
  });
  rows.push({
    key: 'trend',
    label: v.nextLevel !== null ? `Time to ${levelName(v)} (Theil–Sen trend)` : 'Time to the next level (Theil–Sen trend)',
    lines: [trendText(v, unit)],
    rule: 'the Theil–Sen slope of the 10-min mean over the last hour, with the present gust factor',
  });
  return rows;
}

/** "Prepare rises over 20 %: now 14 % that a gust reaches 14.5 m/s within 30 min". */
export function triggerChanceText(c: TriggerChance, unit: SpeedUnit): string {
  return `${c.label} rises over ${chanceText(c.probability)}: now ${chanceText(c.chance)} that a gust here reaches ${speed(c.thresholdGustMps, unit)} ${within(c.withinMinutes)}`;
}

/** What the estimate is, and is not: said under its inputs. */
export const estimateNote =
  'An estimate from the last 10 minutes of wind, as if it goes on the same way: it cannot see a squall coming. It is not a measurement: the measured gust and the levels decide.';
