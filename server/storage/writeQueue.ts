/**
 * Group commit. Every caller enqueues a `WriteBatch` and gets a promise that settles when the
 * batch is committed; all batches enqueued in the same turn of the event loop are written in
 * one SQLite transaction. Ingest acknowledges a QoS 1 message to the broker only after its
 * promise resolves, so nothing the broker handed over is lost in a crash (design.md 5).
 *
 * Raw prepared statements, not the query builder: this is the per-message path.
 */
import type Database from 'better-sqlite3';
import type { AlertRow, LevelChangeRow, ReadingRow, StructureMinuteRow, WriteBatch } from './writeBatch.ts';

/** Stored utilization is in ten-thousandths; "no resistance left" is stored as this sentinel. */
export const utilizationE4Unbounded = 2_000_000_000;

interface Pending {
  batch: WriteBatch;
  resolve: () => void;
  reject: (err: unknown) => void;
}

interface MinuteAggregate {
  sensorId: number;
  minuteMs: number;
  count: number;
  speedSumCmps: number;
  maxGustCmps: number;
  dirSin: number;
  dirCos: number;
  dirCount: number;
}

const minuteMs = 60_000;
const toCmps = (speedMps: number): number => Math.round(speedMps * 100);

export interface WriteQueueStats {
  committedBatches: number;
  committedReadings: number;
  duplicateReadings: number;
  failedCommits: number;
  lastError: string | null;
  lastErrorAtMs: number | null;
  lastCommitAtMs: number | null;
}

export class WriteQueue {
  private pending: Pending[] = [];
  private scheduled = false;
  readonly stats: WriteQueueStats = {
    committedBatches: 0,
    committedReadings: 0,
    duplicateReadings: 0,
    failedCommits: 0,
    lastError: null,
    lastErrorAtMs: null,
    lastCommitAtMs: null,
  };

  private readonly insertReading: Database.Statement;
  private readonly upsertWindMinute: Database.Statement;
  private readonly upsertStructureMinute: Database.Statement;
  private readonly insertLevelChange: Database.Statement;
  private readonly insertAlert: Database.Statement;
  private readonly clearAlert: Database.Statement;
  private readonly commit: (batches: Pending[]) => void;

  constructor(
    private readonly sqlite: Database.Database,
    private readonly now: () => number = Date.now,
  ) {
    this.insertReading = sqlite.prepare(
      `INSERT OR IGNORE INTO readings (sensor_id, ts_ms, speed_cmps, gust_cmps, dir_deg, temp_deci_c, pressure_pa, rh_pct, flags)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    this.upsertWindMinute = sqlite.prepare(
      `INSERT INTO wind_minutes (sensor_id, minute_ms, sample_count, speed_sum_cmps, max_gust_cmps, dir_sin_sum, dir_cos_sum, dir_count)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?)
       ON CONFLICT (sensor_id, minute_ms) DO UPDATE SET
         sample_count = sample_count + excluded.sample_count,
         speed_sum_cmps = speed_sum_cmps + excluded.speed_sum_cmps,
         max_gust_cmps = max(max_gust_cmps, excluded.max_gust_cmps),
         dir_sin_sum = dir_sin_sum + excluded.dir_sin_sum,
         dir_cos_sum = dir_cos_sum + excluded.dir_cos_sum,
         dir_count = dir_count + excluded.dir_count`,
    );
    this.upsertStructureMinute = sqlite.prepare(
      `INSERT INTO structure_minutes (structure_id, minute_ms, max_gust_cmps, max_utilization_e4, max_level)
       VALUES (?, ?, ?, ?, ?)
       ON CONFLICT (structure_id, minute_ms) DO UPDATE SET
         max_gust_cmps = max(max_gust_cmps, excluded.max_gust_cmps),
         max_utilization_e4 = max(max_utilization_e4, excluded.max_utilization_e4),
         max_level = max(max_level, excluded.max_level)`,
    );
    this.insertLevelChange = sqlite.prepare(
      `INSERT INTO level_changes (structure_id, at_ms, from_level, to_level, gust_mps, utilization, no_data) VALUES (?, ?, ?, ?, ?, ?, ?)`,
    );
    this.insertAlert = sqlite.prepare(
      `INSERT INTO alerts (site_id, kind, structure_id, sensor_id, level, label, action_text, raised_at_ms, gust_mps, utilization)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    this.clearAlert = sqlite.prepare(`UPDATE alerts SET cleared_at_ms = ? WHERE id = ? AND cleared_at_ms IS NULL`);
    this.commit = sqlite.transaction((batches: Pending[]) => {
      const minutes = new Map<string, MinuteAggregate>();
      for (const { batch } of batches) {
        for (const row of batch.readings) this.writeReading(row, minutes);
        for (const row of batch.structureMinutes) this.writeStructureMinute(row);
        for (const row of batch.levelChanges) this.writeLevelChange(row);
        if (batch.alerts.length > 0) {
          const ids = batch.alerts.map((row) => this.writeAlert(row));
          batch.onAlertIds?.(ids);
        }
        for (const cleared of batch.clearedAlerts) this.clearAlert.run(cleared.atMs, cleared.id);
      }
      for (const m of minutes.values()) {
        this.upsertWindMinute.run(m.sensorId, m.minuteMs, m.count, m.speedSumCmps, m.maxGustCmps, m.dirSin, m.dirCos, m.dirCount);
      }
    });
  }

  /** Settles when the batch is committed (resolve) or the transaction failed (reject). */
  enqueue(batch: WriteBatch): Promise<void> {
    return new Promise<void>((resolve, reject) => {
      this.pending.push({ batch, resolve, reject });
      if (!this.scheduled) {
        this.scheduled = true;
        setImmediate(() => this.flush());
      }
    });
  }

  /** Commits everything pending now (also used at shutdown). */
  flush(): void {
    this.scheduled = false;
    const batches = this.pending;
    if (batches.length === 0) return;
    this.pending = [];
    try {
      this.commit(batches);
    } catch (err) {
      this.stats.failedCommits++;
      this.stats.lastError = err instanceof Error ? err.message : String(err);
      this.stats.lastErrorAtMs = this.now();
      for (const p of batches) p.reject(err);
      return;
    }
    this.stats.committedBatches += batches.length;
    this.stats.lastCommitAtMs = this.now();
    for (const p of batches) p.resolve();
  }

  private writeReading(row: ReadingRow, minutes: Map<string, MinuteAggregate>): void {
    const speedCmps = toCmps(row.speedMps);
    const result = this.insertReading.run(
      row.sensorId,
      row.tsMs,
      speedCmps,
      row.gustMps === null ? null : toCmps(row.gustMps),
      row.dirDeg === null ? null : Math.round(row.dirDeg) % 360,
      row.tempC === null ? null : Math.round(row.tempC * 10),
      row.pressurePa === null ? null : Math.round(row.pressurePa),
      row.rhPct === null ? null : Math.round(row.rhPct),
      row.late ? 1 : 0,
    );
    if (result.changes === 0) {
      // Same sensor and timestamp already stored: a redelivery. Counted, not added again.
      this.stats.duplicateReadings++;
      return;
    }
    this.stats.committedReadings++;
    const minute = row.tsMs - (row.tsMs % minuteMs);
    const key = `${row.sensorId}:${minute}`;
    let agg = minutes.get(key);
    if (!agg) {
      agg = { sensorId: row.sensorId, minuteMs: minute, count: 0, speedSumCmps: 0, maxGustCmps: 0, dirSin: 0, dirCos: 0, dirCount: 0 };
      minutes.set(key, agg);
    }
    agg.count++;
    agg.speedSumCmps += speedCmps;
    agg.maxGustCmps = Math.max(agg.maxGustCmps, toCmps(row.rollupGustMps), speedCmps);
    if (row.dirDeg !== null) {
      const rad = (row.dirDeg * Math.PI) / 180;
      agg.dirSin += Math.sin(rad);
      agg.dirCos += Math.cos(rad);
      agg.dirCount++;
    }
  }

  private writeStructureMinute(row: StructureMinuteRow): void {
    const utilE4 = Number.isFinite(row.utilization) ? Math.min(utilizationE4Unbounded, Math.round(row.utilization * 10_000)) : utilizationE4Unbounded;
    this.upsertStructureMinute.run(row.structureId, row.minuteMs, toCmps(row.gustMps), utilE4, row.level);
  }

  private writeLevelChange(row: LevelChangeRow): void {
    this.insertLevelChange.run(row.structureId, row.atMs, row.fromLevel, row.toLevel, row.gustMps, finiteOrNull(row.utilization), row.noData ? 1 : 0);
  }

  private writeAlert(row: AlertRow): number {
    const result = this.insertAlert.run(
      row.siteId,
      row.kind,
      row.structureId,
      row.sensorId,
      row.level,
      row.label,
      row.actionText,
      row.raisedAtMs,
      row.gustMps,
      finiteOrNull(row.utilization),
    );
    return Number(result.lastInsertRowid);
  }
}

function finiteOrNull(value: number | null): number | null {
  return value !== null && Number.isFinite(value) ? value : null;
}
