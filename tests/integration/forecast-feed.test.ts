/**
 * The forecast feed (design §2.7, issue 17) against a local HTTP server on 127.0.0.1 serving a
 * CSV file and then a JSON file: each poll is stored, the board's predicted levels come out of
 * the feed, a broken feed (HTTP 500, a malformed body, a server slower than the timeout) is a
 * stored failed poll and shows as failed, a late feed as stale — never as calm — and the log
 * compares the forecast of each hour with the wind measured over it.
 *
 * The feed's clock and timer are the test's (ForecastFeedOptions `now`, `timers: false`): no
 * test waits on a real interval.
 *
 * Scenario (invented): Brackenfold Common, a gate arch on the default levels, the north mast at
 * 10 m and a gate pole at 3 m.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ForecastFeed, firstRetryMs } from '../../server/forecastFeed/index.ts';
import { ensureSite } from '../../server/register/site.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { emptyWriteBatch } from '../../server/storage/writeBatch.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

const hourMs = 3_600_000;
const minuteMs = 60_000;
const intervalMs = 5 * minuteMs;
/** The feed's timeout here: a slow server answers after 3 s. */
const timeoutMs = 300;

// ---- The feed's server: what it answers is set per step. ----
type Mode = { status?: number; contentType?: string; body: string; delayMs?: number };
let mode: Mode = { status: 404, body: 'not set' };
let requests = 0;
let feedServer: http.Server;
let feedUrl = '';

function startFeedServer(): Promise<void> {
  feedServer = http.createServer((req, res) => {
    requests++;
    const m = mode;
    const answer = () => {
      if (res.destroyed) return;
      res.writeHead(m.status ?? 200, { 'content-type': m.contentType ?? 'text/csv; charset=utf-8' });
      res.end(m.body);
    };
    if (m.delayMs) setTimeout(answer, m.delayMs);
    else answer();
  });
  return new Promise((resolve) => feedServer.listen(0, '127.0.0.1', () => resolve()));
}

let feedNowMs = 0;
let ts: TestServer;
let admin: ApiClient;
let viewer: ApiClient;
let archId = 0;

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

const polls = () => ts.server.db.$client.prepare('SELECT * FROM forecast_polls ORDER BY id').all() as Array<{ id: number; at_ms: number; ok: number; http_status: number | null; error: string | null; rows_json: string | null; format: string | null }>;
const iso = (ms: number) => new Date(ms).toISOString();

beforeAll(async () => {
  await startFeedServer();
  feedUrl = `http://127.0.0.1:${(feedServer.address() as AddressInfo).port}/feed?key=secret-123`;
  ts = await startTestServer({}, { forecastFeed: { timers: false, timeoutMs, now: () => feedNowMs } });
  admin = new ApiClient(ts.baseUrl);
  expect((await admin.signIn(adminUsername, adminPassword)).status).toBe(200);
  await ok(admin.json('POST', '/api/people', { username: 'ellis.fairweather', displayName: 'Ellis Fairweather', role: 'viewer', password: 'ellis-pass-1234' }), 201);
  viewer = new ApiClient(ts.baseUrl);
  expect((await viewer.signIn('ellis.fairweather', 'ellis-pass-1234')).status).toBe(200);
  await ok(admin.json('PATCH', '/api/site', { name: 'Brackenfold Common' }));
  await ok(admin.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10, mode: 'summaries' }), 201);
  await ok(admin.json('POST', '/api/sensors', { key: 'gate-pole', name: 'Gate pole', heightM: 3, mode: 'summaries' }), 201);
  // No levels of its own: the site's defaults (60 %, 80 %, 100 % of capacity). No uplift, so a
  // level at a fraction f of the load is reached at limit · √f. Its top (7 m) is below the
  // forecast's 10 m and the site does not reduce gusts with height: the height factor is 1.
  const arch = await ok(
    admin.json('POST', '/api/structures', {
      record: { kind: 'custom', name: 'Gate arch', baseDepthM: 1.5, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 1000, xM: 0.75 }] },
    }),
    201,
  );
  archId = arch.structure.id;
});

afterAll(async () => {
  await ts?.stop();
  feedServer?.closeAllConnections();
  await new Promise((resolve) => feedServer?.close(resolve));
});

describe('the feed settings (PATCH /api/site)', () => {
  it.each([
    ['an address that is not http', { forecastFeedUrl: 'ftp://forecast.example/feed.csv' }, 'forecastFeedUrl'],
    ['an interval under 5 minutes', { forecastFeedIntervalMs: 60_000 }, 'forecastFeedIntervalMs'],
    ['an interval over 6 hours', { forecastFeedIntervalMs: 7 * hourMs }, 'forecastFeedIntervalMs'],
    ['a unit nobody uses', { forecastFeedUnit: 'furlongs' }, 'forecastFeedUnit'],
    ['a height of 0 m', { forecastFeedHeightM: 0 }, 'forecastFeedHeightM'],
  ])('refuses %s with 400 naming the field', async (_what, body, path) => {
    const res = await admin.json('PATCH', '/api/site', body);
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path)).toContain(path);
  });

  it('shows a feed set but never read as stale and unknown, not calm', async () => {
    const site = await ok(admin.json('PATCH', '/api/site', { forecastFeedUrl: feedUrl, forecastFeedIntervalMs: intervalMs }));
    expect(site.site).toMatchObject({ forecastFeedUrl: feedUrl, forecastFeedIntervalMs: intervalMs, forecastFeedUnit: null, forecastFeedHeightM: 10 });
    feedNowMs = Date.now();
    const feed = await ok(viewer.json('GET', '/api/forecast/feed'));
    expect(feed).toMatchObject({ configured: true, lastPoll: null, ageMs: null, stale: true, predictions: null });
    // The key in the query is not shown to a viewer.
    expect(feed.url).not.toContain('secret-123');
    expect(feed.problems[0]).toMatch(/No forecast has been read/);
    const health = await ok(viewer.json('GET', '/api/health'));
    expect(health.forecastFeed).toMatchObject({ configured: true, ok: false, stale: true });
  });
});

// ---- The log comparison: a past day, two polls, known wind minutes. ----
const dayStartMs = Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth(), new Date().getUTCDate()) - 3 * 86_400_000;
const day = iso(dayStartMs).slice(0, 10);
const at = (h: number, m = 0) => dayStartMs + h * hourMs + m * minuteMs;

describe('forecast against measured wind (GET /api/log/forecast)', () => {
  beforeAll(async () => {
    // 06:00 on the day: a CSV table, units in the header.
    feedNowMs = at(6);
    mode = { body: ['time,mean (m/s),gust (m/s),dir', `${iso(at(8))},7,11,SW`, `${iso(at(9))},6,10,W`, `${iso(at(10))},5,9,W`].join('\n') };
    const a = await ts.server.forecastFeed.pollNow();
    expect(a?.ok, a?.error ?? '').toBe(true);
    // 08:30: a JSON file, epoch-millisecond times, the unit stated in the file, a key the feed ignores.
    feedNowMs = at(8, 30);
    mode = {
      contentType: 'application/json',
      body: JSON.stringify({ unit: 'm/s', rows: [at(8), at(9), at(10)].map((t, i) => ({ time: t, mean: [9, 5, 4][i], gust: [14, 8, 7][i], temperature: 14 })) }),
    };
    const b = await ts.server.forecastFeed.pollNow();
    expect(b?.ok, b?.error ?? '').toBe(true);
    expect(b?.format).toBe('json');
    expect(b?.notes.join(' ')).toMatch(/temperature/);

    // Wind minutes through the write queue (summaries, one a minute, stored as late readings).
    const id = (key: string) => (ts.server.db.$client.prepare('SELECT id FROM sensors WHERE key = ?').get(key) as { id: number }).id;
    const mast = id('north-mast');
    const pole = id('gate-pole');
    const batch = emptyWriteBatch();
    const summary = (sensorId: number, tsMs: number, speedMps: number, gustMps: number) =>
      batch.readings.push({ sensorId, tsMs, speedMps, gustMps, dirDeg: 250, tempC: null, pressurePa: null, rhPct: null, late: true, rollupGustMps: gustMps });
    for (let m = 0; m < 60; m++) {
      // 08:00–09:00: mean 5 m/s, 8 m/s from 08:40 to 08:49 (a 12.5 m/s gust at 08:45), 6 m/s after.
      const mean = m < 40 ? 5 : m < 50 ? 8 : 6;
      summary(mast, at(8, m) + 30_000, mean, m === 45 ? 12.5 : m >= 40 && m < 50 ? 10 : 7);
      // 09:00–10:00: mean 4 m/s, gust 6 m/s all hour.
      summary(mast, at(9, m) + 30_000, 4, 6);
      // 10:00–10:19 only: the mast's gateway then went quiet.
      if (m < 20) summary(mast, at(10, m) + 30_000, 3, 5);
      // The lower gate pole blew harder all morning: it is not the site's highest sensor.
      summary(pole, at(8, m) + 30_000, 20, 30);
    }
    await ts.server.queue.enqueue(batch);
  });

  it('takes each hour’s forecast from the last poll made before it, beside the highest sensor’s wind', async () => {
    const check = await ok(viewer.json('GET', `/api/log/forecast?day=${day}`));
    expect(check.sensor).toEqual({ key: 'north-mast', name: 'North mast', heightM: 10 });
    expect(check.pollCount).toBe(2);
    expect(check.hours.map((h: { timeMs: number }) => h.timeMs)).toEqual([at(8), at(9), at(10)]);
    const [h8, h9, h10] = check.hours;
    // 08:00: the 08:30 poll came after the hour began, so the 06:00 poll's forecast stands.
    expect(h8).toMatchObject({ polledAtMs: at(6), leadMs: 2 * hourMs, forecastMeanMps: 7, forecastGustMps: 11, forecastDirFromDeg: 225, minutesWithData: 60, counted: true });
    // Highest 10-minute mean: the 08:40 block, (10 × 8 m/s) / 10 = 8 m/s; peak gust 12.5 m/s at 08:45.
    expect(h8).toMatchObject({ measuredMeanMps: 8, measuredMeanAtMs: at(8, 40), measuredGustMps: 12.5, measuredGustAtMs: at(8, 45) });
    // Forecast − measured: 7 − 8 = −1 m/s (mean), 11 − 12.5 = −1.5 m/s (gust): too low.
    expect(h8.meanDifferenceMps).toBeCloseTo(-1, 9);
    expect(h8.gustDifferenceMps).toBeCloseTo(-1.5, 9);
    // 09:00: the 08:30 JSON poll; 5 − 4 = +1, 8 − 6 = +2.
    expect(h9).toMatchObject({ polledAtMs: at(8, 30), leadMs: 30 * minuteMs, forecastMeanMps: 5, forecastGustMps: 8, measuredMeanMps: 4, measuredGustMps: 6, counted: true });
    expect(h9.meanDifferenceMps).toBeCloseTo(1, 9);
    expect(h9.gustDifferenceMps).toBeCloseTo(2, 9);
    // 10:00: 20 minutes of data, fewer than half the hour: listed, not counted.
    expect(h10).toMatchObject({ forecastMeanMps: 4, forecastGustMps: 7, measuredMeanMps: 3, measuredGustMps: 5, minutesWithData: 20, counted: false });
    // Summary over 08:00 and 09:00: one hour under-forecast by 1.5 m/s; bias (−1.5 + 2) / 2 = +0.25 m/s gust, (−1 + 1) / 2 = 0 mean.
    expect(check.summary).toMatchObject({ gustHours: 2, gustUnderForecastHours: 1, largestGustUnderForecastAtMs: at(8), meanHours: 2 });
    expect(check.summary.largestGustUnderForecastMps).toBeCloseTo(1.5, 9);
    expect(check.summary.meanGustDifferenceMps).toBeCloseTo(0.25, 9);
    expect(check.summary.meanMeanDifferenceMps).toBeCloseTo(0, 9);
  });

  it('is on the day report as its forecastCheck section', async () => {
    const summary = await ok(viewer.json('GET', `/api/log/summary?day=${day}`));
    expect(summary.forecastCheck.hours.map((h: { gustDifferenceMps: number }) => Math.round(h.gustDifferenceMps * 100) / 100)).toEqual([-1.5, 2, 2]);
  });

  it('refuses a window over 7 days with 400 naming it', async () => {
    const res = await viewer.json('GET', `/api/log/forecast?from=${at(0) - 10 * 86_400_000}&to=${at(0)}`);
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path)).toContain('from');
  });
});

// ---- The board's forecast now, then a feed that breaks. ----
describe('the feed on the board (GET /api/forecast/feed)', () => {
  let t0 = 0;
  let limitMps = 0;

  beforeAll(async () => {
    t0 = Math.floor(Date.now() / hourMs) * hourMs + 5 * minuteMs;
    feedNowMs = t0;
    // The arch's limit from the calculator at the site's air density (new sites: 1.25 kg/m³, EN 1991-1-4 §4.5(1) Note 2).
    const structure = await ok(viewer.json('GET', `/api/structures/${archId}`));
    const assessed = await ok(admin.json('POST', '/api/assess', { structure: structure.structure.record, gustMps: 10, airDensityKgM3: 1.25 }));
    limitMps = assessed.limitGustMps;
  });

  it('starts stale: the newest good poll is three days old', async () => {
    const feed = await ok(viewer.json('GET', '/api/forecast/feed'));
    expect(feed.stale).toBe(true);
    expect(feed.ageMs).toBe(t0 - at(8, 30));
    expect(feed.problems.join(' ')).toMatch(/stale/);
    expect(feed.problems.join(' ')).toMatch(/no forecast for the next 12 hours/);
  });

  it('stores the poll and predicts the arch’s level against limit · √fraction of the default levels', async () => {
    // Watch at 60 % of capacity (the site default: published event guidance, README "Levels"):
    // load ∝ gust² (q = ½ρv², EN 1991-1-4 §4.5), so its trigger gust is limit · √0.6.
    const watchMps = limitMps * Math.sqrt(0.6);
    const gusts = [watchMps * 0.97, watchMps * 1.03, limitMps * 1.02, 1];
    const times = [t0 + hourMs, t0 + 2 * hourMs, t0 + 3 * hourMs, t0 + 14 * hourMs];
    mode = { body: ['time;gust (m/s);dir', ...times.map((t, i) => `${iso(t)};${gusts[i]!.toFixed(3)};W`)].join('\n') };
    const before = polls().length;
    const poll = await ok(admin.json('POST', '/api/forecast/feed/poll', {}));
    expect(poll.poll).toMatchObject({ ok: true, httpStatus: 200, format: 'csv', rowCount: 4 });
    const stored = polls();
    expect(stored.length).toBe(before + 1);
    expect(stored.at(-1)).toMatchObject({ at_ms: t0, ok: 1, http_status: 200, error: null, format: 'csv' });
    expect(JSON.parse(stored.at(-1)!.rows_json!).map((r: { timeMs: number }) => r.timeMs)).toEqual(times);

    const feed = await ok(viewer.json('GET', '/api/forecast/feed'));
    expect(feed).toMatchObject({ configured: true, stale: false, ageMs: 0, lastPoll: { ok: true, atMs: t0 }, problems: [] });
    const arch = feed.predictions.structures.find((s: { id: number }) => s.id === archId);
    expect(arch.levels[0].label).toBe('Watch');
    expect(arch.levels[0].triggerGustMps).toBeCloseTo(watchMps, 6);
    // The 14th hour is past the 12 hours shown.
    expect(arch.hours.map((h: { timeMs: number }) => h.timeMs)).toEqual(times.slice(0, 3));
    expect(arch.hours.map((h: { level: number }) => h.level)).toEqual([0, 1, 3]);
    expect(arch.hours[1].gustAtStructureMps).toBeCloseTo(Number(gusts[1]!.toFixed(3)), 9);
    expect(arch).toMatchObject({ highestLevel: 3, highestAtMs: times[2], unknownHours: 0 });
    const health = await ok(viewer.json('GET', '/api/health'));
    expect(health.forecastFeed).toMatchObject({ configured: true, ok: true, stale: false });
  });

  it('stores an HTTP 500 as a failed poll and shows the feed as failed, keeping the last good forecast', async () => {
    feedNowMs = t0 + 6 * minuteMs;
    mode = { status: 500, body: 'upstream down' };
    const poll = await ts.server.forecastFeed.pollNow();
    expect(poll).toMatchObject({ ok: false, httpStatus: 500, rows: null });
    expect(poll?.error).toMatch(/HTTP 500/);
    expect(polls().at(-1)).toMatchObject({ ok: 0, http_status: 500 });
    const feed = await ok(viewer.json('GET', '/api/forecast/feed'));
    expect(feed.lastPoll).toMatchObject({ ok: false, httpStatus: 500 });
    expect(feed.problems.join(' ')).toMatch(/The last poll failed \(1 in a row\): the feed answered HTTP 500/);
    expect(feed.lastSuccessAtMs).toBe(t0);
    expect((await ok(viewer.json('GET', '/api/health'))).forecastFeed).toMatchObject({ ok: false, stale: false, lastError: expect.stringMatching(/HTTP 500/) });
  });

  it.each([
    ['a table whose time is not a time', 'text/csv', 'time,gust (m/s)\nnoon tomorrow,9', /Line 2, column 1 \(time\)/],
    ['JSON cut off halfway', 'application/json', '{"rows": [{"time": "2026-06-14T12:00Z", "gust (m/s)"', /not valid JSON/],
    ['a JSON row with a speed that is not one', 'application/json', JSON.stringify([{ time: '2026-06-14T12:00Z', 'gust (m/s)': 'fast' }]), /rows\[0\]\.gust \(m\/s\): "fast"/],
  ])('stores %s as a failed poll with the reason', async (_what, contentType, body, reason) => {
    feedNowMs += minuteMs;
    mode = { contentType, body };
    const poll = await ts.server.forecastFeed.pollNow();
    expect(poll?.ok).toBe(false);
    expect(poll?.httpStatus).toBe(200);
    expect(poll?.error).toMatch(reason);
    expect(polls().at(-1)!.error).toMatch(reason);
  });

  it('stores a server slower than the timeout as a failed poll', async () => {
    feedNowMs += minuteMs;
    mode = { body: 'time,gust (m/s)\n2026-06-14T12:00Z,9', delayMs: 3_000 };
    const poll = await ts.server.forecastFeed.pollNow();
    expect(poll).toMatchObject({ ok: false, httpStatus: null });
    expect(poll?.error).toMatch(/timed out after 300 ms/);
  });

  it('shows the feed as stale once no poll has succeeded for twice the interval', async () => {
    // The last good poll was at t0; twice the 5-minute interval is 10 minutes.
    feedNowMs = t0 + 2 * intervalMs + 1;
    const feed = await ok(viewer.json('GET', '/api/forecast/feed'));
    expect(feed).toMatchObject({ stale: true, consecutiveFailures: 5 });
    expect(feed.problems[0]).toMatch(/The forecast is stale: the last good poll was 10 min ago/);
    expect((await ok(viewer.json('GET', '/api/health'))).forecastFeed).toMatchObject({ configured: true, ok: false, stale: true });
  });

  it('refuses poll-now to a viewer', async () => {
    const res = await viewer.json('POST', '/api/forecast/feed/poll', {});
    expect(res.status).toBe(403);
  });
});

describe('the feed’s own timer', () => {
  it('polls a never-polled feed at once, then after the interval; a failure is retried after a minute', async () => {
    const opened = openDatabase(':memory:');
    const { db } = opened;
    const storage = new SqliteStorage(opened);
    await ensureSite(storage, 0);
    db.$client.prepare('UPDATE sites SET forecast_feed_url = ?, forecast_feed_interval_ms = ?').run(feedUrl, 20 * minuteMs);
    const clock = Date.UTC(2026, 5, 14, 9);
    mode = { body: 'time,gust (m/s)\n2026-06-14T12:00Z,9' };
    const good = new ForecastFeed({ storage, now: () => clock }, { timeoutMs: 2_000 });
    await good.start();
    await waitFor(async () => (await good.status()).nextPollAtMs === clock + 20 * minuteMs, 5_000, 'the next poll planned an interval ahead');
    expect((await good.lastPoll())?.ok).toBe(true);
    await good.stop();

    // Restarted a minute later: the address was polled a minute ago, so the next poll is 19 minutes away.
    const restarted = new ForecastFeed({ storage, now: () => clock + minuteMs }, { timeoutMs: 2_000 });
    await restarted.start();
    expect((await restarted.status()).nextPollAtMs).toBe(clock + 20 * minuteMs);
    await restarted.stop();

    mode = { status: 503, body: 'busy' };
    db.$client.prepare('UPDATE sites SET forecast_feed_url = ?').run(`${feedUrl}&other=1`);
    const failing = new ForecastFeed({ storage, now: () => clock }, { timeoutMs: 2_000 });
    await failing.start();
    await waitFor(async () => (await failing.status()).nextPollAtMs === clock + firstRetryMs, 5_000, 'a retry a minute ahead');
    expect(await failing.lastPoll(`${feedUrl}&other=1`)).toMatchObject({ ok: false, httpStatus: 503 });
    await failing.stop();
    db.$client.close();
  });
});
