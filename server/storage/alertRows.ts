/**
 * The alert book's domain events (levels/alertBook.ts) as the rows one write batch stores: a raise
 * as an alert row, a clear, an acknowledgement, an action done and an overdue signal as their own
 * rows. A re-signal is not stored (the log keeps when an alert was raised, seen and ended).
 */
import { actionDueAtMs, type AlertEvent, type OpenAlert } from '../levels/alertBook.ts';
import type { StoredAlert } from './alerts.ts';
import type { WriteBatch } from './writeBatch.ts';

/**
 * A stored alert still open, as the alert book holds it after a restart: its sensor's key and the
 * subject's name from the register, its action's due time from the site's action time.
 */
export function openAlertOfRow(r: StoredAlert, context: { sensor: { key: string; name: string } | undefined; structureName: string | undefined; actionDueMs: number }): OpenAlert {
  const { sensor } = context;
  return {
    id: r.id,
    kind: r.kind as OpenAlert['kind'],
    structureId: r.structureId,
    sensorKey: sensor?.key ?? null,
    level: r.level,
    label: r.label,
    actionText: r.actionText,
    raisedAtMs: r.raisedAtMs,
    gustMps: r.gustMps,
    utilization: r.utilization,
    lastSignalledAtMs: r.raisedAtMs,
    clearedAtMs: r.clearedAtMs,
    acknowledgedAtMs: r.acknowledgedAtMs,
    acknowledgedBy: r.acknowledgedBy,
    acknowledgeNote: r.acknowledgeNote,
    subject: r.structureId !== null ? (context.structureName ?? `structure ${r.structureId}`) : (sensor?.name ?? 'sensor'),
    moveToConfiguration: r.moveToConfiguration,
    actionDoneAtMs: r.actionDoneAtMs,
    actionDoneBy: r.actionDoneBy,
    actionDueAtMs: actionDueAtMs(r.raisedAtMs, r.moveToConfiguration, context.actionDueMs),
    overdueAtMs: r.overdueAtMs,
  };
}

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
