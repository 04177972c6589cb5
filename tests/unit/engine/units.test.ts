import { describe, expect, it } from 'vitest';
import { beaufortForce, beaufortRangeMps, knotsToMps, kmhToMps, mphToMps, mpsToKnots, speedToMps } from '../../../server/engine/index.ts';

describe('speed units (exact definitions, references §9)', () => {
  it('1 knot = 1852/3600 m/s (international nautical mile)', () => {
    expect(knotsToMps(1)).toBe(1852 / 3600);
  });
  it('1 mph = 0.44704 m/s (international yard and pound, 1959)', () => {
    expect(mphToMps(1)).toBe(0.44704);
  });
  it('1 km/h = 1/3.6 m/s', () => {
    expect(kmhToMps(36)).toBeCloseTo(10, 12);
    expect(speedToMps(1, 'km/h')).toBe(1 / 3.6);
  });
  it('converting to a unit and back returns the speed', () => {
    expect(knotsToMps(mpsToKnots(17.3))).toBeCloseTo(17.3, 12);
  });
});

describe('Beaufort force of a 10-minute mean (WMO, references §4)', () => {
  it.each([
    [0.2, 0],
    [10.7, 5],
    [10.8, 6],
    [17.1, 7],
    [17.2, 8],
    [32.6, 11],
    [32.7, 12],
  ])('%f m/s is force %i', (speedMps, force) => {
    expect(beaufortForce(speedMps)).toBe(force);
  });

  it('rounds half-up to 0.1 m/s before classifying: 10.75 m/s is force 6', () => {
    expect(beaufortForce(10.75)).toBe(6);
  });

  it('force 8 spans 17.2 to 20.8 m/s and force 12 has no upper bound', () => {
    expect(beaufortRangeMps(8)).toEqual({ lowerMps: 17.2, upperMps: 20.8 });
    expect(beaufortRangeMps(12).upperMps).toBe(Infinity);
  });

  it('rejects a negative speed with a RangeError', () => {
    expect(() => beaufortForce(-1)).toThrow(RangeError);
  });
});
