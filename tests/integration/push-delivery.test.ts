/**
 * Web Push delivery (design §4b, issue 16) to a push endpoint of our own: a node:http server on
 * 127.0.0.1 plays the push service (RFC 8030 §5: it takes a POST of the encrypted message and
 * answers 201). A crew member's "phone" subscribes with a P-256 key pair and auth secret made
 * here, as PushManager makes them; a level alert raised by real MQTT readings (the embedded
 * broker) reaches the endpoint; the endpoint checks the VAPID header as a push service does
 * (RFC 8292 §2–3: ES256 over header and claims, aud the endpoint's origin, exp within 24 h, sub)
 * and the phone decrypts the message with its private key and auth secret (RFC 8291, our own
 * decoder in tests/helpers/webPushCrypto.ts, checked against RFC 8291 appendix A in
 * tests/unit/webPush.test.ts). The message's Acknowledge button, posted as the service worker
 * posts it (no cookie), acknowledges the alert; pressed again it is refused; "Done: lowered"
 * switches the screen's configuration as the app's Done does; an expired button is refused.
 * A subscription the service answers 410 for is removed; a 500 is retried.
 *
 * The screen and its ladder are those of tests/integration/configurations-live.test.ts (13 m/s
 * at the mast: level 2, "Lower the screen", whose action moves it to "lowered").
 */
import http from 'node:http';
import { randomBytes } from 'node:crypto';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';
import { browserKeys, decryptAes128gcm, verifyVapid } from '../helpers/webPushCrypto.ts';
import { harbourScreen, harbourLevels } from '../helpers/harbourScreen.ts';

let clock = Date.UTC(2026, 6, 18, 14, 0, 0);
let ts: TestServer;
let admin: ApiClient;
let ana: ApiClient;
let gateway: MqttClient;
let pushService: http.Server;
let pushBase = '';
let screenId = 0;
let vapidPublicKey = '';

const subject = 'mailto:site-office@harbour-festival.example';
const phone = browserKeys(randomBytes(16));
const tablet = browserKeys(randomBytes(16));
const oldPhone = browserKeys(randomBytes(16));

interface Received {
  path: string;
  headers: http.IncomingHttpHeaders;
  body: Buffer;
  answered: number;
}
const received: Received[] = [];
let flakyCalls = 0;

const screen = harbourScreen;
const levels = harbourLevels;

async function publish(gustMps: number): Promise<void> {
  clock += 1_000;
  await gateway.publishAsync('wind/harbour-mast/reading', JSON.stringify({ ts: clock, speed: gustMps / 1.5, gust: gustMps, dir: 250 }), { qos: 1 });
}

/** What the phone's browser would hand its service worker: the decrypted message. */
function open(r: Received, keys = phone): any {
  return JSON.parse(decryptAes128gcm(r.body, keys.uaPrivate, keys.authSecret).plaintext.toString('utf8'));
}

/** A button pressed on the lock screen: the service worker's POST, without the session cookie. */
async function press(token: string): Promise<{ status: number; body: any }> {
  const res = await fetch(`${ts.baseUrl}/api/push/action`, { method: 'POST', headers: { 'content-type': 'application/json', 'sec-fetch-site': 'same-origin' }, body: JSON.stringify({ t: token }) });
  return { status: res.status, body: await res.json() };
}

beforeAll(async () => {
  pushService = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const path = req.url ?? '';
      let status = 201;
      if (path.startsWith('/push/gone')) status = 410;
      if (path.startsWith('/push/flaky') && ++flakyCalls === 1) status = 500;
      received.push({ path, headers: req.headers, body: Buffer.concat(chunks), answered: status });
      res.writeHead(status, status === 201 ? { location: `${pushBase}/message/${received.length}` } : {});
      res.end();
    });
  });
  await new Promise<void>((resolve) => pushService.listen(0, '127.0.0.1', resolve));
  pushBase = `http://127.0.0.1:${(pushService.address() as { port: number }).port}`;

  ts = await startTestServer({ VAPID_SUBJECT: subject }, { now: () => clock, tickMs: 60_000, notify: { retryDelaysMs: [300, 600, 1_200] } });
  admin = new ApiClient(ts.baseUrl);
  await admin.signIn(adminUsername, adminPassword);
  await admin.json('POST', '/api/sensors', { key: 'harbour-mast', name: 'Harbour mast', heightM: 10 });
  const gw = await admin.json('POST', '/api/gateways', { name: 'Harbour gateway', username: 'harbour-gw', sensorKeys: ['harbour-mast'] });
  const created = await admin.json('POST', '/api/structures', { record: screen, orientationDeg: 250, levels });
  expect(created.status).toBe(201);
  screenId = created.body.structure.id;
  expect((await admin.json('POST', '/api/people', { username: 'rigger-ana', displayName: 'Ana (rigger)', role: 'crew', password: 'rigger-ana-password-1' })).status).toBe(201);
  ana = new ApiClient(ts.baseUrl);
  expect((await ana.signIn('rigger-ana', 'rigger-ana-password-1')).status).toBe(200);
  gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'harbour-gw', password: gw.body.password, reconnectPeriod: 0 });
});

afterAll(async () => {
  await gateway?.endAsync(true).catch(() => undefined);
  await ts?.stop();
  await new Promise<void>((resolve) => (pushService ? pushService.close(() => resolve()) : resolve()));
});

describe('Web Push from a real alert to a push endpoint', () => {
  it('gives the VAPID public key, and takes the phone\'s subscriptions (refusing a malformed one by field)', async () => {
    const key = (await fetch(`${ts.baseUrl}/api/push/key`).then((r) => r.json())) as { enabled: boolean; publicKey: string };
    expect(key.enabled).toBe(true);
    expect(Buffer.from(key.publicKey, 'base64url')).toHaveLength(65);
    vapidPublicKey = key.publicKey;

    const sub = (keys: typeof phone, path: string) => ({ endpoint: `${pushBase}${path}`, expirationTime: null, keys: { p256dh: keys.p256dh, auth: keys.auth } });
    const made = await ana.json('POST', '/api/me/push-subscriptions', { subscription: sub(phone, '/push/ana-phone'), label: 'Ana\'s phone' });
    expect(made.status).toBe(201);
    expect((await ana.json('POST', '/api/me/push-subscriptions', { subscription: sub(tablet, '/push/flaky-tablet'), label: 'Crew tablet' })).status).toBe(201);
    expect((await ana.json('POST', '/api/me/push-subscriptions', { subscription: sub(oldPhone, '/push/gone-old-phone'), label: 'Old phone' })).status).toBe(201);
    // The same browser subscribing again renews its row, not a second one.
    expect((await ana.json('POST', '/api/me/push-subscriptions', { subscription: sub(phone, '/push/ana-phone'), label: 'Ana\'s phone' })).status).toBe(200);
    const bad = await ana.json('POST', '/api/me/push-subscriptions', { subscription: { endpoint: 'http://push.service.example/x', keys: { p256dh: 'AAAA', auth: phone.auth } }, label: 'x' });
    expect(bad.status).toBe(400);
    expect(bad.body.issues.map((i: { path: string }) => i.path).sort()).toEqual(['subscription.endpoint', 'subscription.keys.p256dh']);
    const list = await ana.json('GET', '/api/me/push-subscriptions');
    expect(list.body.subscriptions.map((s: { label: string }) => s.label)).toEqual(['Ana\'s phone', 'Crew tablet', 'Old phone']);
    // Another person does not see (or remove) Ana's devices.
    expect((await admin.json('DELETE', `/api/me/push-subscriptions/${made.body.subscription.id}`)).status).toBe(404);
  });

  it('a test push reaches the phone from the person\'s settings', async () => {
    const list = await ana.json('GET', '/api/me/push-subscriptions');
    const id = list.body.subscriptions.find((s: { label: string }) => s.label === 'Ana\'s phone').id;
    const test = await ana.json('POST', `/api/me/push-subscriptions/${id}/test`);
    expect(test.status).toBe(202);
    const got = await waitFor(() => received.find((r) => r.path === '/push/ana-phone' && open(r).type === 'test'), 10_000, 'the test push');
    expect(open(got)).toMatchObject({ type: 'test', buttons: [], tag: 'test' });
  });

  let raised: Received;
  let message: any;

  it('delivers the level alert raised over MQTT: VAPID verified, decrypted with the phone\'s keys, with structure, level, gust, action and buttons', async () => {
    for (let i = 0; i < 4; i++) await publish(13);
    raised = await waitFor(() => received.find((r) => r.path === '/push/ana-phone' && r.body.length > 0 && open(r).event === 'alert.raised'), 10_000, 'the alert push');
    // RFC 8030 §5 and RFC 8291 §4 headers.
    expect(raised.headers['content-encoding']).toBe('aes128gcm');
    expect(raised.headers['content-type']).toBe('application/octet-stream');
    expect(Number(raised.headers.ttl)).toBe(7200);
    expect(raised.headers.urgency).toBe('high');
    expect(raised.headers.topic).toMatch(/^alert[0-9]+$/);
    // RFC 8292: the push service's check of the sender.
    const vapid = verifyVapid(String(raised.headers.authorization), `${pushBase}/push/ana-phone`, Date.now());
    expect(vapid.publicKey).toBe(vapidPublicKey);
    expect(vapid.claims.aud).toBe(pushBase);
    expect(vapid.claims.sub).toBe(subject);

    message = open(raised);
    expect(message).toMatchObject({
      v: 1,
      type: 'alert',
      event: 'alert.raised',
      tag: `alert-${message.alert.id}`,
      url: `/#/structure/${screenId}`,
      requireInteraction: true,
      actionUrl: '/api/push/action',
      alert: { kind: 'level', level: 2, label: 'Lower the screen', structure: { id: screenId, name: 'Harbour stage LED wall' }, moveToConfiguration: 'lowered', actionDone: false },
    });
    expect(message.alert.gustMps).toBeCloseTo(13, 1);
    // The level's action first (the watch adds the actions of a level the gust jumped past).
    expect(message.alert.action.startsWith('Lower the LED wall to its bottom stop.')).toBe(true);
    expect(message.body.startsWith('ACTION: Lower the LED wall to its bottom stop.')).toBe(true);
    expect(message.buttons.map((b: { action: string; title: string }) => [b.action, b.title])).toEqual([['ack', 'Acknowledge'], ['done', 'Done: lowered']]);
    // Two hours from when it was queued, at the alert or just after (ackTokens.ts: as long as an e-mail link).
    expect(message.buttonsExpireAtMs).toBeGreaterThanOrEqual(message.atMs + 2 * 3_600_000);
    expect(message.buttonsExpireAtMs).toBeLessThanOrEqual(clock + 2 * 3_600_000);
    // The other phone cannot read what was sent to this one.
    expect(() => open(raised, tablet)).toThrow();
  });

  it('retries a push the service answered 500 for, and removes a subscription it answered 410 for', async () => {
    const tabletPush = await waitFor(() => received.filter((r) => r.path === '/push/flaky-tablet' && r.answered === 201).find((r) => open(r, tablet).event === 'alert.raised'), 10_000, 'the retried tablet push');
    expect(open(tabletPush, tablet).alert.id).toBe(message.alert.id);
    expect(received.some((r) => r.path === '/push/flaky-tablet' && r.answered === 500)).toBe(true);
    await waitFor(() => received.find((r) => r.path === '/push/gone-old-phone'), 10_000, 'the push to the old phone');
    const list = await waitFor(async () => {
      const l = await ana.json('GET', '/api/me/push-subscriptions');
      return l.body.subscriptions.length === 2 ? l : null;
    }, 10_000, 'the gone subscription removed');
    expect(list.body.subscriptions.map((s: { label: string }) => s.label)).toEqual(['Ana\'s phone', 'Crew tablet']);
    const deliveries = await admin.json('GET', `/api/notify/deliveries?alertId=${message.alert.id}`);
    const gone = deliveries.body.deliveries.find((d: { channel: string; status: string }) => d.channel === 'push' && d.status === 'failed');
    expect(gone.attemptLog).toHaveLength(1);
    expect(gone.lastError).toMatch(/^HTTP 410/);
    const health = await admin.json('GET', '/api/health');
    expect(health.body.notify.push).toEqual({ enabled: true, subscriptions: 2, problem: null });
  });

  it('acknowledges from the notification\'s button without a session; the same button again is refused', async () => {
    const ack = message.buttons.find((b: { action: string }) => b.action === 'ack').token;
    const first = await press(ack);
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ action: 'ack', by: 'Ana (rigger)' });
    const alert = (await ana.json('GET', '/api/live')).body.alerts.find((a: { id: number }) => a.id === message.alert.id);
    expect(alert.acknowledgedBy).toBe('Ana (rigger)');
    expect(alert.acknowledgeNote).toBe('acknowledged from the push notification');
    const again = await press(ack);
    expect(again.status).toBe(409);
    expect(again.body.error).toMatch(/already used/);
    // The audit trail says how it was acknowledged.
    const audit = await admin.json('GET', `/api/log/audit?from=${clock - 3_600_000}&to=${clock + 60_000}`);
    expect(audit.body.audit.filter((r: { actor: string }) => r.actor === 'Ana (rigger) (rigger-ana) by push notification')).toHaveLength(1);
    // A forged or garbled token is refused.
    expect((await press(ack.slice(0, -2) + (ack.endsWith('A') ? 'BB' : 'AA'))).status).toBe(403);
    expect((await press('not-a-token')).status).toBe(400);
  });

  it('the acknowledgement reaches the phone quietly, with "Done: lowered" still to press; Done switches the screen and works once', async () => {
    const update = await waitFor(() => received.filter((r) => r.path === '/push/ana-phone').map((r) => open(r)).find((m) => m.event === 'alert.acknowledged' && m.alert.id === message.alert.id), 10_000, 'the acknowledged push');
    expect(update).toMatchObject({ silent: true, requireInteraction: false, tag: message.tag, alert: { acknowledgedBy: 'Ana (rigger)' } });
    expect(update.buttons.map((b: { title: string }) => b.title)).toEqual(['Done: lowered']);
    const done = await press(update.buttons[0].token);
    expect(done.status).toBe(200);
    expect(done.body.action).toBe('done');
    const live = (await ana.json('GET', '/api/live')).body;
    expect(live.structures.find((s: { id: number }) => s.id === screenId).configuration).toBe('lowered');
    expect(live.alerts.find((a: { id: number }) => a.id === message.alert.id).actionDoneBy).toBe('Ana (rigger)');
    const log = await admin.json('GET', `/api/log/configurations?from=${clock - 3_600_000}&to=${clock + 60_000}`);
    expect(log.body.configurationChanges).toEqual([expect.objectContaining({ structureId: screenId, from: 'raised', to: 'lowered', by: 'Ana (rigger)', reason: 'action-done', alertId: message.alert.id })]);
    expect((await press(update.buttons[0].token)).status).toBe(409);
    // The first notification's own Done button: the action is done already.
    const firstDone = await press(message.buttons.find((b: { action: string }) => b.action === 'done').token);
    expect(firstDone.status).toBe(409);
    expect(firstDone.body.error).toMatch(/already done by Ana/);
  });

  it('a button past its 2 hours is refused as expired', async () => {
    clock += 2 * 3_600_000 + 1_000;
    const late = await press(message.buttons.find((b: { action: string }) => b.action === 'done').token);
    expect(late.status).toBe(410);
    expect(late.body.error).toMatch(/expired/);
  });
});
