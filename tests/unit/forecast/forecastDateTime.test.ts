/**
 * Dates and times as forecast tables write them. Year-first dates follow ISO 8601 (year, month,
 * day); the day-first and month-first orders of year-last dates are common practice (day/month/year
 * in most of the world, month/day/year in the United States). Month lengths are the Gregorian
 * calendar's (2026 and 2027 are not leap years; 2028 is).
 */
import { describe, expect, it } from 'vitest';
import { calendarDate, orderEvidence, readClock, readDate, readDateTime } from '../../../server/foresight/forecastDateTime.ts';

const value = <T>(read: { ok: true; value: T } | { ok: false; reason: string }): T => {
  if (!read.ok) throw new Error(`expected a value, got: ${read.reason}`);
  return read.value;
};

describe('readDate and calendarDate', () => {
  it('reads year-first dates without an order', () => {
    expect(value(calendarDate(value(readDate('2026-12-03')), null))).toEqual({ year: 2026, month: 12, day: 3 });
    expect(value(calendarDate(value(readDate('2026/1/9')), null))).toEqual({ year: 2026, month: 1, day: 9 });
  });

  it('reads year-last dates in the order given, and refuses them without one', () => {
    const date = value(readDate('03/12/2026'));
    expect(value(calendarDate(date, 'day-first'))).toEqual({ year: 2026, month: 12, day: 3 });
    expect(value(calendarDate(date, 'month-first'))).toEqual({ year: 2026, month: 3, day: 12 });
    expect(calendarDate(date, null)).toEqual({ ok: false, reason: 'needs a date order — choose day first or month first' });
    expect(value(calendarDate(value(readDate('3.12.2026')), 'day-first'))).toEqual({ year: 2026, month: 12, day: 3 });
  });

  it('refuses days a month does not have (Gregorian calendar)', () => {
    expect(calendarDate(value(readDate('29/02/2027')), 'day-first')).toEqual({ ok: false, reason: 'is not a date — February 2027 has no day 29' });
    expect(value(calendarDate(value(readDate('29/02/2028')), 'day-first'))).toEqual({ year: 2028, month: 2, day: 29 });
    expect(calendarDate(value(readDate('2026-04-31')), null)).toMatchObject({ ok: false });
  });

  it('refuses two-digit years and text that is not a date', () => {
    expect(readDate('03/12/26')).toEqual({ ok: false, reason: 'has a two-digit year — write the year in full (03/12/2026)' });
    expect(readDate('tomorrow')).toMatchObject({ ok: false });
  });
});

describe('orderEvidence', () => {
  it('tells which order a date fits', () => {
    expect(orderEvidence(value(readDate('13/12/2026')))).toBe('day-first');
    expect(orderEvidence(value(readDate('12/13/2026')))).toBe('month-first');
    expect(orderEvidence(value(readDate('03/12/2026')))).toBe('ambiguous');
    expect(orderEvidence(value(readDate('03/03/2026')))).toBe('either');
    expect(orderEvidence(value(readDate('2026-12-03')))).toBe('either');
    // 31/04: 31 April does not exist, and there is no month 31: neither order fits.
    expect(orderEvidence(value(readDate('31/04/2026')))).toBe('either');
    // 02/30: no month 30, and 30 February does not exist: neither order fits.
    expect(orderEvidence(value(readDate('02/30/2026')))).toBe('either');
  });
});

describe('readClock and readDateTime', () => {
  it('reads the usual ways of writing a time of day', () => {
    const at = (text: string, compact = false) => {
      const c = value(readClock(text, compact));
      return [c.hour, c.minute, c.second, c.millisecond, c.offsetMinutes];
    };
    expect(at('14:00')).toEqual([14, 0, 0, 0, null]);
    expect(at('9:05:30.5')).toEqual([9, 5, 30, 500, null]);
    expect(at('2 pm')).toEqual([14, 0, 0, 0, null]);
    expect(at('12:30 a.m.')).toEqual([0, 30, 0, 0, null]);
    expect(at('12 PM')).toEqual([12, 0, 0, 0, null]);
    expect(at('1400', true)).toEqual([14, 0, 0, 0, null]);
    expect(at('14:00Z')).toEqual([14, 0, 0, 0, 0]);
    expect(at('14:00 UTC')).toEqual([14, 0, 0, 0, 0]);
    expect(at('14:00+0530')).toEqual([14, 0, 0, 0, 330]);
    expect(at('14:00 -03:00')).toEqual([14, 0, 0, 0, -180]);
  });

  it('refuses "1400" outside a time-of-day column, a bare hour, and out-of-range times', () => {
    expect(readClock('1400', false)).toMatchObject({ ok: false });
    expect(readClock('14', true)).toMatchObject({ ok: false });
    expect(readClock('25:00', false)).toMatchObject({ ok: false });
    expect(readClock('0 am', false)).toMatchObject({ ok: false });
    expect(readClock('14:00+24', false)).toMatchObject({ ok: false });
  });

  it('splits a date and a time in one cell', () => {
    expect(value(readDateTime('2026-06-12T14:00Z')).date).toEqual({ kind: 'ymd', year: 2026, month: 6, day: 12 });
    expect(value(readDateTime('03/12/2026, 2:30 PM')).date).toEqual({ kind: 'pair', first: 3, second: 12, year: 2026 });
    expect(readDateTime('2026-06-12')).toEqual({ ok: false, reason: 'has a date but no time — write the time after it (2026-06-12 14:00) or add a "time" column' });
    expect(readDateTime('2026-06-12 25:00')).toMatchObject({ ok: false, reason: expect.stringMatching(/hours run from 0 to 23/) });
  });
});
