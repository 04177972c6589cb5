/**
 * Numbers on screens: speeds in the unit the person chose (the factor table is the server's own,
 * server/engine/units.ts, so the two can never disagree), Beaufort beside them, compass points,
 * percentages, ages and times in the site's time zone. Missing values print as "—" with the
 * word "unknown" nearby on the screens; never as 0.
 */
import { beaufortForce, mpsToSpeed, speedToMps, speedUnitLabels, speedUnits, type SpeedUnit } from '../../server/engine/units.ts';

export { beaufortForce, mpsToSpeed, speedToMps, speedUnitLabels, speedUnits, type SpeedUnit };

/** Decimals worth showing per unit: m/s and knots to 0.1, km/h and mph to whole numbers. */
const decimals: Readonly<Record<SpeedUnit, number>> = { 'm/s': 1, 'km/h': 0, kn: 0, mph: 0 };

/** A speed in the chosen unit without the unit ("12.4"), or "—" when unknown. */
export function speedNumber(mps: number | null | undefined, unit: SpeedUnit): string {
  if (mps === null || mps === undefined || !Number.isFinite(mps)) return '—';
  return mpsToSpeed(mps, unit).toFixed(decimals[unit]);
}

/**
 * The space between a number and its unit: a no-break space, so that "12.4 m/s" or "−71 %" never
 * splits across two lines on a narrow screen.
 */
export const unitSpace = '\u00a0';

/** A speed with its unit ("12.4 m/s", joined by a no-break space), or "unknown". */
export function speed(mps: number | null | undefined, unit: SpeedUnit): string {
  if (mps === null || mps === undefined || !Number.isFinite(mps)) return 'unknown';
  return `${speedNumber(mps, unit)}${unitSpace}${speedUnitLabels[unit]}`;
}

/** "Force 6" for a mean wind, or null when unknown. */
export function beaufortText(meanMps: number | null | undefined): string | null {
  if (meanMps === null || meanMps === undefined || !Number.isFinite(meanMps) || meanMps < 0) return null;
  return `Beaufort ${beaufortForce(meanMps)}`;
}

const compassPoints = ['N', 'NNE', 'NE', 'ENE', 'E', 'ESE', 'SE', 'SSE', 'S', 'SSW', 'SW', 'WSW', 'W', 'WNW', 'NW', 'NNW'] as const;

/** The 16-point compass point of a direction the wind blows from (degrees clockwise from north). */
export function compassPoint(deg: number | null | undefined): string | null {
  if (deg === null || deg === undefined || !Number.isFinite(deg)) return null;
  const index = Math.round((((deg % 360) + 360) % 360) / 22.5) % 16;
  return compassPoints[index]!;
}

/** A fraction as a whole percentage ("62 %", "−71 %" with a true minus sign, no-break space), or "unknown". */
export function percent(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return 'unknown';
  const p = Math.round(fraction * 100);
  return `${p < 0 ? '−' : ''}${Math.abs(p)}${unitSpace}%`;
}

/** A number with its unit and a fixed number of decimals, or "—". */
export function quantity(value: number | null | undefined, unit: string, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return `${value.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits })}${unitSpace}${unit}`;
}

/** A force in kN, a moment in kN·m (inputs in N and N·m). */
export const kiloNewtons = (n: number | null | undefined): string => quantity(n === null || n === undefined ? n : n / 1000, 'kN', 2);
export const kiloNewtonMetres = (nm: number | null | undefined): string => quantity(nm === null || nm === undefined ? nm : nm / 1000, 'kN·m', 1);

/** "12 s", "4 min", "2 h 5 min", "3 d" — how long ago, for people at arm's length. */
export function duration(ms: number): string {
  const s = Math.max(0, Math.round(ms / 1000));
  const _ = unitSpace;
  if (s < 90) return `${s}${_}s`;
  const min = Math.round(s / 60);
  if (min < 90) return `${min}${_}min`;
  const h = Math.floor(min / 60);
  if (h < 48) return `${h}${_}h ${min % 60}${_}min`;
  return `${Math.floor(h / 24)}${_}d`;
}

const formatters = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string, kind: 'time' | 'hm' | 'datetime' | 'date' | 'day'): Intl.DateTimeFormat {
  const key = `${timeZone}|${kind}`;
  let f = formatters.get(key);
  if (!f) {
    const options: Intl.DateTimeFormatOptions =
      kind === 'time'
        ? { hour: '2-digit', minute: '2-digit', second: '2-digit', hour12: false }
        : kind === 'hm'
          ? { hour: '2-digit', minute: '2-digit', hour12: false }
          : kind === 'datetime'
          ? { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', hour12: false }
          : kind === 'date'
            ? { weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' }
            : { year: 'numeric', month: '2-digit', day: '2-digit' };
    try {
      f = new Intl.DateTimeFormat(kind === 'day' ? 'en-CA' : 'en-GB', { ...options, timeZone });
    } catch {
      // An unknown zone name must not take a screen down: fall back to UTC and say so in the label.
      f = new Intl.DateTimeFormat(kind === 'day' ? 'en-CA' : 'en-GB', { ...options, timeZone: 'UTC' });
    }
    formatters.set(key, f);
  }
  return f;
}

/** "14:03:07" in the site's zone. */
export const clockTime = (ms: number, timeZone: string): string => formatter(timeZone, 'time').format(ms);
/** "14:03" in the site's zone (per-minute values: seconds would be false precision). */
export const hourMinute = (ms: number, timeZone: string): string => formatter(timeZone, 'hm').format(ms);
/**
 * "14:03" for a time on today's date in the site's zone, "13 Jun, 14:03" for one on another day:
 * an alert from yesterday evening must not read as this afternoon's.
 */
export const dayAwareTime = (ms: number, timeZone: string, nowMs: number = Date.now()): string =>
  dayOf(ms, timeZone) === dayOf(nowMs, timeZone) ? hourMinute(ms, timeZone) : dateTime(ms, timeZone);
/** As `dayAwareTime`, with seconds on today's date ("14:03:07"). */
export const dayAwareClockTime = (ms: number, timeZone: string, nowMs: number = Date.now()): string =>
  dayOf(ms, timeZone) === dayOf(nowMs, timeZone) ? clockTime(ms, timeZone) : dateTime(ms, timeZone);
/** "13 Jun, 14:03" in the site's zone. */
export const dateTime = (ms: number, timeZone: string): string => formatter(timeZone, 'datetime').format(ms);
/** "Sat 13 Jun 2026" in the site's zone. */
export const longDate = (ms: number, timeZone: string): string => formatter(timeZone, 'date').format(ms);
/** "2026-06-13": the calendar day in the site's zone. */
export const dayOf = (ms: number, timeZone: string): string => formatter(timeZone, 'day').format(ms);
