/**
 * A structure's foresight figures (design §2.7, issue 17): Rice's expected up-crossings
 * N = ν·T·exp(−(x − U)²/(2σ²)), P = 1 − e^(−N) (S. O. Rice, Bell System Technical Journal 23–24,
 * 1944–45), the expected peak U + g·σ with Davenport's peak factor (A. G. Davenport, Proc. ICE 28,
 * 1964), all at the structure's height (U and σ times the height factor). Hand-worked values below;
 * then the live watch: the figures appear on a structure's state once 5 minutes of samples are in,
 * are unknown (never a small chance) before, and vanish with the data.
 */
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import { seededRandom, normal } from '../../server/demo/random.ts';
import { structureForesight, type ForesightView } from '../../server/watch/structureForesight.ts';
import { Watch, type SiteSettings } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

const known = { status: 'known' as const, source: 'samples' as const, meanMps: 10, sigmaMps: 2, upcrossingRateHz: 0.2, upcrossingRateSource: 'counted' as const, peakMps: 15, sampleCount: 600, observedS: 600, upcrossings: 120 };

describe('structureForesight, hand-worked', () => {
  it('gives the chance of the next level and of the limit within 10 and 30 minutes, and the expected peak', () => {
    const f = structureForesight({
      sensorKey: 'mast',
      statistics: known,
      heightFactor: 1,
      means: { atMs: [], meanMps: [] },
      gustFactor: 1.4,
      level: 0,
      levels: [{ label: 'Watch' }, { label: 'Prepare' }],
      triggerGustsMps: [15, 18],
      limitGustMps: 20,
      nowMs: 0,
    }) as ForesightView;
    // Next level 1 at x = 15: N10 = 0.2 · 600 · exp(−25/8) = 120 · 0.0439369 = 5.27243; P = 1 − e^−5.27243 = 0.994869.
    expect(f.nextLevel).toBe(1);
    expect(f.nextChance10!).toBeCloseTo(0.994869, 5);
    // Limit x = 20: N10 = 120 · exp(−100/8) = 120 · 3.72665e−6 = 4.47198e−4; P ≈ 4.47098e−4.
    expect(f.limitChance10).toBeCloseTo(4.47098e-4, 8);
    // 30 min: N30 = 360 · 3.72665e−6 = 1.341594e−3; P = 1 − e^−N = 1.340695e−3.
    expect(f.limitChance30).toBeCloseTo(1.340695e-3, 8);
    // Expected peak in 10 min: νT = 120, √(2 ln 120) = √9.57499 = 3.09435; g = 3.09435 + 0.5772/3.09435 = 3.28088; U + gσ = 16.5618.
    expect(f.expectedPeak10Mps).toBeCloseTo(16.5618, 3);
    // No trend yet (no means): the time to the next level is not given, and says why
    // (G·U = 1.4 · 10 = 14 m/s, below the trigger).
    expect(f.nextLevelInS).toBeNull();
    expect(f.trend).toBe('too-few-points');
  });

  it('says the next level is reached now when the gust factor times the mean is at its trigger already', () => {
    // G·U = 1.5 · 10 = 15 m/s = the trigger (foresight/timeToLevel.ts: 'reached' whatever the trend).
    const f = structureForesight({ sensorKey: 'mast', statistics: known, heightFactor: 1, means: { atMs: [], meanMps: [] }, gustFactor: 1.5, level: 0, levels: [{ label: 'Watch' }], triggerGustsMps: [15], limitGustMps: 20, nowMs: 0 }) as ForesightView;
    expect(f.trend).toBe('reached');
    expect(f.nextLevelInS).toBe(0);
  });

  it('moves U and σ to the structure with the height factor, as the gust (ν stays)', () => {
    const f = structureForesight({ sensorKey: 'mast', statistics: known, heightFactor: 1.1, means: { atMs: [], meanMps: [] }, gustFactor: 1.5, level: 1, levels: [{ label: 'Watch' }, { label: 'Prepare' }], triggerGustsMps: [15, 18], limitGustMps: 20, nowMs: 0 }) as ForesightView;
    // At the structure U = 11, σ = 2.2; next level 2 at 18: N10 = 120 · exp(−49/9.68) = 120 · 6.3329e−3 = 0.759948; P = 0.532320.
    expect(f.nextLevel).toBe(2);
    expect(f.nextChance10!).toBeCloseTo(0.53232, 4);
  });

  it('is unknown, not a small chance, when the statistics are unknown', () => {
    const f = structureForesight({ sensorKey: 'mast', statistics: { status: 'unknown', source: 'samples', reason: 'too-few-samples', sampleCount: 20, observedS: 20 }, heightFactor: 1, means: { atMs: [], meanMps: [] }, gustFactor: null, level: 0, levels: [{ label: 'Watch' }], triggerGustsMps: [15], limitGustMps: 20, nowMs: 0 });
    expect(f).toEqual({ estimate: true, unknown: 'mast: too-few-samples' });
  });
});

const site = (): SiteSettings => testSite();

describe('foresight in the live watch', () => {
  it('appears on the structure once enough raw samples are in, with its inputs, and is unknown before', () => {
    const t0 = Date.UTC(2026, 7, 1, 12, 0, 0);
    let now = t0;
    const watch = new Watch({ hub: new LiveHub(1000), now: () => now });
    const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };
    watch.configure(site(), [mast], [
      {
        id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: null,
        recordJson: { kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 4000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' },
      },
    ]);
    const random = seededRandom(7);
    // Raw samples at 1 Hz: an invented turbulent wind, mean 8 m/s, standard deviation about 1.5 m/s.
    let wind = 0;
    const feed = (seconds: number): void => {
      for (let i = 0; i < seconds; i++) {
        now += 1_000;
        wind = 0.8 * wind + 0.6 * 1.5 * normal(random);
        const reading: Reading = { tsMs: now, speedMps: Math.max(0, 8 + wind), gustMps: null, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null };
        watch.take(mast, [reading], now);
        watch.tick();
      }
    };
    feed(60);
    const early = watch.structureStateById(1)!.foresight;
    expect(early).not.toBeNull();
    expect('unknown' in early! && early.unknown).toMatch(/too-few-samples/);
    feed(360);
    const f = watch.structureStateById(1)!.foresight as ForesightView;
    expect('unknown' in f).toBe(false);
    expect(f.estimate).toBe(true);
    expect(f.sensorKey).toBe('quay-mast');
    expect(f.meanMps).toBeGreaterThan(7);
    expect(f.meanMps).toBeLessThan(9);
    expect(f.sigmaMps).toBeGreaterThan(0.5);
    expect(f.nextLevel).toBe(1);
    // The chance grows with the time ahead and is a probability.
    expect(f.nextChance30!).toBeGreaterThanOrEqual(f.nextChance10!);
    expect(f.limitChance30).toBeGreaterThanOrEqual(f.limitChance10);
    expect(f.limitChance10).toBeLessThanOrEqual(f.nextChance10!);
    expect(f.expectedPeak10Mps).toBeGreaterThan(f.meanMps);

    // A gust past the first level: the level change written for the log carries the estimate in
    // force just before it (how the estimates did, design §2.7).
    const firstTrigger = watch.structureStateById(1)!.triggerGustsMps[0]!;
    let rise: import('../../server/storage/writeBatch.ts').LevelChangeRow | undefined;
    // A steady rise of 1.5 m/s a second (no implausible step) until the level rises.
    for (let speed = 9; speed < 1.6 * firstTrigger && rise === undefined; speed += 1.5) {
      now += 1_000;
      const step = watch.take(mast, [{ tsMs: now, speedMps: speed, gustMps: null, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null }], now);
      rise = step?.batch.levelChanges.find((c) => c.toLevel > c.fromLevel);
    }
    expect(rise).toBeDefined();
    expect(rise!.estimate!.level).toBe(1);
    expect(rise!.estimate!.chance30).toBeGreaterThanOrEqual(rise!.estimate!.chance10);
    expect(rise!.estimate!.chance10).toBeGreaterThanOrEqual(0);
    expect(rise!.estimate!.chance30).toBeLessThanOrEqual(1);
  });
});
