/**
 * When the forecast feed is polled next (pure). After a success: the site's interval. After the
 * n-th failure in a row: 1 minute · 2^(n−1), never longer than the interval (1, 2, 4, 8… min),
 * so a feed that is down a moment is read again soon, one that stays down is asked no more often
 * than every interval, and a broken feed never hammers its server (common practice: exponential
 * back-off).
 */
export const firstRetryMs = 60_000;

export function nextPollDelayMs(intervalMs: number, consecutiveFailures: number): number {
  if (!(Number.isFinite(intervalMs) && intervalMs > 0)) throw new RangeError(`nextPollDelayMs: intervalMs must be a finite number > 0, got ${intervalMs}`);
  if (!(Number.isInteger(consecutiveFailures) && consecutiveFailures >= 0)) {
    throw new RangeError(`nextPollDelayMs: consecutiveFailures must be a whole number ≥ 0, got ${consecutiveFailures}`);
  }
  if (consecutiveFailures === 0) return intervalMs;
  return Math.min(intervalMs, firstRetryMs * 2 ** Math.min(consecutiveFailures - 1, 30));
}

/** Stale (design §2.7: a late feed is shown as such, never as calm): no successful poll within twice the interval. */
export function feedIsStale(lastSuccessAtMs: number | null, intervalMs: number, nowMs: number): boolean {
  return lastSuccessAtMs === null || nowMs - lastSuccessAtMs > 2 * intervalMs;
}
