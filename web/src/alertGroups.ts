/**
 * The board's alerts, one group per structure (or per sensor for sensor alerts), so that a windy
 * spell that raises Watch, Prepare and Stop for one structure shows as one card with one action,
 * not three.
 *
 * A structure's card always leads with the structure's CURRENT level (from its live state) and
 * that level's action, acknowledged or not (design §2.6): an acknowledgement never hides the level
 * in force, and a lower alert still waiting for acknowledgement never takes the lead from it. The
 * other alerts of the structure are folded into the card: lower or earlier levels, levels whose
 * condition has ended. No-data alerts are never folded: they are shown in full, because the wind
 * there is unknown and unknown is never treated as calm. Sensor alerts have cards of their own.
 *
 * Groups in order: those with an unacknowledged alert whose condition still holds, most urgent
 * first (no data, then the highest current level, then one whose current level is still to be
 * acknowledged, then the newest); then those whose
 * unacknowledged alerts have all ended; then those whose alerts are all acknowledged and still in
 * force.
 */
import type { OpenAlert, StructureState } from './types.ts';

/** What a structure's card leads with: its level now and that level's action. */
export interface CurrentLevel {
  /** 0 = below every level. */
  level: number;
  label: string | null;
  /** The competent person's action for this level; null below every level or when not known. */
  actionText: string | null;
  /** Levels in the structure's ladder (for its shape and colour). */
  levelCount: number;
  /** No live reading reaches the structure: the wind there is unknown. */
  noData: boolean;
  /** When this level was reached (ms), when known. */
  sinceMs: number | null;
}

export interface StructureAlertGroup {
  kind: 'structure';
  key: string;
  structureId: number;
  /** The structure's name. */
  subject: string;
  current: CurrentLevel;
  /** The alert of the current level that is still in force (acknowledged or not), if any. */
  currentAlert: OpenAlert | null;
  /** No-data alerts of the structure: shown in full, never folded. */
  noDataAlerts: OpenAlert[];
  /** The structure's other level alerts, highest level first: folded into the card. */
  folded: OpenAlert[];
  /** Every alert of the group not yet acknowledged (what "Acknowledge all" sends). */
  toAcknowledge: OpenAlert[];
  tier: 0 | 1 | 2;
}

export interface SensorAlertGroup {
  kind: 'sensor';
  key: string;
  sensorKey: string;
  subject: string;
  /** Every open alert of the sensor, newest first: all shown in full. */
  alerts: OpenAlert[];
  toAcknowledge: OpenAlert[];
  tier: 0 | 1 | 2;
}

export type AlertGroup = StructureAlertGroup | SensorAlertGroup;

/** How urgent one alert is, for ordering. */
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

/** The level a structure is at now, from its live state or (a structure no longer in the register) from its alerts. */
function currentLevelOf(state: StructureState | undefined, alerts: readonly OpenAlert[]): CurrentLevel {
  if (state) {
    const def = state.level > 0 ? state.levels.find((l) => l.level === state.level) : undefined;
    return {
      level: state.level,
      label: state.level > 0 ? (def?.label ?? state.levelLabel) : null,
      actionText: def?.actionText ?? null,
      levelCount: state.levels.length,
      noData: state.noData,
      sinceMs: state.level > 0 ? state.levelSinceMs : null,
    };
  }
  const levelAlerts = alerts.filter((a) => a.kind === 'level');
  const inForce = levelAlerts.filter((a) => a.clearedAtMs === null).sort(byAlertUrgency)[0];
  const highest = Math.max(0, ...levelAlerts.map((a) => a.level ?? 0));
  return {
    level: inForce?.level ?? 0,
    label: inForce?.label ?? null,
    actionText: inForce?.actionText ?? null,
    levelCount: Math.max(highest, 3),
    noData: alerts.some((a) => a.kind === 'no-data' && a.clearedAtMs === null),
    sinceMs: inForce?.raisedAtMs ?? null,
  };
}

function tierOf(list: readonly OpenAlert[]): 0 | 1 | 2 {
  const open = list.filter((a) => a.acknowledgedAtMs === null);
  if (open.some((a) => a.clearedAtMs === null)) return 0;
  return open.length > 0 ? 1 : 2;
}

/**
 * The alerts a board shows (open, or acknowledged and still in force), grouped and ordered.
 * `structures` is the live state of the site's structures: each structure's card leads with its
 * level from there.
 */
export function groupAlerts(alerts: readonly OpenAlert[], structures: readonly StructureState[] = []): AlertGroup[] {
  const byKey = new Map<string, OpenAlert[]>();
  for (const a of alerts) {
    if (a.acknowledgedAtMs !== null && a.clearedAtMs !== null) continue;
    const key = alertGroupKey(a);
    const list = byKey.get(key);
    if (list) list.push(a);
    else byKey.set(key, [a]);
  }
  const stateById = new Map(structures.map((s) => [s.id, s]));
  const groups: Array<{ group: AlertGroup; urgency: number; newestMs: number }> = [];
  for (const [key, list] of byKey) {
    const tier = tierOf(list);
    const toAcknowledge = list.filter((a) => a.acknowledgedAtMs === null).sort(byAlertUrgency);
    const newestMs = Math.max(...list.map((a) => a.raisedAtMs));
    const first = list[0]!;
    if (first.structureId !== null) {
      const state = stateById.get(first.structureId);
      const current = currentLevelOf(state, list);
      // The alert of the level in force now: the newest still in force at that level.
      const currentAlert =
        current.level > 0
          ? (list.filter((a) => a.kind === 'level' && a.level === current.level && a.clearedAtMs === null).sort((a, b) => b.raisedAtMs - a.raisedAtMs)[0] ?? null)
          : null;
      const noDataAlerts = list.filter((a) => a.kind !== 'level').sort((a, b) => b.raisedAtMs - a.raisedAtMs);
      const folded = list.filter((a) => a.kind === 'level' && a !== currentAlert).sort((a, b) => (b.level ?? 0) - (a.level ?? 0) || b.raisedAtMs - a.raisedAtMs);
      // Ranked by what holds now: no data first, then the level in force; an ended Stop must not
      // put a structure above one whose Stop is in force now.
      const urgency = current.noData ? Number.POSITIVE_INFINITY : current.level;
      groups.push({
        group: { kind: 'structure', key, structureId: first.structureId, subject: state?.name ?? first.subject, current, currentAlert, noDataAlerts, folded, toAcknowledge, tier },
        urgency,
        newestMs,
      });
    } else {
      const sorted = [...list].sort((a, b) => b.raisedAtMs - a.raisedAtMs);
      const urgency = Math.max(...list.map(alertUrgency));
      groups.push({
        group: { kind: 'sensor', key, sensorKey: first.sensorKey ?? key, subject: first.subject, alerts: sorted, toAcknowledge, tier },
        urgency,
        newestMs,
      });
    }
  }
  // Equal otherwise, a card whose level in force still waits for acknowledgement comes first;
  // then the newest, then by name, so cards do not swap places between updates.
  const currentWaits = (g: AlertGroup): number => (g.kind === 'structure' && g.currentAlert !== null && g.currentAlert.acknowledgedAtMs === null ? 1 : 0);
  groups.sort(
    (a, b) =>
      a.group.tier - b.group.tier || b.urgency - a.urgency || currentWaits(b.group) - currentWaits(a.group) || b.newestMs - a.newestMs || a.group.subject.localeCompare(b.group.subject),
  );
  return groups.map((g) => g.group);
}

/**
 * Whether a group may wait behind the board's "Show more" expander: never a sensor's, never one
 * without data, never one at its structure's top level.
 */
export function mayFold(g: AlertGroup): boolean {
  if (g.kind === 'sensor') return false;
  if (g.current.noData || g.noDataAlerts.length > 0) return false;
  return g.current.level < g.current.levelCount;
}

/** Every alert a group holds. */
export const groupSize = (g: AlertGroup): number => (g.kind === 'sensor' ? g.alerts.length : (g.currentAlert ? 1 : 0) + g.noDataAlerts.length + g.folded.length);
