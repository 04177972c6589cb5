/**
 * Alerts as stored: raised, cleared, acknowledged, their action done or signalled overdue. The
 * live path writes them through the write queue (writeBatch.ts); this module reads them and
 * holds the few direct writes outside it (the demo's history).
 */
import { and, asc, eq, gte, isNull, lt, or } from 'drizzle-orm';
import { alertsTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type StoredAlert = typeof alertsTable.$inferSelect;

export class AlertStore {
  constructor(private readonly db: Db) {}

  byId(id: number): StoredAlert | undefined {
    return this.db.select().from(alertsTable).where(eq(alertsTable.id, id)).get();
  }

  /** Alerts not yet acknowledged or not yet cleared: what the live watch holds after a restart. */
  open(): StoredAlert[] {
    return this.db.select().from(alertsTable).where(or(isNull(alertsTable.acknowledgedAtMs), isNull(alertsTable.clearedAtMs))).all();
  }

  /** The highest alert id stored, 0 for none (the live watch numbers new alerts from the next). */
  maxId(): number {
    return (this.db.$client.prepare('SELECT MAX(id) AS id FROM alerts').get() as { id: number | null }).id ?? 0;
  }

  /** Alerts raised in [from, to), oldest first (of one structure when given; at most `limit` when given). */
  raisedInWindow(fromMs: number, toMs: number, options: { structureId?: number; limit?: number } = {}): StoredAlert[] {
    const conditions = [gte(alertsTable.raisedAtMs, fromMs), lt(alertsTable.raisedAtMs, toMs)];
    if (options.structureId !== undefined) conditions.push(eq(alertsTable.structureId, options.structureId));
    const query = this.db.select().from(alertsTable).where(and(...conditions)).orderBy(asc(alertsTable.raisedAtMs), asc(alertsTable.id));
    return options.limit === undefined ? query.all() : query.limit(options.limit).all();
  }

  /** Records an acknowledgement outside the live path (the demo's history); an alert already acknowledged keeps its first. */
  acknowledge(id: number, atMs: number, by: string, note: string | null): void {
    this.db.update(alertsTable).set({ acknowledgedAtMs: atMs, acknowledgedBy: by, acknowledgeNote: note }).where(and(eq(alertsTable.id, id), isNull(alertsTable.acknowledgedAtMs))).run();
  }
}
