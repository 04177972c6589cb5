/**
 * Group commit. Every caller enqueues a `WriteBatch` and gets a promise that settles when the
 * batch is committed; all batches enqueued in the same turn of the event loop are written in
 * one SQLite transaction. Ingest acknowledges a QoS 1 message to the broker only after its
 * promise resolves, so nothing the broker handed over is lost in a crash (design.md 5).
 *
 * When the database cannot write (disk full, read-only folder), the failed batches are kept in
 * memory (the backlog, bounded) and written first by the next commit that succeeds, retried every
 * few seconds; `enqueue` then resolves with `stored: false` ("held"). The broker is acknowledged
 * for held readings too: a gateway whose messages went unacknowledged would be disconnected and
 * would replay its queue from the oldest message, and the newest gusts — the ones that matter —
 * would reach the watch late or never. Live alerting comes first; the price is that a crash while
 * the disk is full loses what was held (the README says so).
 *
 * Per-minute wind rollups: each sensor's newest minute is summed in memory and written when the
 * sensor moves on to the next minute (in the same transaction as that minute's first reading),
 * and what it gathered so far by `writeOpenMinutes` (the server's 1 Hz tick, and at shutdown):
 * an upsert per sensor per second instead of one per commit, which cost about a third of the
 * commit (`npm run bench`). Readings for older minutes (out of order, late) are upserted at once.
 * After a crash, `rebuildNewestMinutes` recomputes each sensor's newest minute from its raw
 * readings, so the log never misses what the memory held.
 *
 * The server runs it in-thread, on the main connection (runtime.ts says why). With
 * `commitThread: true` (commitThread.ts) the same class runs on a worker's connection and this
 * instance forwards to it.
 *
 * Raw prepared statements, not the query builder: this is the per-message path. About 500 lines:
 * the statements, the transaction, the rollups and the backlog are one commit path, in one file
 * so the worker and the in-thread queue cannot differ.
 */
import type Database from 'better-sqlite3';
import type { AcknowledgementRow, AlertRow, ConfigurationChangeRow, LevelChangeRow, ReadingRow, StructureMinuteRow, WriteBatch } from './writeBatch.ts';
import { sensorsWithReadings } from './retention.ts';
import { batchRowCount } from './writeBatch.ts';
import { finiteOrNull, toCmps, toDeciC, toUtilizationE4, toWholeDeg } from './storedUnits.ts';
import { recountDelta, storedWindMinuteSql, upsertWindMinuteSql, type MinuteSums } from './windMinutes.ts';
import { CommitThread } from './commitThread.ts';

/**
 * Rows kept in memory while the database cannot write; beyond this the oldest readings go first
 * (alerts, level changes and acknowledgements are never dropped). 200 000 rows is about 40 MB:
 * 18 hours of three sensors at 1 Hz, half an hour of a hundred.
 */
export const maxBacklogRows = 200_000;
const retryIntervalMs = 5_000;
/** A group this large is committed at once. */
const maxGroupBatches = 500;

/** Stored utilization is in ten-thousandths; "no resistance left" is stored as this sentinel (storedUnits.ts). */
export { utilizationE4Unbounded } from './storedUnits.ts';

interface Pending {
  batch: WriteBatch;
  resolve: (outcome: WriteOutcome) => void;
}

/** stored: committed now; false: held in memory for retry (the database could not write). */
export interface WriteOutcome {
  stored: boolean;
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

/** Rollups a commit touches: each sensor's open minute (copies), and older minutes to upsert. */
interface MinuteWork {
  open: Map<number, MinuteAggregate>;
  older: Map<string, MinuteAggregate>;
}

function emptyMinute(sensorId: number, minuteMs: number): MinuteAggregate {
  return { sensorId, minuteMs, count: 0, speedSumCmps: 0, maxGustCmps: 0, dirSin: 0, dirCos: 0, dirCount: 0 };
}

const minuteMs = 60_000;

export interface WriteQueueStats {
  /** Rows waiting in memory for the database to accept writes again. */
  backlogRows: number;
  /** Reading rows dropped from a full backlog (lost: counted so health can say so). */
  droppedBacklogReadings: number;
  committedBatches: number;
  committedReadings: number;
  duplicateReadings: number;
  failedCommits: number;
  lastError: string | null;
  lastErrorAtMs: number | null;
  /** When writes succeeded again after the last failure; null while failing or before any failure. */
  recoveredAtMs: number | null;
  lastCommitAtMs: number | null;
}

/**
 * What in-thread commits wait for: a caller's transaction open on the same connection
 * (storage/transactions.ts). Without it a commit would join that transaction, and be rolled back
 * with it after its batches were acknowledged.
 */
export interface CommitGate {
  readonly idle: boolean;
  /** Runs `commit` now when idle, else as soon as the open transaction ends. */
  whenIdle(commit: () => void): void;
}

export class WriteQueue {
  private pending: Pending[] = [];
  /** Per sensor: its newest minute, and what that minute gathered since it was last written. */
  private openMinutes = new Map<number, MinuteAggregate>();
  private backlog: WriteBatch[] = [];
  private retryTimer: NodeJS.Timeout | null = null;
  private scheduled = false;
  readonly stats: WriteQueueStats = {
    backlogRows: 0,
    droppedBacklogReadings: 0,
    committedBatches: 0,
    committedReadings: 0,
    duplicateReadings: 0,
    failedCommits: 0,
    lastError: null,
    lastErrorAtMs: null,
    recoveredAtMs: null,
    lastCommitAtMs: null,
  };

  private readonly insertReading: Database.Statement;
  private readonly upsertWindMinute: Database.Statement;
  private readonly upsertStructureMinute: Database.Statement;
  private readonly insertLevelChange: Database.Statement;
  private readonly insertAlert: Database.Statement;
  private readonly insertConfigurationChange: Database.Statement;
  private readonly insertConfigurationAudit: Database.Statement;
  private readonly markActionDone: Database.Statement;
  private readonly markOverdue: Database.Statement;
  private readonly clearAlert: Database.Statement;
  private readonly acknowledgeAlert: Database.Statement;
  private readonly insertAudit: Database.Statement;
  private readonly commit: (batches: WriteBatch[]) => Map<number, MinuteAggregate>;
  private readonly commitMinutes: (aggregates: MinuteAggregate[]) => void;
  /** Set with `commitThread`: every call goes to the commit thread (commitThread.ts). */
  private readonly thread: CommitThread | null = null;
  private readonly gate: CommitGate | null;

  /**
   * @param groupWindowMs how long the first batch of a group waits for company before the commit.
   *   A commit writes a WAL page per sensor touched, so 100 readings in one commit cost about a
   *   fifth of 100 commits (`npm run bench`). The server uses 0 (next turn) with either broker:
   *   both hand over every message of one socket read in the same turn, and a broker that reads
   *   a connection's next packets only after acknowledging its last read waits out the window on
   *   every round (runtime.ts).
   * @param newestMinutes each sensor's newest stored minute, from `rebuildNewestMinutes` at start:
   *   a sensor's first reading after a restart that is older than that minute (a replayed, late
   *   one) is then upserted at once rather than held as the sensor's open minute.
   * @param options.commitThread commit on a worker thread with its own connection to the same
   *   file (commitThread.ts): the same guarantee, off the event loop. `flush` then only sends,
   *   `writeOpenMinutes` and `settle` resolve once the worker has written, and `groupWindowMs`
   *   is not used (groups gather while the previous one commits).
   * @param options.gate in-thread commits wait while it is not idle (storage.ts gives its transactions).
   */
  constructor(
    sqlite: Database.Database,
    private readonly now: () => number = Date.now,
    private readonly groupWindowMs = 0,
    newestMinutes: ReadonlyMap<number, number> = new Map(),
    options: { commitThread?: boolean; gate?: CommitGate } = {},
  ) {
    this.gate = options.gate ?? null;
    if (options.commitThread) {
      if (sqlite.memory) throw new Error('a commit thread needs a database file, not :memory:');
      // Checkpoints (copying the WAL into the file, with an fsync) are the commit thread's: one
      // started by a rare write on the main connection would block the event loop.
      sqlite.pragma('wal_autocheckpoint = 0');
      this.thread = new CommitThread({ file: sqlite.name, now, newestMinutes, rebuildNewestMinutes: () => rebuildNewestMinutes(sqlite), stats: this.stats });
    }
    for (const [sensorId, minute] of newestMinutes) this.openMinutes.set(sensorId, emptyMinute(sensorId, minute));
    this.insertReading = sqlite.prepare(
      `INSERT OR IGNORE INTO readings (sensor_id, ts_ms, speed_cmps, gust_cmps, dir_deg, temp_deci_c, pressure_pa, rh_pct, flags)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    // The one upsert of a minute rollup, additive (windMinutes.ts says why).
    this.upsertWindMinute = sqlite.prepare(upsertWindMinuteSql);
    this.upsertStructureMinute = sqlite.prepare(
      `INSERT INTO structure_minutes (structure_id, minute_ms, max_gust_cmps, max_utilization_e4, max_level)
       VALUES (?, ?, ?, ?, ?)
       ON CONFLICT (structure_id, minute_ms) DO UPDATE SET
         max_gust_cmps = max(max_gust_cmps, excluded.max_gust_cmps),
         max_utilization_e4 = max(max_utilization_e4, excluded.max_utilization_e4),
         max_level = max(max_level, excluded.max_level)`,
    );
    this.insertLevelChange = sqlite.prepare(
      `INSERT INTO level_changes (structure_id, at_ms, from_level, to_level, gust_mps, utilization, no_data, estimate_level, estimate_chance_10, estimate_chance_30) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    this.insertAlert = sqlite.prepare(
      `INSERT OR IGNORE INTO alerts (id, site_id, kind, structure_id, sensor_id, level, label, action_text, raised_at_ms, gust_mps, utilization, move_to_configuration)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    this.clearAlert = sqlite.prepare(`UPDATE alerts SET cleared_at_ms = ? WHERE id = ? AND cleared_at_ms IS NULL`);
    this.acknowledgeAlert = sqlite.prepare(
      `UPDATE alerts SET acknowledged_at_ms = ?, acknowledged_by = ?, acknowledge_note = ? WHERE id = ? AND acknowledged_at_ms IS NULL`,
    );
    this.insertConfigurationChange = sqlite.prepare(
      `INSERT INTO configuration_changes (structure_id, at_ms, from_name, to_name, by, note, alert_id, reason) VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    this.insertConfigurationAudit = sqlite.prepare(`INSERT INTO audit (at_ms, actor, entity, entity_id, action, before_json, after_json) VALUES (?, ?, 'structure', ?, 'configuration', ?, ?)`);
    this.markActionDone = sqlite.prepare(`UPDATE alerts SET action_done_at_ms = ?, action_done_by = ? WHERE id = ? AND action_done_at_ms IS NULL`);
    this.markOverdue = sqlite.prepare(`UPDATE alerts SET overdue_at_ms = ? WHERE id = ? AND overdue_at_ms IS NULL`);
    this.insertAudit = sqlite.prepare(`INSERT INTO audit (at_ms, actor, entity, entity_id, action, before_json, after_json) VALUES (?, ?, 'alert', ?, 'acknowledge', NULL, ?)`);
    this.commit = sqlite.transaction((batches: WriteBatch[]) => {
      // Open minutes are changed on copies, adopted only once the transaction commits: a
      // rolled-back commit is retried from the backlog and must not be counted twice.
      const minutes: MinuteWork = { older: new Map(), open: new Map() };
      for (const batch of batches) {
        for (const row of batch.readings) this.writeReading(row, minutes);
        for (const row of batch.structureMinutes) this.writeStructureMinute(row);
        for (const row of batch.levelChanges) this.writeLevelChange(row);
        for (const row of batch.alerts) this.writeAlert(row);
        for (const cleared of batch.clearedAlerts) this.clearAlert.run(cleared.atMs, cleared.id);
        for (const ack of batch.acknowledgements) this.writeAcknowledgement(ack);
        for (const change of batch.configurationChanges) this.writeConfigurationChange(change);
        for (const done of batch.actionsDone) this.markActionDone.run(done.atMs, done.by, done.alertId);
        for (const late of batch.overdue) this.markOverdue.run(late.atMs, late.alertId);
      }
      for (const m of minutes.older.values()) this.writeMinute(m);
      return minutes.open;
    });
    this.commitMinutes = sqlite.transaction((aggregates: MinuteAggregate[]) => {
      for (const m of aggregates) this.writeMinute(m);
    });
  }

  /** Resolves when the batch is committed (`stored: true`) or held for retry (`stored: false`). */
  enqueue(batch: WriteBatch): Promise<WriteOutcome> {
    if (this.thread) return this.thread.enqueue(batch);
    return new Promise<WriteOutcome>((resolve) => {
      this.pending.push({ batch, resolve });
      if (this.pending.length >= maxGroupBatches) {
        this.flush();
      } else if (!this.scheduled) {
        this.scheduled = true;
        if (this.groupWindowMs > 0) setTimeout(() => this.flush(), this.groupWindowMs);
        else setImmediate(() => this.flush());
      }
    });
  }

  /** Commits the backlog and everything pending now (also used at shutdown). */
  flush(): void {
    if (this.thread) return this.thread.flush();
    if (this.gate && !this.gate.idle) return this.gate.whenIdle(() => this.flush());
    this.scheduled = false;
    const pending = this.pending;
    if (pending.length === 0 && this.backlog.length === 0) return;
    this.pending = [];
    const batches = [...this.backlog, ...pending.map((p) => p.batch)];
    let opened: Map<number, MinuteAggregate>;
    try {
      opened = this.commit(batches);
    } catch (err) {
      this.stats.failedCommits++;
      this.stats.lastError = err instanceof Error ? err.message : String(err);
      this.stats.lastErrorAtMs = this.now();
      this.stats.recoveredAtMs = null;
      this.keepForRetry(batches);
      for (const p of pending) p.resolve({ stored: false });
      return;
    }
    for (const [sensorId, agg] of opened) this.openMinutes.set(sensorId, agg);
    if (this.backlog.length > 0 || (this.stats.lastErrorAtMs !== null && this.stats.recoveredAtMs === null)) this.stats.recoveredAtMs = this.now();
    this.backlog = [];
    this.stats.backlogRows = 0;
    if (this.retryTimer) clearInterval(this.retryTimer);
    this.retryTimer = null;
    this.stats.committedBatches += pending.length;
    this.stats.lastCommitAtMs = this.now();
    for (const p of pending) p.resolve({ stored: true });
  }

  /**
   * Writes what each sensor's newest minute gathered since it was last written (the 1 Hz tick;
   * shutdown). Nothing is lost when the database cannot write: the sums stay in memory and go
   * with the next call that succeeds. In-thread, done when the call returns (when a transaction is open, once it ends).
   */
  writeOpenMinutes(): Promise<void> {
    if (this.thread) return this.thread.writeOpenMinutes();
    return this.whenIdle(() => this.writeOpenMinutesNow());
  }

  private writeOpenMinutesNow(): void {
    const dirty = [...this.openMinutes.values()].filter((m) => m.count > 0);
    if (dirty.length === 0) return;
    try {
      this.commitMinutes(dirty);
    } catch (err) {
      this.stats.lastError = err instanceof Error ? err.message : String(err);
      this.stats.lastErrorAtMs = this.now();
      this.stats.recoveredAtMs = null;
      return;
    }
    for (const m of dirty) this.openMinutes.set(m.sensorId, emptyMinute(m.sensorId, m.minuteMs));
  }

  /**
   * Commits everything pending and the open minutes: shutdown, and tools that read right after
   * writing. In-thread, done when the call returns (when a transaction is open, once it ends).
   */
  settle(): Promise<void> {
    if (this.thread) return this.thread.settle();
    return this.whenIdle(() => {
      this.flush();
      this.writeOpenMinutesNow();
    });
  }

  /** Runs `commit` now, or (with a gate not idle) once the open transaction has ended. */
  private whenIdle(commit: () => void): Promise<void> {
    const gate = this.gate;
    if (!gate || gate.idle) {
      commit();
      return Promise.resolve();
    }
    return new Promise((resolve) =>
      gate.whenIdle(() => {
        commit();
        resolve();
      }),
    );
  }

  /** True while the last commit failed or rows wait in the backlog. */
  get failing(): boolean {
    if (this.thread) return this.thread.failing;
    return this.backlog.length > 0;
  }

  private keepForRetry(batches: WriteBatch[]): void {
    this.backlog = batches;
    let rows = batches.reduce((n, b) => n + batchRowCount(b), 0);
    // Over the bound, drop the oldest readings first: the live state already took them; alerts,
    // level changes and acknowledgements are what the log must not lose.
    for (const b of this.backlog) {
      if (rows <= maxBacklogRows) break;
      const drop = Math.min(b.readings.length, rows - maxBacklogRows);
      b.readings.splice(0, drop);
      rows -= drop;
      this.stats.droppedBacklogReadings += drop;
    }
    this.stats.backlogRows = rows;
    if (!this.retryTimer) {
      this.retryTimer = setInterval(() => this.flush(), retryIntervalMs);
      this.retryTimer.unref();
    }
  }

  /** Stops the retry timer (shutdown); ends the commit thread (after `settle`). */
  stop(): void {
    this.thread?.stop();
    if (this.retryTimer) clearInterval(this.retryTimer);
    this.retryTimer = null;
  }

  private writeReading(row: ReadingRow, minutes: MinuteWork): void {
    const speedCmps = toCmps(row.speedMps);
    const result = this.insertReading.run(
      row.sensorId,
      row.tsMs,
      speedCmps,
      row.gustMps === null ? null : toCmps(row.gustMps),
      row.dirDeg === null ? null : toWholeDeg(row.dirDeg),
      row.tempC === null ? null : toDeciC(row.tempC),
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
    let open = minutes.open.get(row.sensorId);
    if (!open) {
      const current = this.openMinutes.get(row.sensorId);
      open = current ? { ...current } : emptyMinute(row.sensorId, minute);
    }
    let agg: MinuteAggregate;
    if (minute === open.minuteMs) {
      agg = open;
    } else if (minute > open.minuteMs) {
      // The sensor moved on: its finished minute is written with this reading.
      if (open.count > 0) this.writeMinute(open);
      open = emptyMinute(row.sensorId, minute);
      agg = open;
    } else {
      // An older minute (out of order, or late): upserted with this commit.
      const key = `${row.sensorId}:${minute}`;
      agg = minutes.older.get(key) ?? emptyMinute(row.sensorId, minute);
      minutes.older.set(key, agg);
    }
    minutes.open.set(row.sensorId, open);
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

  private writeMinute(m: MinuteAggregate): void {
    this.upsertWindMinute.run(m.sensorId, m.minuteMs, m.count, m.speedSumCmps, m.maxGustCmps, m.dirSin, m.dirCos, m.dirCount);
  }

  private writeStructureMinute(row: StructureMinuteRow): void {
    this.upsertStructureMinute.run(row.structureId, row.minuteMs, toCmps(row.gustMps), toUtilizationE4(row.utilization), row.level);
  }

  private writeLevelChange(row: LevelChangeRow): void {
    const e = row.estimate ?? null;
    this.insertLevelChange.run(row.structureId, row.atMs, row.fromLevel, row.toLevel, row.gustMps, finiteOrNull(row.utilization), row.noData ? 1 : 0, e?.level ?? null, e ? finiteOrNull(e.chance10) : null, e ? finiteOrNull(e.chance30) : null);
  }

  private writeAcknowledgement(ack: AcknowledgementRow): void {
    const result = this.acknowledgeAlert.run(ack.atMs, ack.by, ack.note, ack.alertId);
    if (result.changes > 0) this.insertAudit.run(ack.atMs, ack.actor, String(ack.alertId), JSON.stringify({ by: ack.by, note: ack.note }));
  }

  private writeAlert(row: AlertRow): void {
    this.insertAlert.run(
      row.id,
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
      row.moveToConfiguration,
    );
  }

  private writeConfigurationChange(row: ConfigurationChangeRow): void {
    this.insertConfigurationChange.run(row.structureId, row.atMs, row.fromName, row.toName, row.by, row.note, row.alertId, row.reason);
    this.insertConfigurationAudit.run(row.atMs, row.actor, String(row.structureId), JSON.stringify({ configuration: row.fromName }), JSON.stringify({ configuration: row.toName, by: row.by, note: row.note, alertId: row.alertId, reason: row.reason }));
  }
}

/**
 * After a start (a crash may have lost what memory held of each sensor's newest minute), each
 * sensor's newest minute is recomputed from its raw readings: count, speed sum and direction sums
 * (from the stored whole degrees); the highest gust as the larger of the stored one and the
 * highest raw speed or gust in the minute (the live 3-s gust is not stored per reading; at worst
 * this errs high). A minute whose raw readings are fewer than its stored count (retention deleted
 * part of it) keeps its stored sums. Walks the sensors along the primary key: a seek per sensor,
 * not a scan. Returns each sensor's newest minute, for the write queue to start from.
 */
export function rebuildNewestMinutes(sqlite: Database.Database): Map<number, number> {
  const newest = sqlite.prepare('SELECT MAX(ts_ms) AS ts FROM readings WHERE sensor_id = ?');
  const rows = sqlite.prepare('SELECT speed_cmps AS speed, gust_cmps AS gust, dir_deg AS dir FROM readings WHERE sensor_id = ? AND ts_ms >= ? AND ts_ms < ?');
  // The same additive upsert as the live path: the recount adds what the stored row lacks (windMinutes.ts).
  const write = sqlite.prepare(upsertWindMinuteSql);
  const stored = sqlite.prepare(storedWindMinuteSql);
  const newestBySensor = new Map<number, number>();
  // IMMEDIATE: it reads before it writes, and after a commit thread died a new one may be writing.
  sqlite.transaction(() => {
    for (const sensorId of sensorsWithReadings(sqlite)) {
      const ts = (newest.get(sensorId) as { ts: number }).ts;
      const minute = ts - (ts % minuteMs);
      const agg = emptyMinute(sensorId, minute);
      for (const r of rows.iterate(sensorId, minute, minute + minuteMs) as Iterable<{ speed: number; gust: number | null; dir: number | null }>) {
        agg.count++;
        agg.speedSumCmps += r.speed;
        agg.maxGustCmps = Math.max(agg.maxGustCmps, r.speed, r.gust ?? 0);
        if (r.dir !== null) {
          const rad = (r.dir * Math.PI) / 180;
          agg.dirSin += Math.sin(rad);
          agg.dirCos += Math.cos(rad);
          agg.dirCount++;
        }
      }
      const d = recountDelta(stored.get(sensorId, minute) as MinuteSums | undefined, agg);
      if (d) write.run(agg.sensorId, agg.minuteMs, d.count, d.speedSumCmps, d.maxGustCmps, d.dirSin, d.dirCos, d.dirCount);
      newestBySensor.set(sensorId, minute);
    }
  }).immediate();
  return newestBySensor;
}
