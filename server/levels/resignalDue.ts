/**
 * Re-signalling (design §2.4): an unacknowledged alert is signalled again every interval until
 * someone acknowledges it. The default of 2 minutes is our choice (common practice for alarms
 * that need a human answer: often enough not to be forgotten, rare enough not to be muted).
 */
import type { Alert } from './alert.ts';

export const defaultResignalIntervalMs = 2 * 60 * 1000;

/**
 * Whether `alert` is due to be signalled again at `nowMs`, and when its next signal is (or was)
 * due: `lastSignalledAtMs + intervalMs`. An acknowledged alert is never due (`nextAtMs` null).
 * After signalling, record it with `recordSignal` so the schedule moves on.
 * Throws a RangeError when `nowMs` is not finite or `intervalMs` is not a finite number > 0 ms.
 *
 * @example resignalDue(alert, alert.raisedAtMs + 120_000) // → { due: true, nextAtMs: raisedAtMs + 120_000 }
 */
export function resignalDue(
  alert: Alert,
  nowMs: number,
  intervalMs: number = defaultResignalIntervalMs,
): { due: boolean; nextAtMs: number | null } {
  if (!Number.isFinite(nowMs)) {
    throw new RangeError(`resignalDue: nowMs must be a finite time in ms since the epoch, got ${nowMs}`);
  }
  if (!(Number.isFinite(intervalMs) && intervalMs > 0)) {
    throw new RangeError(`resignalDue: intervalMs must be a finite number > 0 ms, got ${intervalMs}`);
  }
  if (alert.acknowledgement !== null) return { due: false, nextAtMs: null };
  const nextAtMs = alert.lastSignalledAtMs + intervalMs;
  return { due: nowMs >= nextAtMs, nextAtMs };
}

/**
 * The alert after it was signalled again at `atMs`. Throws a RangeError when `atMs` is not finite
 * or before its last signal.
 */
export function recordSignal(alert: Alert, atMs: number): Alert {
  if (!(Number.isFinite(atMs) && atMs >= alert.lastSignalledAtMs)) {
    throw new RangeError(
      `recordSignal: atMs must be a finite time not before the last signal (${alert.lastSignalledAtMs} ms), got ${atMs}`,
    );
  }
  return { ...alert, lastSignalledAtMs: atMs };
}
