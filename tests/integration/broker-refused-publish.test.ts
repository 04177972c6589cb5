/**
 * One refused publish must not block a gateway (issue 13 item 1): the release closed the
 * connection on a refused QoS 1 PUBLISH; mqtt.js (like most gateways) resends unacknowledged QoS 1
 * messages first on reconnect (MQTT 3.1.1 §4.4), was refused again, and the 19 good readings
 * behind it were never stored (0 stored, 20 disconnects). MQTT 3.1.1 has no negative PUBACK
 * (§3.4), so the broker acknowledges and drops it. And a new gateway password ends connections
 * made with the old one (issue 13 item 4). Real aedes broker, real mqtt.js, 127.0.0.1.
 * Scenario (invented): Harrowmere Showfield's gate gateway still publishing for a retired mast.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;
let gatewayId = 0;
let gatePassword = '';

function connect(password: string, reconnectPeriod = 0): Promise<MqttClient> {
  return new Promise((resolve, reject) => {
    const client = mqtt.connect(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { reconnectPeriod, connectTimeout: 5_000, protocolVersion: 4, username: 'gate-gw', password, clientId: 'gate-gw-1', clean: true });
    client.once('connect', () => resolve(client));
    client.once('error', (err) => {
      client.end(true);
      reject(err);
    });
  });
}

const stored = (key: string): number =>
  (ts.server.db.$client.prepare('SELECT COUNT(*) AS n FROM readings r JOIN sensors s ON s.id = r.sensor_id WHERE s.key = ?').get(key) as { n: number }).n;

beforeAll(async () => {
  ts = await startTestServer();
  api = new ApiClient(ts.baseUrl);
  expect((await api.signIn(adminUsername, adminPassword)).status).toBe(200);
  for (const key of ['gate-mast', 'old-mast']) expect((await api.json('POST', '/api/sensors', { key, name: key, heightM: 6 })).status).toBe(201);
  const gate = await api.json('POST', '/api/gateways', { name: 'Gate gateway', username: 'gate-gw', sensorKeys: ['gate-mast', 'old-mast'] });
  gatewayId = gate.body.gateway.id;
  gatePassword = gate.body.password;
  // The old mast is taken off the gateway; the gateway still publishes for it.
  expect((await api.json('PATCH', `/api/gateways/${gatewayId}`, { sensorKeys: ['gate-mast'] })).status).toBe(200);
});

afterAll(async () => {
  await ts?.stop();
});

describe('a refused publish', () => {
  it('one message for a sensor the gateway no longer owns, then 19 good readings: all 19 stored, not one disconnect', async () => {
    const client = await connect(gatePassword, 200);
    let closes = 0;
    client.on('close', () => closes++);
    const t0 = Date.now();
    await client.publishAsync('wind/old-mast/reading', JSON.stringify({ ts: t0, speed: 6.1 }), { qos: 1 });
    for (let i = 1; i <= 19; i++) await client.publishAsync('wind/gate-mast/reading', JSON.stringify({ ts: t0 + i * 1000, speed: 5 + i / 10 }), { qos: 1 });
    await waitFor(() => stored('gate-mast') === 19, 10_000, '19 good readings stored');
    expect(closes).toBe(0);
    expect(stored('old-mast')).toBe(0);
    client.end(true);
    const health = (await api.json('GET', '/api/health')).body;
    expect(health.broker.droppedPublishes).toBeGreaterThanOrEqual(1);
  }, 30_000);
});

describe('rotating a gateway password', () => {
  it('ends the connection made with the old password: nothing it publishes afterwards is stored', async () => {
    const client = await connect(gatePassword);
    const before = stored('gate-mast');
    await client.publishAsync('wind/gate-mast/reading', JSON.stringify({ ts: Date.now(), speed: 4.2 }), { qos: 1 });
    await waitFor(() => stored('gate-mast') === before + 1, 5_000, 'reading before the rotation stored');
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()));
    const rotated = await api.json('PATCH', `/api/gateways/${gatewayId}`, { newPassword: true });
    expect(rotated.status).toBe(200);
    client.publish('wind/gate-mast/reading', JSON.stringify({ ts: Date.now() + 1000, speed: 4.4 }), { qos: 1 });
    await closed;
    client.end(true);
    expect(stored('gate-mast')).toBe(before + 1);
    // The new password works; the old one no longer signs in.
    const fresh = await connect(rotated.body.password);
    fresh.end(true);
    await expect(connect(gatePassword)).rejects.toThrow(/Bad username or password|Not authorized/i);
  }, 30_000);
});

describe('client ids belong to their gateway (issue 13 item 5)', () => {
  it('another gateway connecting with a client id in use is refused (CONNACK 2, identifier rejected), and the first stays connected', async () => {
    const roof = await api.json('POST', '/api/gateways', { name: 'Roof gateway', username: 'roof-gw', sensorKeys: [] });
    expect(roof.status).toBe(201);
    const rotated = await api.json('PATCH', `/api/gateways/${gatewayId}`, { newPassword: true });
    const gate = await connect(rotated.body.password);
    let gateClosed = false;
    gate.on('close', () => (gateClosed = true));
    const intruder = new Promise<string>((resolve) => {
      const c = mqtt.connect(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { reconnectPeriod: 0, connectTimeout: 5_000, protocolVersion: 4, username: 'roof-gw', password: roof.body.password, clientId: 'gate-gw-1' });
      c.once('connect', () => (c.end(true), resolve('connected')));
      c.once('error', (err) => (c.end(true), resolve(String(err))));
    });
    expect(await intruder).toMatch(/Identifier rejected/i);
    await new Promise((r) => setTimeout(r, 200));
    expect(gateClosed).toBe(false);
    expect(gate.connected).toBe(true);
    // The same gateway reconnecting with its own client id takes over its session as MQTT says (3.1.4-2).
    const again = await connect(rotated.body.password);
    again.end(true);
    gate.end(true);
    const refusals = (await api.json('GET', '/api/refusals')).body.refusals as Array<{ reason: string; username: string }>;
    expect(refusals.some((r) => r.reason === 'client-id-taken' && r.username === 'roof-gw')).toBe(true);
  }, 30_000);
});
