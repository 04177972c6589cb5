/**
 * What one group commit writes: the readings of every message in it, and what they caused
 * (per-minute rollups of wind and of structure assessments, level changes, alerts). Built in
 * memory on the per-message path, written in one transaction by `WriteQueue`.
 */
import type { NewAlert } from '../levels/alertBook.ts';
import type { StructureEvent } from '../watch/watchEvents.ts';
export interface ReadingRow {
  sensorId: number;
  tsMs: number;
  /** A sample, or the mean of a summary. */
  speedMps: number;
  gustMps: number | null;
  dirDeg: number | null;
  tempC: number | null;
  pressurePa: number | null;
  rhPct: number | null;
  /** Arrived in a buffered batch: stored, never used to trigger alerts. */
  late: boolean;
  /** The gust this reading stands for in the per-minute rollup (3-s running mean, or the summary's gust). */
  rollupGustMps: number;
}

export interface StructureMinuteRow {
  structureId: number;
  minuteMs: number;
  gustMps: number;
  /** Governing utilization; Infinity when resistance is gone (stored as a large sentinel). */
  utilization: number;
  level: number;
}

export interface LevelChangeRow {
  structureId: number;
  atMs: number;
  fromLevel: number;
  toLevel: number;
  gustMps: number | null;
  utilization: number | null;
  noData: boolean;
  /** The estimate in force just before a rise: the level it was for and its chances within 10 and 30 min (foresight). */
  estimate?: { level: number; chance10: number; chance30: number } | null;
}

/**
 * An alert as stored: the alert book's raise (levels/alertBook.ts `NewAlert`) with its id, given
 * by the live watch so an alert can be shown and acknowledged before it is stored, and its site.
 */
export type AlertRow = Omit<NewAlert, 'sensorKey' | 'subject'> & { id: number; siteId: number };

/** A structure's live configuration switched (design §2.5): the watch's event (watch/watchEvents.ts) as stored. */
export type ConfigurationChangeRow = Omit<Extract<StructureEvent, { type: 'configuration-changed' }>, 'type'>;

export interface AcknowledgementRow {
  alertId: number;
  atMs: number;
  by: string;
  note: string | null;
  /** Who, for the audit trail (the signed-in principal). */
  actor: string;
}

/** Everything written in one transaction. */
export interface WriteBatch {
  readings: ReadingRow[];
  structureMinutes: StructureMinuteRow[];
  levelChanges: LevelChangeRow[];
  alerts: AlertRow[];
  /** Alerts cleared by this batch (the condition ended). */
  clearedAlerts: Array<{ id: number; atMs: number }>;
  acknowledgements: AcknowledgementRow[];
  configurationChanges: ConfigurationChangeRow[];
  /** Level alerts whose action was marked done. */
  actionsDone: Array<{ alertId: number; atMs: number; by: string }>;
  /** Level alerts whose action was signalled again as overdue. */
  overdue: Array<{ alertId: number; atMs: number }>;
}

export function emptyWriteBatch(): WriteBatch {
  return { readings: [], structureMinutes: [], levelChanges: [], alerts: [], clearedAlerts: [], acknowledgements: [], configurationChanges: [], actionsDone: [], overdue: [] };
}

/** The batch of acknowledgements (the board, an e-mail link, a push button, the demo crew): stored before the watch marks them. */
export function acknowledgementBatch(...rows: AcknowledgementRow[]): WriteBatch {
  return { ...emptyWriteBatch(), acknowledgements: rows };
}

/** Every field of a batch is a list of rows: a field of another type fails the type check here. */
type ListsOnly<T> = { [K in keyof T]: T[K] extends readonly unknown[] ? T[K] : never };
const everyBatchFieldIsAList: WriteBatch extends ListsOnly<WriteBatch> ? true : never = true;
void everyBatchFieldIsAList;

/** Rows of every kind in the batch (every field is a list of rows, so a new kind is counted without a change here). */
export function batchRowCount(batch: WriteBatch): number {
  // for-in, not Object.values: the queue counts every message's batch at each commit, and this allocates nothing.
  let rows = 0;
  for (const field in batch) rows += (batch as unknown as Record<string, unknown[]>)[field]!.length;
  return rows;
}
