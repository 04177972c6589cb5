/**
 * The alert book (design §2.6): every alert of a site from its raise to its end, in one place.
 * Pure: no I/O and no clock (times come in as ms since the Unix epoch). Each change returns the
 * domain events it caused, in order; the live watch turns them into rows for the store
 * (storage/alertRows.ts) and, only after the commit, into announcements on the live stream and the
 * notification channels. The texts the alerts carry are in alertWords.ts: one wording.
 *
 * Life of an alert:
 * - raised: open, unacknowledged; the raise is its first signal;
 * - signalled again every interval (default 2 min, our choice: common practice for alarms that need
 *   a human answer) until someone acknowledges it;
 * - a level alert whose action moves the structure (design §2.5) is signalled once more as overdue
 *   when the action is not marked done in the site's action time;
 * - acknowledged once (who, when, note); the first acknowledgement is what the log keeps;
 * - cleared when its condition ends (the level fell, the sensor reads again); it stays in the book
 *   until it is both cleared and acknowledged, so an alert nobody saw is never lost from a screen.
 */


/**
 * - 'level': a structure reached a higher level.
 * - 'no-data': a structure has no live governing sensor (shown as "no data", never "fine").
 * - 'sensor-silent': a sensor sent nothing usable for longer than its timeout (design default 30 s).
 * - 'sensor-implausible': a sensor sent values outside the plausible range, or reads calm while the others read wind.
 * - 'sensor-clock': a sensor's time stamps are more than 10 s off the server's clock.
 */
export const alertKinds = ['level', 'no-data', 'sensor-silent', 'sensor-implausible', 'sensor-clock'] as const;
export type AlertKind = (typeof alertKinds)[number];

/** Signal an unacknowledged alert again this often (our choice, see above). */
export const defaultResignalIntervalMs = 2 * 60 * 1000;

/** What a raise needs: the alert's facts, without the book's bookkeeping. */
export interface NewAlert {
  kind: AlertKind;
  structureId: number | null;
  /** The sensor's stored id and key (sensor alerts), else null. */
  sensorId: number | null;
  sensorKey: string | null;
  level: number | null;
  label: string;
  actionText: string;
  raisedAtMs: number;
  gustMps: number | null;
  /** As computed; a value that is not finite (an unbounded structure) is shown as unknown. */
  utilization: number | null;
  moveToConfiguration: string | null;
  subject: string;
}

/** An alert in the book: what raised it (the sensor by its key) and its life since. */
export type OpenAlert = Omit<NewAlert, 'sensorId'> & {
  id: number;
  lastSignalledAtMs: number;
  clearedAtMs: number | null;
  acknowledgedAtMs: number | null;
  acknowledgedBy: string | null;
  acknowledgeNote: string | null;
  actionDoneAtMs: number | null;
  actionDoneBy: string | null;
  /** When the action becomes overdue (raised + the site's action time); null without an action that moves the structure. */
  actionDueAtMs: number | null;
  /** When it was signalled again as overdue; null when not (yet). */
  overdueAtMs: number | null;
};


/** The domain events of the alert book, in the order they happened. */
export type AlertEvent =
  | { type: 'alert-raised'; alert: OpenAlert; raised: NewAlert }
  | { type: 'alert-resignalled'; alert: OpenAlert; atMs: number }
  | { type: 'action-overdue'; alert: OpenAlert; atMs: number }
  | { type: 'alert-acknowledged'; alert: OpenAlert; atMs: number; by: string; note: string | null; actor: string }
  | { type: 'action-done'; alert: OpenAlert; atMs: number; by: string }
  | { type: 'alert-cleared'; alert: OpenAlert; atMs: number };

/** When a level's action that moves the structure is due: the site's action time after the raise; null for an alert without such an action. */
export function actionDueAtMs(raisedAtMs: number, moveToConfiguration: string | null, actionDueMs: number): number | null {
  return moveToConfiguration === null ? null : raisedAtMs + actionDueMs;
}

/** The alerts a screen lists: not yet acknowledged, or not yet ended; newest first. */
export function listedAlerts<A extends Pick<OpenAlert, 'acknowledgedAtMs' | 'clearedAtMs' | 'raisedAtMs'>>(alerts: readonly A[]): A[] {
  return alerts.filter((a) => a.acknowledgedAtMs === null || a.clearedAtMs === null).sort((a, b) => b.raisedAtMs - a.raisedAtMs);
}

export class AlertBook {
  private readonly alerts = new Map<number, OpenAlert>();
  private nextId = 1;

  /** Alerts restored from the store after a restart, and the next free id. */
  restore(alerts: readonly OpenAlert[], nextId: number): void {
    this.nextId = Math.max(this.nextId, nextId);
    for (const alert of alerts) this.alerts.set(alert.id, alert);
  }

  get(id: number): OpenAlert | undefined {
    return this.alerts.get(id);
  }

  values(): IterableIterator<OpenAlert> {
    return this.alerts.values();
  }

  /** Alerts a screen shows: not yet acknowledged, or not yet cleared; newest first (live/liveEvents.ts). */
  open(): OpenAlert[] {
    return listedAlerts([...this.alerts.values()]);
  }

  /**
   * Raises an alert: it gets its id here, so it can be shown and acknowledged before it is stored.
   * `actionDueMs`: the site's time for an action that moves the structure (design §2.5).
   */
  raise(input: NewAlert, actionDueMs: number): { alert: OpenAlert; events: AlertEvent[] } {
    const alert: OpenAlert = {
      id: this.nextId++,
      kind: input.kind,
      structureId: input.structureId,
      sensorKey: input.sensorKey,
      level: input.level,
      label: input.label,
      actionText: input.actionText,
      raisedAtMs: input.raisedAtMs,
      gustMps: input.gustMps,
      utilization: input.utilization !== null && Number.isFinite(input.utilization) ? input.utilization : null,
      lastSignalledAtMs: input.raisedAtMs,
      clearedAtMs: null,
      acknowledgedAtMs: null,
      acknowledgedBy: null,
      acknowledgeNote: null,
      subject: input.subject,
      moveToConfiguration: input.moveToConfiguration,
      actionDoneAtMs: null,
      actionDoneBy: null,
      actionDueAtMs: actionDueAtMs(input.raisedAtMs, input.moveToConfiguration, actionDueMs),
      overdueAtMs: null,
    };
    this.alerts.set(alert.id, alert);
    return { alert, events: [{ type: 'alert-raised', alert, raised: input }] };
  }

  /** The condition ended. An alert already acknowledged leaves the book. */
  clear(id: number, atMs: number): AlertEvent[] {
    const alert = this.alerts.get(id);
    if (!alert || alert.clearedAtMs !== null) return [];
    alert.clearedAtMs = atMs;
    if (alert.acknowledgedAtMs !== null) this.alerts.delete(id);
    return [{ type: 'alert-cleared', alert, atMs }];
  }

  /** Clears a structure's level alerts above `level` (the levels it left behind). */
  clearLevelsAbove(structureId: number, level: number, atMs: number): AlertEvent[] {
    const events: AlertEvent[] = [];
    for (const alert of [...this.alerts.values()]) {
      if (alert.kind === 'level' && alert.structureId === structureId && alert.clearedAtMs === null && (alert.level ?? 0) > level) events.push(...this.clear(alert.id, atMs));
    }
    return events;
  }

  /**
   * Someone has seen it. Only the first acknowledgement counts: a second returns no event. A
   * cleared alert leaves the book.
   */
  acknowledge(id: number, ack: { by: string; note: string | null; atMs: number; actor: string }): AlertEvent[] {
    const alert = this.alerts.get(id);
    if (!alert || alert.acknowledgedAtMs !== null) return [];
    alert.acknowledgedAtMs = ack.atMs;
    alert.acknowledgedBy = ack.by;
    alert.acknowledgeNote = ack.note;
    if (alert.clearedAtMs !== null) this.alerts.delete(id);
    return [{ type: 'alert-acknowledged', alert, ...ack }];
  }

  /**
   * The crew marked the alert's action done (design §2.5); this acknowledges it too when nobody had
   * (with `note`, or "Done: <configuration>").
   */
  actionDone(id: number, done: { by: string; note: string | null; atMs: number; actor: string; configurationName: string }): AlertEvent[] {
    const alert = this.alerts.get(id);
    if (!alert || alert.actionDoneAtMs !== null) return [];
    alert.actionDoneAtMs = done.atMs;
    alert.actionDoneBy = done.by;
    const events: AlertEvent[] = [{ type: 'action-done', alert, atMs: done.atMs, by: done.by }];
    if (alert.acknowledgedAtMs === null) events.push(...this.acknowledge(id, { by: done.by, note: done.note ?? `Done: ${done.configurationName}`, atMs: done.atMs, actor: done.actor }));
    else if (alert.clearedAtMs !== null) this.alerts.delete(id);
    return events;
  }

  /**
   * What time has made due at `nowMs`: actions overdue (once each, unless `needsNoAction` says the
   * structure is already where the action takes it), then re-signals of unacknowledged alerts.
   */
  due(nowMs: number, resignalIntervalMs: number, needsNoAction: (alert: OpenAlert) => boolean): AlertEvent[] {
    if (!(Number.isFinite(resignalIntervalMs) && resignalIntervalMs > 0)) {
      throw new RangeError(`AlertBook.due: resignalIntervalMs must be a finite number > 0 ms, got ${resignalIntervalMs}`);
    }
    const events: AlertEvent[] = [];
    for (const alert of this.alerts.values()) {
      if (alert.actionDueAtMs === null || alert.actionDoneAtMs !== null || alert.overdueAtMs !== null || alert.clearedAtMs !== null || nowMs < alert.actionDueAtMs) continue;
      if (needsNoAction(alert)) continue;
      alert.overdueAtMs = nowMs;
      alert.lastSignalledAtMs = nowMs;
      events.push({ type: 'action-overdue', alert, atMs: nowMs });
    }
    for (const alert of this.alerts.values()) {
      if (alert.acknowledgedAtMs === null && nowMs - alert.lastSignalledAtMs >= resignalIntervalMs) {
        alert.lastSignalledAtMs = nowMs;
        events.push({ type: 'alert-resignalled', alert, atMs: nowMs });
      }
    }
    return events;
  }
}
