import { describe, expect, it } from 'vitest';
import { acceptReading, clockOffsetMs, createSensorWindState, noteArrival, sensorSilent, windSnapshot } from '../../../server/wind/index.ts';
import { rawSample, t0Ms } from './windReadings.ts';

describe('silent sensors (design.md §2.4: silent for longer than its timeout, default 30 s)', () => {
  it('a sensor is live up to 30 s after its last reading and silent after', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    acceptReading(state, rawSample(t0Ms, 7), t0Ms);
    expect(sensorSilent(state, t0Ms + 30_000)).toBe(false);
    expect(sensorSilent(state, t0Ms + 30_001)).toBe(true);
  });

  it('the timeout is per sensor', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a', silenceTimeoutMs: 60_000 });
    acceptReading(state, rawSample(t0Ms, 7), t0Ms);
    expect(sensorSilent(state, t0Ms + 45_000)).toBe(false);
    expect(sensorSilent(state, t0Ms + 60_001)).toBe(true);
  });

  it('a silent sensor has no current gust (unknown, never calm) but keeps its 10-minute history', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    acceptReading(state, rawSample(t0Ms, 11), t0Ms);
    const snap = windSnapshot(state, t0Ms + 45_000);
    expect(snap.silent).toBe(true);
    expect(snap.currentGustMps).toBeNull();
    expect(snap.peakGust10minMps).toBe(11);
    expect(snap.mean10minMps).toBe(11);
  });

  it('silence is about arrival: a reading stamped 31 s before it arrives keeps the sensor live (a lagging clock is its own condition, clockOffset.ts; issue 13 item 2)', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    acceptReading(state, rawSample(t0Ms, 7), t0Ms + 31_000);
    expect(sensorSilent(state, t0Ms + 31_000)).toBe(false);
    expect(sensorSilent(state, t0Ms + 61_001)).toBe(true);
    noteArrival(state, t0Ms, t0Ms + 31_000);
    expect(clockOffsetMs(state, t0Ms + 31_000)).toBe(31_000);
  });

  it('a sensor that has never reported is silent', () => {
    expect(sensorSilent(createSensorWindState({ sensorKey: 'mast-a' }), t0Ms)).toBe(true);
  });

  it('a reading stamped more than 10 s ahead of its receipt is kept out of the live state and flagged; one within 10 s is taken', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    expect(acceptReading(state, rawSample(t0Ms + 10_000, 7), t0Ms)).toBe(7);
    expect(acceptReading(state, rawSample(t0Ms + 300_000, 40), t0Ms + 1000)).toBe('ahead-of-clock');
    // The far-future stamp did not block the correctly stamped readings that follow.
    expect(acceptReading(state, rawSample(t0Ms + 12_000, 8), t0Ms + 12_000)).toBeCloseTo(7.67, 2);
    const snap = windSnapshot(state, t0Ms + 12_000);
    expect(snap.implausibleReasons).toEqual(['clock-ahead']);
    expect(snap.peakGust10minMps).toBeLessThan(40);
  });
});
