/**
 * Alert notifications (design §4b, issue 16): fed by the watch's alert events (levels/alertBook.ts
 * `AlertEvent`), handed over only after their commit (`Watch.observeAlertEvents`,
 * watch/alertEventObservers.ts) and mapped to notification events once (events.ts). The observer
 * only queues them in memory; on the next turn each event becomes outbox rows (one per recipient
 * and channel) and the dispatcher sends them, each with its own timeout: nothing here runs on the
 * reading's path, and no channel waits for another. The escalation chain is checked every few seconds.
 */
import type { Config } from '../config.ts';
import type { Logger } from '../log.ts';
import { getSite } from '../register/site.ts';
import type { Storage } from '../storage/storage.ts';
import { acknowledgementBatch } from '../storage/writeBatch.ts';
import type { WriteQueue } from '../storage/writeQueue.ts';
import type { OpenAlert, Watch } from '../watch/watch.ts';
import { ackLinkLifetimeMs, ackSecret, checkAckToken, makeAckToken, type AckClaim } from './ackTokens.ts';
import type { Channel } from './channels/channel.ts';
import type { EmailChannel } from './channels/email.ts';
import { WebhookChannel, type WebhookEndpoint } from './channels/webhook.ts';
import { Dispatcher } from './dispatcher.ts';
import { alertEmail, testEmail } from './emailMessage.ts';
import { dueSteps, escalationChainSchema, type EscalationStep } from './escalation.ts';
import { CommittedAlerts, type NotifyEvent, type NotifyEventName } from './events.ts';
import { filterPasses, storedFilter } from './filter.ts';
import type { NewDelivery, Outbox } from './outbox.ts';
import { PushNotifier } from './pushNotifier.ts';
import { webhookAlert, webhookBodyText } from './webhookBody.ts';

/** The events that ask somebody to do something go by e-mail; the informational ones go to webhooks only. */
const emailEvents: ReadonlySet<NotifyEventName> = new Set(['alert.raised', 'alert.resignalled', 'alert.overdue', 'alert.escalated']);

export interface NotifierOptions {
  /** The dispatcher's clock and timers (real time by default). */
  dispatchNow?: () => number;
  retryDelaysMs?: readonly number[];
  maxAttempts?: number;
  webhookTimeoutMs?: number;
  emailTimeoutMs?: number;
  pushTimeoutMs?: number;
  /** How often the escalation chain is checked, ms (default 5000). */
  escalationCheckMs?: number;
  /** More channels by name (replacing one of the same name). */
  extraChannels?: readonly Channel[];
}

export interface NotifierDeps {
  storage: Storage;
  config: Config;
  /** Its committed alert events feed the notifications; acknowledgements by link go through it. */
  watch: Watch;
  queue: WriteQueue;
  /** The server's clock (alert times). */
  now: () => number;
  log: Logger;
  /** The address the acknowledge links start with (PUBLIC_URL, or the server's own). */
  publicBase: () => string;
}

export type LinkAcknowledgement =
  | { status: 200; alert: OpenAlert; by: string }
  | { status: 400 | 403 | 404 | 409 | 410; message: string };

export class Notifier {
  readonly outbox: Outbox;
  /** Web Push: subscriptions, the VAPID key, the notification buttons (pushNotifier.ts). */
  readonly push: PushNotifier;
  private readonly dispatcher: Dispatcher;
  /** The alerts open as committed, for the escalation chain. */
  private readonly committed = new CommittedAlerts();
  private readonly waiting: NotifyEvent[] = [];
  private processing = false;
  private unsubscribe: (() => void) | null = null;
  private escalationTimer: NodeJS.Timeout | null = null;
  private readonly secret: Buffer;
  private readonly email: EmailChannel | null;
  private lastError: { atMs: number; target: string; channel: string; result: string } | null;
  /** Escalation steps taken, per alert. */
  private readonly taken = new Map<number, Set<number>>();

  /** The notifier, with its signing key (made on first start) and the outbox's last failure read. */
  static async open(deps: NotifierDeps, options: NotifierOptions = {}): Promise<Notifier> {
    const { smtpUrl, smtpFrom } = deps.config;
    // The SMTP client (nodemailer, about 3 MB of resident memory) is loaded only when e-mail is configured.
    const email = smtpUrl && smtpFrom ? new (await import('./channels/email.ts')).EmailChannel(smtpUrl, smtpFrom, options.emailTimeoutMs) : null;
    return new Notifier(deps, options, await ackSecret(deps.storage, deps.now()), await deps.storage.outbox.lastFailure(), email);
  }

  private constructor(
    private readonly deps: NotifierDeps,
    private readonly options: NotifierOptions,
    secret: Buffer,
    lastError: { atMs: number; target: string; channel: string; result: string } | null,
    email: EmailChannel | null,
  ) {
    this.outbox = deps.storage.outbox;
    this.secret = secret;
    const { config } = deps;
    const dispatchNow = options.dispatchNow ?? Date.now;
    const channels = new Map<string, Channel>();
    channels.set('webhook', new WebhookChannel((target) => this.webhookEndpoint(target), dispatchNow, options.webhookTimeoutMs));
    this.email = email;
    if (this.email) channels.set('email', this.email);
    this.push = new PushNotifier({ storage: deps.storage, config, watch: deps.watch, queue: deps.queue, now: deps.now, log: deps.log, secret: this.secret, dispatchNow, ...(options.pushTimeoutMs ? { timeoutMs: options.pushTimeoutMs } : {}) });
    if (this.push.channel) channels.set('push', this.push.channel);
    for (const c of options.extraChannels ?? []) channels.set(c.name, c);
    this.lastError = lastError;
    this.dispatcher = new Dispatcher({
      outbox: this.outbox,
      channels,
      now: dispatchNow,
      ...(options.retryDelaysMs ? { retryDelaysMs: options.retryDelaysMs } : {}),
      ...(options.maxAttempts ? { maxAttempts: options.maxAttempts } : {}),
      log: deps.log,
      onAttempt: (row, result) => {
        if (!result.ok) this.lastError = { atMs: dispatchNow(), target: row.target, channel: row.channel, result: result.result };
      },
    });
  }

  async start(): Promise<void> {
    const stepsTaken = await this.deps.storage.notifications.stepsTaken();
    // Restored from the log: open, never notified as raised again.
    this.committed.seed(this.deps.watch.openAlerts());
    for (const r of stepsTaken) {
      let set = this.taken.get(r.alertId);
      if (!set) this.taken.set(r.alertId, (set = new Set()));
      set.add(r.step);
    }
    // The watch's alert events, after their commit. The observer runs in the committing turn: queue in memory only.
    this.unsubscribe = this.deps.watch.observeAlertEvents((events) => {
      this.waiting.push(...this.committed.take(events));
      this.scheduleProcessing();
    });
    this.escalationTimer = setInterval(() => void this.checkEscalations(), this.options.escalationCheckMs ?? 5_000);
    this.escalationTimer.unref();
    // Whatever was pending at the last stop is sent now.
    this.dispatcher.kick();
  }

  private scheduleProcessing(): void {
    if (this.processing) return;
    this.processing = true;
    setImmediate(() => void this.processWaiting());
  }

  /** The waiting events into the outbox; one round at a time, so the rows keep the events' order. */
  private async processWaiting(): Promise<void> {
    const events = this.waiting.splice(0);
    try {
      const items: NewDelivery[] = [];
      for (const e of events) items.push(...(await this.deliveriesFor(e)));
      await this.outbox.add(items, this.deps.now());
    } catch (err) {
      this.lastError = { atMs: this.deps.now(), target: '*', channel: '*', result: `could not queue notifications: ${String(err)}` };
      this.deps.log.error({ err: String(err), events: events.length }, 'notifications: could not write to the outbox; these alert events are not sent');
    }
    this.dispatcher.kick();
    this.processing = false;
    if (this.waiting.length > 0) this.scheduleProcessing();
  }

  // ---------- recipients ----------

  private async webhookEndpoint(target: string): Promise<WebhookEndpoint | null> {
    const { config } = this.deps;
    if (target === 'webhook:env') return config.alertWebhookUrl && config.alertWebhookSecret ? { url: config.alertWebhookUrl, secret: config.alertWebhookSecret } : null;
    const id = Number(target.slice('webhook:'.length));
    const row = await this.deps.storage.notifications.webhook(id);
    return row && row.enabled ? { url: row.url, secret: row.secret } : null;
  }

  private async webhookTargets(alert: OpenAlert): Promise<string[]> {
    const out: string[] = [];
    if (this.deps.config.alertWebhookUrl && this.deps.config.alertWebhookSecret) out.push('webhook:env');
    for (const w of await this.deps.storage.notifications.enabledWebhooks()) {
      if (filterPasses(storedFilter(w.filterJson), alert)) out.push(`webhook:${w.id}`);
    }
    return out;
  }

  private webhookDelivery(target: string, event: NotifyEventName, atMs: number, alert: OpenAlert, siteName: string): NewDelivery {
    return { channel: 'webhook', target, event, alertId: alert.id, payload: (id) => ({ body: webhookBodyText({ id, event, atMs, site: { name: siteName }, alert: webhookAlert(alert) }) }) };
  }

  /** People who may get e-mail: enabled, with an address. */
  private async emailPeople(): Promise<Array<{ id: number; displayName: string; role: string; email: string; filter: unknown }>> {
    return (await this.deps.storage.notifications.emailSettingsOfActivePeople())
      .filter((p): p is typeof p & { email: string } => p.email !== null && p.email !== '');
  }

  private emailDelivery(person: { id: number; email: string }, event: NotifyEventName, atMs: number, alert: OpenAlert, site: { name: string; timeZone: string }): NewDelivery {
    const needsAck = alert.acknowledgedAtMs === null && event !== 'alert.cleared';
    const ackUrl = needsAck ? `${this.deps.publicBase()}/notify/ack?t=${makeAckToken(this.secret, { alertId: alert.id, personId: person.id, expiresAtMs: this.deps.now() + ackLinkLifetimeMs })}` : null;
    const payload = alertEmail({ to: person.email, event, atMs, siteName: site.name, alert, ackUrl, timeZone: site.timeZone });
    return { channel: 'email', target: `person:${person.id}`, event, alertId: alert.id, payload: () => payload };
  }

  private async deliveriesFor(e: NotifyEvent): Promise<NewDelivery[]> {
    const site = await getSite(this.deps.storage);
    const items = (await this.webhookTargets(e.alert)).map((t) => this.webhookDelivery(t, e.event, e.atMs, e.alert, site.name));
    if (this.email && emailEvents.has(e.event)) {
      for (const p of await this.emailPeople()) if (filterPasses(storedFilter(p.filter), e.alert)) items.push(this.emailDelivery(p, e.event, e.atMs, e.alert, site));
    }
    items.push(...(await this.push.deliveriesFor(e.event, e.atMs, e.alert, site.name)));
    return items;
  }

  // ---------- escalation ----------

  /** Takes every escalation step that is due (the 5-s timer calls it; tests may too). */
  async checkEscalations(): Promise<void> {
    try {
      await this.escalateDue(this.deps.now());
    } catch (err) {
      this.deps.log.error({ err: String(err) }, 'notifications: escalation check failed');
    }
  }

  private async escalateDue(nowMs: number): Promise<void> {
    const chains = new Map<number, EscalationStep[]>();
    for (const row of await this.deps.storage.notifications.chains()) {
      const parsed = escalationChainSchema.safeParse({ level: row.level, steps: row.stepsJson });
      if (parsed.success && parsed.data.steps.length > 0) chains.set(row.level, parsed.data.steps);
    }
    if (chains.size === 0) return;
    const items: NewDelivery[] = [];
    for (const alert of this.committed.open.values()) {
      if (alert.kind !== 'level' || alert.level === null || alert.acknowledgedAtMs !== null || alert.clearedAtMs !== null) continue;
      const steps = chains.get(alert.level);
      if (!steps) continue;
      const taken = this.taken.get(alert.id) ?? new Set<number>();
      this.taken.set(alert.id, taken);
      for (const i of dueSteps(alert.raisedAtMs, steps, taken, nowMs)) {
        taken.add(i);
        items.push(...(await this.escalationStep(alert, i, steps[i]!, nowMs)));
      }
    }
    if (items.length > 0) {
      await this.outbox.add(items, nowMs);
      this.dispatcher.kick();
    }
  }

  private async escalationStep(alert: OpenAlert, index: number, step: EscalationStep, nowMs: number): Promise<NewDelivery[]> {
    const site = await getSite(this.deps.storage);
    const target = step.personId !== undefined ? `person:${step.personId}` : `role:${step.role}`;
    const people = (await this.emailPeople()).filter((p) => (step.personId !== undefined ? p.id === step.personId : p.role === step.role));
    const items: NewDelivery[] = [];
    if (this.email) for (const p of people) items.push(this.emailDelivery(p, 'alert.escalated', nowMs, alert, site));
    const webhooks = await this.webhookTargets(alert);
    for (const t of webhooks) items.push(this.webhookDelivery(t, 'alert.escalated', nowMs, alert, site.name));
    // Push: every device of the step's people, whether or not they have an e-mail address.
    const stepPeople = (await this.deps.storage.people.active()).filter((p) => (step.personId !== undefined ? p.id === step.personId : p.role === step.role));
    const pushed = await this.push.escalationDeliveries(new Set(stepPeople.map((p) => p.id)), nowMs, alert, site.name);
    items.push(...pushed.items);
    const reachedPeople = this.email ? people.map((p) => `${p.displayName} by e-mail`) : [];
    const reachedPush = stepPeople.filter((p) => pushed.reached.has(p.id)).map((p) => `${p.displayName} by push (${pushed.reached.get(p.id)} device${pushed.reached.get(p.id) === 1 ? '' : 's'})`);
    const reached = [...reachedPeople, ...reachedPush, ...(webhooks.length > 0 ? [`${webhooks.length} webhook${webhooks.length === 1 ? '' : 's'}`] : [])];
    const words = reached.length > 0 ? reached.join(', ') : this.email ? 'nobody: no e-mail address or push subscription is set for this step' : 'nobody: e-mail is not set up (SMTP_URL), no push subscription and no webhook';
    const { storage } = this.deps;
    await storage.transaction(async () => {
      const inserted = await storage.notifications.logStep({ alertId: alert.id, step: index, atMs: nowMs, target, reached: words });
      if (inserted) await storage.audit.record({ actor: 'system', entity: 'alert', entityId: alert.id, action: 'escalated', after: { step: index + 1, target, reached: words, level: alert.level, subject: alert.subject } }, nowMs);
    });
    this.deps.log.warn({ alertId: alert.id, step: index + 1, target, reached: words }, 'alert not acknowledged in time: escalated');
    return items;
  }

  // ---------- acknowledge links ----------

  /** Checks an acknowledge link; with `use`, acknowledges the alert and uses the link up. */
  async acknowledgeByLink(token: string, use: boolean): Promise<LinkAcknowledgement | { status: 'confirm'; claim: AckClaim; alert: OpenAlert }> {
    const nowMs = this.deps.now();
    const check = checkAckToken(this.secret, token, nowMs);
    if (!check.ok) {
      if (check.reason === 'expired') return { status: 410, message: 'this acknowledge link has expired (links are valid for 2 hours): acknowledge in the app' };
      return { status: check.reason === 'malformed' ? 400 : 403, message: 'this is not a valid acknowledge link' };
    }
    const { claim } = check;
    const usedAtMs = await this.deps.storage.notifications.tokenUsedAt(claim.nonce);
    if (usedAtMs !== null) return { status: 410, message: `this acknowledge link was used at ${new Date(usedAtMs).toISOString()}; each link works once` };
    const person = await this.deps.storage.people.activeById(claim.personId);
    if (!person) return { status: 403, message: 'the person this link was sent to can no longer sign in' };
    const open = this.deps.watch.openAlert(claim.alertId);
    if (!open) return { status: 409, message: `alert ${claim.alertId} is no longer open (acknowledged and ended)` };
    if (open.acknowledgedAtMs !== null) return { status: 409, message: `alert ${claim.alertId} was acknowledged by ${open.acknowledgedBy ?? 'someone'} at ${new Date(open.acknowledgedAtMs).toISOString()}` };
    if (!use) return { status: 'confirm', claim, alert: open };
    if (!(await this.deps.storage.notifications.useToken(claim.nonce, claim.alertId, nowMs))) return { status: 410, message: 'this acknowledge link was used just now; each link works once' };
    const note = 'acknowledged from the e-mail link';
    // Stored (or held while the disk refuses) before the stream and the notifications say so, as the app's acknowledgement is.
    await this.deps.queue.enqueue(acknowledgementBatch({ alertId: claim.alertId, atMs: nowMs, by: person.displayName, note, actor: `${person.displayName} (${person.username}) by e-mail link` }));
    const alert = this.deps.watch.acknowledged(claim.alertId, person.displayName, note, nowMs) ?? { ...open, acknowledgedAtMs: nowMs, acknowledgedBy: person.displayName, acknowledgeNote: note };
    return { status: 200, alert, by: person.displayName };
  }

  // ---------- tests and visibility ----------

  /** A test message to one person's e-mail address. */
  async testPerson(personId: number): Promise<{ deliveryId: string } | { error: string }> {
    if (!this.email) return { error: 'e-mail is not set up on this server (SMTP_URL and SMTP_FROM)' };
    const p = (await this.emailPeople()).find((x) => x.id === personId);
    if (!p) return { error: 'set your e-mail address first' };
    const site = await getSite(this.deps.storage);
    const payload = testEmail(p.email, site.name, p.displayName);
    const [row] = await this.outbox.add([{ channel: 'email', target: `person:${p.id}`, event: 'test', alertId: null, payload: () => payload }], this.deps.now());
    this.dispatcher.kick();
    return { deliveryId: row!.deliveryId };
  }

  /** A test push to one of the person's devices. */
  async testPush(personId: number, subscriptionId: number, who: string): Promise<{ deliveryId: string } | { error: string; status: 404 | 409 }> {
    const site = await getSite(this.deps.storage);
    const item = await this.push.test(personId, subscriptionId, site.name, who);
    if ('error' in item) return item;
    const [row] = await this.outbox.add([item], this.deps.now());
    this.dispatcher.kick();
    return { deliveryId: row!.deliveryId };
  }

  /**
   * A test message to one webhook: the contract's body with `"event": "test"` and an alert of
   * kind "test" (id 0), so a receiver can tell it from a real alert.
   */
  async testWebhook(target: string): Promise<{ deliveryId: string } | { error: string }> {
    if ((await this.webhookEndpoint(target)) === null) return { error: 'no such webhook, or it is switched off' };
    const site = await getSite(this.deps.storage);
    const atMs = this.deps.now();
    const [row] = await this.outbox.add([{ channel: 'webhook', target, event: 'test', alertId: null, payload: (id) => ({ body: webhookBodyText({ id, event: 'test', atMs, site: { name: site.name }, alert: { id: 0, kind: 'test', label: 'Test message' } }) }) }], atMs);
    this.dispatcher.kick();
    return { deliveryId: row!.deliveryId };
  }

  get emailConfigured(): boolean {
    return this.email !== null;
  }

  get envWebhookUrl(): string | null {
    return this.deps.config.alertWebhookUrl;
  }

  async health(): Promise<{ pending: number; failed: number; lastError: { atMs: number; target: string; channel: string; result: string } | null; email: boolean; webhooks: number; push: Awaited<ReturnType<PushNotifier['health']>> }> {
    let counts = { pending: 0, failed: 0 };
    try {
      counts = await this.outbox.counts();
    } catch {
      // The database cannot be read: the counts are unknown, the last error says why.
    }
    const webhooks = (this.deps.config.alertWebhookUrl ? 1 : 0) + (await this.deps.storage.notifications.enabledWebhookCount());
    return { ...counts, lastError: this.lastError, email: this.email !== null, webhooks, push: await this.push.health() };
  }

  async stop(): Promise<void> {
    this.unsubscribe?.();
    if (this.escalationTimer) clearInterval(this.escalationTimer);
    await this.dispatcher.stop();
  }
}
