/**
 * When the database cannot write — a full disk (simulated with SQLite's max_page_count, which
 * fails writes with SQLITE_FULL exactly as a full disk does) or a read-only data folder (SQLite's
 * query_only, SQLITE_READONLY) — the server says so loudly, keeps alerting from memory, and
 * stores what it kept once writing works again. Issue: fault tests, design.md 5 (durability).
 */
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;
let gateway: MqttClient;
let structureId = 0;
let triggers: number[] = [];
let clock = Date.now();

const record = {
  kind: 'custom',
  name: 'Fault test hoarding',
  baseDepthM: 2,
  frictionCoefficient: 0.4,
  faces: [{ areaM2: 10, centroidHeightM: 2, cfFront: 1.8, cfBack: 1.8 }],
  masses: [{ massKg: 3000, xM: 1 }],
  coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80',
};

function publish(gustMps: number): void {
  // Not awaited: while the disk is full the server withholds the PUBACK.
  gateway.publish('wind/fault-mast/reading', JSON.stringify({ ts: clock, speed: gustMps / 1.5, gust: gustMps }), { qos: 1 });
}

const sqlite = () => ts.server.db.$client;

beforeAll(async () => {
  // The faults are set on the main connection (max_page_count and query_only are per
  // connection), so the commits run on it too; commit-thread.test.ts and
  // disk-full-crash.test.ts cover the commit thread's refusals.
  ts = await startTestServer({}, { now: () => clock, tickMs: 60_000, commitThread: false });
  api = new ApiClient(ts.baseUrl);
  await api.signIn(adminUsername, adminPassword);
  await api.json('POST', '/api/sensors', { key: 'fault-mast', name: 'Fault mast', heightM: 10 });
  const gw = await api.json('POST', '/api/gateways', { name: 'Fault gateway', username: 'fault-gw', sensorKeys: ['fault-mast'] });
  gateway = mqtt.connect(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'fault-gw', password: gw.body.password, reconnectPeriod: 200 });
  await new Promise((r) => gateway.once('connect', r));
  const created = await api.json('POST', '/api/structures', { record });
  structureId = created.body.structure.id;
  triggers = created.body.structure.live.triggerGustsMps;
  clock += 1_000;
  await gateway.publishAsync('wind/fault-mast/reading', JSON.stringify({ ts: clock, speed: 3, gust: 4.5 }), { qos: 1 });
});

afterAll(async () => {
  gateway?.end(true);
  await ts?.stop();
});

async function liveStructure(): Promise<any> {
  return (await api.json('GET', '/api/live')).body.structures.find((s: any) => s.id === structureId);
}

describe.each([
  ['a full disk', 'max_page_count', () => sqlite().pragma(`max_page_count = ${sqlite().pragma('page_count', { simple: true })}`), () => sqlite().pragma('max_page_count = 1073741823')],
  ['a read-only data folder', 'query_only', () => sqlite().pragma('query_only = ON'), () => sqlite().pragma('query_only = OFF')],
] as const)('with %s', (_name, _pragma, breakDisk, mendDisk) => {
  it('keeps raising and acknowledging alerts from memory, says so on health, and stores it all when writing works again', async () => {
    const alertsBefore = (sqlite().prepare('SELECT COUNT(*) AS n FROM alerts').get() as { n: number }).n;
    breakDisk();
    // Enough readings to need new pages (a full disk fails only when the file must grow).
    for (let i = 0; i < 400; i++) {
      clock += 50;
      publish(4.5);
    }
    clock += 1_000;
    publish(triggers[1]! + 0.2);
    const escalated = await waitFor(async () => ((await liveStructure())?.level === 2 ? await liveStructure() : null), 5_000, 'level 2 from memory');
    expect(escalated.levelLabel).toBe('Prepare');

    const health = await api.request('GET', '/api/health');
    expect(health.status).toBe(503);
    const report = (await health.json()) as any;
    expect(report.database.ok).toBe(false);
    expect(report.database.backlogRows).toBeGreaterThan(0);
    expect(report.database.lastError).toMatch(/full|readonly|read-only|attempt to write/i);
    expect(report.database.error).toBe(report.database.lastError);
    expect(report.database.status).toMatch(/^cannot write since /);
    const live = (await api.json('GET', '/api/live')).body;
    expect(live.system.storageOk).toBe(false);

    const alert = live.alerts.find((a: any) => a.structureId === structureId && a.level === 2 && a.acknowledgedAtMs === null);
    expect(alert).toBeDefined();
    const ack = await api.json('POST', `/api/alerts/${alert.id}/acknowledge`, { note: 'Scrim down, disk full noted' });
    expect(ack.status).toBe(200);
    expect(ack.body.stored).toBe(false);
    // Nothing of it is in the database yet.
    expect((sqlite().prepare('SELECT COUNT(*) AS n FROM alerts').get() as { n: number }).n).toBe(alertsBefore);

    mendDisk();
    clock += 1_000;
    publish(triggers[1]! + 0.3);
    await waitFor(() => sqlite().prepare('SELECT acknowledged_by AS by FROM alerts WHERE id = ?').get(alert.id), 10_000, 'the kept alert stored');
    const stored = sqlite().prepare('SELECT acknowledged_by AS by, acknowledge_note AS note, level FROM alerts WHERE id = ?').get(alert.id) as any;
    expect(stored).toEqual({ by: expect.any(String), note: 'Scrim down, disk full noted', level: 2 });
    const change = sqlite().prepare('SELECT from_level AS f, to_level AS t FROM level_changes WHERE structure_id = ? AND to_level = 2 ORDER BY id DESC LIMIT 1').get(structureId);
    expect(change).toEqual({ f: 0, t: 2 });
    await waitFor(async () => (await api.request('GET', '/api/health')).status === 200, 10_000, 'health OK again');
    // After recovery the old error is shown as past, with when it happened and when it ended (issue 13 item 12).
    const after = ((await (await api.request('GET', '/api/health')).json()) as any).database;
    expect(after.ok).toBe(true);
    expect(after.error).toBeNull();
    expect(after.lastError).toMatch(/full|readonly|read-only|attempt to write/i);
    expect(after.recoveredAtMs).toBeGreaterThanOrEqual(after.lastErrorAtMs);
    expect(after.status).toMatch(/^writing; last error at \S+ \(.+\), recovered at \S+$/);
    // The readings held in memory while the disk was full are stored too, once each.
    await waitFor(() => (sqlite().prepare("SELECT COUNT(*) AS n FROM readings WHERE ts_ms > ?").get(clock - 30_000) as { n: number }).n >= 402, 15_000, 'held readings stored');

    // Back to calm for the next case: hold 0 is not set, so lower the level by a fresh structure state.
    await api.json('PATCH', '/api/site', { holdTimeMs: 0 });
    clock += 1_000;
    publish(4.5);
    await waitFor(async () => (await liveStructure())?.level === 0, 5_000, 'back to level 0');
    await api.json('PATCH', '/api/site', { holdTimeMs: 15 * 60_000 });
  }, 40_000);
});
