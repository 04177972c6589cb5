/**
 * Configurations on the register (issue 14): a structure's `configurations` are part of its record,
 * so they are stored and returned unchanged on save and on GET, carried by the register's JSON and
 * CSV export and import, and written to the audit trail with the record. Invalid ones are refused
 * at `record.configurations.<i>.changes.<field>` and never stored. Real server, real SQLite.
 *
 * Scenario (invented): the plan of "Harrowgate Meadow" has a stage screen that is lowered at
 * Prepare, a marquee whose sides come off, and a fence whose scrim is removed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let source: TestServer;
let jsonTarget: TestServer;
let csvTarget: TestServer;
let cp: ApiClient;
let jsonAdmin: ApiClient;
let csvAdmin: ApiClient;

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

const screenRecord = {
  kind: 'screen', name: 'Stage screen', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2, towerMassKg: 400,
  screenMassKg: 600, outriggerDepthM: 5, ballastPerTowerKg: 1500, surface: 'hard', configurationName: 'raised',
  configurations: [{ name: 'lowered', changes: { bottomHeightM: 0.5 } }],
};
const tentRecord = {
  kind: 'tent', name: 'Bar marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed: true, legs: 8,
  ballastPerLegKg: 500, selfWeightKg: 900,
  configurations: [
    { name: 'sides off', changes: { sides: { front: 'open', back: 'open', endY0: 'open', endYW: 'open' } } },
    { name: 'back open', changes: { sides: { back: 'open' }, ratedGustMps: null } },
  ],
};
const fenceRecord = {
  kind: 'banner', name: 'Gate fence, "scrim"', widthM: 20, heightM: 2, clearanceM: 0.1, solidity: 0.9, feet: 11,
  ballastPerFootKg: 40, footDepthM: 0.8, selfWeightKg: 200, configurations: [{ name: 'scrim removed', changes: { solidity: 0.3 } }],
};

const ids: Record<string, number> = {};

beforeAll(async () => {
  [source, jsonTarget, csvTarget] = await Promise.all([startTestServer(), startTestServer(), startTestServer()]);
  cp = await signedIn(source);
  jsonAdmin = await signedIn(jsonTarget);
  csvAdmin = await signedIn(csvTarget);
  await ok(cp.json('PATCH', '/api/site', { name: 'Harrowgate Meadow', timeZone: 'Europe/London' }));
  for (const record of [screenRecord, tentRecord, fenceRecord]) {
    const created = await ok(cp.json('POST', '/api/structures', { record, location: 'Harrowgate Meadow' }), 201);
    ids[record.name] = created.structure?.id ?? created.id;
  }
});

afterAll(async () => {
  await Promise.all([source?.stop(), jsonTarget?.stop(), csvTarget?.stop()]);
});

/** The stored record of a structure by name, from GET /api/structures. */
async function storedRecords(client: ApiClient): Promise<Record<string, any>> {
  const { structures } = await ok(client.json('GET', '/api/structures'));
  return Object.fromEntries(structures.map((s: { name: string; record: unknown }) => [s.name, s.record]));
}

describe('the register keeps a record’s configurations', () => {
  it('returns them unchanged on GET, list and single', async () => {
    const records = await storedRecords(cp);
    for (const record of [screenRecord, tentRecord, fenceRecord]) {
      expect(records[record.name].configurations, record.name).toEqual(record.configurations);
    }
    expect(records['Stage screen'].configurationName).toBe('raised');
    const single = await ok(cp.json('GET', `/api/structures/${ids['Stage screen']}`));
    expect((single.structure ?? single).record.configurations).toEqual(screenRecord.configurations);
  });

  it('keeps them through a PATCH of another field, and replaces them when the record is patched', async () => {
    await ok(cp.json('PATCH', `/api/structures/${ids['Stage screen']}`, { location: 'Main stage, left' }));
    expect((await storedRecords(cp))['Stage screen'].configurations).toEqual(screenRecord.configurations);
    const twoSteps = [...screenRecord.configurations, { name: 'on the deck', changes: { bottomHeightM: 0 } }];
    await ok(cp.json('PATCH', `/api/structures/${ids['Stage screen']}`, { record: { ...screenRecord, configurations: twoSteps } }));
    expect((await storedRecords(cp))['Stage screen'].configurations).toEqual(twoSteps);
    await ok(cp.json('PATCH', `/api/structures/${ids['Stage screen']}`, { record: screenRecord }));
    expect((await storedRecords(cp))['Stage screen'].configurations).toEqual(screenRecord.configurations);
  });

  it('refuses an invalid configuration at record.configurations.<i>.changes.<field> and stores nothing', async () => {
    const bad = { ...screenRecord, name: 'Side screen', configurations: [{ name: 'lowered', changes: { bottomHeightM: -1, screenDepthM: 1 } }] };
    const res = await cp.json('POST', '/api/structures', { record: bad });
    expect(res.status).toBe(400);
    expect(res.body.issues.map((i: { path: string }) => i.path).sort()).toEqual(['record.configurations.0.changes.bottomHeightM', 'record.configurations.0.changes.screenDepthM']);
    expect(Object.keys(await storedRecords(cp))).not.toContain('Side screen');
  });

  it('writes them to the audit trail as part of the record (create and update)', async () => {
    const { audit } = await ok(cp.json('GET', '/api/log/audit'));
    const entries = (audit as Array<{ entity: string; entityId: string; action: string; afterJson: any }>).filter((e) => e.entity === 'structure' && e.entityId === String(ids['Bar marquee']));
    const created = entries.find((e) => e.action === 'create');
    expect(created?.afterJson.record.configurations).toEqual(tentRecord.configurations);
    const screenUpdates = (audit as Array<{ entity: string; entityId: string; action: string; afterJson: any }>).filter((e) => e.entity === 'structure' && e.entityId === String(ids['Stage screen']) && e.action === 'update');
    expect(screenUpdates.some((e) => e.afterJson.record.configurations.length === 2)).toBe(true);
  });
});

describe('a level names a configuration as the watch does', () => {
  it('by the same rule: trimmed, ignoring case and Unicode composition (an accented name typed on another phone)', async () => {
    // "abaissé" written with a combining accent (NFD), as some keyboards send it; the configuration is named in NFC.
    const composed = 'Abaissé';
    const decomposed = ' abaisse\u0301 ';
    expect(decomposed.trim()).not.toBe(composed.toLowerCase());
    const record = { ...screenRecord, name: 'Side screen', configurations: [{ name: composed, changes: { bottomHeightM: 0.5 } }] };
    const levels = [
      { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Lower the side screen.', moveToConfiguration: decomposed },
      { label: 'Clear', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Clear the area.' },
    ];
    // Its own server: the register files below compare the source server's structures.
    const own = await startTestServer();
    try {
      const created = await ok((await signedIn(own)).json('POST', '/api/structures', { record, location: 'Harrowgate Meadow', levels }), 201);
      expect(created.structure.levels[0].moveToConfiguration).toBe(decomposed.trim());
    } finally {
      await own.stop();
    }
  });
});

describe('register files carry configurations', () => {
  it('JSON: export → import into a fresh server → the same records, configurations included, and each import is audited with its record', async () => {
    const exported = await ok(cp.json('GET', '/api/register'));
    const byName = Object.fromEntries(exported.structures.map((s: { record: { name: string } }) => [s.record.name, s.record]));
    expect(byName['Bar marquee'].configurations).toEqual(tentRecord.configurations);
    await ok(jsonAdmin.json('POST', '/api/register/import', { mode: 'merge', register: exported }));
    const again = await ok(jsonAdmin.json('GET', '/api/register'));
    expect(again.structures).toEqual(exported.structures);
    expect(await storedRecords(jsonAdmin)).toEqual(await storedRecords(cp));

    const { audit } = await ok(jsonAdmin.json('GET', '/api/log/audit'));
    const imported = (audit as Array<{ entity: string; action: string; afterJson: any }>).filter((e) => e.entity === 'structure' && e.action === 'import (merge)');
    expect(imported.map((e) => e.afterJson.record.name).sort()).toEqual([fenceRecord.name, tentRecord.name, screenRecord.name].sort());
    expect(imported.find((e) => e.afterJson.record.name === 'Stage screen')?.afterJson.record.configurations).toEqual(screenRecord.configurations);
  });

  it('CSV: the record_json cell carries them: export → import into a fresh server → the same file and the same records', async () => {
    const csv = await (await cp.request('GET', '/api/register.csv')).text();
    expect(csv).toContain('scrim removed');
    const res = await csvAdmin.request('POST', '/api/register/import', csv, { 'content-type': 'text/csv; charset=utf-8' });
    expect(res.status, await res.clone().text()).toBe(200);
    expect(await (await csvAdmin.request('GET', '/api/register.csv')).text()).toBe(csv);
    expect(await storedRecords(csvAdmin)).toEqual(await storedRecords(cp));
  });

  it('an import with a configuration that breaks its kind’s check is refused with the path in the file, and changes nothing', async () => {
    const exported = await ok(cp.json('GET', '/api/register'));
    const index = exported.structures.findIndex((s: { record: { name: string } }) => s.record.name === 'Bar marquee');
    const broken = structuredClone(exported);
    broken.structures[index].record.configurations = [{ name: 'high eaves', changes: { eaveHeightM: 5 } }];
    const res = await jsonAdmin.json('POST', '/api/register/import', { register: broken });
    expect(res.status).toBe(400);
    expect(res.body.issues).toEqual([
      { path: `register.structures.${index}.record.configurations.0.changes.eaveHeightM`, message: 'breaks a check of the record: ridgeHeightM must be ≥ eaveHeightM (5 m)' },
    ]);
    expect((await storedRecords(jsonAdmin))['Bar marquee'].configurations).toEqual(tentRecord.configurations);
  });
});
