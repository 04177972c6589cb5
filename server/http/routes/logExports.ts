/**
 * The log's CSV exports (GET /api/export/<table>.csv, logRoutes.ts): one table per stored log,
 * every time on the site's clock and in UTC, every figure with its unit and rounded to what the
 * instruments resolve. README "CSV exports" lists the columns.
 */
import { registeredConfigurationName, type StructureRecord } from '../../engine/index.ts';
import { toCsv } from '../../register/csv.ts';
import { getSite } from '../../register/site.ts';
import type { ApiContext } from './apiContext.ts';
import { LocalTimes } from './zonedDay.ts';

export const csvTables = ['readings', 'wind-minutes', 'structure-minutes', 'level-changes', 'alerts', 'audit', 'configuration-changes'] as const;

/** The name of a stored record's configuration as registered (engine/configuration.ts). */
function registeredNameOf(json: string): string {
  try {
    const record = JSON.parse(json) as unknown;
    if (record !== null && typeof record === 'object') return registeredConfigurationName(record as StructureRecord);
  } catch {
    // A record that is not JSON cannot be assessed either: it stood as registered.
  }
  return registeredConfigurationName({});
}

/** A figure rounded to `decimals` places, as text ("" for none); never "-0.0". */
export function rounded(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  const f = 10 ** decimals;
  const r = Math.round(value * f) / f;
  return (r === 0 ? 0 : r).toFixed(decimals);
}

/** A utilization (fraction of capacity) in tenths of a per cent, or null. */
const tenthsPct = (fraction: number | null | undefined): number | null => (fraction === null || fraction === undefined || !Number.isFinite(fraction) ? null : Math.round(fraction * 1000));
/** A utilization as % of capacity, to 0.1 %. */
const pct = (fraction: number | null | undefined): string => rounded(tenthsPct(fraction) === null ? null : tenthsPct(fraction)! / 10, 1);
/** The margin left as % of capacity, to 0.1 %: 100 − the rounded utilization, so the two always add up; negative past the limit. */
const marginPct = (fraction: number | null | undefined): string => rounded(tenthsPct(fraction) === null ? null : (1000 - tenthsPct(fraction)!) / 10, 1);

/**
 * The CSV exports. Every time is given twice: on the site's clock (`*_local`, "YYYY-MM-DD
 * HH:MM:SS" in the site's time zone, which spreadsheets read as a date and time) and in UTC
 * (`*_utc`, ISO 8601 with milliseconds, unambiguous also in the hour the clocks go back). Every
 * figure carries its unit in the column name and is rounded to what the instruments resolve:
 * speeds to 0.1 m/s, utilization and margin to 0.1 % of capacity, directions to 1°, temperature
 * to 0.1 °C, pressure to 0.1 hPa, humidity to 1 %. README "CSV exports" lists the columns.
 */
export async function exportCsv(ctx: Pick<ApiContext, 'storage'>, table: (typeof csvTables)[number], fromMs: number, toMs: number, timeZone: string): Promise<string> {
  const { storage } = ctx;
  const local = new LocalTimes(timeZone);
  const iso = (ms: number | null) => (ms === null ? '' : new Date(ms).toISOString());
  const loc = (ms: number | null) => (ms === null ? '' : local.dateTime(ms));
  switch (table) {
    case 'readings': {
      return toCsv(
        ['sensor', 'time_local', 'time_utc', 'speed_mps', 'gust_mps', 'dir_from_deg', 'temp_c', 'pressure_hpa', 'rh_pct', 'late'],
        (await storage.log.exports.readings(fromMs, toMs)).map((r) => [r.sensorKey, loc(r.tsMs), iso(r.tsMs), rounded(r.speedMps, 1), rounded(r.gustMps, 1), rounded(r.dirDeg, 0), rounded(r.tempC, 1), r.pressurePa === null ? '' : rounded(r.pressurePa / 100, 1), rounded(r.rhPct, 0), r.late ? 'yes' : '']),
      );
    }
    case 'wind-minutes': {
      return toCsv(
        ['sensor', 'minute_local', 'minute_utc', 'samples', 'mean_mps', 'max_gust_mps', 'mean_dir_from_deg'],
        (await storage.log.exports.windMinutes(fromMs, toMs)).map((r) => {
          // A bearing that rounds up to 360° is north, written 0.
          const dir = rounded(r.meanDirDeg, 0);
          return [r.sensorKey, loc(r.minuteMs), iso(r.minuteMs), r.samples, rounded(r.meanMps, 1), rounded(r.maxGustMps, 1), dir === '360' ? '0' : dir];
        }),
      );
    }
    case 'structure-minutes': {
      return toCsv(
        ['structure', 'minute_local', 'minute_utc', 'max_gust_mps', 'max_utilization_pct', 'min_margin_pct', 'max_level'],
        (await storage.log.exports.structureMinutes(fromMs, toMs)).map((r) => {
          // An infinite utilization: no resistance was left.
          const unbounded = !Number.isFinite(r.maxUtilization);
          return [r.structureName, loc(r.minuteMs), iso(r.minuteMs), rounded(r.maxGustMps, 1), unbounded ? 'unbounded' : pct(r.maxUtilization), unbounded ? 'none' : marginPct(r.maxUtilization), r.maxLevel];
        }),
      );
    }
    case 'level-changes': {
      const rows = await storage.log.exports.levelChanges(fromMs, toMs);
      // The configuration each change was assessed in (design §2.5): the log's last switch at or before it, else the one as registered.
      const history = await storage.log.configurationHistory(toMs);
      const registered = new Map<number, string>();
      const registeredName = (id: number, json: string): string => {
        let name = registered.get(id);
        if (name === undefined) {
          name = registeredNameOf(json);
          registered.set(id, name);
        }
        return name;
      };
      return toCsv(
        ['structure', 'time_local', 'time_utc', 'event', 'from_level', 'to_level', 'gust_mps', 'utilization_pct', 'margin_pct', 'configuration', 'estimate_level', 'estimate_chance_10min_pct', 'estimate_chance_30min_pct'],
        rows.map((r) => [
          r.structureName, loc(r.atMs), iso(r.atMs), r.noData ? 'no data' : r.toLevel > r.fromLevel ? 'raised' : r.toLevel < r.fromLevel ? 'lowered' : 'data back', r.fromLevel, r.toLevel, rounded(r.gustMps, 1), pct(r.utilization), marginPct(r.utilization), history.at(r.structureId, r.atMs) ?? registeredName(r.structureId, r.recordJson),
          r.estimateLevel ?? '', r.estimateChance10 === null ? '' : rounded(r.estimateChance10 * 100, 1), r.estimateChance30 === null ? '' : rounded(r.estimateChance30 * 100, 1),
        ]),
      );
    }
    case 'alerts': {
      const rows = await storage.alerts.raisedInWindow(fromMs, toMs);
      const names = await storage.structures.names();
      const sensorNames = new Map((await storage.sensors.all()).map((s) => [s.id, s.key]));
      const actionDueMs = (await getSite(storage)).actionDueMs;
      return toCsv(
        [
          'id', 'kind', 'structure', 'sensor', 'level', 'label', 'raised_local', 'raised_utc', 'gust_mps', 'utilization_pct', 'acknowledged_local', 'acknowledged_utc', 'acknowledged_by', 'note', 'cleared_local', 'cleared_utc', 'action',
          // Issue 14 (design §2.5): the action that moves the structure, when it was marked done and by whom, and whether it was signalled as overdue.
          'move_to_configuration', 'action_done_local', 'action_done_utc', 'action_done_by', 'overdue_local', 'overdue_utc', 'action_late',
        ],
        rows.map((a) => [
          a.id,
          a.kind,
          a.structureId === null ? '' : (names.get(a.structureId) ?? a.structureId),
          a.sensorId === null ? '' : (sensorNames.get(a.sensorId) ?? a.sensorId),
          a.level ?? '',
          a.label,
          loc(a.raisedAtMs),
          iso(a.raisedAtMs),
          rounded(a.gustMps, 1),
          pct(a.utilization),
          loc(a.acknowledgedAtMs),
          iso(a.acknowledgedAtMs),
          a.acknowledgedBy ?? '',
          a.acknowledgeNote ?? '',
          loc(a.clearedAtMs),
          iso(a.clearedAtMs),
          a.actionText,
          a.moveToConfiguration ?? '',
          loc(a.actionDoneAtMs),
          iso(a.actionDoneAtMs),
          a.actionDoneBy ?? '',
          loc(a.overdueAtMs),
          iso(a.overdueAtMs),
          a.moveToConfiguration === null ? '' : a.overdueAtMs !== null || (a.actionDoneAtMs !== null && a.actionDoneAtMs - a.raisedAtMs > actionDueMs) ? 'yes' : 'no',
        ]),
      );
    }
    case 'configuration-changes': {
      const rows = await storage.log.configurationChanges(fromMs, toMs);
      return toCsv(
        ['structure', 'time_local', 'time_utc', 'from', 'to', 'reason', 'by', 'alert_id', 'alert_level', 'alert_label', 'after_alert_min', 'signalled_overdue', 'note'],
        rows.map((r) => [
          r.structureName ?? r.structureId,
          loc(r.atMs),
          iso(r.atMs),
          r.from,
          r.to,
          r.reason === 'action-done' ? 'action done' : 'by hand',
          r.by,
          r.alertId ?? '',
          r.alertLevel ?? '',
          r.alertLabel ?? '',
          r.alertRaisedAtMs === null ? '' : rounded((r.atMs - r.alertRaisedAtMs) / 60_000, 1),
          r.alertId === null ? '' : r.alertOverdueAtMs !== null && r.alertOverdueAtMs <= r.atMs ? 'yes' : 'no',
          r.note ?? '',
        ]),
      );
    }
    case 'audit': {
      const rows = await storage.audit.inWindow(fromMs, toMs);
      return toCsv(
        ['time_local', 'time_utc', 'who', 'what', 'id', 'action', 'before', 'after'],
        rows.map((r) => [loc(r.atMs), iso(r.atMs), r.actor, r.entity, r.entityId, r.action, r.beforeJson === null ? '' : JSON.stringify(r.beforeJson), r.afterJson === null ? '' : JSON.stringify(r.afterJson)]),
      );
    }
  }
}
