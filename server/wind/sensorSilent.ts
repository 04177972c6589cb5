/**
 * Staleness: a sensor is silent when nothing usable has arrived for longer than its silence
 * timeout (default 30 s, design.md §2.6). A silent sensor raises a sensor alert, and its current
 * gust is unknown, never "calm".
 */
import type { SensorWindState } from './sensorWindState.ts';

/**
 * True when no usable reading has been received within the sensor's silence timeout at nowMs.
 * Silence is about arrival: readings that keep arriving keep the sensor live whatever their time
 * stamps say. A gateway whose clock lags is its own condition (clockOffset.ts: measured per sensor,
 * one alert with the figure); a reading more than 60 s old at receipt is late and kept out of the
 * live state by the watch, so a gateway flushing an old buffer does not count as live either.
 * Before the first reading a sensor is silent.
 *
 * @example
 * sensorSilent(state, Date.now()) // → true when the mast has gone quiet
 */
export function sensorSilent(state: SensorWindState, nowMs: number): boolean {
  if (!Number.isFinite(nowMs)) throw new RangeError(`sensorSilent: nowMs must be finite epoch ms, got ${nowMs}`);
  if (state.newestMode === null) return true;
  return nowMs - state.newestReceivedAtMs > state.silenceTimeoutMs;
}
