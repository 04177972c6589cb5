/**
 * The stored units turned into the domain's in one place (server/storage/storedUnits.ts), and
 * the one conflict rule of the minute rollups (server/storage/windMinutes.ts).
 */
import { describe, expect, it } from 'vitest';
import { fromCmps, fromUtilizationE4, meanDirectionDeg, toCmps, toUtilizationE4, toWholeDeg, utilizationE4Unbounded } from '../../server/storage/storedUnits.ts';
import { recountDelta, type MinuteSums } from '../../server/storage/windMinutes.ts';

const rad = (deg: number) => (deg * Math.PI) / 180;
const sums = (dirs: number[]) => ({ sin: dirs.reduce((s, d) => s + Math.sin(rad(d)), 0), cos: dirs.reduce((s, d) => s + Math.cos(rad(d)), 0), n: dirs.length });

describe('stored units', () => {
  it('speeds are whole cm/s: 12.345 m/s is stored as 1235 and read back as 12.35 m/s', () => {
    // Rounding to the nearest stored step (common practice); 1 m/s = 100 cm/s (SI).
    expect(toCmps(12.345)).toBe(1235);
    expect(fromCmps(1235)).toBe(12.35);
  });

  it('a minute’s direction is the unit-vector mean of its stored sums (WMO-No. 8, Part I, ch. 5): 350° and 10° give north, not 180°', () => {
    const s = sums([350, 10]);
    expect(meanDirectionDeg(s.sin, s.cos, s.n)).toBeCloseTo(0, 9);
    const w = sums([250, 260, 270]);
    expect(meanDirectionDeg(w.sin, w.cos, w.n)).toBeCloseTo(260, 9);
  });

  it('a minute whose directions cancel out, or that has none, has no direction (unknown, not 0°)', () => {
    const s = sums([90, 270]);
    expect(meanDirectionDeg(s.sin, s.cos, s.n)).toBeNull();
    expect(meanDirectionDeg(0, 0, 0)).toBeNull();
  });

  it('a reading’s direction is a whole degree from north: 359.6° is stored as 0°', () => {
    expect(toWholeDeg(359.6)).toBe(0);
    expect(toWholeDeg(89.4)).toBe(89);
  });

  it('utilization is stored in ten-thousandths, "no resistance left" as the sentinel, and read back as Infinity', () => {
    expect(toUtilizationE4(0.8123)).toBe(8123);
    expect(fromUtilizationE4(8123)).toBe(0.8123);
    expect(toUtilizationE4(Infinity)).toBe(utilizationE4Unbounded);
    expect(fromUtilizationE4(utilizationE4Unbounded)).toBe(Infinity);
    // A finite utilization too large for the column is capped at the sentinel: never read back as a small number.
    expect(fromUtilizationE4(toUtilizationE4(1e9))).toBe(Infinity);
  });
});

describe('the minute rollup’s one conflict rule (additive)', () => {
  const stored: MinuteSums = { count: 3, speedSumCmps: 1500, maxGustCmps: 900, dirSin: 0.5, dirCos: 2.5, dirCount: 3 };
  const add = (a: MinuteSums, d: MinuteSums): MinuteSums => ({
    count: a.count + d.count,
    speedSumCmps: a.speedSumCmps + d.speedSumCmps,
    maxGustCmps: Math.max(a.maxGustCmps, d.maxGustCmps),
    dirSin: a.dirSin + d.dirSin,
    dirCos: a.dirCos + d.dirCos,
    dirCount: a.dirCount + d.dirCount,
  });

  it('a recount of more readings than stored adds the difference: the row then holds the recount', () => {
    const recounted: MinuteSums = { count: 5, speedSumCmps: 2600, maxGustCmps: 1100, dirSin: 0.9, dirCos: 4.1, dirCount: 5 };
    const d = recountDelta(stored, recounted)!;
    const after = add(stored, d);
    expect(after.count).toBe(5);
    expect(after.speedSumCmps).toBe(2600);
    expect(after.maxGustCmps).toBe(1100);
    expect(after.dirSin).toBeCloseTo(0.9, 12);
    expect(after.dirCos).toBeCloseTo(4.1, 12);
    expect(after.dirCount).toBe(5);
  });

  it('a recount of fewer readings (retention deleted part of the minute) or the same writes nothing; a minute not stored is written whole', () => {
    expect(recountDelta(stored, { ...stored, count: 2, speedSumCmps: 1000, dirCount: 2 })).toBeNull();
    expect(recountDelta(stored, { ...stored })).toBeNull();
    expect(recountDelta(undefined, stored)).toEqual(stored);
  });
});
