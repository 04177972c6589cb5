/**
 * How far a sensor's clock (in practice its gateway's) is from the server's, measured from every
 * reading that arrives, late or not.
 *
 * Each reading gives lag = receipt time − its own time stamp: the clock offset plus the delay on
 * the way (network, the gateway's batching), and the delay is never negative. The smallest lag in
 * a recent window is therefore the best estimate of the offset (the minimum-delay rule of clock
 * filters; common practice, from memory of NTP's clock filter). Two blocks of 30 s are kept, so the
 * estimate always rests on 30–60 s of arrivals and follows a clock that is set right within a
 * minute. Positive = the sensor's clock is behind the server's; negative = ahead.
 *
 * Silence is about arrival (sensorSilent.ts); this offset is its own sensor condition, shown on
 * the Sensors screen and alerted once when it passes `clockOffsetAlertMs`.
 */
import type { SensorWindState } from './sensorWindState.ts';

/** Length of one block of the windowed minimum, ms. */
export const clockOffsetBlockMs = 30_000;
/** An offset larger than this (either way) raises one sensor alert, with the figure. Common practice: a gateway kept by NTP is within a second. */
export const clockOffsetAlertMs = 10_000;
/** The alert clears when the offset is back under this (a dead band, so it cannot flicker). */
export const clockOffsetClearMs = 5_000;

/**
 * Notes one reading's arrival. Runs for every reading the sensor sends, including late ones kept
 * out of the live state, and allocates nothing.
 *
 * @example
 * noteArrival(state, reading.tsMs, receivedAtMs);
 */
export function noteArrival(state: SensorWindState, tsMs: number, receivedAtMs: number): void {
  if (!Number.isFinite(tsMs) || !Number.isFinite(receivedAtMs)) throw new RangeError(`noteArrival: times must be finite epoch ms, got ${tsMs}, ${receivedAtMs}`);
  const lag = receivedAtMs - tsMs;
  if (receivedAtMs > state.arrivalLastAtMs) state.arrivalLastAtMs = receivedAtMs;
  if (receivedAtMs - state.lagBlockStartMs >= clockOffsetBlockMs) {
    // A new block; the old one is kept only if it was the one just before.
    state.lagMinPreviousMs = receivedAtMs - state.lagBlockStartMs < 2 * clockOffsetBlockMs ? state.lagMinCurrentMs : Number.POSITIVE_INFINITY;
    state.lagMinCurrentMs = lag;
    state.lagBlockStartMs = receivedAtMs - (receivedAtMs % clockOffsetBlockMs);
    return;
  }
  if (lag < state.lagMinCurrentMs) state.lagMinCurrentMs = lag;
}

/**
 * The estimated clock offset at nowMs (ms; positive = the sensor's clock is behind), or null when
 * nothing has arrived within the last two blocks.
 *
 * @example
 * clockOffsetMs(state, Date.now()) // → 40_120 for a gateway 40 s behind
 */
export function clockOffsetMs(state: SensorWindState, nowMs: number): number | null {
  if (nowMs - state.arrivalLastAtMs > 2 * clockOffsetBlockMs) return null;
  const inCurrent = nowMs - state.lagBlockStartMs < 2 * clockOffsetBlockMs;
  const current = inCurrent ? state.lagMinCurrentMs : Number.POSITIVE_INFINITY;
  const previous = inCurrent && nowMs - state.lagBlockStartMs < clockOffsetBlockMs ? state.lagMinPreviousMs : Number.POSITIVE_INFINITY;
  const best = Math.min(current, previous);
  return Number.isFinite(best) ? best : null;
}
