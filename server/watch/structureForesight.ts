/**
 * Each structure's foresight figures for the board (design §2.7, issue 17): from its governing
 * sensor's 10-minute statistics (U, σ, ν; foresight/windowStatistics.ts or, for a sensor that
 * sends summaries, summaryStatistics.ts), moved to the structure's height with the same factor as
 * the gust, the chance that the gust at the structure reaches its next level and its limit within
 * 10 and 30 minutes, the expected peak gust in the next 10 minutes, and the time to the next level
 * at the trend of the 10-minute mean (foresight/timeToLevel.ts). Estimates, never measurements:
 * every figure carries its inputs, and unknown inputs give an unknown answer, never a small chance.
 */
import {
  chanceOfReaching,
  expectedPeakGustMps,
  meanTrend,
  structureGustProcess,
  timeToLevel,
  type GustProcess,
  type MeanSeries,
  type WindStatistics,
} from '../foresight/index.ts';
import { maxPlausibleSpeedMps } from '../engine/limits.ts';
// From its own module, not levels/index.ts: the web app bundles this file, and the index's level
// schemas would bring zod with them (npm run bench: the app's JavaScript 158.6 → 133.6 kB gzipped).
import { cappedLimitMps, chanceThresholds } from '../levels/triggerLadder.ts';

export interface ForesightView {
  /** Always true: the figures are estimates beside the measured gust. */
  estimate: true;
  /** The sensor whose statistics were used (the structure's governing sensor). */
  sensorKey: string;
  /** U, σ and ν at the sensor, and the factor to the structure's height. */
  meanMps: number;
  sigmaMps: number;
  upcrossingRateHz: number;
  heightFactor: number;
  source: 'samples' | 'summary';
  upcrossingRateSource: 'counted' | 'default' | 'given';
  /** Expected peak 3-s gust at the structure in the next 10 minutes, m/s. */
  expectedPeak10Mps: number;
  /** The next level above the current one; null at the top level. */
  nextLevel: number | null;
  nextLabel: string | null;
  nextTriggerGustMps: number | null;
  nextChance10: number | null;
  nextChance30: number | null;
  /** The effective limit and the chance of reaching it. */
  limitGustMps: number;
  limitChance10: number;
  limitChance30: number;
  /** Seconds to the next level at the trend of the 10-minute mean; null when there is none. */
  nextLevelInS: number | null;
  /** Why there is no time to the next level (the trend's status), or 'ahead' / 'reached'. */
  trend: string;
  /**
   * Levels on a chance trigger (levels/levelDefinition.ts): the chance now that the gust at the
   * structure reaches the trigger's threshold (its fraction of capacity) within its horizon. The
   * level machine rises on it (levels/stepLevel.ts); empty when no level is on a chance.
   */
  triggerChances: TriggerChance[];
}

export interface TriggerChance {
  level: number;
  label: string;
  thresholdGustMps: number;
  withinMinutes: number;
  probability: number;
  chance: number;
}

export type StructureForesight = ForesightView | { estimate: true; unknown: string };

export interface ForesightInput {
  sensorKey: string;
  statistics: WindStatistics;
  heightFactor: number;
  /** The sensor's 10-minute means over the last hour (one a minute), for the trend. */
  means: MeanSeries;
  /** The sensor's current gust factor (10-min peak / 10-min mean), or null. */
  gustFactor: number | null;
  level: number;
  levels: ReadonlyArray<{ label: string; trigger?: { kind: string; fraction?: number; withinMinutes?: number; probability?: number } }>;
  triggerGustsMps: readonly number[];
  limitGustMps: number;
  nowMs: number;
}

const tenMinutesS = 600;
const thirtyMinutesS = 1_800;

export function structureForesight(input: ForesightInput): StructureForesight {
  const stats = input.statistics;
  if (stats.status !== 'known') return { estimate: true, unknown: `${input.sensorKey}: ${stats.reason}` };
  if (!Number.isFinite(input.heightFactor) || input.heightFactor <= 0 || input.heightFactor > 20) return { estimate: true, unknown: 'no height factor' };
  const atStructure: GustProcess = structureGustProcess(stats, input.heightFactor);
  const chance = (x: number, s: number): number => chanceOfReaching({ ...atStructure, thresholdMps: x, durationS: s }).probability;
  const next = input.level < input.levels.length ? input.level + 1 : null;
  const nextTrigger = next === null ? null : (input.triggerGustsMps[next - 1] ?? null);
  // An unbounded limit is taken at the plausible top speed, as the ladder takes it.
  const limit = cappedLimitMps(input.limitGustMps);
  let nextLevelInS: number | null = null;
  let trend = 'top level';
  if (nextTrigger !== null) {
    const t = input.gustFactor !== null && input.gustFactor >= 1 && input.gustFactor <= 10 && stats.meanMps <= maxPlausibleSpeedMps
      ? timeToLevel({ trend: meanTrend(input.means, input.nowMs), meanMps: stats.meanMps, gustFactor: input.gustFactor, triggerGustMps: nextTrigger, heightFactor: input.heightFactor })
      : ({ status: 'none', reason: 'no gust factor' } as const);
    if (t.status === 'none') trend = t.reason;
    else {
      trend = t.status;
      nextLevelInS = t.afterS;
    }
  }
  return {
    estimate: true,
    sensorKey: input.sensorKey,
    meanMps: stats.meanMps,
    sigmaMps: stats.sigmaMps,
    upcrossingRateHz: stats.upcrossingRateHz,
    heightFactor: input.heightFactor,
    source: stats.source,
    upcrossingRateSource: stats.upcrossingRateSource,
    expectedPeak10Mps: expectedPeakGustMps(atStructure, tenMinutesS),
    nextLevel: next,
    nextLabel: next === null ? null : (input.levels[next - 1]?.label ?? null),
    nextTriggerGustMps: nextTrigger,
    nextChance10: nextTrigger === null ? null : chance(nextTrigger, tenMinutesS),
    nextChance30: nextTrigger === null ? null : chance(nextTrigger, thirtyMinutesS),
    limitGustMps: limit,
    limitChance10: chance(limit, tenMinutesS),
    limitChance30: chance(limit, thirtyMinutesS),
    nextLevelInS,
    trend,
    triggerChances: chanceThresholds(input.levels, limit).map((t) => ({ ...t, label: input.levels[t.level - 1]!.label, chance: chance(t.thresholdGustMps, t.withinMinutes * 60) })),
  };
}

/** How long a refresh of the figures is trusted by the level machine: older, a chance is unknown (our own choice: six refreshes at 5 s, the silence timeout of a sensor, design §2.6). */
export const foresightTrustedForMs = 30_000;

/**
 * The chances of a structure's levels for the level machine (levels/stepLevel.ts `chances`): one
 * entry per level, null for a level that is not on a chance; a chance level's entry carries null
 * (unknown: never calm) when the figures are unknown or older than `foresightTrustedForMs`.
 * Undefined when no level is on a chance.
 */
export function levelChances(
  levels: ReadonlyArray<{ trigger: { kind: string; probability?: number } }>,
  foresight: StructureForesight | null,
  foresightAtMs: number,
  nowMs: number,
): Array<{ chance: number | null; probability: number } | null> | undefined {
  if (!levels.some((l) => l.trigger.kind === 'chance')) return undefined;
  const fresh = foresight !== null && !('unknown' in foresight) && nowMs - foresightAtMs <= foresightTrustedForMs ? foresight : null;
  return levels.map((l, i) => {
    if (l.trigger.kind !== 'chance' || l.trigger.probability === undefined) return null;
    const known = fresh?.triggerChances.find((c) => c.level === i + 1 && c.probability === l.trigger.probability);
    return { chance: known ? known.chance : null, probability: l.trigger.probability };
  });
}

/**
 * The figures as one compact cell of the stream's `structures` frame (live/frames.ts), in the
 * order of `foresightCellFields`, rounded to what a screen shows: chances to 0.1 %, speeds to
 * 0.1 m/s, the time to the next level to 10 s. Unknown: `[reason]`.
 */
export const foresightCellFields = [
  'nextLevel',
  'nextTriggerGustMps',
  'nextChance10',
  'nextChance30',
  'limitGustMps',
  'limitChance10',
  'limitChance30',
  'expectedPeak10Mps',
  'nextLevelInS',
  'trend',
  'sensorKey',
  'meanMps',
  'sigmaMps',
  'upcrossingRateHz',
  'heightFactor',
  'source',
  'upcrossingRateSource',
  'triggerChances',
] as const;

export function foresightCell(f: StructureForesight | null): unknown[] | null {
  if (f === null) return null;
  if ('unknown' in f) return [f.unknown];
  const p = (v: number | null): number | null => (v === null ? null : Math.round(v * 1000) / 1000);
  const r1 = (v: number | null): number | null => (v === null ? null : Math.round(v * 10) / 10);
  return [
    f.nextLevel,
    r1(f.nextTriggerGustMps),
    p(f.nextChance10),
    p(f.nextChance30),
    r1(f.limitGustMps),
    p(f.limitChance10),
    p(f.limitChance30),
    r1(f.expectedPeak10Mps),
    f.nextLevelInS === null ? null : Math.round(f.nextLevelInS / 10) * 10,
    f.trend,
    f.sensorKey,
    r1(f.meanMps),
    Math.round(f.sigmaMps * 100) / 100,
    Math.round(f.upcrossingRateHz * 1000) / 1000,
    Math.round(f.heightFactor * 1000) / 1000,
    f.source,
    f.upcrossingRateSource,
    // Only for a structure with a level on a chance (the frame's budget is per character).
    ...(f.triggerChances.length === 0 ? [] : [f.triggerChances.map((c) => ({ ...c, thresholdGustMps: r1(c.thresholdGustMps), chance: p(c.chance) }))]),
  ];
}

/** What a screen would show differently (whole percent, 0.5 m/s, whole minutes): when this changes the row is sent again. */
export function foresightIdentity(f: StructureForesight | null): string {
  if (f === null) return 'none';
  if ('unknown' in f) return `unknown:${f.unknown}`;
  const pc = (v: number | null): string => (v === null ? '-' : String(Math.round(v * 100)));
  return [f.nextLevel, pc(f.nextChance10), pc(f.nextChance30), pc(f.limitChance10), pc(f.limitChance30), Math.round(f.expectedPeak10Mps * 2), f.nextLevelInS === null ? '-' : Math.round(f.nextLevelInS / 60), f.trend, f.sensorKey, ...f.triggerChances.map((c) => `${c.level}:${pc(c.chance)}`)].join('|');
}

/** The compact cell of a `structures` frame back to the figures (the web app's reader). */
export function foresightFromCell(cell: unknown): StructureForesight | null {
  if (!Array.isArray(cell)) return null;
  if (cell.length === 1) return { estimate: true, unknown: String(cell[0]) };
  const view: Record<string, unknown> = { estimate: true };
  foresightCellFields.forEach((field, i) => (view[field] = cell[i] ?? null));
  if (!Array.isArray(view.triggerChances)) view.triggerChances = [];
  return view as unknown as ForesightView;
}
