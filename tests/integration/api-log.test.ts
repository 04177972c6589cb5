/**
 * Review and planning over HTTP: the log endpoints with their windows (from/to, day, and bad
 * windows refused), the CSV exports, the forecast check, and acknowledging alerts.
 *
 * Scenario (invented): on Brackenfold Common a squall line passes; the north mast's gateway sends
 * its buffered summaries and a 20 m/s gust that takes the gate arch to "Stop and clear". A crew
 * member acknowledges the alert; the safety officer reviews the day and checks tomorrow's forecast.
 */
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseRfc4180 } from '../helpers/rfc4180.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let cp: ApiClient;
let crew: ApiClient;
let viewer: ApiClient;
let archId = 0;
let marqueeId = 0;
/** When the gust arrived (the reading's timestamp). */
let gustAtMs = 0;
let archAlertId = 0;

const crewName = 'Morgan Tait';
const timeZone = 'Europe/London';

const archLevels = [
  { label: 'Watch', trigger: { kind: 'gust', gustMps: 5 }, actionText: 'Check the water ballast on the arch.' },
  { label: 'Prepare', trigger: { kind: 'gust', gustMps: 8 }, actionText: 'Close the gate path under the arch.' },
  { label: 'Stop and clear', trigger: { kind: 'gust', gustMps: 12 }, actionText: 'Lower the header board and keep everyone 5 m clear.' },
];

function paths(body: { issues?: Array<{ path: string }> } | null): string[] {
  return (body?.issues ?? []).map((i) => i.path);
}

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

/** Today's date in the site's time zone, YYYY-MM-DD. */
function siteDay(atMs: number): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(atMs));
}

/** The calendar date before a YYYY-MM-DD date. */
function dayBefore(day: string): string {
  const d = new Date(`${day}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() - 1);
  return d.toISOString().slice(0, 10);
}

/** The wall clock of the site at an instant, "YYYY-MM-DD HH:MM:SS", formatted by Intl.DateTimeFormat alone. */
function intlSiteTime(atMs: number): string {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' }).formatToParts(new Date(atMs));
  const get = (type: Intl.DateTimeFormatPartTypes): string => parts.find((p) => p.type === type)!.value;
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}:${get('second')}`;
}

/** A CSV's records as objects keyed by the header, every record checked to have the header's field count (RFC 4180 2.4). */
function csvObjects(text: string): Array<Record<string, string>> {
  const [header, ...rows] = parseRfc4180(text);
  expect(header, 'no header row').toBeDefined();
  for (const r of rows) expect(r.length, `record ${JSON.stringify(r)}`).toBe(header!.length);
  return rows.map((r) => Object.fromEntries(header!.map((h, k) => [h, r[k]!])));
}

beforeAll(async () => {
  ts = await startTestServer();
  const admin = new ApiClient(ts.baseUrl);
  expect((await admin.signIn(adminUsername, adminPassword)).status).toBe(200);
  for (const [username, displayName, role] of [
    ['rowan.ashby', 'Rowan Ashby', 'competent-person'],
    ['morgan.tait', crewName, 'crew'],
    ['ellis.fairweather', 'Ellis Fairweather', 'viewer'],
  ] as const) {
    await ok(admin.json('POST', '/api/people', { username, displayName, role, password: `${username}-pass-1234` }), 201);
  }
  cp = new ApiClient(ts.baseUrl);
  crew = new ApiClient(ts.baseUrl);
  viewer = new ApiClient(ts.baseUrl);
  expect((await cp.signIn('rowan.ashby', 'rowan.ashby-pass-1234')).status).toBe(200);
  expect((await crew.signIn('morgan.tait', 'morgan.tait-pass-1234')).status).toBe(200);
  expect((await viewer.signIn('ellis.fairweather', 'ellis.fairweather-pass-1234')).status).toBe(200);

  await ok(cp.json('PATCH', '/api/site', { name: 'Brackenfold Common', timeZone }));
  await ok(cp.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10, mode: 'summaries' }), 201);
  const gateway = await ok(cp.json('POST', '/api/gateways', { name: 'Mast gateway', username: 'brackenfold-gw', sensorKeys: ['north-mast'] }), 201);
  const arch = await ok(
    cp.json('POST', '/api/structures', {
      record: {
        kind: 'custom',
        name: 'Gate arch',
        baseDepthM: 1.5,
        referenceHeightM: 10,
        faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }],
        masses: [{ massKg: 1000, xM: 0.75 }],
      },
      levels: archLevels,
    }),
    201,
  );
  archId = arch.structure.id;
  const marquee = await ok(
    cp.json('POST', '/api/structures', {
      record: { kind: 'tent', name: 'Hospitality marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed: true, legs: 8, ballastPerLegKg: 500, selfWeightKg: 900, referenceHeightM: 10 },
    }),
    201,
  );
  marqueeId = marquee.structure.id;

  // The gateway flushes two buffered summaries, then the squall's gust arrives.
  gustAtMs = Date.now();
  const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'brackenfold-gw', password: gateway.password, reconnectPeriod: 0 });
  await client.publishAsync(
    'wind/north-mast/reading',
    JSON.stringify([
      { ts: gustAtMs - 180_000, speed: 3, gust: 4.5, dir: 240 },
      { ts: gustAtMs - 120_000, speed: 4, gust: 6, dir: 245 },
    ]),
    { qos: 1 },
  );
  await client.publishAsync('wind/north-mast/reading', JSON.stringify({ ts: gustAtMs, speed: 11, gust: 20, dir: 250 }), { qos: 1 });
  await client.endAsync();
  const alert = await waitFor(
    async () => (await viewer.json('GET', '/api/live')).body.alerts.find((a: { structureId: number; level: number }) => a.structureId === archId && a.level === 3),
    5_000,
    'the gate arch at Stop and clear',
  );
  archAlertId = alert.id;
});

afterAll(async () => {
  await ts?.stop();
});

describe('log windows', () => {
  it('answers the last 24 hours when no window is given', async () => {
    const before = Date.now();
    const body = await ok(viewer.json('GET', '/api/log/wind'));
    expect(body.toMs).toBeGreaterThanOrEqual(before);
    expect(body.toMs).toBeLessThanOrEqual(Date.now());
    expect(body.toMs - body.fromMs).toBe(86_400_000);
  });

  it('takes from/to as epoch milliseconds and as ISO 8601', async () => {
    const epoch = await ok(viewer.json('GET', `/api/log/audit?from=${Date.UTC(2026, 5, 13, 8)}&to=${Date.UTC(2026, 5, 13, 20)}`));
    expect([epoch.fromMs, epoch.toMs]).toEqual([Date.UTC(2026, 5, 13, 8), Date.UTC(2026, 5, 13, 20)]);
    const iso = await ok(viewer.json('GET', `/api/log/levels?from=${encodeURIComponent('2026-06-13T09:00:00+01:00')}&to=${encodeURIComponent('2026-06-13T21:00:00+01:00')}`));
    expect([iso.fromMs, iso.toMs]).toEqual([Date.UTC(2026, 5, 13, 8), Date.UTC(2026, 5, 13, 20)]);
  });

  it('takes day=YYYY-MM-DD as a calendar day in the site’s time zone, 23 or 25 hours when the clocks change', async () => {
    const summer = await ok(viewer.json('GET', '/api/log/alerts?day=2026-06-13'));
    expect([summer.fromMs, summer.toMs]).toEqual([Date.UTC(2026, 5, 12, 23), Date.UTC(2026, 5, 13, 23)]);
    const springForward = await ok(viewer.json('GET', '/api/log/alerts?day=2026-03-29'));
    expect(springForward.toMs - springForward.fromMs).toBe(23 * 3_600_000);
    const fallBack = await ok(viewer.json('GET', '/api/log/alerts?day=2026-10-25'));
    expect(fallBack.toMs - fallBack.fromMs).toBe(25 * 3_600_000);
  });

  const endpoints = ['/api/log/wind', `/api/log/structures/{arch}`, '/api/log/levels', '/api/log/alerts', '/api/log/audit', '/api/log/summary', '/api/export/readings.csv'];
  const badWindows: Array<[string, string, string]> = [
    ['a from that is not a time', 'from=yesterday', 'from'],
    ['a to that is not a time', 'to=soon', 'to'],
    ['a from after to', `from=${Date.UTC(2026, 5, 14)}&to=${Date.UTC(2026, 5, 13)}`, 'from'],
    ['an empty window (from = to)', `from=${Date.UTC(2026, 5, 13)}&to=${Date.UTC(2026, 5, 13)}`, 'from'],
    ['a window of 63 days', `from=${Date.UTC(2026, 3, 1)}&to=${Date.UTC(2026, 3, 1) + 63 * 86_400_000}`, 'from'],
    ['a day that does not exist', 'day=2026-02-30', 'day'],
    ['a day written the British way', 'day=13/06/2026', 'day'],
  ];
  for (const endpoint of endpoints) {
    it.each(badWindows)(`${endpoint} refuses %s with 400 naming it`, async (_what, query, path) => {
      const res = await viewer.request('GET', `${endpoint.replace('{arch}', String(archId))}?${query}`);
      expect(res.status).toBe(400);
      const body = (await res.json()) as { issues: Array<{ path: string }> };
      expect(paths(body)).toEqual([path]);
    });
  }

  // One window parser serves every log endpoint: the audit trail stands for them all here.
  it.each([
    // With a `to` a day later, so the window check cannot refuse it for being too long.
    ['a from in words, not ISO 8601 ("June 13", which JavaScript reads as 13 June 2001)', `from=June%2013&to=${Date.UTC(2001, 5, 14)}`, 'from'],
    ['a to in words, not ISO 8601 ("x 1", which JavaScript reads as 1 January 2001)', 'to=x%201', 'to'],
  ])('refuses %s with 400 naming it', async (_what, query, path) => {
    const res = await viewer.json('GET', `/api/log/audit?${query}`);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual([path]);
  });

  it.each([
    ['points=5', '/api/log/wind'],
    ['points=20000', '/api/log/wind'],
    ['points=many', '/api/log/wind'],
    ['points=100.5', '/api/log/structures/{arch}'],
  ])('refuses %s on %s with 400 naming points', async (query, endpoint) => {
    const res = await viewer.json('GET', `${endpoint.replace('{arch}', String(archId))}?${query}`);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(['points']);
  });
});

describe('log endpoints', () => {
  it('GET /api/log/wind shows the gust and mean each sensor reported, buffered readings included', async () => {
    const body = await ok(viewer.json('GET', `/api/log/wind?from=${gustAtMs - 300_000}&to=${gustAtMs + 1_000}&points=100`));
    expect(body.sensors).toHaveLength(1);
    const { key, series } = body.sensors[0];
    expect(key).toBe('north-mast');
    expect(series.source).toBe('readings');
    expect(Math.max(...series.gustMps.filter((g: number | null) => g !== null))).toBe(20);
    expect(series.gustMps.filter((g: number | null) => g !== null)).toEqual(expect.arrayContaining([4.5, 6, 20]));
    expect(series.tMs.length).toBeLessThanOrEqual(100);
  });

  it('GET /api/log/wind?sensor= narrows to one sensor, and answers 404 for a sensor nobody registered', async () => {
    expect((await ok(viewer.json('GET', '/api/log/wind?sensor=north-mast'))).sensors.map((s: { key: string }) => s.key)).toEqual(['north-mast']);
    expect((await viewer.json('GET', '/api/log/wind?sensor=west-mast')).status).toBe(404);
  });

  it('GET /api/log/structures/:id shows the level change and the alert of the gust', async () => {
    const body = await ok(viewer.json('GET', `/api/log/structures/${archId}`));
    expect(body.structure).toEqual({ id: archId, name: 'Gate arch', kind: 'custom' });
    const changes = body.levelChanges as Array<{ id: number; atMs: number; fromLevel: number; toLevel: number; gustMps: number | null; noData: boolean }>;
    const raise = changes.find((c) => c.fromLevel === 0 && c.toLevel === 3);
    expect(raise).toMatchObject({ structureId: archId, gustMps: 20, noData: false });
    // Before the gust the arch had no data, then calm: no row may say it stood at level 3 before it was raised.
    const others = changes.filter((c) => c !== raise);
    expect(others.map((c) => [c.fromLevel, c.toLevel])).toEqual(others.map(() => [0, 0]));
    expect(others.every((c) => c.atMs <= raise!.atMs)).toBe(true);
    // Its own action first, then those of the levels the gust passed at once (watch.ts escalationAction).
    expect(body.alerts).toEqual([expect.objectContaining({ id: archAlertId, level: 3, label: 'Stop and clear', actionText: expect.stringMatching(new RegExp(`^${archLevels[2]!.actionText}\n`)) })]);
    expect(body.live).toMatchObject({ id: archId, level: 3 });
  });

  it('GET /api/log/levels lists level changes with the structure’s name, and ?structure= narrows to one', async () => {
    const all = await ok(viewer.json('GET', '/api/log/levels'));
    expect(all.levelChanges).toEqual(expect.arrayContaining([expect.objectContaining({ structureId: archId, structureName: 'Gate arch', toLevel: 3 })]));
    const one = await ok(viewer.json('GET', `/api/log/levels?structure=${marqueeId}`));
    expect(one.levelChanges.every((c: { structureId: number }) => c.structureId === marqueeId)).toBe(true);
    expect(one.levelChanges.map((c: { structureId: number }) => c.structureId)).not.toContain(archId);
  });

  it('GET /api/log/levels?structure= refuses an id that is not a number with 400 naming structure', async () => {
    const res = await viewer.json('GET', '/api/log/levels?structure=gate-arch');
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(['structure']);
  });

  it('GET /api/log/summary?day= sums up the day per structure and sensor', async () => {
    const body = await ok(viewer.json('GET', `/api/log/summary?day=${siteDay(gustAtMs)}`));
    const arch = body.structures.find((s: { id: number }) => s.id === archId);
    expect(arch).toMatchObject({ name: 'Gate arch', highestLevel: 3 });
    expect(arch.alerts.map((a: { id: number }) => a.id)).toContain(archAlertId);
    expect(body.sensors).toEqual([expect.objectContaining({ key: 'north-mast', maxGustMps: 20, readings: 3 })]);
  });

  it('the day before, nothing here was registered yet: its report lists no structure and no sensor, and its wind log no sensor', async () => {
    const yesterday = dayBefore(siteDay(gustAtMs));
    const body = await ok(viewer.json('GET', `/api/log/summary?day=${yesterday}`));
    expect(body.structures).toEqual([]);
    expect(body.sensors).toEqual([]);
    expect((await ok(viewer.json('GET', `/api/log/wind?day=${yesterday}`))).sensors).toEqual([]);
  });

  it('a structure registered and retired today is listed up to its retirement (the audit trail’s time), and not after it; its history stays readable', async () => {
    const booth = await ok(
      cp.json('POST', '/api/structures', {
        record: { kind: 'custom', name: 'Ticket booth banner', baseDepthM: 1.2, referenceHeightM: 10, faces: [{ areaM2: 4, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 600, xM: 0.6 }] },
      }),
      201,
    );
    const id = booth.structure.id as number;
    expect((await cp.request('DELETE', `/api/structures/${id}`)).status).toBeLessThan(300);
    const audit = (await ok(viewer.json('GET', '/api/log/audit'))).audit as Array<{ entity: string; entityId: string; action: string; atMs: number }>;
    const created = audit.find((e) => e.entity === 'structure' && e.entityId === String(id) && e.action === 'create')!;
    const retired = audit.find((e) => e.entity === 'structure' && e.entityId === String(id) && e.action === 'retire')!;
    const today = await ok(viewer.json('GET', `/api/log/summary?day=${siteDay(retired.atMs)}`));
    const entry = today.structures.find((s: { id: number }) => s.id === id);
    expect(entry.onRegister).toEqual({ fromMs: created.atMs, toMs: retired.atMs });
    expect(entry.retiredAtMs).toBe(retired.atMs);
    const after = await ok(viewer.json('GET', `/api/log/summary?from=${retired.atMs + 1}&to=${retired.atMs + 60_000}`));
    expect(after.structures.map((s: { id: number }) => s.id)).not.toContain(id);
    expect(after.structures.map((s: { id: number }) => s.id)).toContain(archId);
    const log = await ok(viewer.json('GET', `/api/log/structures/${id}`));
    expect(log.structure).toEqual({ id, name: 'Ticket booth banner', kind: 'custom' });
    expect((await viewer.json('GET', '/api/log/structures/987654')).status).toBe(404);
  });
});

describe('CSV exports (GET /api/export/<table>.csv)', () => {
  const headers: Record<string, string> = {
    readings: 'sensor,time_local,time_utc,speed_mps,gust_mps,dir_from_deg,temp_c,pressure_hpa,rh_pct,late',
    'wind-minutes': 'sensor,minute_local,minute_utc,samples,mean_mps,max_gust_mps,mean_dir_from_deg',
    'structure-minutes': 'structure,minute_local,minute_utc,max_gust_mps,max_utilization_pct,min_margin_pct,max_level',
    // Issue 14 added columns at the end (README "CSV exports"): the configuration a level change was assessed in, and each alert's plan action.
    'level-changes': 'structure,time_local,time_utc,event,from_level,to_level,gust_mps,utilization_pct,margin_pct,configuration,estimate_level,estimate_chance_10min_pct,estimate_chance_30min_pct',
    alerts:
      'id,kind,structure,sensor,level,label,raised_local,raised_utc,gust_mps,utilization_pct,acknowledged_local,acknowledged_utc,acknowledged_by,note,cleared_local,cleared_utc,action,move_to_configuration,action_done_local,action_done_utc,action_done_by,overdue_local,overdue_utc,action_late',
    audit: 'time_local,time_utc,who,what,id,action,before,after',
  };
  /** Each local-time column and its UTC twin. */
  const timePairs: Record<string, Array<[string, string]>> = {
    readings: [['time_local', 'time_utc']],
    'wind-minutes': [['minute_local', 'minute_utc']],
    'structure-minutes': [['minute_local', 'minute_utc']],
    'level-changes': [['time_local', 'time_utc']],
    alerts: [
      ['raised_local', 'raised_utc'],
      ['acknowledged_local', 'acknowledged_utc'],
      ['cleared_local', 'cleared_utc'],
      ['action_done_local', 'action_done_utc'],
      ['overdue_local', 'overdue_utc'],
    ],
    audit: [['time_local', 'time_utc']],
  };
  /** Columns holding figures, and the decimals each is rounded to (0.1 m/s, 0.1 %, whole degrees). */
  const figureDecimals: Record<string, number> = {
    speed_mps: 1,
    gust_mps: 1,
    mean_mps: 1,
    max_gust_mps: 1,
    max_utilization_pct: 1,
    min_margin_pct: 1,
    utilization_pct: 1,
    margin_pct: 1,
    dir_from_deg: 0,
    mean_dir_from_deg: 0,
    temp_c: 1,
    pressure_hpa: 1,
    rh_pct: 0,
  };

  beforeAll(async () => {
    // A second mast whose gateway flushes one summary two minutes old (late: stored, not used
    // live), with figures finer than the export shows.
    await ok(cp.json('POST', '/api/sensors', { key: 'stage-mast', name: 'Stage mast', heightM: 6, mode: 'summaries' }), 201);
    const gateway = await ok(cp.json('POST', '/api/gateways', { name: 'Stage gateway', username: 'brackenfold-stage-gw', sensorKeys: ['stage-mast'] }), 201);
    const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'brackenfold-stage-gw', password: gateway.password, reconnectPeriod: 0 });
    await client.publishAsync('wind/stage-mast/reading', JSON.stringify({ ts: gustAtMs - 120_000, speed: 7.26, gust: 12.34, dir: 271.6, tempC: 14.23, pressureHpa: 1013.27, rh: 81.6 }), { qos: 1 });
    await client.endAsync();
    // The 1 Hz tick writes each structure's minute in progress: run one, so the minute of the gust is stored.
    await ts.server.tickNow();
  });

  it.each(Object.keys(headers))('%s.csv is text/csv with its header row, as an attachment named after the site’s date', async (table) => {
    const day = siteDay(gustAtMs);
    const res = await viewer.request('GET', `/api/export/${table}.csv?day=${day}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    // day=… starts at local midnight (23:00 UTC the day before in summer): the name keeps the site's date.
    expect(res.headers.get('content-disposition')).toBe(`attachment; filename="${table}-${day}.csv"`);
    const text = await res.text();
    expect(text.split('\r\n')[0]).toBe(headers[table]);
  });

  it.each(Object.keys(headers))('%s.csv is RFC 4180, gives each time on the site’s clock (as Intl.DateTimeFormat reads the UTC beside it) and rounds every figure', async (table) => {
    const text = await (await viewer.request('GET', `/api/export/${table}.csv?from=${gustAtMs - 86_400_000}&to=${Date.now() + 1_000}`)).text();
    const rows = csvObjects(text);
    expect(rows.length, `${table}.csv has no rows`).toBeGreaterThan(0);
    for (const row of rows) {
      for (const [localColumn, utcColumn] of timePairs[table]!) {
        const utc = row[utcColumn]!;
        if (utc === '') {
          expect(row[localColumn]).toBe('');
          continue;
        }
        expect(utc).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
        expect(row[localColumn]).toBe(intlSiteTime(Date.parse(utc)));
      }
      for (const [column, decimals] of Object.entries(figureDecimals)) {
        const value = row[column];
        if (value === undefined || value === '' || value === 'unbounded' || value === 'none') continue;
        expect(value, `${table}.${column}`).toMatch(decimals === 0 ? /^-?\d+$/ : new RegExp(`^-?\\d+\\.\\d{${decimals}}$`));
      }
      // Margin is what the utilization leaves of 100 %: the two rounded figures add up exactly.
      const [u, m] = table === 'structure-minutes' ? [row.max_utilization_pct, row.min_margin_pct] : [row.utilization_pct, row.margin_pct];
      if (u !== undefined && u !== '' && u !== 'unbounded' && m !== undefined) expect(Math.round((Number(u) + Number(m)) * 10)).toBe(1000);
    }
  });

  it('readings.csv has one row per stored reading, in m/s to 0.1, direction to 1°, pressure in hPa', async () => {
    const rows = csvObjects(await (await viewer.request('GET', `/api/export/readings.csv?from=${gustAtMs - 300_000}&to=${gustAtMs + 1_000}`)).text());
    expect(rows.map((r) => [r.sensor, Date.parse(r.time_utc!), r.speed_mps, r.gust_mps, r.dir_from_deg, r.late])).toEqual([
      // The gateway's buffered summaries are minutes old on arrival: stored, marked late, not used live.
      ['north-mast', gustAtMs - 180_000, '3.0', '4.5', '240', 'yes'],
      ['north-mast', gustAtMs - 120_000, '4.0', '6.0', '245', 'yes'],
      ['stage-mast', gustAtMs - 120_000, '7.3', '12.3', '272', 'yes'],
      ['north-mast', gustAtMs, '11.0', '20.0', '250', ''],
    ]);
    // Hand-rounded: 14.23 °C → 14.2; 1013.27 hPa → 1013.3; 81.6 % → 82.
    expect(rows.find((r) => r.sensor === 'stage-mast')).toMatchObject({ temp_c: '14.2', pressure_hpa: '1013.3', rh_pct: '82' });
  });

  it('level-changes.csv says the arch was raised to level 3 at 20.0 m/s, its utilization and margin as the public calculator gives them at that gust', async () => {
    const rows = csvObjects(await (await viewer.request('GET', '/api/export/level-changes.csv')).text());
    const raise = rows.find((r) => r.structure === 'Gate arch' && r.event === 'raised');
    expect(raise).toMatchObject({ from_level: '0', to_level: '3', gust_mps: '20.0' });
    // The same record at the same gust and air density through POST /api/assess (sensor and
    // structure both at 10 m: no height transfer).
    const live = await ok(viewer.json('GET', '/api/live'));
    const state = live.structures.find((x: { id: number }) => x.id === archId);
    const record = (await ok(viewer.json('GET', `/api/structures/${archId}`))).structure.record;
    const answer = await ok(viewer.json('POST', '/api/assess', { structure: record, gustMps: 20, airDensityKgM3: state.airDensityKgM3 }));
    const pctExpected = answer.effectiveUtilization * 100;
    expect(Math.abs(Number(raise!.utilization_pct) - pctExpected)).toBeLessThanOrEqual(0.05 + 1e-9);
    expect(Math.abs(Number(raise!.margin_pct) - (100 - pctExpected))).toBeLessThanOrEqual(0.05 + 1e-9);
    // Past its limit: the margin is negative.
    expect(Number(raise!.margin_pct)).toBeLessThan(0);
  });

  it('a window outside the data gives the header row alone', async () => {
    const text = await (await viewer.request('GET', '/api/export/readings.csv?day=2026-01-01')).text();
    expect(text).toBe(`${headers.readings}\r\n`);
  });

  it.each(['sessions', 'people', 'READINGS', '..%2Fpeople'])('answers 404 for a table that is not exported (%s)', async (table) => {
    const res = await viewer.request('GET', `/api/export/${table}.csv`);
    expect(res.status).toBe(404);
  });
});

describe('acknowledging alerts (POST /api/alerts/:id/acknowledge)', () => {
  it('refuses a note over 2000 characters with 400 naming note, and leaves the alert open', async () => {
    const res = await crew.json('POST', `/api/alerts/${archAlertId}/acknowledge`, { note: 'x'.repeat(2001) });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(['note']);
    const live = await ok(viewer.json('GET', '/api/live'));
    expect(live.alerts.find((a: { id: number }) => a.id === archAlertId).acknowledgedAtMs).toBeNull();
  });

  it('records the crew member’s name and note, on the board and in the log', async () => {
    const res = await crew.json('POST', `/api/alerts/${archAlertId}/acknowledge`, { note: 'Header board lowered, path closed.' });
    expect(res.status).toBe(200);
    expect(res.body.alert).toMatchObject({ id: archAlertId, acknowledgedBy: crewName, acknowledgeNote: 'Header board lowered, path closed.' });
    expect(res.body.alert.acknowledgedAtMs).toEqual(expect.any(Number));

    const live = await ok(viewer.json('GET', '/api/live'));
    expect(live.alerts.find((a: { id: number }) => a.id === archAlertId)).toMatchObject({ acknowledgedBy: crewName, acknowledgeNote: 'Header board lowered, path closed.' });
    const log = await ok(viewer.json('GET', '/api/log/alerts'));
    expect(log.alerts.find((a: { id: number }) => a.id === archAlertId)).toMatchObject({ acknowledgedBy: crewName });
    const audit = await ok(viewer.json('GET', '/api/log/audit'));
    const entry = audit.audit.find((e: { entity: string; entityId: string }) => e.entity === 'alert' && e.entityId === String(archAlertId));
    expect(entry).toMatchObject({ action: 'acknowledge', afterJson: { by: crewName, note: 'Header board lowered, path closed.' } });
    expect(entry.actor).toContain(crewName);
    const csv = await (await viewer.request('GET', '/api/export/alerts.csv')).text();
    expect(csv).toContain(`${crewName},"Header board lowered, path closed."`);
  });

  it('answers 409 to a second acknowledgement and keeps the first', async () => {
    const res = await cp.json('POST', `/api/alerts/${archAlertId}/acknowledge`, { note: 'Seen.' });
    expect(res.status).toBe(409);
    expect(res.body.error).toContain(crewName);
    const log = await ok(viewer.json('GET', '/api/log/alerts'));
    expect(log.alerts.find((a: { id: number }) => a.id === archAlertId)).toMatchObject({ acknowledgedBy: crewName, acknowledgeNote: 'Header board lowered, path closed.' });
  });

  it.each(['999999', 'abc', '0', '-1'])('answers 404 for alert %s', async (id) => {
    const res = await crew.json('POST', `/api/alerts/${id}/acknowledge`, {});
    expect(res.status).toBe(404);
  });
});

describe('the forecast check (POST /api/forecast)', () => {
  const table = ['time;gust (m/s);dir', '2026-06-14T12:00Z;3;W', '2026-06-14T13:00Z;9;WSW', '2026-06-14T14:00Z;30;SW'].join('\n');

  it('answers each structure’s predicted level for every row of the table', async () => {
    const body = await ok(viewer.json('POST', '/api/forecast', { text: table }));
    expect(body.heightM).toBe(10);
    expect(body.structures.find((s: { id: number }) => s.id === archId).levels.map((l: { triggerGustMps: number }) => l.triggerGustMps)).toEqual([5, 8, 12]);
    expect(body.rows.map((r: { timeMs: number }) => r.timeMs)).toEqual([Date.UTC(2026, 5, 14, 12), Date.UTC(2026, 5, 14, 13), Date.UTC(2026, 5, 14, 14)]);
    const archLevelsByRow = body.rows.map((r: { levels: Array<{ structureId: string; level: number; gustAtStructureMps: number }> }) => r.levels.find((l) => l.structureId === String(archId)));
    expect(archLevelsByRow.map((l: { level: number }) => l.level)).toEqual([0, 2, 3]);
    expect(archLevelsByRow.map((l: { gustAtStructureMps: number }) => l.gustAtStructureMps)).toEqual([3, 9, 30]);
    expect(body.rows.map((r: { dirFromDeg: number }) => r.dirFromDeg)).toEqual([270, 247.5, 225]);
    // The marquee is stronger than the arch but not than a 30 m/s gust.
    const marquee = body.rows.map((r: { levels: Array<{ structureId: string; level: number }> }) => r.levels.find((l) => l.structureId === String(marqueeId))!.level);
    expect(marquee[0]).toBe(0);
    expect(marquee[2]).toBe(3);
  });

  it('takes the unit from the request when the header names none (36 km/h = 10 m/s)', async () => {
    const body = await ok(viewer.json('POST', '/api/forecast', { text: 'time,gust\n2026-06-14T12:00Z,36', unit: 'km/h' }));
    expect(body.rows[0].gustMps).toBeCloseTo(10, 9);
    expect(body.rows[0].levels.find((l: { structureId: string }) => l.structureId === String(archId)).level).toBe(2);
  });

  it.each([
    ['a speed that is not a number', 'time;gust (m/s)\n2026-06-14T12:00Z;9\n2026-06-14T13:00Z;fast', 'text.line 3.gust (m/s)'],
    ['a time that is not a time', 'time;gust (m/s)\n14 June, noon;9', 'text.line 2.time'],
    ['a gust below the mean', 'time;mean (m/s);gust (m/s)\n2026-06-14T12:00Z;12;9', 'text.line 2'],
    ['a speed of 500 m/s', 'time;gust (m/s)\n2026-06-14T12:00Z;500', 'text.line 2.gust (m/s)'],
    ['a header without a speed unit', 'time;gust\n2026-06-14T12:00Z;9', 'text.line 1.gust'],
  ])('refuses a table with %s with 400 naming the line', async (_what, text, path) => {
    const res = await viewer.json('POST', '/api/forecast', { text });
    expect(res.status).toBe(400);
    expect(paths(res.body).some((p) => p === path || p.startsWith(`${path}.`))).toBe(true);
  });

  it.each([
    ['an empty table', { text: '' }, 'text'],
    ['a unit nobody uses', { text: table, unit: 'furlongs' }, 'unit'],
    ['a height of 0 m', { text: table, heightM: 0 }, 'heightM'],
    ['no table at all', { unit: 'kn' }, 'text'],
  ])('refuses %s with 400 naming the field', async (_what, body, path) => {
    const res = await viewer.json('POST', '/api/forecast', body);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain(path);
  });
});
