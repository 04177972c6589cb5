/**
 * The checkpoint thread (server/storage/checkpointThread.ts): the write-ahead log is copied into
 * the database file by a worker, never inside the main thread's commits, and nothing committed is
 * lost on the way. SQLite's behaviour relied on (https://www.sqlite.org/wal.html, "Checkpointing"
 * and https://www.sqlite.org/pragma.html#pragma_wal_checkpoint): with `wal_autocheckpoint = 0` a
 * connection never copies the log on its own; a PASSIVE checkpoint from another connection copies
 * committed frames without blocking the writer; the log restarts from its beginning at the first
 * write after every frame has been copied.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { CheckpointThread } from '../../server/storage/checkpointThread.ts';
import { openStorage, type SqliteStorage } from '../../server/storage/storage.ts';
import { emptyWriteBatch, type WriteBatch } from '../../server/storage/writeBatch.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

function freshDir(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-checkpoints-'));
  dirs.push(dir);
  return dir;
}

/** A fresh database with one site and one sensor (invented: Brackenfold Common, north mast). */
async function freshStorage(checkpointThread: boolean): Promise<{ storage: SqliteStorage; sensorId: number; file: string }> {
  const file = path.join(freshDir(), 'holdfast.sqlite');
  const storage = openStorage(file, { checkpointThread });
  const site = await storage.site.insert({ name: 'Brackenfold Common', defaultLevelsJson: [], createdAtMs: 0, updatedAtMs: 0 });
  const sensor = await storage.sensors.insert({ siteId: site.id, key: 'north-mast', name: 'North mast', heightM: 10, createdAtMs: 0 });
  return { storage, sensorId: sensor.id, file };
}

const t0 = Date.UTC(2026, 5, 13, 12);

function readings(sensorId: number, from: number, count: number): WriteBatch {
  const batch = emptyWriteBatch();
  for (let i = from; i < from + count; i++) batch.readings.push({ sensorId, tsMs: t0 + i * 250, speedMps: 6 + (i % 7) / 10, gustMps: null, dirDeg: 250, tempC: null, pressurePa: null, rhPct: null, late: false, rollupGustMps: 6 });
  return batch;
}

const size = (file: string): number => (fs.existsSync(file) ? fs.statSync(file).size : 0);

async function until(what: string, ok: () => boolean, timeoutMs = 10_000): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!ok()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** Writes `commits` group commits of `perCommit` readings through the live path's queue. */
async function feed(storage: SqliteStorage, sensorId: number, commits: number, perCommit: number): Promise<void> {
  const queue = storage.writes.queue(Date.now, 0);
  for (let c = 0; c < commits; c++) {
    const outcome = await queue.enqueue(readings(sensorId, c * perCommit, perCommit));
    expect(outcome.stored).toBe(true);
  }
  queue.stop();
}

describe('checkpoints on a worker thread', () => {
  it('copies the log into the file while the main connection never checkpoints, and keeps every reading', async () => {
    const { storage, sensorId, file } = await freshStorage(true);
    const sqlite = storage.opened.sqlite;
    expect(sqlite.pragma('wal_autocheckpoint', { simple: true })).toBe(0);
    const before = size(file);
    await feed(storage, sensorId, 400, 20);
    // The worker copies the frames into the database file: it grows to hold 8,000 readings.
    await until('the worker to copy the log', () => storage.checkpoints!.stats.rounds > 0 && storage.checkpoints!.stats.copiedFrames > 0 && size(file) > before + 100_000);
    expect(storage.checkpoints!.stats.failure).toBeNull();
    // Another connection reading the file sees every committed reading.
    const reader = new Database(file, { readonly: true });
    expect(reader.prepare('SELECT count(*) AS n FROM readings').get()).toEqual({ n: 8000 });
    reader.close();
    await storage.close();
    // The last connection's close copies the rest and removes the log (SQLite), after the worker stopped.
    expect(fs.existsSync(`${file}-wal`)).toBe(false);
    const after = new Database(file, { readonly: true });
    expect(after.prepare('SELECT count(*) AS n FROM readings').get()).toEqual({ n: 8000 });
    after.close();
  });

  it('control: without the thread and with autocheckpoint off, the file does not grow (so the check above can fail)', async () => {
    const { storage, sensorId, file } = await freshStorage(false);
    storage.opened.sqlite.pragma('wal_autocheckpoint = 0');
    const before = size(file);
    await feed(storage, sensorId, 400, 20);
    await new Promise((r) => setTimeout(r, 500));
    expect(size(file)).toBe(before);
    expect(size(`${file}-wal`)).toBeGreaterThan(100_000);
    await storage.close();
  });

  it('a log grown long under a steady feed is finished by the main thread and starts again, so it stays bounded', async () => {
    const file = path.join(freshDir(), 'steady.sqlite');
    const sqlite = new Database(file);
    sqlite.pragma('journal_mode = WAL');
    sqlite.pragma('synchronous = NORMAL');
    sqlite.exec('CREATE TABLE samples (k INTEGER PRIMARY KEY, v BLOB NOT NULL)');
    const thread = new CheckpointThread(sqlite, { intervalMs: 10, catchUpMs: 1, longLogFrames: 256 });
    // The server starts it with the database, long before the first reading; here, wait for it.
    await until('the first round', () => thread.stats.rounds > 0);
    const insert = sqlite.prepare('INSERT INTO samples (k, v) VALUES (?, ?)');
    const blob = Buffer.alloc(3000, 7);
    let maxLogBytes = 0;
    // About 60 MB through the log, one page-sized row a commit, yielding only now and then.
    for (let k = 0; k < 20_000; k++) {
      insert.run(k, blob);
      if (k % 50 === 0) {
        maxLogBytes = Math.max(maxLogBytes, size(`${file}-wal`));
        await new Promise((r) => setImmediate(r));
      }
    }
    await until('a main-thread checkpoint', () => thread.stats.mainCheckpoints > 0);
    // Bounded: the log started again many times, and never held more than a few multiples of the
    // long mark, against the ~40,000 frames of 20,000 commits in a log never started again. The file
    // may stay longer (journal_size_limit 64 MiB), but not as long as that.
    expect(thread.stats.restarts).toBeGreaterThan(5);
    expect(thread.stats.maxLogFrames).toBeLessThan(16 * 256);
    expect(maxLogBytes).toBeLessThan(70 * 2 ** 20);
    expect(thread.stats.failure).toBeNull();
    await thread.stop();
    expect(sqlite.prepare('SELECT count(*) AS n FROM samples').get()).toEqual({ n: 20_000 });
    sqlite.close();
  });

  it('if the worker dies, the main connection checkpoints on its own again and says why', async () => {
    const file = path.join(freshDir(), 'fallback.sqlite');
    const sqlite = new Database(file);
    sqlite.pragma('journal_mode = WAL');
    const failures: string[] = [];
    const thread = new CheckpointThread(sqlite, { onFailure: (why) => failures.push(why) });
    expect(sqlite.pragma('wal_autocheckpoint', { simple: true })).toBe(0);
    await until('the first round', () => thread.stats.rounds > 0);
    // The worker is private: a test reaches it to stand in for a defect or an out-of-memory death.
    await (thread as unknown as { worker: { terminate(): Promise<number> } }).worker.terminate();
    await until('the fallback', () => failures.length > 0);
    expect(failures[0]).toMatch(/checkpoint worker exited/);
    expect(thread.stats.failure).toMatch(/exited/);
    // SQLite's default (https://www.sqlite.org/pragma.html#pragma_wal_autocheckpoint): 1,000 pages.
    expect(sqlite.pragma('wal_autocheckpoint', { simple: true })).toBe(1000);
    await thread.stop();
    sqlite.close();
  });

  it('refuses an in-memory database (it has no log to copy)', () => {
    const sqlite = new Database(':memory:');
    expect(() => new CheckpointThread(sqlite)).toThrow(/database file/);
    sqlite.close();
  });
});
