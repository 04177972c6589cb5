/**
 * Access control by role, endpoint by endpoint: every route of server/http/routes/*.ts with the
 * lowest role that may use it. Without a session the answer is 401; with too low a role 403, and
 * nothing changes; from the lowest allowed role up the request gets through to its own checks.
 * A steward's site link counts as a viewer. The calculator stays public.
 *
 * Scenario (invented): Brackenfold Common's crew list — a steward (viewer), a rigger (crew), the
 * competent person and the site administrator — plus a site link handed to the gate stewards.
 */
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';

type Role = 'viewer' | 'crew' | 'competent-person' | 'admin';
type Caller = 'anonymous' | 'site link' | Role;
const callers: Caller[] = ['anonymous', 'site link', 'viewer', 'crew', 'competent-person', 'admin'];
const rank: Record<Caller, number> = { anonymous: -1, 'site link': 0, viewer: 0, crew: 1, 'competent-person': 2, admin: 3 };

/** A browser: its session cookie and CSRF token, sent on every change. */
class Browser {
  constructor(
    readonly baseUrl: string,
    public cookie = '',
    public csrf = '',
  ) {}

  static async signIn(baseUrl: string, username: string, password: string): Promise<Browser> {
    const res = await fetch(`${baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username, password }) });
    expect(res.status).toBe(200);
    return new Browser(baseUrl, res.headers.get('set-cookie')!.split(';')[0]!, ((await res.json()) as { csrfToken: string }).csrfToken);
  }

  /** Opens a site link as a steward's phone would, and reads the session's CSRF token. */
  static async openLink(url: string): Promise<Browser> {
    const res = await fetch(url, { redirect: 'manual' });
    expect(res.status).toBe(303);
    const browser = new Browser(new URL(url).origin, res.headers.get('set-cookie')!.split(';')[0]!);
    const session = await browser.send('GET', '/api/session');
    expect(session.body).toMatchObject({ signedIn: true, kind: 'link', role: 'viewer' });
    browser.csrf = session.body.csrfToken;
    return browser;
  }

  async send(method: string, path: string, body?: unknown): Promise<{ status: number; body: any }> {
    const headers: Record<string, string> = {};
    if (this.cookie) headers.cookie = this.cookie;
    if (this.csrf && method !== 'GET') headers['x-csrf-token'] = this.csrf;
    if (body !== undefined) headers['content-type'] = 'application/json';
    const res = await fetch(`${this.baseUrl}${path}`, { method, headers, ...(body === undefined ? {} : { body: JSON.stringify(body) }) });
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = JSON.parse(text);
    } catch {
      // CSV and plain text stay text.
    }
    return { status: res.status, body: parsed };
  }
}

let ts: TestServer;
let admin: Browser;
const browsers = new Map<Caller, Browser>();
/** Ids of things the refused requests aim at (a missing guard would change them). */
const ids = { viewerPerson: 0, siteLink: 0, gateway: 0, structure: 0, alert: 0 };

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

beforeAll(async () => {
  ts = await startTestServer();
  admin = await Browser.signIn(ts.baseUrl, adminUsername, adminPassword);
  const people: Array<[Role, string, string]> = [
    ['viewer', 'ellis.fairweather', 'Ellis Fairweather'],
    ['crew', 'morgan.tait', 'Morgan Tait'],
    ['competent-person', 'rowan.ashby', 'Rowan Ashby'],
    ['admin', 'jo.marsh', 'Jo Marsh'],
  ];
  for (const [role, username, displayName] of people) {
    const created = await ok(admin.send('POST', '/api/people', { username, displayName, role, password: `${username}-pass-1234` }), 201);
    if (role === 'viewer') ids.viewerPerson = created.person.id;
  }
  await Promise.all(people.map(async ([role, username]) => browsers.set(role, await Browser.signIn(ts.baseUrl, username, `${username}-pass-1234`))));
  browsers.set('anonymous', new Browser(ts.baseUrl));

  const cp = browsers.get('competent-person')!;
  const stewardsLink = await ok(cp.send('POST', '/api/site-links', { label: 'Gate stewards', validHours: 12 }), 201);
  browsers.set('site link', await Browser.openLink(stewardsLink.url));
  ids.siteLink = (await ok(cp.send('POST', '/api/site-links', { label: 'Car park stewards', validHours: 12 }), 201)).id;

  await ok(cp.send('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10, mode: 'summaries' }), 201);
  const gateway = await ok(cp.send('POST', '/api/gateways', { name: 'Mast gateway', username: 'brackenfold-gw', sensorKeys: ['north-mast'] }), 201);
  ids.gateway = gateway.gateway.id;
  const levels = [
    { label: 'Watch', trigger: { kind: 'gust', gustMps: 5 }, actionText: 'Check the ballast.' },
    { label: 'Stop and clear', trigger: { kind: 'gust', gustMps: 10 }, actionText: 'Clear the arch.' },
  ];
  const record = { kind: 'custom', name: 'Gate arch', baseDepthM: 1.5, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 1000, xM: 0.75 }] };
  ids.structure = (await ok(cp.send('POST', '/api/structures', { record, levels }), 201)).structure.id;

  // A gust raises an alert that crew may acknowledge and a viewer may not.
  const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'brackenfold-gw', password: gateway.password, reconnectPeriod: 0 });
  await client.publishAsync('wind/north-mast/reading', JSON.stringify({ ts: Date.now(), speed: 8, gust: 14 }), { qos: 1 });
  await client.endAsync();
  const alert = await waitFor(async () => (await admin.send('GET', '/api/live')).body.alerts.find((a: { structureId: number }) => a.structureId === ids.structure), 5_000, 'an alert');
  ids.alert = alert.id;
});

afterAll(async () => {
  await ts?.stop();
});

/**
 * One route: the lowest role that may use it; a valid request (what a refused caller sends:
 * were the guard missing, it would change something); and a harmless probe for allowed callers
 * (invalid input or an unknown id, so their answer proves they got past the guard and changes
 * nothing), with the status the probe gets.
 */
interface Route {
  method: string;
  path: () => string;
  min: Role;
  valid?: () => unknown;
  probe: { path?: () => string; body?: unknown; status: number } | null;
}

const validStructure = { record: { kind: 'banner', name: 'Intruder banner', widthM: 6, heightM: 2, clearanceM: 0, feet: 4, ballastPerFootKg: 50, footDepthM: 1, selfWeightKg: 80 } };

const routes: Route[] = [
  // accessRoutes.ts
  { method: 'POST', path: () => '/api/session/everywhere', min: 'viewer', probe: null },
  { method: 'GET', path: () => '/api/people', min: 'admin', probe: { status: 200 } },
  { method: 'POST', path: () => '/api/people', min: 'admin', valid: () => ({ username: 'intruder', displayName: 'Intruder', role: 'admin', password: 'intruder-pass-1234' }), probe: { body: {}, status: 400 } },
  { method: 'PATCH', path: () => `/api/people/${ids.viewerPerson}`, min: 'admin', valid: () => ({ role: 'admin' }), probe: { body: { role: 'owner' }, status: 400 } },
  { method: 'GET', path: () => '/api/site-links', min: 'competent-person', probe: { status: 200 } },
  { method: 'POST', path: () => '/api/site-links', min: 'competent-person', valid: () => ({ label: 'Intruder link', validHours: 700 }), probe: { body: { label: '' }, status: 400 } },
  { method: 'DELETE', path: () => `/api/site-links/${ids.siteLink}`, min: 'competent-person', probe: { path: () => '/api/site-links/999999', status: 404 } },
  // liveRoutes.ts
  { method: 'GET', path: () => '/api/live', min: 'viewer', probe: { status: 200 } },
  { method: 'POST', path: () => `/api/alerts/${ids.alert}/acknowledge`, min: 'crew', valid: () => ({ note: 'not mine to acknowledge' }), probe: { path: () => '/api/alerts/999999/acknowledge', body: {}, status: 404 } },
  { method: 'POST', path: () => '/api/alerts/acknowledge', min: 'crew', valid: () => ({ structureId: ids.structure, note: 'not mine to acknowledge' }), probe: { body: { structureId: 999999 }, status: 404 } },
  // registerRoutes.ts
  { method: 'GET', path: () => '/api/site', min: 'viewer', probe: { status: 200 } },
  { method: 'PATCH', path: () => '/api/site', min: 'competent-person', valid: () => ({ name: 'Taken over' }), probe: { body: { altitudeM: 'high' }, status: 400 } },
  { method: 'GET', path: () => '/api/sensors', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/sensors/north-mast', min: 'viewer', probe: { status: 200 } },
  { method: 'POST', path: () => '/api/sensors', min: 'competent-person', valid: () => ({ key: 'intruder-mast', name: 'Intruder', heightM: 3 }), probe: { body: {}, status: 400 } },
  { method: 'PATCH', path: () => '/api/sensors/north-mast', min: 'competent-person', valid: () => ({ unit: 'mph' }), probe: { body: { heightM: -1 }, status: 400 } },
  { method: 'DELETE', path: () => '/api/sensors/north-mast', min: 'competent-person', probe: { path: () => '/api/sensors/no-such-mast', status: 404 } },
  { method: 'GET', path: () => '/api/rejections', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/refusals', min: 'competent-person', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/setup/checklist', min: 'competent-person', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/gateways', min: 'competent-person', probe: { status: 200 } },
  { method: 'GET', path: () => `/api/gateways/${ids.gateway}`, min: 'competent-person', probe: { status: 200 } },
  { method: 'POST', path: () => '/api/gateways', min: 'competent-person', valid: () => ({ name: 'Intruder', username: 'intruder-gw', sensorKeys: ['north-mast'] }), probe: { body: {}, status: 400 } },
  { method: 'PATCH', path: () => `/api/gateways/${ids.gateway}`, min: 'competent-person', valid: () => ({ newPassword: true }), probe: { body: { name: '' }, status: 400 } },
  { method: 'DELETE', path: () => `/api/gateways/${ids.gateway}`, min: 'competent-person', probe: { path: () => '/api/gateways/999999', status: 404 } },
  { method: 'GET', path: () => '/api/structures', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => `/api/structures/${ids.structure}`, min: 'viewer', probe: { status: 200 } },
  { method: 'POST', path: () => '/api/structures', min: 'competent-person', valid: () => validStructure, probe: { body: {}, status: 400 } },
  { method: 'PATCH', path: () => `/api/structures/${ids.structure}`, min: 'competent-person', valid: () => ({ location: 'Moved by an intruder' }), probe: { body: { orientationDeg: 999 }, status: 400 } },
  { method: 'DELETE', path: () => `/api/structures/${ids.structure}`, min: 'competent-person', probe: { path: () => '/api/structures/999999', status: 404 } },
  { method: 'GET', path: () => '/api/register', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/register.csv', min: 'viewer', probe: { status: 200 } },
  {
    method: 'POST',
    path: () => '/api/register/import',
    min: 'competent-person',
    valid: () => ({ mode: 'replace', register: { format: 'holdfast-register', version: 1, site: emptySite, sensors: [], gateways: [], structures: [] } }),
    probe: { body: { mode: 'overwrite', register: {} }, status: 400 },
  },
  // logRoutes.ts
  { method: 'GET', path: () => '/api/log/wind', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => `/api/log/structures/${ids.structure}`, min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/log/levels', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/log/alerts', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/log/audit', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/log/summary', min: 'viewer', probe: { status: 200 } },
  { method: 'GET', path: () => '/api/export/audit.csv', min: 'viewer', probe: { status: 200 } },
  { method: 'POST', path: () => '/api/forecast', min: 'viewer', valid: () => ({ text: 'time;gust (m/s)\n2026-06-14T12:00Z;9' }), probe: { body: { text: 'time;gust (m/s)\n2026-06-14T12:00Z;9' }, status: 200 } },
];

const emptySite = {
  name: 'Wiped',
  altitudeM: 0,
  terrainCategory: 'II',
  timeZone: 'UTC',
  airDensityMode: 'isa',
  fixedAirDensityKgM3: null,
  heightReductionEnabled: false,
  directionalEnabled: false,
  deadBandFraction: 0.1,
  holdTimeMs: 900_000,
  defaultLevels: [{ label: 'Only', trigger: { kind: 'utilization', fraction: 1 }, actionText: '' }],
};

/** Everything a refused request could have changed, as the administrator sees it. */
async function everything(): Promise<unknown> {
  const register = await ok(admin.send('GET', '/api/register'));
  delete register.exportedAtMs;
  const alerts = (await ok(admin.send('GET', '/api/log/alerts'))).alerts.filter((a: { id: number }) => a.id === ids.alert);
  const audit = (await ok(admin.send('GET', '/api/log/audit'))).audit;
  return {
    register,
    people: (await ok(admin.send('GET', '/api/people'))).people,
    siteLinks: (await ok(admin.send('GET', '/api/site-links'))).siteLinks,
    gateways: (await ok(admin.send('GET', '/api/gateways'))).gateways,
    alerts,
    audit,
  };
}

describe('access control by role', () => {
  let before: unknown;
  beforeAll(async () => {
    before = await everything();
  });

  it.each(routes.map((r) => [`${r.method} ${r.path.toString().replace(/^\(\) => /, '').replace(/[`'"]/g, '').replace(/\$\{ids\.(\w+)\}/g, ':$1')}`, r] as const))(
    '%s: 401 without a session, 403 below its role, through to its own checks from its role up',
    async (_name, route) => {
      const got: Array<[Caller, number]> = [];
      const want: Array<[Caller, number | string]> = [];
      for (const caller of callers) {
        const browser = browsers.get(caller)!;
        if (rank[caller] < rank[route.min]) {
          const res = await browser.send(route.method, route.path(), route.valid?.());
          got.push([caller, res.status]);
          want.push([caller, caller === 'anonymous' ? 401 : 403]);
        } else if (route.probe) {
          const res = await browser.send(route.method, route.probe.path?.() ?? route.path(), route.probe.body);
          got.push([caller, res.status]);
          want.push([caller, route.probe.status]);
        }
      }
      expect(got).toEqual(want);
    },
  );

  it('changed nothing through all the refused and probing requests above', async () => {
    expect(await everything()).toEqual(before);
  });

  it('GET /api/stream: 401 without a session; a live event stream for a viewer and a site link', async () => {
    expect((await browsers.get('anonymous')!.send('GET', '/api/stream')).status).toBe(401);
    for (const caller of ['viewer', 'site link'] as const) {
      const controller = new AbortController();
      const res = await fetch(`${ts.baseUrl}/api/stream`, { headers: { cookie: browsers.get(caller)!.cookie }, signal: controller.signal });
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toMatch(/^text\/event-stream/);
      const reader = res.body!.getReader();
      const first = new TextDecoder().decode((await reader.read()).value);
      expect(first).toContain('event: hello');
      controller.abort();
      await reader.cancel().catch(() => undefined);
    }
  });

  it('the error of a refused request names the role it needs, never what the caller could otherwise learn', async () => {
    const res = await browsers.get('crew')!.send('GET', '/api/gateways');
    expect(res).toEqual({ status: 403, body: { error: 'this needs the competent-person role' } });
    const anonymous = await browsers.get('anonymous')!.send('GET', '/api/people');
    expect(anonymous).toEqual({ status: 401, body: { error: 'sign in first' } });
  });
});

describe('public endpoints', () => {
  const record = { kind: 'custom', name: 'Sponsor arch', baseDepthM: 1.5, frictionCoefficient: 0.3, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ label: 'ballast', massKg: 1000, xM: 0.75 }] };

  it('the calculator (POST /api/assess) answers anyone, without a session or CSRF token, and stores nothing', async () => {
    const before = await everything();
    const res = await fetch(`${ts.baseUrl}/api/assess`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ structure: record, gustMps: 18 }) });
    expect(res.status).toBe(200);
    const report = (await res.json()) as { qPa: number; limitGustMps: number; governing: string };
    expect(report.qPa).toBeCloseTo(0.5 * 1.225 * 18 * 18, 6);
    expect(report.limitGustMps).toBeGreaterThan(0);
    expect(['overturning', 'sliding', 'uplift']).toContain(report.governing);
    expect(await everything()).toEqual(before);
  });

  it('the calculator answers a signed-in viewer and a site link too', async () => {
    for (const caller of ['viewer', 'site link'] as const) {
      const res = await browsers.get(caller)!.send('POST', '/api/assess', { structure: record, gustMps: 10 });
      expect(res.status).toBe(200);
    }
  });

  it.each([
    ['GET', '/api/health', 200],
    ['GET', '/api/setup', 200],
    ['GET', '/api/session', 200],
  ])('%s %s answers without a session', async (method, path, status) => {
    expect((await browsers.get('anonymous')!.send(method, path)).status).toBe(status);
  });

  it('GET /api/session tells an anonymous caller it is not signed in, and a person who they are', async () => {
    expect((await browsers.get('anonymous')!.send('GET', '/api/session')).body).toEqual({ signedIn: false, setupPending: false });
    const me = await browsers.get('crew')!.send('GET', '/api/session');
    expect(me.body).toMatchObject({ signedIn: true, kind: 'person', role: 'crew', name: 'Morgan Tait (morgan.tait)' });
  });
});
