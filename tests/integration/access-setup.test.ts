/**
 * First start: without ADMIN_USERNAME and ADMIN_PASSWORD nobody can sign in until the first
 * administrator is made with the one-time setup code printed in the log; there is never a
 * default password. With both set, that administrator is made — only with a password the server
 * would accept from anyone else (at least 12 characters, README "Configuration").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tokenHash } from '../../server/auth/tokens.ts';
import { startTestServer, type TestServer } from '../helpers/testServer.ts';

async function post(ts: TestServer, path: string, body: unknown): Promise<{ status: number; body: any }> {
  const res = await fetch(`${ts.baseUrl}${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, body: await res.json() };
}

async function get(ts: TestServer, path: string): Promise<{ status: number; body: any }> {
  const res = await fetch(`${ts.baseUrl}${path}`);
  return { status: res.status, body: await res.json() };
}

function peopleCount(ts: TestServer): number {
  return (ts.server.db.$client.prepare('SELECT COUNT(*) AS n FROM people').get() as { n: number }).n;
}

describe('first start without ADMIN_USERNAME', () => {
  let ts: TestServer;
  const firstAdmin = { username: 'site.office', displayName: 'Brackenfold site office', password: 'brackenfold-office-2026' };

  beforeAll(async () => {
    // Empty counts as unset (server/config.ts).
    ts = await startTestServer({ ADMIN_USERNAME: '', ADMIN_PASSWORD: '' });
  });

  afterAll(async () => {
    await ts?.stop();
  });

  it('says setup is pending, and nobody is signed in', async () => {
    expect(await get(ts, '/api/setup')).toEqual({ status: 200, body: { setupPending: true } });
    expect(await get(ts, '/api/session')).toEqual({ status: 200, body: { signedIn: false, setupPending: true } });
    expect(peopleCount(ts)).toBe(0);
  });

  it('has no default password: common guesses do not sign in', async () => {
    for (const [username, password] of [
      ['admin', 'admin'],
      ['admin', 'password'],
    ]) {
      expect((await post(ts, '/api/session', { username, password })).status).toBe(401);
    }
  });

  it('refuses a wrong setup code with 403 and makes nobody', async () => {
    const res = await post(ts, '/api/setup', { code: 'not-the-code-not-the-code', ...firstAdmin });
    expect(res.status).toBe(403);
    expect(res.body.error).toMatch(/setup code/);
    expect(peopleCount(ts)).toBe(0);
    expect((await get(ts, '/api/setup')).body.setupPending).toBe(true);
  });

  it('refuses an invalid first administrator with 400 naming every field', async () => {
    const res = await post(ts, '/api/setup', { code: '', username: 'Site Office', displayName: '', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['code', 'username', 'displayName', 'password']));
    expect(peopleCount(ts)).toBe(0);
  });

  it('people cannot be made without an administrator: POST /api/people answers 401', async () => {
    expect((await post(ts, '/api/people', { ...firstAdmin, role: 'admin' })).status).toBe(401);
    expect(peopleCount(ts)).toBe(0);
  });

  it('makes the first administrator with the right code, once; then setup is done and they can sign in', async () => {
    // The code is printed in the log and stored hashed: give the server a code we know.
    const code = 'brackenfold-setup-code-1';
    const changed = ts.server.db.$client.prepare("UPDATE meta SET value = ? WHERE key = 'setup-code-sha256'").run(tokenHash(code)).changes;
    expect(changed).toBe(1);

    const res = await post(ts, '/api/setup', { code, ...firstAdmin });
    expect(res.status).toBe(201);
    expect(res.body.person).toMatchObject({ username: 'site.office', displayName: 'Brackenfold site office', role: 'admin' });
    expect(await get(ts, '/api/setup')).toEqual({ status: 200, body: { setupPending: false } });

    const signIn = await post(ts, '/api/session', { username: firstAdmin.username, password: firstAdmin.password });
    expect(signIn.status).toBe(200);
    expect(signIn.body.role).toBe('admin');

    const again = await post(ts, '/api/setup', { code, username: 'second.admin', displayName: 'Second', password: 'second-admin-pass-1' });
    expect(again.status).toBe(409);
    expect(peopleCount(ts)).toBe(1);
  });
});

describe('first start with only one of ADMIN_USERNAME and ADMIN_PASSWORD', () => {
  it('makes no administrator without a password (the server refuses to start, or waits for the setup code)', async () => {
    let ts: TestServer | null = null;
    try {
      ts = await startTestServer({ ADMIN_USERNAME: 'site.office', ADMIN_PASSWORD: '' });
    } catch (err) {
      // Refusing to start is right too, as long as it says why.
      expect(String(err)).toMatch(/ADMIN_PASSWORD/);
      return;
    }
    try {
      expect((await get(ts, '/api/setup')).body.setupPending).toBe(true);
      expect(peopleCount(ts)).toBe(0);
    } finally {
      await ts.stop();
    }
  });
});

describe('first start with an ADMIN_PASSWORD under 12 characters', () => {
  it('does not make an administrator who signs in with it (the server refuses to start, or makes nobody)', async () => {
    let ts: TestServer | null = null;
    try {
      ts = await startTestServer({ ADMIN_USERNAME: 'site.office', ADMIN_PASSWORD: 'office1' });
    } catch (err) {
      // Refusing to start is right too, as long as it says why.
      expect(String(err)).toMatch(/ADMIN_PASSWORD/);
      return;
    }
    try {
      const res = await post(ts, '/api/session', { username: 'site.office', password: 'office1' });
      expect(res.status).not.toBe(200);
      expect(peopleCount(ts)).toBe(0);
    } finally {
      await ts.stop();
    }
  });
});
