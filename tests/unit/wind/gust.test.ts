import { describe, expect, it } from 'vitest';
import { createSensorWindState, peakGustMps, windSnapshot } from '../../../server/wind/index.ts';
import { feed, rawSample, regularSamples, seededRandom, t0Ms } from './windReadings.ts';

describe('3-second gust from raw samples', () => {
  it('at 4 Hz the 3-s running mean is the mean of the last 12 samples (WMO-No. 8 §5.8.2: 3-s running average, 4 Hz sampling)', () => {
    // 40 samples of 10 m/s (10 s), then 22 m/s. At the 4th sample of 22 m/s the 3 s window
    // (12 samples of 0.25 s) holds 8 × 10 and 4 × 22: (80 + 88) / 12 = 14 m/s.
    // Once 12 samples of 22 m/s are in, the gust is 22 m/s.
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    const gusts = feed(state, regularSamples(t0Ms, 250, 52, (i) => (i < 40 ? 10 : 22)));
    expect(gusts[39]).toBeCloseTo(10, 12);
    expect(gusts[43]).toBeCloseTo(14, 12);
    expect(gusts[51]).toBeCloseTo(22, 12);
  });

  it('at 4 Hz equals an independent 12-sample moving average on a gusty random series (WMO-No. 8 §5.8.2)', () => {
    const random = seededRandom(20240601);
    const speeds = Array.from({ length: 2400 }, () => 4 + 12 * random());
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    const gusts = feed(state, regularSamples(t0Ms, 250, speeds.length, (i) => speeds[i]!));
    for (let i = 11; i < speeds.length; i++) {
      const last12 = speeds.slice(i - 11, i + 1);
      const movingAverage = last12.reduce((a, b) => a + b, 0) / 12;
      expect(gusts[i]).toBeCloseTo(movingAverage, 9);
    }
    // The peak gust is the highest 3-s running mean (WMO-No. 306 §15.5.5); the series spans
    // exactly the 10 minutes, so every sample's gust is in the window.
    const nowMs = t0Ms + 2399 * 250;
    expect(windSnapshot(state, nowMs).peakGust10minMps).toBe(Math.max(...(gusts as number[])));
  });

  it('with irregular samples is the time-weighted mean over 3 s, each sample standing for the time since the previous one (hand-worked)', () => {
    // Samples (s after t0, m/s): (0, 5) (2, 11) (2.5, 8) (4.5, 20) (10, 7).
    // Each sample stands for the time back to the previous sample, at most 3 s.
    // t = 0:   only sample, stands for (−3, 0]                                  → 5
    // t = 2:   window (−1, 2]:   11 × 2 + 5 × 1 = 27                    / 3     → 9
    // t = 2.5: window (−0.5, 2.5]: 8 × 0.5 + 11 × 2 + 5 × 0.5 = 28.5     / 3     → 9.5
    // t = 4.5: window (1.5, 4.5]: 20 × 2 + 8 × 0.5 + 11 × 0.5 = 49.5     / 3     → 16.5
    // t = 10:  5.5 s after the previous sample: it alone covers the 3 s          → 7
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    const gusts = feed(state, [
      rawSample(t0Ms, 5),
      rawSample(t0Ms + 2000, 11),
      rawSample(t0Ms + 2500, 8),
      rawSample(t0Ms + 4500, 20),
      rawSample(t0Ms + 10_000, 7),
    ]);
    expect(gusts[0]).toBeCloseTo(5, 12);
    expect(gusts[1]).toBeCloseTo(9, 12);
    expect(gusts[2]).toBeCloseTo(9.5, 12);
    expect(gusts[3]).toBeCloseTo(16.5, 12);
    expect(gusts[4]).toBeCloseTo(7, 12);
    const snap = windSnapshot(state, t0Ms + 10_000);
    // Current gust: the 3-s running mean now. Peak: the highest 3-s mean in the window.
    expect(snap.currentGustMps).toBeCloseTo(7, 12);
    expect(snap.peakGust10minMps).toBeCloseTo(16.5, 12);
  });

  it('a single sample more than 3 s after the previous one is its own 3-s mean, undiluted by calmer older data (conservative choice)', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    const gusts = feed(state, [rawSample(t0Ms, 2), rawSample(t0Ms + 4000, 18)]);
    expect(gusts[1]).toBe(18);
  });

  it('the peak gust over 10 minutes forgets gusts older than 10 minutes (WMO-No. 8: 10-minute window)', () => {
    // A 25 m/s sample at t0, then 5 m/s every second for 11 minutes. The gusts in the first
    // 3 s after t0 still contain the 25 m/s sample ((25 × 2 + 5) / 3 = 18.3 at t0 + 1 s).
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    const calm = regularSamples(t0Ms + 1000, 1000, 660, () => 5);
    feed(state, [rawSample(t0Ms, 25), ...calm.slice(0, 540)]);
    expect(windSnapshot(state, t0Ms + 9 * 60_000).peakGust10minMps).toBe(25);
    feed(state, calm.slice(540));
    expect(windSnapshot(state, t0Ms + 11 * 60_000).peakGust10minMps).toBeCloseTo(5, 12);
  });

  it('the peak over a shorter window (e.g. the last minute) covers only that window', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, [rawSample(t0Ms, 15), ...regularSamples(t0Ms + 4000, 1000, 120, () => 6)]);
    const nowMs = t0Ms + 123_000;
    expect(peakGustMps(state, nowMs, 60_000)).toBeCloseTo(6, 12);
    expect(peakGustMps(state, nowMs, 600_000)).toBe(15);
  });

  it('peakGustMps rejects a window longer than the 10 minutes it keeps, naming the value', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    expect(() => peakGustMps(state, t0Ms, 700_000)).toThrow(/windowMs.*700000/);
    expect(() => peakGustMps(state, t0Ms, 0)).toThrow(RangeError);
  });

  it('more samples within 3 s than the ring holds is flagged, and the gust still covers what it holds', () => {
    // 100 Hz for 3 s: 300 samples in 3 s, the ring keeps 256.
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    const gusts = feed(state, regularSamples(t0Ms, 10, 400, () => 12));
    expect(gusts[399]).toBeCloseTo(12, 9);
    expect(windSnapshot(state, t0Ms + 4000).implausibleReasons).toContain('sample-rate-too-high');
  });

  it('4 Hz, the rate WMO-No. 8 finds desirable, never trips the sample-rate check', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, regularSamples(t0Ms, 250, 400, (i) => 5 + (i % 7)));
    expect(windSnapshot(state, t0Ms + 100_000).implausibleReasons).toEqual([]);
  });
});
