/**
 * The notification outbox (table `notify_outbox`, attempts in `notify_attempts`): every message to
 * every recipient is a row before anything is sent, so a restart loses none; each attempt's result
 * is a row of its own. Small synchronous statements on the server's connection, never inside the
 * ingest write queue's transactions (those run in one synchronous call each). Moved here from
 * notify/outbox.ts: notify/ decides what to send, this module stores it.
 */
import { randomUUID } from 'node:crypto';
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import { notifyAttemptsTable, notifyOutboxTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type OutboxRow = typeof notifyOutboxTable.$inferSelect;

export interface NewDelivery {
  channel: string;
  target: string;
  event: string;
  alertId: number | null;
  /** Made with the delivery id, so a body can carry it. */
  payload: (deliveryId: string) => unknown;
}

export class OutboxStore {
  constructor(private readonly db: Db) {}

  add(items: readonly NewDelivery[], atMs: number): OutboxRow[] {
    if (items.length === 0) return [];
    return this.db.transaction((tx) =>
      items.map((item) => {
        const deliveryId = randomUUID();
        return tx
          .insert(notifyOutboxTable)
          .values({ deliveryId, channel: item.channel, target: item.target, event: item.event, alertId: item.alertId, payloadJson: item.payload(deliveryId), createdAtMs: atMs, status: 'pending', attempts: 0, nextAttemptAtMs: atMs })
          .returning()
          .get();
      }),
    );
  }

  /** Pending deliveries in the order they were queued. */
  pending(limit = 1000): OutboxRow[] {
    return this.db.select().from(notifyOutboxTable).where(eq(notifyOutboxTable.status, 'pending')).orderBy(notifyOutboxTable.id).limit(limit).all();
  }

  record(row: OutboxRow, attempt: { atMs: number; durationMs: number; ok: boolean; result: string }, next: { status: 'pending' | 'delivered' | 'failed'; nextAttemptAtMs: number }): void {
    this.db.transaction((tx) => {
      tx.insert(notifyAttemptsTable).values({ outboxId: row.id, ...attempt }).run();
      tx.update(notifyOutboxTable)
        .set({
          status: next.status,
          attempts: sql`${notifyOutboxTable.attempts} + 1`,
          nextAttemptAtMs: next.nextAttemptAtMs,
          lastError: attempt.ok ? row.lastError : attempt.result,
          deliveredAtMs: attempt.ok ? attempt.atMs : null,
        })
        .where(eq(notifyOutboxTable.id, row.id))
        .run();
    });
  }

  counts(): { pending: number; failed: number } {
    const rows = this.db.$client.prepare(`SELECT status, COUNT(*) AS n FROM notify_outbox WHERE status IN ('pending', 'failed') GROUP BY status`).all() as Array<{ status: string; n: number }>;
    return { pending: rows.find((r) => r.status === 'pending')?.n ?? 0, failed: rows.find((r) => r.status === 'failed')?.n ?? 0 };
  }

  /** The newest failed attempt: what it was, to whom, when. */
  lastFailure(): { atMs: number; target: string; channel: string; result: string } | null {
    const row = this.db.$client
      .prepare(`SELECT a.at_ms AS atMs, o.target AS target, o.channel AS channel, a.result AS result FROM notify_attempts a JOIN notify_outbox o ON o.id = a.outbox_id WHERE a.ok = 0 ORDER BY a.id DESC LIMIT 1`)
      .get() as { atMs: number; target: string; channel: string; result: string } | undefined;
    return row ?? null;
  }

  /** The newest deliveries, each with every attempt's result. */
  recent(limit: number, filter: { status?: string; alertId?: number } = {}) {
    const where = and(filter.status ? eq(notifyOutboxTable.status, filter.status) : undefined, filter.alertId !== undefined ? eq(notifyOutboxTable.alertId, filter.alertId) : undefined);
    const rows = this.db.select().from(notifyOutboxTable).where(where).orderBy(desc(notifyOutboxTable.id)).limit(limit).all();
    const attempts = rows.length === 0 ? [] : this.db.select().from(notifyAttemptsTable).where(inArray(notifyAttemptsTable.outboxId, rows.map((r) => r.id))).orderBy(notifyAttemptsTable.id).all();
    return rows.map((r) => ({
      id: r.id,
      deliveryId: r.deliveryId,
      channel: r.channel,
      target: r.target,
      event: r.event,
      alertId: r.alertId,
      status: r.status,
      attempts: r.attempts,
      createdAtMs: r.createdAtMs,
      nextAttemptAtMs: r.status === 'pending' ? r.nextAttemptAtMs : null,
      deliveredAtMs: r.deliveredAtMs,
      lastError: r.lastError,
      attemptLog: attempts.filter((a) => a.outboxId === r.id).map((a) => ({ atMs: a.atMs, durationMs: a.durationMs, ok: a.ok, result: a.result })),
    }));
  }
}
