/**
 * The live stream's once-a-second frames of the watch (`winds` and `structures`): which fields
 * go in a row, in what order, rounded to what a screen shows, and how urgent each row is. The
 * frame mechanics (columns, `ago`, budget) are in live/frames.ts.
 *
 * Rounding: speeds to 0.01 m/s (screens show 0.1), directions to 1°, utilization and margin to
 * 0.0001 (screens show whole percent), temperature to 0.1 °C, pressure to 1 Pa, humidity to 1 %.
 * The full figures stay in the snapshot (GET /api/live) and in the `structure` event that every
 * level change sends.
 */
import { roundTo } from '../live/frames.ts';
import type { SensorState, StructureUpdate } from './watch.ts';

/**
 * Characters of rows per frame, so that one client receives at most about 10 kB/s with the
 * `foresight` frame below (design §6,
 * issue 13 item 8: 100 sensors and 1,000 structures). Sensor rows first, with their own share;
 * what they leave goes to structures. The foresight frame's 1,000 came out of the structures'
 * share (3,600 before it): with it on top, `npm run bench` measured 10.0 kB/s per client, over
 * the target, the level changes and alerts that go at once coming to about 0.9 kB/s of it.
 */
export const windsFrameBudgetChars = 5_000;
export const structuresFrameBudgetChars = 3_000;
/**
 * The `foresight` frame: a structure's estimates when what a screen shows of them changed (whole
 * percent, 0.5 m/s, whole minutes), in their own small budget: they move with the 10-minute
 * statistics, not with each gust, and must not crowd out the measured figures.
 */
export const foresightFrameBudgetChars = 1_000;
export const foresightOverdueAfterMs = 60_000;
export const foresightColumns = ['id', 'foresight', 'computedAtMs'] as const;
export const foresightAgoColumns = ['computedAtMs'] as const;
/** A row that has waited this long goes before every row that has not (so nothing goes stale). */
export const windsOverdueAfterMs = 3_000;
export const structuresOverdueAfterMs = 10_000;

export const windColumns = [
  'key',
  'currentGustMps',
  'peakGust10minMps',
  'mean10minMps',
  'meanDirDeg',
  'beaufort',
  'lastReadingTsMs',
  'lastReceivedAtMs',
  'lastArrivalAtMs',
  'clockOffsetMs',
  'silent',
  'implausible',
  'temperatureC',
  'pressurePa',
  'rhPct',
] as const satisfies ReadonlyArray<keyof SensorState>;
export const windAgoColumns = ['lastReadingTsMs', 'lastReceivedAtMs', 'lastArrivalAtMs'] as const;

/** A sensor's row with absolute times (its identity: the row is sent again only when this changes). */
export function windCells(s: SensorState): unknown[] {
  return [
    s.key,
    roundTo(s.currentGustMps, 2),
    roundTo(s.peakGust10minMps, 2),
    roundTo(s.mean10minMps, 2),
    roundTo(s.meanDirDeg, 0),
    s.beaufort,
    s.lastReadingTsMs,
    s.lastReceivedAtMs,
    s.lastArrivalAtMs,
    s.clockOffsetMs === null ? null : Math.round(s.clockOffsetMs),
    s.silent,
    s.implausible,
    roundTo(s.temperatureC, 1),
    roundTo(s.pressurePa, 0),
    roundTo(s.rhPct, 0),
  ];
}

/** Silent and implausible sensors first, then the strongest gust. */
export function windUrgency(s: SensorState): number {
  return (s.silent ? 1e7 : 0) + (s.implausible.length > 0 ? 1e6 : 0) + (s.currentGustMps ?? 0);
}

export const structureColumns = ['id', 'gustMps', 'governingSensorKey', 'windFromDeg', 'utilization', 'calculatedUtilization', 'margin', 'unbounded', 'evaluatedAtMs'] as const;
/** With a wind sector on, the governing case and the limits follow the wind and come with it. */
export const structureDirectionalColumns = ['governing', 'governingDirectionDeg', 'governingElement', 'governingText', 'limitGustMps', 'triggerGustsMps'] as const;
export const structureAgoColumns = ['evaluatedAtMs'] as const;

export function structureCells(u: StructureUpdate, directional: boolean): unknown[] {
  const cells: unknown[] = [
    u.id,
    roundTo(u.gustMps, 2),
    u.governingSensorKey,
    roundTo(u.windFromDeg, 0),
    roundTo(u.utilization, 4),
    roundTo(u.calculatedUtilization, 4),
    roundTo(u.margin, 4),
    u.unbounded,
    u.evaluatedAtMs,
  ];
  if (directional) {
    cells.push(u.governing ?? null, u.governingDirectionDeg ?? null, u.governingElement ?? null, u.governingText ?? null, roundTo(u.limitGustMps ?? null, 2), (u.triggerGustsMps ?? []).map((g) => roundTo(g, 2)));
  }
  return cells;
}

/** No data first, then the highest level, then the highest utilization. */
export function structureUrgency(u: StructureUpdate): number {
  const utilization = u.utilization === null ? (u.unbounded ? 1e5 : 0) : Math.min(u.utilization, 1e5);
  return (u.noData ? 1e9 : 0) + u.level * 1e6 + utilization;
}

/** The row with its times as `ago` (frame time minus the value) where the columns say so. */
export function withAgo(cells: readonly unknown[], columns: readonly string[], ago: readonly string[], atMs: number): unknown[] {
  return cells.map((cell, i) => (typeof cell === 'number' && ago.includes(columns[i]!) ? atMs - cell : cell));
}

