/**
 * Each person's Web Push subscriptions (table `notify_push_subscriptions`), one per browser.
 * Subscribing the same browser again (the same endpoint) updates the row, also when another
 * person now signs in on it: a device alerts the person who subscribed it last. The request's
 * shape is checked in notify/pushSubscriptions.ts.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { notifyPushSubscriptionsTable, peopleTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type PushSubscriptionRow = typeof notifyPushSubscriptionsTable.$inferSelect;

/** What a browser's PushManager gave: its endpoint, P-256 key and auth secret, and the person's label. */
export interface PushSubscriptionInput {
  subscription: { endpoint: string; keys: { p256dh: string; auth: string } };
  label: string;
}

export class PushSubscriptionStore {
  constructor(private readonly db: Db) {}

  ofPerson(personId: number): PushSubscriptionRow[] {
    return this.db.select().from(notifyPushSubscriptionsTable).where(eq(notifyPushSubscriptionsTable.personId, personId)).orderBy(notifyPushSubscriptionsTable.id).all();
  }

  byId(id: number): PushSubscriptionRow | undefined {
    return this.db.select().from(notifyPushSubscriptionsTable).where(eq(notifyPushSubscriptionsTable.id, id)).get();
  }

  /** Every subscription of a person who may still sign in, with the person. */
  active(): Array<{ sub: PushSubscriptionRow; person: { id: number; displayName: string; role: (typeof peopleTable.$inferSelect)['role']; username: string } }> {
    return this.db
      .select({ sub: notifyPushSubscriptionsTable, person: { id: peopleTable.id, displayName: peopleTable.displayName, role: peopleTable.role, username: peopleTable.username } })
      .from(notifyPushSubscriptionsTable)
      .innerJoin(peopleTable, eq(peopleTable.id, notifyPushSubscriptionsTable.personId))
      .where(isNull(peopleTable.disabledAtMs))
      .orderBy(notifyPushSubscriptionsTable.id)
      .all();
  }

  /** Stores (or renews) the browser's subscription for this person. `created` false: the endpoint was known. */
  save(personId: number, body: PushSubscriptionInput, userAgent: string | null, atMs: number): { row: PushSubscriptionRow; created: boolean } {
    const { endpoint, keys } = body.subscription;
    // IMMEDIATE: it reads before it writes, and the commit thread writes on another connection (storage.ts `transaction`).
    return this.db.transaction((tx) => {
      const before = tx.select().from(notifyPushSubscriptionsTable).where(eq(notifyPushSubscriptionsTable.endpoint, endpoint)).get();
      const values = { personId, p256dh: keys.p256dh, auth: keys.auth, label: body.label, userAgent: userAgent ? userAgent.slice(0, 200) : null, updatedAtMs: atMs };
      if (before) {
        const row = tx.update(notifyPushSubscriptionsTable).set(values).where(eq(notifyPushSubscriptionsTable.id, before.id)).returning().get();
        return { row, created: false };
      }
      const row = tx.insert(notifyPushSubscriptionsTable).values({ ...values, endpoint, createdAtMs: atMs }).returning().get();
      return { row, created: true };
    }, { behavior: 'immediate' });
  }

  relabel(personId: number, id: number, label: string, atMs: number): PushSubscriptionRow | undefined {
    return this.db
      .update(notifyPushSubscriptionsTable)
      .set({ label, updatedAtMs: atMs })
      .where(and(eq(notifyPushSubscriptionsTable.id, id), eq(notifyPushSubscriptionsTable.personId, personId)))
      .returning()
      .get();
  }

  /** Removes one of the person's subscriptions; false when it is not theirs (or not there). */
  remove(personId: number, id: number): boolean {
    return this.db.delete(notifyPushSubscriptionsTable).where(and(eq(notifyPushSubscriptionsTable.id, id), eq(notifyPushSubscriptionsTable.personId, personId))).run().changes > 0;
  }

  /** The push service said it is gone. */
  removeGone(id: number): void {
    this.db.delete(notifyPushSubscriptionsTable).where(eq(notifyPushSubscriptionsTable.id, id)).run();
  }

  markDelivered(id: number, atMs: number): void {
    this.db.update(notifyPushSubscriptionsTable).set({ lastDeliveredAtMs: atMs }).where(eq(notifyPushSubscriptionsTable.id, id)).run();
  }

  count(): number {
    return (this.db.$client.prepare('SELECT COUNT(*) AS n FROM notify_push_subscriptions').get() as { n: number }).n;
  }
}
