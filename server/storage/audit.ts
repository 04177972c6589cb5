/**
 * The audit trail: every change to the register (site, sensors, gateways, structures, levels)
 * and every acknowledgement, with who made it, what it was before and after, and when.
 */
import { and, asc, gte, lt } from 'drizzle-orm';
import { auditTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type AuditRow = typeof auditTable.$inferSelect;

export interface AuditEntry {
  actor: string;
  entity: 'site' | 'sensor' | 'gateway' | 'structure' | 'alert' | 'person' | 'site-link' | 'register' | 'notify';
  entityId: string | number;
  action: string;
  before?: unknown;
  after?: unknown;
}

export class AuditStore {
  constructor(private readonly db: Db) {}

  /** Writes one audit row; call it inside the transaction that makes the change. */
  record(entry: AuditEntry, atMs: number): void {
    this.db
      .insert(auditTable)
      .values({
        atMs,
        actor: entry.actor,
        entity: entry.entity,
        entityId: String(entry.entityId),
        action: entry.action,
        beforeJson: entry.before === undefined ? null : entry.before,
        afterJson: entry.after === undefined ? null : entry.after,
      })
      .run();
  }

  /** Rows with from ≤ at < to, oldest first (at most `limit` when given). */
  inWindow(fromMs: number, toMs: number, limit?: number): AuditRow[] {
    const query = this.db.select().from(auditTable).where(and(gte(auditTable.atMs, fromMs), lt(auditTable.atMs, toMs))).orderBy(asc(auditTable.atMs), asc(auditTable.id));
    return limit === undefined ? query.all() : query.limit(limit).all();
  }
}
