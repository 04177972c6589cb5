/**
 * Sends what the outbox holds, off the reading path: each delivery in its own promise with its
 * own timeout, at most one at a time per recipient (a hanging webhook holds only its own queue)
 * and the alerts' events to one recipient in order (a later event of an alert waits while an
 * earlier one to the same recipient is still being retried). A failed attempt is retried on the
 * schedule of retrySchedule.ts. At start every pending row is picked up.
 */
import type { Logger } from '../log.ts';
import type { AttemptResult, Channel } from './channels/channel.ts';
import type { Outbox, OutboxRow } from './outbox.ts';
import { defaultMaxAttempts, defaultRetryDelaysMs, retryDelayMs } from './retrySchedule.ts';

export interface DispatcherOptions {
  outbox: Outbox;
  channels: ReadonlyMap<string, Channel>;
  /** The dispatcher's clock (real time by default: its timers are real). */
  now?: () => number;
  retryDelaysMs?: readonly number[];
  maxAttempts?: number;
  /** Most deliveries in flight at once, over all recipients. */
  maxInFlight?: number;
  log?: Logger;
  onAttempt?: (row: OutboxRow, result: AttemptResult) => void;
}

export class Dispatcher {
  private readonly now: () => number;
  private readonly inFlightTargets = new Set<string>();
  private inFlight = 0;
  private timer: NodeJS.Timeout | null = null;
  private timerAtMs = Infinity;
  private scheduled = false;
  private stopped = false;
  /** A round is reading the outbox; another asked for meanwhile runs after it (`again`). */
  private roundRunning = false;
  private again = false;
  private readonly running = new Set<Promise<void>>();
  private readonly controllers = new Set<AbortController>();

  constructor(private readonly options: DispatcherOptions) {
    this.now = options.now ?? Date.now;
  }

  /** Looks at the outbox soon (after the current turn: never inside the caller's). */
  kick(): void {
    if (this.scheduled || this.stopped) return;
    this.scheduled = true;
    setImmediate(() => {
      this.scheduled = false;
      this.run();
    });
  }

  /** One round at a time: a round started while another reads the outbox would start its rows twice. */
  private run(): void {
    if (this.roundRunning) {
      this.again = true;
      return;
    }
    this.roundRunning = true;
    void this.round().finally(() => {
      this.roundRunning = false;
      if (!this.again) return;
      this.again = false;
      this.run();
    });
  }

  private async round(): Promise<void> {
    if (this.stopped) return;
    const nowMs = this.now();
    const maxInFlight = this.options.maxInFlight ?? 16;
    /** (recipient, alert) pairs with an earlier delivery still pending: later ones wait for it. */
    const seen = new Set<string>();
    let nextDueMs = Infinity;
    let rows: OutboxRow[];
    try {
      rows = await this.options.outbox.pending();
    } catch (err) {
      this.options.log?.error({ err: String(err) }, 'notifications: cannot read the outbox; trying again in 5 s');
      this.schedule(nowMs + 5_000);
      return;
    }
    if (this.stopped) return;
    for (const row of rows) {
      const key = row.alertId === null ? null : `${row.target}|${row.alertId}`;
      const blocked = key !== null && seen.has(key);
      if (key !== null) seen.add(key);
      if (blocked || this.inFlightTargets.has(row.target)) continue;
      if (row.nextAttemptAtMs > nowMs) {
        nextDueMs = Math.min(nextDueMs, row.nextAttemptAtMs);
        continue;
      }
      if (this.inFlight >= maxInFlight) break;
      this.start(row);
    }
    if (nextDueMs < Infinity) this.schedule(nextDueMs);
  }

  private schedule(atMs: number): void {
    if (this.stopped || (this.timer !== null && this.timerAtMs <= atMs)) return;
    if (this.timer !== null) clearTimeout(this.timer);
    this.timerAtMs = atMs;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.timerAtMs = Infinity;
      this.run();
    }, Math.max(0, atMs - this.now()));
    this.timer.unref();
  }

  private start(row: OutboxRow): void {
    const channel = this.options.channels.get(row.channel);
    this.inFlightTargets.add(row.target);
    this.inFlight++;
    const controller = new AbortController();
    this.controllers.add(controller);
    const startedMs = this.now();
    const timeout = setTimeout(() => controller.abort(), channel?.timeoutMs ?? 1);
    const attempt: Promise<AttemptResult> = channel
      ? channel.send({ deliveryId: row.deliveryId, target: row.target, payload: row.payloadJson }, controller.signal).catch((err: unknown) => ({ ok: false, result: `channel failed: ${String(err)}` }))
      : Promise.resolve({ ok: false, result: `the ${row.channel} channel is not set up (see README "Alert notifications")` });
    const done = attempt.then(async (result) => {
      clearTimeout(timeout);
      this.controllers.delete(controller);
      if (this.stopped) return;
      const atMs = this.now();
      const attempts = row.attempts + 1;
      const giveUp = !result.ok && (result.permanent === true || attempts >= (this.options.maxAttempts ?? defaultMaxAttempts));
      const status = result.ok ? 'delivered' : giveUp ? 'failed' : 'pending';
      const nextAttemptAtMs = status === 'pending' ? atMs + retryDelayMs(attempts, this.options.retryDelaysMs ?? defaultRetryDelaysMs) : atMs;
      try {
        await this.options.outbox.record(row, { atMs: startedMs, durationMs: Math.max(0, atMs - startedMs), ok: result.ok, result: result.result }, { status, nextAttemptAtMs });
      } catch (err) {
        // Not recorded (disk full): the row stays pending as it was and is tried again.
        this.options.log?.error({ err: String(err), deliveryId: row.deliveryId }, 'notifications: cannot record a delivery attempt');
      }
      this.options.onAttempt?.(row, result);
      if (!result.ok) this.options.log?.warn({ deliveryId: row.deliveryId, target: row.target, event: row.event, attempt: attempts, result: result.result, status }, 'notification not delivered');
    });
    const tracked = done.finally(() => {
      this.inFlightTargets.delete(row.target);
      this.inFlight--;
      this.running.delete(tracked);
      this.kick();
    });
    this.running.add(tracked);
  }

  /** Stops sending; attempts in flight are cut short and stay pending for the next start. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer !== null) clearTimeout(this.timer);
    for (const c of this.controllers) c.abort();
    await Promise.allSettled([...this.running]);
    for (const channel of this.options.channels.values()) channel.close?.();
  }
}
