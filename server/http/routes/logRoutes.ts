/**
 * Review and planning: wind and utilization history (downsampled), level changes, alerts and
 * acknowledgements, the audit trail, the summary of a day, CSV exports of every log table, and
 * the forecast check. All need the viewer role.
 *
 * Windows: `from` and `to` as epoch milliseconds or ISO 8601; or `day=YYYY-MM-DD`, a calendar day
 * in the site's time zone. Default: the last 24 hours. At most 62 days at a time.
 */
import { Hono, type MiddlewareHandler } from 'hono';
import { z } from 'zod';
import { gustHeightFactor, maxDimensionM, recordConfigurations, type StructureRecord } from '../../engine/index.ts';
import { type LevelDefinition } from '../../levels/index.ts';
import { dateOrders, parseForecastTable, predictLevels, predictPlannedLevels, forecastSpeedUnits, type ForecastPlannedStructure } from '../../foresight/index.ts';
import { chanceThresholds, triggerLadderMps } from '../../levels/index.ts';
import { densityDependent, structureModel } from '../../watch/structureModel.ts';
import type { StructureState } from '../../watch/watch.ts';
import { isoInstantMs } from '../../formats/isoDateTime.ts';
import { getSite } from '../../register/site.ts';
import { getSensor } from '../../register/sensors.ts';
import { getStructureRow } from '../../register/structures.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { idParam, jsonBody } from '../validate.ts';
import type { ApiContext } from './apiContext.ts';
import { csvTables, exportCsv } from './logExports.ts';
import { LocalTimes, zonedDayWindow } from './zonedDay.ts';

const maxWindowMs = 62 * 86_400_000;


function timeParam(raw: string | undefined, name: string): number | null {
  if (raw === undefined || raw === '') return null;
  // Only epoch ms or ISO 8601 (formats/isoDateTime.ts): a date (UTC midnight), or a date and time with its
  // zone (without one it would be the server's local time). Date.parse also reads words ("June 13" → 13 June 2001).
  const iso = /^[0-9]{1,15}$/.test(raw) ? null : isoInstantMs(raw, { dateAlone: true });
  const value = iso === null ? Number(raw) : iso.ok ? iso.value : NaN;
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
    .max(maxDimensionM, `the height of the forecast speeds must be at most ${maxDimensionM} m`)
    .default(10),
});


/** An optional `structure` query parameter: a structure id, or undefined. */
function structureParam(raw: string | undefined): number | undefined {
  if (raw === undefined) return undefined;
  if (!/^[1-9][0-9]{0,14}$/.test(raw)) throw HttpError.invalid([{ path: 'structure', message: 'must be a structure id (a positive whole number)' }]);
  return Number(raw);
}

export function logRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  const { storage } = ctx;
  const queries = storage.log.series;
  const viewer = requireRole('viewer');
  const win = async (c: { req: { query(name: string): string | undefined } }) => windowOf((n) => c.req.query(n), ctx.now(), (await getSite(storage)).timeZone);
  // Each sensor's newest minute rollup is summed in memory between ticks: write it before a
  // read, so the log and its exports include the reading that just came in.
  const withOpenMinutes: MiddlewareHandler<AppEnv> = async (_c, next) => {
    await ctx.queue.writeOpenMinutes();
    await next();
  };
  api.use('/log/*', withOpenMinutes);
  api.use('/export/*', withOpenMinutes);

  api.get('/log/wind', viewer, async (c) => {
    const { fromMs, toMs } = await win(c);
    const points = pointsParam(c.req.query('points'));
    const key = c.req.query('sensor');
    // The sensors on the register during the window (a retired sensor keeps its history; one
    // registered later has none), or the one asked for, retired or not.
    const present = (await storage.log.sensorsInWindow(fromMs, toMs)).map((p) => p.sensor);
    const sensors = key ? [present.find((s) => s.key === key) ?? (await storage.sensors.byKey(key)) ?? (await getSensor(storage, key))] : present;
    return c.json({
      fromMs,
      toMs,
      sensors: await Promise.all(sensors.map(async (s) => ({ key: s.key, name: s.name, heightM: s.heightM, series: await queries.windSeries(s.id, fromMs, toMs, points) }))),
    });
  });

  api.get('/log/structures/:id', viewer, async (c) => {
    const id = idParam(c);
    // A retired structure's history stays in the log: only an id never registered is unknown.
    const row = (await storage.structures.byId(id)) ?? (await getStructureRow(storage, id));
    const { fromMs, toMs } = await win(c);
    const points = pointsParam(c.req.query('points'));
    const changes = await storage.levelChanges.inWindow(fromMs, toMs, { structureId: id });
    const alerts = await storage.alerts.raisedInWindow(fromMs, toMs, { structureId: id });
    return c.json({
      fromMs,
      toMs,
      structure: { id: row.id, name: row.name, kind: row.kind },
      live: ctx.watch.structureStateById(id),
      series: await queries.structureSeries(id, fromMs, toMs, points),
      levelChanges: changes,
      alerts,
      configurationChanges: await storage.log.configurationChanges(fromMs, toMs, id),
      overdueSignals: await storage.log.overdueSignals(fromMs, toMs, id),
    });
  });

  // The plan's actions (design §2.5): configuration switches ("Done" on an alert, or by hand) and
  // actions signalled again as overdue, by the time they happened.
  api.get('/log/configurations', viewer, async (c) => {
    const { fromMs, toMs } = await win(c);
    const structure = structureParam(c.req.query('structure'));
    return c.json({ fromMs, toMs, configurationChanges: await storage.log.configurationChanges(fromMs, toMs, structure), overdueSignals: await storage.log.overdueSignals(fromMs, toMs, structure) });
  });

  api.get('/log/levels', viewer, async (c) => {
    const { fromMs, toMs } = await win(c);
    const structure = structureParam(c.req.query('structure'));
    const names = await storage.structures.names();
    const rows = await storage.levelChanges.inWindow(fromMs, toMs, { ...(structure !== undefined ? { structureId: structure } : {}), limit: 20_000 });
    return c.json({ fromMs, toMs, levelChanges: rows.map((r) => ({ ...r, structureName: names.get(r.structureId) ?? null })) });
  });

  api.get('/log/alerts', viewer, async (c) => {
    const { fromMs, toMs } = await win(c);
    const rows = await storage.alerts.raisedInWindow(fromMs, toMs, { limit: 20_000 });
    return c.json({ fromMs, toMs, alerts: rows });
  });

  api.get('/log/audit', viewer, async (c) => {
    const { fromMs, toMs } = await win(c);
    const rows = await storage.audit.inWindow(fromMs, toMs, 20_000);
    return c.json({ fromMs, toMs, audit: rows });
  });

  api.get('/log/summary', viewer, async (c) => {
    const { fromMs, toMs } = await win(c);
    return c.json(await storage.log.daySummary(fromMs, toMs, ctx.now()));
  });

  api.get('/export/:table{[a-z-]+\\.csv}', viewer, async (c) => {
    const table = c.req.param('table').replace(/\.csv$/, '') as (typeof csvTables)[number];
    if (!csvTables.includes(table)) throw HttpError.notFound(`export "${table}"`);
    const { fromMs, toMs } = await win(c);
    const timeZone = (await getSite(storage)).timeZone;
    const csv = await exportCsv(ctx, table, fromMs, toMs, timeZone);
    c.header('Content-Type', 'text/csv; charset=utf-8');
    // Named after the window's first date on the site's clock (day=2026-06-13 starts at 23:00 UTC the day before in summer in London).
    c.header('Content-Disposition', `attachment; filename="${table}-${new LocalTimes(timeZone).date(fromMs)}.csv"`);
    return c.body(csv);
  });

  api.post('/forecast', viewer, async (c) => {
    const input = await jsonBody(c, forecastSchema);
    const site = await getSite(storage);
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
    const heightFactor = (toHeightM: number) => gustHeightFactor({ fromHeightM: input.heightM, toHeightM, terrainCategory: site.terrainCategory, allowReduction: site.heightReductionEnabled });
    const structures = states.map((s, i) => ({
      id: String(s.id),
      triggerGustsMps: ladders[i]!,
      heightFactor: heightFactor(s.referenceHeightM),
      chanceTriggers: chanceThresholds(s.levels, s.allDirectionsLimitGustMps),
    }));
    const predictions = predictLevels(table.rows, structures);
    // Every configuration (design §2.5, §2.8): the same engine per configuration as the watch
    // (engine recordConfigurations → one structure model each), each at the air density now and
    // over every direction, with its own reference height; the current one as the watch has it.
    const siteLevels = site.defaultLevelsJson;
    const planned = await Promise.all(states.map((s, i) => forecastConfigurations(ctx, s, ladders[i]!, heightFactor, siteLevels)));
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
export async function forecastConfigurations(
  ctx: ApiContext,
  state: StructureState,
  currentLadder: number[],
  heightFactor: (toHeightM: number) => number,
  siteLevels: readonly LevelDefinition[],
): Promise<{ structure: ForecastPlannedStructure; views: Array<{ name: string; current: boolean; referenceHeightM: number; limitGustMps: number; levels: Array<{ level: number; label: string; triggerGustMps: number }> }>; moveTo: Array<string | null> }> {
  const row = await ctx.storage.structures.byId(state.id);
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
    structure: { id: String(state.id), configurations: list.map(({ name, triggerGustsMps, heightFactor: f, limitGustMps }) => ({ name, triggerGustsMps, heightFactor: f, chanceTriggers: chanceThresholds(state.levels, limitGustMps) })), currentIndex, moveToIndex },
    views: list.map((c, i) => ({ name: c.name, current: i === currentIndex, referenceHeightM: c.referenceHeightM, limitGustMps: c.limitGustMps, levels: state.levels.map((l, j) => ({ level: l.level, label: l.label, triggerGustMps: c.triggerGustsMps[j]! })) })),
    moveTo,
  };
}
