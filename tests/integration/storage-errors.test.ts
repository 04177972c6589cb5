/**
 * Database errors classified by kind in one place (server/storage/errors.ts), against errors a
 * real SQLite file raises, and mapped to HTTP once (server/http/app.ts onError).
 *
 * The reference for what each situation raises is SQLite's list of result codes
 * (https://www.sqlite.org/rescode.html): SQLITE_CONSTRAINT_UNIQUE / _PRIMARYKEY for a duplicate
 * key, SQLITE_CONSTRAINT_FOREIGNKEY and _NOTNULL for other broken rules, SQLITE_FULL when the
 * file may not grow (PRAGMA max_page_count, https://www.sqlite.org/pragma.html#pragma_max_page_count,
 * fails exactly as a full disk does), SQLITE_READONLY under PRAGMA query_only, SQLITE_BUSY when
 * another connection holds the write lock past the busy timeout, SQLITE_NOTADB for a file that
 * is not a database.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { classifyStorageError, storageErrorWords } from '../../server/storage/errors.ts';
import { openStorage } from '../../server/storage/storage.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer } from '../helpers/testServer.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

function freshFile(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-storage-errors-'));
  dirs.push(dir);
  return path.join(dir, 'holdfast.sqlite');
}

/** The error `work` throws (a test fails when it throws none). */
function thrown(work: () => unknown): unknown {
  try {
    work();
  } catch (err) {
    return err;
  }
  throw new Error('expected the database to refuse');
}

/** The error `work`'s promise rejects with (a test fails when it resolves). */
async function rejected(work: () => Promise<unknown>): Promise<unknown> {
  try {
    await work();
  } catch (err) {
    return err;
  }
  throw new Error('expected the database to refuse');
}

const newSensor = (siteId: number, key: string) => ({ siteId, key, name: key, heightM: 10, createdAtMs: 0 });

describe('database errors by kind', () => {
  it('a duplicate key is "unique", a broken foreign key or NOT NULL rule is "constraint"', async () => {
    const storage = openStorage(freshFile());
    const site = await storage.site.insert({ name: 'Error test site (invented)', defaultLevelsJson: [], createdAtMs: 0, updatedAtMs: 0 });
    await storage.sensors.insert(newSensor(site.id, 'north-mast'));
    // sensors.key is unique (db/schema.ts).
    expect(classifyStorageError(await rejected(() => storage.sensors.insert(newSensor(site.id, 'north-mast'))))).toBe('unique');
    // site 999 does not exist: the foreign key refuses (foreign_keys = ON, storage/database.ts).
    expect(classifyStorageError(await rejected(() => storage.sensors.insert(newSensor(999, 'east-mast'))))).toBe('constraint');
    expect(classifyStorageError(thrown(() => storage.opened.sqlite.prepare('INSERT INTO sensors (site_id, key, height_m, created_at_ms) VALUES (?, ?, 10, 0)').run(site.id, 'west-mast')))).toBe('constraint');
    await storage.close();
  });

  it('a file that may not grow is "disk-full", a connection that may not write is "read-only"', async () => {
    const storage = openStorage(freshFile());
    const site = await storage.site.insert({ name: 'Error test site (invented)', defaultLevelsJson: [], createdAtMs: 0, updatedAtMs: 0 });
    const { sqlite } = storage.opened;
    sqlite.pragma(`max_page_count = ${sqlite.pragma('page_count', { simple: true }) as number}`);
    // Enough rows to need a new page.
    const full = await rejected(() => storage.transaction(async () => { for (let i = 0; i < 5_000; i++) await storage.sensors.insert(newSensor(site.id, `mast-${i}`)); }));
    expect(classifyStorageError(full)).toBe('disk-full');
    sqlite.pragma('max_page_count = 1073741823');
    sqlite.pragma('query_only = ON');
    expect(classifyStorageError(await rejected(() => storage.sensors.insert(newSensor(site.id, 'gate-mast'))))).toBe('read-only');
    sqlite.pragma('query_only = OFF');
    await storage.close();
  });

  it('another writer holding the lock is "busy"; a file that is not a database is "corrupt"', async () => {
    const file = freshFile();
    const storage = openStorage(file);
    const site = await storage.site.insert({ name: 'Error test site (invented)', defaultLevelsJson: [], createdAtMs: 0, updatedAtMs: 0 });
    const other = new Database(file);
    other.exec('BEGIN IMMEDIATE');
    storage.opened.sqlite.pragma('busy_timeout = 0');
    expect(classifyStorageError(await rejected(() => storage.sensors.insert(newSensor(site.id, 'busy-mast'))))).toBe('busy');
    other.exec('ROLLBACK');
    other.close();
    await storage.close();

    const garbage = freshFile();
    fs.writeFileSync(garbage, 'this is a CSV export, not a database\n'.repeat(200));
    expect(classifyStorageError(thrown(() => new Database(garbage).prepare('SELECT * FROM sites').all()))).toBe('corrupt');
  });

  it('anything that is not a database error has no kind', () => {
    expect(classifyStorageError(new TypeError("Cannot read properties of undefined (reading 'gustMps')"))).toBeNull();
    expect(classifyStorageError('SQLITE_FULL')).toBeNull();
    expect(classifyStorageError(null)).toBeNull();
  });
});

describe('a request the database cannot serve', () => {
  it('is answered 503 with the kind in words, never the driver’s text or the SQL, and works again once the database does', async () => {
    // Commits on the main connection, so the fault below reaches the request's own statements.
    const ts = await startTestServer({}, { commitThread: false });
    try {
      const api = new ApiClient(ts.baseUrl);
      await api.signIn(adminUsername, adminPassword);
      ts.server.db.$client.pragma('query_only = ON');
      const refused = await api.request('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10 });
      expect(refused.status).toBe(503);
      const text = await refused.text();
      expect(JSON.parse(text)).toEqual({ error: storageErrorWords['read-only'] });
      expect(text).not.toMatch(/SQLITE_|INSERT|readonly database/);
      ts.server.db.$client.pragma('query_only = OFF');
      expect((await api.json('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10 })).status).toBe(201);
    } finally {
      await ts.stop();
    }
  });
});
