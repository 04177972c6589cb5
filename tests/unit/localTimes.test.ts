/**
 * Local site time for the CSV exports (server/http/routes/zonedDay.ts, LocalTimes): the zone's
 * offset is looked up once per quarter hour and the wall clock computed by arithmetic. Checked
 * instant by instant against Intl.DateTimeFormat formatting the same instant in the same zone
 * (the IANA time zone database as ICU ships it), through days when the clocks change, in zones
 * with half-hour and 45-minute offsets and a half-hour daylight-saving shift; and the rounding
 * of the exported figures (0.1 m/s, 0.1 %).
 */
import { describe, expect, it } from 'vitest';
import { rounded } from '../../server/http/routes/logExports.ts';
import { LocalTimes, zonedDayWindow } from '../../server/http/routes/zonedDay.ts';

/** "YYYY-MM-DD HH:MM:SS" straight from Intl.DateTimeFormat's parts, one formatting per instant. */
function intlLocal(atMs: number, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' }).formatToParts(new Date(atMs));
  const get = (type: Intl.DateTimeFormatPartTypes): string => parts.find((p) => p.type === type)!.value;
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}:${get('second')}`;
}

// Transition dates from the IANA tz database rules (from memory; the check is against Intl, not against these dates).
const cases: Array<[string, string, string, number]> = [
  ['Europe/London', '2026-03-29', 'clocks go forward 01:00 → 02:00', 1],
  ['Europe/London', '2026-10-25', 'clocks go back 02:00 → 01:00 (the hour 01:00–02:00 twice)', 1],
  ['America/New_York', '2026-03-08', 'clocks go forward 02:00 → 03:00', 1],
  ['America/New_York', '2026-11-01', 'clocks go back 02:00 → 01:00', 1],
  ['Australia/Lord_Howe', '2026-04-05', 'a half-hour shift back', 1],
  ['Asia/Kathmandu', '2026-06-13', 'UTC+05:45 all year', 0],
  ['Pacific/Chatham', '2026-04-05', 'UTC+13:45 → +12:45', 1],
  ['UTC', '2026-06-13', 'no offset', 0],
];

describe('local site time beside UTC', () => {
  it.each(cases)('%s on %s (%s): every 7 min 30 s and every second around the change agree with Intl.DateTimeFormat', (timeZone, day, _what, changes) => {
    const window = zonedDayWindow(day, timeZone)!;
    const local = new LocalTimes(timeZone);
    const mismatches: string[] = [];
    const check = (t: number): void => {
      const mine = local.dateTime(t);
      const theirs = intlLocal(t, timeZone);
      if (mine !== theirs) mismatches.push(`${new Date(t).toISOString()}: ${mine} ≠ ${theirs}`);
    };
    for (let t = window.fromMs - 3_600_000; t < window.toMs + 3_600_000; t += 450_000) check(t + 1_234);
    // Around each change of offset: the second before and the second after.
    let found = 0;
    for (let t = window.fromMs; t < window.toMs; t += 60_000) {
      if (local.offsetMs(t) === local.offsetMs(t + 60_000)) continue;
      found++;
      for (let s = t - 5_000; s <= t + 65_000; s += 1_000) check(s);
    }
    expect(found).toBe(changes);
    expect(mismatches).toEqual([]);
  });

  it('gives the site-clock date of an instant (13 June 2026 00:30 in London is 12 June 23:30 UTC)', () => {
    expect(new LocalTimes('Europe/London').date(Date.UTC(2026, 5, 12, 23, 30))).toBe('2026-06-13');
    expect(new LocalTimes('UTC').date(Date.UTC(2026, 5, 12, 23, 30))).toBe('2026-06-12');
  });

  it('reads the same instant twice in the hour the clocks go back, told apart only by UTC', () => {
    const local = new LocalTimes('Europe/London');
    // 25 October 2026: 00:30 UTC is 01:30 BST, 01:30 UTC is 01:30 GMT.
    expect(local.dateTime(Date.UTC(2026, 9, 25, 0, 30))).toBe('2026-10-25 01:30:00');
    expect(local.dateTime(Date.UTC(2026, 9, 25, 1, 30))).toBe('2026-10-25 01:30:00');
  });
});

describe('figures rounded for the exports', () => {
  it.each([
    [12.34, 1, '12.3'],
    [12.36, 1, '12.4'],
    [7.26, 1, '7.3'],
    [0.04, 1, '0.0'],
    [-0.04, 1, '0.0'],
    [-12.37, 1, '-12.4'],
    [271.6, 0, '272'],
    [99.96, 1, '100.0'],
  ])('%d to %d decimals is "%s"', (value, decimals, text) => {
    expect(rounded(value, decimals)).toBe(text);
  });

  it.each([null, undefined, Number.NaN, Number.POSITIVE_INFINITY])('leaves %s empty, never "0"', (value) => {
    expect(rounded(value, 1)).toBe('');
  });
});
