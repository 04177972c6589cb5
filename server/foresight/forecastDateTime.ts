/**
 * Reading the dates and times of a forecast table, cell by cell: a date and time in one cell
 * ("2026-06-12T14:00Z", "2026-06-12 14:00", "03/12/2026 14:00"), or a date and a time of day in
 * separate cells ("03/12/2026" and "14:00").
 *
 * - Year first (2026-12-03, 2026/12/03, 2026.12.03) is always year, month, day (ISO 8601 order).
 * - Year last (03/12/2026, 03.12.2026, 03-12-2026) is day/month/year in most of the world and
 *   month/day/year in the United States. Such a date is only read with a date order: chosen by
 *   the user, named in the header, or detected from a date that fits only one order (13/12/2026
 *   has no month 13). Which one was used is always said; a table where both readings fit is
 *   refused (see parseForecastTable.ts). A two-digit year is refused: "03/12/26" has one reading
 *   too many.
 * - Times of day: 14:00, 14:00:30, 14:00:30.5, 9:00, 2 pm, 2:30 PM and, in a column of its own,
 *   1400. An offset may follow (Z, UTC, GMT, +02, +0200, +02:00); without one the time is
 *   wall-clock time in the table's zone.
 */

export const dateOrders = ['day-first', 'month-first'] as const;
export type DateOrder = (typeof dateOrders)[number];

export const isDateOrder = (value: unknown): value is DateOrder => typeof value === 'string' && (dateOrders as readonly string[]).includes(value);

/** "day first (day/month/year)" */
export const dateOrderWords = (order: DateOrder): string => (order === 'day-first' ? 'day first (day/month/year)' : 'month first (month/day/year)');

/** A date as written: year first (unambiguous), or two numbers before the year whose order is not yet known. */
export type DateText =
  | { readonly kind: 'ymd'; readonly year: number; readonly month: number; readonly day: number }
  | { readonly kind: 'pair'; readonly first: number; readonly second: number; readonly year: number };

export interface ClockText {
  readonly hour: number;
  readonly minute: number;
  readonly second: number;
  readonly millisecond: number;
  /** Offset from UTC in minutes when the cell gives one, else null (wall-clock time). */
  readonly offsetMinutes: number | null;
}

export interface CalendarDate {
  readonly year: number;
  /** 1..12 */
  readonly month: number;
  readonly day: number;
}

export type Read<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly reason: string };
const fine = <T>(value: T): Read<T> => ({ ok: true, value });
const wrong = <T>(reason: string): Read<T> => ({ ok: false, reason });

export const monthNames = [
  'January', 'February', 'March', 'April', 'May', 'June',
  'July', 'August', 'September', 'October', 'November', 'December',
] as const;

const daysInMonth = (year: number, month: number): number => new Date(Date.UTC(year, month, 0)).getUTCDate();

const yearFirst = /^(\d{4})([-/.])(\d{1,2})\2(\d{1,2})$/;
const yearLast = /^(\d{1,2})([-/.])(\d{1,2})\2(\d{4})$/;
const shortYearLast = /^(\d{1,2})([-/.])(\d{1,2})\2(\d{2})$/;

const dateHelp = 'write 2026-12-03, or 03/12/2026 with the date order chosen';

/** A date cell as written, or why it is not a date. */
export function readDate(text: string): Read<DateText> {
  const t = text.trim();
  let m = yearFirst.exec(t);
  if (m) return fine({ kind: 'ymd', year: Number(m[1]), month: Number(m[3]), day: Number(m[4]) });
  m = yearLast.exec(t);
  if (m) return fine({ kind: 'pair', first: Number(m[1]), second: Number(m[3]), year: Number(m[4]) });
  if (shortYearLast.test(t)) return wrong('has a two-digit year — write the year in full (03/12/2026)');
  return wrong(`is not a date — ${dateHelp}`);
}

const offsetPart = String.raw`(z|utc|gmt|[+-]\d{2}(?::?\d{2})?)`;
const clockPattern = new RegExp(
  String.raw`^(\d{1,2})(?::(\d{2})(?::(\d{2})(?:[.,](\d{1,3}))?)?)?\s*(am|pm|a\.m\.|p\.m\.)?\s*${offsetPart}?$`,
  'i',
);
const compactClockPattern = new RegExp(String.raw`^(\d{2})(\d{2})\s*${offsetPart}?$`, 'i');

function offsetMinutesOf(text: string | undefined): Read<number | null> {
  if (text === undefined) return fine(null);
  const upper = text.toUpperCase();
  if (upper === 'Z' || upper === 'UTC' || upper === 'GMT') return fine(0);
  const digits = text.slice(1).replace(':', '');
  const hours = Number(digits.slice(0, 2));
  const minutes = digits.length > 2 ? Number(digits.slice(2)) : 0;
  if (hours > 23 || minutes > 59) return wrong(`has an offset ${text} that is not a UTC offset — offsets run from -23:59 to +23:59`);
  return fine((text[0] === '-' ? -1 : 1) * (hours * 60 + minutes));
}

const clockHelp = 'write 14:00, 14:00:00 or 2 pm';

/**
 * A time-of-day cell as written, or why it is not one. `compact` also accepts four digits
 * ("1400"), which only a column holding nothing but the time of day can mean.
 */
export function readClock(text: string, compact: boolean): Read<ClockText> {
  const t = text.trim();
  const m = clockPattern.exec(t);
  const c = m ? null : compact ? compactClockPattern.exec(t) : null;
  if (!m && !c) return wrong(`is not a time of day — ${compact ? `${clockHelp} or 1400` : clockHelp}`);
  let hour = Number((m ?? c)![1]);
  const minute = m ? (m[2] === undefined ? 0 : Number(m[2])) : Number(c![2]);
  const second = m?.[3] === undefined ? 0 : Number(m[3]);
  const millisecond = m?.[4] === undefined ? 0 : Number(m[4].padEnd(3, '0'));
  const meridiem = m?.[5]?.toLowerCase().replace(/\./g, '');
  if (m && m[2] === undefined && meridiem === undefined) {
    // "14" alone could be an hour, a day or a speed.
    return wrong(`is not a time of day — ${clockHelp}`);
  }
  if (meridiem !== undefined) {
    if (hour < 1 || hour > 12) return wrong('is not a time of day — with am or pm the hour runs from 1 to 12');
    hour = (hour % 12) + (meridiem === 'pm' ? 12 : 0);
  }
  if (hour > 23 || minute > 59 || second > 59) return wrong('is not a time of day — hours run from 0 to 23, minutes and seconds from 0 to 59');
  const offset = offsetMinutesOf((m ?? c)![m ? 6 : 3]);
  if (!offset.ok) return wrong(offset.reason);
  return fine({ hour, minute, second, millisecond, offsetMinutes: offset.value });
}

/** A cell holding a date and a time ("2026-06-12T14:00Z", "03/12/2026 14:00"), or why not. */
export function readDateTime(text: string): Read<{ date: DateText; clock: ClockText }> {
  const t = text.trim();
  const split = /^([0-9./-]+)(?:T|,?\s+)(.+)$/i.exec(t);
  const help = 'is not a date and time — write 2026-06-12 14:00, 2026-06-12T14:00Z, or 12/06/2026 14:00 with the date order chosen';
  if (!split) return wrong(readDate(t).ok ? 'has a date but no time — write the time after it (2026-06-12 14:00) or add a "time" column' : help);
  const date = readDate(split[1]!);
  if (!date.ok) return date.reason.startsWith('has a two-digit year') ? wrong(date.reason) : wrong(help);
  const clock = readClock(split[2]!, false);
  if (!clock.ok) return clockPattern.test(split[2]!.trim()) ? wrong(clock.reason) : wrong(help);
  return fine({ date: date.value, clock: clock.value });
}

/**
 * What a written date says about the order of its first two numbers: 'day-first' when only that
 * reading is a date (13/12/2026), 'month-first' likewise (12/13/2026), 'ambiguous' when both are
 * dates and differ (03/12/2026), 'either' when the order changes nothing (year first, or 03/03/2026)
 * or when neither reading is a date (that is reported when the date is read).
 */
export function orderEvidence(date: DateText): DateOrder | 'ambiguous' | 'either' {
  if (date.kind === 'ymd' || date.first === date.second) return 'either';
  const asDayFirst = date.second >= 1 && date.second <= 12 && date.first >= 1 && date.first <= daysInMonth(date.year, date.second);
  const asMonthFirst = date.first >= 1 && date.first <= 12 && date.second >= 1 && date.second <= daysInMonth(date.year, date.first);
  if (asDayFirst && asMonthFirst) return 'ambiguous';
  if (asDayFirst) return 'day-first';
  if (asMonthFirst) return 'month-first';
  return 'either';
}

/** "3 December 2026" */
export const dateWords = (d: CalendarDate): string => `${d.day} ${monthNames[d.month - 1]} ${d.year}`;

/** The two readings of an ambiguous date, in words: "3 December 2026 or 12 March 2026". */
export function bothReadings(date: DateText & { kind: 'pair' }): string {
  return `${dateWords({ year: date.year, month: date.second, day: date.first })} (day first) or ${dateWords({ year: date.year, month: date.first, day: date.second })} (month first)`;
}

/**
 * The calendar date of a written date. A year-last date needs `order`; without one (null) it is
 * refused, as are a month outside 1..12 and a day the month does not have.
 */
export function calendarDate(date: DateText, order: DateOrder | null): Read<CalendarDate> {
  const year = date.year;
  let month: number;
  let day: number;
  if (date.kind === 'ymd') {
    ({ month, day } = date);
  } else if (order === null && date.first !== date.second) {
    return wrong('needs a date order — choose day first or month first');
  } else {
    month = order === 'month-first' ? date.first : date.second;
    day = order === 'month-first' ? date.second : date.first;
  }
  if (year < 1970 || year > 2200) return wrong(`is not a forecast date — the year ${year} is out of range`);
  if (month < 1 || month > 12) {
    return wrong(`is not a date — there is no month ${month}${date.kind === 'pair' && order !== null ? ` when dates are read ${dateOrderWords(order)}` : ''}`);
  }
  if (day < 1 || day > daysInMonth(year, month)) return wrong(`is not a date — ${monthNames[month - 1]} ${year} has no day ${day}`);
  return fine({ year, month, day });
}
