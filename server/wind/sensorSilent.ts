/**
 * Staleness: a sensor is silent when nothing usable has arrived for longer than its silence
 * timeout (default 30 s, design.md §2.4). A silent sensor raises a sensor alert, and its current
 * gust is unknown, never "calm".
 */
import type { SensorWindState } from './sensorWindState.ts';

/**
 * True when the sensor has had no reading within its silence timeout at nowMs. Both clocks are
 * checked, and either one going quiet makes the sensor silent (conservative):
 * - receipt: no accepted reading received for longer than the timeout (the sensor or its
 *   gateway stopped, whatever its clock says);
 * - sample time: the newest reading's own timestamp is older than the timeout (a gateway
 *   flushing old data, or a clock running behind: the data does not describe the wind now).
 * Before the first reading a sensor is silent.
 *
 * @example
 * sensorSilent(state, Date.now()) // → true when the mast has gone quiet
 */
export function sensorSilent(state: SensorWindState, nowMs: number): boolean {
  if (!Number.isFinite(nowMs)) throw new RangeError(`sensorSilent: nowMs must be finite epoch ms, got ${nowMs}`);
  if (state.newestMode === null) return true;
  return nowMs - state.newestReceivedAtMs > state.silenceTimeoutMs || nowMs - state.newestTsMs > state.silenceTimeoutMs;
}
