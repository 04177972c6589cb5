/**
 * The alert book's committed domain events (levels/alertBook.ts `AlertEvent`, handed over by the
 * watch after their commit: watch/alertEventObservers.ts) → notification events (design §4b,
 * issue 16), in one place. An event says what happened, so nothing is worked out by comparing
 * states: a raise, a re-signal, an overdue action, an acknowledgement and a clear each give one
 * notification event; an action marked done gives none of its own (the acknowledgement it brings,
 * when nobody had acknowledged, is an event of its own).
 */
import type { AlertEvent } from '../levels/alertBook.ts';
import type { OpenAlert } from '../watch/watch.ts';

export const notifyEventNames = ['alert.raised', 'alert.resignalled', 'alert.escalated', 'alert.acknowledged', 'alert.cleared', 'alert.overdue'] as const;
export type NotifyEventName = (typeof notifyEventNames)[number];

export interface NotifyEvent {
  event: NotifyEventName;
  atMs: number;
  alert: OpenAlert;
}

/** The notification event of one alert event, or null (an action done); `alert` is the alert as it stands after the commit. */
export function notifyEventOf(e: AlertEvent, alert: OpenAlert): NotifyEvent | null {
  switch (e.type) {
    case 'alert-raised':
      return { event: 'alert.raised', atMs: alert.raisedAtMs, alert };
    case 'alert-resignalled':
      return { event: 'alert.resignalled', atMs: e.atMs, alert };
    case 'action-overdue':
      return { event: 'alert.overdue', atMs: e.atMs, alert };
    case 'alert-acknowledged':
      return { event: 'alert.acknowledged', atMs: e.atMs, alert };
    case 'alert-cleared':
      return { event: 'alert.cleared', atMs: e.atMs, alert };
    case 'action-done':
      return null;
  }
}

/**
 * The alerts open as committed (the escalation chain reads them): seeded with the alerts restored
 * at start (which are never notified as raised again), kept by the committed events.
 */
export class CommittedAlerts {
  readonly open = new Map<number, OpenAlert>();

  seed(alerts: readonly OpenAlert[]): void {
    for (const a of alerts) this.open.set(a.id, { ...a });
  }

  /** Committed events → notification events, each with a copy of its alert as it stands now (after the commit). */
  take(events: readonly AlertEvent[]): NotifyEvent[] {
    const out: NotifyEvent[] = [];
    for (const e of events) {
      const alert = { ...e.alert };
      const n = notifyEventOf(e, alert);
      if (n) out.push(n);
      if (alert.acknowledgedAtMs !== null && alert.clearedAtMs !== null) this.open.delete(alert.id);
      else this.open.set(alert.id, alert);
    }
    return out;
  }
}
