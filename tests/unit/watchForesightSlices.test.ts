/**
 * The foresight round in slices (Watch `foresightSliceSize` and `continueForesight`, runtime.ts):
 * the server refreshes 100 structures in the tick and the rest a slice per turn of the event loop,
 * so a round of 1,000 structures is not one long pause. Split or whole, a round must come to the
 * same figures: two watches take the same seeded gusty wind (an invented AR(1) process, as in
 * watchChanceTrigger.test.ts) on a dozen invented quay banners with chance levels (design §2.7
 * v2), one refreshing every structure in the tick, the other three a slice; after each tick and
 * its slices, every card's foresight, level and the level changes must be equal. A check that the
 * split one really was partway through after the tick keeps the comparison from passing vacuously.
 */
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import { normal, seededRandom } from '../../server/demo/random.ts';
import { Watch } from '../../server/watch/watch.ts';
import type { StructureRow } from '../../server/watch/structureModel.ts';
import { testSite } from '../helpers/testSite.ts';

const t0 = Date.UTC(2026, 7, 1, 12, 0, 0);
const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };

function banner(id: number): StructureRow {
  const levels = [
    { label: 'Prepare', trigger: { kind: 'chance', fraction: 1, withinMinutes: 60, probability: 0.05 }, actionText: 'Bring the second ballast pallet to the banner.' },
    { label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Unclip the banner and roll it.' },
  ];
  const name = `Quay banner ${id}`;
  return {
    id,
    name,
    kind: 'custom',
    orientationDeg: 0,
    mobile: false,
    sensorKeysJson: null,
    levelsJson: levels,
    recordJson: { kind: 'custom', name, baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 3000 + 150 * id, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' },
  } as StructureRow;
}

describe('the foresight round in slices', () => {
  it('comes to the same foresight, levels and level changes as the whole round in the tick', () => {
    let now = t0;
    const structures = Array.from({ length: 12 }, (_, i) => banner(i + 1));
    const whole = new Watch({ hub: new LiveHub(1000), now: () => now });
    const split = new Watch({ hub: new LiveHub(1000), now: () => now, foresightSliceSize: 3 });
    for (const w of [whole, split]) w.configure(testSite(), [mast], structures);
    const limit = whole.structureStateById(1)!.limitGustMps;
    const random = seededRandom(23);
    let wind = 0;
    let partway = 0;
    let comparedForesights = 0;
    const changes: { whole: unknown[]; split: unknown[] } = { whole: [], split: [] };
    // Light, then gusty (the chance of the limit rises over 5 % on the weaker banners), then light.
    const spell = (seconds: number, meanMps: number, sigmaMps: number): void => {
      for (let i = 0; i < seconds; i++) {
        now += 1_000;
        wind = 0.8 * wind + 0.6 * sigmaMps * normal(random);
        const reading: Reading = { tsMs: now, speedMps: Math.max(0, Math.min(0.85 * limit, meanMps + wind)), gustMps: null, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null };
        changes.whole.push(...(whole.take(mast, [reading], now)?.batch.levelChanges ?? []));
        changes.split.push(...(split.take(mast, [reading], now)?.batch.levelChanges ?? []));
        changes.whole.push(...(whole.tick()?.batch.levelChanges ?? []));
        changes.split.push(...(split.tick()?.batch.levelChanges ?? []));
        if (split.continueForesight(0)) partway++;
        while (split.continueForesight(3));
        for (const s of structures) {
          const a = whole.structureStateById(s.id)!;
          const b = split.structureStateById(s.id)!;
          expect(b.foresight).toEqual(a.foresight);
          expect(b.level).toBe(a.level);
          if (a.foresight !== null && !('unknown' in a.foresight)) comparedForesights++;
        }
      }
    };
    spell(7 * 60, 0.25 * limit, 0.04 * limit);
    spell(12 * 60, 0.6 * limit, 0.12 * limit);
    spell(10 * 60, 0.25 * limit, 0.04 * limit);
    expect(changes.split).toEqual(changes.whole);
    // Not vacuous: rounds were split (one every 5 s over 29 min), figures were there to compare,
    // and the gusty spell raised levels on the estimate.
    expect(partway).toBeGreaterThan(300);
    expect(comparedForesights).toBeGreaterThan(1000);
    expect(changes.whole.length).toBeGreaterThan(0);
  });
});
