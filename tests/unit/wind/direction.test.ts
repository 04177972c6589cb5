import { describe, expect, it } from 'vitest';
import { createSensorWindState, unitVectorMeanDeg, windSnapshot } from '../../../server/wind/index.ts';
import { angleBetweenDeg, feed, rawSample, regularSamples, t0Ms } from './windReadings.ts';

// The unit-vector mean of directions (design.md §2.2) is common practice in meteorology; the
// expected values below are plain vector geometry.
describe('mean wind direction (unit-vector mean)', () => {
  it('of 350° and 10° is 0° (north), not the 180° an arithmetic mean would give', () => {
    expect(unitVectorMeanDeg([350, 10])).toBe(0);
  });

  it('of 0° and 90° is 45°; of 270° and 360° is 315°', () => {
    expect(unitVectorMeanDeg([0, 90])).toBeCloseTo(45, 12);
    expect(unitVectorMeanDeg([270, 360])).toBeCloseTo(315, 12);
  });

  it('weighted 3 : 1 between 0° and 90° points to atan(1/3) = 18.435°', () => {
    expect(unitVectorMeanDeg([0, 90], [3, 1])).toBeCloseTo((Math.atan(1 / 3) * 180) / Math.PI, 12);
  });

  it('is unknown when the directions cancel out (90° and 270°) or there are none', () => {
    expect(unitVectorMeanDeg([90, 270])).toBeNull();
    expect(unitVectorMeanDeg([])).toBeNull();
  });

  it('over 10 minutes of samples swinging 340°–20° around north is north', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    // 11 minutes at 4 Hz; the window at the end holds 2404 samples, 601 whole swings.
    const swing = [340, 350, 10, 20];
    feed(state, regularSamples(t0Ms, 250, 2640, () => 6, (i) => swing[i % swing.length]!));
    const dirDeg = windSnapshot(state, t0Ms + 2639 * 250).meanDirDeg;
    expect(dirDeg).not.toBeNull();
    expect(angleBetweenDeg(dirDeg!, 0)).toBeLessThan(1e-9);
  });

  it('ignores samples without a direction', () => {
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    feed(state, [rawSample(t0Ms, 5, 250), rawSample(t0Ms + 1000, 5, null), rawSample(t0Ms + 2000, 5, 250), rawSample(t0Ms + 3000, 5, null)]);
    expect(windSnapshot(state, t0Ms + 3000).meanDirDeg).toBeCloseTo(250, 9);
  });

  it('rejects a weight list of the wrong length, naming both lengths', () => {
    expect(() => unitVectorMeanDeg([0, 90], [1])).toThrow(/\(2\).*1/);
  });
});
