/**
 * The log of the plan's actions (design §2.5, §2.8): every switch of a structure's live
 * configuration (who, when, from → to, the note, and whether it was a level alert's action
 * marked "Done" or a switch by hand), every action signalled again as overdue, and which
 * configuration a structure stood in at a given moment. Read from `configuration_changes` and the
 * alerts' action columns, which the write queue fills on the live path (watch.ts
 * `switchConfiguration` and the tick's overdue signal).
 */
import type { Db } from './database.ts';

/** One switch of a structure's live configuration. */
export interface ConfigurationChangeEntry {
  id: number;
  atMs: number;
  structureId: number;
  /** The structure's name on the register now; null when the id is not (or no longer) there. */
  structureName: string | null;
  from: string;
  to: string;
  /** Who switched it (display name). */
  by: string;
  note: string | null;
  /** The level alert whose action this was ("Done"); null for a switch by hand. */
  alertId: number | null;
  reason: 'action-done' | 'by-hand';
  /** The alert's level and label (the action's name, "Lower the screen"), when it was one. */
  alertLevel: number | null;
  alertLabel: string | null;
  /** When that alert was raised: the action came this long after it. */
  alertRaisedAtMs: number | null;
  /** When the action had been signalled again as overdue before it was done; null when it was done in time. */
  alertOverdueAtMs: number | null;
}

/** A level alert's action (moving the structure to another configuration) signalled again as not done in time. */
export interface OverdueSignalEntry {
  /** When it was signalled again. */
  atMs: number;
  alertId: number;
  structureId: number | null;
  structureName: string | null;
  level: number | null;
  /** The level's label: the action's name ("Lower the screen"). */
  label: string;
  actionText: string;
  moveToConfiguration: string | null;
  raisedAtMs: number;
  /** When the action was marked done in the end, and by whom; null: not (yet). */
  actionDoneAtMs: number | null;
  actionDoneBy: string | null;
}

function structureNames(db: Db): Map<number, string> {
  const rows = db.$client.prepare('SELECT id, name FROM structures').all() as Array<{ id: number; name: string }>;
  return new Map(rows.map((r) => [r.id, r.name]));
}

/** The configuration switches in [fromMs, toMs), oldest first; of one structure when `structureId` is given. */
export function configurationChangesInWindow(db: Db, fromMs: number, toMs: number, structureId?: number): ConfigurationChangeEntry[] {
  const rows = db.$client
    .prepare(
      `SELECT c.id, c.at_ms AS atMs, c.structure_id AS structureId, c.from_name AS "from", c.to_name AS "to", c.by, c.note, c.alert_id AS alertId, c.reason,
              a.level AS alertLevel, a.label AS alertLabel, a.raised_at_ms AS alertRaisedAtMs, a.overdue_at_ms AS alertOverdueAtMs
       FROM configuration_changes c LEFT JOIN alerts a ON a.id = c.alert_id
       WHERE c.at_ms >= @from AND c.at_ms < @to AND (@structure IS NULL OR c.structure_id = @structure)
       ORDER BY c.at_ms, c.id LIMIT 20000`,
    )
    .all({ from: fromMs, to: toMs, structure: structureId ?? null }) as Array<Omit<ConfigurationChangeEntry, 'structureName'>>;
  const names = structureNames(db);
  return rows.map((r) => ({ ...r, reason: r.reason === 'action-done' ? 'action-done' : 'by-hand', structureName: names.get(r.structureId) ?? null }));
}

/** The overdue signals in [fromMs, toMs) (by the time they were signalled), oldest first; of one structure when `structureId` is given. */
export function overdueSignalsInWindow(db: Db, fromMs: number, toMs: number, structureId?: number): OverdueSignalEntry[] {
  const rows = db.$client
    .prepare(
      `SELECT overdue_at_ms AS atMs, id AS alertId, structure_id AS structureId, level, label, action_text AS actionText, move_to_configuration AS moveToConfiguration,
              raised_at_ms AS raisedAtMs, action_done_at_ms AS actionDoneAtMs, action_done_by AS actionDoneBy
       FROM alerts WHERE overdue_at_ms IS NOT NULL AND overdue_at_ms >= @from AND overdue_at_ms < @to AND (@structure IS NULL OR structure_id = @structure)
       ORDER BY overdue_at_ms, id LIMIT 20000`,
    )
    .all({ from: fromMs, to: toMs, structure: structureId ?? null }) as Array<Omit<OverdueSignalEntry, 'structureName'>>;
  const names = structureNames(db);
  return rows.map((r) => ({ ...r, structureName: r.structureId === null ? null : (names.get(r.structureId) ?? null) }));
}

/** One switch as the history takes it: structure, time, the configuration switched to. */
export interface ConfigurationSwitch {
  s: number;
  atMs: number;
  to: string;
}

/** Every switch before `beforeMs`, oldest first. */
export function configurationSwitchesBefore(db: Db, beforeMs: number): ConfigurationSwitch[] {
  return db.$client.prepare('SELECT structure_id AS s, at_ms AS atMs, to_name AS "to" FROM configuration_changes WHERE at_ms < ? ORDER BY at_ms, id').all(beforeMs) as ConfigurationSwitch[];
}

/**
 * Which configuration each structure stood in at a moment, from the log: the target of its last
 * switch at or before that moment, else null (never switched by then: as registered, whose name
 * the record gives). A switch and the level change it caused share their time, so a level change
 * is reported in the configuration it was assessed in.
 */
export class ConfigurationHistory {
  private readonly byStructure = new Map<number, Array<{ atMs: number; to: string }>>();

  /** From the switches, oldest first (configurationSwitchesBefore). */
  constructor(rows: readonly ConfigurationSwitch[]) {
    for (const r of rows) {
      const list = this.byStructure.get(r.s) ?? [];
      list.push({ atMs: r.atMs, to: r.to });
      this.byStructure.set(r.s, list);
    }
  }

  /** The configuration's name at `atMs`, or null when the log records no switch of the structure by then. */
  at(structureId: number, atMs: number): string | null {
    const list = this.byStructure.get(structureId);
    if (!list) return null;
    let name: string | null = null;
    for (const change of list) {
      if (change.atMs > atMs) break;
      name = change.to;
    }
    return name;
  }
}

/** Each structure's last configuration switch (after a restart it is assessed as it stands). */
export function lastConfigurations(db: Db): Map<number, { name: string; atMs: number; by: string }> {
  const rows = db.$client
    .prepare(
      `SELECT structure_id AS id, to_name AS name, at_ms AS atMs, by FROM (
         SELECT structure_id, to_name, at_ms, by, ROW_NUMBER() OVER (PARTITION BY structure_id ORDER BY at_ms DESC, id DESC) AS rn FROM configuration_changes
       ) WHERE rn = 1`,
    )
    .all() as Array<{ id: number; name: string; atMs: number; by: string }>;
  return new Map(rows.map((r) => [r.id, { name: r.name, atMs: r.atMs, by: r.by }]));
}
