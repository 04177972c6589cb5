/**
 * The people an escalation step can name (issue 16: "the next person or role"): a competent person
 * who is not an administrator sets the chains, so they may list who can be named — id, name and
 * role of everyone not disabled, nothing more (usernames and sign-in state stay the
 * administrator's, GET /api/people). Crew may not.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let admin: ApiClient;

beforeAll(async () => {
  ts = await startTestServer();
  admin = new ApiClient(ts.baseUrl);
  await admin.signIn(adminUsername, adminPassword);
  for (const [username, displayName, role] of [
    ['site-cp', 'Morag (competent person)', 'competent-person'],
    ['rigger-1', 'Tomasz (rigger)', 'crew'],
    ['rigger-2', 'Ines (rigger)', 'crew'],
  ] as const) {
    expect((await admin.json('POST', '/api/people', { username, displayName, role, password: `${username}-password-12` })).status).toBe(201);
  }
  const list = await admin.json<{ people: Array<{ id: number; username: string }> }>('GET', '/api/people');
  const ines = list.body.people.find((p) => p.username === 'rigger-2')!;
  expect((await admin.json('PATCH', `/api/people/${ines.id}`, { disabled: true })).status).toBe(200);
});

afterAll(async () => {
  await ts?.stop();
});

describe('GET /api/notify/people', () => {
  it('gives a competent person the id, name and role of everyone not disabled, and nothing else', async () => {
    const cp = new ApiClient(ts.baseUrl);
    expect((await cp.signIn('site-cp', 'site-cp-password-12')).status).toBe(200);
    expect((await cp.json('GET', '/api/people')).status).toBe(403);
    const res = await cp.json<{ people: Array<Record<string, unknown>> }>('GET', '/api/notify/people');
    expect(res.status).toBe(200);
    const names = res.body.people.map((p) => p.displayName);
    expect(names).toContain('Morag (competent person)');
    expect(names).toContain('Tomasz (rigger)');
    expect(names).not.toContain('Ines (rigger)');
    for (const p of res.body.people) expect(Object.keys(p).sort()).toEqual(['displayName', 'id', 'role']);
  });

  it('refuses crew', async () => {
    const crew = new ApiClient(ts.baseUrl);
    expect((await crew.signIn('rigger-1', 'rigger-1-password-12')).status).toBe(200);
    expect((await crew.json('GET', '/api/notify/people')).status).toBe(403);
  });
});
