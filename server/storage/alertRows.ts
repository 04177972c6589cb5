/**
 * The alert book's domain events (levels/alertBook.ts) as the rows one write batch stores: a raise
 * as an alert row, a clear, an acknowledgement, an action done and an overdue signal as their own
 * rows. A re-signal is not stored (the log keeps when an alert was raised, seen and ended).
 */
import type { AlertEvent } from '../levels/alertBook.ts';
import type { WriteBatch } from './writeBatch.ts';

export function alertEventRows(events: readonly AlertEvent[], siteId: number, batch: WriteBatch): void {
  for (const e of events) {
    switch (e.type) {
      case 'alert-raised': {
        const r = e.raised;
        batch.alerts.push({ id: e.alert.id, siteId, kind: r.kind, structureId: r.structureId, sensorId: r.sensorId, level: r.level, label: r.label, actionText: r.actionText, raisedAtMs: r.raisedAtMs, gustMps: r.gustMps, utilization: r.utilization, moveToConfiguration: r.moveToConfiguration });
        break;
      }
      case 'alert-cleared':
        batch.clearedAlerts.push({ id: e.alert.id, atMs: e.atMs });
        break;
      case 'alert-acknowledged':
        batch.acknowledgements.push({ alertId: e.alert.id, atMs: e.atMs, by: e.by, note: e.note, actor: e.actor });
        break;
      case 'action-done':
        batch.actionsDone.push({ alertId: e.alert.id, atMs: e.atMs, by: e.by });
        break;
      case 'action-overdue':
        batch.overdue.push({ alertId: e.alert.id, atMs: e.atMs });
        break;
      case 'alert-resignalled':
        break;
    }
  }
}
