/**
 * The checkpoint thread (server/storage/checkpointThread.ts): the write-ahead log is copied into
 * the database file by a worker, never inside the main thread's commits, and nothing committed is
 * lost on the way. SQLite's behaviour relied on (https://www.sqlite.org/wal.html, "Checkpointing"
 * and https://www.sqlite.org/pragma.html#pragma_wal_checkpoint): with `wal_autocheckpoint = 0` a
 * connection never copies the log on its own; a PASSIVE checkpoint from another connection copies
 * committed frames without blocking the writer; the log restarts from its beginning at the first
 * write after every frame has been copied.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { CheckpointThread, type CheckpointStats } from '../../server/storage/checkpointThread.ts';
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

/**
 * 3,000 commits of 40 sensors' readings (a page or more each) through the live path's queue, as
 * fast as it takes them; the log file's largest size, the thread's statistics, the readings stored.
 */
async function steadyFeed(options: Parameters<typeof openStorage>[1]): Promise<{ maxLogBytes: number; stats: CheckpointStats | null; readings: number }> {
  const file = path.join(freshDir(), 'holdfast.sqlite');
  const storage = openStorage(file, options);
  if (!options?.checkpointThread) storage.opened.sqlite.pragma('wal_autocheckpoint = 0');
  const site = await storage.site.insert({ name: 'Brackenfold Common', defaultLevelsJson: [], createdAtMs: 0, updatedAtMs: 0 });
  const sensorIds: number[] = [];
  for (let i = 0; i < 40; i++) sensorIds.push((await storage.sensors.insert({ siteId: site.id, key: `mast-${i}`, name: `Mast ${i}`, heightM: 10, createdAtMs: 0 })).id);
  await storage.checkpoints?.ready;
  const queue = storage.writes.queue(Date.now, 0);
  let maxLogBytes = 0;
  for (let c = 0; c < 3000; c++) {
    const batch = emptyWriteBatch();
    for (const sensorId of sensorIds) batch.readings.push(...readings(sensorId, c, 1).readings);
    expect((await queue.enqueue(batch)).stored).toBe(true);
    if (c % 50 === 0) maxLogBytes = Math.max(maxLogBytes, size(`${file}-wal`));
  }
  maxLogBytes = Math.max(maxLogBytes, size(`${file}-wal`));
  queue.stop();
  if (storage.checkpoints) await until('a finish with the commits held', () => storage.checkpoints!.stats.finishes > 0);
  const stats = storage.checkpoints ? { ...storage.checkpoints.stats } : null;
  const stored = (storage.opened.sqlite.prepare('SELECT count(*) AS n FROM readings').get() as { n: number }).n;
  await storage.close();
  return { maxLogBytes, stats, readings: stored };
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

  it('a log grown long under a steady feed is finished while commits are held, starts again, and stays bounded', async () => {
    // The same feed twice: once with autocheckpoint off and no thread (the log is never copied,
    // so it never starts again: its size is what the feed writes), once with the thread.
    const unbounded = await steadyFeed({ checkpointThread: false });
    const bounded = await steadyFeed({ checkpointThread: true, checkpoints: { intervalMs: 10, catchUpMs: 1, longLogFrames: 256 } });
    const thread = bounded.stats!;
    expect(thread.finishes).toBeGreaterThan(0);
    expect(thread.restarts).toBeGreaterThan(5);
    expect(thread.failure).toBeNull();
    // Bounded: well under what the feed writes. Not a tight figure: a worker starved of CPU (a
    // busy CI machine) copies late, and the log grows meanwhile.
    expect(unbounded.maxLogBytes).toBeGreaterThan(40 * 2 ** 20);
    expect(bounded.maxLogBytes).toBeLessThan(unbounded.maxLogBytes / 2);
    expect(thread.maxLogFrames * 4096).toBeLessThan(unbounded.maxLogBytes / 2);
    expect(bounded.readings).toBe(3000 * 40);
  });

  it('holding the connection makes store calls and commits wait until it is let go', async () => {
    const { storage, sensorId } = await freshStorage(false);
    const queue = storage.writes.queue(Date.now, 0);
    // transactions.ts `hold`, reached through the store's transaction gate as the checkpoint thread does.
    const transactions = (storage as unknown as { transactions: { hold(): Promise<() => void> } }).transactions;
    const release = await transactions.hold();
    let committed = false;
    let read = false;
    const commit = queue.enqueue(readings(sensorId, 0, 5)).then(() => (committed = true));
    const call = storage.sensors.active().then(() => (read = true));
    await new Promise((r) => setTimeout(r, 100));
    expect([committed, read]).toEqual([false, false]);
    release();
    await Promise.all([commit, call]);
    expect([committed, read]).toEqual([true, true]);
    queue.stop();
    await storage.close();
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

  it('keeps a process that waits for it alive until it has started (the server awaits it before anything else runs)', () => {
    const out = execFileSync(process.execPath, ['--import', 'tsx', path.resolve('tests/fixtures/openStorageReady.ts')], { encoding: 'utf8', env: { ...process.env, NODE_OPTIONS: '' }, timeout: 60_000 });
    expect(out.trim()).toBe('ready');
  }, 70_000);

  it('refuses an in-memory database (it has no log to copy)', () => {
    const sqlite = new Database(':memory:');
    expect(() => new CheckpointThread(sqlite)).toThrow(/database file/);
    sqlite.close();
  });
});
