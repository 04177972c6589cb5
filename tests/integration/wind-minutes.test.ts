/**
 * The per-minute wind rollups against the raw readings they summarise, in a real SQLite file.
 * The write queue keeps each sensor's newest minute in memory (storage/writeQueue.ts); whatever
 * order readings arrive in, however commits and the once-a-second writes interleave, through a
 * database that refuses writes for a while, and after a crash that loses the memory, every
 * minute row must equal what a plain GROUP BY over the raw readings gives (count, speed sum,
 * direction sums) — the reference here is SQLite's own aggregation of the stored readings.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { seededRandom as random } from '../../server/demo/random.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { emptyWriteBatch, type ReadingRow } from '../../server/storage/writeBatch.ts';
import { rebuildNewestMinutes, WriteQueue } from '../../server/storage/writeQueue.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

function freshDatabase() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-minutes-'));
  dirs.push(dir);
  const opened = openDatabase(path.join(dir, 'holdfast.sqlite'));
  opened.sqlite.prepare("INSERT INTO sites (id, name, default_levels_json, created_at_ms, updated_at_ms) VALUES (1, 'Brackenfold Common', '[]', 0, 0)").run();
  for (const id of [1, 2, 3]) opened.sqlite.prepare('INSERT INTO sensors (id, site_id, key, name, height_m, created_at_ms) VALUES (?, 1, ?, ?, 10, 0)').run(id, `mast-${id}`, `Mast ${id}`);
  return opened;
}


const t0 = Date.UTC(2026, 5, 13, 14, 0, 0);

/** 3 sensors, 12 minutes at about 2 Hz, mostly in order; some out of order, some late, some repeated. */
function readings(seed: number): ReadingRow[] {
  const rnd = random(seed);
  const rows: ReadingRow[] = [];
  for (let ms = 0; ms < 12 * 60_000; ms += 500) {
    for (const sensorId of [1, 2, 3]) {
      if (rnd() < 0.1) continue;
      const speedMps = Math.round((3 + 12 * rnd()) * 100) / 100;
      rows.push({ sensorId, tsMs: t0 + ms + Math.floor(rnd() * 400), speedMps, gustMps: null, dirDeg: rnd() < 0.1 ? null : Math.floor(360 * rnd()), tempC: null, pressurePa: null, rhPct: null, late: false, rollupGustMps: speedMps });
    }
  }
  // Shuffle neighbours (out of order within a few seconds), send some back minutes later (late), repeat some (redelivery).
  for (let i = 1; i < rows.length; i++) if (rnd() < 0.2) [rows[i - 1], rows[i]] = [rows[i]!, rows[i - 1]!];
  const late = rows.filter(() => rnd() < 0.03);
  const onTime = rows.filter((r) => !late.includes(r));
  const repeats = onTime.filter(() => rnd() < 0.02);
  return [...onTime, ...late.map((r) => ({ ...r, late: true })), ...repeats];
}

interface MinuteRow {
  sensor_id: number;
  minute_ms: number;
  sample_count: number;
  speed_sum_cmps: number;
  max_gust_cmps: number;
  dir_sin_sum: number;
  dir_cos_sum: number;
  dir_count: number;
}

function expectRollupsMatchRaw(sqlite: ReturnType<typeof freshDatabase>['sqlite']): void {
  const stored = sqlite.prepare('SELECT * FROM wind_minutes ORDER BY sensor_id, minute_ms').all() as MinuteRow[];
  const reference = sqlite
    .prepare(
      `SELECT sensor_id, ts_ms - (ts_ms % 60000) AS minute_ms, COUNT(*) AS sample_count, SUM(speed_cmps) AS speed_sum_cmps,
              MAX(speed_cmps) AS max_speed, COUNT(dir_deg) AS dir_count
         FROM readings GROUP BY sensor_id, minute_ms ORDER BY sensor_id, minute_ms`,
    )
    .all() as Array<{ sensor_id: number; minute_ms: number; sample_count: number; speed_sum_cmps: number; max_speed: number; dir_count: number }>;
  expect(stored.map((m) => [m.sensor_id, m.minute_ms])).toEqual(reference.map((r) => [r.sensor_id, r.minute_ms]));
  const dirs = sqlite.prepare('SELECT dir_deg AS d FROM readings WHERE sensor_id = ? AND ts_ms >= ? AND ts_ms < ? AND dir_deg IS NOT NULL');
  stored.forEach((m, i) => {
    const r = reference[i]!;
    expect(m.sample_count).toBe(r.sample_count);
    expect(m.speed_sum_cmps).toBe(r.speed_sum_cmps);
    expect(m.max_gust_cmps).toBe(r.max_speed);
    expect(m.dir_count).toBe(r.dir_count);
    const rows = dirs.all(m.sensor_id, m.minute_ms, m.minute_ms + 60_000) as Array<{ d: number }>;
    expect(m.dir_sin_sum).toBeCloseTo(rows.reduce((s, x) => s + Math.sin((x.d * Math.PI) / 180), 0), 9);
    expect(m.dir_cos_sum).toBeCloseTo(rows.reduce((s, x) => s + Math.cos((x.d * Math.PI) / 180), 0), 9);
  });
}

function feed(queue: WriteQueue, rows: ReadingRow[], seed: number, between: (i: number) => void = () => undefined): void {
  const rnd = random(seed);
  for (let i = 0; i < rows.length; ) {
    const batch = emptyWriteBatch();
    const n = 1 + Math.floor(rnd() * 40);
    for (const row of rows.slice(i, i + n)) batch.readings.push({ ...row });
    i += n;
    void queue.enqueue(batch);
    queue.flush();
    if (rnd() < 0.3) queue.writeOpenMinutes();
    between(i);
  }
}

describe('per-minute wind rollups', () => {
  it.each([1, 2, 3])('equal the raw readings grouped by minute, for any order of arrival and of writes (seed %i)', (seed) => {
    const { sqlite } = freshDatabase();
    const queue = new WriteQueue(sqlite);
    const rows = readings(seed);
    feed(queue, rows, seed + 100);
    queue.settle();
    expect(queue.stats.duplicateReadings).toBeGreaterThan(0);
    expectRollupsMatchRaw(sqlite);
    sqlite.close();
  });

  it('count nothing twice when commits fail part-way for a while and are retried from memory', () => {
    const { sqlite } = freshDatabase();
    const queue = new WriteQueue(sqlite);
    const rows = readings(7);
    const third = Math.floor(rows.length / 3);
    // A failing spell in the middle: a write fails part-way through a commit (on every seventh
    // timestamp), after the commit has already summed earlier readings into its minutes; the
    // transaction rolls back and the batches are retried from memory.
    const failPartWay = (on: boolean): void => {
      if (on) sqlite.exec("CREATE TEMP TRIGGER IF NOT EXISTS fail_part_way BEFORE INSERT ON readings WHEN NEW.ts_ms % 7 = 3 BEGIN SELECT RAISE(ABORT, 'disk I/O error (simulated)'); END");
      else sqlite.exec('DROP TRIGGER IF EXISTS temp.fail_part_way');
    };
    feed(queue, rows, 107, (i) => failPartWay(i >= third && i < 2 * third));
    failPartWay(false);
    expect(queue.stats.failedCommits).toBeGreaterThan(0);
    queue.settle();
    expect(queue.failing).toBe(false);
    expectRollupsMatchRaw(sqlite);
    sqlite.close();
  });

  it('are recomputed from the raw readings at start when a crash lost what memory held of the newest minutes', () => {
    const { sqlite } = freshDatabase();
    const queue = new WriteQueue(sqlite);
    feed(queue, readings(11), 111);
    // A new minute starts on every sensor; then a crash: the readings are committed, but what the
    // open minutes gathered was never written.
    const batch = emptyWriteBatch();
    for (const sensorId of [1, 2, 3]) {
      for (const s of [1, 2]) batch.readings.push({ sensorId, tsMs: t0 + 13 * 60_000 + s * 1000, speedMps: 6 + s, gustMps: null, dirDeg: 200, tempC: null, pressurePa: null, rhPct: null, late: false, rollupGustMps: 6 + s });
    }
    void queue.enqueue(batch);
    queue.flush();
    const count = (sql: string): number => (sqlite.prepare(sql).get() as { n: number }).n;
    expect(count('SELECT SUM(sample_count) AS n FROM wind_minutes')).toBeLessThan(count('SELECT COUNT(*) AS n FROM readings'));
    expect(rebuildNewestMinutes(sqlite).size).toBe(3);
    expectRollupsMatchRaw(sqlite);
    // A second start changes nothing.
    expect([...rebuildNewestMinutes(sqlite).values()]).toEqual([1, 2, 3].map(() => t0 + 13 * 60_000));
    expectRollupsMatchRaw(sqlite);
    sqlite.close();
  });

  it('keep a replayed late reading that is a sensor’s first after a restart, even if the server then crashes', () => {
    const { sqlite } = freshDatabase();
    const first = new WriteQueue(sqlite);
    feed(first, readings(13), 113);
    first.settle();
    // Restart: the queue starts from each sensor's newest stored minute.
    const queue = new WriteQueue(sqlite, Date.now, 0, rebuildNewestMinutes(sqlite));
    const batch = emptyWriteBatch();
    batch.readings.push({ sensorId: 2, tsMs: t0 + 3 * 60_000 + 777, speedMps: 9.99, gustMps: null, dirDeg: 90, tempC: null, pressurePa: null, rhPct: null, late: true, rollupGustMps: 9.99 });
    void queue.enqueue(batch);
    queue.flush();
    // Crash before the next once-a-second write, then a start.
    rebuildNewestMinutes(sqlite);
    expectRollupsMatchRaw(sqlite);
    sqlite.close();
  });

  it('keep a minute whose raw readings retention has partly deleted when the server restarts', async () => {
    const { removeRawReadingsBefore } = await import('../../server/storage/retention.ts');
    const { sqlite } = freshDatabase();
    const queue = new WriteQueue(sqlite);
    feed(queue, readings(17), 117);
    queue.settle();
    const minuteRow = (sensorId: number) =>
      sqlite.prepare('SELECT * FROM wind_minutes WHERE sensor_id = ? ORDER BY minute_ms DESC LIMIT 1').get(sensorId) as MinuteRow;
    const before = minuteRow(1);
    // Retention's cutoff falls in the middle of sensor 1's newest minute.
    await removeRawReadingsBefore(sqlite, before.minute_ms + 30_000, { pause: async () => undefined });
    rebuildNewestMinutes(sqlite);
    expect(minuteRow(1)).toEqual(before);
    sqlite.close();
  });
});
