/**
 * The register over HTTP: the site, sensors, gateways and structures of every kind, each for
 * valid and invalid input (400 naming every offending field, 404, 409, 413, 415), and the audit
 * trail that says who changed what from what to what.
 *
 * Scenario (invented): the competent person registers the anemometers and structures of
 * "Brackenfold Common", a weekend folk festival on an open common.
 */
import http from 'node:http';
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let admin: ApiClient;
/** The competent person, Rowan Ashby: edits the register. */
let cp: ApiClient;
/** A viewer (a steward): reads the log. */
let viewer: ApiClient;

const cpName = 'Rowan Ashby';

beforeAll(async () => {
  ts = await startTestServer();
  admin = new ApiClient(ts.baseUrl);
  expect((await admin.signIn(adminUsername, adminPassword)).status).toBe(200);
  for (const [username, displayName, role] of [
    ['rowan.ashby', cpName, 'competent-person'],
    ['ellis.steward', 'Ellis Fairweather', 'viewer'],
  ] as const) {
    const res = await admin.json('POST', '/api/people', { username, displayName, role, password: `${username}-pass-1234` });
    expect(res.status).toBe(201);
  }
  cp = new ApiClient(ts.baseUrl);
  expect((await cp.signIn('rowan.ashby', 'rowan.ashby-pass-1234')).status).toBe(200);
  viewer = new ApiClient(ts.baseUrl);
  expect((await viewer.signIn('ellis.steward', 'ellis.steward-pass-1234')).status).toBe(200);
});

afterAll(async () => {
  await ts?.stop();
});

// ---------------------------------------------------------------------------------------------
// Helpers

/** Paths named in a 400 answer. */
function paths(body: { issues?: Array<{ path: string }> } | null): string[] {
  return (body?.issues ?? []).map((i) => i.path);
}

/** A valid record of every kind (dimensions from the kinds' schemas in server/engine/kinds). */
function records() {
  return {
    tent: {
      kind: 'tent',
      name: 'Hospitality marquee',
      lengthM: 12,
      widthM: 6,
      eaveHeightM: 2.4,
      ridgeHeightM: 4,
      wallsClosed: true,
      legs: 8,
      ballastPerLegKg: 500,
      selfWeightKg: 900,
      surface: 'grass',
    },
    banner: {
      kind: 'banner',
      name: 'North fence scrim',
      widthM: 20,
      heightM: 2,
      clearanceM: 0.1,
      solidity: 0.5,
      feet: 10,
      ballastPerFootKg: 40,
      footDepthM: 1.2,
      selfWeightKg: 300,
    },
    screen: {
      kind: 'screen',
      name: 'Side screen',
      widthM: 4,
      heightM: 2.5,
      bottomHeightM: 3,
      supportTowers: 2,
      towerMassKg: 400,
      screenMassKg: 700,
      outriggerDepthM: 3.5,
      ballastPerTowerKg: 1200,
    },
    shell: { kind: 'shell', name: 'Band shell', radiusM: 3.5, selfWeightKg: 2000, frontBallastKg: 600, backBallastKg: 1500 },
    custom: {
      kind: 'custom',
      name: 'Gate arch',
      baseDepthM: 1.2,
      frictionCoefficient: 0.35,
      faces: [
        { label: 'header board', areaM2: 5, centroidHeightM: 3.2, cfFront: 1.8, cfBack: 1.8 },
        { label: 'two posts', areaM2: 1.8, centroidHeightM: 1.4, cfFront: 1.2, cfBack: 1.2 },
      ],
      masses: [
        { label: 'arch frame', massKg: 180, xM: 0.6 },
        { label: 'water ballast, back', massKg: 600, xM: 1.1 },
      ],
      safetyFactors: { overturning: 1.5, sliding: 2, uplift: 1.5 },
      ratedGustMps: 18,
    },
  } as const;
}
type Kind = keyof ReturnType<typeof records>;
const kinds: Kind[] = ['tent', 'banner', 'screen', 'shell', 'custom'];

/** A deep copy of a kind's valid record, to be spoilt by a test. */
function recordOf(kind: Kind, name?: string): Record<string, any> {
  const copy = JSON.parse(JSON.stringify(records()[kind])) as Record<string, any>;
  if (name) copy.name = name;
  return copy;
}

async function structureCount(): Promise<number> {
  const res = await cp.json('GET', '/api/structures');
  expect(res.status).toBe(200);
  return res.body.structures.length;
}

/** Signs in with fetch alone, for requests the ApiClient cannot make (no content type, raw bodies). */
async function rawSession(username: string, password: string): Promise<{ cookie: string; csrf: string }> {
  const res = await fetch(`${ts.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username, password }) });
  expect(res.status).toBe(200);
  return { cookie: res.headers.get('set-cookie')!.split(';')[0]!, csrf: ((await res.json()) as { csrfToken: string }).csrfToken };
}

/** A request on a fresh connection (the server may close it after refusing a large body). */
function rawRequest(method: string, pathname: string, headers: Record<string, string>, body: string): Promise<{ status: number; text: string }> {
  return new Promise((resolve, reject) => {
    let answered = false;
    const req = http.request(`${ts.baseUrl}${pathname}`, { method, headers, agent: false }, (res) => {
      answered = true;
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, text: Buffer.concat(chunks).toString('utf8') }));
      res.on('error', reject);
    });
    // Writing the rest of a refused body may fail once the server has answered: that is fine.
    req.on('error', (err) => {
      if (!answered) reject(err);
    });
    req.end(body);
  });
}

/** Connects to the embedded broker as a gateway: 'connected', or the broker's refusal. */
async function mqttConnect(username: string, password: string): Promise<string> {
  try {
    const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username, password, reconnectPeriod: 0, connectTimeout: 5_000 });
    await client.endAsync();
    return 'connected';
  } catch (err) {
    return `refused: ${err instanceof Error ? err.message : String(err)}`;
  }
}

// ---------------------------------------------------------------------------------------------

describe('site settings (GET/PATCH /api/site)', () => {
  it('answers the site with its default levels (Watch 60 %, Prepare 80 %, Stop and clear 100 %) and the air density', async () => {
    const res = await viewer.json('GET', '/api/site');
    expect(res.status).toBe(200);
    expect(res.body.site.defaultLevels.map((l: { label: string; trigger: { fraction: number } }) => [l.label, l.trigger.fraction])).toEqual([
      ['Watch', 0.6],
      ['Prepare', 0.8],
      ['Stop and clear', 1],
    ]);
    // A new site's density is fixed at 1.25 kg/m³ (EN 1991-1-4 §4.5(1) Note 2; design §2.1 v2).
    expect(res.body.site).toMatchObject({ airDensityMode: 'fixed', fixedAirDensityKgM3: 1.25 });
    expect(res.body.airDensityKgM3).toBe(1.25);
  });

  it('takes a valid change from the competent person and answers the changed site', async () => {
    const res = await cp.json('PATCH', '/api/site', { name: 'Brackenfold Common', timeZone: 'Europe/London', altitudeM: 240, terrainCategory: 'III', holdTimeMs: 600_000, airDensityMode: 'isa' });
    expect(res.status).toBe(200);
    expect(res.body.site).toMatchObject({ name: 'Brackenfold Common', timeZone: 'Europe/London', altitudeM: 240, terrainCategory: 'III', holdTimeMs: 600_000 });
    const again = await viewer.json('GET', '/api/site');
    expect(again.body.site.name).toBe('Brackenfold Common');
    // ISA at 240 m is thinner than at sea level.
    expect(again.body.airDensityKgM3).toBeLessThan(1.225);
    expect(again.body.airDensityKgM3).toBeGreaterThan(1.19);
  });

  it.each([
    ['an altitude above 5000 m', { altitudeM: 9000 }, 'altitudeM'],
    ['a time zone that does not exist', { timeZone: 'Mars/Olympus_Mons' }, 'timeZone'],
    ['a terrain category beyond IV', { terrainCategory: 'V' }, 'terrainCategory'],
    ['fixed density without a density', { airDensityMode: 'fixed' }, 'fixedAirDensityKgM3'],
    ['a negative hold time', { holdTimeMs: -1 }, 'holdTimeMs'],
    ['a dead band over 50 %', { deadBandFraction: 0.9 }, 'deadBandFraction'],
    ['a density of 12 kg/m³', { airDensityMode: 'fixed', fixedAirDensityKgM3: 12 }, 'fixedAirDensityKgM3'],
    ['an empty name', { name: '   ' }, 'name'],
    ['heightReductionEnabled as a string', { heightReductionEnabled: 'yes' }, 'heightReductionEnabled'],
    [
      'default levels out of order',
      {
        defaultLevels: [
          { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Walk round.' },
          { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Drop the scrims.' },
        ],
      },
      'defaultLevels.1.trigger.fraction',
    ],
    [
      'two default levels with one label',
      {
        defaultLevels: [
          { label: 'Watch', trigger: { kind: 'gust', gustMps: 10 }, actionText: 'Walk round.' },
          { label: 'watch', trigger: { kind: 'gust', gustMps: 14 }, actionText: 'Drop the scrims.' },
        ],
      },
      'defaultLevels.1.label',
    ],
    ['an empty level list', { defaultLevels: [] }, 'defaultLevels'],
  ])('refuses %s with 400 naming %s, and changes nothing', async (_what, patch, path) => {
    const before = (await cp.json('GET', '/api/site')).body.site;
    const res = await cp.json('PATCH', '/api/site', patch);
    expect(res.status).toBe(400);
    expect(res.body.error).toBe('invalid input');
    expect(paths(res.body)).toContain(path);
    expect((await cp.json('GET', '/api/site')).body.site).toEqual(before);
  });

  it('names every offending field of a site change in one answer', async () => {
    const res = await cp.json('PATCH', '/api/site', { altitudeM: -900, terrainCategory: 'X', holdTimeMs: 1.5 });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(expect.arrayContaining(['altitudeM', 'terrainCategory', 'holdTimeMs']));
  });
});

describe('sensors (POST/GET/PATCH/DELETE /api/sensors)', () => {
  it('registers a sensor and answers it with its MQTT topic, live state and rejection counts', async () => {
    const res = await cp.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10, location: 'By the north fence', unit: 'km/h' });
    expect(res.status).toBe(201);
    expect(res.body.sensor).toMatchObject({ key: 'north-mast', name: 'North mast', heightM: 10, unit: 'km/h', mode: 'samples', silenceTimeoutMs: 30_000, topic: 'wind/north-mast/reading' });
    expect(res.body.sensor.live).toMatchObject({ key: 'north-mast', currentGustMps: null, silent: true });
    expect(res.body.sensor.rejections).toEqual([]);

    const one = await viewer.json('GET', '/api/sensors/north-mast');
    expect(one.status).toBe(200);
    expect(one.body.sensor.name).toBe('North mast');
    const list = await viewer.json('GET', '/api/sensors');
    expect(list.body.sensors.map((s: { key: string }) => s.key)).toContain('north-mast');
  });

  it('changes a sensor with PATCH', async () => {
    const res = await cp.json('PATCH', '/api/sensors/north-mast', { heightM: 12, unit: 'km/h', silenceTimeoutMs: 45_000 });
    expect(res.status).toBe(200);
    expect(res.body.sensor).toMatchObject({ key: 'north-mast', name: 'North mast', heightM: 12, unit: 'km/h', silenceTimeoutMs: 45_000 });
    expect((await viewer.json('GET', '/api/sensors/north-mast')).body.sensor).toMatchObject({ heightM: 12, unit: 'km/h', silenceTimeoutMs: 45_000 });
  });

  it('keeps everything a PATCH does not name: unit, mode, location, position and timeout stay as registered', async () => {
    const registered = { key: 'stage-roof', name: 'Stage roof', heightM: 8, location: 'Upwind corner of the stage roof', latDeg: 54.41, lonDeg: -2.97, unit: 'kn', mode: 'summaries', silenceTimeoutMs: 60_000 };
    expect((await cp.json('POST', '/api/sensors', registered)).status).toBe(201);
    const res = await cp.json('PATCH', '/api/sensors/stage-roof', { heightM: 9 });
    expect(res.status).toBe(200);
    // A knots anemometer silently read as m/s would under-read every gust by half.
    expect(res.body.sensor).toMatchObject({ ...registered, heightM: 9 });
    expect((await viewer.json('GET', '/api/sensors/stage-roof')).body.sensor).toMatchObject({ ...registered, heightM: 9 });
  });

  it('refuses a second sensor with the same key with 409', async () => {
    const res = await cp.json('POST', '/api/sensors', { key: 'north-mast', name: 'Another north mast', heightM: 6 });
    expect(res.status).toBe(409);
    expect((await viewer.json('GET', '/api/sensors/north-mast')).body.sensor.name).toBe('North mast');
  });

  it.each([
    ['a key with capitals and spaces', { key: 'North Mast', name: 'N', heightM: 10 }, ['key']],
    ['a key of 65 characters', { key: 'a'.repeat(65), name: 'N', heightM: 10 }, ['key']],
    ['a height of 0 m', { key: 'gate-pole', name: 'Gate pole', heightM: 0 }, ['heightM']],
    ['a speed unit nobody uses', { key: 'gate-pole', name: 'Gate pole', heightM: 4, unit: 'furlongs/fortnight' }, ['unit']],
    ['a silence timeout of half a second', { key: 'gate-pole', name: 'Gate pole', heightM: 4, silenceTimeoutMs: 500 }, ['silenceTimeoutMs']],
    ['a latitude of 91°', { key: 'gate-pole', name: 'Gate pole', heightM: 4, latDeg: 91 }, ['latDeg']],
    ['a missing name and height', { key: 'gate-pole' }, ['name', 'heightM']],
    ['everything wrong at once', { key: '', name: '', heightM: -3, mode: 'guesses' }, ['key', 'name', 'heightM', 'mode']],
  ])('refuses %s with 400 naming the fields, and stores nothing', async (_what, body, expected) => {
    const res = await cp.json('POST', '/api/sensors', body);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(expect.arrayContaining(expected));
    expect((await viewer.json('GET', '/api/sensors')).body.sensors.map((s: { key: string }) => s.key)).not.toContain('gate-pole');
  });

  it('refuses an invalid PATCH with 400 naming the field, and keeps the sensor as it was', async () => {
    const before = (await viewer.json('GET', '/api/sensors/north-mast')).body.sensor;
    const res = await cp.json('PATCH', '/api/sensors/north-mast', { heightM: 5000, unit: 'parsecs' });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(expect.arrayContaining(['heightM', 'unit']));
    expect((await viewer.json('GET', '/api/sensors/north-mast')).body.sensor).toEqual(before);
  });

  it.each([
    ['GET', undefined],
    ['PATCH', { name: 'Nobody' }],
    ['DELETE', undefined],
  ])('answers 404 to %s of a sensor key nobody registered', async (method, body) => {
    const res = await cp.json(method, '/api/sensors/no-such-mast', body);
    expect(res.status).toBe(404);
  });

  it('retires a sensor with DELETE: it leaves the list, answers 404, and its key can be registered again', async () => {
    expect((await cp.json('POST', '/api/sensors', { key: 'east-gate', name: 'East gate pole', heightM: 4 })).status).toBe(201);
    const del = await cp.json('DELETE', '/api/sensors/east-gate');
    expect(del.status).toBe(200);
    expect(del.body).toEqual({ retired: true });
    expect((await viewer.json('GET', '/api/sensors/east-gate')).status).toBe(404);
    expect((await viewer.json('GET', '/api/sensors')).body.sensors.map((s: { key: string }) => s.key)).not.toContain('east-gate');
    expect((await cp.json('DELETE', '/api/sensors/east-gate')).status).toBe(404);
    const again = await cp.json('POST', '/api/sensors', { key: 'east-gate', name: 'East gate pole (new cups)', heightM: 4.5 });
    expect(again.status).toBe(201);
    expect(again.body.sensor.name).toBe('East gate pole (new cups)');
  });
});

describe('gateways (POST/GET/PATCH/DELETE /api/gateways)', () => {
  let gatewayId = 0;
  let password = '';

  it('makes a gateway and shows its password once: the list never shows it again', async () => {
    const res = await cp.json('POST', '/api/gateways', { name: 'Mast gateway', username: 'brackenfold-gw', sensorKeys: ['north-mast'] });
    expect(res.status).toBe(201);
    expect(res.body.gateway).toMatchObject({ name: 'Mast gateway', username: 'brackenfold-gw', sensorKeys: ['north-mast'], revokedAtMs: null });
    expect(typeof res.body.password).toBe('string');
    expect(res.body.password.length).toBeGreaterThanOrEqual(16);
    gatewayId = res.body.gateway.id;
    password = res.body.password;

    const list = await cp.request('GET', '/api/gateways');
    const text = await list.text();
    expect(list.status).toBe(200);
    expect(text).toContain('brackenfold-gw');
    expect(text).not.toContain(password);
    expect(text).not.toMatch(/passwordHash|scrypt/);
    const one = await cp.request('GET', `/api/gateways/${gatewayId}`);
    const oneText = await one.text();
    expect(one.status).toBe(200);
    expect(oneText).not.toContain(password);
    expect(oneText).not.toMatch(/passwordHash|scrypt/);
  });

  it('lets the gateway connect to the embedded broker with that password, and no other', async () => {
    expect(await mqttConnect('brackenfold-gw', password)).toBe('connected');
    expect(await mqttConnect('brackenfold-gw', 'not-the-password-at-all')).toMatch(/^refused/);
  });

  it('takes a password of its own (at least 16 characters) when one is given', async () => {
    const res = await cp.json('POST', '/api/gateways', { name: 'Screen gateway', username: 'screen-gw', password: 'screen-gateway-secret-1', sensorKeys: [] });
    expect(res.status).toBe(201);
    expect(res.body.password).toBe('screen-gateway-secret-1');
    expect(await mqttConnect('screen-gw', 'screen-gateway-secret-1')).toBe('connected');
  });

  it('replaces the password with PATCH {newPassword: true}: the new one works, the old one stops', async () => {
    const res = await cp.json('PATCH', `/api/gateways/${gatewayId}`, { newPassword: true });
    expect(res.status).toBe(200);
    expect(typeof res.body.password).toBe('string');
    expect(res.body.password).not.toBe(password);
    const old = password;
    password = res.body.password;
    expect(await mqttConnect('brackenfold-gw', password)).toBe('connected');
    expect(await mqttConnect('brackenfold-gw', old)).toMatch(/^refused/);
  });

  it('renames a gateway without showing any password', async () => {
    const res = await cp.json('PATCH', `/api/gateways/${gatewayId}`, { name: 'Mast gateway (north)' });
    expect(res.status).toBe(200);
    expect(res.body.gateway.name).toBe('Mast gateway (north)');
    expect(res.body.password).toBeUndefined();
  });

  it('refuses a second gateway with the same username with 409', async () => {
    const res = await cp.json('POST', '/api/gateways', { name: 'Copy', username: 'brackenfold-gw' });
    expect(res.status).toBe(409);
  });

  it.each([
    ['a username of two characters', { name: 'G', username: 'gw' }, ['username']],
    ['a password of 8 characters', { name: 'G', username: 'gate-gw', password: 'short-pw' }, ['password']],
    ['an empty name', { name: ' ', username: 'gate-gw' }, ['name']],
    ['a sensor key nobody registered', { name: 'G', username: 'gate-gw', sensorKeys: ['no-such-mast'] }, ['sensorKeys']],
    ['everything wrong at once', { name: '', username: 'g w', password: 'x' }, ['name', 'username', 'password']],
  ])('refuses %s with 400 naming the fields, and makes no gateway', async (_what, body, expected) => {
    const res = await cp.json('POST', '/api/gateways', body);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(expect.arrayContaining(expected));
    expect((await cp.json('GET', '/api/gateways')).body.gateways.map((g: { username: string }) => g.username)).not.toContain('gate-gw');
  });

  it('refuses a PATCH naming an unknown sensor with 400 and keeps the gateway’s sensors', async () => {
    const res = await cp.json('PATCH', `/api/gateways/${gatewayId}`, { sensorKeys: ['north-mast', 'no-such-mast'] });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('sensorKeys');
    expect((await cp.json('GET', `/api/gateways/${gatewayId}`)).body.gateway.sensorKeys).toEqual(['north-mast']);
  });

  it.each([
    ['GET', '/api/gateways/999999', undefined],
    ['PATCH', '/api/gateways/999999', { name: 'x' }],
    ['DELETE', '/api/gateways/999999', undefined],
    ['GET', '/api/gateways/not-a-number', undefined],
    ['GET', '/api/gateways/0', undefined],
  ])('answers 404 to %s %s', async (method, path, body) => {
    expect((await cp.json(method, path, body)).status).toBe(404);
  });

  it('revokes a gateway with DELETE: its password is refused at once, and it cannot be changed after', async () => {
    const res = await cp.json('DELETE', `/api/gateways/${gatewayId}`);
    expect(res.status).toBe(200);
    expect(res.body.gateway.revokedAtMs).toEqual(expect.any(Number));
    expect(await mqttConnect('brackenfold-gw', password)).toMatch(/^refused/);
    const patch = await cp.json('PATCH', `/api/gateways/${gatewayId}`, { newPassword: true });
    expect(patch.status).toBe(409);
    expect(patch.body.password).toBeUndefined();
    expect(await mqttConnect('brackenfold-gw', password)).toMatch(/^refused/);
  });
});

describe('structures of every kind (POST/GET/PATCH/DELETE /api/structures)', () => {
  const ids = new Map<Kind, number>();

  it.each(kinds)('registers a %s and answers it with its live state', async (kind) => {
    const record = recordOf(kind);
    const res = await cp.json('POST', '/api/structures', { record, location: `${kind} pitch`, orientationDeg: 225 });
    expect(res.status).toBe(201);
    const s = res.body.structure;
    expect(s).toMatchObject({ name: record.name, kind, record, location: `${kind} pitch`, orientationDeg: 225, sensorKeys: null, levels: null });
    expect(s.live).toMatchObject({ id: s.id, name: record.name, kind });
    ids.set(kind, s.id);

    const one = await viewer.json('GET', `/api/structures/${s.id}`);
    expect(one.status).toBe(200);
    expect(one.body.structure.record).toEqual(record);
    const list = await viewer.json('GET', '/api/structures');
    expect(list.body.structures.map((x: { id: number }) => x.id)).toContain(s.id);
  });

  it('takes its own levels (mixing gust and utilization triggers) and named sensors', async () => {
    const levels = [
      { label: 'Watch', trigger: { kind: 'gust', gustMps: 9 }, actionText: 'Check the water barrels on every leg.' },
      { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Close the side walls.' },
      { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Clear the marquee.' },
    ];
    const res = await cp.json('POST', '/api/structures', { record: recordOf('tent', 'Bar tent'), levels, sensorKeys: ['north-mast'], mobile: false });
    expect(res.status).toBe(201);
    expect(res.body.structure.levels).toEqual(levels);
    expect(res.body.structure.sensorKeys).toEqual(['north-mast']);
  });

  it('changes a structure with PATCH', async () => {
    const id = ids.get('banner')!;
    const before = (await viewer.json('GET', `/api/structures/${id}`)).body.structure;
    const record = { ...recordOf('banner'), ballastPerFootKg: 60 };
    const res = await cp.json('PATCH', `/api/structures/${id}`, { record, location: 'North fence, bays 1–10', orientationDeg: 180 });
    expect(res.status).toBe(200);
    expect(res.body.structure).toMatchObject({ id, record, location: 'North fence, bays 1–10', orientationDeg: 180 });
    expect(res.body.structure.updatedAtMs).toBeGreaterThanOrEqual(before.updatedAtMs);
    expect((await viewer.json('GET', `/api/structures/${id}`)).body.structure).toMatchObject({ record, location: 'North fence, bays 1–10', orientationDeg: 180 });
  });

  it('refuses site default levels whose gust trigger is at or above the limit of a structure that follows them, naming it (design §2.6 v2)', async () => {
    const followers = (await cp.json('GET', '/api/structures')).body.structures.filter((s: { levels: unknown }) => s.levels === null);
    expect(followers.length).toBeGreaterThan(0);
    const before = (await cp.json('GET', '/api/site')).body.site;
    const res = await cp.json('PATCH', '/api/site', {
      defaultLevels: [
        { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Look.' },
        { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Ready.' },
        { label: 'Stop and clear', trigger: { kind: 'gust', gustMps: 110 }, actionText: 'Clear.' },
      ],
    });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('defaultLevels.2.trigger.gustMps');
    expect(JSON.stringify(res.body.issues)).toContain(followers[0].name);
    expect((await cp.json('GET', '/api/site')).body.site).toEqual(before);
  });

  it('keeps everything a PATCH does not name: own levels, sensors, orientation and mobility stay as registered', async () => {
    const levels = [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: 'Check the feet.' },
      { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.7 }, actionText: 'Unclip every second bay.' },
      { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 0.9 }, actionText: 'Drop the scrim.' },
    ];
    const created = await cp.json('POST', '/api/structures', { record: recordOf('banner', 'East fence scrim'), levels, sensorKeys: ['north-mast'], orientationDeg: 90, mobile: true, location: 'East fence' });
    expect(created.status).toBe(201);
    const id = created.body.structure.id as number;
    const res = await cp.json('PATCH', `/api/structures/${id}`, { location: 'East fence, by the car park' });
    expect(res.status).toBe(200);
    const expected = { location: 'East fence, by the car park', levels, sensorKeys: ['north-mast'], orientationDeg: 90, mobile: true };
    // Losing the structure's own levels would move its alerts to the site defaults without anyone deciding so.
    expect(res.body.structure).toMatchObject(expected);
    expect((await viewer.json('GET', `/api/structures/${id}`)).body.structure).toMatchObject(expected);
  });

  it('refuses a second active structure with the same name with 409 (the register identifies structures by name)', async () => {
    const count = await structureCount();
    const res = await cp.json('POST', '/api/structures', { record: recordOf('shell') });
    expect(res.status).toBe(409);
    expect(await structureCount()).toBe(count);
  });

  it('refuses renaming a structure to the name of another active one with 409, and keeps both as they were', async () => {
    const id = ids.get('screen')!;
    const before = (await viewer.json('GET', `/api/structures/${id}`)).body.structure;
    const res = await cp.json('PATCH', `/api/structures/${id}`, { record: recordOf('screen', records().tent.name) });
    expect(res.status).toBe(409);
    expect((await viewer.json('GET', `/api/structures/${id}`)).body.structure).toEqual(before);
  });

  it('lets a retired structure’s name be used again', async () => {
    const first = await cp.json('POST', '/api/structures', { record: recordOf('banner', 'Gate 3 banner') });
    expect(first.status).toBe(201);
    expect((await cp.json('DELETE', `/api/structures/${first.body.structure.id}`)).status).toBe(200);
    const second = await cp.json('POST', '/api/structures', { record: recordOf('banner', 'Gate 3 banner') });
    expect(second.status).toBe(201);
    expect(second.body.structure.id).not.toBe(first.body.structure.id);
  });

  const invalid: Array<[string, () => unknown, string[]]> = [
    ['a negative mass', () => ({ record: { ...recordOf('custom'), masses: [{ massKg: -50, xM: 0.6 }] } }), ['record.masses.0.massKg']],
    ['a mass outside the base', () => ({ record: { ...recordOf('custom'), masses: [{ massKg: 180, xM: 0.6 }, { massKg: 600, xM: 2.5 }] } }), ['record.masses.1.xM']],
    [
      'a custom record without faces',
      () => {
        const { faces: _faces, ...rest } = recordOf('custom');
        return { record: rest };
      },
      ['record.faces'],
    ],
    ['an empty face list', () => ({ record: { ...recordOf('custom'), faces: [] } }), ['record.faces']],
    ['a zero base depth', () => ({ record: { ...recordOf('custom'), baseDepthM: 0 } }), ['record.baseDepthM']],
    ['a tent of zero width', () => ({ record: { ...recordOf('tent'), widthM: 0 } }), ['record.widthM']],
    ['a banner of negative ballast per foot', () => ({ record: { ...recordOf('banner'), ballastPerFootKg: -40 } }), ['record.ballastPerFootKg']],
    ['a tent 12 km long (millimetres typed as metres)', () => ({ record: { ...recordOf('tent'), lengthM: 12_000 } }), ['record.lengthM']],
    ['a screen with 5 000 t of ballast per tower', () => ({ record: { ...recordOf('screen'), ballastPerTowerKg: 5e9 } }), ['record.ballastPerTowerKg']],
    ['a number given as text', () => ({ record: { ...recordOf('shell'), radiusM: '3.5' } }), ['record.radiusM']],
    ['a force coefficient of 40', () => ({ record: { ...recordOf('custom'), faces: [{ areaM2: 5, centroidHeightM: 3, cfFront: 40, cfBack: 1.8 }] } }), ['record.faces.0.cfFront']],
    ['a safety factor below 1', () => ({ record: { ...recordOf('custom'), safetyFactors: { overturning: 0.5 } } }), ['record.safetyFactors.overturning']],
    ['a rated gust of 500 m/s', () => ({ record: { ...recordOf('custom'), ratedGustMps: 500 } }), ['record.ratedGustMps']],
    ['a tent whose ridge is below its eaves', () => ({ record: { ...recordOf('tent'), ridgeHeightM: 2 } }), ['record.ridgeHeightM']],
    ['a tent whose side is neither open nor closed', () => ({ record: { ...recordOf('tent'), sides: { front: 'rolled up' } } }), ['record.sides.front']],
    ['a tent with an odd number of legs', () => ({ record: { ...recordOf('tent'), legs: 7 } }), ['record.legs']],
    ['a shell whose base is shallower than its radius', () => ({ record: { ...recordOf('shell'), baseDepthM: 2 } }), ['record.baseDepthM']],
    ['a coefficient override without its source', () => ({ record: { ...recordOf('banner'), coefficients: { cf: 1.2 } } }), ['record.coefficientSource']],
    ['a misspelt field in the record', () => ({ record: { ...recordOf('tent'), ratedGust: 20 } }), ['record.ratedGust']],
    ['a kind nobody knows', () => ({ record: { ...recordOf('tent'), kind: 'yurt' } }), ['record.kind']],
    ['no record at all', () => ({ location: 'Somewhere' }), ['record']],
    ['a sensor key nobody registered', () => ({ record: recordOf('screen', 'Screen two'), sensorKeys: ['north-mast', 'no-such-mast'] }), ['sensorKeys.1']],
    ['an orientation of 400°', () => ({ record: recordOf('screen', 'Screen two'), orientationDeg: 400 }), ['orientationDeg']],
    [
      'levels whose fractions fall',
      () => ({
        record: recordOf('screen', 'Screen two'),
        levels: [
          { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Look.' },
          { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Lower it.' },
        ],
      }),
      ['levels.1.trigger.fraction'],
    ],
    [
      'levels out of order once the structure is known (a gust trigger above the capacity trigger after it)',
      () => ({
        record: recordOf('tent', 'Bar tent two'),
        levels: [
          { label: 'Watch', trigger: { kind: 'gust', gustMps: 40 }, actionText: 'Look.' },
          { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: 'Close the walls.' },
        ],
      }),
      ['levels.0.trigger.gustMps', 'levels.1.trigger.fraction'],
    ],
    [
      // Issue 11 item 5: a fence with a 5.4 m/s limit was given a 9 m/s level 3.
      'a gust trigger at or above the structure’s effective limit (design §2.6 v2)',
      () => ({
        record: recordOf('banner', 'West fence scrim'),
        levels: [
          { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Look.' },
          { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Unclip.' },
          { label: 'Stop and clear', trigger: { kind: 'gust', gustMps: 110 }, actionText: 'Drop it.' },
        ],
      }),
      ['levels.2.trigger.gustMps'],
    ],
    [
      'several faults at once',
      () => ({ record: { ...recordOf('tent', 'Bar tent three'), lengthM: -1, legs: 3.5, ballastPerLegKg: -5 }, latDeg: 120 }),
      ['record.lengthM', 'record.legs', 'record.ballastPerLegKg', 'latDeg'],
    ],
  ];

  it.each(invalid)('refuses %s with 400 naming the offending fields, and stores nothing', async (_what, body, expected) => {
    const count = await structureCount();
    const res = await cp.json('POST', '/api/structures', body());
    expect(res.status).toBe(400);
    expect(res.body.error).toBe('invalid input');
    expect(paths(res.body)).toEqual(expect.arrayContaining(expected));
    expect(await structureCount()).toBe(count);
  });

  it('refuses a non-finite number (1e999 in the JSON text) with 400 naming the field', async () => {
    const count = await structureCount();
    const text = JSON.stringify({ record: recordOf('tent', 'Infinite tent') }).replace('"lengthM":12', '"lengthM":1e999');
    expect(text).toContain('1e999');
    const res = await cp.json('POST', '/api/structures', text);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('record.lengthM');
    expect(await structureCount()).toBe(count);
  });

  it('refuses an invalid PATCH with 400 naming the field and keeps the structure as it was', async () => {
    const id = ids.get('custom')!;
    const before = (await viewer.json('GET', `/api/structures/${id}`)).body.structure;
    const res = await cp.json('PATCH', `/api/structures/${id}`, { record: { ...recordOf('custom'), masses: [{ massKg: 200, xM: 5 }] } });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('record.masses.0.xM');
    expect((await viewer.json('GET', `/api/structures/${id}`)).body.structure).toEqual(before);
  });

  it.each([
    ['GET', '/api/structures/999999', undefined],
    ['PATCH', '/api/structures/999999', { location: 'x' }],
    ['DELETE', '/api/structures/999999', undefined],
    ['GET', '/api/structures/abc', undefined],
    ['GET', '/api/structures/-1', undefined],
    ['GET', '/api/structures/1.5', undefined],
    ['GET', '/api/log/structures/999999', undefined],
  ])('answers 404 to %s %s', async (method, path, body) => {
    const res = await cp.json(method, path, body);
    expect(res.status).toBe(404);
    expect(res.body.error).toMatch(/not found/);
  });

  it('retires a structure with DELETE: it leaves the board and the list and answers 404 after', async () => {
    const res = await cp.json('POST', '/api/structures', { record: recordOf('banner', 'Temporary sponsor banner') });
    expect(res.status).toBe(201);
    const id = res.body.structure.id as number;
    const del = await cp.json('DELETE', `/api/structures/${id}`);
    expect(del.status).toBe(200);
    expect(del.body).toEqual({ retired: true });
    expect((await viewer.json('GET', `/api/structures/${id}`)).status).toBe(404);
    expect((await viewer.json('GET', '/api/structures')).body.structures.map((s: { id: number }) => s.id)).not.toContain(id);
    expect((await viewer.json('GET', '/api/live')).body.structures.map((s: { id: number }) => s.id)).not.toContain(id);
    expect((await cp.json('PATCH', `/api/structures/${id}`, { location: 'x' })).status).toBe(404);
    expect((await cp.json('DELETE', `/api/structures/${id}`)).status).toBe(404);
  });
});

/** The validation library's own phrases, which must never reach a person (issue 12). */
const libraryWords = /Invalid (input|option|discriminator|string|number|key|element)|expected \w+, received|Too (small|big)|Unrecognized/;

describe('plain words in every 400, and a reference height below a face refused (POST /api/structures, POST /api/assess)', () => {
  const sentences = async (method: string, path: string, body: unknown) => {
    const res = await cp.json(method, path, body);
    expect(res.status).toBe(400);
    expect(res.body.error).toBe('invalid input');
    // The contract's shape (README "HTTP API"): each issue exactly a path and a message.
    for (const issue of res.body.issues) expect(Object.keys(issue).sort()).toEqual(['message', 'path']);
    for (const issue of res.body.issues) expect(issue.message, issue.path).not.toMatch(libraryWords);
    return res.body.issues as Array<{ path: string; message: string }>;
  };

  it('names an unknown or missing kind with the kinds there are, and the value given', async () => {
    expect(await sentences('POST', '/api/structures', { record: { ...recordOf('tent'), kind: 'yurt' } })).toEqual([
      { path: 'record.kind', message: 'must be one of tent, banner, screen, shell or custom, not “yurt”' },
    ]);
    const { kind: _kind, ...noKind } = recordOf('tent');
    expect(await sentences('POST', '/api/structures', { record: noKind })).toEqual([{ path: 'record.kind', message: 'is required: one of tent, banner, screen, shell or custom' }]);
    expect(await sentences('POST', '/api/assess', { structure: { name: 'Gate', kind: 7 }, gustMps: 20 })).toEqual([
      { path: 'structure.kind', message: 'must be one of tent, banner, screen, shell or custom, not 7' },
    ]);
  });

  it('says a missing number is required, text is not a number, and which of closed or open a side may be', async () => {
    const { heightM: _h, ...bannerNoHeight } = recordOf('banner');
    expect(await sentences('POST', '/api/structures', { record: bannerNoHeight })).toEqual([{ path: 'record.heightM', message: 'is required (a number)' }]);
    expect(await sentences('POST', '/api/structures', { record: { ...recordOf('shell'), radiusM: '3.5' } })).toEqual([{ path: 'record.radiusM', message: 'must be a number, not text (“3.5”)' }]);
    const { wallsClosed: _w, ...tent } = recordOf('tent');
    expect(await sentences('POST', '/api/structures', { record: { ...tent, sides: { front: 'rolled up', back: 'closed', endY0: 'closed', endYW: 'closed' } } })).toEqual([
      { path: 'record.sides.front', message: 'must be “closed” or “open”, not “rolled up”' },
    ]);
    // Around the record too (the register's own fields go through the same wording).
    const around = await sentences('POST', '/api/structures', { record: recordOf('tent', 'Plain tent'), latDeg: 'north', mobile: 'yes' });
    expect(around).toEqual(
      expect.arrayContaining([
        { path: 'latDeg', message: expect.stringMatching(/^must be a number/) },
        { path: 'mobile', message: expect.stringMatching(/^must be true or false/) },
      ]),
    );
    const assess = await sentences('POST', '/api/assess', { structure: { kind: 'banner', name: 'Gate' }, gustMps: 'twenty' });
    expect(assess).toEqual(
      expect.arrayContaining([
        { path: 'gustMps', message: 'must be a number, not text' },
        { path: 'structure.heightM', message: 'is required (a number)' },
        { path: 'structure.ballastPerFootKg', message: 'is required (a number)' },
      ]),
    );
  });

  it('a fence with neither panels nor a length is asked for its panel width and panel count', async () => {
    const { widthM: _w, feet: _f, ...fence } = recordOf('banner');
    expect(await sentences('POST', '/api/assess', { structure: fence, gustMps: 20 })).toEqual([
      { path: 'structure.panelWidthM', message: expect.stringMatching(/^is required with the number of panels \(the feet follow/) },
    ]);
  });

  // Hand-worked centroids: the tent's roof side elevation at eave + rise / 2 = 2.4 + 1.6 / 2 = 3.2 m
  // (above the gable triangle's 2.4 + 1.6 / 3 and the walls' 1.2 m); the fence's banner at
  // clearance + h / 2 = 0.1 + 1 = 1.1 m; the custom arch's header board as given, 3.2 m.
  it.each([
    ['custom', 3.1, 3.2, 'header board'],
    ['tent', 3.1, 3.2, 'roof, side elevation'],
    ['banner', 1.0, 1.1, 'banner'],
  ] as const)('%s: a reference height of %s m, below the highest face centroid (%s m), is refused naming the field and the face; stores nothing', async (kind, lowM, centroidM, face) => {
    const count = await structureCount();
    const record = { ...recordOf(kind, `Reference ${kind}`), referenceHeightM: lowM };
    const saved = await sentences('POST', '/api/structures', { record });
    expect(saved).toEqual([{ path: 'record.referenceHeightM', message: expect.stringContaining(`must be at least ${centroidM} m`) }]);
    expect(saved[0]!.message).toContain(face);
    expect(saved[0]!.message).toMatch(/under-reads the wind on that face/);
    expect(await structureCount()).toBe(count);
    const assessed = await sentences('POST', '/api/assess', { structure: record, gustMps: 20 });
    expect(assessed).toEqual([{ path: 'structure.referenceHeightM', message: saved[0]!.message }]);
    // At the centroid itself it is accepted (the rule is "not below").
    const atCentroid = await cp.json('POST', '/api/structures', { record: { ...record, referenceHeightM: centroidM } });
    expect(atCentroid.status).toBe(201);
    expect((await cp.json('DELETE', `/api/structures/${atCentroid.body.structure.id}`)).status).toBe(200);
  });

  it('a PATCH lowering the reference height below a face is refused and the structure kept', async () => {
    const made = await cp.json('POST', '/api/structures', { record: { ...recordOf('custom', 'Arch to patch'), referenceHeightM: 6.4 } });
    expect(made.status).toBe(201);
    const id = made.body.structure.id as number;
    const issues = await sentences('PATCH', `/api/structures/${id}`, { record: { ...recordOf('custom', 'Arch to patch'), referenceHeightM: 2 } });
    expect(issues.map((i) => i.path)).toEqual(['record.referenceHeightM']);
    expect((await cp.json('GET', `/api/structures/${id}`)).body.structure.record.referenceHeightM).toBe(6.4);
    expect((await cp.json('DELETE', `/api/structures/${id}`)).status).toBe(200);
  });
});

describe('request bodies', () => {
  it('refuses a body over 2 MiB with 413 and stores nothing', async () => {
    const { cookie, csrf } = await rawSession('rowan.ashby', 'rowan.ashby-pass-1234');
    const count = await structureCount();
    const body = JSON.stringify({ record: recordOf('tent', 'Huge tent'), location: 'x'.repeat(2 * 1024 * 1024 + 1) });
    const res = await rawRequest('POST', '/api/structures', { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(body)) }, body);
    expect(res.status).toBe(413);
    expect(JSON.parse(res.text).error).toMatch(/larger than/);
    expect(await structureCount()).toBe(count);
  });

  it('refuses a register import over 2 MiB with 413', async () => {
    const { cookie, csrf } = await rawSession('rowan.ashby', 'rowan.ashby-pass-1234');
    const body = JSON.stringify({ mode: 'merge', register: { padding: 'y'.repeat(3 * 1024 * 1024) } });
    const res = await rawRequest('POST', '/api/register/import', { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(body)) }, body);
    expect(res.status).toBe(413);
  });

  it('reads a body just under 2 MiB (and then judges its content: 400, not 413)', async () => {
    const res = await cp.json('POST', '/api/structures', { record: recordOf('tent', 'Big but fine'), location: 'x'.repeat(2 * 1024 * 1024 - 500) });
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('location');
  });

  it('answers 400 naming the body when it is not valid JSON', async () => {
    const res = await cp.json('POST', '/api/sensors', '{"key": "gate-pole", "name": ');
    expect(res.status).toBe(400);
    expect(res.body.issues).toEqual([{ path: '', message: expect.stringMatching(/JSON/) }]);
  });

  const jsonEndpoints: Array<[string, string]> = [
    ['POST', '/api/sensors'],
    ['PATCH', '/api/sensors/north-mast'],
    ['PATCH', '/api/site'],
    ['POST', '/api/gateways'],
    ['PATCH', '/api/gateways/1'],
    ['POST', '/api/structures'],
    ['PATCH', '/api/structures/1'],
    ['POST', '/api/register/import'],
    ['POST', '/api/people'],
    ['PATCH', '/api/people/1'],
    ['POST', '/api/site-links'],
    ['POST', '/api/alerts/1/acknowledge'],
    ['POST', '/api/forecast'],
    ['POST', '/api/session'],
    ['POST', '/api/setup'],
    ['POST', '/api/assess'],
  ];

  it.each(jsonEndpoints)('%s %s refuses a text/plain body with 415', async (method, path) => {
    const body = JSON.stringify({ name: 'Brackenfold Common' });
    const res = await admin.request(method, path, body, { 'content-type': 'text/plain' });
    expect(res.status).toBe(415);
    expect(((await res.json()) as { error: string }).error).toMatch(/application\/json/);
  });

  let adminSession: Promise<{ cookie: string; csrf: string }> | null = null;
  it.each(jsonEndpoints)('%s %s refuses a body without a content type with 415', async (method, path) => {
    adminSession ??= rawSession(adminUsername, adminPassword);
    const { cookie, csrf } = await adminSession;
    const res = await fetch(`${ts.baseUrl}${path}`, { method, headers: { cookie, 'x-csrf-token': csrf }, body: new Uint8Array(Buffer.from('{"name":"Brackenfold Common"}')) });
    expect(res.status).toBe(415);
  });

  it('names every unknown field at its own path (a misspelt field must not go unnoticed)', async () => {
    const cases: Array<[string, string, unknown, string]> = [
      ['POST', '/api/sensors', { key: 'west-mast', name: 'West mast', heightM: 10, colour: 'red' }, 'colour'],
      ['PATCH', '/api/sensors/north-mast', { hieghtM: 11 }, 'hieghtM'],
      ['PATCH', '/api/site', { altitude: 200 }, 'altitude'],
      ['POST', '/api/gateways', { name: 'G', username: 'west-gw', sensors: [] }, 'sensors'],
      ['POST', '/api/structures', { record: recordOf('tent', 'Spelling tent'), colour: 'white' }, 'colour'],
      ['POST', '/api/people', { username: 'sam.reed', displayName: 'Sam Reed', role: 'crew', password: 'sam-reed-pass-123', team: 'riggers' }, 'team'],
      ['POST', '/api/site-links', { label: 'Gate', validHours: 12, note: 'x' }, 'note'],
      ['POST', '/api/forecast', { text: 'time;gust (m/s)\n2026-06-12T14:00Z;9', units: 'm/s' }, 'units'],
    ];
    const answers: Array<[string, number, string[]]> = [];
    for (const [method, path, body, field] of cases) {
      const res = await admin.json(method, path, body);
      answers.push([`${method} ${path} (${field})`, res.status, paths(res.body)]);
    }
    expect(answers).toEqual(cases.map(([method, path, , field]) => [`${method} ${path} (${field})`, 400, expect.arrayContaining([field])]));
  });
});

describe('the audit trail (GET /api/log/audit)', () => {
  it('records who changed a structure, with the person’s name, and what it was before and after', async () => {
    const created = await cp.json('POST', '/api/structures', { record: recordOf('tent', 'Crafts marquee'), location: 'South field' });
    expect(created.status).toBe(201);
    const id = created.body.structure.id as number;
    const sinceMs = created.body.structure.createdAtMs as number;
    const record = { ...recordOf('tent', 'Crafts marquee'), ballastPerLegKg: 650 };
    expect((await cp.json('PATCH', `/api/structures/${id}`, { record, location: 'South field, by the pond' })).status).toBe(200);

    const res = await viewer.json('GET', `/api/log/audit?from=${sinceMs}&to=${Date.now() + 1000}`);
    expect(res.status).toBe(200);
    const entries = res.body.audit.filter((e: { entity: string; entityId: string }) => e.entity === 'structure' && e.entityId === String(id));
    expect(entries.map((e: { action: string }) => e.action)).toEqual(['create', 'update']);
    const update = entries[1];
    expect(update.actor).toContain(cpName);
    expect(update.atMs).toBeGreaterThanOrEqual(sinceMs);
    expect(update.beforeJson).toMatchObject({ location: 'South field', record: { ballastPerLegKg: 500 } });
    expect(update.afterJson).toMatchObject({ location: 'South field, by the pond', record: { ballastPerLegKg: 650 } });
  });

  it('records nothing for a change that was refused', async () => {
    const created = await cp.json('POST', '/api/structures', { record: recordOf('screen', 'Second screen') });
    const id = created.body.structure.id as number;
    const count = async () => (await viewer.json('GET', `/api/log/audit?from=${created.body.structure.createdAtMs}&to=${Date.now() + 1000}`)).body.audit.length as number;
    const before = await count();
    expect((await cp.json('PATCH', `/api/structures/${id}`, { record: { ...recordOf('screen', 'Second screen'), widthM: -4 } })).status).toBe(400);
    expect(await count()).toBe(before);
  });

  it('records sensor and site changes with the actor’s name, before and after', async () => {
    expect((await cp.json('POST', '/api/sensors', { key: 'audit-mast', name: 'Car park mast', heightM: 6, location: 'Car park' })).status).toBe(201);
    const deadBandBefore = (await viewer.json('GET', '/api/site')).body.site.deadBandFraction as number;
    const fromMs = Date.now() - 1;
    expect((await cp.json('PATCH', '/api/sensors/audit-mast', { location: 'Car park, west corner' })).status).toBe(200);
    expect((await cp.json('PATCH', '/api/site', { deadBandFraction: 0.15 })).status).toBe(200);
    const res = await viewer.json('GET', `/api/log/audit?from=${fromMs}&to=${Date.now() + 1000}`);
    const sensor = res.body.audit.find((e: { entity: string; entityId: string }) => e.entity === 'sensor' && e.entityId === 'audit-mast');
    const site = res.body.audit.find((e: { entity: string }) => e.entity === 'site');
    expect(sensor).toMatchObject({ action: 'update', beforeJson: { location: 'Car park' }, afterJson: { location: 'Car park, west corner' } });
    expect(sensor.actor).toContain(cpName);
    expect(site.beforeJson.deadBandFraction).toBe(deadBandBefore);
    expect(site.afterJson.deadBandFraction).toBe(0.15);
    expect(site.actor).toContain(cpName);
  });

  it('exports the audit trail as CSV with who, what, before and after', async () => {
    const res = await viewer.request('GET', '/api/export/audit.csv');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    const text = await res.text();
    expect(text.split('\r\n')[0]).toBe('time_local,time_utc,who,what,id,action,before,after');
    expect(text).toContain(cpName);
    expect(text).toContain('Crafts marquee');
  });
});
