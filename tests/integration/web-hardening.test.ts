/**
 * Cross-site requests from a browser are refused (issue 13 item 11). Sources: the Fetch Standard
 * (WHATWG) — a "CORS-safelisted request-header" Content-Type is only application/x-www-form-urlencoded,
 * multipart/form-data or text/plain by its essence (the part before ";"), so a page on another site
 * may POST `text/plain; charset=application/json` without a preflight; Fetch Metadata Request
 * Headers (W3C) — `Sec-Fetch-Site: cross-site`; RFC 6454 — the Origin header. OWASP's Cross-Site
 * Request Forgery Prevention Cheat Sheet recommends checking Origin with the token ("login CSRF"
 * included).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let admin: ApiClient;
const signInBody = JSON.stringify({ username: adminUsername, password: adminPassword });

beforeAll(async () => {
  ts = await startTestServer({ PUBLIC_URL: 'https://wind.harrowmere.example' });
  admin = new ApiClient(ts.baseUrl);
  const res = await admin.signIn(adminUsername, adminPassword);
  expect(res.status).toBe(200);
});
afterAll(async () => ts.stop());

const signIn = (headers: Record<string, string>) => fetch(`${ts.baseUrl}/api/session`, { method: 'POST', headers, body: signInBody });
const host = () => new URL(ts.baseUrl).host;

describe('the JSON content type is required exactly (Fetch Standard: text/plain is CORS-safelisted)', () => {
  it('text/plain; charset=application/json is refused with 415 and signs nobody in', async () => {
    const res = await signIn({ 'content-type': 'text/plain; charset=application/json' });
    expect(res.status).toBe(415);
    expect(res.headers.get('set-cookie')).toBeNull();
    expect(((await res.json()) as { error: string }).error).toMatch(/application\/json/);
  });

  it('application/json with a charset parameter is accepted', async () => {
    const res = await signIn({ 'content-type': 'application/json; charset=utf-8' });
    expect(res.status).toBe(200);
  });

  it('a register import may still be sent as text/csv, and not as text/plain', async () => {
    const csv = await admin.request('POST', '/api/register/import', 'kind\n', { 'content-type': 'text/csv' });
    expect(csv.status).not.toBe(415);
    const plain = await admin.request('POST', '/api/register/import', 'kind\n', { 'content-type': 'text/plain' });
    expect(plain.status).toBe(415);
  });

  it('a change to the register sent as text/plain is refused before it reaches the route', async () => {
    const res = await admin.request('POST', '/api/sensors', JSON.stringify({ key: 'north-gate', name: 'North gate', heightM: 6 }), { 'content-type': 'text/plain' });
    expect(res.status).toBe(415);
    const list = await admin.json<Array<{ key: string }>>('GET', '/api/sensors');
    expect(JSON.stringify(list.body)).not.toContain('north-gate');
  });
});

describe('Origin and Sec-Fetch-Site are checked on every state-changing request, sign-in included (login CSRF)', () => {
  it('a cross-origin sign-in is refused with 403 and sets no cookie', async () => {
    const res = await signIn({ 'content-type': 'application/json', origin: 'https://tickets.elsewhere.example' });
    expect(res.status).toBe(403);
    expect(res.headers.get('set-cookie')).toBeNull();
  });

  it('Sec-Fetch-Site: cross-site is refused even without an Origin', async () => {
    const res = await signIn({ 'content-type': 'application/json', 'sec-fetch-site': 'cross-site' });
    expect(res.status).toBe(403);
  });

  it('a same-site (not same-origin) request is refused too', async () => {
    const res = await signIn({ 'content-type': 'application/json', 'sec-fetch-site': 'same-site' });
    expect(res.status).toBe(403);
  });

  it('an opaque Origin ("null", e.g. a sandboxed frame) is refused', async () => {
    const res = await signIn({ 'content-type': 'application/json', origin: 'null' });
    expect(res.status).toBe(403);
  });

  it('the page’s own origin is accepted, and so is the configured public address', async () => {
    expect((await signIn({ 'content-type': 'application/json', origin: `http://${host()}`, 'sec-fetch-site': 'same-origin' })).status).toBe(200);
    expect((await signIn({ 'content-type': 'application/json', origin: 'https://wind.harrowmere.example' })).status).toBe(200);
  });

  it('a client that is not a browser (no Origin, no Sec-Fetch-Site: curl, a script) is not affected', async () => {
    expect((await signIn({ 'content-type': 'application/json' })).status).toBe(200);
  });

  it('a signed-in change from another origin is refused even with the right CSRF token', async () => {
    const res = await admin.request('POST', '/api/sensors', { key: 'east-gate', name: 'East gate', heightM: 6 }, { origin: 'https://tickets.elsewhere.example' });
    expect(res.status).toBe(403);
    const list = await admin.json<Array<{ key: string }>>('GET', '/api/sensors');
    expect(JSON.stringify(list.body)).not.toContain('east-gate');
  });

  it('the public calculator stays open to other origins (it stores nothing)', async () => {
    const res = await fetch(`${ts.baseUrl}/api/assess`, { method: 'POST', headers: { 'content-type': 'application/json', origin: 'https://tickets.elsewhere.example' }, body: '{}' });
    expect(res.status).toBe(400);
  });
});
