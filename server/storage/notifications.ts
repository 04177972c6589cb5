/**
 * What the alert channels keep besides the outbox: the webhooks made in the app, each person's
 * e-mail address and filter, the escalation chains per level and the log of steps taken, and the
 * nonces of used acknowledge links and push buttons (each works once).
 */
import { desc, eq, isNull } from 'drizzle-orm';
import { notifyEscalationsTable, notifyEscalationTable, notifyPersonSettingsTable, notifyWebhooksTable, peopleTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type WebhookRow = typeof notifyWebhooksTable.$inferSelect;
export type EscalationChainRow = typeof notifyEscalationTable.$inferSelect;
export type EscalationStepRow = typeof notifyEscalationsTable.$inferSelect;
export type PersonNotifySettingsRow = typeof notifyPersonSettingsTable.$inferSelect;

export class NotificationStore {
  constructor(private readonly db: Db) {}

  // ---- webhooks ----

  webhooks(): WebhookRow[] {
    return this.db.select().from(notifyWebhooksTable).orderBy(notifyWebhooksTable.id).all();
  }

  enabledWebhooks(): WebhookRow[] {
    return this.db.select().from(notifyWebhooksTable).where(eq(notifyWebhooksTable.enabled, true)).all();
  }

  enabledWebhookCount(): number {
    return (this.db.$client.prepare('SELECT COUNT(*) AS n FROM notify_webhooks WHERE enabled = 1').get() as { n: number }).n;
  }

  webhook(id: number): WebhookRow | undefined {
    return this.db.select().from(notifyWebhooksTable).where(eq(notifyWebhooksTable.id, id)).get();
  }

  insertWebhook(values: Omit<typeof notifyWebhooksTable.$inferInsert, 'id'>): WebhookRow {
    return this.db.insert(notifyWebhooksTable).values(values).returning().get();
  }

  updateWebhook(id: number, changes: Partial<Omit<WebhookRow, 'id' | 'createdBy' | 'createdAtMs'>>): WebhookRow {
    return this.db.update(notifyWebhooksTable).set(changes).where(eq(notifyWebhooksTable.id, id)).returning().get();
  }

  deleteWebhook(id: number): void {
    this.db.delete(notifyWebhooksTable).where(eq(notifyWebhooksTable.id, id)).run();
  }

  // ---- people's own settings ----

  personSettings(personId: number): PersonNotifySettingsRow | undefined {
    return this.db.select().from(notifyPersonSettingsTable).where(eq(notifyPersonSettingsTable.personId, personId)).get();
  }

  savePersonSettings(personId: number, email: string | null, filter: unknown, atMs: number): void {
    this.db
      .insert(notifyPersonSettingsTable)
      .values({ personId, email, filterJson: filter, updatedAtMs: atMs })
      .onConflictDoUpdate({ target: notifyPersonSettingsTable.personId, set: { email, filterJson: filter, updatedAtMs: atMs } })
      .run();
  }

  /** People not disabled who have settings, with their e-mail address (null or "" when none) and filter. */
  emailSettingsOfActivePeople(): Array<{ id: number; displayName: string; role: string; email: string | null; filter: unknown }> {
    return this.db
      .select({ id: peopleTable.id, displayName: peopleTable.displayName, role: peopleTable.role, email: notifyPersonSettingsTable.email, filter: notifyPersonSettingsTable.filterJson })
      .from(notifyPersonSettingsTable)
      .innerJoin(peopleTable, eq(peopleTable.id, notifyPersonSettingsTable.personId))
      .where(isNull(peopleTable.disabledAtMs))
      .all();
  }

  // ---- escalation ----

  chains(): EscalationChainRow[] {
    return this.db.select().from(notifyEscalationTable).orderBy(notifyEscalationTable.level).all();
  }

  /** Replaces every chain (levels with no steps are left out). */
  replaceChains(chains: ReadonlyArray<{ level: number; steps: unknown[] }>, actor: string, atMs: number): void {
    this.db.delete(notifyEscalationTable).run();
    for (const chain of chains) if (chain.steps.length > 0) this.db.insert(notifyEscalationTable).values({ level: chain.level, stepsJson: chain.steps, updatedBy: actor, updatedAtMs: atMs }).run();
  }

  /** The steps taken, newest first. */
  recentSteps(limit: number): EscalationStepRow[] {
    return this.db.select().from(notifyEscalationsTable).orderBy(desc(notifyEscalationsTable.id)).limit(limit).all();
  }

  /** Every step taken (alert, step index). */
  stepsTaken(): Array<{ alertId: number; step: number }> {
    return this.db.select({ alertId: notifyEscalationsTable.alertId, step: notifyEscalationsTable.step }).from(notifyEscalationsTable).all();
  }

  /** Logs a step taken; false when that step of that alert was logged already. */
  logStep(values: Omit<typeof notifyEscalationsTable.$inferInsert, 'id'>): boolean {
    return this.db.insert(notifyEscalationsTable).values(values).onConflictDoNothing().run().changes > 0;
  }

  // ---- single-use tokens ----

  /** When the token with this nonce was used, or null. */
  tokenUsedAt(nonce: string): number | null {
    return (this.db.$client.prepare('SELECT used_at_ms AS atMs FROM notify_used_tokens WHERE nonce = ?').get(nonce) as { atMs: number } | undefined)?.atMs ?? null;
  }

  /** Uses the token up; false when it was used already. */
  useToken(nonce: string, alertId: number, atMs: number): boolean {
    return this.db.$client.prepare('INSERT OR IGNORE INTO notify_used_tokens (nonce, alert_id, used_at_ms) VALUES (?, ?, ?)').run(nonce, alertId, atMs).changes > 0;
  }
}
