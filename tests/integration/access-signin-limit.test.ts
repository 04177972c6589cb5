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

/**
 * Behind a trusted proxy (issue 13 item 6): the proxy appends the address it saw to
 * X-Forwarded-For (MDN, X-Forwarded-For: "the rightmost IP address is the IP address of the most
 * recent proxy"; RFC 7239 §5.2 for the Forwarded equivalent), and everything to its left is what the
 * client sent. The release keyed on the leftmost entry: 40 of 40 guesses with a rotated leftmost
 * entry were checked, and a chosen address could be locked out.
 */
describe('behind one trusted proxy (TRUST_PROXY=1)', () => {
  let ts: TestServer;
  const proxied = (clientSent: string | null, proxySaw: string) => ({ 'x-forwarded-for': clientSent ? `${clientSent}, ${proxySaw}` : proxySaw });

  beforeAll(async () => {
    ts = await startTestServer({ TRUST_PROXY: '1' });
  });

  afterAll(async () => {
    await ts?.stop();
  });

  it('rotating the leftmost entry does not escape the address lock: after thirty failures the address the proxy saw is locked', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 40; i++) {
      const res = await signIn(ts, `guess-${i}`, 'wrong-password', proxied(`10.9.${i}.1`, '203.0.113.7'));
      statuses.push(res.status);
    }
    expect(statuses.slice(0, 30).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(30).every((s) => s === 429)).toBe(true);
  });

  it('a client cannot lock out an address of its choosing by sending it: the victim still signs in', async () => {
    for (let i = 0; i < 35; i++) await signIn(ts, `other-${i}`, 'wrong-password', proxied('198.51.100.9', '203.0.113.8'));
    const victim = await signIn(ts, adminUsername, adminPassword, proxied(null, '198.51.100.9'));
    expect(victim.status).toBe(200);
  });
});
