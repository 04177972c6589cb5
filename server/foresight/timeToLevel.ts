/**
 * Time to the next level (design.md 2.7): with the mean rising at the trend's slope b and the
 * current gust factor G (gust / mean), the expected peak gust after a time t is
 *
 *   f · G · (U + b t),   f the height factor to the structure (engine gustHeightFactor),
 *
 * and the level's trigger x is reached after t = (x / (f G) − U) / b. Rules (ours, no source):
 * - 'reached' (after 0 s) when f G U is at or above x already, whatever the trend;
 * - otherwise only when the trend is 'rising' (meanTrend.ts); else none, with the trend's status
 *   as the reason;
 * - none ('beyond-horizon') when t is longer than the trend's own span (at most the hour it was
 *   measured over): a trend is not extrapolated further ahead than it was observed.
 * The estimate assumes the gust factor stays as it is; it says nothing of a squall line.
 */
import { maxPlausibleSpeedMps } from '../engine/limits.ts';
import { assertAbove, assertInRange } from '../engine/rangeCheck.ts';
import type { MeanTrend, TrendStatus } from './meanTrend.ts';

export interface TimeToLevelInput {
  trend: MeanTrend;
  /** Current 10-minute mean U at the sensor, m/s (0–120). */
  meanMps: number;
  /** Current gust factor G = gust / mean at the sensor (1–10). */
  gustFactor: number;
  /** The level's trigger as a gust at the structure, m/s (≥ 0, finite). */
  triggerGustMps: number;
  /** Factor from the sensor's gust to the structure's (default 1; > 0, ≤ 20). */
  heightFactor?: number;
}

export type TimeToLevel =
  | { status: 'ahead'; afterS: number }
  | { status: 'reached'; afterS: 0 }
  | { status: 'none'; reason: Exclude<TrendStatus, 'rising'> | 'beyond-horizon' };

/**
 * When the expected peak gust reaches the trigger at this trend, or why there is no answer.
 *
 * @example timeToLevel({ trend, meanMps: 14, gustFactor: 1.5, triggerGustMps: 24 }) // { status: 'ahead', afterS: 1200 } at 0.1 m/s a minute
 */
export function timeToLevel(input: TimeToLevelInput): TimeToLevel {
  const caller = 'timeToLevel';
  const heightFactor = input.heightFactor ?? 1;
  assertInRange(caller, 'meanMps', input.meanMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertInRange(caller, 'gustFactor', input.gustFactor, 1, 10);
  assertInRange(caller, 'triggerGustMps', input.triggerGustMps, 0, Number.MAX_VALUE, 'm/s');
  assertAbove(caller, 'heightFactor', heightFactor, 0, 20);
  const { trend } = input;
  const peakNowMps = heightFactor * input.gustFactor * input.meanMps;
  if (peakNowMps >= input.triggerGustMps) return { status: 'reached', afterS: 0 };
  if (trend.status !== 'rising') return { status: 'none', reason: trend.status };
  const slope = trend.slopeMpsPerS!;
  const afterS = (input.triggerGustMps / (heightFactor * input.gustFactor) - input.meanMps) / slope;
  if (afterS > trend.spanS) return { status: 'none', reason: 'beyond-horizon' };
  return { status: 'ahead', afterS };
}
