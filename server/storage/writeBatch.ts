/**
 * What one group commit writes: the readings of every message in it, and what they caused
 * (per-minute rollups of wind and of structure assessments, level changes, alerts). Built in
 * memory on the per-message path, written in one transaction by `WriteQueue`.
 */
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
}

export interface AlertRow {
  siteId: number;
  kind: 'level' | 'no-data' | 'sensor-silent' | 'sensor-implausible';
  structureId: number | null;
  sensorId: number | null;
  level: number | null;
  label: string;
  actionText: string;
  raisedAtMs: number;
  gustMps: number | null;
  utilization: number | null;
}

/** Everything written in one transaction. Alerts get their ids through `onAlertIds`. */
export interface WriteBatch {
  readings: ReadingRow[];
  structureMinutes: StructureMinuteRow[];
  levelChanges: LevelChangeRow[];
  alerts: AlertRow[];
  /** Alerts cleared by this batch (the condition ended). */
  clearedAlerts: Array<{ id: number; atMs: number }>;
  /** Called inside the transaction with the ids given to `alerts`, in order. */
  onAlertIds?: (ids: number[]) => void;
}

export function emptyWriteBatch(): WriteBatch {
  return { readings: [], structureMinutes: [], levelChanges: [], alerts: [], clearedAlerts: [] };
}
