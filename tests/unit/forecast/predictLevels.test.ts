/**
 * Forecast check (design.md §2.5, our own model). The gust factor 1.66 for a row with only a mean
 * wind is the in-land 3-s gust / 10-min mean ratio of Harper, Kepert & Ginger (2010), WMO/TD-No.
 * 1555 (references.md §3). Staged triggers 60 %/80 % of load follow the Cardiff Council Bute Park
 * event organisers' guide (2020). Structures and forecast are invented.
 */
import { describe, expect, it } from 'vitest';
import { gustAtFractionWithoutUpliftMps } from '../../../server/levels/index.ts';
import { inlandGustFactor, parseForecastTable, predictLevels, type ForecastStructure } from '../../../server/foresight/index.ts';

const hourMs = 3_600_000;
const t0 = Date.UTC(2026, 5, 13, 10);
const ladder = (limitGustMps: number) => [0.6, 0.8, 1].map((f) => gustAtFractionWithoutUpliftMps(limitGustMps, f));

const bannerFence: ForecastStructure = { id: 'banner-fence-east', triggerGustsMps: ladder(20), heightFactor: 1 };
const ledScreen: ForecastStructure = { id: 'led-screen-main', triggerGustsMps: [12, 15, 18], heightFactor: 1.2 };

describe('predictLevels', () => {
  it('compares each row’s gust times the height factor with each structure’s triggers', () => {
    const [prediction] = predictLevels([{ timeMs: t0, meanMps: 9, gustMps: 15 }], [bannerFence, ledScreen]);
    expect(prediction!.gustSource).toBe('gust');
    expect(prediction!.levels).toEqual([
      { structureId: 'banner-fence-east', gustAtStructureMps: 15, level: 0 }, // below 15.49
      { structureId: 'led-screen-main', gustAtStructureMps: 18, level: 3 }, // 15 × 1.2 reaches 18
    ]);
  });

  it('counts a gust equal to a trigger as reaching it, as the live levels do', () => {
    const [prediction] = predictLevels(
      [{ timeMs: t0, meanMps: null, gustMps: gustAtFractionWithoutUpliftMps(20, 0.8) }],
      [bannerFence],
    );
    expect(prediction!.levels[0]!.level).toBe(2);
  });

  it('estimates a missing gust as mean × 1.66 (Harper, Kepert & Ginger 2010, in-land)', () => {
    expect(inlandGustFactor).toBe(1.66);
    const [prediction] = predictLevels([{ timeMs: t0, meanMps: 10, gustMps: null }], [bannerFence]);
    expect(prediction!.gustSource).toBe('mean');
    expect(prediction!.gustMps).toBeCloseTo(16.6, 12);
    expect(prediction!.levels[0]!.level).toBe(1); // 16.6 ≥ 15.49, < 17.89
  });

  it('gives an unknown level, never calm, for a row with neither gust nor mean', () => {
    const [prediction] = predictLevels([{ timeMs: t0, meanMps: null, gustMps: null }], [bannerFence, ledScreen]);
    expect(prediction).toEqual({
      timeMs: t0,
      gustMps: null,
      gustSource: null,
      levels: [
        { structureId: 'banner-fence-east', gustAtStructureMps: null, level: null },
        { structureId: 'led-screen-main', gustAtStructureMps: null, level: null },
      ],
    });
  });

  it('gives the level of every structure hour by hour from a pasted table', () => {
    const table = parseForecastTable(
      'time;mean (km/h);gust (km/h)\n2026-06-13 11:00;25;40\n2026-06-13 12:00;35;58\n2026-06-13 13:00;40;\n2026-06-13 14:00;;\n',
      { timeZone: 'Europe/London' },
    );
    if (!table.ok) throw new Error(table.problems.map((p) => p.message).join('; '));
    const predictions = predictLevels(table.rows, [bannerFence, ledScreen]);
    expect(predictions.map((p) => p.timeMs)).toEqual([t0, t0 + hourMs, t0 + 2 * hourMs, t0 + 3 * hourMs]);
    // Gusts: 11.11 m/s, 16.11 m/s, 40 km/h mean × 1.66 = 18.44 m/s, unknown.
    expect(predictions.map((p) => p.levels.map((l) => l.level))).toEqual([
      [0, 1], // 11.11 | 13.33
      [1, 3], // 16.11 | 19.33
      [2, 3], // 18.44 | 22.13
      [null, null],
    ]);
  });

  it('refuses a bad structure or row with a RangeError naming it', () => {
    const row = { timeMs: t0, meanMps: null, gustMps: 10 };
    expect(() => predictLevels([row], [{ ...bannerFence, heightFactor: 0 }])).toThrow(/heightFactor.*got 0/);
    expect(() => predictLevels([row], [{ ...bannerFence, triggerGustsMps: [18, 16] }])).toThrow(/banner-fence-east/);
    expect(() => predictLevels([row], [bannerFence, bannerFence])).toThrow(/unique/);
    expect(() => predictLevels([{ ...row, gustMps: Number.NaN }], [bannerFence])).toThrow(/rows\[0\]\.gustMps.*NaN/);
    expect(() => predictLevels([{ ...row, meanMps: -2 }], [bannerFence])).toThrow(/rows\[0\]\.meanMps/);
  });
});
