/**
 * What the foresight takes from a sensor's 10-minute figures besides its statistics: the gust
 * factor G = peak 3-s gust / 10-minute mean (WMO-No. 8 definitions of both), and the last hour of
 * 10-minute means, one a minute, for the mean's trend (foresight/meanTrend.ts). Pure.
 */

/** Below this 10-minute mean the ratio of two near-calm numbers says nothing: no gust factor (our own choice). */
export const gustFactorFloorMeanMps = 0.5;
/** The range a gust factor is held to, the range foresight/timeToLevel.ts takes (our own bounds; gusty open country gives about 1.5, common practice). */
export const gustFactorRange = { min: 1, max: 10 } as const;
/** How long the means for the trend are kept, ms: an hour. */
export const meanHistoryMs = 3_600_000;
/** At most one mean a minute is kept for the trend. */
export const meanHistoryStepMs = 60_000;

/** G = peak gust / mean of the last 10 minutes, held to `gustFactorRange`; null without both or under the floor mean. */
export function tenMinuteGustFactor(meanMps: number | null, peakGustMps: number | null): number | null {
  if (meanMps === null || peakGustMps === null || !(meanMps > gustFactorFloorMeanMps)) return null;
  return Math.min(gustFactorRange.max, Math.max(gustFactorRange.min, peakGustMps / meanMps));
}

/** The last hour of 10-minute means: times (ms) and means (m/s), oldest first. */
export interface MeanHistory {
  atMs: number[];
  meanMps: number[];
}

/** Adds the mean now when a minute has passed since the last one, and drops means older than an hour. */
export function noteTenMinuteMean(history: MeanHistory, nowMs: number, meanMps: number): void {
  const lastAt = history.atMs.at(-1) ?? -Infinity;
  if (nowMs - lastAt < meanHistoryStepMs) return;
  history.atMs.push(nowMs);
  history.meanMps.push(meanMps);
  while (history.atMs.length > 0 && history.atMs[0]! < nowMs - meanHistoryMs) {
    history.atMs.shift();
    history.meanMps.shift();
  }
}
