/**
 * The log's high-volume tables read for the CSV exports, in domain units (storedUnits.ts): speeds
 * in m/s, temperature in °C, pressure in Pa, directions in degrees (a minute's mean decoded from
 * its stored sums), utilization as a fraction (Infinity when no resistance was left).
 */
import { fromCmps, fromCmpsOrNull, fromDeciCOrNull, fromUtilizationE4, meanDirectionDeg } from './storedUnits.ts';
import type { Db } from './database.ts';
import type { ReadingRow } from './writeBatch.ts';

/** A stored reading as exported: named by its sensor's key, without the rollup's bookkeeping. */
export type ReadingExportRow = Omit<ReadingRow, 'sensorId' | 'rollupGustMps'> & { sensorKey: string };

export interface WindMinuteExportRow {
  sensorKey: string;
  minuteMs: number;
  samples: number;
  /** Null when the minute has no sample. */
  meanMps: number | null;
  maxGustMps: number;
  /** Null when no reading had a direction or the directions cancel out. */
  meanDirDeg: number | null;
}

export interface StructureMinuteExportRow {
  structureName: string;
  minuteMs: number;
  maxGustMps: number;
  /** Infinity: no resistance was left. */
  maxUtilization: number;
  maxLevel: number;
}

export interface LevelChangeExportRow {
  structureName: string;
  structureId: number;
  /** The structure's record as stored (JSON text), for the configuration it was registered in. */
  recordJson: string;
  atMs: number;
  fromLevel: number;
  toLevel: number;
  gustMps: number | null;
  utilization: number | null;
  noData: boolean;
  estimateLevel: number | null;
  estimateChance10: number | null;
  estimateChance30: number | null;
}

/** At most this many raw readings in one export. */
export const maxExportedReadings = 2_000_000;

export class LogExports {
  constructor(private readonly db: Db) {}

  readings(fromMs: number, toMs: number): ReadingExportRow[] {
    const rows = this.db.$client
      .prepare(
        `SELECT s.key, r.ts_ms, r.speed_cmps, r.gust_cmps, r.dir_deg, r.temp_deci_c, r.pressure_pa, r.rh_pct, r.flags
         FROM readings r JOIN sensors s ON s.id = r.sensor_id WHERE r.ts_ms >= ? AND r.ts_ms < ? ORDER BY r.ts_ms, s.key LIMIT ${maxExportedReadings}`,
      )
      .raw()
      .all(fromMs, toMs) as Array<[string, number, number, number | null, number | null, number | null, number | null, number | null, number]>;
    return rows.map((r) => ({ sensorKey: r[0], tsMs: r[1], speedMps: fromCmps(r[2]), gustMps: fromCmpsOrNull(r[3]), dirDeg: r[4], tempC: fromDeciCOrNull(r[5]), pressurePa: r[6], rhPct: r[7], late: (r[8] & 1) !== 0 }));
  }

  windMinutes(fromMs: number, toMs: number): WindMinuteExportRow[] {
    const rows = this.db.$client
      .prepare(
        `SELECT s.key, w.minute_ms, w.sample_count, w.speed_sum_cmps, w.max_gust_cmps, w.dir_sin_sum, w.dir_cos_sum, w.dir_count
         FROM wind_minutes w JOIN sensors s ON s.id = w.sensor_id WHERE w.minute_ms >= ? AND w.minute_ms < ? ORDER BY w.minute_ms, s.key`,
      )
      .raw()
      .all(fromMs, toMs) as Array<[string, number, number, number, number, number, number, number]>;
    return rows.map((r) => ({ sensorKey: r[0], minuteMs: r[1], samples: r[2], meanMps: r[2] > 0 ? fromCmps(r[3] / r[2]) : null, maxGustMps: fromCmps(r[4]), meanDirDeg: meanDirectionDeg(r[5], r[6], r[7]) }));
  }

  structureMinutes(fromMs: number, toMs: number): StructureMinuteExportRow[] {
    const rows = this.db.$client
      .prepare(
        `SELECT t.name, m.minute_ms, m.max_gust_cmps, m.max_utilization_e4, m.max_level
         FROM structure_minutes m JOIN structures t ON t.id = m.structure_id WHERE m.minute_ms >= ? AND m.minute_ms < ? ORDER BY m.minute_ms, t.name`,
      )
      .raw()
      .all(fromMs, toMs) as Array<[string, number, number, number, number]>;
    return rows.map((r) => ({ structureName: r[0], minuteMs: r[1], maxGustMps: fromCmps(r[2]), maxUtilization: fromUtilizationE4(r[3]), maxLevel: r[4] }));
  }

  levelChanges(fromMs: number, toMs: number): LevelChangeExportRow[] {
    const rows = this.db.$client
      .prepare(
        `SELECT t.name, c.at_ms, c.from_level, c.to_level, c.gust_mps, c.utilization, c.no_data, c.structure_id, t.record_json, c.estimate_level, c.estimate_chance_10, c.estimate_chance_30
         FROM level_changes c JOIN structures t ON t.id = c.structure_id WHERE c.at_ms >= ? AND c.at_ms < ? ORDER BY c.at_ms, c.id`,
      )
      .raw()
      .all(fromMs, toMs) as Array<[string, number, number, number, number | null, number | null, number, number, string, number | null, number | null, number | null]>;
    return rows.map((r) => ({
      structureName: r[0],
      atMs: r[1],
      fromLevel: r[2],
      toLevel: r[3],
      gustMps: r[4],
      utilization: r[5],
      noData: r[6] !== 0,
      structureId: r[7],
      recordJson: r[8],
      estimateLevel: r[9],
      estimateChance10: r[10],
      estimateChance30: r[11],
    }));
  }
}
