/**
 * Alert webhooks (design §4b, issue 16): a level alert raised by real MQTT readings through the
 * embedded broker is POSTed to a local HTTP receiver (node:http on 127.0.0.1) with the contract's
 * body; the receiver checks the HMAC-SHA256 signature itself with node:crypto (RFC 2104 HMAC,
 * FIPS 180-4 SHA-256, as the README tells a receiver to), answers 500 once and gets the retry with
 * the same delivery id; a delivery still in flight when the server stops is delivered after the
 * next start. Real broker, real SQLite, real HTTP; nothing mocked.
 *
 * The screen and its ladder are those of tests/integration/configurations-live.test.ts: 13 m/s
 * is above its "Lower the screen" trigger (level 2), 14.5 m/s above "Stop and clear" (level 3).
 */
import { createHmac, timingSafeEqual } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { configFromEnv } from '../../server/config.ts';
import { createLogger } from '../../server/log.ts';
import { startServer, type RunningServer } from '../../server/runtime.ts';
import { ApiClient, adminPassword, adminUsername, waitFor } from '../helpers/testServer.ts';
import { harbourScreenPlain, harbourLevelsPlain } from '../helpers/harbourScreen.ts';

const secret = 'test-webhook-secret-0123456789';
let clock = Date.UTC(2026, 6, 18, 14, 0, 0);

interface Received {
  path: string;
  headers: http.IncomingHttpHeaders;
  raw: string;
  body: any;
  answered: number | 'hung';
}
const received: Received[] = [];
/** What the receiver answers next, per path: a status, or 'hang' (never answers). */
const answers: Array<number | 'hang'> = [];
let receiver: http.Server;
let receiverUrl = '';
const hung: http.ServerResponse[] = [];

let dataDir = '';
let server: RunningServer;
let baseUrl = '';
let admin: ApiClient;
let gateway: MqttClient;
let gatewayPassword = '';
let screenId = 0;

const screen = harbourScreenPlain;
const levels = harbourLevelsPlain;

function env(): NodeJS.ProcessEnv {
  return { DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', MQTT_PORT: '0', MQTT_HOST: '127.0.0.1', ADMIN_USERNAME: adminUsername, ADMIN_PASSWORD: adminPassword, ALERT_WEBHOOK_URL: `${receiverUrl}/hook`, ALERT_WEBHOOK_SECRET: secret };
}

async function start(): Promise<void> {
  server = await startServer(configFromEnv(env()), createLogger(process.env.TEST_LOG_LEVEL ?? 'silent'), { now: () => clock, tickMs: 60_000, staticRoot: null });
  baseUrl = `http://127.0.0.1:${server.httpPort}`;
  admin = new ApiClient(baseUrl);
  expect((await admin.signIn(adminUsername, adminPassword)).status).toBe(200);
}

async function publish(gustMps: number): Promise<void> {
  clock += 1_000;
  await gateway.publishAsync('wind/harbour-mast/reading', JSON.stringify({ ts: clock, speed: gustMps / 1.5, gust: gustMps, dir: 250 }), { qos: 1 });
}

/** The receiver's own check, as a webhook consumer would write it (README "Alert webhooks"). */
function signatureValid(r: Received, key: string): boolean {
  const timestamp = String(r.headers['x-signature-timestamp']);
  const expected = Buffer.from(`sha256=${createHmac('sha256', key).update(`${timestamp}.${r.raw}`).digest('hex')}`);
  const given = Buffer.from(String(r.headers['x-signature']));
  const fresh = Math.abs(Date.now() / 1000 - Number(timestamp)) <= 300;
  return fresh && given.length === expected.length && timingSafeEqual(given, expected);
}

beforeAll(async () => {
  receiver = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const raw = Buffer.concat(chunks).toString('utf8');
      const answer = answers.shift() ?? 200;
      received.push({ path: req.url ?? '', headers: req.headers, raw, body: JSON.parse(raw), answered: answer === 'hang' ? 'hung' : answer });
      if (answer === 'hang') hung.push(res);
      else res.writeHead(answer, { 'content-type': 'text/plain' }).end(answer === 200 ? 'ok' : 'no');
    });
  });
  await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  receiverUrl = `http://127.0.0.1:${(receiver.address() as { port: number }).port}`;
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-notify-webhook-'));
  await start();
  await admin.json('POST', '/api/sensors', { key: 'harbour-mast', name: 'Harbour mast', heightM: 10 });
  const gw = await admin.json('POST', '/api/gateways', { name: 'Harbour gateway', username: 'harbour-gw', sensorKeys: ['harbour-mast'] });
  gatewayPassword = gw.body.password;
  const created = await admin.json('POST', '/api/structures', { record: screen, orientationDeg: 250, levels });
  expect(created.status).toBe(201);
  screenId = created.body.structure.id;
  gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${server.mqttPort}`, { username: 'harbour-gw', password: gatewayPassword, reconnectPeriod: 0 });
});

afterAll(async () => {
  await gateway?.endAsync(true).catch(() => undefined);
  for (const res of hung) res.destroy();
  await server?.close().catch(() => undefined);
  await new Promise((resolve) => receiver?.close(resolve));
  receiver?.closeAllConnections();
  if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('the alert webhook', () => {
  let raised: Received[] = [];

  it('POSTs a real level alert with the contract body, signed; a 500 is retried with the same id', async () => {
    answers.push(500);
    for (let i = 0; i < 4; i++) await publish(13);
    // The first answer was 500; the retry (5 s later by the default schedule) is answered 200.
    const delivered = await waitFor(() => received.find((r) => r.path === '/hook' && r.body.event === 'alert.raised' && r.body.alert.level === 2 && r.answered === 200), 20_000, 'the retried alert.raised');
    raised = received.filter((r) => r.path === '/hook' && r.body.id === delivered.body.id);
    expect(raised.map((r) => r.answered)).toEqual([500, 200]);
    expect(raised[0]!.raw).toBe(raised[1]!.raw);

    for (const r of raised) {
      expect(r.headers['content-type']).toBe('application/json');
      expect(String(r.headers['x-signature'])).toMatch(/^sha256=[0-9a-f]{64}$/);
      expect(String(r.headers['x-signature-timestamp'])).toMatch(/^[0-9]{10}$/);
      expect(signatureValid(r, secret)).toBe(true);
      // A signature made with another key, or over another body, does not pass.
      expect(signatureValid(r, `${secret}x`)).toBe(false);
      expect(signatureValid({ ...r, raw: r.raw.replace('"level":2', '"level":1') }, secret)).toBe(false);
    }

    const body = delivered.body;
    expect(Object.keys(body)).toEqual(['id', 'event', 'atMs', 'site', 'alert']);
    expect(body.id).toMatch(/^[0-9a-f-]{36}$/);
    expect(Object.keys(body.site)).toEqual(['name']);
    expect(typeof body.site.name).toBe('string');
    const allowed = ['id', 'kind', 'level', 'label', 'action', 'gustMps', 'structure', 'sensorKey', 'acknowledgedBy', 'note'];
    expect(Object.keys(body.alert).every((k) => allowed.includes(k))).toBe(true);
    // The level's own action first; the gust passed Prepare at once, so its action follows (watch.ts escalationAction).
    expect(body.alert).toMatchObject({ kind: 'level', level: 2, label: 'Lower the screen', action: expect.stringMatching(/^Lower the LED wall to its bottom stop\.\nThe gust passed Prepare at once/), structure: { id: screenId, name: 'Harbour stage LED wall' } });
    expect(Object.keys(body.alert.structure)).toEqual(['id', 'name']);
    expect(body.alert.gustMps).toBeCloseTo(13, 1);
    expect(body.alert.acknowledgedBy).toBeUndefined();
    const stored = (await admin.json('GET', '/api/live')).body.alerts.find((a: any) => a.id === body.alert.id);
    expect(stored.raisedAtMs).toBe(body.atMs);

    const deliveries = await admin.json('GET', `/api/notify/deliveries?alertId=${body.alert.id}`);
    expect(deliveries.status).toBe(200);
    const row = deliveries.body.deliveries.find((d: any) => d.deliveryId === body.id);
    expect(row).toMatchObject({ channel: 'webhook', target: 'webhook:env', event: 'alert.raised', status: 'delivered', attempts: 2 });
    expect(row.attemptLog.map((a: any) => [a.ok, a.result])).toEqual([
      [false, 'HTTP 500'],
      [true, 'HTTP 200'],
    ]);
    const health = (await admin.json('GET', '/api/health')).body;
    expect(health.notify.failed).toBe(0);
    expect(health.notify.lastError).toMatchObject({ target: 'webhook:env', result: 'HTTP 500' });
  }, 30_000);

  it('sends the acknowledgement after the alert, with who acknowledged it and the note', async () => {
    const alertId = raised[0]!.body.alert.id;
    const ack = await admin.json('POST', `/api/alerts/${alertId}/acknowledge`, { note: 'crew on the way' });
    expect(ack.status).toBe(200);
    const acknowledged = await waitFor(() => received.find((r) => r.body.event === 'alert.acknowledged' && r.body.alert.id === alertId), 10_000, 'alert.acknowledged');
    expect(signatureValid(acknowledged, secret)).toBe(true);
    expect(acknowledged.body.alert.acknowledgedBy).toBe(ack.body.alert.acknowledgedBy);
    expect(acknowledged.body.alert.note).toBe('crew on the way');
    expect(acknowledged.body.atMs).toBe(ack.body.alert.acknowledgedAtMs);
    // In order per alert: raised was delivered before acknowledged was sent.
    const events = received.filter((r) => r.body.alert?.id === alertId && r.answered === 200).map((r) => r.body.event);
    expect(events.indexOf('alert.raised')).toBeLessThan(events.indexOf('alert.acknowledged'));
  });

  it('keeps a webhook added in the app to its own secret and filter', async () => {
    const made = await admin.json('POST', '/api/notify/webhooks', { name: 'Radio room', url: `${receiverUrl}/radio`, filter: { kind: 'levels', atLeast: 3 } });
    expect(made.status).toBe(201);
    expect(made.body.secret).toMatch(/^whsec_/);
    const list = await admin.json('GET', '/api/notify/webhooks');
    expect(JSON.stringify(list.body)).not.toContain(made.body.secret);
    expect(list.body.webhooks.map((w: any) => w.id)).toEqual(['env', made.body.webhook.id]);
    const bad = await admin.json('POST', '/api/notify/webhooks', { name: 'x', url: 'ftp://radio', filter: { kind: 'levels', atLeast: 0 } });
    expect(bad.status).toBe(400);
    expect(bad.body.issues.map((i: any) => i.path).sort()).toEqual(['filter.atLeast', 'url']);

    const test = await admin.json('POST', `/api/notify/webhooks/${made.body.webhook.id}/test`);
    expect(test.status).toBe(202);
    const got = await waitFor(() => received.find((r) => r.path === '/radio' && r.body.id === test.body.deliveryId), 10_000, 'the test message');
    expect(got.body.event).toBe('test');
    expect(signatureValid(got, made.body.secret)).toBe(true);
    expect(signatureValid(got, secret)).toBe(false);
    // The level 2 alert did not pass its filter (levels ≥ 3): nothing was queued for it.
    const rows = (await admin.json('GET', '/api/notify/deliveries')).body.deliveries.filter((d: any) => d.target === `webhook:${made.body.webhook.id}`);
    expect(rows.map((d: any) => d.event)).toEqual(['test']);
  });

  it('delivers after a restart what was still being sent when the server stopped', async () => {
    answers.push('hang', 'hang', 'hang', 'hang');
    await publish(14.5);
    await publish(14.5);
    const hanging = await waitFor(() => received.find((r) => r.path === '/hook' && r.answered === 'hung'), 10_000, 'a delivery in flight');
    await gateway.endAsync(true);
    await server.close();
    const db = new (await import('better-sqlite3')).default(path.join(dataDir, 'holdfast.sqlite'), { readonly: true });
    const row = db.prepare('SELECT status, attempts FROM notify_outbox WHERE delivery_id = ?').get(hanging.body.id) as { status: string; attempts: number };
    db.close();
    expect(row).toEqual({ status: 'pending', attempts: 0 });
    answers.length = 0;
    for (const res of hung) res.destroy();

    await start();
    const after = await waitFor(() => received.find((r) => r.body.id === hanging.body.id && r.answered === 200), 10_000, 'the delivery after the restart');
    expect(after.raw).toBe(hanging.raw);
    expect(signatureValid(after, secret)).toBe(true);
    await waitFor(async () => (await admin.json('GET', '/api/health')).body.notify.pending === 0, 10_000, 'the outbox emptied');
  }, 30_000);
});
