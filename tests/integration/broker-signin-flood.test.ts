/**
 * A flood of wrong-password CONNECTs (issue 13 item 3): the release derived a 32 MiB scrypt key
 * for every one of them, one at a time in a queue shared with the web, so 300 of them made a web
 * sign-in wait 26.8 s and a real gateway's first connect 15.9 s. Now a username is locked after
 * 10 failed CONNECTs in 15 minutes and an address after 30 (as for the web: common practice, the
 * OWASP Authentication Cheat Sheet's account lockout), refused before any derivation, and the web
 * and the broker derive in lanes of their own. Real aedes broker, real mqtt.js clients, 127.0.0.1.
 * Counted, not timed: derivations started per lane, and which lane finishes first.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passwordDerivations, passwordLaneDepth } from '../../server/auth/password.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;
let gatePassword = '';

function connect(username: string, password: string): Promise<MqttClient> {
  return new Promise((resolve, reject) => {
    const client = mqtt.connect(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { reconnectPeriod: 0, connectTimeout: 20_000, protocolVersion: 4, username, password, clientId: `${username}-${Math.random().toString(36).slice(2)}` });
    client.once('connect', () => resolve(client));
    client.once('error', (err) => {
      client.end(true);
      reject(err);
    });
  });
}

beforeAll(async () => {
  ts = await startTestServer();
  api = new ApiClient(ts.baseUrl);
  expect((await api.signIn(adminUsername, adminPassword)).status).toBe(200);
  expect((await api.json('POST', '/api/sensors', { key: 'gate-mast', name: 'Gate mast', heightM: 8 })).status).toBe(201);
  const gate = await api.json('POST', '/api/gateways', { name: 'Gate gateway', username: 'gate-gw', sensorKeys: ['gate-mast'] });
  gatePassword = gate.body.password;
  // The gate gateway signs in once before the flood, as it would on a running site.
  (await connect('gate-gw', gatePassword)).end(true);
  for (let i = 0; i < 8; i++) expect((await api.json('POST', '/api/gateways', { name: `Spare gateway ${i}`, username: `spare-gw-${i}`, sensorKeys: [] })).status).toBe(201);
}, 60_000);

afterAll(async () => {
  await ts?.stop();
});

describe('a flood of wrong-password CONNECTs', () => {
  it('a web sign-in does not wait behind the broker’s derivations: it finishes while eight wrong CONNECTs are still queued', async () => {
    const before = passwordDerivations('broker');
    const guesses = Array.from({ length: 8 }, (_, i) => connect(`spare-gw-${i}`, 'wrong-guess-123').then(() => 'connected', () => 'refused'));
    // Let the broker queue them all (each CONNECT reaches authenticate within a few ms).
    for (let i = 0; i < 200 && passwordDerivations('broker') - before < 8; i++) await new Promise((r) => setTimeout(r, 10));
    expect(passwordDerivations('broker') - before).toBe(8);
    const web = new ApiClient(ts.baseUrl);
    expect((await web.signIn(adminUsername, adminPassword)).status).toBe(200);
    // With one shared queue the sign-in came after all eight: the broker lane would be empty now.
    expect(passwordLaneDepth('broker')).toBeGreaterThan(0);
    expect(await Promise.all(guesses)).toEqual(Array(8).fill('refused'));
  }, 30_000);

  it('300 wrong CONNECTs for one gateway cost at most 10 derivations; the rest are refused as locked, and recorded so', async () => {
    const before = passwordDerivations('broker');
    let refused = 0;
    for (let round = 0; round < 15; round++) {
      const results = await Promise.all(Array.from({ length: 20 }, () => connect('gate-gw', 'guess-' + Math.random()).then(() => 'connected', () => 'refused')));
      refused += results.filter((r) => r === 'refused').length;
    }
    expect(refused).toBe(300);
    // The release derived 300 keys here.
    expect(passwordDerivations('broker') - before).toBeLessThanOrEqual(10);
    const list = (await api.json('GET', '/api/refusals')).body.refusals as Array<{ reason: string; username: string; count: number }>;
    const locked = list.find((r) => r.reason === 'locked' && r.username === 'gate-gw');
    expect(locked?.count).toBeGreaterThanOrEqual(290);
  }, 60_000);

  it('the real gateway, signed in before the flood, reconnects with its password while its username is locked: its checked password costs no derivation', async () => {
    const before = passwordDerivations('broker');
    const client = await connect('gate-gw', gatePassword);
    client.end(true);
    expect(passwordDerivations('broker') - before).toBe(0);
  }, 30_000);

  it('a wrong password for the locked username is still refused, without a derivation', async () => {
    const before = passwordDerivations('broker');
    await expect(connect('gate-gw', 'one-more-guess')).rejects.toThrow(/Not authorized/i);
    expect(passwordDerivations('broker') - before).toBe(0);
  }, 30_000);
});
