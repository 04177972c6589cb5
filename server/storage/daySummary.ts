/**
 * The summary of a window (usually one day in the site's time zone) per structure and per
 * sensor: the questions a safety officer asks after a windy day. How hard did it blow, how close
 * did each structure come to its limit and when, how long was it at each level, which alerts
 * fired and who acknowledged them.
 *
 * Only what was on the register during the window is listed: a structure or sensor registered
 * after the window's end is not there (it would read "unknown" for a day it did not exist), one
 * retired before its start neither, and one registered or retired inside the window is counted
 * from or up to that time. Structures are never brought back once retired, so the register's
 * created and retired times say it all; a sensor's key can be retired and registered again, so
 * its spells on the register come from the audit rows (create and retire) as well. Anything with
 * logged data inside the window is listed regardless (a gateway may flush readings taken before
 * the sensor was registered: they are true readings).
 */
import { and, asc, desc, eq, gte, inArray, lt } from 'drizzle-orm';
import { alertsTable, auditTable, levelChangesTable, sensorsTable, structuresTable } from '../../db/schema.ts';
import { registeredConfigurationName, type StructureRecord } from '../engine/index.ts';
import { ConfigurationHistory, configurationChangesInWindow, configurationSwitchesBefore, type ConfigurationChangeEntry } from './configurationLog.ts';
import type { Db } from './database.ts';
import { forecastCheck, type ForecastCheck } from './forecastCheck.ts';
import { utilizationE4Unbounded } from './storedUnits.ts';

type SensorRow = typeof sensorsTable.$inferSelect;
type StructureRow = typeof structuresTable.$inferSelect;

/** The part of a window something was on the register: [fromMs, toMs). */
export interface OnRegister {
  fromMs: number;
  toMs: number;
}

function clip(spells: ReadonlyArray<readonly [number, number]>, fromMs: number, toMs: number): OnRegister | null {
  let first = Infinity;
  let last = -Infinity;
  for (const [a, b] of spells) {
    const start = Math.max(a, fromMs);
    const end = Math.min(b, toMs);
    if (end <= start) continue;
    first = Math.min(first, start);
    last = Math.max(last, end);
  }
  return first < last ? { fromMs: first, toMs: last } : null;
}

/** A structure's time on the register within the window, or null when it was not on it. */
export function structureOnRegister(s: Pick<StructureRow, 'createdAtMs' | 'retiredAtMs'>, fromMs: number, toMs: number): OnRegister | null {
  return clip([[s.createdAtMs, s.retiredAtMs ?? Infinity]], fromMs, toMs);
}

/**
 * A sensor's spells on the register: from its first registration (the register's created time),
 * closed by each retirement and opened again by each registration of the same key in the audit
 * trail; open at the end unless the register says it is retired now. A register import changes
 * sensors without an audit row per sensor: when the register shows the key in service after a
 * retirement the audit trail does not reopen, the spell reopens at the first import after it.
 */
export function sensorSpells(sensor: Pick<SensorRow, 'createdAtMs' | 'retiredAtMs'>, audit: ReadonlyArray<{ atMs: number; entity: string; action: string }>): Array<[number, number]> {
  const spells: Array<[number, number]> = [];
  let openAt: number | null = sensor.createdAtMs;
  let lastClose = -Infinity;
  for (const e of [...audit].sort((a, b) => a.atMs - b.atMs)) {
    if (e.atMs < sensor.createdAtMs) continue;
    if (e.entity === 'sensor' && e.action === 'create') openAt ??= e.atMs;
    else if (e.entity === 'sensor' && e.action === 'retire' && openAt !== null) {
      spells.push([openAt, e.atMs]);
      openAt = null;
      lastClose = e.atMs;
    }
  }
  if (openAt === null && sensor.retiredAtMs === null) {
    const reopened = audit.filter((e) => e.entity === 'register' && e.atMs >= lastClose).reduce((min, e) => Math.min(min, e.atMs), Infinity);
    openAt = Number.isFinite(reopened) ? reopened : lastClose;
  }
  if (openAt !== null) spells.push([openAt, sensor.retiredAtMs !== null && sensor.retiredAtMs >= openAt ? sensor.retiredAtMs : Infinity]);
  return spells;
}

/**
 * The sensors that were on the register during the window (or logged readings in it), each with
 * its time on the register clipped to the window (the whole window for one known only by data).
 */
export function sensorsInWindow(db: Db, fromMs: number, toMs: number): Array<{ sensor: SensorRow; onRegister: OnRegister }> {
  const rows = db.select().from(sensorsTable).orderBy(asc(sensorsTable.key)).all();
  if (rows.length === 0) return [];
  const audit = db
    .select({ atMs: auditTable.atMs, entity: auditTable.entity, entityId: auditTable.entityId, action: auditTable.action })
    .from(auditTable)
    .where(inArray(auditTable.entity, ['sensor', 'register']))
    .all();
  const hasData = db.$client.prepare('SELECT 1 FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ? LIMIT 1');
  const out: Array<{ sensor: SensorRow; onRegister: OnRegister }> = [];
  for (const sensor of rows) {
    const own = audit.filter((e) => e.entity === 'register' || e.entityId === sensor.key);
    const onRegister = clip(sensorSpells(sensor, own), fromMs, toMs);
    if (onRegister) out.push({ sensor, onRegister });
    else if (hasData.get(sensor.id, fromMs - (fromMs % 60_000), toMs)) out.push({ sensor, onRegister: { fromMs, toMs } });
  }
  return out;
}

export interface StructureDay {
  id: number;
  name: string;
  kind: string;
  /** The part of the window the structure was on the register (later start: registered that day; earlier end: retired). */
  onRegister: OnRegister;
  /** When it was retired, if it is (possibly after the window). */
  retiredAtMs: number | null;
  /** Highest gust at the structure's reference height, m/s, and when (minute start); null without data. */
  maxGustMps: number | null;
  maxGustAtMs: number | null;
  /** Highest governing utilization and when; null without data or when resistance ran out. */
  maxUtilization: number | null;
  maxUtilizationAtMs: number | null;
  unboundedAtMs: number | null;
  highestLevel: number;
  /** Milliseconds spent at each level 0..n within the window (level held between logged changes). */
  msAtLevel: number[];
  /** Milliseconds within the window without live data. */
  msNoData: number;
  minutesWithData: number;
  alerts: Array<{
    id: number;
    kind: string;
    level: number | null;
    label: string;
    raisedAtMs: number;
    gustMps: number | null;
    acknowledgedAtMs: number | null;
    acknowledgedBy: string | null;
    acknowledgeNote: string | null;
    clearedAtMs: number | null;
    /** The configuration the level's action moves the structure to (design §2.5); null: the action moves nothing. */
    moveToConfiguration: string | null;
    /** When and by whom the action was marked done; null: not marked done. */
    actionDoneAtMs: number | null;
    actionDoneBy: string | null;
    /** When it was signalled again as not done in time; null: it was not. */
    overdueAtMs: number | null;
    /**
     * The action was late: signalled as overdue, or marked done more than the site's action time
     * after the alert; null when the alert has no such action.
     */
    actionLate: boolean | null;
  }>;
  /** The configuration it stood in at the start of the window (the log's last switch before it, else the one as registered). */
  configurationAtStart: string;
  /** Every switch of its configuration in the window: the crew's "Done" on an alert's action, or by hand. */
  configurationChanges: Array<Omit<ConfigurationChangeEntry, 'structureId' | 'structureName'>>;
}

export interface SensorDay {
  key: string;
  name: string;
  heightM: number;
  /** The part of the window the sensor was on the register. */
  onRegister: OnRegister;
  maxGustMps: number | null;
  maxGustAtMs: number | null;
  meanMps: number | null;
  readings: number;
}

export interface DaySummary {
  fromMs: number;
  toMs: number;
  structures: StructureDay[];
  sensors: SensorDay[];
  alertCount: number;
  unacknowledgedCount: number;
  /** Level alerts whose action moves a structure to another configuration (design §2.5), and of those: marked done, late, not marked done. */
  actionCount: number;
  actionsDoneCount: number;
  actionsLateCount: number;
  actionsNotDoneCount: number;
  /** The site's action time now, ms: an action marked done later than this after its alert counts as late. */
  actionDueMs: number;
  /** How the forecast feed did: each forecast hour beside the measured wind (storage/forecastCheck.ts). */
  forecastCheck: ForecastCheck;
}

/**
 * `nowMs`: time not yet lived (the rest of today) is counted nowhere; nor is time before a
 * structure was registered or first logged, whichever came first.
 */
export function daySummary(db: Db, fromMs: number, toMs: number, nowMs: number): DaySummary {
  const sqlite = db.$client;
  const structures = db.select().from(structuresTable).orderBy(asc(structuresTable.name)).all();
  const maxGust = sqlite.prepare('SELECT minute_ms AS t, max_gust_cmps AS g FROM structure_minutes WHERE structure_id = ? AND minute_ms >= ? AND minute_ms < ? ORDER BY max_gust_cmps DESC, minute_ms LIMIT 1');
  const maxUtil = sqlite.prepare('SELECT minute_ms AS t, max_utilization_e4 AS u FROM structure_minutes WHERE structure_id = ? AND minute_ms >= ? AND minute_ms < ? ORDER BY max_utilization_e4 DESC, minute_ms LIMIT 1');
  const minuteCount = sqlite.prepare('SELECT COUNT(*) AS n, MAX(max_level) AS l FROM structure_minutes WHERE structure_id = ? AND minute_ms >= ? AND minute_ms < ?');
  const firstLogged = sqlite.prepare(
    'SELECT MIN(t) AS t FROM (SELECT MIN(minute_ms) AS t FROM structure_minutes WHERE structure_id = ? UNION ALL SELECT MIN(at_ms) FROM level_changes WHERE structure_id = ?)',
  );

  const alerts = db.select().from(alertsTable).where(and(gte(alertsTable.raisedAtMs, fromMs), lt(alertsTable.raisedAtMs, toMs))).orderBy(asc(alertsTable.raisedAtMs)).all();

  const loggedIn = sqlite.prepare(
    'SELECT EXISTS (SELECT 1 FROM structure_minutes WHERE structure_id = @id AND minute_ms >= @from AND minute_ms < @to) OR EXISTS (SELECT 1 FROM level_changes WHERE structure_id = @id AND at_ms >= @from AND at_ms < @to) AS any',
  );

  const actionDueMs = (sqlite.prepare('SELECT action_due_ms AS ms FROM sites ORDER BY id LIMIT 1').get() as { ms: number } | undefined)?.ms ?? 5 * 60_000;
  const switches = configurationChangesInWindow(db, fromMs, toMs);
  const history = new ConfigurationHistory(configurationSwitchesBefore(db, fromMs));
  const lateAction = (a: { moveToConfiguration: string | null; raisedAtMs: number; actionDoneAtMs: number | null; overdueAtMs: number | null }): boolean | null =>
    a.moveToConfiguration === null ? null : a.overdueAtMs !== null || (a.actionDoneAtMs !== null && a.actionDoneAtMs - a.raisedAtMs > actionDueMs);

  const out: StructureDay[] = [];
  for (const s of structures) {
    const structureAlerts = alerts.filter((a) => a.structureId === s.id);
    const registered = structureOnRegister(s, fromMs, toMs);
    // Not on the register that day and nothing logged: it did not exist for this window.
    if (!registered && structureAlerts.length === 0 && !(loggedIn.get({ id: s.id, from: fromMs - (fromMs % 60_000), to: toMs }) as { any: number }).any) continue;
    const onRegister = registered ?? { fromMs, toMs };
    const changes = db
      .select()
      .from(levelChangesTable)
      .where(and(eq(levelChangesTable.structureId, s.id), gte(levelChangesTable.atMs, fromMs), lt(levelChangesTable.atMs, toMs)))
      .orderBy(asc(levelChangesTable.atMs), asc(levelChangesTable.id))
      .all();
    const minutes = minuteCount.get(s.id, fromMs, toMs) as { n: number; l: number | null };
    const before = db
      .select()
      .from(levelChangesTable)
      .where(and(eq(levelChangesTable.structureId, s.id), lt(levelChangesTable.atMs, fromMs)))
      .orderBy(desc(levelChangesTable.atMs), desc(levelChangesTable.id))
      .limit(1)
      .get();
    const levelCount = Math.max(3, ...changes.map((c) => c.toLevel), before?.toLevel ?? 0);
    const msAtLevel = new Array<number>(levelCount + 1).fill(0);
    let msNoData = 0;
    let level = before?.toLevel ?? 0;
    let noData = before?.noData ?? true;
    const logged = (firstLogged.get(s.id, s.id) as { t: number | null }).t;
    let t = Math.max(fromMs, Math.min(s.createdAtMs, logged ?? s.createdAtMs));
    const end = Math.min(toMs, nowMs, s.retiredAtMs ?? toMs);
    let highestLevel = level;
    for (const c of changes) {
      if (c.atMs > t) {
        if (noData) msNoData += c.atMs - t;
        msAtLevel[level]! += c.atMs - t;
        t = c.atMs;
      }
      level = c.toLevel;
      noData = c.noData;
      highestLevel = Math.max(highestLevel, level);
    }
    if (end > t) {
      if (noData) msNoData += end - t;
      msAtLevel[level]! += end - t;
    }
    const g = maxGust.get(s.id, fromMs, toMs) as { t: number; g: number } | undefined;
    const u = maxUtil.get(s.id, fromMs, toMs) as { t: number; u: number } | undefined;
    out.push({
      id: s.id,
      name: s.name,
      kind: s.kind,
      onRegister,
      retiredAtMs: s.retiredAtMs,
      maxGustMps: g ? g.g / 100 : null,
      maxGustAtMs: g ? g.t : null,
      maxUtilization: u && u.u < utilizationE4Unbounded ? u.u / 10_000 : null,
      maxUtilizationAtMs: u && u.u < utilizationE4Unbounded ? u.t : null,
      unboundedAtMs: u && u.u >= utilizationE4Unbounded ? u.t : null,
      highestLevel: Math.max(highestLevel, minutes.l ?? 0),
      msAtLevel,
      msNoData,
      minutesWithData: minutes.n,
      alerts: structureAlerts.map((a) => ({
        id: a.id,
        kind: a.kind,
        level: a.level,
        label: a.label,
        raisedAtMs: a.raisedAtMs,
        gustMps: a.gustMps,
        acknowledgedAtMs: a.acknowledgedAtMs,
        acknowledgedBy: a.acknowledgedBy,
        acknowledgeNote: a.acknowledgeNote,
        clearedAtMs: a.clearedAtMs,
        moveToConfiguration: a.moveToConfiguration,
        actionDoneAtMs: a.actionDoneAtMs,
        actionDoneBy: a.actionDoneBy,
        overdueAtMs: a.overdueAtMs,
        actionLate: lateAction(a),
      })),
      configurationAtStart: history.at(s.id, fromMs - 1) ?? registeredName(s.recordJson),
      configurationChanges: switches.filter((c) => c.structureId === s.id).map(({ structureId: _id, structureName: _name, ...c }) => c),
    });
  }

  const sensorRows = sensorsInWindow(db, fromMs, toMs);
  const sensorMax = sqlite.prepare('SELECT minute_ms AS t, max_gust_cmps AS g FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ? ORDER BY max_gust_cmps DESC, minute_ms LIMIT 1');
  const sensorMean = sqlite.prepare('SELECT SUM(speed_sum_cmps) AS s, SUM(sample_count) AS n FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ?');
  const sensors: SensorDay[] = sensorRows.map(({ sensor: s, onRegister }) => {
    const m = sensorMax.get(s.id, fromMs, toMs) as { t: number; g: number } | undefined;
    const mean = sensorMean.get(s.id, fromMs, toMs) as { s: number | null; n: number | null };
    return {
      key: s.key,
      name: s.name,
      heightM: s.heightM,
      onRegister,
      maxGustMps: m ? m.g / 100 : null,
      maxGustAtMs: m ? m.t : null,
      meanMps: mean.n ? (mean.s ?? 0) / mean.n / 100 : null,
      readings: mean.n ?? 0,
    };
  });

  const withAction = alerts.filter((a) => a.kind === 'level' && a.moveToConfiguration !== null);
  return {
    fromMs,
    toMs,
    structures: out,
    sensors,
    alertCount: alerts.length,
    unacknowledgedCount: alerts.filter((a) => a.acknowledgedAtMs === null).length,
    actionCount: withAction.length,
    actionsDoneCount: withAction.filter((a) => a.actionDoneAtMs !== null).length,
    actionsLateCount: withAction.filter((a) => lateAction(a) === true).length,
    actionsNotDoneCount: withAction.filter((a) => a.actionDoneAtMs === null).length,
    actionDueMs,
    forecastCheck: forecastCheck(db, fromMs, toMs, nowMs),
  };
}

/** The name of a record's configuration as registered; "as registered" when the stored record is not one (it cannot be assessed either). */
function registeredName(recordJson: unknown): string {
  return recordJson !== null && typeof recordJson === 'object' ? registeredConfigurationName(recordJson as StructureRecord) : registeredConfigurationName({});
}
