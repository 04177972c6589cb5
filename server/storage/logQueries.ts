/**
 * Questions asked of the log after a windy day. Series are downsampled in SQL to at most the
 * requested number of points: from the per-minute rollups when a point spans a minute or more
 * (so a festival's worth of readings answers from a few thousand rows per sensor), from the raw
 * readings only for windows short enough that a point is under a minute.
 *
 * Series are columnar (one array per quantity, null for a gap), ready for a chart.
 */
import type Database from 'better-sqlite3';
import { unitVectorMeanDegFromSums } from '../wind/index.ts';
import { utilizationE4Unbounded } from './storedUnits.ts';

const minuteMs = 60_000;

export interface WindSeries {
  bucketMs: number;
  source: 'readings' | 'minutes';
  tMs: number[];
  meanMps: Array<number | null>;
  gustMps: Array<number | null>;
  dirDeg: Array<number | null>;
  samples: number[];
}

export interface StructureSeries {
  bucketMs: number;
  tMs: number[];
  gustMps: number[];
  utilization: Array<number | null>;
  level: number[];
}

/**
 * A bucket width that gives at most `maxPoints` buckets over the window. From 30 s up it is whole
 * minutes (answered from the per-minute rollups: a day in 1 440 points rather than 2 000 from
 * 86 400 raw rows); below that whole seconds, from the raw readings.
 */
export function bucketWidthMs(fromMs: number, toMs: number, maxPoints: number): number {
  const raw = Math.ceil((toMs - fromMs) / maxPoints);
  if (raw < minuteMs / 2) return Math.max(1_000, Math.ceil(raw / 1_000) * 1_000);
  return Math.max(minuteMs, Math.ceil(raw / minuteMs) * minuteMs);
}

export class LogQueries {
  private readonly windFromMinutes: Database.Statement;
  private readonly windFromReadings: Database.Statement;
  private readonly structureFromMinutes: Database.Statement;

  constructor(private readonly sqlite: Database.Database) {
    // Buckets are aligned to the window start: bucket = (t − from) / width, in integer division.
    // better-sqlite3 binds every JS number as REAL, so the CASTs matter: without them the division
    // is exact and every row becomes its own bucket.
    this.windFromMinutes = sqlite.prepare(
      `SELECT CAST(minute_ms - @from AS INTEGER) / CAST(@width AS INTEGER) AS b, SUM(sample_count) AS n, SUM(speed_sum_cmps) AS s, MAX(max_gust_cmps) AS g,
              SUM(dir_sin_sum) AS ds, SUM(dir_cos_sum) AS dc, SUM(dir_count) AS dn
       FROM wind_minutes WHERE sensor_id = @sensor AND minute_ms >= @from AND minute_ms < @to GROUP BY b ORDER BY b`,
    );
    this.windFromReadings = sqlite.prepare(
      `SELECT CAST(ts_ms - @from AS INTEGER) / CAST(@width AS INTEGER) AS b, COUNT(*) AS n, SUM(speed_cmps) AS s, MAX(COALESCE(gust_cmps, speed_cmps)) AS g,
              SUM(CASE WHEN dir_deg IS NULL THEN 0 ELSE sin(radians(dir_deg)) END) AS ds,
              SUM(CASE WHEN dir_deg IS NULL THEN 0 ELSE cos(radians(dir_deg)) END) AS dc,
              COUNT(dir_deg) AS dn
       FROM readings WHERE sensor_id = @sensor AND ts_ms >= @from AND ts_ms < @to GROUP BY b ORDER BY b`,
    );
    this.structureFromMinutes = sqlite.prepare(
      `SELECT CAST(minute_ms - @from AS INTEGER) / CAST(@width AS INTEGER) AS b, MAX(max_gust_cmps) AS g, MAX(max_utilization_e4) AS u, MAX(max_level) AS l
       FROM structure_minutes WHERE structure_id = @structure AND minute_ms >= @from AND minute_ms < @to GROUP BY b ORDER BY b`,
    );
  }

  windSeries(sensorId: number, fromMs: number, toMs: number, maxPoints: number): WindSeries {
    const width = bucketWidthMs(fromMs, toMs, maxPoints);
    const fromMinutes = width >= minuteMs;
    // Rollups are per whole minute: widen the start to the minute so the first bucket is complete.
    const from = fromMinutes ? fromMs - (fromMs % minuteMs) : fromMs;
    const rows = (fromMinutes ? this.windFromMinutes : this.windFromReadings).all({ sensor: sensorId, from, to: toMs, width }) as Array<{
      b: number;
      n: number;
      s: number;
      g: number;
      ds: number;
      dc: number;
      dn: number;
    }>;
    const out: WindSeries = { bucketMs: width, source: fromMinutes ? 'minutes' : 'readings', tMs: [], meanMps: [], gustMps: [], dirDeg: [], samples: [] };
    for (const r of rows) {
      out.tMs.push(from + r.b * width);
      out.meanMps.push(r.n > 0 ? r.s / r.n / 100 : null);
      out.gustMps.push(r.g === null ? null : r.g / 100);
      out.dirDeg.push(r.dn > 0 ? unitVectorMeanDegFromSums(r.ds, r.dc, r.dn) : null);
      out.samples.push(r.n);
    }
    return out;
  }

  structureSeries(structureId: number, fromMs: number, toMs: number, maxPoints: number): StructureSeries {
    const width = Math.max(minuteMs, bucketWidthMs(fromMs, toMs, maxPoints));
    const from = fromMs - (fromMs % minuteMs);
    const rows = this.structureFromMinutes.all({ structure: structureId, from, to: toMs, width }) as Array<{ b: number; g: number; u: number; l: number }>;
    const out: StructureSeries = { bucketMs: width, tMs: [], gustMps: [], utilization: [], level: [] };
    for (const r of rows) {
      out.tMs.push(from + r.b * width);
      out.gustMps.push(r.g / 100);
      out.utilization.push(r.u >= utilizationE4Unbounded ? null : r.u / 10_000);
      out.level.push(r.l);
    }
    return out;
  }

  /** The naive way, for the benchmark: every raw reading in the window, downsampled in JavaScript. */
  windSeriesByFullScan(sensorId: number, fromMs: number, toMs: number, maxPoints: number): WindSeries {
    const width = bucketWidthMs(fromMs, toMs, maxPoints);
    const rows = this.sqlite.prepare('SELECT ts_ms AS t, speed_cmps AS s, gust_cmps AS g FROM readings WHERE sensor_id = ? ORDER BY ts_ms').all(sensorId) as Array<{ t: number; s: number; g: number | null }>;
    const out: WindSeries = { bucketMs: width, source: 'readings', tMs: [], meanMps: [], gustMps: [], dirDeg: [], samples: [] };
    let bucket = -1;
    let n = 0;
    let sum = 0;
    let max = 0;
    const flush = (): void => {
      if (bucket < 0) return;
      out.tMs.push(fromMs + bucket * width);
      out.meanMps.push(sum / n / 100);
      out.gustMps.push(max / 100);
      out.dirDeg.push(null);
      out.samples.push(n);
    };
    for (const r of rows) {
      if (r.t < fromMs || r.t >= toMs) continue;
      const b = Math.floor((r.t - fromMs) / width);
      if (b !== bucket) {
        flush();
        bucket = b;
        n = 0;
        sum = 0;
        max = 0;
      }
      n++;
      sum += r.s;
      max = Math.max(max, r.g ?? r.s);
    }
    flush();
    return out;
  }
}
