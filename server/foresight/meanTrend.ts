/**
 * The trend of a sensor's 10-minute mean over the last hour (design.md 2.7, "time to the next
 * level"): the Theil–Sen slope (theilSen.ts) of the 10-minute means against time, with a rule for
 * when the trend is too flat, falling or too noisy to extrapolate. Pure: time is an argument.
 *
 * The rule, in order (ours, no source; the thresholds are engineering judgement):
 * 1. Points: the 10-minute means stamped within the hour up to and including `nowMs`
 *    (nowMs − 3 600 000 ≤ atMs ≤ nowMs), typically one a minute (61 at most then). At least 7
 *    points spanning at least 30 minutes, with at least 10 pairs of points 10 minutes or more
 *    apart (see 4), else 'too-few-points'.
 * 2. Slope b: the Theil–Sen slope over all those points, m/s per second.
 * 3. b ≤ −0.5 m/s per hour: 'falling'; |b| < 0.5 m/s per hour: 'flat' (over the hour ahead that is
 *    less than half a metre per second: nothing to extrapolate).
 * 4. Otherwise rising, but only 'rising' when at least 80 % of the pairs of points at least
 *    10 minutes apart rise (slope > 0; a tie does not count as rising); else 'too-noisy'. Means less than 10 minutes apart share part of their window,
 *    so their pairs are not independent evidence; pairs 10 minutes or more apart are (their
 *    windows do not overlap). 80 % rising is Kendall's τ ≥ 0.6 on those pairs: with 7 means
 *    10 minutes apart (21 pairs, at least 17 rising) it happens by chance alone — no trend,
 *    independent means, every order equally likely — in 174 of the 5 040 orders, 3.5 % (counted
 *    by enumeration).
 */
import { maxPlausibleSpeedMps } from '../engine/limits.ts';
import { assertInRange } from '../engine/rangeCheck.ts';
import { maxTheilSenPoints, theilSenLine } from './theilSen.ts';

/** A sensor's 10-minute means in time order (columnar). */
export interface MeanSeries {
  /** Times the means were taken at (the end of each 10-minute window), epoch ms, strictly increasing. */
  atMs: ArrayLike<number>;
  /** 10-minute means, m/s (0–120). */
  meanMps: ArrayLike<number>;
}

export type TrendStatus = 'rising' | 'flat' | 'falling' | 'too-noisy' | 'too-few-points';

export interface MeanTrend {
  status: TrendStatus;
  /** Theil–Sen slope, m/s per second (null with too few points). */
  slopeMpsPerS: number | null;
  /** Points used. */
  pointCount: number;
  /** Time from the first to the last point used, s. */
  spanS: number;
  /** Pairs at least 10 minutes apart. */
  separatedPairs: number;
  /** Share of those pairs that rise, 0–1 (null with none). */
  risingFraction: number | null;
}

export const trendWindowMs = 3_600_000;
export const minimumTrendPoints = 7;
export const minimumTrendSpanS = 1_800;
/** 0.5 m/s per hour, in m/s per second. */
export const flatSlopeMpsPerS = 0.5 / 3_600;
export const separatedPairMs = 600_000;
export const minimumSeparatedPairs = 10;
export const minimumRisingFraction = 0.8;

/**
 * The trend of the 10-minute mean over the hour ending at `nowMs`.
 *
 * @example meanTrend({ atMs, meanMps }, nowMs) // { status: 'rising', slopeMpsPerS: 0.00167, ... }
 */
export function meanTrend(series: MeanSeries, nowMs: number): MeanTrend {
  const caller = 'meanTrend';
  assertInRange(caller, 'nowMs', nowMs, -8.64e15, 8.64e15, 'ms');
  const { atMs, meanMps } = series;
  if (atMs.length !== meanMps.length) {
    throw new RangeError(`${caller}: series.atMs and series.meanMps must have the same length, got ${atMs.length} and ${meanMps.length}`);
  }
  const times: number[] = [];
  const means: number[] = [];
  for (let i = 0; i < atMs.length; i++) {
    const t = atMs[i]!;
    assertInRange(caller, `series.atMs[${i}]`, t, -8.64e15, 8.64e15, 'ms');
    if (i > 0 && !(t > atMs[i - 1]!)) {
      throw new RangeError(`${caller}: series.atMs must increase strictly, got atMs[${i}] = ${t} after atMs[${i - 1}] = ${atMs[i - 1]}`);
    }
    assertInRange(caller, `series.meanMps[${i}]`, meanMps[i]!, 0, maxPlausibleSpeedMps, 'm/s');
    if (t >= nowMs - trendWindowMs && t <= nowMs) {
      // Seconds from now (≤ 0): small numbers, so the pairwise differences keep their digits.
      times.push((t - nowMs) / 1000);
      means.push(meanMps[i]!);
    }
  }
  const pointCount = times.length;
  assertInRange(caller, 'points within the hour', pointCount, 0, maxTheilSenPoints);
  const spanS = pointCount > 0 ? times[pointCount - 1]! - times[0]! : 0;
  let separatedPairs = 0;
  let rising = 0;
  for (let i = 0; i < pointCount; i++) {
    for (let j = i + 1; j < pointCount; j++) {
      if ((times[j]! - times[i]!) * 1000 >= separatedPairMs) {
        separatedPairs++;
        if (means[j]! > means[i]!) rising++;
      }
    }
  }
  const risingFraction = separatedPairs > 0 ? rising / separatedPairs : null;
  const answer = (status: TrendStatus, slopeMpsPerS: number | null): MeanTrend => ({ status, slopeMpsPerS, pointCount, spanS, separatedPairs, risingFraction });
  if (pointCount < minimumTrendPoints || spanS < minimumTrendSpanS || separatedPairs < minimumSeparatedPairs) return answer('too-few-points', null);
  const { slope } = theilSenLine(times, means);
  if (slope <= -flatSlopeMpsPerS) return answer('falling', slope);
  if (slope < flatSlopeMpsPerS) return answer('flat', slope);
  if (risingFraction! < minimumRisingFraction) return answer('too-noisy', slope);
  return answer('rising', slope);
}
