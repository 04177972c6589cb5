/**
 * Site links carry the configured public address (PUBLIC_URL, README "Configuration"); without
 * one they carry the address the request came in on, with a warning that phones on another
 * network may not reach it. Behind a trusted proxy the request's address is the one the proxy
 * was asked for (X-Forwarded-Proto and X-Forwarded-Host, the de-facto proxy headers; RFC 7239
 * describes their standard form).
 */
import http from 'node:http';
import { afterEach, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer | null = null;

afterEach(async () => {
  await ts?.stop();
  ts = null;
});

/** GET with a Host header of our choosing (fetch does not let a caller set Host). */
function getWithHost(api: ApiClient, pathname: string, host: string): Promise<any> {
  const url = new URL(ts!.baseUrl);
  return new Promise((resolve, reject) => {
    const req = http.request({ host: url.hostname, port: url.port, path: pathname, headers: { host, cookie: (api as unknown as { cookie: string }).cookie } }, (res) => {
      let text = '';
      res.on('data', (chunk) => (text += chunk));
      res.on('end', () => resolve(JSON.parse(text)));
    });
    req.on('error', reject);
    req.end();
  });
}

async function admin(env: Record<string, string>): Promise<ApiClient> {
  ts = await startTestServer(env);
  const api = new ApiClient(ts.baseUrl);
  expect((await api.signIn(adminUsername, adminPassword)).status).toBe(200);
  return api;
}

describe('site link address', () => {
  it('uses PUBLIC_URL when it is set, with no warning, and the link opens a viewer session there', async () => {
    const api = await admin({ PUBLIC_URL: 'https://wind.brackenfold.example/' });
    const made = await api.json('POST', '/api/site-links', { label: 'Gate stewards', validHours: 12 });
    expect(made.status).toBe(201);
    expect(made.body.url).toMatch(/^https:\/\/wind\.brackenfold\.example\/link\/[A-Za-z0-9_-]+$/);
    expect(made.body.linkAddress).toEqual({ origin: 'https://wind.brackenfold.example', source: 'PUBLIC_URL', warning: null });
    expect((await api.json('GET', '/api/site-links')).body.linkAddress.source).toBe('PUBLIC_URL');
    // The token works on this server (the public address is the proxy in front of it).
    const token = new URL(made.body.url).pathname;
    const opened = await fetch(`${ts!.baseUrl}${token}`, { redirect: 'manual' });
    expect(opened.status).toBe(303);
  });

  it('falls back to the request’s address with a warning when PUBLIC_URL is unset, and says loudly when that is this computer', async () => {
    const api = await admin({});
    const made = await api.json('POST', '/api/site-links', { label: 'Car park stewards', validHours: 12 });
    expect(made.body.url.startsWith(`${ts!.baseUrl}/link/`)).toBe(true);
    expect(made.body.linkAddress).toMatchObject({ origin: ts!.baseUrl, source: 'request' });
    expect(made.body.linkAddress.warning).toMatch(/PUBLIC_URL is not set/);
    expect(made.body.linkAddress.warning).toMatch(/this computer's own address. No phone can open it/);

    // Asked for by another name (the site office's LAN address): the warning about other networks.
    const body = (await getWithHost(api, '/api/site-links', '192.168.10.5:8080')) as { linkAddress: { origin: string; warning: string } };
    expect(body.linkAddress.origin).toBe('http://192.168.10.5:8080');
    expect(body.linkAddress.warning).toMatch(/Phones on another network \(mobile data, another Wi-Fi\) may not reach it/);
  });

  it('takes the forwarded scheme and host only from a proxy it was told to trust', async () => {
    const trusted = await admin({ TRUST_PROXY: '1' });
    const forwarded = { 'x-forwarded-proto': 'https', 'x-forwarded-host': 'wind.brackenfold.example' };
    let res = await trusted.request('GET', '/api/site-links', undefined, forwarded);
    expect(((await res.json()) as { linkAddress: { origin: string } }).linkAddress.origin).toBe('https://wind.brackenfold.example');
    await ts!.stop();
    ts = null;
    const untrusted = await admin({});
    res = await untrusted.request('GET', '/api/site-links', undefined, forwarded);
    expect(((await res.json()) as { linkAddress: { origin: string } }).linkAddress.origin).toBe(ts!.baseUrl);
  });
});
