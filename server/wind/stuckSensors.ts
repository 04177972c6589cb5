/**
 * Stuck sensors: an anemometer whose cups have seized, or a gateway repeating its last value,
 * reads the same number (often exactly 0) for a long time. Calm is real, so a sensor is only
 * called stuck when the other sensors on the site read wind at the same time.
 *
 * Rule (numbers are common practice / engineering judgement, not from a standard): a sensor is
 * stuck when its readings have been exactly the same value for at least 15 minutes — its
 * 10-minute mean has then been exactly that value for at least 5 minutes — while the median
 * 10-minute mean of the other live sensors is at least 3 m/s (a light breeze, Beaufort 2, that
 * turns any working cup anemometer). Exactly 0 is reported as `stuck-zero`, any other repeated
 * value as `stuck-constant` (for summaries both mean and gust must repeat).
 */
import type { SensorWindState } from './sensorWindState.ts';
import { sensorSilent } from './sensorSilent.ts';
import { windSnapshot } from './windSnapshot.ts';

export const defaultStuckAfterMs = 900_000;
export const defaultNeighbourMedianMps = 3;

export interface StuckSensor {
  readonly sensorKey: string;
  readonly reason: 'stuck-zero' | 'stuck-constant';
  /** The value repeated (m/s: the sample, or the summary's mean). */
  readonly valueMps: number;
  /** Timestamp of the first reading of the unchanged run (epoch ms). */
  readonly sinceTsMs: number;
  /** Median 10-minute mean of the other live sensors (m/s). */
  readonly othersMedianMps: number;
}

export interface StuckSensorOptions {
  /** How long the value must have stayed the same (ms, default 15 min). */
  stuckAfterMs?: number;
  /** Median 10-min mean of the other sensors from which they "read wind" (m/s, default 3). */
  neighbourMedianMps?: number;
}

/**
 * The sensors among `states` (one site) that read the same value for too long while the others
 * read wind. Silent sensors are neither judged nor used as neighbours (silence is its own
 * alert). Meant to run periodically (e.g. once a minute), not per message.
 *
 * @example
 * for (const stuck of stuckSensors(siteStates, nowMs)) raiseSensorAlert(stuck.sensorKey, stuck.reason);
 */
export function stuckSensors(states: readonly SensorWindState[], nowMs: number, options: StuckSensorOptions = {}): StuckSensor[] {
  if (!Number.isFinite(nowMs)) throw new RangeError(`stuckSensors: nowMs must be finite epoch ms, got ${nowMs}`);
  const stuckAfterMs = options.stuckAfterMs ?? defaultStuckAfterMs;
  const neighbourMedianMps = options.neighbourMedianMps ?? defaultNeighbourMedianMps;
  if (!Number.isFinite(stuckAfterMs) || stuckAfterMs <= 0) {
    throw new RangeError(`stuckSensors: stuckAfterMs must be a finite number of ms > 0, got ${stuckAfterMs}`);
  }
  if (!Number.isFinite(neighbourMedianMps) || neighbourMedianMps < 0) {
    throw new RangeError(`stuckSensors: neighbourMedianMps must be a finite number ≥ 0, got ${neighbourMedianMps}`);
  }

  // 10-min means of live sensors, computed once: null for silent sensors or no mean.
  const means: (number | null)[] = states.map((state) => {
    if (sensorSilent(state, nowMs)) return null;
    return windSnapshot(state, nowMs).mean10minMps;
  });

  const stuck: StuckSensor[] = [];
  states.forEach((state, i) => {
    if (means[i] === null || means[i] === undefined) return;
    if (nowMs - state.runStartTsMs < stuckAfterMs) return;
    const others: number[] = [];
    means.forEach((mean, j) => {
      if (j !== i && mean !== null && mean !== undefined) others.push(mean);
    });
    if (others.length === 0) return;
    const othersMedianMps = median(others);
    if (othersMedianMps < neighbourMedianMps) return;
    stuck.push({
      sensorKey: state.sensorKey,
      reason: state.runSpeedMps === 0 ? 'stuck-zero' : 'stuck-constant',
      valueMps: state.runSpeedMps,
      sinceTsMs: state.runStartTsMs,
      othersMedianMps,
    });
  });
  return stuck;
}

function median(values: number[]): number {
  values.sort((a, b) => a - b);
  const mid = values.length >> 1;
  return values.length % 2 === 1 ? values[mid]! : (values[mid - 1]! + values[mid]!) / 2;
}
