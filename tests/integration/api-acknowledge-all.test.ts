/**
 * POST /api/alerts/acknowledge: every open alert of one structure (or one sensor) acknowledged in
 * one call — the board's default action after a windy spell raised Watch, Prepare and Stop for a
 * structure. Checked against the real server, broker and SQLite: crew and above only; bad input
 * named by field and never stored; only the alerts the screen showed (an alert raised since stays
 * open and is named back); an alert acknowledged meanwhile by someone else is reported, not
 * overwritten; one acknowledgement row and one audit entry per alert, exactly as the single-alert
 * path stores them; and the live stream announces each acknowledgement only once it is in the
 * database (checked inside the announcement itself, so the order cannot be missed).
 *
 * Scenario (invented): Harrowfield Green, a gate arch and a bar tent on one mast, a rigger and a
 * gate steward.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

let clock = Date.now();
let ts: TestServer;
let admin: ApiClient;
let crew: ApiClient;
let viewer: ApiClient;
let gateway: MqttClient;
const ids = { arch: 0, tent: 0 };
const crewName = 'Morgan Tait';

/** A board on a 1.5 m base, a tonne of ballast (limit about 14 m/s at ISA density: numbers invented for the test). */
const record = (name: string) => ({ kind: 'custom', name, baseDepthM: 1.5, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 1000, xM: 0.75 }] });
const levels = [
  { label: 'Watch', trigger: { kind: 'gust', gustMps: 5 }, actionText: 'Check the ballast and the ties.' },
  { label: 'Prepare', trigger: { kind: 'gust', gustMps: 8 }, actionText: 'Close the side walls, brief the stewards.' },
  { label: 'Stop and clear', trigger: { kind: 'gust', gustMps: 10 }, actionText: 'Clear everyone out and keep them out.' },
];

interface Alert {
  id: number;
  kind: string;
  structureId: number | null;
  sensorKey: string | null;
  label: string;
  acknowledgedAtMs: number | null;
  acknowledgedBy: string | null;
  acknowledgeNote: string | null;
}

const sqlite = () => ts.server.db.$client;
const openAlerts = async (): Promise<Alert[]> => (await admin.json('GET', '/api/live')).body.alerts;
const alertsOf = async (structureId: number) => (await openAlerts()).filter((a) => a.structureId === structureId);
const byLabel = (list: Alert[], label: string) => list.find((a) => a.label === label)!;

beforeAll(async () => {
  ts = await startTestServer({}, { now: () => clock, tickMs: 60_000 });
  admin = new ApiClient(ts.baseUrl);
  await admin.signIn(adminUsername, adminPassword);
  await admin.json('POST', '/api/people', { username: 'morgan', displayName: crewName, role: 'crew', password: 'morgan-pass-1234' });
  await admin.json('POST', '/api/people', { username: 'ellis', displayName: 'Ellis Fairweather', role: 'viewer', password: 'ellis-pass-1234' });
  crew = new ApiClient(ts.baseUrl);
  expect((await crew.signIn('morgan', 'morgan-pass-1234')).status).toBe(200);
  viewer = new ApiClient(ts.baseUrl);
  expect((await viewer.signIn('ellis', 'ellis-pass-1234')).status).toBe(200);
  expect((await admin.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10, mode: 'summaries' })).status).toBe(201);
  const gw = await admin.json('POST', '/api/gateways', { name: 'Mast gateway', username: 'harrowfield-gw', sensorKeys: ['north-mast'] });
  for (const [key, name] of [['arch', 'Gate arch'], ['tent', 'Bar tent']] as const) {
    const made = await admin.json('POST', '/api/structures', { record: record(name), levels });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    ids[key] = made.body.structure.id;
  }
  gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'harrowfield-gw', password: gw.body.password, reconnectPeriod: 0 });
  // A rising spell: Watch, Prepare, then Stop for both structures, one alert each.
  for (const gust of [6, 9, 11]) {
    clock += 1_000;
    await gateway.publishAsync('wind/north-mast/reading', JSON.stringify({ ts: clock, speed: gust / 1.5, gust }), { qos: 1 });
    await ts.server.tickNow();
  }
  await waitFor(async () => (await alertsOf(ids.tent)).length === 3 && (await alertsOf(ids.arch)).length === 3, 5_000, 'three alerts per structure');
});

afterAll(async () => {
  await gateway?.endAsync();
  await ts?.stop();
});

describe('acknowledging every alert of a structure at once', () => {
  it('refuses a viewer (403) and nobody signed in (401), and changes nothing', async () => {
    expect((await viewer.json('POST', '/api/alerts/acknowledge', { structureId: ids.arch })).status).toBe(403);
    expect((await new ApiClient(ts.baseUrl).json('POST', '/api/alerts/acknowledge', { structureId: ids.arch })).status).toBe(401);
    expect((await alertsOf(ids.arch)).every((a) => a.acknowledgedAtMs === null)).toBe(true);
  });

  it('names the field of bad input in plain words, and stores nothing from it', async () => {
    const cases: Array<[unknown, string, RegExp]> = [
      [{}, 'structureId', /either a structure \(structureId\) or a sensor \(sensorKey\)/],
      [{ structureId: ids.arch, sensorKey: 'north-mast' }, 'sensorKey', /not both/],
      [{ structureId: 'arch' }, 'structureId', /must be a structure id/],
      [{ structureId: ids.arch, alertIds: [] }, 'alertIds', /at least one alert/],
      [{ structureId: ids.arch, note: 'x'.repeat(2001) }, 'note', /longer than 2000 characters/],
      [{ structureId: ids.arch, colour: 'red' }, 'colour', /is not a field here/],
    ];
    for (const [body, path, message] of cases) {
      const res = await crew.json('POST', '/api/alerts/acknowledge', body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      const issue = (res.body.issues as Array<{ path: string; message: string }>).find((i) => i.path === path);
      expect(issue, `${JSON.stringify(body)} → ${JSON.stringify(res.body)}`).toBeDefined();
      expect(issue!.message).toMatch(message);
    }
    // An alert of another structure in the list: refused by its place in the list, nothing acknowledged.
    const tentStop = byLabel(await alertsOf(ids.tent), 'Stop and clear');
    const archWatch = byLabel(await alertsOf(ids.arch), 'Watch');
    const res = await crew.json('POST', '/api/alerts/acknowledge', { structureId: ids.arch, alertIds: [archWatch.id, tentStop.id] });
    expect(res.status).toBe(400);
    expect(res.body.issues).toEqual([{ path: 'alertIds.1', message: `alert ${tentStop.id} is not an alert of structure ${ids.arch}` }]);
    expect((await crew.json('POST', '/api/alerts/acknowledge', { structureId: 999_999 })).status).toBe(404);
    expect((await openAlerts()).every((a) => a.acknowledgedAtMs === null)).toBe(true);
    expect((sqlite().prepare('SELECT COUNT(*) AS n FROM alerts WHERE acknowledged_at_ms IS NOT NULL').get() as { n: number }).n).toBe(0);
  });

  it('acknowledges only the alerts the screen showed, reports one taken by someone else, and names the one raised since', async () => {
    const arch = await alertsOf(ids.arch);
    // Another phone acknowledges Watch first, through the single-alert path.
    expect((await crew.json('POST', `/api/alerts/${byLabel(arch, 'Watch').id}/acknowledge`, { note: 'Ties checked.' })).status).toBe(200);

    // Each announcement of an acknowledgement must find it already in the database.
    const seenAtAnnouncement: Array<{ id: number; storedBy: string | null }> = [];
    const off = ts.server.hub.subscribe((event) => {
      if (event.kind !== 'alert-update') return;
      const id = (JSON.parse(event.data) as { id: number }).id;
      const row = sqlite().prepare('SELECT acknowledged_by AS by FROM alerts WHERE id = ?').get(id) as { by: string | null };
      seenAtAnnouncement.push({ id, storedBy: row.by });
    });
    // The screen showed Watch and Prepare (Stop was raised after it was drawn).
    const shown = [byLabel(arch, 'Watch').id, byLabel(arch, 'Prepare').id];
    const res = await crew.json('POST', '/api/alerts/acknowledge', { structureId: ids.arch, alertIds: shown, note: 'Walls closed, stewards briefed.' });
    off();
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.stored).toBe(true);
    expect(res.body.acknowledged.map((a: Alert) => a.label)).toEqual(['Prepare']);
    expect(res.body.acknowledged[0]).toMatchObject({ acknowledgedBy: crewName, acknowledgeNote: 'Walls closed, stewards briefed.' });
    expect(res.body.alreadyAcknowledged).toEqual([{ id: byLabel(arch, 'Watch').id, acknowledgedBy: crewName, acknowledgedAtMs: expect.any(Number) }]);
    expect(res.body.notShown.map((a: Alert) => a.label)).toEqual(['Stop and clear']);
    expect(seenAtAnnouncement).toEqual([{ id: byLabel(arch, 'Prepare').id, storedBy: crewName }]);

    const now = await alertsOf(ids.arch);
    expect(byLabel(now, 'Watch').acknowledgeNote).toBe('Ties checked.');
    expect(byLabel(now, 'Stop and clear').acknowledgedAtMs).toBeNull();
  });

  it('without a list acknowledges every open alert of the structure, and leaves the other structure alone', async () => {
    const seen: number[] = [];
    const off = ts.server.hub.subscribe((event) => {
      if (event.kind !== 'alert-update') return;
      const id = (JSON.parse(event.data) as { id: number }).id;
      const row = sqlite().prepare('SELECT acknowledged_by AS by FROM alerts WHERE id = ?').get(id) as { by: string | null };
      if (row.by === crewName) seen.push(id);
    });
    const res = await crew.json('POST', '/api/alerts/acknowledge', { structureId: ids.tent });
    off();
    expect(res.status).toBe(200);
    expect(res.body.acknowledged.map((a: Alert) => a.label).sort()).toEqual(['Prepare', 'Stop and clear', 'Watch']);
    expect(res.body.notShown).toEqual([]);
    expect(seen.sort()).toEqual(res.body.acknowledged.map((a: Alert) => a.id).sort());
    expect((await alertsOf(ids.tent)).every((a) => a.acknowledgedBy === crewName && a.acknowledgeNote === null)).toBe(true);
    expect(byLabel(await alertsOf(ids.arch), 'Stop and clear').acknowledgedAtMs).toBeNull();
    // Again: nothing left to acknowledge, said in the answer, not an error.
    const again = await crew.json('POST', '/api/alerts/acknowledge', { structureId: ids.tent });
    expect(again.status).toBe(200);
    expect(again.body.acknowledged).toEqual([]);
  });

  it('stores one acknowledgement row and one audit entry per alert, as the single-alert path does', async () => {
    const rows = sqlite()
      .prepare('SELECT a.id, a.label, a.acknowledged_by AS by, a.acknowledge_note AS note, COUNT(u.id) AS audits, MAX(u.actor) AS actor FROM alerts a LEFT JOIN audit u ON u.entity = \'alert\' AND u.entity_id = CAST(a.id AS TEXT) AND u.action = \'acknowledge\' WHERE a.structure_id IN (?, ?) AND a.acknowledged_at_ms IS NOT NULL GROUP BY a.id ORDER BY a.id')
      .all(ids.arch, ids.tent) as Array<{ id: number; label: string; by: string; note: string | null; audits: number; actor: string }>;
    // Arch: Watch (single path) and Prepare (all); tent: all three.
    expect(rows).toHaveLength(5);
    for (const r of rows) {
      expect(r.by).toBe(crewName);
      expect(r.audits).toBe(1);
      expect(r.actor).toBe(`${crewName} (morgan)`);
    }
    const audit = await admin.json('GET', `/api/log/audit?from=${clock - 3_600_000}&to=${clock + 60_000}`);
    const entries = (audit.body.audit as Array<{ entity: string; entityId: string; action: string; afterJson: unknown }>).filter((e) => e.entity === 'alert' && e.action === 'acknowledge');
    expect(entries).toHaveLength(5);
  });

  it('acknowledges a sensor\'s alerts by its key, and only those', async () => {
    // The mast goes quiet past its timeout (and past the start grace): a sensor alert, and no data for both structures.
    clock += 120_000;
    await ts.server.tickNow();
    const sensorAlert = await waitFor(async () => (await openAlerts()).find((a) => a.sensorKey === 'north-mast' && a.acknowledgedAtMs === null), 5_000, 'a sensor-silent alert');
    expect(sensorAlert.kind).toBe('sensor-silent');
    const noDataBefore = (await openAlerts()).filter((a) => a.kind === 'no-data' && a.acknowledgedAtMs === null).length;
    expect(noDataBefore).toBe(2);
    const res = await crew.json('POST', '/api/alerts/acknowledge', { sensorKey: 'north-mast', alertIds: [sensorAlert.id] });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.acknowledged.map((a: Alert) => a.id)).toEqual([sensorAlert.id]);
    expect((await openAlerts()).filter((a) => a.kind === 'no-data' && a.acknowledgedAtMs === null)).toHaveLength(noDataBefore);
    // A structure's alert is not the sensor's.
    const noData = (await openAlerts()).find((a) => a.kind === 'no-data')!;
    const wrong = await crew.json('POST', '/api/alerts/acknowledge', { sensorKey: 'north-mast', alertIds: [noData.id] });
    expect(wrong.status).toBe(400);
    expect(wrong.body.issues[0]).toEqual({ path: 'alertIds.0', message: `alert ${noData.id} is not an alert of sensor "north-mast"` });
    expect((await crew.json('POST', '/api/alerts/acknowledge', { sensorKey: 'south-mast' })).status).toBe(404);
  });
});
