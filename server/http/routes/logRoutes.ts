/**
 * Review and planning: wind and utilization history (downsampled), level changes, alerts and
 * acknowledgements, the audit trail, the summary of a day, CSV exports of every log table, and
 * the forecast check. All need the viewer role.
 *
 * Windows: `from` and `to` as epoch milliseconds or ISO 8601; or `day=YYYY-MM-DD`, a calendar day
 * in the site's time zone. Default: the last 24 hours. At most 62 days at a time.
 */
import { Hono, type MiddlewareHandler } from 'hono';
import { and, asc, eq, gte, lt } from 'drizzle-orm';
import { z } from 'zod';
import { alertsTable, auditTable, levelChangesTable, sensorsTable, structuresTable } from '../../../db/schema.ts';
import { gustHeightFactor, recordConfigurations, registeredConfigurationName, type StructureRecord, type TerrainCategory } from '../../engine/index.ts';
import { dateOrders, parseForecastTable, predictLevels, predictPlannedLevels, forecastSpeedUnits, type ForecastPlannedStructure, type LevelDefinition } from '../../levels/index.ts';
import { densityDependent, structureModel, triggerLadderMps } from '../../watch/structureModel.ts';
import type { StructureState } from '../../watch/watch.ts';
import { toCsv } from '../../register/csv.ts';
import { getSite } from '../../register/site.ts';
import { getSensor } from '../../register/sensors.ts';
import { getStructureRow } from '../../register/structures.ts';
import { daySummary, sensorsInWindow } from '../../storage/daySummary.ts';
import { ConfigurationHistory, configurationChangesInWindow, overdueSignalsInWindow } from '../../storage/configurationLog.ts';
import { LogQueries } from '../../storage/logQueries.ts';
import { utilizationE4Unbounded } from '../../storage/writeQueue.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { idParam, jsonBody } from '../validate.ts';
import type { ApiContext } from './apiContext.ts';
import { LocalTimes, zonedDayWindow } from './zonedDay.ts';

const maxWindowMs = 62 * 86_400_000;

/** ISO 8601: a date (UTC midnight), or a date and time with its zone (without one it would be the server's local time). */
const isoPattern = /^[0-9]{4}-[0-9]{2}-[0-9]{2}(T[0-9]{2}:[0-9]{2}(:[0-9]{2}(\.[0-9]{1,9})?)?(Z|[+-][0-9]{2}:?[0-9]{2}))?$/;

function timeParam(raw: string | undefined, name: string): number | null {
  if (raw === undefined || raw === '') return null;
  // Only epoch ms or ISO 8601: Date.parse also reads words ("June 13" → 13 June 2001).
  const value = /^[0-9]{1,15}$/.test(raw) ? Number(raw) : isoPattern.test(raw) ? Date.parse(raw) : NaN;
  if (!Number.isFinite(value)) throw HttpError.invalid([{ path: name, message: `"${raw.slice(0, 40)}" is not a time: give epoch ms or ISO 8601 with a zone (2026-06-13T14:00:00Z)` }]);
  return value;
}

export interface Window {
  fromMs: number;
  toMs: number;
}

export function windowOf(query: (name: string) => string | undefined, nowMs: number, timeZone: string): Window {
  const day = query('day');
  if (day !== undefined) {
    const window = zonedDayWindow(day, timeZone);
    if (!window) throw HttpError.invalid([{ path: 'day', message: `"${day.slice(0, 20)}" is not a date (YYYY-MM-DD)` }]);
    return window;
  }
  const toMs = timeParam(query('to'), 'to') ?? nowMs;
  const fromMs = timeParam(query('from'), 'from') ?? toMs - 86_400_000;
  if (!(fromMs < toMs)) throw HttpError.invalid([{ path: 'from', message: 'must be before to' }]);
  if (toMs - fromMs > maxWindowMs) throw HttpError.invalid([{ path: 'from', message: 'a window may span at most 62 days' }]);
  return { fromMs, toMs };
}

function pointsParam(raw: string | undefined): number {
  if (raw === undefined) return 2000;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 10 || n > 10_000) throw HttpError.invalid([{ path: 'points', message: 'must be an integer from 10 to 10000' }]);
  return n;
}

const forecastSchema = z.strictObject({
  text: z
    .string({ error: 'the forecast table must be text' })
    .min(1, 'paste the forecast table')
    .max(200_000, 'the forecast table is longer than 200,000 characters — split it'),
  /** The unit of the speeds written as bare numbers when the header does not say. */
  unit: z.enum(forecastSpeedUnits, { error: 'the speed unit must be one of m/s, km/h, kn or mph' }).optional(),
  /** The order of dates written with the year last (03/12/2026). */
  dateOrder: z.enum(dateOrders, { error: 'the date order must be day-first or month-first' }).optional(),
  /** Height the forecast speeds refer to, m (forecasts give 10 m). */
  heightM: z
    .number({ error: 'the height of the forecast speeds must be a number of metres' })
    .gt(0, 'the height of the forecast speeds must be above 0 m')
    .max(200, 'the height of the forecast speeds must be at most 200 m')
    .default(10),
});

export const csvTables = ['readings', 'wind-minutes', 'structure-minutes', 'level-changes', 'alerts', 'audit', 'configuration-changes'] as const;

/** An optional `structure` query parameter: a structure id, or undefined. */
function structureParam(raw: string | undefined): number | undefined {
  if (raw === undefined) return undefined;
  if (!/^[1-9][0-9]{0,14}$/.test(raw)) throw HttpError.invalid([{ path: 'structure', message: 'must be a structure id (a positive whole number)' }]);
  return Number(raw);
}

export function logRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  const queries = new LogQueries(ctx.db.$client);
  const viewer = requireRole('viewer');
  const win = (c: { req: { query(name: string): string | undefined } }) => windowOf((n) => c.req.query(n), ctx.now(), getSite(ctx.db).timeZone);
  // Each sensor's newest minute rollup is summed in memory between ticks: write it before a
  // read, so the log and its exports include the reading that just came in.
  const withOpenMinutes: MiddlewareHandler<AppEnv> = async (_c, next) => {
    ctx.queue.writeOpenMinutes();
    await next();
  };
  api.use('/log/*', withOpenMinutes);
  api.use('/export/*', withOpenMinutes);

  api.get('/log/wind', viewer, (c) => {
    const { fromMs, toMs } = win(c);
    const points = pointsParam(c.req.query('points'));
    const key = c.req.query('sensor');
    // The sensors on the register during the window (a retired sensor keeps its history; one
    // registered later has none), or the one asked for, retired or not.
    const present = sensorsInWindow(ctx.db, fromMs, toMs).map((p) => p.sensor);
    const sensors = key ? [present.find((s) => s.key === key) ?? ctx.db.select().from(sensorsTable).where(eq(sensorsTable.key, key)).get() ?? getSensor(ctx.db, key)] : present;
    return c.json({
      fromMs,
      toMs,
      sensors: sensors.map((s) => ({ key: s.key, name: s.name, heightM: s.heightM, series: queries.windSeries(s.id, fromMs, toMs, points) })),
    });
  });

  api.get('/log/structures/:id', viewer, (c) => {
    const id = idParam(c);
    // A retired structure's history stays in the log: only an id never registered is unknown.
    const row = ctx.db.select().from(structuresTable).where(eq(structuresTable.id, id)).get() ?? getStructureRow(ctx.db, id);
    const { fromMs, toMs } = win(c);
    const points = pointsParam(c.req.query('points'));
    const changes = ctx.db
      .select()
      .from(levelChangesTable)
      .where(and(eq(levelChangesTable.structureId, id), gte(levelChangesTable.atMs, fromMs), lt(levelChangesTable.atMs, toMs)))
      .orderBy(asc(levelChangesTable.atMs))
      .all();
    const alerts = ctx.db
      .select()
      .from(alertsTable)
      .where(and(eq(alertsTable.structureId, id), gte(alertsTable.raisedAtMs, fromMs), lt(alertsTable.raisedAtMs, toMs)))
      .orderBy(asc(alertsTable.raisedAtMs))
      .all();
    return c.json({
      fromMs,
      toMs,
      structure: { id: row.id, name: row.name, kind: row.kind },
      live: ctx.watch.structureStateById(id),
      series: queries.structureSeries(id, fromMs, toMs, points),
      levelChanges: changes,
      alerts,
      configurationChanges: configurationChangesInWindow(ctx.db, fromMs, toMs, id),
      overdueSignals: overdueSignalsInWindow(ctx.db, fromMs, toMs, id),
    });
  });

  // The plan's actions (design §2.5): configuration switches ("Done" on an alert, or by hand) and
  // actions signalled again as overdue, by the time they happened.
  api.get('/log/configurations', viewer, (c) => {
    const { fromMs, toMs } = win(c);
    const structure = structureParam(c.req.query('structure'));
    return c.json({ fromMs, toMs, configurationChanges: configurationChangesInWindow(ctx.db, fromMs, toMs, structure), overdueSignals: overdueSignalsInWindow(ctx.db, fromMs, toMs, structure) });
  });

  api.get('/log/levels', viewer, (c) => {
    const { fromMs, toMs } = win(c);
    const structure = structureParam(c.req.query('structure'));
    const conditions = [gte(levelChangesTable.atMs, fromMs), lt(levelChangesTable.atMs, toMs)];
    if (structure !== undefined) conditions.push(eq(levelChangesTable.structureId, structure));
    const names = new Map(ctx.db.select({ id: structuresTable.id, name: structuresTable.name }).from(structuresTable).all().map((s) => [s.id, s.name]));
    const rows = ctx.db.select().from(levelChangesTable).where(and(...conditions)).orderBy(asc(levelChangesTable.atMs)).limit(20_000).all();
    return c.json({ fromMs, toMs, levelChanges: rows.map((r) => ({ ...r, structureName: names.get(r.structureId) ?? null })) });
  });

  api.get('/log/alerts', viewer, (c) => {
    const { fromMs, toMs } = win(c);
    const rows = ctx.db.select().from(alertsTable).where(and(gte(alertsTable.raisedAtMs, fromMs), lt(alertsTable.raisedAtMs, toMs))).orderBy(asc(alertsTable.raisedAtMs)).limit(20_000).all();
    return c.json({ fromMs, toMs, alerts: rows });
  });

  api.get('/log/audit', viewer, (c) => {
    const { fromMs, toMs } = win(c);
    const rows = ctx.db.select().from(auditTable).where(and(gte(auditTable.atMs, fromMs), lt(auditTable.atMs, toMs))).orderBy(asc(auditTable.atMs)).limit(20_000).all();
    return c.json({ fromMs, toMs, audit: rows });
  });

  api.get('/log/summary', viewer, (c) => {
    const { fromMs, toMs } = win(c);
    return c.json(daySummary(ctx.db, fromMs, toMs, ctx.now()));
  });

  api.get('/export/:table{[a-z-]+\\.csv}', viewer, (c) => {
    const table = c.req.param('table').replace(/\.csv$/, '') as (typeof csvTables)[number];
    if (!csvTables.includes(table)) throw HttpError.notFound(`export "${table}"`);
    const { fromMs, toMs } = win(c);
    const timeZone = getSite(ctx.db).timeZone;
    const csv = exportCsv(ctx, table, fromMs, toMs, timeZone);
    c.header('Content-Type', 'text/csv; charset=utf-8');
    // Named after the window's first date on the site's clock (day=2026-06-13 starts at 23:00 UTC the day before in summer in London).
    c.header('Content-Disposition', `attachment; filename="${table}-${new LocalTimes(timeZone).date(fromMs)}.csv"`);
    return c.body(csv);
  });

  api.post('/forecast', viewer, async (c) => {
    const input = await jsonBody(c, forecastSchema);
    const site = getSite(ctx.db);
    const table = parseForecastTable(input.text, {
      ...(input.unit ? { unit: input.unit } : {}),
      ...(input.dateOrder ? { dateOrder: input.dateOrder } : {}),
      timeZone: site.timeZone,
    });
    if (!table.ok) {
      // Each message starts with its line and column in words; the path lets a form mark the table.
      throw HttpError.invalid(table.problems.map((p) => ({ path: p.line === null ? 'text' : `text.line ${p.line}${p.column ? `.${p.column}` : ''}`, message: p.message })));
    }
    const all = ctx.watch.snapshot().structures;
    const states = all.filter((s) => !s.error && s.triggerGustsMps.length > 0);
    // The ladder over every direction: the live ladder may be a sector's (directional assessment,
    // taken from the wind blowing now), which says nothing about the forecast hours.
    const ladders = states.map((s) => (s.limitGustMps === s.allDirectionsLimitGustMps ? s.triggerGustsMps : triggerLadderMps(s.levels, s.allDirectionsLimitGustMps)));
    const heightFactor = (toHeightM: number) => gustHeightFactor({ fromHeightM: input.heightM, toHeightM, terrainCategory: site.terrainCategory as TerrainCategory, allowReduction: site.heightReductionEnabled });
    const structures = states.map((s, i) => ({
      id: String(s.id),
      triggerGustsMps: ladders[i]!,
      heightFactor: heightFactor(s.referenceHeightM),
    }));
    const predictions = predictLevels(table.rows, structures);
    // Every configuration (design §2.5, §2.8): the same engine per configuration as the watch
    // (engine recordConfigurations → one structure model each), each at the air density now and
    // over every direction, with its own reference height; the current one as the watch has it.
    const siteLevels = site.defaultLevelsJson as LevelDefinition[];
    const planned = states.map((s, i) => forecastConfigurations(ctx, s, ladders[i]!, heightFactor, siteLevels));
    const plans = predictPlannedLevels(table.rows, planned.map((p) => p.structure));
    return c.json({
      heightM: input.heightM,
      ignoredColumns: table.ignoredColumns,
      notes: table.notes,
      dateOrder: table.dateOrder,
      structures: states.map((s, i) => ({
        id: s.id,
        name: s.name,
        referenceHeightM: s.referenceHeightM,
        levels: s.levels.map((l, j) => ({ level: l.level, label: l.label, triggerGustMps: ladders[i]![j]!, moveToConfiguration: planned[i]!.moveTo[j] ?? null })),
        configuration: planned[i]!.structure.configurations[planned[i]!.structure.currentIndex]!.name,
        configurations: planned[i]!.views,
      })),
      // Structures the check could not cover are named, never left out silently.
      notChecked: all
        .filter((s) => !states.includes(s))
        .map((s) => ({ id: s.id, name: s.name, reason: s.error ? `its record cannot be assessed: ${s.error}` : 'it has no levels' })),
      rows: predictions.map((p, i) => ({
        ...p,
        meanMps: table.rows[i]!.meanMps,
        dirFromDeg: table.rows[i]!.dirFromDeg,
        // Per structure (in the order of `structures`): the level in every configuration, and the one the plan moves it to.
        configurations: plans[i]!.map((plan) => ({ inConfigurations: plan.inConfigurations, current: plan.currentIndex, planned: plan.plannedIndex })),
      })),
    });
  });

  return api;
}

/** A structure in the forecast check with every configuration: what `predictPlannedLevels` takes, and what the answer shows of each. */
export function forecastConfigurations(
  ctx: ApiContext,
  state: StructureState,
  currentLadder: number[],
  heightFactor: (toHeightM: number) => number,
  siteLevels: readonly LevelDefinition[],
): { structure: ForecastPlannedStructure; views: Array<{ name: string; current: boolean; referenceHeightM: number; limitGustMps: number; levels: Array<{ level: number; label: string; triggerGustMps: number }> }>; moveTo: Array<string | null> } {
  const row = ctx.db.select().from(structuresTable).where(eq(structuresTable.id, state.id)).get();
  const key = (name: string) => name.trim().normalize('NFC').toLowerCase();
  const current = { name: state.configuration, triggerGustsMps: currentLadder, heightFactor: heightFactor(state.referenceHeightM), referenceHeightM: state.referenceHeightM, limitGustMps: state.allDirectionsLimitGustMps };
  let list: Array<typeof current> = [current];
  let levels: readonly LevelDefinition[] = [];
  let currentIndex = 0;
  if (row) {
    try {
      const configured = recordConfigurations(row.recordJson as StructureRecord);
      const models = configured.map((c) => structureModel({ ...row, recordJson: c.record }, siteLevels));
      levels = models[0]!.levels;
      const index = configured.findIndex((c) => key(c.name) === key(state.configuration));
      if (index >= 0 && models.every((m) => m.levels.length === currentLadder.length)) {
        list = models.map((model, i) => {
          if (i === index) return current;
          const d = densityDependent(model, state.airDensityKgM3);
          return { name: configured[i]!.name, triggerGustsMps: d.triggerGustsMps, heightFactor: heightFactor(model.referenceHeightM), referenceHeightM: model.referenceHeightM, limitGustMps: d.limitGustMps };
        });
        currentIndex = index;
      }
    } catch {
      // A configuration the engine cannot build: the check keeps the one the watch assesses, named as such.
      list = [current];
    }
  }
  const moveTo = state.levels.map((_, j) => levels[j]?.moveToConfiguration ?? null);
  const moveToIndex = moveTo.map((name) => {
    if (name === null) return null;
    const i = list.findIndex((c) => key(c.name) === key(name));
    return i >= 0 ? i : null;
  });
  return {
    structure: { id: String(state.id), configurations: list.map(({ name, triggerGustsMps, heightFactor: f }) => ({ name, triggerGustsMps, heightFactor: f })), currentIndex, moveToIndex },
    views: list.map((c, i) => ({ name: c.name, current: i === currentIndex, referenceHeightM: c.referenceHeightM, limitGustMps: c.limitGustMps, levels: state.levels.map((l, j) => ({ level: l.level, label: l.label, triggerGustMps: c.triggerGustsMps[j]! })) })),
    moveTo,
  };
}

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
export function exportCsv(ctx: Pick<ApiContext, 'db'>, table: (typeof csvTables)[number], fromMs: number, toMs: number, timeZone: string): string {
  const sqlite = ctx.db.$client;
  const local = new LocalTimes(timeZone);
  const iso = (ms: number | null) => (ms === null ? '' : new Date(ms).toISOString());
  const loc = (ms: number | null) => (ms === null ? '' : local.dateTime(ms));
  const cmps = (v: number | null) => (v === null ? '' : rounded(v / 100, 1));
  switch (table) {
    case 'readings': {
      const rows = sqlite
        .prepare(
          `SELECT s.key, r.ts_ms, r.speed_cmps, r.gust_cmps, r.dir_deg, r.temp_deci_c, r.pressure_pa, r.rh_pct, r.flags
           FROM readings r JOIN sensors s ON s.id = r.sensor_id WHERE r.ts_ms >= ? AND r.ts_ms < ? ORDER BY r.ts_ms, s.key LIMIT 2000000`,
        )
        .raw()
        .all(fromMs, toMs) as Array<[string, number, number, number | null, number | null, number | null, number | null, number | null, number]>;
      return toCsv(
        ['sensor', 'time_local', 'time_utc', 'speed_mps', 'gust_mps', 'dir_from_deg', 'temp_c', 'pressure_hpa', 'rh_pct', 'late'],
        rows.map((r) => [r[0], loc(r[1]), iso(r[1]), cmps(r[2]), cmps(r[3]), rounded(r[4], 0), r[5] === null ? '' : rounded(r[5] / 10, 1), r[6] === null ? '' : rounded(r[6] / 100, 1), rounded(r[7], 0), r[8] & 1 ? 'yes' : '']),
      );
    }
    case 'wind-minutes': {
      const rows = sqlite
        .prepare(
          `SELECT s.key, w.minute_ms, w.sample_count, w.speed_sum_cmps, w.max_gust_cmps, w.dir_sin_sum, w.dir_cos_sum, w.dir_count
           FROM wind_minutes w JOIN sensors s ON s.id = w.sensor_id WHERE w.minute_ms >= ? AND w.minute_ms < ? ORDER BY w.minute_ms, s.key`,
        )
        .raw()
        .all(fromMs, toMs) as Array<[string, number, number, number, number, number, number, number]>;
      return toCsv(
        ['sensor', 'minute_local', 'minute_utc', 'samples', 'mean_mps', 'max_gust_mps', 'mean_dir_from_deg'],
        rows.map((r) => {
          const dir = r[7] > 0 ? ((Math.atan2(r[5], r[6]) * 180) / Math.PI + 360) % 360 : null;
          return [r[0], loc(r[1]), iso(r[1]), r[2], r[2] > 0 ? rounded(r[3] / r[2] / 100, 1) : '', cmps(r[4]), dir === null ? '' : rounded(dir, 0) === '360' ? '0' : rounded(dir, 0)];
        }),
      );
    }
    case 'structure-minutes': {
      const rows = sqlite
        .prepare(
          `SELECT t.name, m.minute_ms, m.max_gust_cmps, m.max_utilization_e4, m.max_level
           FROM structure_minutes m JOIN structures t ON t.id = m.structure_id WHERE m.minute_ms >= ? AND m.minute_ms < ? ORDER BY m.minute_ms, t.name`,
        )
        .raw()
        .all(fromMs, toMs) as Array<[string, number, number, number, number]>;
      return toCsv(
        ['structure', 'minute_local', 'minute_utc', 'max_gust_mps', 'max_utilization_pct', 'min_margin_pct', 'max_level'],
        rows.map((r) => {
          const unbounded = r[3] >= utilizationE4Unbounded;
          return [r[0], loc(r[1]), iso(r[1]), cmps(r[2]), unbounded ? 'unbounded' : pct(r[3] / 10_000), unbounded ? 'none' : marginPct(r[3] / 10_000), r[4]];
        }),
      );
    }
    case 'level-changes': {
      const rows = sqlite
        .prepare(
          `SELECT t.name, c.at_ms, c.from_level, c.to_level, c.gust_mps, c.utilization, c.no_data, c.structure_id, t.record_json, c.estimate_level, c.estimate_chance_10, c.estimate_chance_30
           FROM level_changes c JOIN structures t ON t.id = c.structure_id WHERE c.at_ms >= ? AND c.at_ms < ? ORDER BY c.at_ms, c.id`,
        )
        .raw()
        .all(fromMs, toMs) as Array<[string, number, number, number, number | null, number | null, number, number, string, number | null, number | null, number | null]>;
      // The configuration each change was assessed in (design §2.5): the log's last switch at or before it, else the one as registered.
      const history = new ConfigurationHistory(ctx.db, toMs);
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
          r[0], loc(r[1]), iso(r[1]), r[6] ? 'no data' : r[3] > r[2] ? 'raised' : r[3] < r[2] ? 'lowered' : 'data back', r[2], r[3], rounded(r[4], 1), pct(r[5]), marginPct(r[5]), history.at(r[7], r[1]) ?? registeredName(r[7], r[8]),
          r[9] ?? '', r[10] === null ? '' : rounded(r[10] * 100, 1), r[11] === null ? '' : rounded(r[11] * 100, 1),
        ]),
      );
    }
    case 'alerts': {
      const rows = ctx.db.select().from(alertsTable).where(and(gte(alertsTable.raisedAtMs, fromMs), lt(alertsTable.raisedAtMs, toMs))).orderBy(asc(alertsTable.raisedAtMs), asc(alertsTable.id)).all();
      const names = new Map(ctx.db.select({ id: structuresTable.id, name: structuresTable.name }).from(structuresTable).all().map((s) => [s.id, s.name]));
      const sensorNames = new Map(ctx.db.select({ id: sensorsTable.id, key: sensorsTable.key }).from(sensorsTable).all().map((s) => [s.id, s.key]));
      const actionDueMs = getSite(ctx.db).actionDueMs;
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
      const rows = configurationChangesInWindow(ctx.db, fromMs, toMs);
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
      const rows = ctx.db.select().from(auditTable).where(and(gte(auditTable.atMs, fromMs), lt(auditTable.atMs, toMs))).orderBy(asc(auditTable.atMs), asc(auditTable.id)).all();
      return toCsv(
        ['time_local', 'time_utc', 'who', 'what', 'id', 'action', 'before', 'after'],
        rows.map((r) => [loc(r.atMs), iso(r.atMs), r.actor, r.entity, r.entityId, r.action, r.beforeJson === null ? '' : JSON.stringify(r.beforeJson), r.afterJson === null ? '' : JSON.stringify(r.afterJson)]),
      );
    }
  }
}
