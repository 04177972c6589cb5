/**
 * A sensor's wind over the last 10 minutes as the foresight figures need it: the mean U, the
 * standard deviation σ of the 3-second mean speed about U, and the up-crossing rate ν of the mean
 * (design.md 2.7). Pure: the series and the time come in as arguments.
 *
 * The series is the sensor's 3-s mean speed (the gust's running mean, WMO-No. 8 §5.8.2) sampled at
 * regular times: best the running mean every second (or more often); block means every 3 s do,
 * but ν then reads a little low, since two crossings between samples are not seen (about 5 % in
 * the simulation of tests/unit/foresight.test.ts, 1 % from samples a second apart). ν can never read above half the sampling rate.
 *
 * Rules (ours, no source):
 * - The window is the `windowMs` (10 minutes) up to and including `nowMs`; samples after `nowMs`
 *   are left out.
 * - Time between two samples counts as observed only when they are at most `maxGapMs` (10 s)
 *   apart; no crossing is counted across a longer gap. ν = up-crossings / observed time.
 * - At least 100 samples and 300 s observed (half the window) are needed, else the answer is
 *   unknown ('too-few-samples'); σ below 0.05 m/s (half the 0.1 m/s step of common anemometers:
 *   a stuck or iced sensor, or a calm nobody can forecast from) is 'no-fluctuation'; fewer than 5
 *   up-crossings ('too-few-crossings': ν's own counting error would be over 45 %) likewise. An
 *   unknown answer is never a calm one: the board shows no chance rather than a small one.
 * - U is the plain mean of the samples (they are taken as evenly spaced), σ the sample standard
 *   deviation (n − 1). An up-crossing is a step from below U to U or above.
 * - The fluctuation is about the window's mean: a wind rising within the window adds its rise to σ.
 */
import { assertAbove, assertInRange } from '../engine/rangeCheck.ts';
import { maxSpeedMps } from './chance.ts';

/** A sensor's 3-s mean speeds, in time order (columnar: one time array, one speed array). */
export interface SpeedSeries {
  /** Sample times, epoch ms, strictly increasing. */
  atMs: ArrayLike<number>;
  /** 3-s mean speeds, m/s (0–120), one per time. */
  speedMps: ArrayLike<number>;
}

export type StatisticsSource = 'samples' | 'summary';

export interface KnownWindStatistics {
  status: 'known';
  source: StatisticsSource;
  /** U, m/s. */
  meanMps: number;
  /** σ, m/s (> 0). */
  sigmaMps: number;
  /** ν, Hz (> 0). */
  upcrossingRateHz: number;
  /** Whether ν was counted from the samples, is the summary default, or was given with the summary. */
  upcrossingRateSource: 'counted' | 'default' | 'given';
  /** The highest 3-s mean in the window, or the summary's gust, m/s. */
  peakMps: number;
  /** Samples used (null for a summary). */
  sampleCount: number | null;
  /** Observed time, s (null for a summary). */
  observedS: number | null;
  /** Up-crossings counted (null for a summary). */
  upcrossings: number | null;
}

/**
 * Why the figures are unknown: too few samples or too little observed time; no fluctuation
 * measured; too few up-crossings to count ν; a summary whose gust is not above its mean.
 */
export type UnknownReason = 'too-few-samples' | 'no-fluctuation' | 'too-few-crossings' | 'gust-not-above-mean';

export interface UnknownWindStatistics {
  status: 'unknown';
  source: StatisticsSource;
  reason: UnknownReason;
  sampleCount: number | null;
  observedS: number | null;
}

export type WindStatistics = KnownWindStatistics | UnknownWindStatistics;

export interface WindowStatisticsOptions {
  /** Window length, ms (default 600 000: the 10-minute mean of WMO-No. 8; 60 000–3 600 000). */
  windowMs?: number;
  /** Longest step between samples counted as observed, ms (default 10 000; > 0). */
  maxGapMs?: number;
}

export const statisticsWindowMs = 600_000;
export const defaultMaxGapMs = 10_000;
export const minimumSamples = 100;
export const minimumObservedS = 300;
export const minimumUpcrossings = 5;
export const minimumSigmaMps = 0.05;

/**
 * U, σ and ν of the samples in the window ending at `nowMs`, or unknown with the reason.
 *
 * @example windowStatistics({ atMs, speedMps }, nowMs) // { status: 'known', meanMps, sigmaMps, upcrossingRateHz, ... }
 */
export function windowStatistics(series: SpeedSeries, nowMs: number, options: WindowStatisticsOptions = {}): WindStatistics {
  const caller = 'windowStatistics';
  const windowMs = options.windowMs ?? statisticsWindowMs;
  const maxGapMs = options.maxGapMs ?? defaultMaxGapMs;
  assertInRange(caller, 'nowMs', nowMs, -8.64e15, 8.64e15, 'ms');
  assertInRange(caller, 'options.windowMs', windowMs, 60_000, 3_600_000, 'ms');
  assertAbove(caller, 'options.maxGapMs', maxGapMs, 0, windowMs, 'ms');
  const { atMs, speedMps } = series;
  if (atMs.length !== speedMps.length) {
    throw new RangeError(`${caller}: series.atMs and series.speedMps must have the same length, got ${atMs.length} and ${speedMps.length}`);
  }
  // In-window samples are [start, end): the first after nowMs − windowMs, up to the last at or before nowMs.
  let start = atMs.length;
  let end = 0;
  for (let i = 0; i < atMs.length; i++) {
    const t = atMs[i]!;
    assertInRange(caller, `series.atMs[${i}]`, t, -8.64e15, 8.64e15, 'ms');
    if (i > 0 && !(t > atMs[i - 1]!)) {
      throw new RangeError(`${caller}: series.atMs must increase strictly, got atMs[${i}] = ${t} after atMs[${i - 1}] = ${atMs[i - 1]}`);
    }
    assertInRange(caller, `series.speedMps[${i}]`, speedMps[i]!, 0, maxSpeedMps, 'm/s');
    if (start === atMs.length && t > nowMs - windowMs) start = i;
    if (t <= nowMs) end = i + 1;
  }
  const sampleCount = Math.max(0, end - start);
  let observedMs = 0;
  for (let i = start + 1; i < end; i++) {
    const step = atMs[i]! - atMs[i - 1]!;
    if (step <= maxGapMs) observedMs += step;
  }
  const observedS = observedMs / 1000;
  const unknown = (reason: UnknownReason): UnknownWindStatistics => ({ status: 'unknown', source: 'samples', reason, sampleCount, observedS });
  if (sampleCount < minimumSamples || observedS < minimumObservedS) return unknown('too-few-samples');

  let sum = 0;
  let peakMps = 0;
  for (let i = start; i < end; i++) {
    sum += speedMps[i]!;
    if (speedMps[i]! > peakMps) peakMps = speedMps[i]!;
  }
  const meanMps = sum / sampleCount;
  // Two passes: the sum of squares about the mean, not Σv² − n U², which loses digits.
  let squares = 0;
  for (let i = start; i < end; i++) squares += (speedMps[i]! - meanMps) ** 2;
  const sigmaMps = Math.sqrt(squares / (sampleCount - 1));
  if (sigmaMps < minimumSigmaMps) return unknown('no-fluctuation');

  let upcrossings = 0;
  for (let i = start + 1; i < end; i++) {
    if (atMs[i]! - atMs[i - 1]! <= maxGapMs && speedMps[i - 1]! < meanMps && speedMps[i]! >= meanMps) upcrossings++;
  }
  if (upcrossings < minimumUpcrossings) return unknown('too-few-crossings');
  return {
    status: 'known',
    source: 'samples',
    meanMps,
    sigmaMps,
    upcrossingRateHz: upcrossings / observedS,
    upcrossingRateSource: 'counted',
    peakMps,
    sampleCount,
    observedS,
    upcrossings,
  };
}
