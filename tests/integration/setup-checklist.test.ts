/**
 * The first-start checklist (GET /api/setup/checklist) is read from the register and the log as
 * they are: each step ticks only once the real thing exists (the site saved, a sensor with a
 * gateway, a structure, levels of the site's own, a second person, a stored reading), through
 * the same API and the real embedded broker a new site would use.
 *
 * Scenario (invented): Brackenfold Common on its first morning.
 */
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { siteDefaultLevels } from '../../server/levels/siteDefaultLevels.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let api: ApiClient;

type Steps = Record<string, { done: boolean; detail: string; atMs: number | null }>;

async function steps(): Promise<{ steps: Steps; doneCount: number }> {
  const res = await api.json('GET', '/api/setup/checklist');
  expect(res.status).toBe(200);
  const out: Steps = {};
  for (const s of res.body.steps as Array<{ id: string; done: boolean; detail: string; atMs: number | null }>) out[s.id] = s;
  return { steps: out, doneCount: res.body.doneCount };
}

beforeAll(async () => {
  ts = await startTestServer();
  api = new ApiClient(ts.baseUrl);
  expect((await api.signIn(adminUsername, adminPassword)).status).toBe(200);
});

afterAll(async () => {
  await ts?.stop();
});

describe('the first-start checklist', () => {
  it('starts with nothing done on a fresh server, in the order site, sensors, structures, levels, people, publish', async () => {
    const res = await api.json('GET', '/api/setup/checklist');
    expect(res.body.steps.map((s: { id: string }) => s.id)).toEqual(['site', 'sensors', 'structures', 'levels', 'people', 'publish']);
    expect(res.body.doneCount).toBe(0);
    expect(res.body.steps.every((s: { done: boolean }) => !s.done)).toBe(true);
    expect((await steps()).steps.site!.detail).toMatch(/Not saved yet; now time zone UTC, terrain category II, air density fixed 1.25 kg\/m³/);
  });

  it('ticks the site once its settings are saved', async () => {
    expect((await api.json('PATCH', '/api/site', { name: 'Brackenfold Common', timeZone: 'Europe/London', terrainCategory: 'III' })).status).toBe(200);
    const { steps: s } = await steps();
    expect(s.site).toMatchObject({ done: true });
    expect(s.site!.detail).toMatch(/time zone Europe\/London, terrain category III/);
    // Saving the settings with the shipped levels does not tick the levels.
    expect(s.levels!.done).toBe(false);
  });

  it('ticks sensors only when a gateway may publish for a registered sensor', async () => {
    expect((await api.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10 })).status).toBe(201);
    let s = (await steps()).steps;
    expect(s.sensors).toMatchObject({ done: false });
    expect(s.sensors!.detail).toMatch(/no gateway may publish/);
    expect((await api.json('POST', '/api/gateways', { name: 'Office gateway', username: 'office-gw', sensorKeys: ['north-mast'] })).status).toBe(201);
    s = (await steps()).steps;
    expect(s.sensors).toMatchObject({ done: true });
    expect(s.sensors!.detail).toMatch(/office-gw/);
  });

  it('ticks structures when one is registered, and levels when a structure has its own or the defaults are changed', async () => {
    const record = { kind: 'custom', name: 'Gate arch', baseDepthM: 1.5, frictionCoefficient: 0.3, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ label: 'ballast', massKg: 1000, xM: 0.75 }] };
    const created = await api.json('POST', '/api/structures', { record });
    expect(created.status).toBe(201);
    let s = (await steps()).steps;
    expect(s.structures).toMatchObject({ done: true });
    expect(s.structures!.detail).toMatch(/Gate arch/);
    expect(s.levels!.done).toBe(false);
    // The site's defaults with the crew's own words at level 2.
    const own = siteDefaultLevels.map((l, i) => ({ ...l, actionText: i === 1 ? 'Close the gate arch banner; stewards move the queue back to the car park fence.' : l.actionText }));
    expect((await api.json('PATCH', '/api/site', { defaultLevels: own })).status).toBe(200);
    s = (await steps()).steps;
    expect(s.levels).toMatchObject({ done: true });
    expect(s.levels!.detail).toMatch(/default levels are the site's own/);
  });

  it('ticks people when a second, enabled person can sign in', async () => {
    const added = await api.json('POST', '/api/people', { username: 'sam.okoro', displayName: 'Sam Okoro', role: 'crew', password: 'crew-password-12' });
    expect(added.status).toBe(201);
    expect((await steps()).steps.people).toMatchObject({ done: true });
    // Disabled, Sam no longer counts.
    expect((await api.json('PATCH', `/api/people/${added.body.person.id}`, { disabled: true })).status).toBe(200);
    expect((await steps()).steps.people).toMatchObject({ done: false });
    expect((await api.json('PATCH', `/api/people/${added.body.person.id}`, { disabled: false })).status).toBe(200);
  });

  it('ticks the test publish when a reading from the gateway is stored, with its time', async () => {
    const gateway = await api.json('PATCH', '/api/gateways/1', { newPassword: true });
    const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'office-gw', password: gateway.body.password, protocolVersion: 4, reconnectPeriod: 0 });
    const tsMs = Date.now() - 1_000;
    await client.publishAsync('wind/north-mast/reading', JSON.stringify({ ts: tsMs, speed: 6.4, dir: 250 }), { qos: 1 });
    await client.endAsync();
    const { steps: s, doneCount } = await steps();
    expect(s.publish).toMatchObject({ done: true, atMs: tsMs });
    expect(s.publish!.detail).toMatch(/A reading arrived from North mast/);
    expect(doneCount).toBe(6);
  });

  it('is for a competent person and up', async () => {
    const crew = new ApiClient(ts.baseUrl);
    expect((await crew.signIn('sam.okoro', 'crew-password-12')).status).toBe(200);
    expect((await crew.json('GET', '/api/setup/checklist')).status).toBe(403);
  });
});
