/**
 * The per-message update of a sensor's wind state. Runs once per accepted reading on the MQTT
 * path, so it writes into the state's preallocated arrays and allocates nothing.
 *
 * Raw samples and the 3-second running mean. Samples may come 0.25 s to a few seconds apart, so
 * the running mean is time-weighted: each sample stands for the wind from the previous sample up
 * to its own time (at most sampleSpanCapMs = 3 s before it), and the 3-s mean at a sample is the
 * average of that step signal over the 3 s ending at the sample. With regular 4 Hz sampling this
 * is exactly the WMO 12-sample running mean (WMO-No. 8 §5.8.2). Letting a sample stand for the
 * time BEFORE it (not after) is the conservative choice: a new high sample counts in full at
 * once, and a single sample more than 3 s after the previous one is its own 3-s mean, undiluted
 * by older, possibly calmer data. The running mean is evaluated at each sample time, as with
 * regularly sampled data; the gust at a sample is what acceptReading returns, and the peak gust
 * is the highest of these.
 *
 * The 10-minute mean and the mean direction use the same weights (time each sample stands for),
 * so irregular sampling does not over-weight bursts; with regular sampling they are plain means.
 *
 * Summaries (a reading with a gust) are used as sent: the current gust is the summary's gust,
 * the mean is its speed.
 *
 * Ordering: only readings newer than the newest accepted one change the live state. Older or
 * equal timestamps are ignored here (the caller still stores them; storage de-duplicates on
 * sensor and timestamp).
 */
import {
  gustWindowMs,
  bucketCount,
  sampleSpanCapMs,
  type SensorWindState,
  type WindReading,
} from './sensorWindState.ts';
import { isImplausibleSpeedStep, summaryImplausibility } from './implausibility.ts';

/** Why a reading did not change the live state (the caller still stores it). */
export type IgnoredReason =
  /** Timestamp older than the newest accepted reading. */
  | 'out-of-order'
  /** Same timestamp as the newest accepted reading. */
  | 'duplicate'
  /** Stamped further ahead of its receipt than the sensor's clock tolerance. */
  | 'ahead-of-clock';

const radPerDeg = Math.PI / 180;

/**
 * Takes one reading into the live state. Returns the 3-s gust at this reading in m/s (for a raw
 * sample the 3-s running mean ending at it, for a summary its gust as sent: the storage layer
 * keeps the highest per minute), or the reason the reading was left out of the live state.
 * Throws a RangeError for values no parser should let through (non-finite, negative speed,
 * direction outside 0–360).
 *
 * @example
 * const gust = acceptReading(state, reading, receivedAtMs);
 * if (typeof gust === 'number') minuteMaxGustMps = Math.max(minuteMaxGustMps, gust);
 */
export function acceptReading(state: SensorWindState, reading: WindReading, receivedAtMs: number): number | IgnoredReason {
  checkReading(reading, receivedAtMs);
  const tsMs = reading.tsMs;
  if (tsMs > receivedAtMs + state.clockAheadToleranceMs) {
    state.clockAheadAtMs = receivedAtMs;
    return 'ahead-of-clock';
  }
  if (tsMs === state.newestTsMs) return 'duplicate';
  if (tsMs < state.newestTsMs) return 'out-of-order';

  state.newestTsMs = tsMs;
  state.newestReceivedAtMs = receivedAtMs;
  const bucket = bucketFor(state, tsMs);
  state.bucketReadings[bucket]! += 1;

  let gustMps: number;
  if (reading.gustMps === null) {
    gustMps = takeRawSample(state, bucket, tsMs, reading.speedMps, reading.dirDeg);
  } else {
    gustMps = reading.gustMps;
    takeSummary(state, tsMs, reading.speedMps, gustMps, reading.dirDeg);
  }
  if (gustMps > state.bucketPeakGustMps[bucket]!) state.bucketPeakGustMps[bucket] = gustMps;
  state.currentGustMps = gustMps;

  if (reading.tempC !== null) {
    state.temperatureC = reading.tempC;
    state.temperatureTsMs = tsMs;
  }
  if (reading.pressurePa !== null) {
    state.pressurePa = reading.pressurePa;
    state.pressureTsMs = tsMs;
  }
  if (reading.rhPct !== null) {
    state.rhPct = reading.rhPct;
    state.rhTsMs = tsMs;
  }
  return gustMps;
}

function takeRawSample(state: SensorWindState, bucket: number, tsMs: number, speedMps: number, dirDeg: number | null): number {
  const hasPrevious = state.lastRawTsMs > -Infinity;
  const spanMs = hasPrevious ? Math.min(tsMs - state.lastRawTsMs, sampleSpanCapMs) : sampleSpanCapMs;
  if (hasPrevious && isImplausibleSpeedStep(state.lastRawSpeedMps, speedMps, tsMs - state.lastRawTsMs)) {
    state.speedStepAtMs = tsMs;
  }

  const capacity = state.rawTsMs.length;
  const newest = state.rawNewest + 1 === capacity ? 0 : state.rawNewest + 1;
  state.rawTsMs[newest] = tsMs;
  state.rawSpeedMps[newest] = speedMps;
  state.rawSpanMs[newest] = spanMs;
  state.rawNewest = newest;
  if (state.rawCount < capacity) state.rawCount++;

  state.bucketSpanMs[bucket]! += spanMs;
  state.bucketSpeedSpan[bucket]! += speedMps * spanMs;
  if (dirDeg !== null) {
    state.bucketDirSpanMs[bucket]! += spanMs;
    state.bucketSinSpan[bucket]! += Math.sin(dirDeg * radPerDeg) * spanMs;
    state.bucketCosSpan[bucket]! += Math.cos(dirDeg * radPerDeg) * spanMs;
  }

  if (state.newestMode !== 'raw' || state.runGustMps !== null || speedMps !== state.runSpeedMps) {
    state.runStartTsMs = tsMs;
    state.runSpeedMps = speedMps;
    state.runGustMps = null;
  }
  state.newestMode = 'raw';
  state.lastRawTsMs = tsMs;
  state.lastRawSpeedMps = speedMps;
  return threeSecondMeanMps(state);
}

/**
 * Time-weighted mean of the raw step signal over the 3 s ending at the newest raw sample. Walks
 * back through the ring until the window start is covered: about 12 samples at 4 Hz. If the ring
 * runs out first (more than its capacity within 3 s), the mean covers the time it holds and the
 * sensor is flagged `sample-rate-too-high`.
 */
function threeSecondMeanMps(state: SensorWindState): number {
  const times = state.rawTsMs;
  const speeds = state.rawSpeedMps;
  const spans = state.rawSpanMs;
  const capacity = times.length;
  let i = state.rawNewest;
  const endMs = times[i]!;
  const windowStartMs = endMs - gustWindowMs;
  let speedTimeSum = 0;
  let coveredMs = 0;
  let complete = false;
  for (let k = 0; k < state.rawCount; k++) {
    const tsMs = times[i]!;
    if (tsMs <= windowStartMs) {
      complete = true;
      break;
    }
    const spanStartMs = tsMs - spans[i]!;
    const fromMs = spanStartMs > windowStartMs ? spanStartMs : windowStartMs;
    speedTimeSum += speeds[i]! * (tsMs - fromMs);
    coveredMs += tsMs - fromMs;
    if (spanStartMs <= windowStartMs) {
      complete = true;
      break;
    }
    i = i === 0 ? capacity - 1 : i - 1;
  }
  if (!complete) state.sampleRateTooHighAtMs = endMs;
  // coveredMs > 0: the newest sample's span is > 0 because its time is strictly newer.
  return speedTimeSum / coveredMs;
}

function takeSummary(state: SensorWindState, tsMs: number, meanMps: number, gustMps: number, dirDeg: number | null): void {
  state.summaryTsMs = tsMs;
  state.summaryMeanMps = meanMps;
  state.summaryDirDeg = dirDeg;
  const implausible = summaryImplausibility(meanMps, gustMps);
  if (implausible === 'gust-below-mean') state.gustBelowMeanAtMs = tsMs;
  else if (implausible === 'gust-factor-high') state.gustFactorHighAtMs = tsMs;
  if (state.newestMode !== 'summary' || meanMps !== state.runSpeedMps || gustMps !== state.runGustMps) {
    state.runStartTsMs = tsMs;
    state.runSpeedMps = meanMps;
    state.runGustMps = gustMps;
  }
  state.newestMode = 'summary';
}

/** Index of the one-second bucket for tsMs, reset first if it still holds an older second. */
function bucketFor(state: SensorWindState, tsMs: number): number {
  const second = Math.floor(tsMs / 1000);
  const index = ((second % bucketCount) + bucketCount) % bucketCount;
  if (state.bucketSecond[index] !== second) {
    state.bucketSecond[index] = second;
    state.bucketSpanMs[index] = 0;
    state.bucketSpeedSpan[index] = 0;
    state.bucketDirSpanMs[index] = 0;
    state.bucketSinSpan[index] = 0;
    state.bucketCosSpan[index] = 0;
    state.bucketPeakGustMps[index] = 0;
    state.bucketReadings[index] = 0;
  }
  return index;
}

function checkReading(reading: WindReading, receivedAtMs: number): void {
  if (!Number.isFinite(receivedAtMs)) throw new RangeError(`acceptReading: receivedAtMs must be finite epoch ms, got ${receivedAtMs}`);
  if (!Number.isFinite(reading.tsMs)) throw new RangeError(`acceptReading: tsMs must be finite epoch ms, got ${reading.tsMs}`);
  if (!Number.isFinite(reading.speedMps) || reading.speedMps < 0) {
    throw new RangeError(`acceptReading: speedMps must be a finite number ≥ 0, got ${reading.speedMps}`);
  }
  if (reading.gustMps !== null && (!Number.isFinite(reading.gustMps) || reading.gustMps < 0)) {
    throw new RangeError(`acceptReading: gustMps must be null or a finite number ≥ 0, got ${reading.gustMps}`);
  }
  if (reading.dirDeg !== null && (!Number.isFinite(reading.dirDeg) || reading.dirDeg < 0 || reading.dirDeg > 360)) {
    throw new RangeError(`acceptReading: dirDeg must be null or within 0–360, got ${reading.dirDeg}`);
  }
  checkNullableFinite('tempC', reading.tempC);
  checkNullableFinite('pressurePa', reading.pressurePa);
  checkNullableFinite('rhPct', reading.rhPct);
}

function checkNullableFinite(name: string, value: number | null): void {
  if (value !== null && !Number.isFinite(value)) throw new RangeError(`acceptReading: ${name} must be null or finite, got ${value}`);
}
