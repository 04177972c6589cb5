/**
 * The board's alerts, grouped by what they are about (a structure, or a sensor for sensor alerts),
 * so that a windy spell that raises Watch, Prepare and Stop for one structure shows as one card
 * with one action, not three.
 *
 * Within a group the alert shown in full is the most urgent unacknowledged one: the highest level
 * first, the newest for equal levels. A no-data alert whose condition still holds ranks above
 * every level: the wind there is unknown, and unknown is never treated as calm (the board lists
 * no-data structures first for the same reason).
 *
 * Groups in order: those with an unacknowledged alert whose condition still holds, most urgent
 * first; then those whose unacknowledged alerts have all ended; then those with only acknowledged
 * alerts still in force (shown compact).
 */
import type { OpenAlert } from './types.ts';

export interface AlertGroup {
  key: string;
  /** The structure's or sensor's name. */
  subject: string;
  /** The most urgent unacknowledged alert, shown in full; null when all are acknowledged. */
  head: OpenAlert | null;
  /** The other unacknowledged alerts of the group, oldest first: collapsed into one line. */
  rest: OpenAlert[];
  /** Acknowledged alerts whose condition is still in force, newest first: one line each. */
  acked: OpenAlert[];
  /** 0: an unacknowledged alert still in force; 1: unacknowledged, all ended; 2: acknowledged only. */
  tier: 0 | 1 | 2;
}

/** How urgent one alert is, for choosing the one shown in full and for ordering groups. */
export function alertUrgency(a: OpenAlert): number {
  if (a.kind === 'level') return a.level ?? 0;
  if (a.kind === 'no-data') return a.clearedAtMs === null ? Number.POSITIVE_INFINITY : 0;
  // A sensor silent or implausible: the structures it leaves without wind have alerts of their own.
  return a.clearedAtMs === null ? 0.5 : 0;
}

/** Most urgent first: highest level, then the newest. */
export function byAlertUrgency(a: OpenAlert, b: OpenAlert): number {
  return alertUrgency(b) - alertUrgency(a) || b.raisedAtMs - a.raisedAtMs;
}

export function alertGroupKey(a: OpenAlert): string {
  if (a.structureId !== null) return `structure-${a.structureId}`;
  if (a.sensorKey !== null) return `sensor-${a.sensorKey}`;
  return `alert-${a.id}`;
}

/** The alerts a board shows (open, or acknowledged and still in force), grouped and ordered. */
export function groupAlerts(alerts: readonly OpenAlert[]): AlertGroup[] {
  const byKey = new Map<string, OpenAlert[]>();
  for (const a of alerts) {
    if (a.acknowledgedAtMs !== null && a.clearedAtMs !== null) continue;
    const key = alertGroupKey(a);
    const list = byKey.get(key);
    if (list) list.push(a);
    else byKey.set(key, [a]);
  }
  const groups: Array<AlertGroup & { urgency: number; newestMs: number }> = [];
  for (const [key, list] of byKey) {
    const open = list.filter((a) => a.acknowledgedAtMs === null).sort(byAlertUrgency);
    const acked = list.filter((a) => a.acknowledgedAtMs !== null).sort((a, b) => b.raisedAtMs - a.raisedAtMs);
    const head = open[0] ?? null;
    const inForce = open.filter((a) => a.clearedAtMs === null);
    const tier = inForce.length > 0 ? 0 : open.length > 0 ? 1 : 2;
    // Groups are ranked by what still holds when something does: an ended Stop must not put a
    // structure above one whose Stop is in force now.
    const ranked = tier === 0 ? inForce : tier === 1 ? open : acked;
    groups.push({
      key,
      subject: (head ?? acked[0]!).subject,
      head,
      rest: open.slice(1).sort((a, b) => a.raisedAtMs - b.raisedAtMs),
      acked,
      tier,
      urgency: Math.max(...ranked.map(alertUrgency)),
      newestMs: Math.max(...list.map((a) => a.raisedAtMs)),
    });
  }
  groups.sort((a, b) => a.tier - b.tier || b.urgency - a.urgency || b.newestMs - a.newestMs);
  return groups.map(({ urgency: _u, newestMs: _n, ...g }) => g);
}

/** Alerts a group holds (shown in full, collapsed and compact). */
export const groupSize = (g: AlertGroup): number => (g.head ? 1 : 0) + g.rest.length + g.acked.length;
