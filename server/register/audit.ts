/**
 * The audit trail: every change to the register (site, sensors, gateways, structures, levels)
 * and every acknowledgement, with who made it, what it was before and after, and when.
 */
import { auditTable } from '../../db/schema.ts';
import type { Db, Tx } from '../storage/database.ts';

export interface AuditEntry {
  actor: string;
  entity: 'site' | 'sensor' | 'gateway' | 'structure' | 'alert' | 'person' | 'site-link' | 'register' | 'notify';
  entityId: string | number;
  action: string;
  before?: unknown;
  after?: unknown;
}

/** Writes one audit row; call it inside the transaction that makes the change. */
export function recordAudit(db: Tx, entry: AuditEntry, atMs: number): void {
  db.insert(auditTable)
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
