/**
 * Web Push in the notifier (design §4b, issue 16): who gets a push (each subscribed device of a
 * person whose filter passes the alert; for an escalation step, the step's people), what it says
 * (pushMessage.ts), and the buttons it carries — Acknowledge, and "Done: <configuration>" — which
 * the service worker posts back to POST /api/push/action without the app being open. The Done
 * button takes the same path as POST /api/structures/:id/configuration with `alertId`
 * (Watch.switchConfiguration, then the write queue, then the announcement).
 */
import { Invalid, NotFound } from '../domainErrors.ts';
import { roleAllows, type Role } from '../auth/roles.ts';
import type { Config } from '../config.ts';
import type { Logger } from '../log.ts';
import type { Storage } from '../storage/storage.ts';
import { acknowledgementBatch } from '../storage/writeBatch.ts';
import type { WriteQueue } from '../storage/writeQueue.ts';
import type { OpenAlert, Watch } from '../watch/watch.ts';
import { PushChannel, type PushPayload } from './channels/push.ts';
import type { NotifyEventName } from './events.ts';
import { filterPasses, storedFilter, type NotifyFilter } from './filter.ts';
import type { NewDelivery } from './outbox.ts';
import { alertPushMessage, buttonsFor, testPushMessage, type PushButton } from './pushMessage.ts';
import type { PushSubscriptionRow } from './pushSubscriptions.ts';
import { checkPushActionToken, makePushActionToken, pushActionLifetimeMs, type PushActionClaim } from './pushTokens.ts';
import { loadVapidKeys, vapidSubject, type VapidKeys } from './vapid.ts';

/** The events that go to phones: those that ask for something, and the acknowledgement (it replaces the alert's notification, quietly). */
export const pushEvents: ReadonlySet<NotifyEventName> = new Set(['alert.raised', 'alert.resignalled', 'alert.overdue', 'alert.escalated', 'alert.acknowledged']);

/** Who may press the buttons: the same role the app's Acknowledge and Done need (crew). */
const actingRole: Role = 'crew';

export type PushActionAnswer =
  | { status: 200; action: 'ack' | 'done'; alert: OpenAlert; by: string; message: string }
  | { status: 400 | 403 | 404 | 409 | 410 | 503; message: string };

export interface PushNotifierDeps {
  storage: Storage;
  config: Config;
  watch: Watch;
  queue: WriteQueue;
  now: () => number;
  log: Logger;
  /** The acknowledge-link key (ackTokens.ts ackSecret): one signing key for every token. */
  secret: Buffer;
  dispatchNow: () => number;
  timeoutMs?: number;
}

type Recipient = { sub: PushSubscriptionRow; person: { id: number; displayName: string; role: Role; username: string } };

export class PushNotifier {
  readonly subscriptions: Storage['pushSubscriptions'];
  readonly channel: PushChannel | null;
  readonly keys: VapidKeys | null;
  /** Why push is off (the key file could not be read or made), in words. */
  readonly problem: string | null;

  constructor(private readonly deps: PushNotifierDeps) {
    this.subscriptions = deps.storage.pushSubscriptions;
    let keys: VapidKeys | null = null;
    let problem: string | null = null;
    try {
      keys = loadVapidKeys(deps.config.dataDir, vapidSubject(deps.config), deps.now());
    } catch (err) {
      problem = err instanceof Error ? err.message : String(err);
      deps.log.error({ err: problem }, 'Web Push is off: the VAPID key could not be read or made; e-mail and webhooks go on');
    }
    this.keys = keys;
    this.problem = problem;
    this.channel = keys
      ? new PushChannel(
          keys,
          {
            subscription: async (target) => {
              const row = await this.subscriptions.byId(Number(target.slice('push:'.length)));
              return row ? { id: row.id, endpoint: row.endpoint, p256dh: row.p256dh, auth: row.auth } : null;
            },
            gone: async (id, result) => {
              await this.subscriptions.removeGone(id);
              deps.log.warn({ subscriptionId: id, result }, 'push subscription gone at the push service: removed');
            },
            delivered: async (id, atMs) => {
              await this.subscriptions.markDelivered(id, atMs);
            },
          },
          deps.dispatchNow,
          deps.timeoutMs,
        )
      : null;
  }

  private async filterOf(personId: number): Promise<NotifyFilter> {
    const row = await this.deps.storage.notifications.personSettings(personId);
    return row ? storedFilter(row.filterJson) : { kind: 'all' };
  }

  private buttons(alert: OpenAlert, event: NotifyEventName, person: Recipient['person']): PushButton[] {
    if (!roleAllows(person.role, actingRole)) return [];
    const expiresAtMs = this.deps.now() + pushActionLifetimeMs;
    return buttonsFor(alert, event).map((b) => ({ ...b, token: makePushActionToken(this.deps.secret, { action: b.action, alertId: alert.id, personId: person.id, expiresAtMs }) }));
  }

  private delivery(r: Recipient, event: NotifyEventName, atMs: number, alert: OpenAlert, siteName: string): NewDelivery {
    const buttons = this.buttons(alert, event, r.person);
    const payload: PushPayload = {
      message: alertPushMessage({ event, atMs, siteName, alert, buttons, buttonsExpireAtMs: buttons.length > 0 ? this.deps.now() + pushActionLifetimeMs : null }),
      // No longer than its buttons work; an acknowledgement is news for a quarter of an hour.
      ttlSeconds: event === 'alert.acknowledged' ? 900 : pushActionLifetimeMs / 1000,
      urgency: event === 'alert.acknowledged' ? 'normal' : 'high',
      topic: `alert${alert.id}`,
    };
    return { channel: 'push', target: `push:${r.sub.id}`, event, alertId: alert.id, payload: () => payload };
  }

  /** The pushes of one alert event: every subscribed device whose owner's filter passes it. */
  async deliveriesFor(event: NotifyEventName, atMs: number, alert: OpenAlert, siteName: string): Promise<NewDelivery[]> {
    if (!this.channel || !pushEvents.has(event)) return [];
    const filters = new Map<number, NotifyFilter>();
    const out: NewDelivery[] = [];
    for (const r of await this.subscriptions.active()) {
      let f = filters.get(r.person.id);
      if (!f) filters.set(r.person.id, (f = await this.filterOf(r.person.id)));
      if (filterPasses(f, alert)) out.push(this.delivery(r, event, atMs, alert, siteName));
    }
    return out;
  }

  /** An escalation step's pushes: every device of the chosen people (their filters do not apply: they were chosen). */
  async escalationDeliveries(personIds: ReadonlySet<number>, atMs: number, alert: OpenAlert, siteName: string): Promise<{ items: NewDelivery[]; reached: Map<number, number> }> {
    const items: NewDelivery[] = [];
    const reached = new Map<number, number>();
    if (!this.channel) return { items, reached };
    for (const r of await this.subscriptions.active()) {
      if (!personIds.has(r.person.id)) continue;
      items.push(this.delivery(r, 'alert.escalated', atMs, alert, siteName));
      reached.set(r.person.id, (reached.get(r.person.id) ?? 0) + 1);
    }
    return { items, reached };
  }

  async test(personId: number, subscriptionId: number, siteName: string, who: string): Promise<NewDelivery | { error: string; status: 404 | 409 }> {
    if (!this.channel) return { error: `Web Push is off on this server: ${this.problem ?? 'no key'}`, status: 409 };
    const sub = await this.subscriptions.byId(subscriptionId);
    if (!sub || sub.personId !== personId) return { error: `push subscription ${subscriptionId} is not one of yours`, status: 404 };
    const payload: PushPayload = { message: testPushMessage(siteName, who, sub.label, this.deps.now()), ttlSeconds: 300, urgency: 'normal' };
    return { channel: 'push', target: `push:${sub.id}`, event: 'test', alertId: null, payload: () => payload };
  }

  /**
   * A notification's button pressed (POST /api/push/action): checks the token, refuses an expired
   * (410) or used (409) one, and acknowledges the alert or marks its action done, recorded like
   * the same tap in the app, with "by push notification" in the audit trail.
   */
  async act(token: string): Promise<PushActionAnswer> {
    const nowMs = this.deps.now();
    const check = checkPushActionToken(this.deps.secret, token, nowMs);
    if (!check.ok) {
      if (check.reason === 'expired') return { status: 410, message: 'this notification\'s buttons have expired (they work for 2 hours): open the app' };
      return { status: check.reason === 'malformed' ? 400 : 403, message: 'this is not a valid notification button' };
    }
    const { claim } = check;
    const usedAtMs = await this.deps.storage.notifications.tokenUsedAt(claim.nonce);
    if (usedAtMs !== null) return { status: 409, message: `this button was already used at ${new Date(usedAtMs).toISOString()}; each works once` };
    const person = await this.deps.storage.people.byId(claim.personId);
    if (!person || person.disabledAtMs !== null) return { status: 403, message: 'the person this notification was sent to can no longer sign in' };
    if (!roleAllows(person.role, actingRole)) return { status: 403, message: `acknowledging needs the ${actingRole} role` };
    const open = this.deps.watch.openAlert(claim.alertId);
    if (!open) return { status: 409, message: `alert ${claim.alertId} is no longer open (acknowledged and ended)` };
    return claim.action === 'ack' ? this.acknowledge(claim, open, person, nowMs) : this.done(claim, open, person, nowMs);
  }

  private consume(claim: PushActionClaim, nowMs: number): Promise<boolean> {
    return this.deps.storage.notifications.useToken(claim.nonce, claim.alertId, nowMs);
  }

  private async acknowledge(claim: PushActionClaim, open: OpenAlert, person: { username: string; displayName: string }, nowMs: number): Promise<PushActionAnswer> {
    if (open.acknowledgedAtMs !== null) return { status: 409, message: `already acknowledged by ${open.acknowledgedBy ?? 'someone'} at ${new Date(open.acknowledgedAtMs).toISOString()}` };
    if (!(await this.consume(claim, nowMs))) return { status: 409, message: 'this button was used just now; each works once' };
    const note = 'acknowledged from the push notification';
    // Stored (or held while the disk refuses) before the stream and the notifications say so, as the app's acknowledgement is.
    await this.deps.queue.enqueue(acknowledgementBatch({ alertId: claim.alertId, atMs: nowMs, by: person.displayName, note, actor: `${person.displayName} (${person.username}) by push notification` }));
    const alert = this.deps.watch.acknowledged(claim.alertId, person.displayName, note, nowMs) ?? { ...open, acknowledgedAtMs: nowMs, acknowledgedBy: person.displayName, acknowledgeNote: note };
    return { status: 200, action: 'ack', alert, by: person.displayName, message: `Acknowledged by ${person.displayName}.` };
  }

  private async done(claim: PushActionClaim, open: OpenAlert, person: { username: string; displayName: string }, nowMs: number): Promise<PushActionAnswer> {
    if (open.moveToConfiguration === null || open.structureId === null) return { status: 409, message: `the action of alert ${open.id} does not move the structure to another configuration` };
    if (open.actionDoneAtMs !== null) return { status: 409, message: `already done by ${open.actionDoneBy ?? 'someone'} at ${new Date(open.actionDoneAtMs).toISOString()}` };
    // The same path as POST /api/structures/:id/configuration with alertId (server/http/routes/liveRoutes.ts).
    const result = this.deps.watch.switchConfiguration({
      structureId: open.structureId,
      name: open.moveToConfiguration,
      by: person.displayName,
      actor: `${person.displayName} (${person.username}) by push notification`,
      note: null,
      alertId: open.id,
      atMs: nowMs,
    });
    if (!result.ok) {
      // The button acted on an alert the crew saw: whatever stops it now is a clash with the state, not bad input.
      const { error } = result;
      return { status: error instanceof NotFound ? 404 : 409, message: error instanceof Invalid ? error.issues.map((i) => i.message).join('; ') : error.message };
    }
    // Synchronous from the checks to the switch: no other tap of this button can come between.
    await this.consume(claim, nowMs);
    await this.deps.queue.enqueue(result.batch);
    result.announce();
    const alert = result.alert ?? open;
    return { status: 200, action: 'done', alert, by: person.displayName, message: `Done: ${open.moveToConfiguration}, marked by ${person.displayName}.` };
  }

  /** For /api/health (public): no addresses, only whether push works and how many devices. */
  async health(): Promise<{ enabled: boolean; subscriptions: number; problem: string | null }> {
    let subscriptions = 0;
    try {
      subscriptions = await this.subscriptions.count();
    } catch {
      // unknown
    }
    return { enabled: this.channel !== null, subscriptions, problem: this.problem };
  }
}
