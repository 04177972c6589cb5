/**
 * Benchmarks 3 and 4 on a generated festival log: the log queries (LogQueries.windSeries against
 * the naive full scan LogQueries.windSeriesByFullScan) and the bytes each stored reading costs on
 * disk.
 *
 * The festival (invented): Brackenfold Common, six days, ten anemometers sending raw samples at
 * 1 Hz (5.18 million readings), wind from the seeded simulator with a windy spell on two of the
 * days; one mast also reports temperature, pressure and humidity, as the demo's north mast does.
 * It is written through the server's own WriteQueue — the same rows and per-minute rollups the
 * live path writes — with each reading's rollup gust from the real wind state (acceptReading's
 * 3-s gust), in time order across sensors, as live ingest would write them. Transactions are big
 * (the queue is flushed every ten simulated minutes) and `synchronous = OFF` while generating: the
 * file's layout does not depend on either.
 *
 * The database is cached in tests/artifacts/bench-festival/ with the parameters it was made with;
 * it is made again when missing or when the parameters or the migrations change.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import Database from 'better-sqlite3';
import { WindSimulator } from '../../server/demo/windSimulator.ts';
import { createSensor } from '../../server/register/sensors.ts';
import { ensureSite, getSite, updateSite } from '../../server/register/site.ts';
import { migrationsFolder, openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { bucketWidthMs, LogQueries, type WindSeries } from '../../server/storage/logQueries.ts';
import { emptyWriteBatch } from '../../server/storage/writeBatch.ts';
import { WriteQueue } from '../../server/storage/writeQueue.ts';
import { acceptReading, createSensorWindState } from '../../server/wind/index.ts';
import { median } from './common.ts';

export interface FestivalParams {
  sensors: number;
  days: number;
  /** Samples per second per sensor. */
  hz: number;
  seed: number;
  startMs: number;
}

export interface FestivalDb {
  file: string;
  params: FestivalParams;
  readings: number;
  generatedSeconds: number | null;
  cached: boolean;
}

const dayMs = 86_400_000;

function migrationsHash(): string {
  const dir = migrationsFolder();
  const h = crypto.createHash('sha256');
  for (const f of fs.readdirSync(dir).filter((f) => f.endsWith('.sql')).sort()) h.update(f).update(fs.readFileSync(path.join(dir, f)));
  return h.digest('hex').slice(0, 16);
}

export async function festivalDatabase(dir: string, params: FestivalParams, log: (line: string) => void): Promise<FestivalDb> {
  const file = path.join(dir, 'holdfast.sqlite');
  const metaFile = path.join(dir, 'festival.json');
  const key = JSON.stringify({ ...params, migrations: migrationsHash(), generator: 1 });
  if (fs.existsSync(file) && fs.existsSync(metaFile)) {
    const meta = JSON.parse(fs.readFileSync(metaFile, 'utf8')) as { key: string; readings: number; generatedSeconds: number };
    if (meta.key === key) return { file, params, readings: meta.readings, generatedSeconds: meta.generatedSeconds, cached: true };
  }
  fs.rmSync(dir, { recursive: true, force: true });
  fs.mkdirSync(dir, { recursive: true });
  const t0 = performance.now();
  const readings = await generate(file, params, log);
  const generatedSeconds = (performance.now() - t0) / 1000;
  fs.writeFileSync(metaFile, JSON.stringify({ key, readings, generatedSeconds, params }, null, 2));
  return { file, params, readings, generatedSeconds, cached: false };
}

async function generate(file: string, p: FestivalParams, log: (line: string) => void): Promise<number> {
  const opened = openDatabase(file);
  const { sqlite } = opened;
  const db = new SqliteStorage(opened);
  try {
    await ensureSite(db, p.startMs, 'Brackenfold Common');
    await updateSite(db, { name: 'Brackenfold Common — festival week (benchmark log, invented)', timeZone: 'Europe/London' }, 'benchmark set-up', p.startMs);
    const site = await getSite(db);
    const specs = Array.from({ length: p.sensors }, (_, i) => ({ key: `field-mast-${i + 1}`, heightM: [10, 8, 6, 4, 12][i % 5]! }));
    const sensors = [];
    for (const [i, s] of specs.entries()) sensors.push(await createSensor(db, site.id, { key: s.key, name: `Field mast ${i + 1}`, heightM: s.heightM, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000 }, 'benchmark set-up', p.startMs));
    const windStates = specs.map((s) => createSensorWindState({ sensorKey: s.key }));
    const simulator = new WindSimulator({
      seed: p.seed,
      startMs: p.startMs,
      baseMeanMps: 4.5,
      dailySwingMps: 1.5,
      baseDirDeg: 240,
      sensors: specs,
      spells: [
        { startMs: 1 * dayMs + 13 * 3_600_000, rampMs: 90 * 60_000, holdMs: 120 * 60_000, peakMeanMps: 12.5 },
        { startMs: 4 * dayMs + 15 * 3_600_000, rampMs: 40 * 60_000, holdMs: 60 * 60_000, peakMeanMps: 10 },
      ],
    });
    let simNow = p.startMs;
    const queue = new WriteQueue(sqlite, () => simNow);
    sqlite.pragma('synchronous = OFF');
    const stepMs = Math.round(1000 / p.hz);
    const endMs = p.startMs + p.days * dayMs;
    const flushEveryMs = 600_000;
    let nextFlush = p.startMs + flushEveryMs;
    let nextLog = p.startMs + dayMs;
    let written = 0;
    for (simNow = p.startMs; simNow < endMs; simNow += stepMs) {
      const batch = emptyWriteBatch();
      const samples = simulator.sample(simNow);
      for (let i = 0; i < samples.length; i++) {
        const s = samples[i]!;
        const withAir = i === 0;
        const reading = {
          tsMs: s.tsMs,
          speedMps: s.speedMps,
          gustMps: null,
          dirDeg: s.dirDeg,
          tempC: withAir ? s.tempC : null,
          pressurePa: withAir ? Math.round(s.pressureHpa * 100) : null,
          rhPct: withAir ? s.rhPct : null,
        };
        const gust = acceptReading(windStates[i]!, reading, simNow);
        batch.readings.push({ sensorId: sensors[i]!.id, ...reading, late: false, rollupGustMps: typeof gust === 'number' ? gust : s.speedMps });
      }
      written += batch.readings.length;
      void queue.enqueue(batch);
      if (simNow >= nextFlush) {
        queue.flush();
        nextFlush += flushEveryMs;
        // Let the queue's promises settle so they do not pile up.
        await new Promise((r) => setImmediate(r));
      }
      if (simNow >= nextLog) {
        log(`  festival log: day ${Math.round((simNow - p.startMs) / dayMs)} of ${p.days} written (${written} readings)`);
        nextLog += dayMs;
      }
    }
    queue.settle();
    if (queue.stats.failedCommits > 0) throw new Error(`festival generation: ${queue.stats.failedCommits} failed commits: ${queue.stats.lastError}`);
    sqlite.pragma('synchronous = NORMAL');
    sqlite.pragma('wal_checkpoint(TRUNCATE)');
    return queue.stats.committedReadings;
  } finally {
    sqlite.close();
  }
}

// ---------- storage ----------

export interface StorageResult {
  readings: number;
  fileBytes: number;
  walBytes: number;
  bytesPerReading: number;
  /** Bytes per table and index (dbstat), and readings-table bytes per reading. */
  tables: Array<{ name: string; bytes: number; pages: number; rows: number | null }>;
  readingsTableBytesPerReading: number | null;
}

export function measureStorage(file: string): StorageResult {
  const sqlite = new Database(file);
  try {
    sqlite.pragma('wal_checkpoint(TRUNCATE)');
    const readings = (sqlite.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n;
    let tables: StorageResult['tables'] = [];
    try {
      const rows = sqlite.prepare('SELECT name, SUM(pgsize) AS bytes, COUNT(*) AS pages FROM dbstat GROUP BY name ORDER BY bytes DESC').all() as Array<{ name: string; bytes: number; pages: number }>;
      const counted = new Set(['readings', 'wind_minutes', 'structure_minutes', 'level_changes', 'alerts', 'audit']);
      tables = rows.map((r) => ({ ...r, rows: counted.has(r.name) ? (sqlite.prepare(`SELECT COUNT(*) AS n FROM ${r.name}`).get() as { n: number }).n : null }));
    } catch {
      tables = [];
    }
    const fileBytes = fs.statSync(file).size;
    const wal = `${file}-wal`;
    const walBytes = fs.existsSync(wal) ? fs.statSync(wal).size : 0;
    const readingsTable = tables.find((t) => t.name === 'readings');
    return {
      readings,
      fileBytes,
      walBytes,
      bytesPerReading: (fileBytes + walBytes) / readings,
      tables,
      readingsTableBytesPerReading: readingsTable ? readingsTable.bytes / readings : null,
    };
  } finally {
    sqlite.close();
  }
}

// ---------- log queries ----------

/**
 * A copy of LogQueries.windSeries's SQL with the bucket arithmetic bound as integers (BigInt),
 * for the benchmark only: better-sqlite3 binds a JS number as REAL, so `(t - @from) / @width`
 * in the server's query is a real division, GROUP BY makes one bucket per row and the series has
 * one point per stored row or minute instead of at most `maxPoints`. This shows what the query
 * costs once the division is an integer one (e.g. `CAST(@width AS INTEGER)` in the server).
 */
export class IntegerBucketQueries {
  private readonly fromMinutes: Database.Statement;
  private readonly fromReadings: Database.Statement;
  constructor(sqlite: Database.Database) {
    this.fromMinutes = sqlite.prepare(
      `SELECT (minute_ms - @from) / @width AS b, SUM(sample_count) AS n, SUM(speed_sum_cmps) AS s, MAX(max_gust_cmps) AS g,
              SUM(dir_sin_sum) AS ds, SUM(dir_cos_sum) AS dc, SUM(dir_count) AS dn
       FROM wind_minutes WHERE sensor_id = @sensor AND minute_ms >= @from AND minute_ms < @to GROUP BY b ORDER BY b`,
    );
    this.fromReadings = sqlite.prepare(
      `SELECT (ts_ms - @from) / @width AS b, COUNT(*) AS n, SUM(speed_cmps) AS s, MAX(COALESCE(gust_cmps, speed_cmps)) AS g,
              SUM(CASE WHEN dir_deg IS NULL THEN 0 ELSE sin(radians(dir_deg)) END) AS ds,
              SUM(CASE WHEN dir_deg IS NULL THEN 0 ELSE cos(radians(dir_deg)) END) AS dc,
              COUNT(dir_deg) AS dn
       FROM readings WHERE sensor_id = @sensor AND ts_ms >= @from AND ts_ms < @to GROUP BY b ORDER BY b`,
    );
  }

  /** Points of the series (the rows are aggregated the same way; only their count matters here). */
  points(sensorId: number, fromMs: number, toMs: number, maxPoints: number): number {
    const width = bucketWidthMs(fromMs, toMs, maxPoints);
    const fromMinutes = width >= 60_000;
    const from = fromMinutes ? fromMs - (fromMs % 60_000) : fromMs;
    const rows = (fromMinutes ? this.fromMinutes : this.fromReadings).all({ sensor: sensorId, from: BigInt(from), to: BigInt(toMs), width: BigInt(width) }) as Array<{ b: number; n: number; s: number }>;
    let check = 0;
    for (const r of rows) check += r.n > 0 ? r.s / r.n : 0;
    return Number.isFinite(check) ? rows.length : -1;
  }
}

export interface QueryTiming {
  window: string;
  spanMs: number;
  points: number;
  source: WindSeries['source'];
  bucketMs: number;
  rowsScanned: number;
  indexedMedianMs: number;
  indexedMaxMs: number;
  fullScanMedianMs: number;
  fullScanMaxMs: number;
  speedUp: number;
  /** The same query with integer bucket division (IntegerBucketQueries): points and time. */
  integerBuckets: { points: number; medianMs: number; maxMs: number };
}

/**
 * Times each window on every sensor in turn (warm page cache: the first call per window is a
 * warm-up and not counted): the indexed, rollup-backed query `reps` times, the full scan
 * `fullScanReps` times.
 */
export function timeLogQueries(file: string, params: FestivalParams, reps: number, fullScanReps: number): QueryTiming[] {
  const sqlite = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const queries = new LogQueries(sqlite);
    const fixed = new IntegerBucketQueries(sqlite);
    const sensorIds = (sqlite.prepare('SELECT id FROM sensors ORDER BY id').all() as Array<{ id: number }>).map((r) => r.id);
    const start = params.startMs;
    const end = start + params.days * dayMs;
    const windows: Array<{ window: string; from: number; to: number }> = [
      { window: `whole festival (${params.days} days)`, from: start, to: end },
      // 32 h: the longest window whose 2,000 points are under a minute each, so it is answered from raw readings.
      { window: '32 h (longest answered from raw readings)', from: start + 2 * dayMs, to: start + 2 * dayMs + 32 * 3_600_000 },
      { window: 'one day', from: start + 1 * dayMs, to: start + 2 * dayMs },
      { window: 'one hour (the windy spell)', from: start + 1 * dayMs + 15 * 3_600_000, to: start + 1 * dayMs + 16 * 3_600_000 },
    ];
    const maxPoints = 2_000;
    const out: QueryTiming[] = [];
    const rowsIn = sqlite.prepare('SELECT COUNT(*) AS n FROM readings WHERE sensor_id = ? AND ts_ms >= ? AND ts_ms < ?');
    const minutesIn = sqlite.prepare('SELECT COUNT(*) AS n FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ?');
    for (const w of windows) {
      const first = queries.windSeries(sensorIds[0]!, w.from, w.to, maxPoints);
      queries.windSeriesByFullScan(sensorIds[0]!, w.from, w.to, maxPoints);
      if (first.tMs.length === 0) throw new Error(`${w.window}: no points`);
      const indexed: number[] = [];
      for (let i = 0; i < reps; i++) {
        const id = sensorIds[i % sensorIds.length]!;
        const t = performance.now();
        queries.windSeries(id, w.from, w.to, maxPoints);
        indexed.push(performance.now() - t);
      }
      const full: number[] = [];
      for (let i = 0; i < fullScanReps; i++) {
        const id = sensorIds[i % sensorIds.length]!;
        const t = performance.now();
        queries.windSeriesByFullScan(id, w.from, w.to, maxPoints);
        full.push(performance.now() - t);
      }
      const fixedPoints = fixed.points(sensorIds[0]!, w.from, w.to, maxPoints);
      const fixedMs: number[] = [];
      for (let i = 0; i < reps; i++) {
        const id = sensorIds[i % sensorIds.length]!;
        const t = performance.now();
        fixed.points(id, w.from, w.to, maxPoints);
        fixedMs.push(performance.now() - t);
      }
      const scanned = (first.source === 'minutes' ? minutesIn : rowsIn).get(sensorIds[0]!, w.from, w.to) as { n: number };
      out.push({
        window: w.window,
        spanMs: w.to - w.from,
        points: first.tMs.length,
        source: first.source,
        bucketMs: first.bucketMs,
        rowsScanned: scanned.n,
        indexedMedianMs: median(indexed),
        indexedMaxMs: Math.max(...indexed),
        fullScanMedianMs: median(full),
        fullScanMaxMs: Math.max(...full),
        speedUp: median(full) / median(indexed),
        integerBuckets: { points: fixedPoints, medianMs: median(fixedMs), maxMs: Math.max(...fixedMs) },
      });
    }
    return out;
  } finally {
    sqlite.close();
  }
}
