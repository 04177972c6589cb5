/**
 * The sensor figures the foresight takes besides its statistics (server/wind/meanHistory.ts): the
 * gust factor G = peak 3-s gust / 10-minute mean (WMO-No. 8 definitions), and the last hour of
 * 10-minute means, one a minute, for the trend. The floor and range are our own choices.
 */
import { describe, expect, it } from 'vitest';
import { gustFactorFloorMeanMps, gustFactorRange, noteTenMinuteMean, tenMinuteGustFactor, type MeanHistory } from '../../../server/wind/index.ts';

describe('the gust factor', () => {
  it('is the peak gust over the mean: 15 over 10 m/s gives 1.5', () => {
    expect(tenMinuteGustFactor(10, 15)).toBe(1.5);
  });
  it('is unknown without both figures or in a near calm, never a guess', () => {
    expect(tenMinuteGustFactor(null, 15)).toBeNull();
    expect(tenMinuteGustFactor(10, null)).toBeNull();
    expect(tenMinuteGustFactor(gustFactorFloorMeanMps, 3)).toBeNull();
  });
  it('is held to the range the time-to-level estimate takes', () => {
    expect(tenMinuteGustFactor(1, 30)).toBe(gustFactorRange.max);
    expect(tenMinuteGustFactor(10, 8)).toBe(gustFactorRange.min);
  });
});

describe('the hour of means for the trend', () => {
  it('keeps one mean a minute at most and drops those older than an hour', () => {
    const history: MeanHistory = { atMs: [], meanMps: [] };
    const t0 = Date.UTC(2026, 7, 1, 12);
    for (let s = 0; s <= 2 * 3600; s += 5) noteTenMinuteMean(history, t0 + s * 1000, s / 600);
    // Every 60 s over the last hour: 61 means, the oldest exactly an hour before the last.
    expect(history.atMs).toHaveLength(61);
    expect(history.atMs.at(-1)! - history.atMs[0]!).toBe(3_600_000);
    expect(history.atMs.every((at, i) => i === 0 || at - history.atMs[i - 1]! === 60_000)).toBe(true);
    expect(history.meanMps.at(-1)).toBe(12);
  });
});
