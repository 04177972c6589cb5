/**
 * The write queue on its commit thread (storage/commitThread.ts): the worker commits on its own
 * connection to the same SQLite file, and the main connection reads what it committed.
 *
 * - Acknowledge after commit: when `enqueue` resolves with `stored: true`, the batch's rows are
 *   already visible to the main connection (a reader in WAL mode sees every committed
 *   transaction, SQLite's WAL documentation, "Concurrency"); every batch resolves at once on the
 *   main thread's side otherwise would let this fail.
 * - Same rows as in-thread: the same batches through a queue on the main connection and through
 *   the commit thread leave identical tables (readings, minute rollups, alerts, level changes),
 *   and the rollups equal SQLite's own GROUP BY of the stored readings (as in wind-minutes).
 * - Held while the database refuses writes: a trigger in the database file (seen by every
 *   connection, unlike a TEMP one) makes inserts fail; batches resolve `stored: false`, the
 *   statistics say so on the main thread, and once the trigger is gone everything is stored once.
 * - A dead worker is replaced and the group it had is sent again, still unacknowledged.
 * - The main connection's own transactions (read, then write) succeed while the thread commits:
 *   they begin IMMEDIATE; a deferred one fails at once with SQLITE_BUSY when it tries to write
 *   while the other connection holds the lock (SQLite, "Locking and concurrency in SQLite
 *   version 3" and the WAL page's "Sometimes queries return SQLITE_BUSY").
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { seededRandom as random } from '../../server/demo/random.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { emptyWriteBatch, type ReadingRow, type WriteBatch } from '../../server/storage/writeBatch.ts';
import { WriteQueue } from '../../server/storage/writeQueue.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

function freshDatabase() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-commit-thread-'));
  dirs.push(dir);
  const opened = openDatabase(path.join(dir, 'holdfast.sqlite'));
  opened.sqlite.prepare("INSERT INTO sites (id, name, default_levels_json, created_at_ms, updated_at_ms) VALUES (1, 'Brackenfold Common', '[]', 0, 0)").run();
  for (const id of [1, 2, 3]) opened.sqlite.prepare('INSERT INTO sensors (id, site_id, key, name, height_m, created_at_ms) VALUES (?, 1, ?, ?, 10, 0)').run(id, `mast-${id}`, `Mast ${id}`);
  opened.sqlite.prepare("INSERT INTO structures (id, site_id, name, kind, record_json, created_at_ms, updated_at_ms) VALUES (1, 1, 'North gate banner', 'banner', '{}', 0, 0)").run();
  return opened;
}

const t0 = Date.UTC(2026, 5, 13, 14, 0, 0);

/** Batches of 1–5 readings from three sensors over four minutes, some repeated (redelivery), with a level change and an alert now and then. */
function batches(seed: number): WriteBatch[] {
  const rnd = random(seed);
  const out: WriteBatch[] = [];
  let alertId = 1;
  for (let ms = 0; ms < 4 * 60_000; ms += 2_000) {
    const b = emptyWriteBatch();
    for (const sensorId of [1, 2, 3]) {
      if (rnd() < 0.2) continue;
      const speedMps = Math.round((3 + 12 * rnd()) * 100) / 100;
      const row: ReadingRow = { sensorId, tsMs: t0 + ms + sensorId, speedMps, gustMps: rnd() < 0.5 ? null : speedMps * 1.4, dirDeg: rnd() < 0.1 ? null : Math.floor(360 * rnd()), tempC: rnd() < 0.5 ? null : 14.2, pressurePa: null, rhPct: null, late: rnd() < 0.05, rollupGustMps: speedMps };
      b.readings.push(row);
      if (rnd() < 0.05) b.readings.push({ ...row });
    }
    if (rnd() < 0.1) {
      b.levelChanges.push({ structureId: 1, atMs: t0 + ms, fromLevel: 0, toLevel: 1, gustMps: 12.5, utilization: 0.62, noData: false });
      b.alerts.push({ id: alertId, siteId: 1, kind: 'level', structureId: 1, sensorId: null, level: 1, label: 'Watch', actionText: 'Check the guy lines', raisedAtMs: t0 + ms, gustMps: 12.5, utilization: 0.62, moveToConfiguration: null });
      if (alertId > 1) b.clearedAlerts.push({ id: alertId - 1, atMs: t0 + ms });
      alertId++;
    }
    out.push(b);
  }
  return out;
}

type Sqlite = ReturnType<typeof freshDatabase>['sqlite'];

function tables(sqlite: Sqlite) {
  return {
    readings: sqlite.prepare('SELECT * FROM readings ORDER BY sensor_id, ts_ms').all(),
    windMinutes: sqlite.prepare('SELECT * FROM wind_minutes ORDER BY sensor_id, minute_ms').all(),
    levelChanges: sqlite.prepare('SELECT structure_id, at_ms, from_level, to_level, gust_mps, utilization FROM level_changes ORDER BY id').all(),
    alerts: sqlite.prepare('SELECT id, level, label, raised_at_ms, cleared_at_ms FROM alerts ORDER BY id').all(),
  };
}

function expectRollupsMatchRaw(sqlite: Sqlite): void {
  const stored = sqlite.prepare('SELECT sensor_id, minute_ms, sample_count, speed_sum_cmps, dir_count FROM wind_minutes ORDER BY sensor_id, minute_ms').all();
  const reference = sqlite
    .prepare(
      `SELECT sensor_id, ts_ms - (ts_ms % 60000) AS minute_ms, COUNT(*) AS sample_count, SUM(speed_cmps) AS speed_sum_cmps, COUNT(dir_deg) AS dir_count
         FROM readings GROUP BY sensor_id, minute_ms ORDER BY sensor_id, minute_ms`,
    )
    .all();
  expect(stored).toEqual(reference);
}

const readingCount = (sqlite: Sqlite): number => (sqlite.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n;

describe('the write queue on its commit thread', () => {
  it('resolves a batch only once its rows are committed, and leaves the same tables as the in-thread queue', async () => {
    const input = batches(11);

    const local = freshDatabase();
    const inThread = new WriteQueue(local.sqlite);
    for (const b of input) {
      void inThread.enqueue(structuredClone(b));
      inThread.flush();
    }
    await inThread.settle();

    const shared = freshDatabase();
    const queue = new WriteQueue(shared.sqlite, Date.now, 0, new Map(), { commitThread: true });
    try {
      const expected = new Set<string>();
      // Some one at a time, checked as each resolves; the rest all at once (one group or several).
      const half = Math.floor(input.length / 2);
      for (const b of input.slice(0, half)) {
        for (const r of b.readings) expected.add(`${r.sensorId}:${r.tsMs}`);
        const outcome = await queue.enqueue(b);
        expect(outcome.stored).toBe(true);
        expect(readingCount(shared.sqlite)).toBe(expected.size);
      }
      const outcomes = await Promise.all(input.slice(half).map((b) => queue.enqueue(b)));
      expect(outcomes.every((o) => o.stored)).toBe(true);
      await queue.settle();
      expect(queue.stats.committedReadings).toBe(inThread.stats.committedReadings);
      expect(queue.stats.duplicateReadings).toBe(inThread.stats.duplicateReadings);
      expect(queue.stats.duplicateReadings).toBeGreaterThan(0);
      expect(queue.stats.committedBatches).toBe(input.length);
      expect(tables(shared.sqlite)).toEqual(tables(local.sqlite));
      expectRollupsMatchRaw(shared.sqlite);
    } finally {
      queue.stop();
    }
  });

  it('holds batches while the database refuses writes, says so on the main thread, and stores each once afterwards', async () => {
    const { sqlite } = freshDatabase();
    const queue = new WriteQueue(sqlite, Date.now, 0, new Map(), { commitThread: true });
    try {
      const input = batches(12);
      const third = Math.floor(input.length / 3);
      for (const b of input.slice(0, third)) expect((await queue.enqueue(b)).stored).toBe(true);
      // In the database file, so the worker's connection sees it too.
      sqlite.exec("CREATE TRIGGER refuse_readings BEFORE INSERT ON readings BEGIN SELECT RAISE(ABORT, 'disk I/O error (simulated)'); END");
      const held = await Promise.all(input.slice(third, 2 * third).map((b) => queue.enqueue(b)));
      expect(held.every((o) => !o.stored)).toBe(true);
      expect(queue.failing).toBe(true);
      expect(queue.stats.backlogRows).toBeGreaterThan(0);
      expect(queue.stats.failedCommits).toBeGreaterThan(0);
      expect(queue.stats.lastError).toMatch(/simulated/);
      sqlite.exec('DROP TRIGGER refuse_readings');
      const after = await Promise.all(input.slice(2 * third).map((b) => queue.enqueue(b)));
      expect(after.every((o) => o.stored)).toBe(true);
      await queue.settle();
      expect(queue.failing).toBe(false);
      expect(queue.stats.backlogRows).toBe(0);
      expect(queue.stats.recoveredAtMs).not.toBeNull();
      const distinct = new Set(input.flatMap((b) => b.readings.map((r) => `${r.sensorId}:${r.tsMs}`)));
      expect(readingCount(sqlite)).toBe(distinct.size);
      expectRollupsMatchRaw(sqlite);
    } finally {
      queue.stop();
    }
  });

  it('replaces a worker that died and sends it the group again, acknowledged only once stored', async () => {
    const { sqlite } = freshDatabase();
    const queue = new WriteQueue(sqlite, Date.now, 0, new Map(), { commitThread: true });
    try {
      const input = batches(13);
      const half = Math.floor(input.length / 2);
      await Promise.all(input.slice(0, half).map((b) => queue.enqueue(b)));
      // A defect or an out-of-memory end of the worker, from outside: its thread is terminated
      // while a group is on its way to it.
      const thread = (queue as unknown as { thread: { worker: { terminate(): Promise<number> } } }).thread;
      const pending = input.slice(half).map((b) => queue.enqueue(b));
      void thread.worker.terminate();
      const outcomes = await Promise.all(pending);
      expect(outcomes.every((o) => o.stored)).toBe(true);
      await queue.settle();
      const distinct = new Set(input.flatMap((b) => b.readings.map((r) => `${r.sensorId}:${r.tsMs}`)));
      expect(readingCount(sqlite)).toBe(distinct.size);
      expect(queue.stats.lastError).toMatch(/commit thread/);
      expectRollupsMatchRaw(sqlite);
    } finally {
      queue.stop();
    }
  }, 20_000);

  it("lets the main connection's transactions read and then write while the thread commits", async () => {
    const opened = freshDatabase();
    const storage = new SqliteStorage(opened);
    const queue = new WriteQueue(opened.sqlite, Date.now, 0, new Map(), { commitThread: true });
    try {
      // Groups large enough to keep the worker writing for a while.
      const big: WriteBatch[] = [];
      for (let k = 0; k < 40; k++) {
        const b = emptyWriteBatch();
        for (let i = 0; i < 500; i++) b.readings.push({ sensorId: 1 + (i % 3), tsMs: t0 + k * 10_000 + i * 3 + (i % 3), speedMps: 5, gustMps: null, dirDeg: 200, tempC: null, pressurePa: null, rhPct: null, late: false, rollupGustMps: 5 });
        big.push(b);
      }
      const count = opened.sqlite.prepare('SELECT COUNT(*) AS n FROM readings');
      const audit = opened.sqlite.prepare("INSERT INTO audit (at_ms, actor, entity, entity_id, action, before_json, after_json) VALUES (?, 'test', 'site', '1', 'note', NULL, ?)");
      let done = false;
      // One batch a turn, so the thread commits group after group …
      const all = (async () => {
        const outcomes = [];
        for (const b of big) {
          outcomes.push(queue.enqueue(b));
          await new Promise((r) => setImmediate(r));
        }
        const settled = await Promise.all(outcomes);
        done = true;
        return settled;
      })();
      // … while the main connection runs transactions, synchronous as a route's would be.
      let transactions = 0;
      const overlapped = new Set<number>();
      while (!done) {
        for (let i = 0; i < 20; i++) {
          await storage.transaction(async () => {
            const n = (count.get() as { n: number }).n;
            audit.run(Date.now(), JSON.stringify({ readingsSeen: n }));
            if (n > 0) overlapped.add(n);
          });
          transactions++;
        }
        // A millisecond with no transaction between bursts: the thread's commit waits for the
        // write lock in SQLite's busy handler, which retries at intervals (up to 100 ms apart,
        // from memory of sqliteDefaultBusyCallback); with bursts back to back it found the lock
        // free at none of its retries in 5 s once on a loaded CI machine, and held its batch.
        await new Promise((r) => setTimeout(r, 1));
      }
      expect((await all).every((o) => o.stored)).toBe(true);
      // The transactions ran while the thread was committing (they saw several counts).
      expect(overlapped.size).toBeGreaterThan(1);
      expect((opened.sqlite.prepare("SELECT COUNT(*) AS n FROM audit WHERE action = 'note'").get() as { n: number }).n).toBe(transactions);
    } finally {
      queue.stop();
    }
  }, 30_000);
});
