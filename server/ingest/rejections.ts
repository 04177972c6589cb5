/**
 * Rejected payloads: counted per sensor key and reason (kept in the database, visible through the
 * API), logged at most once per interval per sensor and reason, never stored as readings.
 * Counts are flushed to the database in the background so a flood of garbage costs one write a
 * second, not one per message.
 */
import type Database from 'better-sqlite3';
import type { Logger } from '../log.ts';

export interface RejectionCount {
  sensorKey: string;
  reason: string;
  count: number;
  firstAtMs: number;
  lastAtMs: number;
  lastDetail: string;
}

/** How often the same sensor and reason may reach the log. */
export const rejectionLogIntervalMs = 60_000;
const flushIntervalMs = 1_000;
const maxDetailLength = 300;

export class RejectionLog {
  private readonly counts = new Map<string, RejectionCount>();
  private readonly dirty = new Set<string>();
  private readonly lastLoggedAtMs = new Map<string, number>();
  private readonly upsert: Database.Statement;
  private timer: NodeJS.Timeout | null = null;
  private total = 0;

  constructor(
    private readonly sqlite: Database.Database,
    private readonly log: Logger,
    private readonly now: () => number = Date.now,
  ) {
    for (const row of sqlite
      .prepare('SELECT sensor_key AS sensorKey, reason, count, first_at_ms AS firstAtMs, last_at_ms AS lastAtMs, last_detail AS lastDetail FROM rejections')
      .all() as RejectionCount[]) {
      this.counts.set(`${row.sensorKey}\u0000${row.reason}`, row);
      this.total += row.count;
    }
    this.upsert = sqlite.prepare(
      `INSERT INTO rejections (sensor_key, reason, count, first_at_ms, last_at_ms, last_detail) VALUES (?, ?, ?, ?, ?, ?)
       ON CONFLICT (sensor_key, reason) DO UPDATE SET count = excluded.count, last_at_ms = excluded.last_at_ms, last_detail = excluded.last_detail`,
    );
  }

  record(sensorKey: string, reason: string, detail: string): void {
    const atMs = this.now();
    const key = `${sensorKey}\u0000${reason}`;
    const shortDetail = detail.length > maxDetailLength ? detail.slice(0, maxDetailLength) + '…' : detail;
    let entry = this.counts.get(key);
    if (!entry) {
      entry = { sensorKey, reason, count: 0, firstAtMs: atMs, lastAtMs: atMs, lastDetail: shortDetail };
      this.counts.set(key, entry);
    }
    entry.count++;
    entry.lastAtMs = atMs;
    entry.lastDetail = shortDetail;
    this.total++;
    this.dirty.add(key);
    const last = this.lastLoggedAtMs.get(key);
    if (last === undefined || atMs - last >= rejectionLogIntervalMs) {
      this.lastLoggedAtMs.set(key, atMs);
      this.log.warn({ sensorKey, reason, detail: shortDetail, countSoFar: entry.count }, 'payload rejected');
    }
    if (!this.timer) {
      this.timer = setTimeout(() => this.flush(), flushIntervalMs);
      this.timer.unref();
    }
  }

  /** Writes changed counts to the database. */
  flush(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (this.dirty.size === 0) return;
    const keys = [...this.dirty];
    this.dirty.clear();
    try {
      this.sqlite.transaction(() => {
        for (const key of keys) {
          const e = this.counts.get(key)!;
          this.upsert.run(e.sensorKey, e.reason, e.count, e.firstAtMs, e.lastAtMs, e.lastDetail);
        }
      })();
    } catch (err) {
      // The counts stay in memory and are retried on the next rejection or flush.
      for (const key of keys) this.dirty.add(key);
      this.log.error({ err: String(err) }, 'could not store rejection counts');
    }
  }

  list(sensorKey?: string): RejectionCount[] {
    const all = [...this.counts.values()].map((e) => ({ ...e }));
    return sensorKey === undefined ? all : all.filter((e) => e.sensorKey === sensorKey);
  }

  get totalCount(): number {
    return this.total;
  }
}
