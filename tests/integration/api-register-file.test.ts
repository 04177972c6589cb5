/**
 * The whole register as a file: export as JSON and CSV, import into a fresh server, export again
 * and get the same register back (apart from timestamps, and gateways, whose credentials an
 * import never creates). Invalid files are refused with every problem named and change nothing.
 *
 * Scenario (invented): the plan of "Brackenfold Common" is moved from the planning server to the
 * server that runs on site, once as JSON and once through a spreadsheet (CSV).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

/** The planning server, where the register is written. */
let source: TestServer;
/** Fresh servers the register is imported into: JSON, and CSV. */
let jsonTarget: TestServer;
let csvTarget: TestServer;
let cp: ApiClient;
let jsonAdmin: ApiClient;
let csvAdmin: ApiClient;

const csvHeader = 'entity,key,name,heightM,location,latDeg,lonDeg,unit,mode,silenceTimeoutMs,orientationDeg,mobile,sensorKeys,levels_json,record_json,settings_json';

function paths(body: { issues?: Array<{ path: string }> } | null): string[] {
  return (body?.issues ?? []).map((i) => i.path);
}

async function signedIn(ts: TestServer): Promise<ApiClient> {
  const client = new ApiClient(ts.baseUrl);
  expect((await client.signIn(adminUsername, adminPassword)).status).toBe(200);
  return client;
}

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

/** The register without its export time. */
function withoutTimestamps(register: Record<string, unknown>): Record<string, unknown> {
  const { exportedAtMs: _exportedAtMs, ...rest } = register;
  return rest;
}

const siteLevels = [
  { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.55 }, actionText: 'Walk round every structure and check the ballast.' },
  { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.75 }, actionText: 'Drop scrims, lower the screen, brief the stewards.' },
  { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Stop the show and clear the exclusion zones.' },
];

/** Writes the register of Brackenfold Common on the planning server. */
async function writeRegister(client: ApiClient): Promise<void> {
  await ok(
    client.json('PATCH', '/api/site', {
      name: 'Brackenfold Common',
      altitudeM: 85,
      terrainCategory: 'III',
      timeZone: 'Europe/London',
      airDensityMode: 'fixed',
      fixedAirDensityKgM3: 1.25,
      heightReductionEnabled: true,
      directionalEnabled: true,
      deadBandFraction: 0.12,
      holdTimeMs: 1_200_000,
      defaultLevels: siteLevels,
    }),
  );
  await ok(client.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10, location: 'Mast by the north fence, clear of the trees' }), 201);
  await ok(
    client.json('POST', '/api/sensors', { key: 'stage-roof', name: 'Stage roof', heightM: 8, location: 'Upwind corner, "B" truss', latDeg: 54.4102, lonDeg: -2.9731, unit: 'kn', mode: 'summaries', silenceTimeoutMs: 60_000 }),
    201,
  );
  await ok(client.json('POST', '/api/sensors', { key: 'east-gate', name: 'East gate pole', heightM: 4, unit: 'km/h' }), 201);
  await ok(client.json('POST', '/api/gateways', { name: 'Mast gateway', username: 'brackenfold-gw', sensorKeys: ['north-mast', 'stage-roof'] }), 201);

  const structures = [
    {
      record: { kind: 'tent', name: 'Hospitality marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed: true, legs: 8, ballastPerLegKg: 500, selfWeightKg: 900 },
      location: 'South field,\nnext to the pond',
      orientationDeg: 200,
      sensorKeys: ['north-mast', 'east-gate'],
    },
    {
      record: { kind: 'banner', name: 'North fence scrim', widthM: 20, heightM: 2, clearanceM: 0.1, solidity: 0.5, feet: 12, ballastPerFootKg: 300, footDepthM: 1.6, selfWeightKg: 300, coefficients: { cf: 1.3 }, coefficientSource: 'Manufacturer sheet HF-22, table 3' },
      location: 'North fence',
      levels: [
        { label: 'Watch', trigger: { kind: 'gust', gustMps: 9 }, actionText: 'Check the feet, ballast and cable ties.' },
        { label: 'Prepare', trigger: { kind: 'gust', gustMps: 12 }, actionText: 'Unclip every second bay.' },
        { label: 'Drop', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Drop the scrim to the ground and roll it.' },
      ],
    },
    {
      record: { kind: 'screen', name: 'Side screen', widthM: 4, heightM: 2.5, bottomHeightM: 3, supportTowers: 2, towerMassKg: 400, screenMassKg: 700, outriggerDepthM: 3.5, ballastPerTowerKg: 1200, surface: 'hard' },
      location: 'Stage left',
      latDeg: 54.41,
      lonDeg: -2.9735,
      mobile: true,
    },
    { record: { kind: 'shell', name: 'Band shell', radiusM: 3.5, form: 'open', selfWeightKg: 2000, frontBallastKg: 600, backBallastKg: 1500, ratedGustMps: 20 }, orientationDeg: 45 },
    {
      record: {
        kind: 'custom',
        name: 'Sponsor arch "Hartley\'s", gate 2',
        baseDepthM: 1.2,
        frictionCoefficient: 0.35,
        faces: [
          { label: 'header board', areaM2: 5, centroidHeightM: 3.2, cfFront: 1.8, cfBack: 1.8 },
          { label: 'two posts', areaM2: 1.8, centroidHeightM: 1.4, cfFront: 1.2, cfBack: 1.2 },
        ],
        uplift: { planAreaM2: 1, liftCoefficient: 0.2 },
        masses: [
          { label: 'arch frame', massKg: 180, xM: 0.6 },
          { label: 'water ballast, back', massKg: 600, xM: 1.1 },
        ],
        safetyFactors: { overturning: 1.6 },
        ratedGustMps: 18,
      },
      location: 'Gate 2',
    },
  ];
  for (const s of structures) await ok(client.json('POST', '/api/structures', s), 201);
}

beforeAll(async () => {
  [source, jsonTarget, csvTarget] = await Promise.all([startTestServer(), startTestServer(), startTestServer()]);
  cp = await signedIn(source);
  jsonAdmin = await signedIn(jsonTarget);
  csvAdmin = await signedIn(csvTarget);
  await writeRegister(cp);
});

afterAll(async () => {
  await Promise.all([source?.stop(), jsonTarget?.stop(), csvTarget?.stop()]);
});

describe('register export (GET /api/register, /api/register.csv)', () => {
  it('exports the whole register as a JSON attachment, gateways without any password', async () => {
    const res = await cp.request('GET', '/api/register');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^application\/json/);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="register\.json"/);
    const register = (await res.json()) as any;
    expect(register).toMatchObject({ format: 'holdfast-register', version: 1, site: { name: 'Brackenfold Common', timeZone: 'Europe/London', defaultLevels: siteLevels } });
    expect(register.exportedAtMs).toEqual(expect.any(Number));
    expect(register.sensors.map((s: { key: string }) => s.key)).toEqual(['north-mast', 'stage-roof', 'east-gate']);
    expect(register.gateways).toEqual([{ name: 'Mast gateway', username: 'brackenfold-gw', sensorKeys: ['north-mast', 'stage-roof'] }]);
    expect(register.structures).toHaveLength(5);
    expect(JSON.stringify(register)).not.toMatch(/password|scrypt/i);
  });

  it('exports the register as CSV: text/csv, a header row, one row per item', async () => {
    const res = await cp.request('GET', '/api/register.csv');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="register\.csv"/);
    const text = await res.text();
    expect(text.split('\r\n')[0]).toBe(csvHeader);
    const entities = text
      .split('\r\n')
      .slice(1)
      .map((line) => line.split(',')[0])
      .filter((e) => e === 'site' || e === 'sensor' || e === 'gateway' || e === 'structure');
    expect(entities).toEqual(['site', 'sensor', 'sensor', 'sensor', 'gateway', 'structure', 'structure', 'structure', 'structure', 'structure']);
    // A name with a comma and quotes is one quoted field.
    expect(text).toContain('"Sponsor arch ""Hartley\'s"", gate 2"');
  });
});

describe('register round trip', () => {
  it('JSON: export → import into a fresh server → export again gives the same register', async () => {
    const exported = await ok(cp.json('GET', '/api/register'));
    const registerEvents: number[] = [];
    const stop = jsonTarget.server.hub.observe((event) => {
      if (event.kind === 'register') registerEvents.push(event.id);
    });
    const summary = (await ok(jsonAdmin.json('POST', '/api/register/import', { mode: 'merge', register: exported }))).imported;
    stop();
    expect(summary).toEqual({ siteUpdated: true, sensorsAdded: 3, sensorsUpdated: 0, sensorsRetired: 0, structuresAdded: 5, structuresUpdated: 0, structuresRetired: 0, gatewaysSkipped: 1 });
    // One import, one reload of the live board (one `register` event), not one per reload path.
    expect(registerEvents).toHaveLength(1);

    const again = await ok(jsonAdmin.json('GET', '/api/register'));
    // Gateways carry no password in the file, so an import makes none (README, registerFile.ts).
    expect(again.gateways).toEqual([]);
    expect(withoutTimestamps(again)).toEqual(withoutTimestamps({ ...exported, gateways: [] }));
  });

  it('JSON: the imported structures are assessed exactly as on the planning server', async () => {
    const triggers = async (client: ApiClient) => {
      const live = await ok(client.json('GET', '/api/live'));
      return Object.fromEntries(live.structures.map((s: { name: string; triggerGustsMps: number[] }) => [s.name, s.triggerGustsMps]));
    };
    const planned = await triggers(cp);
    expect(Object.keys(planned)).toHaveLength(5);
    expect(await triggers(jsonAdmin)).toEqual(planned);
  });

  it('JSON: importing the same file again updates in place and adds nothing', async () => {
    const exported = await ok(cp.json('GET', '/api/register'));
    const summary = (await ok(jsonAdmin.json('POST', '/api/register/import', { register: exported }))).imported;
    expect(summary).toMatchObject({ sensorsAdded: 0, sensorsUpdated: 3, structuresAdded: 0, structuresUpdated: 5, structuresRetired: 0 });
    expect((await ok(jsonAdmin.json('GET', '/api/structures'))).structures).toHaveLength(5);
    const again = await ok(jsonAdmin.json('GET', '/api/register'));
    expect(withoutTimestamps(again)).toEqual(withoutTimestamps({ ...exported, gateways: [] }));
  });

  it('CSV: export → import into a fresh server → export again gives the same file (without the gateway row)', async () => {
    const csv = await (await cp.request('GET', '/api/register.csv')).text();
    const res = await csvAdmin.request('POST', '/api/register/import', csv, { 'content-type': 'text/csv; charset=utf-8' });
    expect(res.status).toBe(200);
    const summary = ((await res.json()) as any).imported;
    expect(summary).toMatchObject({ siteUpdated: true, sensorsAdded: 3, structuresAdded: 5, gatewaysSkipped: 1 });

    const again = await (await csvAdmin.request('GET', '/api/register.csv')).text();
    const withoutGateways = csv
      .split('\r\n')
      .filter((line) => !line.startsWith('gateway,'))
      .join('\r\n');
    expect(again).toBe(withoutGateways);
    // And the JSON view of the CSV-imported register is the planning server's.
    const planned = await ok(cp.json('GET', '/api/register'));
    expect(withoutTimestamps(await ok(csvAdmin.json('GET', '/api/register')))).toEqual(withoutTimestamps({ ...planned, gateways: [] }));
  });

  it('CSV: text that starts with + - = or @ comes back as written (the spreadsheet guard is undone on import)', async () => {
    await ok(cp.json('PATCH', '/api/sensors/east-gate', { location: '+2 m above the gate arch' }));
    await ok(cp.json('PATCH', '/api/sensors/north-mast', { location: '-' }));
    const csv = await (await cp.request('GET', '/api/register.csv')).text();
    const res = await csvAdmin.request('POST', '/api/register/import', csv, { 'content-type': 'text/csv' });
    expect(res.status).toBe(200);
    expect((await ok(csvAdmin.json('GET', '/api/sensors/east-gate'))).sensor.location).toBe('+2 m above the gate arch');
    expect((await ok(csvAdmin.json('GET', '/api/sensors/north-mast'))).sensor.location).toBe('-');
  });

  it('replace mode retires the sensors and structures the file leaves out; merge keeps them', async () => {
    const exported = await ok(jsonAdmin.json('GET', '/api/register'));
    const smaller = {
      ...exported,
      sensors: exported.sensors.filter((s: { key: string }) => s.key !== 'east-gate'),
      structures: exported.structures
        .filter((s: { record: { name: string } }) => s.record.name !== 'Band shell')
        .map((s: { sensorKeys: string[] | null }) => ({ ...s, sensorKeys: s.sensorKeys?.filter((k) => k !== 'east-gate') ?? null })),
    };
    const merged = (await ok(jsonAdmin.json('POST', '/api/register/import', { mode: 'merge', register: smaller }))).imported;
    expect(merged).toMatchObject({ sensorsRetired: 0, structuresRetired: 0 });
    expect((await ok(jsonAdmin.json('GET', '/api/structures'))).structures).toHaveLength(5);

    const replaced = (await ok(jsonAdmin.json('POST', '/api/register/import', { mode: 'replace', register: smaller }))).imported;
    expect(replaced).toMatchObject({ sensorsRetired: 1, structuresRetired: 1 });
    const names = (await ok(jsonAdmin.json('GET', '/api/structures'))).structures.map((s: { name: string }) => s.name);
    expect(names).toHaveLength(4);
    expect(names).not.toContain('Band shell');
    expect((await jsonAdmin.json('GET', '/api/sensors/east-gate')).status).toBe(404);
  });
});

describe('register import refuses invalid files and changes nothing', () => {
  async function register(): Promise<any> {
    return ok(cp.json('GET', '/api/register'));
  }

  const cases: Array<[string, (r: any) => unknown, string[]]> = [
    ['a file of another format', (r) => ({ register: { ...r, format: 'spreadsheet' } }), ['register.format']],
    ['a file of version 2', (r) => ({ register: { ...r, version: 2 } }), ['register.version']],
    ['an unknown import mode', (r) => ({ mode: 'overwrite', register: r }), ['mode']],
    ['a site in a time zone that does not exist', (r) => ({ register: { ...r, site: { ...r.site, timeZone: 'Europe/Brackenfold' } } }), ['register.site.timeZone']],
    ['a sensor listed twice', (r) => ({ register: { ...r, sensors: [...r.sensors, { ...r.sensors[0], name: 'Copy' }] } }), ['register.sensors.3.key']],
    ['a sensor with a bad key', (r) => ({ register: { ...r, sensors: [...r.sensors, { ...r.sensors[0], key: 'West Mast' }] } }), ['register.sensors.3.key']],
    [
      'a structure with a negative mass (and a new sensor that must not be stored either)',
      (r) => ({
        register: {
          ...r,
          sensors: [...r.sensors, { key: 'west-mast', name: 'West mast', heightM: 10 }],
          structures: r.structures.map((s: any) => (s.record.kind === 'custom' ? { ...s, record: { ...s.record, masses: [{ massKg: -180, xM: 0.6 }] } } : s)),
        },
      }),
      // The custom record is the last of the five: structures are exported in name order.
      ['register.structures.4.record.masses.0.massKg'],
    ],
    [
      'a structure governed by a sensor the file does not list',
      (r) => ({ register: { ...r, structures: r.structures.map((s: any, i: number) => (i === 1 ? { ...s, sensorKeys: ['no-such-mast'] } : s)) } }),
      ['register.structures.1.sensorKeys.0'],
    ],
    [
      'two structures with one name',
      (r) => ({ register: { ...r, structures: [...r.structures, r.structures[0]] } }),
      ['register.structures.5.record.name'],
    ],
  ];

  it('exports structures in name order (the custom record last)', async () => {
    expect((await register()).structures.map((s: { record: { kind: string } }) => s.record.kind)).toEqual(['shell', 'tent', 'banner', 'screen', 'custom']);
  });

  it.each(cases)('refuses %s with 400 naming the fields', async (_what, make, expected) => {
    const before = withoutTimestamps(await register());
    const res = await cp.json('POST', '/api/register/import', make(await register()));
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(expect.arrayContaining(expected));
    expect(withoutTimestamps(await register())).toEqual(before);
    expect((await cp.json('GET', '/api/sensors/west-mast')).status).toBe(404);
  });

  async function importCsv(text: string): Promise<{ status: number; body: any }> {
    const res = await cp.request('POST', '/api/register/import', text, { 'content-type': 'text/csv' });
    return { status: res.status, body: await res.json() };
  }

  it('refuses a CSV with a broken JSON cell with 400 naming its line and column', async () => {
    const before = withoutTimestamps(await register());
    const csv = `${csvHeader}\r\nstructure,,Broken arch,,,,,,,,0,false,,,"{""kind"": ""custom"", ",\r\n`;
    const res = await importCsv(csv);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('line 2.record_json');
    expect(withoutTimestamps(await register())).toEqual(before);
  });

  it('refuses a CSV without the register columns with 400 naming the header', async () => {
    const res = await importCsv('name,height\r\nNorth mast,10\r\n');
    expect(res.status).toBe(400);
    expect(paths(res.body)).toContain('header');
  });

  it('refuses a CSV row of an unknown entity with 400 naming its line', async () => {
    const csv = await (await cp.request('GET', '/api/register.csv')).text();
    const res = await importCsv(`${csv}caravan,,Catering van,,,,,,,,,,,,,\r\n`);
    expect(res.status).toBe(400);
    expect(paths(res.body).some((p) => /^line \d+\.entity$/.test(p))).toBe(true);
  });

  it('refuses a CSV with an unclosed quote with 400', async () => {
    const res = await importCsv(`${csvHeader}\r\nsensor,gate-pole,"Gate pole,4,,,,m/s,samples,30000,,,,,,\r\n`);
    expect(res.status).toBe(400);
    expect(res.body.issues[0].message).toMatch(/quote/);
    expect((await cp.json('GET', '/api/sensors/gate-pole')).status).toBe(404);
  });
});
