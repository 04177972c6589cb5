import { describe, expect, it } from 'vitest';
import {
  acceptReading,
  createSensorWindState,
  isImplausibleSpeedStep,
  stuckSensors,
  summaryImplausibility,
  windSnapshot,
  type SensorWindState,
} from '../../../server/wind/index.ts';
import { feed, rawSample, regularSamples, summary, t0Ms } from './windReadings.ts';

describe('speed steps between consecutive raw samples (common practice: step test; limit 30 m/s within 1 s, engineering judgement)', () => {
  it('a jump of 35 m/s within 0.5 s is not wind', () => {
    expect(isImplausibleSpeedStep(0, 35, 500)).toBe(true);
  });

  it('a rise of 25 m/s within 0.25 s, or 29.9 m/s within 1 s, passes', () => {
    expect(isImplausibleSpeedStep(0, 25, 250)).toBe(false);
    expect(isImplausibleSpeedStep(2, 31.9, 1000)).toBe(false);
  });

  it('over longer gaps the limit grows at 30 m/s per second: 35 m/s over 2 s passes, 65 m/s over 2 s does not', () => {
    expect(isImplausibleSpeedStep(0, 35, 2000)).toBe(false);
    expect(isImplausibleSpeedStep(0, 65, 2000)).toBe(true);
  });

  it('a spike is flagged for 10 minutes, and still counts for the gust (a real extreme is never thrown away)', () => {
    // 4 Hz at 4 m/s, one sample of 60 m/s at t0 + 5 s, then 4 m/s again. The gust at the spike:
    // (60 × 0.25 + 4 × 2.75) / 3 = 8.67 m/s.
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, [...regularSamples(t0Ms, 250, 20, () => 4), rawSample(t0Ms + 5000, 60), rawSample(t0Ms + 5250, 4)]);
    const soon = windSnapshot(state, t0Ms + 5250);
    expect(soon.implausibleReasons).toEqual(['speed-step']);
    expect(soon.peakGust10minMps).toBeCloseTo(26 / 3, 12);
    feed(state, regularSamples(t0Ms + 6250, 1000, 600, () => 4));
    expect(windSnapshot(state, t0Ms + 605_250).implausibleReasons).toEqual([]);
  });
});

describe('summaries: gust against mean (Harper, Kepert & Ginger 2010, WMO/TD-No. 1555, used generously)', () => {
  it('a gust below the mean is implausible (the gust is the highest 3-s mean within the period)', () => {
    expect(summaryImplausibility(10, 9)).toBe('gust-below-mean');
  });

  it('a gust equal to the mean, or 0.05 m/s below it from rounding, passes', () => {
    expect(summaryImplausibility(10, 10)).toBeNull();
    expect(summaryImplausibility(10, 9.95)).toBeNull();
  });

  it('the tabulated in-land 10-min → 3-s gust factor 1.66 passes; a factor of 3.75 at a 4 m/s mean does not', () => {
    expect(summaryImplausibility(10, 16.6)).toBeNull();
    expect(summaryImplausibility(4, 15)).toBe('gust-factor-high');
  });

  it('in light wind (mean below 3 m/s) large gust factors pass: they are erratic there (common practice)', () => {
    expect(summaryImplausibility(1, 4)).toBeNull();
  });

  it('an implausible summary shows in the snapshot as a reason', () => {
    const state = createSensorWindState({ sensorKey: 'gateway-b' });
    feed(state, [summary(t0Ms, 12, 10)]);
    expect(windSnapshot(state, t0Ms).implausibleReasons).toEqual(['gust-below-mean']);
  });
});

describe('stuck sensors (common practice; 15 min unchanged while the median of the others is ≥ 3 m/s)', () => {
  /** Three masts at 1 Hz for `minutes`: a reads `aAt(i)`, b and c read a gusty 5–8 m/s. */
  function site(minutes: number, aAt: (i: number) => number, othersAt: (i: number) => number = (i) => 5 + (i % 4)): SensorWindState[] {
    const a = createSensorWindState({ sensorKey: 'mast-a' });
    const b = createSensorWindState({ sensorKey: 'mast-b' });
    const c = createSensorWindState({ sensorKey: 'mast-c' });
    const count = minutes * 60;
    feed(a, regularSamples(t0Ms, 1000, count, aAt));
    feed(b, regularSamples(t0Ms, 1000, count, othersAt));
    feed(c, regularSamples(t0Ms, 1000, count, (i) => othersAt(i + 1)));
    return [a, b, c];
  }
  const endOf = (minutes: number): number => t0Ms + (minutes * 60 - 1) * 1000;

  it('a sensor reading exactly 0 for 16 minutes while the others read 5–8 m/s is stuck at zero', () => {
    const stuck = stuckSensors(site(16, () => 0), endOf(16));
    expect(stuck).toHaveLength(1);
    expect(stuck[0]).toMatchObject({ sensorKey: 'mast-a', reason: 'stuck-zero', valueMps: 0, sinceTsMs: t0Ms });
    expect(stuck[0]!.othersMedianMps).toBeGreaterThanOrEqual(3);
  });

  it('after 14 minutes of zeros it is not yet called stuck', () => {
    expect(stuckSensors(site(14, () => 0), endOf(14))).toEqual([]);
  });

  it('the same non-zero value for 16 minutes is stuck-constant', () => {
    const stuck = stuckSensors(site(16, () => 4.2), endOf(16));
    expect(stuck.map((s) => [s.sensorKey, s.reason, s.valueMps])).toEqual([['mast-a', 'stuck-constant', 4.2]]);
  });

  it('calm everywhere (others below 3 m/s) is calm, not a fault', () => {
    expect(stuckSensors(site(16, () => 0, (i) => (i % 2) * 0.4), endOf(16))).toEqual([]);
  });

  it('a sensor with varying readings is never stuck', () => {
    expect(stuckSensors(site(16, (i) => 3 + (i % 5)), endOf(16))).toEqual([]);
  });

  it('silent sensors are neither judged nor used as neighbours', () => {
    const [a, b, c] = site(16, () => 0);
    // b and c stop reporting; a keeps reporting zeros for one more minute.
    feed(a!, regularSamples(endOf(16) + 1000, 1000, 60, () => 0));
    expect(stuckSensors([a!, b!, c!], endOf(17))).toEqual([]);
  });

  it('a lone sensor has no neighbours to compare with and is not judged', () => {
    const a = createSensorWindState({ sensorKey: 'mast-a' });
    feed(a, regularSamples(t0Ms, 1000, 960, () => 0));
    expect(stuckSensors([a], endOf(16))).toEqual([]);
  });

  it('rejects a nowMs that is not a finite time, naming it', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    acceptReading(state, rawSample(t0Ms, 0), t0Ms);
    expect(() => stuckSensors([state], Number.NaN)).toThrow(/nowMs.*NaN/);
  });
});
