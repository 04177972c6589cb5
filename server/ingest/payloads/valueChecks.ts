/**
 * The checks every payload form shares (design.md §3 and the limits listed in ingest/payload.ts):
 * plausible speeds after unit conversion, directions, temperature, pressure and humidity ranges,
 * the time window around receipt, and the small helpers that word a rejected value for people.
 */
import { maxPlausibleSpeedMps, readingPressureRangePa, readingTempRangeC } from '../../engine/limits.ts';
import { speedToMps, type SpeedUnit } from '../../engine/units.ts';
import { bad, type Bad } from './parseResult.ts';

export const maxFutureMs = 300_000;
export const maxAgeMs = 7 * 86_400_000;
export const maxSpeedMps = maxPlausibleSpeedMps;
export const minTempC = readingTempRangeC.min;
export const maxTempC = readingTempRangeC.max;
export const minPressurePa = readingPressureRangePa.min;
export const maxPressurePa = readingPressureRangePa.max;

// ---------------------------------------------------------------------------------------------
// Shared checks

/** A speed in `unit` as m/s, within 0–120 m/s after conversion. */
export function speedFrom(value: number, field: string, unit: SpeedUnit): number | Bad {
  if (!Number.isFinite(value)) return notANumber(field, value);
  const mps = speedToMps(value, unit);
  if (mps < 0 || mps > maxSpeedMps) {
    const given = unit === 'm/s' ? '' : ` (${value} ${unit})`;
    return bad('out-of-range', `${field} ${round3(mps)} m/s${given} is outside 0–${maxSpeedMps} m/s`);
  }
  return mps === 0 ? 0 : mps; // no −0
}

/** Degrees within 0–360 (360 is north, returned as 0). */
export function directionDeg(deg: number, field: string, given: string): number | Bad {
  // 1e-9° of slack lets 2π rad come out as 360°, not as just over it.
  if (!Number.isFinite(deg) || deg < 0 || deg > 360 + 1e-9) {
    return bad('bad-direction', `${field} ${given} is outside 0–360°`);
  }
  return deg >= 360 || deg === 0 ? 0 : deg;
}

export function inRange(value: number, min: number, max: number, field: string, unit: string): number | Bad {
  if (value < min || value > max) return bad('out-of-range', `${field} ${round3(value)} ${unit} is outside ${min}…${max} ${unit}`);
  return value;
}

/** Too far ahead of receipt or too far behind it; null when plausible. */
export function timeWindowProblem(tsMs: number, field: string, receivedAtMs: number): Bad | null {
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

export function notANumber(field: string, value: unknown): Bad {
  return bad('not-a-number', `${field} ${show(value)} is not a finite JSON number`);
}

// ---------------------------------------------------------------------------------------------
// Small pure helpers of the payload forms

export function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

export function isFiniteNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

export function describeJsonType(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  if (typeof value === 'string') return `a string ${show(value)}`;
  return `${typeof value} ${show(value)}`;
}

/** A value for a human message: JSON, clipped. Values here come from JSON.parse. */
export function show(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  return clip(JSON.stringify(value), 60);
}

export function clip(text: string, length: number): string {
  return text.length > length ? `${text.slice(0, length)}…` : text;
}

export function round3(value: number): number {
  return Math.round(value * 1000) / 1000;
}

/** ISO text of an epoch-ms time, or the number when it is beyond what Date can show. */
export function timeText(tsMs: number): string {
  return Math.abs(tsMs) <= 8.64e15 ? new Date(tsMs).toISOString() : `${tsMs} ms`;
}
