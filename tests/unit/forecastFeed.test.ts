/**
 * The forecast feed's pure parts: reading a JSON body through the forecast table's parser (the
 * same rows as the CSV it stands for), the problems named by where they are in the JSON, and the
 * back-off and staleness rules (common practice, stated in server/forecastFeed/pollDelay.ts).
 */
import { describe, expect, it } from 'vitest';
import { feedIsStale, nextPollDelayMs } from '../../server/forecastFeed/index.ts';
import { parseForecastFeed, parseForecastTable } from '../../server/foresight/index.ts';

const noon = Date.UTC(2026, 5, 14, 12);

describe('a JSON feed is read as the table it stands for', () => {
  it('gives the same rows as the CSV with the same content (one parser: 36 km/h = 10 m/s)', () => {
    const csv = parseForecastTable('time,mean (km/h),gust (km/h),dir\n2026-06-14T12:00Z,18,36,WSW\n2026-06-14T13:00Z,,45,');
    const json = parseForecastFeed(
      JSON.stringify({ rows: [{ time: '2026-06-14T12:00Z', 'mean (km/h)': 18, 'gust (km/h)': 36, dir: 'WSW' }, { time: noon + 3_600_000, 'mean (km/h)': null, 'gust (km/h)': '45 km/h' }] }),
      'application/json',
    );
    expect(csv.ok && json.ok).toBe(true);
    if (!csv.ok || !json.ok) return;
    expect(json.rows.map(({ timeMs, meanMps, gustMps, dirFromDeg }) => ({ timeMs, meanMps, gustMps, dirFromDeg }))).toEqual(
      csv.rows.map(({ timeMs, meanMps, gustMps, dirFromDeg }) => ({ timeMs, meanMps, gustMps, dirFromDeg })),
    );
    expect(json.rows[0]!.gustMps).toBeCloseTo(10, 12);
    // A missing mean is null, never 0.
    expect(json.rows[1]!.meanMps).toBeNull();
  });

  it('recognises JSON by its first character when the content type does not say', () => {
    const read = parseForecastFeed('[{"time":"2026-06-14T12:00Z","gust":9}]', 'text/plain', { unit: 'm/s' });
    expect(read).toMatchObject({ ok: true, format: 'json', rows: [{ timeMs: noon, gustMps: 9 }] });
  });

  it.each([
    ['a row that is not an object', '[1]', {}, /rows\[0\]: must be an object/],
    ['a time in seconds', JSON.stringify([{ time: noon / 1000, 'gust (m/s)': 9 }]), {}, /rows\[0\]\.time: .* would be seconds/],
    ['a file unit that disagrees with the settings', JSON.stringify({ unit: 'kn', rows: [{ time: '2026-06-14T12:00Z', gust: 9 }] }), { unit: 'm/s' }, /the file says kn but the feed settings say m\/s/],
    ['a gust below its mean', JSON.stringify([{ time: '2026-06-14T12:00Z', mean: 12, gust: 9 }]), { unit: 'm/s' }, /^rows\[0\]\.gust: "9" is below the mean/],
    ['no speed unit anywhere', JSON.stringify({ rows: [{ time: '2026-06-14T12:00Z', gust: 9 }] }), {}, /The key "gust": no speed unit/],
    ['an object without rows', '{"data": []}', {}, /array of rows or an object with "rows"/],
  ] as const)('refuses %s, saying where', (_what, body, options, reason) => {
    const read = parseForecastFeed(body, 'application/json', options);
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.error).toMatch(reason);
  });
});

describe('back-off and staleness', () => {
  it('waits the interval after a success and 1, 2, 4, 8 minutes after failures in a row, never more than the interval', () => {
    const interval = 10 * 60_000;
    expect([0, 1, 2, 3, 4, 5, 40].map((n) => nextPollDelayMs(interval, n) / 60_000)).toEqual([10, 1, 2, 4, 8, 10, 10]);
    expect(() => nextPollDelayMs(interval, -1)).toThrow(RangeError);
  });

  it('calls a forecast stale past twice the interval, and always without a good poll', () => {
    expect(feedIsStale(0, 300_000, 600_000)).toBe(false);
    expect(feedIsStale(0, 300_000, 600_001)).toBe(true);
    expect(feedIsStale(null, 300_000, 0)).toBe(true);
  });
});
