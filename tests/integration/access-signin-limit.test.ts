/**
 * Brute force on the sign-in: five failed sign-ins for a username or from an address lock it for
 * 15 minutes (README, "People, roles and site links"). The lock holds for the right password too,
 * for every username from that address, against a forged X-Forwarded-For, and against attempts
 * sent all at once; it lifts after 15 minutes.
 *
 * Each describe has its own server: the lock is per server and per address (all of ours come
 * from 127.0.0.1).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

async function signIn(ts: TestServer, username: string, password: string, headers: Record<string, string> = {}): Promise<Response> {
  return fetch(`${ts.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify({ username, password }) });
}

describe('five wrong passwords, one after another', () => {
  let ts: TestServer;
  let alreadySignedIn: ApiClient;

  beforeAll(async () => {
    ts = await startTestServer();
    alreadySignedIn = new ApiClient(ts.baseUrl);
    expect((await alreadySignedIn.signIn(adminUsername, adminPassword)).status).toBe(200);
    const created = await alreadySignedIn.json('POST', '/api/people', { username: 'morgan.tait', displayName: 'Morgan Tait', role: 'crew', password: 'morgan-tait-pass-1234' });
    expect(created.status).toBe(201);
  });

  afterAll(async () => {
    await ts?.stop();
  });

  it('are each answered 401; the sixth attempt, with the right password, gets 429 with Retry-After', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await signIn(ts, adminUsername, `guess-number-${i}`)).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401]);

    const sixth = await signIn(ts, adminUsername, adminPassword);
    expect(sixth.status).toBe(429);
    expect(sixth.headers.get('set-cookie')).toBeNull();
    const retryAfter = Number(sixth.headers.get('retry-after'));
    expect(Number.isInteger(retryAfter)).toBe(true);
    expect(retryAfter).toBeGreaterThan(14 * 60);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
    expect(((await sixth.json()) as { error: string }).error).toMatch(/too many failed sign-ins/);
  });

  it('lets another person sign in from the same address (a crew behind one router), right password only', async () => {
    const res = await signIn(ts, 'morgan.tait', 'morgan-tait-pass-1234');
    expect(res.status).toBe(200);
  });

  it('locks the address itself after thirty failures across usernames (a password list, not a crew)', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 30; i++) statuses.push((await signIn(ts, `guess-${i}`, 'not-a-password-at-all')).status);
    expect(statuses.filter((s) => s === 401).length).toBeLessThanOrEqual(30);
    const res = await signIn(ts, 'morgan.tait', 'morgan-tait-pass-1234');
    expect(res.status).toBe(429);
    expect(res.headers.get('retry-after')).toMatch(/^[0-9]+$/);
  });

  it('is not escaped by a forged X-Forwarded-For (no trusted proxy configured)', async () => {
    const res = await signIn(ts, adminUsername, adminPassword, { 'x-forwarded-for': '203.0.113.77' });
    expect(res.status).toBe(429);
  });

  it('leaves sessions opened before the lock working', async () => {
    expect((await alreadySignedIn.json('GET', '/api/live')).status).toBe(200);
  });
});

describe('wrong passwords sent all at once', () => {
  let ts: TestServer;

  beforeAll(async () => {
    ts = await startTestServer();
  });

  afterAll(async () => {
    await ts?.stop();
  });

  it('check at most five passwords: the rest are refused with 429 before any password is tried', async () => {
    const statuses = await Promise.all(Array.from({ length: 20 }, (_, i) => signIn(ts, adminUsername, `parallel-guess-${i}`).then((r) => r.status)));
    expect(statuses.filter((s) => s === 401).length).toBeLessThanOrEqual(5);
    expect(statuses.filter((s) => s !== 401 && s !== 429)).toEqual([]);
    expect((await signIn(ts, adminUsername, adminPassword)).status).toBe(429);
  });
});

describe('after 15 minutes', () => {
  let ts: TestServer;
  /** The server's clock runs this far ahead of the wall clock. */
  let aheadMs = 0;

  beforeAll(async () => {
    ts = await startTestServer({}, { now: () => Date.now() + aheadMs });
  });

  afterAll(async () => {
    await ts?.stop();
  });

  it('the lock lifts and the right password signs in again', async () => {
    for (let i = 0; i < 5; i++) expect((await signIn(ts, adminUsername, `guess-number-${i}`)).status).toBe(401);
    expect((await signIn(ts, adminUsername, adminPassword)).status).toBe(429);
    aheadMs = 14 * 60_000;
    expect((await signIn(ts, adminUsername, adminPassword)).status).toBe(429);
    aheadMs = 15 * 60_000 + 1_000;
    expect((await signIn(ts, adminUsername, adminPassword)).status).toBe(200);
  });
});
