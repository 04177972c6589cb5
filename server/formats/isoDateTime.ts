/**
 * The one reader of ISO 8601 dates and instants (the extended format RFC 3339 §5.6 profiles):
 * a reading's `ts` (ingest/payloads/readingObject.ts), the log's `from`/`to` (http/routes/logRoutes.ts) and a
 * calendar day `YYYY-MM-DD` (http/routes/zonedDay.ts). Pure.
 *
 * An instant is `YYYY-MM-DD`, `T`, `hh:mm`, optionally `:ss` and a fraction (`.` or `,`, 1 to 9
 * digits; digits below the millisecond dropped), then the zone: `Z` or `±hh:mm`. Lower-case `t`
 * and `z` are read too (RFC 3339 §5.6 NOTE). A time without a zone is refused: it would be some
 * server's local time. Every part is checked (month 1–12, the month's days, hour 0–23, minute and
 * second 0–59, offset up to ±23:59), where `Date.parse` would roll 30 February into March and
 * also read words ("June 13" → 13 June 2001); it is not used.
 */

export interface IsoDate {
  readonly year: number;
  /** 1..12 */
  readonly month: number;
  readonly day: number;
}

/** Why a text is not what was asked: not of the form at all, or of the form with a part out of range. */
export type IsoProblem = 'form' | 'range';

export type IsoRead<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly problem: IsoProblem };

/** Longest text looked at: the longest instant with nine fraction digits is 35 characters. */
const maxIsoLength = 40;

const datePattern = /^(\d{4})-(\d{2})-(\d{2})$/;
const instantPattern = /^(\d{4})-(\d{2})-(\d{2})[Tt](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(?:([Zz])|([+-])(\d{2}):(\d{2}))$/;

/** Days in a month (1–12) of a proleptic Gregorian year (setUTCFullYear: Date.UTC reads years 0–99 as 1900–1999). */
function daysInMonth(year: number, month: number): number {
  const lastDay = new Date(0);
  lastDay.setUTCFullYear(year, month, 0); // day 0 of the next month
  return lastDay.getUTCDate();
}

function validDate(year: number, month: number, day: number): boolean {
  return month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month);
}

/** Epoch ms of a date and time in UTC (years 0000–9999 without Date.UTC's two-digit-year rule). */
function utcMs(year: number, month: number, day: number, hour = 0, minute = 0, second = 0, ms = 0): number {
  const utc = new Date(0);
  utc.setUTCFullYear(year, month - 1, day);
  utc.setUTCHours(hour, minute, second, ms);
  return utc.getTime();
}

/**
 * A calendar date `YYYY-MM-DD`.
 *
 * @example isoDate('2026-06-13') // → { ok: true, value: { year: 2026, month: 6, day: 13 } }
 * @example isoDate('2026-02-30') // → { ok: false, problem: 'range' }
 */
export function isoDate(text: string): IsoRead<IsoDate> {
  const m = text.length <= maxIsoLength ? datePattern.exec(text) : null;
  if (!m) return { ok: false, problem: 'form' };
  const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (!validDate(year, month, day)) return { ok: false, problem: 'range' };
  return { ok: true, value: { year, month, day } };
}

/**
 * An instant with its zone, as epoch ms. With `dateAlone`, a date without a time is read too, as
 * UTC midnight (a date names a whole day, with no zone to be misread).
 *
 * @example isoInstantMs('2024-06-01T13:59:58.5+02:00') // → { ok: true, value: Date.UTC(2024, 5, 1, 11, 59, 58, 500) }
 * @example isoInstantMs('2024-06-01T12:00:00')         // → { ok: false, problem: 'form' } (no zone)
 */
export function isoInstantMs(text: string, options: { dateAlone?: boolean } = {}): IsoRead<number> {
  if (options.dateAlone) {
    const date = isoDate(text);
    if (date.ok) return { ok: true, value: utcMs(date.value.year, date.value.month, date.value.day) };
    if (date.problem === 'range') return date;
  }
  const m = text.length <= maxIsoLength ? instantPattern.exec(text) : null;
  if (!m) return { ok: false, problem: 'form' };
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const hour = Number(m[4]);
  const minute = Number(m[5]);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const ms = m[7] === undefined ? 0 : Number(m[7].slice(0, 3).padEnd(3, '0'));
  const offsetValid = m[10] === undefined || (Number(m[10]) <= 23 && Number(m[11]) <= 59);
  if (!validDate(year, month, day) || hour > 23 || minute > 59 || second > 59 || !offsetValid) return { ok: false, problem: 'range' };
  const offsetMinutes = m[8] !== undefined ? 0 : (m[9] === '-' ? -1 : 1) * (Number(m[10]) * 60 + Number(m[11]));
  return { ok: true, value: utcMs(year, month, day, hour, minute, second, ms) - offsetMinutes * 60_000 };
}
