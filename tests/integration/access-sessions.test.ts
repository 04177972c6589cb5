/**
 * Sessions and who may keep them: the CSRF token on every change, expired sessions, site links
 * that are withdrawn or run out, signing out (here and everywhere), and what an administrator's
 * change to a person does to that person's sessions; the last administrator stays.
 *
 * Scenario (invented): Brackenfold Common's site office manages its crew list during the event.
 * (Few wrong passwords are used here on purpose: five from one address lock sign-in for all.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

/** A browser: its session cookie and CSRF token. `send` sends the token unless told otherwise. */
class Browser {
  constructor(
    readonly baseUrl: string,
    public cookie = '',
    public csrf = '',
  ) {}

  async signIn(username: string, password: string, headers: Record<string, string> = {}): Promise<Response> {
    const res = await fetch(`${this.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify({ username, password }) });
    if (res.ok) {
      this.cookie = res.headers.get('set-cookie')!.split(';')[0]!;
      this.csrf = ((await res.clone().json()) as { csrfToken: string }).csrfToken;
    }
    return res;
  }

  static async of(baseUrl: string, username: string, password: string): Promise<Browser> {
    const browser = new Browser(baseUrl);
    const res = await browser.signIn(username, password);
    expect(res.status).toBe(200);
    return browser;
  }

  async send(method: string, path: string, body?: unknown, options: { csrf?: string | null; contentType?: string } = {}): Promise<{ status: number; body: any; headers: Headers }> {
    const headers: Record<string, string> = {};
    if (this.cookie) headers.cookie = this.cookie;
    const csrf = options.csrf === undefined ? this.csrf : options.csrf;
    if (csrf && method !== 'GET') headers['x-csrf-token'] = csrf;
    if (body !== undefined) headers['content-type'] = options.contentType ?? 'application/json';
    const res = await fetch(`${this.baseUrl}${path}`, { method, headers, redirect: 'manual', ...(body === undefined ? {} : { body: typeof body === 'string' ? body : JSON.stringify(body) }) });
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = JSON.parse(text);
    } catch {
      // plain text stays text
    }
    return { status: res.status, body: parsed, headers: res.headers };
  }
}

let ts: TestServer;
let admin: Browser;
let cp: Browser;
const personIds = new Map<string, number>();

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

function sqlite() {
  return ts.server.db.$client;
}

async function addPerson(username: string, displayName: string, role: string): Promise<number> {
  const body = await ok(admin.send('POST', '/api/people', { username, displayName, role, password: `${username}-pass-1234` }), 201);
  personIds.set(username, body.person.id);
  return body.person.id;
}

beforeAll(async () => {
  ts = await startTestServer();
  admin = await Browser.of(ts.baseUrl, adminUsername, adminPassword);
  await addPerson('rowan.ashby', 'Rowan Ashby', 'competent-person');
  cp = await Browser.of(ts.baseUrl, 'rowan.ashby', 'rowan.ashby-pass-1234');
});

afterAll(async () => {
  await ts?.stop();
});

describe('signing in', () => {
  it('sets an HttpOnly, SameSite session cookie for 12 hours and answers the CSRF token', async () => {
    const before = Date.now();
    const res = await fetch(`${ts.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: 'rowan.ashby', password: 'rowan.ashby-pass-1234' }) });
    expect(res.status).toBe(200);
    const cookie = res.headers.get('set-cookie')!;
    expect(cookie).toMatch(/^hf_session=[A-Za-z0-9_-]{43}; /);
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Lax/);
    expect(cookie).toMatch(/; Path=\//);
    // Plain HTTP and no trusted proxy: not Secure.
    expect(cookie).not.toMatch(/; Secure/);
    const body = (await res.json()) as { csrfToken: string; expiresAtMs: number; role: string; person: Record<string, unknown> };
    expect(body.role).toBe('competent-person');
    expect(body.csrfToken).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(body.expiresAtMs - before).toBeGreaterThanOrEqual(12 * 3_600_000 - 1_000);
    expect(body.expiresAtMs - Date.now()).toBeLessThanOrEqual(12 * 3_600_000);
    expect(JSON.stringify(body.person)).not.toMatch(/password|scrypt/i);
  });

  it('does not trust X-Forwarded-Proto without TRUST_PROXY: the cookie stays without Secure', async () => {
    const res = await fetch(`${ts.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-forwarded-proto': 'https' }, body: JSON.stringify({ username: 'rowan.ashby', password: 'rowan.ashby-pass-1234' }) });
    expect(res.status).toBe(200);
    expect(res.headers.get('set-cookie')).not.toMatch(/; Secure/);
  });

  it('answers a wrong password and an unknown username alike, with 401 and no cookie', async () => {
    const wrong = await new Browser(ts.baseUrl).signIn('rowan.ashby', 'not-the-password');
    const unknown = await new Browser(ts.baseUrl).signIn('nobody.here', 'not-the-password');
    expect([wrong.status, unknown.status]).toEqual([401, 401]);
    expect(await wrong.json()).toEqual(await unknown.json());
    expect(wrong.headers.get('set-cookie')).toBeNull();
  });
});

describe('CSRF: a change made with a session needs its X-CSRF-Token', () => {
  it.each([
    ['without the header', null],
    ['with a wrong token', 'forged-token-forged-token-forged-token-0000'],
    ['with an empty token', ''],
  ])('refuses POST /api/sensors %s with 403 and registers nothing', async (_what, csrf) => {
    const res = await cp.send('POST', '/api/sensors', { key: 'forged-mast', name: 'Forged', heightM: 5 }, { csrf });
    expect(res.status).toBe(403);
    expect(res.body.error).toMatch(/CSRF/);
    expect((await cp.send('GET', '/api/sensors/forged-mast')).status).toBe(404);
  });

  it('refuses another session’s token (the token belongs to its own session)', async () => {
    const other = await Browser.of(ts.baseUrl, adminUsername, adminPassword);
    const res = await cp.send('POST', '/api/sensors', { key: 'forged-mast', name: 'Forged', heightM: 5 }, { csrf: other.csrf });
    expect(res.status).toBe(403);
    expect((await cp.send('GET', '/api/sensors/forged-mast')).status).toBe(404);
  });

  it('refuses PATCH /api/site without the token and keeps the site as it was', async () => {
    const before = (await ok(cp.send('GET', '/api/site'))).site;
    const res = await cp.send('PATCH', '/api/site', { name: 'Forged Common' }, { csrf: null });
    expect(res.status).toBe(403);
    expect((await ok(cp.send('GET', '/api/site'))).site).toEqual(before);
  });

  it('refuses DELETE /api/structures/:id without the token and the structure stays', async () => {
    const record = { kind: 'shell', name: 'Band shell', radiusM: 3.5, selfWeightKg: 2000, frontBallastKg: 600, backBallastKg: 1500 };
    const id = (await ok(cp.send('POST', '/api/structures', { record }), 201)).structure.id;
    const res = await cp.send('DELETE', `/api/structures/${id}`, undefined, { csrf: null });
    expect(res.status).toBe(403);
    expect((await cp.send('GET', `/api/structures/${id}`)).status).toBe(200);
  });

  it('refuses a form post (no JSON, no token) as a cross-site page would send it', async () => {
    const res = await admin.send('POST', '/api/people', 'username=intruder&displayName=Intruder&role=admin&password=intruder-pass-1234', { csrf: null, contentType: 'application/x-www-form-urlencoded' });
    // Refused at the door for its content type (415), before the missing token would be (403).
    expect([403, 415]).toContain(res.status);
    expect((await ok(admin.send('GET', '/api/people'))).people.map((p: { username: string }) => p.username)).not.toContain('intruder');
  });

  it('refuses POST /api/session/everywhere without the token and every session stays', async () => {
    const res = await cp.send('POST', '/api/session/everywhere', undefined, { csrf: null });
    expect(res.status).toBe(403);
    expect((await cp.send('GET', '/api/live')).status).toBe(200);
  });

  it('needs no token to read', async () => {
    expect((await cp.send('GET', '/api/site', undefined, { csrf: null })).status).toBe(200);
  });
});

describe('expired sessions', () => {
  it('refuses a session past its 12 hours with 401 and forgets it', async () => {
    const id = await addPerson('ellis.fairweather', 'Ellis Fairweather', 'viewer');
    const steward = await Browser.of(ts.baseUrl, 'ellis.fairweather', 'ellis.fairweather-pass-1234');
    expect((await steward.send('GET', '/api/live')).status).toBe(200);
    const changed = sqlite().prepare('UPDATE sessions SET expires_at_ms = ? WHERE person_id = ?').run(Date.now() - 1, id).changes;
    expect(changed).toBe(1);
    expect((await steward.send('GET', '/api/live')).status).toBe(401);
    expect((await steward.send('GET', '/api/session')).body).toEqual({ signedIn: false, setupPending: false });
    expect(sqlite().prepare('SELECT COUNT(*) AS n FROM sessions WHERE person_id = ?').get(id)).toEqual({ n: 0 });
  });

  it('refuses a change made with an expired session with 401 and stores nothing', async () => {
    const editor = await Browser.of(ts.baseUrl, 'rowan.ashby', 'rowan.ashby-pass-1234');
    sqlite().prepare('UPDATE sessions SET expires_at_ms = ? WHERE csrf_token = ?').run(Date.now() - 1, editor.csrf);
    const res = await editor.send('POST', '/api/sensors', { key: 'late-mast', name: 'Late mast', heightM: 5 });
    expect(res.status).toBe(401);
    expect((await cp.send('GET', '/api/sensors/late-mast')).status).toBe(404);
  });
});

describe('site links', () => {
  let linkId = 0;
  let linkUrl = '';
  let steward: Browser;

  it('makes a link for the stewards that is shown once and listed without its token', async () => {
    const before = Date.now();
    const res = await cp.send('POST', '/api/site-links', { label: 'Gate stewards', validHours: 12 });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ label: 'Gate stewards', url: expect.stringMatching(new RegExp(`^${ts.baseUrl}/link/[A-Za-z0-9_-]{43}$`)) });
    expect(res.body.expiresAtMs - before).toBeGreaterThanOrEqual(12 * 3_600_000 - 1_000);
    expect(res.body.expiresAtMs - Date.now()).toBeLessThanOrEqual(12 * 3_600_000);
    linkId = res.body.id;
    linkUrl = res.body.url;
    const list = await cp.send('GET', '/api/site-links');
    expect(list.body.siteLinks).toEqual([expect.objectContaining({ id: linkId, label: 'Gate stewards', createdBy: 'Rowan Ashby (rowan.ashby)', revokedAtMs: null })]);
    expect(JSON.stringify(list.body)).not.toContain(linkUrl.split('/link/')[1]);
  });

  it('opens the live board read-only: 303 to the board with a session cookie, no referrer', async () => {
    const res = await fetch(linkUrl, { redirect: 'manual' });
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe('/');
    expect(res.headers.get('referrer-policy')).toBe('no-referrer');
    const cookie = res.headers.get('set-cookie')!;
    expect(cookie).toMatch(/^hf_session=[^;]+; /);
    expect(cookie).toMatch(/; HttpOnly/);
    steward = new Browser(ts.baseUrl, cookie.split(';')[0]!);
    const live = await steward.send('GET', '/api/live');
    expect(live.status).toBe(200);
    expect(live.body.structures.map((s: { name: string }) => s.name)).toContain('Band shell');
    expect((await steward.send('GET', '/api/session')).body).toMatchObject({ signedIn: true, kind: 'link', role: 'viewer', name: 'site link "Gate stewards"', person: null });
  });

  it('a site link has no other sessions to end: POST /api/session/everywhere is refused with 403', async () => {
    steward.csrf = (await steward.send('GET', '/api/session')).body.csrfToken;
    expect((await steward.send('POST', '/api/session/everywhere')).status).toBe(403);
    expect((await steward.send('GET', '/api/live')).status).toBe(200);
  });

  it('withdrawn with DELETE: the same cookie gets 401 at once, and the link no longer opens', async () => {
    const res = await cp.send('DELETE', `/api/site-links/${linkId}`);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ revoked: true });
    expect((await steward.send('GET', '/api/live')).status).toBe(401);
    const again = await fetch(linkUrl, { redirect: 'manual' });
    expect(again.status).toBe(404);
    expect(again.headers.get('set-cookie')).toBeNull();
    const list = await cp.send('GET', '/api/site-links');
    expect(list.body.siteLinks.find((l: { id: number }) => l.id === linkId).revokedAtMs).toEqual(expect.any(Number));
  });

  it('expired: the cookie gets 401 and the link no longer opens', async () => {
    const link = await ok(cp.send('POST', '/api/site-links', { label: 'Car park stewards', validHours: 1 }), 201);
    const opened = await fetch(link.url, { redirect: 'manual' });
    const stewardOfCarPark = new Browser(ts.baseUrl, opened.headers.get('set-cookie')!.split(';')[0]!);
    expect((await stewardOfCarPark.send('GET', '/api/live')).status).toBe(200);
    sqlite().prepare('UPDATE site_links SET expires_at_ms = ? WHERE id = ?').run(Date.now() - 1, link.id);
    expect((await stewardOfCarPark.send('GET', '/api/live')).status).toBe(401);
    expect((await fetch(link.url, { redirect: 'manual' })).status).toBe(404);
  });

  it('a session opened by a link ends when the link would: its cookie expires with the link', async () => {
    const link = await ok(cp.send('POST', '/api/site-links', { label: 'Night stewards', validHours: 2 }), 201);
    const opened = await fetch(link.url, { redirect: 'manual' });
    const expires = /Expires=([^;]+)/.exec(opened.headers.get('set-cookie')!)![1]!;
    expect(Math.abs(Date.parse(expires) - link.expiresAtMs)).toBeLessThan(2_000);
  });

  it.each([
    ['a label that is empty', { label: ' ', validHours: 12 }, 'label'],
    ['a life of 0 hours', { label: 'Gate', validHours: 0 }, 'validHours'],
    ['a life beyond 31 days', { label: 'Gate', validHours: 745 }, 'validHours'],
    ['a life given as text', { label: 'Gate', validHours: '12' }, 'validHours'],
  ])('refuses %s with 400 naming the field', async (_what, body, path) => {
    const res = await cp.send('POST', '/api/site-links', body);
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path)).toContain(path);
  });

  it.each(['/link/not-a-token', '/link/' + 'A'.repeat(43)])('answers 404 to an unknown link (%s) and sets no cookie', async (path) => {
    const res = await fetch(`${ts.baseUrl}${path}`, { redirect: 'manual' });
    expect(res.status).toBe(404);
    expect(res.headers.get('set-cookie')).toBeNull();
  });

  it('answers 404 to withdrawing a link that does not exist', async () => {
    expect((await cp.send('DELETE', '/api/site-links/999999')).status).toBe(404);
  });
});

describe('signing out', () => {
  it('DELETE /api/session ends this session only, and clears the cookie', async () => {
    await addPerson('morgan.tait', 'Morgan Tait', 'crew');
    const phone = await Browser.of(ts.baseUrl, 'morgan.tait', 'morgan.tait-pass-1234');
    const tablet = await Browser.of(ts.baseUrl, 'morgan.tait', 'morgan.tait-pass-1234');
    const res = await phone.send('DELETE', '/api/session');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ signedIn: false });
    expect(res.headers.get('set-cookie')).toMatch(/^hf_session=; .*(Max-Age=0|Expires=Thu, 01 Jan 1970)/);
    expect((await phone.send('GET', '/api/live')).status).toBe(401);
    expect((await tablet.send('GET', '/api/live')).status).toBe(200);
  });

  it('POST /api/session/everywhere ends all of the person’s sessions, and nobody else’s', async () => {
    const phone = await Browser.of(ts.baseUrl, 'morgan.tait', 'morgan.tait-pass-1234');
    const tablet = await Browser.of(ts.baseUrl, 'morgan.tait', 'morgan.tait-pass-1234');
    const laptop = await Browser.of(ts.baseUrl, 'morgan.tait', 'morgan.tait-pass-1234');
    const res = await phone.send('POST', '/api/session/everywhere');
    expect(res.status).toBe(200);
    expect(res.body.signedIn).toBe(false);
    // Three here, and the tablet of the test before.
    expect(res.body.closedSessions).toBe(4);
    for (const browser of [phone, tablet, laptop]) expect((await browser.send('GET', '/api/live')).status).toBe(401);
    expect((await cp.send('GET', '/api/live')).status).toBe(200);
    expect((await admin.send('GET', '/api/live')).status).toBe(200);
  });
});

describe('people (administrator) and their sessions', () => {
  it('disabling a person ends their sessions and refuses their password; enabling lets them in again', async () => {
    const id = await addPerson('sam.reed', 'Sam Reed', 'crew');
    const sam = await Browser.of(ts.baseUrl, 'sam.reed', 'sam.reed-pass-1234');
    const res = await admin.send('PATCH', `/api/people/${id}`, { disabled: true });
    expect(res.status).toBe(200);
    expect(res.body.person.disabledAtMs).toEqual(expect.any(Number));
    expect((await sam.send('GET', '/api/live')).status).toBe(401);
    expect((await new Browser(ts.baseUrl).signIn('sam.reed', 'sam.reed-pass-1234')).status).toBe(401);

    expect((await admin.send('PATCH', `/api/people/${id}`, { disabled: false })).body.person.disabledAtMs).toBeNull();
    expect((await new Browser(ts.baseUrl).signIn('sam.reed', 'sam.reed-pass-1234')).status).toBe(200);
  });

  it('a new role ends the person’s sessions; signing in again gives the new role', async () => {
    const id = personIds.get('sam.reed')!;
    const sam = await Browser.of(ts.baseUrl, 'sam.reed', 'sam.reed-pass-1234');
    expect((await ok(admin.send('PATCH', `/api/people/${id}`, { role: 'viewer' }))).person.role).toBe('viewer');
    expect((await sam.send('GET', '/api/live')).status).toBe(401);
    const again = await Browser.of(ts.baseUrl, 'sam.reed', 'sam.reed-pass-1234');
    expect((await again.send('GET', '/api/session')).body.role).toBe('viewer');
    expect((await again.send('POST', '/api/alerts/1/acknowledge', {})).status).toBe(403);
  });

  it('a new password ends the person’s sessions; the old password stops working', async () => {
    const id = personIds.get('sam.reed')!;
    const sam = await Browser.of(ts.baseUrl, 'sam.reed', 'sam.reed-pass-1234');
    expect((await admin.send('PATCH', `/api/people/${id}`, { password: 'sam-reed-new-pass-5678' })).status).toBe(200);
    expect((await sam.send('GET', '/api/live')).status).toBe(401);
    expect((await new Browser(ts.baseUrl).signIn('sam.reed', 'sam.reed-pass-1234')).status).toBe(401);
    expect((await new Browser(ts.baseUrl).signIn('sam.reed', 'sam-reed-new-pass-5678')).status).toBe(200);
  });

  it('a new display name keeps the person signed in and shows in their session', async () => {
    const id = personIds.get('sam.reed')!;
    const sam = await Browser.of(ts.baseUrl, 'sam.reed', 'sam-reed-new-pass-5678');
    expect((await admin.send('PATCH', `/api/people/${id}`, { displayName: 'Samantha Reed' })).status).toBe(200);
    expect((await sam.send('GET', '/api/session')).body).toMatchObject({ signedIn: true, name: 'Samantha Reed (sam.reed)' });
  });

  it('lists people without password hashes', async () => {
    const res = await admin.send('GET', '/api/people');
    expect(res.status).toBe(200);
    expect(res.body.people.map((p: { username: string }) => p.username)).toEqual(expect.arrayContaining([adminUsername, 'rowan.ashby', 'sam.reed']));
    expect(JSON.stringify(res.body)).not.toMatch(/password|scrypt/i);
  });

  it.each([
    ['a username with capitals and a space', { username: 'Sam Reed', displayName: 'Sam', role: 'crew', password: 'long-enough-pass' }, 'username'],
    ['a password of 11 characters', { username: 'kit.lowe', displayName: 'Kit Lowe', role: 'crew', password: 'elevenchars' }, 'password'],
    ['a role nobody has', { username: 'kit.lowe', displayName: 'Kit Lowe', role: 'owner', password: 'long-enough-pass' }, 'role'],
    ['an empty name', { username: 'kit.lowe', displayName: '  ', role: 'crew', password: 'long-enough-pass' }, 'displayName'],
  ])('refuses a person with %s with 400 naming the field', async (_what, body, path) => {
    const res = await admin.send('POST', '/api/people', body);
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path)).toContain(path);
    expect((await ok(admin.send('GET', '/api/people'))).people.map((p: { username: string }) => p.username)).not.toContain('kit.lowe');
  });

  it('refuses a username that is taken with 409', async () => {
    const res = await admin.send('POST', '/api/people', { username: 'sam.reed', displayName: 'Another Sam', role: 'admin', password: 'another-sam-pass' });
    expect(res.status).toBe(409);
    expect((await ok(admin.send('GET', '/api/people'))).people.find((p: { username: string }) => p.username === 'sam.reed').role).toBe('viewer');
  });

  it.each([
    ['/api/people/999999', { displayName: 'x' }, 404],
    ['/api/people/abc', { displayName: 'x' }, 404],
  ])('answers PATCH %s with %s', async (path, body, status) => {
    expect((await admin.send('PATCH', path, body)).status).toBe(status);
  });

  it('refuses a short new password with 400 and keeps the old one', async () => {
    const res = await admin.send('PATCH', `/api/people/${personIds.get('sam.reed')}`, { password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path)).toEqual(['password']);
    expect((await new Browser(ts.baseUrl).signIn('sam.reed', 'sam-reed-new-pass-5678')).status).toBe(200);
  });
});

describe('the last administrator', () => {
  async function adminId(): Promise<number> {
    return (await ok(admin.send('GET', '/api/people'))).people.find((p: { username: string }) => p.username === adminUsername).id;
  }

  it('cannot be demoted or disabled: 409, and stays an administrator', async () => {
    const id = await adminId();
    for (const patch of [{ role: 'competent-person' }, { role: 'viewer' }, { disabled: true }]) {
      const res = await admin.send('PATCH', `/api/people/${id}`, patch);
      expect(res.status).toBe(409);
      expect(res.body.error).toMatch(/last administrator/);
    }
    const me = (await ok(admin.send('GET', '/api/people'))).people.find((p: { id: number }) => p.id === id);
    expect(me).toMatchObject({ role: 'admin', disabledAtMs: null });
    expect((await admin.send('GET', '/api/people')).status).toBe(200);
  });

  it('with a second administrator either may step down, but then the other is the last again', async () => {
    const joId = await addPerson('jo.marsh', 'Jo Marsh', 'admin');
    expect((await ok(admin.send('PATCH', `/api/people/${joId}`, { role: 'competent-person' }))).person.role).toBe('competent-person');
    expect((await admin.send('PATCH', `/api/people/${await adminId()}`, { role: 'crew' })).status).toBe(409);

    expect((await ok(admin.send('PATCH', `/api/people/${joId}`, { role: 'admin' }))).person.role).toBe('admin');
    expect((await admin.send('PATCH', `/api/people/${joId}`, { disabled: true })).status).toBe(200);
    // Jo is disabled: the test administrator is the last active one.
    expect((await admin.send('PATCH', `/api/people/${await adminId()}`, { disabled: true })).status).toBe(409);
  });
});
