import { describe, expect, it } from 'vitest';
import { createSensorWindState, windSnapshot } from '../../../server/wind/index.ts';
import { feed, rawSample, regularSamples, summary, t0Ms } from './windReadings.ts';

describe('10-minute mean wind', () => {
  it('with regular 4 Hz samples is the plain mean of the last 10 minutes (WMO-No. 8: 10-minute mean)', () => {
    // 11 minutes at 4 Hz cycling 3, 5, 7, 9 m/s (mean 6). At the last sample, t0 + 659.75 s, the
    // window starts at the whole second of t0 + 59.75 s, i.e. t0 + 59 s (never shorter than 10
    // minutes): samples 236…2639, 2404 of them, 601 whole cycles, mean exactly 6 m/s.
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, regularSamples(t0Ms, 250, 2640, (i) => [3, 5, 7, 9][i % 4]!));
    const snap = windSnapshot(state, t0Ms + 2639 * 250);
    expect(snap.sampleCount10min).toBe(2404);
    expect(snap.mean10minMps).toBeCloseTo(6, 12);
  });

  it('the first sample of all stands for 3 s, like any sample after a pause (the cap of sampleSpanCapMs)', () => {
    // 4 samples at 1 s: the first stands for 3 s, the others for 1 s each:
    // (2 × 3 + 6 + 6 + 6) / 6 = 4 m/s.
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, regularSamples(t0Ms, 1000, 4, (i) => (i === 0 ? 2 : 6)));
    expect(windSnapshot(state, t0Ms + 3000).mean10minMps).toBeCloseTo(4, 12);
  });

  it('with irregular samples weights each sample by the time it stands for, at most 3 s (hand-worked)', () => {
    // Samples (s after t0, m/s) and the time each stands for:
    // (0, 5) 3 s [first sample]; (2, 11) 2 s; (2.5, 8) 0.5 s; (4.5, 20) 2 s; (10, 7) 3 s [capped].
    // Mean = (5·3 + 11·2 + 8·0.5 + 20·2 + 7·3) / (3 + 2 + 0.5 + 2 + 3) = 102 / 10.5 = 9.7142857…
    // (The plain mean of the five values, 10.2, would over-weight the burst around t = 2 s.)
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, [rawSample(t0Ms, 5), rawSample(t0Ms + 2000, 11), rawSample(t0Ms + 2500, 8), rawSample(t0Ms + 4500, 20), rawSample(t0Ms + 10_000, 7)]);
    const snap = windSnapshot(state, t0Ms + 10_000);
    expect(snap.mean10minMps).toBeCloseTo(102 / 10.5, 12);
    expect(snap.meanCoveredMs).toBe(10_500);
  });

  it('leaves out samples older than 10 minutes (WMO-No. 8: 10-minute window)', () => {
    // 10 minutes at 20 m/s, then 11 minutes at 5 m/s, 1 Hz: at the end only 5 m/s is in the window.
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, regularSamples(t0Ms, 1000, 600 + 660, (i) => (i < 600 ? 20 : 5)));
    const snap = windSnapshot(state, t0Ms + 1259 * 1000);
    expect(snap.mean10minMps).toBeCloseTo(5, 12);
    expect(snap.peakGust10minMps).toBeCloseTo(5, 12);
    expect(snap.sampleCount10min).toBeGreaterThanOrEqual(600);
    expect(snap.sampleCount10min).toBeLessThanOrEqual(601);
  });

  it('is unknown (null), never 0, when nothing was received in the last 10 minutes', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, [rawSample(t0Ms, 9)]);
    const snap = windSnapshot(state, t0Ms + 11 * 60_000);
    expect(snap.mean10minMps).toBeNull();
    expect(snap.peakGust10minMps).toBeNull();
    expect(snap.meanDirDeg).toBeNull();
    expect(snap.sampleCount10min).toBe(0);
  });
});

describe('ready-made summaries', () => {
  it('are used as sent: the current gust is the latest summary gust, the mean its speed, the peak the highest gust in 10 minutes (design.md §2.2)', () => {
    const state = createSensorWindState({ sensorKey: 'gateway-b' });
    const gusts = feed(state, [summary(t0Ms, 8, 12, 200), summary(t0Ms + 60_000, 9, 15, 210), summary(t0Ms + 120_000, 7, 11, 220)]);
    expect(gusts).toEqual([12, 15, 11]);
    const snap = windSnapshot(state, t0Ms + 120_000);
    expect(snap.mode).toBe('summary');
    expect(snap.currentGustMps).toBe(11);
    expect(snap.peakGust10minMps).toBe(15);
    expect(snap.mean10minMps).toBe(7);
    expect(snap.meanDirDeg).toBe(220);
    expect(snap.meanCoveredMs).toBe(0);
    expect(snap.sampleCount10min).toBe(3);
  });

  it('a summary without direction leaves the direction unknown', () => {
    const state = createSensorWindState({ sensorKey: 'gateway-b' });
    feed(state, [summary(t0Ms, 8, 12)]);
    expect(windSnapshot(state, t0Ms).meanDirDeg).toBeNull();
  });
});

describe('snapshot of a sensor', () => {
  it('before any reading, every value is unknown and the sensor is silent (missing data is never safe, design.md §2.4)', () => {
    const snap = windSnapshot(createSensorWindState({ sensorKey: 'mast-a' }), t0Ms);
    expect(snap).toEqual({
      sensorKey: 'mast-a',
      mode: null,
      currentGustMps: null,
      peakGust10minMps: null,
      mean10minMps: null,
      meanCoveredMs: 0,
      meanDirDeg: null,
      lastReadingTsMs: null,
      lastReceivedAtMs: null,
      sampleCount10min: 0,
      temperatureC: null,
      temperatureTsMs: null,
      pressurePa: null,
      pressureTsMs: null,
      rhPct: null,
      rhTsMs: null,
      silent: true,
      implausibleReasons: [],
    });
  });

  it('keeps the latest temperature, pressure and humidity with their times, and forgets them after 15 minutes (engineering judgement)', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, [
      { tsMs: t0Ms, speedMps: 4, gustMps: null, dirDeg: null, tempC: 18.5, pressurePa: 100_900, rhPct: 64 },
      rawSample(t0Ms + 60_000, 5),
    ]);
    const fresh = windSnapshot(state, t0Ms + 60_000);
    expect([fresh.temperatureC, fresh.pressurePa, fresh.rhPct]).toEqual([18.5, 100_900, 64]);
    expect([fresh.temperatureTsMs, fresh.pressureTsMs, fresh.rhTsMs]).toEqual([t0Ms, t0Ms, t0Ms]);
    const late = windSnapshot(state, t0Ms + 15 * 60_000 + 1);
    expect([late.temperatureC, late.pressurePa, late.rhPct]).toEqual([null, null, null]);
  });

  it('ignores readings older than the newest for the live state, and says so (the caller still stores them)', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    expect(feed(state, [rawSample(t0Ms + 5000, 6), rawSample(t0Ms + 4000, 30), rawSample(t0Ms + 5000, 30)])).toEqual([6, 'out-of-order', 'duplicate']);
    const snap = windSnapshot(state, t0Ms + 5000);
    expect(snap.currentGustMps).toBe(6);
    expect(snap.sampleCount10min).toBe(1);
    expect(snap.lastReadingTsMs).toBe(t0Ms + 5000);
  });

  it('throws a RangeError naming the field for values no parser lets through', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    expect(() => feed(state, [rawSample(t0Ms, -1)])).toThrow(/speedMps.*-1/);
    expect(() => feed(state, [rawSample(t0Ms, Number.NaN)])).toThrow(RangeError);
    expect(() => feed(state, [rawSample(t0Ms, 3, 400)])).toThrow(/dirDeg.*400/);
    expect(() => createSensorWindState({ sensorKey: 'mast-a', silenceTimeoutMs: 0 })).toThrow(/silenceTimeoutMs/);
  });
});
