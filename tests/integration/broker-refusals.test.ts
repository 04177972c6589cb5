/**
 * What the embedded broker refuses is recorded with who, when, which topic and why, for the
 * Sensors screen (GET /api/refusals): a real mqtt.js client against the server's own aedes
 * broker. Logins are refused with the CONNACK return codes of MQTT 3.1.1 section 3.2.2.3 (4: bad
 * user name or password; 1: unacceptable protocol version). Acceptance is unchanged: nothing
 * refused is stored. Of a refused publish only a short excerpt of its payload is kept.
 *
 * Scenario (invented): Brackenfold Common's gate gateway, a mistyped password, a gateway that
 * publishes for a mast nobody registered, and a laptop that tries to subscribe.
 */
import mqtt, { type IClientOptions, type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrokerRefusals, excerptBytes, payloadExcerpt } from '../../server/ingest/rejections.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;
let gatePassword = '';

interface Refusal {
  kind: string;
  reason: string;
  detail: string;
  clientId: string | null;
  username: string | null;
  address: string | null;
  topic: string | null;
  excerpt: string | null;
  count: number;
  firstAtMs: number;
  lastAtMs: number;
}

function connect(options: IClientOptions): Promise<MqttClient> {
  return new Promise((resolve, reject) => {
    const client = mqtt.connect(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { reconnectPeriod: 0, connectTimeout: 3_000, protocolVersion: 4, ...options });
    client.once('connect', () => resolve(client));
    client.once('error', (err) => {
      client.end(true);
      reject(err);
    });
  });
}

async function refusals(): Promise<{ refusals: Refusal[]; total: number; broker: string }> {
  const res = await api.json('GET', '/api/refusals');
  expect(res.status).toBe(200);
  return res.body;
}

const storedReadings = (): number => (ts.server.db.$client.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n;

beforeAll(async () => {
  ts = await startTestServer();
  api = new ApiClient(ts.baseUrl);
  expect((await api.signIn(adminUsername, adminPassword)).status).toBe(200);
  for (const key of ['gate-mast', 'roof-mast']) expect((await api.json('POST', '/api/sensors', { key, name: `Mast ${key}`, heightM: 10 })).status).toBe(201);
  const gate = await api.json('POST', '/api/gateways', { name: 'Gate gateway', username: 'gate-gw', sensorKeys: ['gate-mast'] });
  gatePassword = gate.body.password;
  expect((await api.json('POST', '/api/gateways', { name: 'Roof gateway', username: 'roof-gw', sensorKeys: ['roof-mast'] })).status).toBe(201);
});

afterAll(async () => {
  await ts?.stop();
});

describe('refusals at the embedded broker', () => {
  it('records a wrong password with the username, client id and address, once per who and why, with a count', async () => {
    for (let i = 0; i < 3; i++) {
      await expect(connect({ username: 'gate-gw', password: 'not-the-password-at-all', clientId: `gate-gw-try-${i}` })).rejects.toThrow(/Bad username or password/i);
    }
    const answer = await refusals();
    expect(answer.broker).toBe('embedded');
    const wrong = answer.refusals.filter((r) => r.kind === 'connect' && r.reason === 'wrong-password');
    expect(wrong).toHaveLength(1);
    expect(wrong[0]).toMatchObject({ username: 'gate-gw', address: '127.0.0.1', clientId: 'gate-gw-try-2', topic: null, excerpt: null, count: 3 });
    expect(wrong[0]!.detail).toMatch(/wrong password for gateway "gate-gw"/);
    expect(wrong[0]!.firstAtMs).toBeLessThanOrEqual(wrong[0]!.lastAtMs);
    // The password typed is never kept.
    expect(JSON.stringify(answer)).not.toContain('not-the-password-at-all');
  });

  it('records an unknown username and a login without a username apart', async () => {
    await expect(connect({ username: 'nobody-gw', password: 'whatever-password-123', clientId: 'stray-laptop' })).rejects.toThrow();
    await expect(connect({ clientId: 'anonymous-probe' })).rejects.toThrow();
    const list = (await refusals()).refusals;
    expect(list.find((r) => r.reason === 'unknown-username')).toMatchObject({ kind: 'connect', username: 'nobody-gw', clientId: 'stray-laptop' });
    expect(list.find((r) => r.reason === 'no-username')).toMatchObject({ kind: 'connect', username: null, clientId: 'anonymous-probe' });
  });

  it('records an MQTT 5 CONNECT, which aedes answers with return code 1 (unacceptable protocol version)', async () => {
    await expect(connect({ username: 'gate-gw', password: gatePassword, protocolVersion: 5, clientId: 'v5-gateway' })).rejects.toThrow();
    const protocol = (await refusals()).refusals.find((r) => r.reason === 'protocol');
    expect(protocol).toMatchObject({ kind: 'connect', address: '127.0.0.1' });
    expect(protocol!.detail).toMatch(/unacceptable protocol version/);
    // The Sensors screen shows this detail: it says what to do (issue 13 item 10).
    expect(protocol!.detail).toMatch(/MQTT 3\.1\.1.*not MQTT 5.*MQTT_URL/);
  });

  it('records a publish to a key no sensor has, with the topic and no more than a short excerpt of the payload; nothing is stored', async () => {
    const before = storedReadings();
    const client = await connect({ username: 'gate-gw', password: gatePassword, clientId: 'gate-gw-main' });
    const payload = JSON.stringify({ ts: Date.now(), speed: 7.5, dir: 240, note: 'x'.repeat(500) });
    // Acknowledged and dropped, the connection kept (issue 13 item 1).
    await client.publishAsync('wind/ghost-mast/reading', payload, { qos: 1 });
    expect(client.connected).toBe(true);
    client.end(true);
    expect(storedReadings()).toBe(before);
    const answer = await refusals();
    const ghost = answer.refusals.find((r) => r.reason === 'unknown-sensor');
    expect(ghost).toMatchObject({ kind: 'publish', topic: 'wind/ghost-mast/reading', username: 'gate-gw', clientId: 'gate-gw-main', address: '127.0.0.1', count: 1 });
    expect(ghost!.detail).toMatch(/no sensor is registered with the key "ghost-mast"/);
    expect(ghost!.excerpt).toBe(`${payload.slice(0, excerptBytes)}…`);
    expect(JSON.stringify(answer)).not.toContain('x'.repeat(100));
    // The per-sensor rejection count the API had before is still kept.
    const rejections = (await api.json('GET', '/api/rejections')).body.rejections as Array<{ sensorKey: string; reason: string }>;
    expect(rejections.some((r) => r.sensorKey === 'ghost-mast' && r.reason === 'not-permitted')).toBe(true);
  });

  it("records a publish for another gateway's sensor, and a topic that is not a reading topic", async () => {
    for (const topic of ['wind/roof-mast/reading', 'wind/gate-mast/status']) {
      const client = await connect({ username: 'gate-gw', password: gatePassword });
      await client.publishAsync(topic, '8.5', { qos: 1 });
      client.end(true);
    }
    const list = (await refusals()).refusals;
    expect(list.find((r) => r.reason === 'other-sensor')).toMatchObject({ topic: 'wind/roof-mast/reading', excerpt: '8.5' });
    expect(list.find((r) => r.reason === 'not-reading-topic')).toMatchObject({ topic: 'wind/gate-mast/status' });
  });

  it('records a refused subscription (SUBACK 0x80, MQTT 3.1.1 section 3.9.3)', async () => {
    const client = await connect({ username: 'gate-gw', password: gatePassword, clientId: 'gate-gw-listener' });
    // mqtt.js turns a SUBACK with return code 0x80 (failure) into an error.
    await expect(client.subscribeAsync('wind/#', { qos: 1 })).rejects.toThrow(/Subscribe error/);
    await client.endAsync();
    expect((await refusals()).refusals.find((r) => r.kind === 'subscribe')).toMatchObject({ reason: 'subscribe', topic: 'wind/#', username: 'gate-gw', clientId: 'gate-gw-listener' });
  });

  it('still takes the rightful gateway’s reading, and lists refusals newest first', async () => {
    const before = storedReadings();
    const client = await connect({ username: 'gate-gw', password: gatePassword });
    await client.publishAsync('wind/gate-mast/reading', JSON.stringify({ ts: Date.now(), speed: 4.2 }), { qos: 1 });
    await client.endAsync();
    expect(storedReadings()).toBe(before + 1);
    const list = (await refusals()).refusals;
    for (let i = 1; i < list.length; i++) expect(list[i - 1]!.lastAtMs).toBeGreaterThanOrEqual(list[i]!.lastAtMs);
    expect(list[0]!.kind).toBe('subscribe');
  });

  it('shows who was refused to a competent person only (usernames and addresses are half a credential)', async () => {
    await api.json('POST', '/api/people', { username: 'gate-steward', displayName: 'Gate steward', role: 'crew', password: 'steward-password-1' });
    const crew = new ApiClient(ts.baseUrl);
    expect((await crew.signIn('gate-steward', 'steward-password-1')).status).toBe(200);
    expect((await crew.json('GET', '/api/refusals')).status).toBe(403);
  });
});

describe('the refusal book', () => {
  it('keeps at most its bound of groups, dropping the one refused least recently, and counts everything', () => {
    let t = 0;
    const book = new BrokerRefusals(() => t, 5);
    for (let i = 0; i < 8; i++) {
      t += 1000;
      book.record({ kind: 'connect', reason: 'unknown-username', detail: 'x', clientId: `c${i}`, username: `user-${i}`, address: '10.0.0.9', topic: null });
    }
    // user-3 is refused again: it becomes the newest and is not the next to go.
    t += 1000;
    book.record({ kind: 'connect', reason: 'unknown-username', detail: 'x', clientId: 'c3b', username: 'user-3', address: '10.0.0.9', topic: null });
    t += 1000;
    book.record({ kind: 'connect', reason: 'unknown-username', detail: 'x', clientId: 'c8', username: 'user-8', address: '10.0.0.9', topic: null });
    expect(book.list().map((r) => r.username)).toEqual(['user-8', 'user-3', 'user-7', 'user-6', 'user-5']);
    expect(book.list()[1]).toMatchObject({ count: 2, clientId: 'c3b', firstAtMs: 4000, lastAtMs: 9000 });
    expect(book.totalCount).toBe(10);
    expect(book.droppedGroups).toBe(4);
  });

  it('keeps a payload excerpt of at most 48 bytes; bad UTF-8 becomes U+FFFD (WHATWG Encoding Standard, non-fatal decode) and control characters "·"', () => {
    expect(payloadExcerpt(Buffer.from('12.5'))).toBe('12.5');
    expect(payloadExcerpt(Buffer.from([0x7b, 0xff, 0xfe, 0x7d]))).toBe('{\uFFFD\uFFFD}');
    expect(payloadExcerpt(Buffer.from('a\nb\u0000c'))).toBe('a·b·c');
    const long = payloadExcerpt(Buffer.alloc(300 * 1024, 0x41));
    expect(long).toBe(`${'A'.repeat(excerptBytes)}…`);
  });
});
