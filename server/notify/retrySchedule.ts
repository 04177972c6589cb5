/**
 * When a failed delivery is tried again: 5 s after the first failure, then 15 s, 30 s, 1 min,
 * 2 min, 5 min, 10 min, then every 15 min (the cap), and given up ("failed") after 20 attempts,
 * about 3 h 35 min after the first. Common practice for webhooks: a quick first retry for a
 * receiver that blinked, growing gaps for one that is down.
 */
export const defaultRetryDelaysMs: readonly number[] = [5_000, 15_000, 30_000, 60_000, 120_000, 300_000, 600_000, 900_000];
export const defaultMaxAttempts = 20;

/** The wait after the `attempts`-th failed attempt (1 = the first); the last delay repeats. */
export function retryDelayMs(attempts: number, delaysMs: readonly number[] = defaultRetryDelaysMs): number {
  if (!Number.isInteger(attempts) || attempts < 1) throw new RangeError(`attempts must be a whole number from 1, got ${attempts}`);
  if (delaysMs.length === 0) throw new RangeError('delaysMs must list at least one delay');
  return delaysMs[Math.min(attempts, delaysMs.length) - 1]!;
}
