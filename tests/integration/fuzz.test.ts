/**
 * Bad input, thousands of times (seeded, so a failure repeats): fuzzed MQTT payloads through the
 * embedded broker and fuzzed HTTP requests. The server must not crash, must store nothing from
 * them, and must count every rejected payload with its reason (design.md 3 and 6: "0 crashes,
 * 0 stored garbage").
 */
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seededRandom, type Random } from '../../server/demo/random.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;
let password = '';

beforeAll(async () => {
  ts = await startTestServer();
  api = new ApiClient(ts.baseUrl);
  await api.signIn(adminUsername, adminPassword);
  await api.json('POST', '/api/sensors', { key: 'fuzz-mast', name: 'Fuzz mast', heightM: 10 });
  password = (await api.json('POST', '/api/gateways', { name: 'Fuzz gateway', username: 'fuzz-gw', sensorKeys: ['fuzz-mast'] })).body.password;
  await api.json('POST', '/api/structures', {
    record: { kind: 'screen', name: 'Fuzz screen', widthM: 4, heightM: 3, bottomHeightM: 2, supportTowers: 2, towerMassKg: 300, screenMassKg: 500, outriggerDepthM: 3, ballastPerTowerKg: 1000 },
  });
});

afterAll(async () => {
  await ts.stop();
});

const pick = <T>(random: Random, items: readonly T[]): T => items[Math.floor(random() * items.length)]!;

/** Payloads that are each invalid by construction (every branch breaks the contract of design.md 3). */
function badPayload(random: Random, nowMs: number): Buffer | string {
  const kind = Math.floor(random() * 12);
  switch (kind) {
    case 0: // random bytes, mostly not UTF-8 JSON (a leading 0xff makes sure)
      return Buffer.concat([Buffer.from([0xff]), Buffer.from(Array.from({ length: 1 + Math.floor(random() * 200) }, () => Math.floor(random() * 256)))]);
    case 1: // wrong types
      return JSON.stringify({ ts: nowMs, speed: pick(random, ['7', true, null, [], {}, 'NaN']) });
    case 2: // NaN and infinities written as numbers are not JSON
      return `{"ts": ${nowMs}, "speed": ${pick(random, ['NaN', 'Infinity', '-Infinity', '1e999'])}}`;
    case 3: // huge and negative numbers
      return JSON.stringify({ ts: nowMs, speed: pick(random, [1e308, 121, -0.5, -1e9, 5e5]) });
    case 4: // huge payload
      return Buffer.alloc(262_145 + Math.floor(random() * 100_000), 0x31);
    case 5: // deep nesting
      return '['.repeat(9 + Math.floor(random() * 500)) + ']'.repeat(9 + Math.floor(random() * 500));
    case 6: // bad timestamps
      return JSON.stringify({ ts: pick(random, ['yesterday', '2026-13-45T99:99:99Z', -1, nowMs + 3_600_000, 0, 1e20, '2026-06-01T12:00:00']), speed: 5 });
    case 7: // unknown fields
      return JSON.stringify({ ts: nowMs, speed: 5, [`x${Math.floor(random() * 1e6)}`]: 1 });
    case 8: // gust below zero or direction out of range
      return JSON.stringify({ ts: nowMs, speed: 5, ...(random() < 0.5 ? { gust: -3 } : { dir: 361 + random() * 1000 }) });
    case 9: // an array of only bad readings
      return JSON.stringify(Array.from({ length: 1 + Math.floor(random() * 5) }, () => ({ ts: 'never', speed: -1 })));
    case 10: // SenML with a unit we do not take
      return JSON.stringify([{ bn: 'fuzz:', n: 'speed', u: pick(random, ['furlong/fortnight', 'lx', 'V']), v: 5 }]);
    default: // strings, null, empty
      return pick(random, ['', '   ', 'null', '"text"', 'true', '{}', '[]']);
  }
}

describe('fuzzed input', () => {
  it('3 000 seeded malformed MQTT payloads: no crash, nothing stored, every one counted with a reason', async () => {
    const random = seededRandom(8428);
    const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'fuzz-gw', password });
    const before = ts.server.pipeline.counters.messages;
    const rejectedBefore = (await api.json('GET', '/api/rejections')).body.total as number;
    const n = 3_000;
    for (let i = 0; i < n; i += 100) {
      await Promise.all(Array.from({ length: Math.min(100, n - i) }, () => client.publishAsync('wind/fuzz-mast/reading', badPayload(random, Date.now()), { qos: 1 })));
    }
    await client.endAsync();
    expect(ts.server.pipeline.counters.messages - before).toBe(n);
    expect(ts.server.pipeline.counters.acceptedReadings).toBe(0);
    const stored = ts.server.db.$client.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number };
    expect(stored.n).toBe(0);
    const rejections = (await api.json('GET', '/api/rejections')).body;
    // Every message is rejected at least once (a bad batch counts each of its readings).
    expect(rejections.total - rejectedBefore).toBeGreaterThanOrEqual(n);
    const reasons = new Set((rejections.rejections as Array<{ reason: string }>).map((r) => r.reason));
    for (const reason of ['bad-utf8', 'not-json', 'too-large', 'too-deep', 'unknown-field', 'future-timestamp', 'bad-timestamp']) expect(reasons).toContain(reason);
    expect((await api.request('GET', '/api/health')).status).toBe(200);
  }, 60_000);

  it('2 000 seeded malformed HTTP requests: never a 500, never a stack trace or SQL, and the register unchanged', async () => {
    const random = seededRandom(7230);
    const registerBefore = JSON.stringify({ ...(await api.json('GET', '/api/register')).body, exportedAtMs: 0 });
    const paths = ['/api/site', '/api/sensors', '/api/sensors/fuzz-mast', '/api/gateways', '/api/gateways/1', '/api/structures', '/api/structures/1', '/api/alerts/1/acknowledge', '/api/assess', '/api/forecast', '/api/register/import', '/api/log/wind', '/api/log/summary', '/api/export/readings.csv', '/api/people', '/api/site-links', '/api/session', '/api/setup'];
    const methods = ['GET', 'POST', 'PATCH', 'PUT', 'DELETE'];
    const junk = (): unknown => {
      const k = Math.floor(random() * 8);
      if (k === 0) return '{"unterminated": ';
      if (k === 1) return { structure: { kind: pick(random, ['tent', 'custom', 'x']), faces: 'no', masses: [{ massKg: -1, xM: 1e308 }] }, gustMps: pick(random, [-1, 1e9, 'fast']) };
      if (k === 2) return { key: "x'; DROP TABLE readings; --", name: 'Robert"); DELETE FROM sensors; --', heightM: 'tall' };
      if (k === 3) return Array.from({ length: 50 }, (_, i) => i);
      if (k === 4) return { text: '\u0000'.repeat(100), unit: 'parsec' };
      if (k === 5) return { mode: 'replace', register: { format: 'something else' } };
      if (k === 6) return 'a'.repeat(1000);
      return { a: { b: { c: { d: [null, true, 1.5e-300] } } } };
    };
    let fiveHundreds = 0;
    for (let i = 0; i < 2_000; i++) {
      const method = pick(random, methods);
      // DELETE only on ids that name nothing: a well-formed DELETE of a real thing is not bad input.
      const path =
        method === 'DELETE'
          ? pick(random, ['/api/sensors/no-such-mast', '/api/structures/abc', '/api/structures/999999', '/api/gateways/-1', "/api/site-links/1;DROP", '/api/session/x'])
          : pick(random, paths) + (random() < 0.3 ? pick(random, ['?from=never', '?day=2026-02-30', '?points=-5', "?sensor=' OR 1=1 --", '/../../etc/passwd', '%00']) : '');
      const res = await api.request(method, path, method === 'GET' || method === 'DELETE' ? undefined : junk(), random() < 0.2 ? { 'content-type': 'text/plain' } : {});
      const text = await res.text();
      if (res.status >= 500) fiveHundreds++;
      expect(text).not.toMatch(/SQLITE_|sqlite3|SELECT .* FROM|    at [A-Za-z]/);
    }
    expect(fiveHundreds).toBe(0);
    const registerAfter = JSON.stringify({ ...(await api.json('GET', '/api/register')).body, exportedAtMs: 0 });
    expect(registerAfter).toBe(registerBefore);
    expect(registerBefore).toContain('fuzz-mast');
    expect((await api.request('GET', '/api/health')).status).toBe(200);
  }, 120_000);
});
