/** Rejected payloads counted per sensor key and reason (ingest/rejections.ts keeps the counts in memory and flushes them here). */
import type { Db } from './database.ts';

export interface RejectionCount {
  sensorKey: string;
  reason: string;
  count: number;
  firstAtMs: number;
  lastAtMs: number;
  lastDetail: string;
}

export class RejectionStore {
  private upsert: ReturnType<Db['$client']['prepare']> | null = null;

  constructor(private readonly db: Db) {}

  all(): RejectionCount[] {
    return this.db.$client
      .prepare('SELECT sensor_key AS sensorKey, reason, count, first_at_ms AS firstAtMs, last_at_ms AS lastAtMs, last_detail AS lastDetail FROM rejections')
      .all() as RejectionCount[];
  }

  /** Writes these counts (each replaces the stored count of its key and reason) in one transaction. */
  save(entries: readonly RejectionCount[]): void {
    const upsert = (this.upsert ??= this.db.$client.prepare(
      `INSERT INTO rejections (sensor_key, reason, count, first_at_ms, last_at_ms, last_detail) VALUES (?, ?, ?, ?, ?, ?)
       ON CONFLICT (sensor_key, reason) DO UPDATE SET count = excluded.count, last_at_ms = excluded.last_at_ms, last_detail = excluded.last_detail`,
    ));
    this.db.$client.transaction(() => {
      for (const e of entries) upsert.run(e.sensorKey, e.reason, e.count, e.firstAtMs, e.lastAtMs, e.lastDetail);
    })();
  }
}
