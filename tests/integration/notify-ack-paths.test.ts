/**
 * The notifier is fed the watch's alert events after their commit (Watch.observeAlertEvents,
 * issue 15): an acknowledgement made through each way in — the board's button, the board's
 * "acknowledge all", the board's "Done" (which acknowledges), the e-mail link, the push button and
 * the demo crew — gives exactly one `alert.acknowledged` notification; one whose commit fails (the
 * write queue's promise rejects: the commit thread gone) gives none; one held while the disk
 * refuses (`stored: false`) is notified once, as the stream is (writeQueue.ts header: live alerting
 * does not wait for the disk). Alerts restored from the log after a restart are not notified as
 * raised again. Real broker, real SQLite, real HTTP receiver; only the failed commit is simulated.
 *
 * The screen and its ladder are tests/helpers/harbourScreen.ts's: 13 m/s is above its "Lower the
 * screen" trigger (level 2, its action moves it to "lowered").
 */
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { configFromEnv } from '../../server/config.ts';
import { DemoCrew } from '../../server/demo/demoCrew.ts';
import { createLogger } from '../../server/log.ts';
import { ackSecret, makeAckToken } from '../../server/notify/ackTokens.ts';
import { makePushActionToken } from '../../server/notify/pushTokens.ts';
import { startServer, type RunningServer } from '../../server/runtime.ts';
import type { OpenAlert } from '../../server/watch/watch.ts';
import { harbourLevels, harbourScreen } from '../helpers/harbourScreen.ts';
import { ApiClient, adminPassword, adminUsername, waitFor } from '../helpers/testServer.ts';

const secret = 'test-webhook-secret-0123456789';
let clock = Date.UTC(2026, 6, 19, 15, 0, 0);
const received: Array<{ event: string; alertId: number; acknowledgedBy?: string }> = [];
let receiver: http.Server;
let receiverUrl = '';
let dataDir = '';
let server: RunningServer;
let baseUrl = '';
let admin: ApiClient;
let gateway: MqttClient;
let gatewayPassword = '';
const paths = ['crew', 'board', 'all', 'done', 'link', 'push', 'held', 'failed-board', 'failed-done'] as const;
type Way = (typeof paths)[number];
const structureOf = new Map<Way, number>();

async function start(): Promise<void> {
  const env = { DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', MQTT_PORT: '0', MQTT_HOST: '127.0.0.1', ADMIN_USERNAME: adminUsername, ADMIN_PASSWORD: adminPassword, ALERT_WEBHOOK_URL: `${receiverUrl}/hook`, ALERT_WEBHOOK_SECRET: secret };
  server = await startServer(configFromEnv(env), createLogger(process.env.TEST_LOG_LEVEL ?? 'silent'), { now: () => clock, tickMs: 60_000, staticRoot: null });
  baseUrl = `http://127.0.0.1:${server.httpPort}`;
  admin = new ApiClient(baseUrl);
  expect((await admin.signIn(adminUsername, adminPassword)).status).toBe(200);
}

async function connectGateway(): Promise<void> {
  gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${server.mqttPort}`, { username: 'quay-gw', password: gatewayPassword, reconnectPeriod: 0 });
}

async function publish(gustMps: number): Promise<void> {
  clock += 1_000;
  await gateway.publishAsync('wind/quay-mast/reading', JSON.stringify({ ts: clock, speed: gustMps / 1.5, gust: gustMps, dir: 250 }), { qos: 1 });
}

/** The notifications queued for an event, per alert (one webhook target: one row per notification). */
function outboxRows(event: string): Map<number, number> {
  const rows = server.db.$client.prepare(`SELECT alert_id AS alertId, count(*) AS n FROM notify_outbox WHERE event = ? GROUP BY alert_id`).all(event) as Array<{ alertId: number; n: number }>;
  return new Map(rows.map((r) => [r.alertId, r.n]));
}

function alertOf(way: Way): OpenAlert {
  const alert = server.watch.openAlerts().find((a) => a.kind === 'level' && a.structureId === structureOf.get(way));
  if (!alert) throw new Error(`no open level alert on the structure for ${way}`);
  return alert;
}

beforeAll(async () => {
  receiver = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const body = JSON.parse(Buffer.concat(chunks).toString('utf8'));
      received.push({ event: body.event, alertId: body.alert.id, ...(body.alert.acknowledgedBy ? { acknowledgedBy: body.alert.acknowledgedBy } : {}) });
      res.writeHead(200, { 'content-type': 'text/plain' }).end('ok');
    });
  });
  await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  receiverUrl = `http://127.0.0.1:${(receiver.address() as { port: number }).port}`;
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-notify-ack-paths-'));
  await start();
  await admin.json('POST', '/api/sensors', { key: 'quay-mast', name: 'Quay mast', heightM: 10 });
  const gw = await admin.json('POST', '/api/gateways', { name: 'Quay gateway', username: 'quay-gw', sensorKeys: ['quay-mast'] });
  gatewayPassword = gw.body.password;
  for (const way of paths) {
    const created = await admin.json('POST', '/api/structures', { record: { ...harbourScreen, name: `Quay screen (${way})` }, orientationDeg: 250, levels: harbourLevels });
    expect(created.status).toBe(201);
    structureOf.set(way, created.body.structure.id);
  }
  await connectGateway();
});

afterAll(async () => {
  vi.restoreAllMocks();
  await gateway?.endAsync(true).catch(() => undefined);
  await server?.close().catch(() => undefined);
  await new Promise((resolve) => receiver?.close(resolve));
  receiver?.closeAllConnections();
  if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('acknowledgements reach the notifications after their commit', () => {
  const alertIds = new Map<Way, number>();

  it('raises one level alert per structure, each notified once as raised', async () => {
    for (let i = 0; i < 4; i++) await publish(13);
    for (const way of paths) alertIds.set(way, alertOf(way).id);
    expect(new Set(alertIds.values()).size).toBe(paths.length);
    const raised = await waitFor(() => {
      const rows = outboxRows('alert.raised');
      return [...alertIds.values()].every((id) => rows.has(id)) ? rows : null;
    }, 10_000, 'every alert.raised queued');
    for (const id of alertIds.values()) expect(raised.get(id)).toBe(1);
  });

  it('notifies nothing for an acknowledgement whose commit fails, from the board or by Done', async () => {
    const enqueue = vi.spyOn(server.queue, 'enqueue');
    enqueue.mockRejectedValueOnce(new Error('commit thread failed: simulated'));
    const board = await admin.json('POST', `/api/alerts/${alertIds.get('failed-board')}/acknowledge`, { note: 'seen' });
    expect(board.status).toBe(500);
    expect(alertOf('failed-board').acknowledgedAtMs).toBeNull();
    enqueue.mockRejectedValueOnce(new Error('commit thread failed: simulated'));
    const done = await admin.json('POST', `/api/structures/${structureOf.get('failed-done')}/configuration`, { configuration: 'lowered', alertId: alertIds.get('failed-done') });
    expect(done.status).toBe(500);
    enqueue.mockRestore();
  });

  it('gives exactly one alert.acknowledged for each way in, and none for the failed commits', async () => {
    // The demo crew first: its late plan acknowledges the first open alert with an action (before Done, never reached here).
    const crew = new DemoCrew({ watch: server.watch, store: (b) => server.queue.enqueue(b), random: () => 0, kindOf: () => 'screen', crew: ['Quay crew member'], competentPerson: 'Quay lead', doneAfterMs: [1e9, 1e9], actionDueMs: 1e9, lateKind: 'screen', calmForMs: 1e9 });
    // Its first open alert is the crew structure's (registered first; openAlerts lists newest first, ties in raise order).
    crew.step(clock + 60_000);
    const picked = await waitFor(() => server.watch.openAlerts().find((a) => a.acknowledgedBy === 'Quay crew member'), 5_000, 'the crew acknowledging');
    expect(picked.id).toBe(alertIds.get('crew'));

    expect((await admin.json('POST', `/api/alerts/${alertIds.get('board')}/acknowledge`, { note: 'seen on the board' })).status).toBe(200);
    const all = await admin.json('POST', '/api/alerts/acknowledge', { structureId: structureOf.get('all'), alertIds: [alertIds.get('all')] });
    expect(all.status).toBe(200);
    expect(all.body.acknowledged.map((a: OpenAlert) => a.id)).toEqual([alertIds.get('all')]);
    expect((await admin.json('POST', `/api/structures/${structureOf.get('done')}/configuration`, { configuration: 'lowered', alertId: alertIds.get('done') })).status).toBe(200);

    const people = await server.storage.people.active();
    const me = people.find((p) => p.username === adminUsername)!;
    const key = await ackSecret(server.storage, clock);
    const link = makeAckToken(key, { alertId: alertIds.get('link')!, personId: me.id, expiresAtMs: clock + 3_600_000 });
    const byLink = await fetch(`${baseUrl}/notify/ack`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ t: link }) });
    expect(byLink.status).toBe(200);
    const button = makePushActionToken(key, { action: 'ack', alertId: alertIds.get('push')!, personId: me.id, expiresAtMs: clock + 3_600_000 });
    const byButton = await fetch(`${baseUrl}/api/push/action`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ t: button }) });
    expect(byButton.status).toBe(200);

    // Held while the disk refuses: counted at once, and notified once, as the stream says so.
    const enqueue = vi.spyOn(server.queue, 'enqueue').mockResolvedValueOnce({ stored: false });
    const held = await admin.json('POST', `/api/alerts/${alertIds.get('held')}/acknowledge`, { note: 'seen while the disk is full' });
    expect(held.status).toBe(200);
    expect(held.body.stored).toBe(false);
    enqueue.mockRestore();

    // The failed acknowledgement from the board, made again: this one is stored.
    expect((await admin.json('POST', `/api/alerts/${alertIds.get('failed-board')}/acknowledge`, { note: 'seen, second try' })).status).toBe(200);

    const acknowledgedWays = paths.filter((w) => w !== 'failed-done');
    const rows = await waitFor(() => {
      const r = outboxRows('alert.acknowledged');
      return acknowledgedWays.every((w) => r.has(alertIds.get(w)!)) ? r : null;
    }, 10_000, 'every alert.acknowledged queued');
    for (const way of acknowledgedWays) expect(rows.get(alertIds.get(way)!), way).toBe(1);
    // The failed "Done" was never committed: nothing of it went out (the rows are queued in order, so it would be there by now).
    expect(rows.has(alertIds.get('failed-done')!)).toBe(false);
    expect(rows.size).toBe(acknowledgedWays.length);

    const sent = await waitFor(() => {
      const acks = received.filter((r) => r.event === 'alert.acknowledged');
      return acks.length >= acknowledgedWays.length ? acks : null;
    }, 10_000, 'the acknowledgements at the receiver');
    expect(sent.map((r) => r.alertId).sort((a, b) => a - b)).toEqual(acknowledgedWays.map((w) => alertIds.get(w)!).sort((a, b) => a - b));
    expect(sent.find((r) => r.alertId === alertIds.get('crew'))?.acknowledgedBy).toBe('Quay crew member');
    expect(sent.find((r) => r.alertId === alertIds.get('link'))?.acknowledgedBy).toBe(me.displayName);
  });

  it('does not notify the alerts restored after a restart as raised again', async () => {
    const raisedBefore = [...outboxRows('alert.raised').values()].reduce((a, b) => a + b, 0);
    const acknowledgedBefore = [...outboxRows('alert.acknowledged').values()].reduce((a, b) => a + b, 0);
    await gateway.endAsync(true);
    await server.close();
    await start();
    await connectGateway();
    expect(server.watch.openAlerts().length).toBeGreaterThanOrEqual(paths.length);
    await publish(13);
    await server.tickNow();
    // Another round of the notifier's queue: whatever the restart caused would be queued by now.
    await new Promise((r) => setTimeout(r, 200));
    expect([...outboxRows('alert.raised').values()].reduce((a, b) => a + b, 0)).toBe(raisedBefore);
    expect([...outboxRows('alert.acknowledged').values()].reduce((a, b) => a + b, 0)).toBe(acknowledgedBefore);
  });
});
