/**
 * Plausibility of a sensor's readings: the closed list of reasons a sensor's data is suspect, and
 * the limits behind them. A suspect sensor raises a sensor alert (design.md §2.6); its readings
 * still count for the gust, because a real extreme must never be thrown away as an error
 * (decision support, conservative).
 */

/**
 * Why a sensor's readings look wrong.
 * - `speed-step`: consecutive raw samples differ by more than real wind does (speedStepLimitMps).
 * - `gust-below-mean`: a summary whose gust is lower than its mean.
 * - `gust-factor-high`: a summary whose gust/mean ratio is beyond gustFactorLimit.
 * - `clock-ahead`: readings stamped further ahead of their receipt than the sensor's tolerance.
 * - `sample-rate-too-high`: more samples within 3 s than the raw ring holds.
 * - `stuck-zero`, `stuck-constant`: from stuckSensors(): the same reading for a long time while
 *   the other sensors on the site read wind.
 */
export const implausibleReasons = [
  'speed-step',
  'gust-below-mean',
  'gust-factor-high',
  'clock-ahead',
  'sample-rate-too-high',
  'stuck-zero',
  'stuck-constant',
] as const;
export type ImplausibleReason = (typeof implausibleReasons)[number];

/**
 * A speed change between consecutive raw samples of more than 30 m/s within 1 s is not wind
 * (for gaps longer than 1 s the limit grows at 30 m/s per second). A step test with a limit of
 * this kind is common practice in quality control of automatic stations; the number is our
 * engineering judgement, generous so that only faults (spikes, bit errors, unit mix-ups) trip it.
 */
export const speedStepLimitMps = 30;
export const speedStepPeriodMs = 1_000;

/**
 * Summaries: a gust below the mean is impossible (the gust is the highest 3-s mean within the
 * averaging period). 0.1 m/s of slack absorbs a gateway rounding both values to one decimal.
 */
export const gustBelowMeanSlackMps = 0.1;

/**
 * Summaries: a gust factor (3-s gust / mean) above 3.5 is implausible. Harper, Kepert & Ginger
 * 2010 (WMO/TD-No. 1555) give mean factors of 1.66 (10-min mean, in-land) and 1.75 (1-h mean,
 * in-land); 3.5 is twice the larger, used generously as they are means of a spread. Applied only
 * from a mean of 3 m/s: in light wind gust factors are erratic (common practice).
 */
export const gustFactorLimit = 3.5;
export const gustFactorMinMeanMps = 3;

/** A reason stays reported for 10 minutes after it was last seen: one mean-wind window. */
export const implausibleHoldMs = 600_000;

/** True when the change from one raw sample to the next is beyond what wind does. */
export function isImplausibleSpeedStep(previousMps: number, nextMps: number, intervalMs: number): boolean {
  const limitMps = speedStepLimitMps * Math.max(1, intervalMs / speedStepPeriodMs);
  return Math.abs(nextMps - previousMps) > limitMps;
}

/** What is wrong with a summary's mean and gust, or null when they are plausible. */
export function summaryImplausibility(meanMps: number, gustMps: number): 'gust-below-mean' | 'gust-factor-high' | null {
  if (gustMps < meanMps - gustBelowMeanSlackMps) return 'gust-below-mean';
  if (meanMps >= gustFactorMinMeanMps && gustMps > gustFactorLimit * meanMps) return 'gust-factor-high';
  return null;
}
