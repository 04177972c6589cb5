/**
 * Speed cells and the Beaufort band tops.
 *
 * Beaufort bands in m/s: WMO, Manual on Codes WMO-No. 306 code table 1100, as reproduced in
 * WMO-No. 8 (../shared/references.md §4, checked against several reproductions). The same scale in
 * knots, the unit it is defined in for code table 1100 (several published reproductions agree):
 * 0 <1, 1 1–3, 2 4–6, 3 7–10, 4 11–16, 5 17–21, 6 22–27, 7 28–33, 8 34–40, 9 41–47, 10 48–55,
 * 11 56–63, 12 64 and above. 1 kn = 1852/3600 m/s (SI Brochure, table 8).
 */
import { describe, expect, it } from 'vitest';
import { beaufortTopMps, forecastSpeedUnitOf, forecastUnitOf, speedCell } from '../../../server/foresight/forecastSpeedUnit.ts';

/** Published top of each band, m/s, force 0..11 (WMO). */
const wmoTopMps = [0.2, 1.5, 3.3, 5.4, 7.9, 10.7, 13.8, 17.1, 20.7, 24.4, 28.4, 32.6];
/** Published band of each force in whole knots, force 0..11. */
const wmoKnots: Array<[number, number]> = [[0, 0], [1, 3], [4, 6], [7, 10], [11, 16], [17, 21], [22, 27], [28, 33], [34, 40], [41, 47], [48, 55], [56, 63]];

describe('beaufortTopMps', () => {
  it('is the published top of every band, force 0 to 11', () => {
    expect(wmoTopMps.map((_, force) => beaufortTopMps(force))).toEqual(wmoTopMps);
  });

  it('lies inside the same force’s published band in knots (an independent check of the table)', () => {
    wmoKnots.forEach(([low, high], force) => {
      const knots = Math.round((beaufortTopMps(force) * 3600) / 1852);
      expect(knots, `force ${force}`).toBeGreaterThanOrEqual(low);
      expect(knots, `force ${force}`).toBeLessThanOrEqual(high);
    });
  });

  it('throws a RangeError for force 12 (no upper limit), fractions and negatives', () => {
    for (const force of [12, 6.5, -1, Number.NaN]) expect(() => beaufortTopMps(force)).toThrow(RangeError);
  });
});

describe('speedCell', () => {
  it('reads a number with or without its unit, spaced or not, in any case', () => {
    expect(speedCell('8 mph', false)).toEqual({ kind: 'number', value: 8, unit: 'mph' });
    expect(speedCell('8MPH', false)).toEqual({ kind: 'number', value: 8, unit: 'mph' });
    expect(speedCell(' 14 km/h ', false)).toEqual({ kind: 'number', value: 14, unit: 'km/h' });
    expect(speedCell('12,5 kt', true)).toEqual({ kind: 'number', value: 12.5, unit: 'kn' });
    expect(speedCell('6', false)).toEqual({ kind: 'number', value: 6, unit: null });
    expect(speedCell('Bft 6', false)).toEqual({ kind: 'number', value: 6, unit: 'Bft' });
    expect(speedCell('F6', false)).toEqual({ kind: 'number', value: 6, unit: 'Bft' });
  });

  it('treats empty and "missing" marks as missing, never 0', () => {
    for (const mark of ['', ' ', '-', 'NA', 'n/a', 'null']) expect(speedCell(mark, false)).toEqual({ kind: 'missing' });
  });

  it('says why a cell is not a speed', () => {
    expect(speedCell('8 mhp', false)).toEqual({ kind: 'bad', reason: 'is not a speed — use m/s, km/h, mph or kn' });
    expect(speedCell('fast', false)).toMatchObject({ kind: 'bad' });
    expect(speedCell('12,5', false)).toEqual({ kind: 'bad', reason: 'is not a speed — use a decimal point (12.5) in a comma-separated table' });
    expect(speedCell('1e3', false)).toMatchObject({ kind: 'bad' });
  });
});

describe('unit spellings', () => {
  it('knows the common spellings of each unit, and that Beaufort is not a speed unit', () => {
    expect(['m/s', 'mps', 'm s-1', 'km/h', 'kph', 'kmh', 'kn', 'kt', 'kts', 'knots', 'mph', 'mi/h'].map(forecastSpeedUnitOf)).toEqual([
      'm/s', 'm/s', 'm/s', 'km/h', 'km/h', 'km/h', 'kn', 'kn', 'kn', 'kn', 'mph', 'mph',
    ]);
    expect(forecastUnitOf('Bft')).toBe('Bft');
    expect(forecastSpeedUnitOf('Bft')).toBeNull();
    expect(forecastUnitOf('furlongs')).toBeNull();
  });
});
