/**
 * Ingest through the embedded broker, end to end: a real MQTT gateway client publishes, the
 * server parses, stores and counts. Contract: design.md section 3.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;
let ownPassword = '';
let otherPassword = '';

function connect(username: string, password: string): Promise<MqttClient> {
  return new Promise((resolve, reject) => {
    const client = mqtt.connect(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username, password, reconnectPeriod: 0, connectTimeout: 3_000 });
    client.once('connect', () => resolve(client));
    client.once('error', (err) => {
      client.end(true);
      reject(err);
    });
  });
}

function storedCount(sensorKey: string): number {
  const row = ts.server.db.$client.prepare('SELECT COUNT(*) AS n FROM readings r JOIN sensors s ON s.id = r.sensor_id WHERE s.key = ?').get(sensorKey) as { n: number };
  return row.n;
}

/** Rejection counts per reason for one sensor, as the API reports them (counted at once in memory). */
async function rejections(sensorKey: string): Promise<Record<string, number>> {
  const res = await api.json('GET', '/api/rejections');
  const out: Record<string, number> = {};
  for (const r of res.body.rejections as Array<{ sensorKey: string; reason: string; count: number }>) if (r.sensorKey === sensorKey) out[r.reason] = r.count;
  return out;
}

beforeAll(async () => {
  ts = await startTestServer();
  api = new ApiClient(ts.baseUrl);
  expect((await api.signIn(adminUsername, adminPassword)).status).toBe(200);
  for (const key of ['gate-mast', 'roof-mast', 'bad-mast']) {
    const res = await api.json('POST', '/api/sensors', { key, name: `Mast ${key}`, heightM: 10 });
    expect(res.status).toBe(201);
  }
  const own = await api.json('POST', '/api/gateways', { name: 'Gate gateway', username: 'gate-gw', sensorKeys: ['gate-mast', 'bad-mast'] });
  expect(own.status).toBe(201);
  ownPassword = own.body.password;
  const other = await api.json('POST', '/api/gateways', { name: 'Roof gateway', username: 'roof-gw', sensorKeys: ['roof-mast'] });
  otherPassword = other.body.password;
});

afterAll(async () => {
  await ts.stop();
});

describe('the embedded broker', () => {
  it('stores exactly what a registered gateway publishes at QoS 1, each reading once', async () => {
    const client = await connect('gate-gw', ownPassword);
    const t0 = Date.now() - 60_000;
    const n = 500;
    await Promise.all(
      Array.from({ length: n }, (_, i) => client.publishAsync('wind/gate-mast/reading', JSON.stringify({ ts: t0 + i * 100, speed: 3 + (i % 10) / 10 }), { qos: 1 })),
    );
    // Every PUBACK came after the commit: the rows are there the moment the publishes resolve.
    expect(storedCount('gate-mast')).toBe(n);
    // Publishing the same readings again (a redelivery) stores nothing twice.
    await Promise.all(Array.from({ length: 50 }, (_, i) => client.publishAsync('wind/gate-mast/reading', JSON.stringify({ ts: t0 + i * 100, speed: 3 + (i % 10) / 10 }), { qos: 1 })));
    expect(storedCount('gate-mast')).toBe(n);
    await client.endAsync();
  });

  it('refuses unknown gateways and wrong passwords at CONNECT', async () => {
    await expect(connect('gate-gw', 'not-the-password-at-all')).rejects.toThrow(/Bad username or password|Not authorized|bad/i);
    await expect(connect('nobody', 'whatever-password-123')).rejects.toThrow();
    const health = await api.json('GET', '/api/health');
    expect(health.body.broker.refusedConnections).toBeGreaterThanOrEqual(2);
  });

  it('refuses a gateway publishing for a sensor it does not own, and stores nothing', async () => {
    const before = storedCount('roof-mast');
    const client = await connect('gate-gw', ownPassword);
    // MQTT 3.1.1 has no negative PUBACK: the broker acknowledges and drops it, keeping the connection.
    await client.publishAsync('wind/roof-mast/reading', JSON.stringify({ ts: Date.now(), speed: 1.5 }), { qos: 1 });
    expect(client.connected).toBe(true);
    client.end(true);
    expect(storedCount('roof-mast')).toBe(before);
    expect((await rejections('roof-mast'))['not-permitted']).toBeGreaterThanOrEqual(1);
    // The rightful gateway still can.
    const owner = await connect('roof-gw', otherPassword);
    await owner.publishAsync('wind/roof-mast/reading', JSON.stringify({ ts: Date.now(), speed: 1.5 }), { qos: 1 });
    expect(storedCount('roof-mast')).toBe(before + 1);
    await owner.endAsync();
  });

  it('rejects every malformed payload kind with its reason, counts it, and stores none of it', async () => {
    const client = await connect('gate-gw', ownPassword);
    const now = Date.now();
    const cases: Array<[string, Buffer | string]> = [
      ['not-json', '{"ts": 1, "speed": '],
      ['bad-utf8', Buffer.from([0x7b, 0xff, 0xfe, 0x7d])],
      ['wrong-shape', '"just a string"'],
      ['unknown-field', JSON.stringify({ ts: now, speed: 3, gusty: 9 })],
      ['out-of-range', JSON.stringify({ ts: now, speed: 500 })],
      ['future-timestamp', JSON.stringify({ ts: now + 3_600_000, speed: 3 })],
      ['too-large', Buffer.alloc(300 * 1024, 0x20)],
      ['too-deep', '[[[[[[[[[[[[1]]]]]]]]]]]]'],
    ];
    const before = storedCount('bad-mast');
    for (const [, payload] of cases) await client.publishAsync('wind/bad-mast/reading', payload, { qos: 1 });
    await client.endAsync();
    expect(storedCount('bad-mast')).toBe(before);
    const seen = await rejections('bad-mast');
    for (const [reason] of cases) expect(seen[reason], reason).toBeGreaterThanOrEqual(1);
    const viaApi = await api.json('GET', '/api/sensors/bad-mast');
    const reasons = (viaApi.body.sensor.rejections as Array<{ reason: string }>).map((r) => r.reason);
    expect(reasons).toEqual(expect.arrayContaining(cases.map(([reason]) => reason)));
    // And they reach the database (flushed once a second), so a restart keeps the counts.
    await waitFor(() => {
      const rows = ts.server.db.$client.prepare("SELECT COUNT(*) AS n FROM rejections WHERE sensor_key = 'bad-mast'").get() as { n: number };
      return rows.n >= cases.length;
    }, 3_000, 'rejection counts stored');
  });

  it('stops taking a revoked gateway at once', async () => {
    const client = await connect('roof-gw', otherPassword);
    const list = await api.json('GET', '/api/gateways');
    const roof = (list.body.gateways as Array<{ id: number; username: string }>).find((g) => g.username === 'roof-gw')!;
    expect((await api.json('DELETE', `/api/gateways/${roof.id}`)).status).toBe(200);
    const before = storedCount('roof-mast');
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()));
    client.publish('wind/roof-mast/reading', JSON.stringify({ ts: Date.now(), speed: 2 }), { qos: 1 });
    await closed;
    client.end(true);
    expect(storedCount('roof-mast')).toBe(before);
    await expect(connect('roof-gw', otherPassword)).rejects.toThrow();
  });

  it('stops the server with a message naming MQTT_PORT and MQTT_URL when its port is taken', async () => {
    await expect(startTestServer({ MQTT_PORT: String(ts.server.mqttPort) })).rejects.toThrow(/MQTT_PORT.*MQTT_URL/s);
  });
});
