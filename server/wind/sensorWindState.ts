/**
 * The live wind state of one sensor: everything the per-message path needs to answer "what is the
 * gust now, what was the peak and the mean over the last 10 minutes", held in arrays allocated
 * once when the sensor is registered. Accepting a sample writes into these arrays; it never
 * allocates (see acceptReading.ts). Reading the state is windSnapshot.ts.
 *
 * Layout, and why:
 *
 * - A short ring of raw samples (time, speed, span) for the 3-second running mean. Only the last
 *   3 s matter for it, so the ring is small (256 samples: 3 s at up to 85 Hz). WMO-No. 8 §5.8.2
 *   finds 4 Hz desirable; gateways typically send 0.25 s to a few seconds apart.
 * - 640 one-second buckets for the 10-minute statistics (mean, direction, peak gust, count).
 *   A bucket holds sums, not samples, so memory and the cost of a snapshot do not grow with the
 *   sample rate: 640 buckets cover the 600 s window plus the 10 s a sensor clock may run ahead,
 *   with room to spare. Each bucket records which second it holds, so an old bucket is recognised
 *   (and reset on write) without a sweep.
 *
 * Times are epoch milliseconds as given by the caller: this module has no clock.
 */

/** Length of the gust averaging window: 3 s (WMO-No. 8 §5.8.2, WMO-No. 306 §15.5.5). */
export const gustWindowMs = 3_000;

/** Length of the mean-wind averaging window: 10 minutes (WMO-No. 8, synoptic practice). */
export const meanWindowMs = 600_000;

/**
 * The longest time one raw sample stands for. A sample represents the wind from the previous
 * sample up to its own time (see acceptReading.ts); after a gap it stands for at most 3 s before
 * it, so a lone sample after a pause is its own 3-s mean (its value, undiluted: conservative) and
 * does not get minutes of weight in the 10-minute mean. The very first sample, with no previous
 * one, stands for 3 s too. It must not be shorter than
 * gustWindowMs, or the 3-s window could contain time no sample stands for.
 */
export const sampleSpanCapMs = gustWindowMs;

/** Default silence timeout: 30 s (design.md §2.6). */
export const defaultSilenceTimeoutMs = 30_000;

/**
 * Temperature, pressure and humidity older than this are unknown: 15 minutes. They change slowly
 * and many stations report them every few minutes; older values no longer describe the air now
 * (engineering judgement).
 */
export const defaultAirDataMaxAgeMs = 900_000;

/**
 * A reading stamped further ahead of its receipt than this is not used for the live state: 10 s,
 * well above the error of a clock kept by NTP, well below the silence timeout (engineering
 * judgement). Without this bound one reading stamped minutes ahead would make every later,
 * correctly stamped reading look out of order and freeze the live state.
 */
export const defaultClockAheadToleranceMs = 10_000;

/** Raw samples kept for the 3-s mean. */
export const defaultRawSampleCapacity = 256;

/** One-second buckets: 600 for the window, plus the clock-ahead tolerance, rounded up. */
export const bucketCount = 640;

/**
 * How a sensor reports: raw samples (the server computes gust and mean) or ready-made summaries
 * (mean and gust as sent). Decided per reading: a reading with a gust is a summary.
 */
export type WindMode = 'raw' | 'summary';

/** A reading as the wind state takes it: SI units, null for anything not reported. */
export interface WindReading {
  /** Sample time, epoch ms. */
  readonly tsMs: number;
  /** An instantaneous sample, or the mean when gustMps is given (m/s, ≥ 0). */
  readonly speedMps: number;
  /** The gust of a ready-made summary (m/s, ≥ 0), or null for a raw sample. */
  readonly gustMps: number | null;
  /** Direction the wind blows from, degrees 0–360 clockwise from north, or null. */
  readonly dirDeg: number | null;
  readonly tempC: number | null;
  readonly pressurePa: number | null;
  readonly rhPct: number | null;
}

export interface SensorWindOptions {
  /** The key the sensor was registered with; stuckSensors reports sensors by it. */
  sensorKey: string;
  /** No reading for longer than this makes the sensor silent (ms, default 30 s). */
  silenceTimeoutMs?: number;
  /** Air data older than this is unknown (ms, default 15 min). */
  airDataMaxAgeMs?: number;
  /** Readings stamped further ahead of their receipt are kept out of the live state (ms). */
  clockAheadToleranceMs?: number;
  /** Raw samples kept for the 3-s mean (default 256; 16–65 536). */
  rawSampleCapacity?: number;
}

/**
 * Mutable per-sensor state. Fields are public for the functions of this folder; other code reads
 * it through windSnapshot() and friends and changes it only through acceptReading().
 */
export class SensorWindState {
  readonly sensorKey: string;
  readonly silenceTimeoutMs: number;
  readonly airDataMaxAgeMs: number;
  readonly clockAheadToleranceMs: number;

  // Raw-sample ring: index of the newest entry and how many entries are valid.
  readonly rawTsMs: Float64Array;
  readonly rawSpeedMps: Float64Array;
  /** Time each raw sample stands for, ending at its timestamp (ms, ≤ sampleSpanCapMs). */
  readonly rawSpanMs: Float64Array;
  rawNewest = -1;
  rawCount = 0;

  // One-second buckets, index = second mod bucketCount. NaN marks a bucket never written.
  readonly bucketSecond: Float64Array;
  /** Σ span (ms) of raw samples in the bucket. */
  readonly bucketSpanMs: Float64Array;
  /** Σ speed × span (m/s · ms). */
  readonly bucketSpeedSpan: Float64Array;
  /** Σ span of raw samples that carry a direction (ms). */
  readonly bucketDirSpanMs: Float64Array;
  /** Σ sin(direction) × span and Σ cos(direction) × span (ms). */
  readonly bucketSinSpan: Float64Array;
  readonly bucketCosSpan: Float64Array;
  /** Highest gust in the bucket: 3-s means of raw samples and gusts of summaries (m/s). */
  readonly bucketPeakGustMps: Float64Array;
  /** Accepted readings in the bucket. */
  readonly bucketReadings: Float64Array;

  // The newest accepted reading.
  /** Mode of the newest accepted reading, null before the first. */
  newestMode: WindMode | null = null;
  newestTsMs = -Infinity;
  newestReceivedAtMs = -Infinity;
  /** 3-s mean at the newest raw sample, or the newest summary's gust (m/s). */
  currentGustMps = 0;

  /** Time and speed of the newest raw sample, for the span and the step test. */
  lastRawTsMs = -Infinity;
  lastRawSpeedMps = 0;

  // The newest summary, used as sent.
  summaryTsMs = -Infinity;
  summaryMeanMps = 0;
  summaryDirDeg: number | null = null;

  // Air data with its own times: a reading may carry some fields and not others.
  temperatureC: number | null = null;
  temperatureTsMs = -Infinity;
  pressurePa: number | null = null;
  pressureTsMs = -Infinity;
  rhPct: number | null = null;
  rhTsMs = -Infinity;

  // Run of identical readings, for stuckSensors: since when the speed (and, for summaries, the
  // gust) has not changed at all.
  runStartTsMs = -Infinity;
  runSpeedMps = 0;
  runGustMps: number | null = null;

  // Latest time each implausibility was seen (ms); a reason stays reported for 10 minutes.
  speedStepAtMs = -Infinity;
  gustBelowMeanAtMs = -Infinity;
  gustFactorHighAtMs = -Infinity;
  clockAheadAtMs = -Infinity;
  sampleRateTooHighAtMs = -Infinity;

  // Arrivals and clock offset (clockOffset.ts): every reading that arrives, used live or not.
  arrivalLastAtMs = -Infinity;
  lagBlockStartMs = -Infinity;
  lagMinCurrentMs = Number.POSITIVE_INFINITY;
  lagMinPreviousMs = Number.POSITIVE_INFINITY;

  constructor(options: SensorWindOptions) {
    if (typeof options.sensorKey !== 'string' || options.sensorKey.length === 0) {
      throw new RangeError(`SensorWindState: sensorKey must be a non-empty string, got ${JSON.stringify(options.sensorKey)}`);
    }
    this.sensorKey = options.sensorKey;
    this.silenceTimeoutMs = positiveMs('silenceTimeoutMs', options.silenceTimeoutMs ?? defaultSilenceTimeoutMs);
    this.airDataMaxAgeMs = positiveMs('airDataMaxAgeMs', options.airDataMaxAgeMs ?? defaultAirDataMaxAgeMs);
    const tolerance = options.clockAheadToleranceMs ?? defaultClockAheadToleranceMs;
    if (!Number.isFinite(tolerance) || tolerance < 0 || tolerance > 60_000) {
      throw new RangeError(`SensorWindState: clockAheadToleranceMs must be within 0–60000 ms, got ${tolerance}`);
    }
    this.clockAheadToleranceMs = tolerance;
    const capacity = options.rawSampleCapacity ?? defaultRawSampleCapacity;
    if (!Number.isInteger(capacity) || capacity < 16 || capacity > 65_536) {
      throw new RangeError(`SensorWindState: rawSampleCapacity must be an integer within 16–65536, got ${capacity}`);
    }
    this.rawTsMs = new Float64Array(capacity);
    this.rawSpeedMps = new Float64Array(capacity);
    this.rawSpanMs = new Float64Array(capacity);
    this.bucketSecond = new Float64Array(bucketCount).fill(Number.NaN);
    this.bucketSpanMs = new Float64Array(bucketCount);
    this.bucketSpeedSpan = new Float64Array(bucketCount);
    this.bucketDirSpanMs = new Float64Array(bucketCount);
    this.bucketSinSpan = new Float64Array(bucketCount);
    this.bucketCosSpan = new Float64Array(bucketCount);
    this.bucketPeakGustMps = new Float64Array(bucketCount);
    this.bucketReadings = new Float64Array(bucketCount);
  }
}

function positiveMs(name: string, value: number): number {
  if (!Number.isFinite(value) || value <= 0) {
    throw new RangeError(`SensorWindState: ${name} must be a finite number of ms > 0, got ${value}`);
  }
  return value;
}

/**
 * A fresh wind state for one sensor, with its arrays allocated once.
 *
 * @example
 * const state = createSensorWindState({ sensorKey: 'mast-north', silenceTimeoutMs: 30_000 });
 */
export function createSensorWindState(options: SensorWindOptions): SensorWindState {
  return new SensorWindState(options);
}
