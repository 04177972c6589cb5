/**
 * The summary of a window (usually one day in the site's time zone) per structure and per
 * sensor: the questions a safety officer asks after a windy day. How hard did it blow, how close
 * did each structure come to its limit and when, how long was it at each level, which alerts
 * fired and who acknowledged them.
 */
import { and, asc, desc, eq, gte, lt } from 'drizzle-orm';
import { alertsTable, levelChangesTable, sensorsTable, structuresTable } from '../../db/schema.ts';
import type { Db } from './database.ts';
import { utilizationE4Unbounded } from './writeQueue.ts';

export interface StructureDay {
  id: number;
  name: string;
  kind: string;
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
  alerts: Array<{ id: number; kind: string; level: number | null; label: string; raisedAtMs: number; gustMps: number | null; acknowledgedAtMs: number | null; acknowledgedBy: string | null; acknowledgeNote: string | null; clearedAtMs: number | null }>;
}

export interface SensorDay {
  key: string;
  name: string;
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

  const out: StructureDay[] = [];
  for (const s of structures) {
    const changes = db
      .select()
      .from(levelChangesTable)
      .where(and(eq(levelChangesTable.structureId, s.id), gte(levelChangesTable.atMs, fromMs), lt(levelChangesTable.atMs, toMs)))
      .orderBy(asc(levelChangesTable.atMs), asc(levelChangesTable.id))
      .all();
    const minutes = minuteCount.get(s.id, fromMs, toMs) as { n: number; l: number | null };
    const structureAlerts = alerts.filter((a) => a.structureId === s.id);
    // Structures retired before the window have nothing to say about it.
    if (s.retiredAtMs !== null && s.retiredAtMs < fromMs) continue;
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
      })),
    });
  }

  const sensorRows = db.select().from(sensorsTable).orderBy(asc(sensorsTable.key)).all();
  const sensorMax = sqlite.prepare('SELECT minute_ms AS t, max_gust_cmps AS g FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ? ORDER BY max_gust_cmps DESC, minute_ms LIMIT 1');
  const sensorMean = sqlite.prepare('SELECT SUM(speed_sum_cmps) AS s, SUM(sample_count) AS n FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ?');
  const sensors: SensorDay[] = sensorRows.map((s) => {
    const m = sensorMax.get(s.id, fromMs, toMs) as { t: number; g: number } | undefined;
    const mean = sensorMean.get(s.id, fromMs, toMs) as { s: number | null; n: number | null };
    return {
      key: s.key,
      name: s.name,
      maxGustMps: m ? m.g / 100 : null,
      maxGustAtMs: m ? m.t : null,
      meanMps: mean.n ? (mean.s ?? 0) / mean.n / 100 : null,
      readings: mean.n ?? 0,
    };
  });

  return {
    fromMs,
    toMs,
    structures: out,
    sensors,
    alertCount: alerts.length,
    unacknowledgedCount: alerts.filter((a) => a.acknowledgedAtMs === null).length,
  };
}
