/**
 * Live-hub alert events → notification events (design §4b, issue 16). The hub publishes `alert`
 * (`{...OpenAlert, resignal, overdue?}`) and `alert-update` (the alert after an acknowledgement,
 * a clear or its action done) after the commit; the tracker keeps each alert's last state so an
 * update says which field it set: an acknowledgement, a clear, or both.
 */
import type { LiveEventMap } from '../live/liveEvents.ts';
import type { OpenAlert } from '../watch/watch.ts';

export const notifyEventNames = ['alert.raised', 'alert.resignalled', 'alert.escalated', 'alert.acknowledged', 'alert.cleared', 'alert.overdue'] as const;
export type NotifyEventName = (typeof notifyEventNames)[number];

export interface NotifyEvent {
  event: NotifyEventName;
  atMs: number;
  alert: OpenAlert;
}

/** An alert record as the watch publishes it after its commit (live/liveEvents.ts): raised or signalled again, or updated. */
export type HubAlert = LiveEventMap['alert'] | (LiveEventMap['alert-update'] & { resignal?: undefined; overdue?: undefined });

export class AlertEventTracker {
  /** Each alert still open, as last seen (the escalation chain reads it too). */
  readonly open = new Map<number, OpenAlert>();

  /** The alerts open at start (rebuilt from the log), so their later updates are told apart. */
  seed(alerts: readonly OpenAlert[]): void {
    for (const a of alerts) this.open.set(a.id, { ...a });
  }

  take(kind: 'alert' | 'alert-update', alert: HubAlert): NotifyEvent[] {
    const { resignal, overdue, ...plain } = alert;
    const prev = this.open.get(alert.id);
    const out: NotifyEvent[] = [];
    if (kind === 'alert') {
      if (overdue === true) out.push({ event: 'alert.overdue', atMs: plain.overdueAtMs ?? plain.lastSignalledAtMs, alert: plain });
      else if (resignal === true) out.push({ event: 'alert.resignalled', atMs: plain.lastSignalledAtMs, alert: plain });
      else out.push({ event: 'alert.raised', atMs: plain.raisedAtMs, alert: plain });
    } else {
      if (plain.acknowledgedAtMs !== null && (prev === undefined || prev.acknowledgedAtMs === null)) out.push({ event: 'alert.acknowledged', atMs: plain.acknowledgedAtMs, alert: plain });
      if (plain.clearedAtMs !== null && (prev === undefined || prev.clearedAtMs === null)) out.push({ event: 'alert.cleared', atMs: plain.clearedAtMs, alert: plain });
    }
    if (plain.acknowledgedAtMs !== null && plain.clearedAtMs !== null) this.open.delete(plain.id);
    else this.open.set(plain.id, plain);
    return out;
  }
}
