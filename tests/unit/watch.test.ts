/**
 * The live watch's choice of gust per structure (design.md 2.2): every governing sensor's gust
 * moved to the structure's reference height with the EN 1991-1-4 peak-velocity-pressure profile
 * (expression 4.8), the highest governing; a factor below 1 only when the site allows it; wind
 * direction only when the site enables it; late readings never raise a level.
 */
import { describe, expect, it } from 'vitest';
import { gustHeightFactor } from '../../server/engine/index.ts';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { frameRecords, type Frame } from '../../server/live/frames.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import type { StructureRow } from '../../server/watch/structureModel.ts';
import { Watch, type SiteSettings } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

const t0 = Date.UTC(2026, 5, 13, 14, 0, 0);

function site(overrides: Partial<SiteSettings> = {}): SiteSettings {
  return testSite({ name: 'Brackenfold Common', ...overrides });
}

function sensor(id: number, key: string, heightM: number): RegisteredSensor {
  return { id, siteId: 1, key, name: key, heightM, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };
}

/** A board whose top is `topM` (reference height), facing north; invented numbers. */
function board(id: number, name: string, topM: number, sensorKeys: string[] | null = null, orientationDeg = 0): StructureRow {
  return {
    id,
    name,
    kind: 'custom',
    orientationDeg,
    mobile: false,
    sensorKeysJson: sensorKeys,
    levelsJson: null,
    recordJson: {
      kind: 'custom',
      name,
      baseDepthM: 2,
      frictionCoefficient: 0.4,
      referenceHeightM: topM,
      faces: [{ areaM2: 8, centroidHeightM: topM / 2, cfFront: 1.8, cfBack: 1.8 }],
      masses: [{ massKg: 2500, xM: 1 }],
      coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80',
    },
  };
}

function summary(tsMs: number, gustMps: number, dirDeg: number | null = null): Reading {
  return { tsMs, speedMps: gustMps / 1.5, gustMps, dirDeg, tempC: null, pressurePa: null, rhPct: null };
}

function setup(siteSettings: SiteSettings, structures: StructureRow[]) {
  let now = t0;
  const watch = new Watch({ hub: new LiveHub(100), now: () => now });
  const sensors = [sensor(1, 'mast-10m', 10), sensor(2, 'pole-3m', 3), sensor(3, 'roof-15m', 15)];
  watch.configure(siteSettings, sensors, structures);
  const feed = (key: string, gustMps: number, dirDeg: number | null = null, ageMs = 0) => {
    now += 1_000;
    watch.take(sensors.find((s) => s.key === key)!, [summary(now - ageMs, gustMps, dirDeg)], now);
  };
  return { watch, feed, state: (id: number) => watch.structureStateById(id)! };
}

const factor = (fromHeightM: number, toHeightM: number, allowReduction = false) => gustHeightFactor({ fromHeightM, toHeightM, terrainCategory: 'II', allowReduction });

describe('the gust a structure takes', () => {
  it('is the highest of its sensors after each is moved to the structure’s height (EN 1991-1-4 4.8)', () => {
    const { feed, state } = setup(site(), [board(1, 'Tall board', 12)]);
    feed('mast-10m', 10);
    feed('pole-3m', 8.5);
    feed('roof-15m', 9);
    const expected = Math.max(10 * factor(10, 12), 8.5 * factor(3, 12), 9 * factor(15, 12));
    expect(state(1).gustMps).toBeCloseTo(expected, 9);
    // The low pole's gust, moved up from 3 m, beats the mast's own reading here.
    expect(8.5 * factor(3, 12)).toBeGreaterThan(10 * factor(10, 12));
    expect(state(1).governingSensorKey).toBe('pole-3m');
  });

  it('is never reduced below what a sensor measured unless the site allows it (design.md 2.2 conservative default)', () => {
    const { feed, state } = setup(site(), [board(1, 'Low board', 4)]);
    feed('mast-10m', 12);
    expect(state(1).gustMps).toBeCloseTo(12, 9);
    const reduced = setup(site({ heightReductionEnabled: true }), [board(1, 'Low board', 4)]);
    reduced.feed('mast-10m', 12);
    expect(reduced.state(1).gustMps).toBeCloseTo(12 * factor(10, 4, true), 9);
    expect(factor(10, 4, true)).toBeLessThan(1);
  });

  it('comes only from the sensors a structure names when it names some', () => {
    const { feed, state } = setup(site(), [board(1, 'Gate board', 3, ['pole-3m'])]);
    feed('mast-10m', 20);
    expect(state(1).noData).toBe(true);
    feed('pole-3m', 6);
    expect(state(1).gustMps).toBeCloseTo(6, 9);
    feed('mast-10m', 25);
    expect(state(1).gustMps).toBeCloseTo(6, 9);
  });

  it('matches a direct computation for every structure when many share the sensors', () => {
    const structures = Array.from({ length: 40 }, (_, i) => board(i + 1, `Board ${i + 1}`, 2 + i * 0.5));
    const { feed, state } = setup(site(), structures);
    const gusts: Record<string, number> = { 'mast-10m': 11, 'pole-3m': 9.2, 'roof-15m': 10.4 };
    const heights: Record<string, number> = { 'mast-10m': 10, 'pole-3m': 3, 'roof-15m': 15 };
    for (const [key, g] of Object.entries(gusts)) feed(key, g);
    for (const s of structures) {
      const top = (s.recordJson as { referenceHeightM: number }).referenceHeightM;
      const expected = Math.max(...Object.entries(gusts).map(([key, g]) => g * factor(heights[key]!, top)));
      expect(state(s.id).gustMps, s.name).toBeCloseTo(expected, 9);
    }
  });

  it('with directional assessment a wind 85° off the board’s normal still loads it fully: the ±45° sector holds directions within 60° of it (issue 11 item 1; design §2.2 v2)', () => {
    const structures = [board(1, 'North-facing board', 4, ['mast-10m'], 0)];
    const onto = setup(site({ directionalEnabled: true }), structures);
    const along = setup(site({ directionalEnabled: true }), structures);
    const limit = onto.state(1).limitGustMps;
    onto.feed('mast-10m', limit * 0.95, 0); // from the north, onto the front
    along.feed('mast-10m', limit * 0.95, 85); // the first release took v·cos 85° here
    expect(onto.state(1).level).toBe(2);
    expect(along.state(1).level).toBe(2);
    expect(along.state(1).utilization!).toBeCloseTo(onto.state(1).utilization!, 9);
  });

  it('with a ±15° sector, wind square along the board takes its worst direction 75° off the normal: ψ = 2 cos 75° of the load (design §2.3)', () => {
    const structures = [board(1, 'North-facing board', 4, ['mast-10m'], 0)];
    const onto = setup(site({ directionalEnabled: true, directionSectorHalfWidthDeg: 15 }), structures);
    const along = setup(site({ directionalEnabled: true, directionSectorHalfWidthDeg: 15 }), structures);
    const limit = onto.state(1).allDirectionsLimitGustMps;
    onto.feed('mast-10m', limit * 0.95, 0);
    along.feed('mast-10m', limit * 0.95, 90);
    expect(along.state(1).utilization!).toBeCloseTo(onto.state(1).utilization! * 2 * Math.cos((75 * Math.PI) / 180), 6);
    expect(along.state(1).level).toBe(0);
  });

  it('a 3 m pole over category IV terrain (below z_min 10 m) moves its gust to a 12 m board with the unclamped profile, not the clamped 1.05 (issue 11 item 6; EN 1991-1-4 §4.3.2)', () => {
    const { feed, state } = setup(site({ terrainCategory: 'IV' }), [board(1, 'Tall board', 12, ['pole-3m'])]);
    feed('pole-3m', 10);
    const expected = gustHeightFactor({ fromHeightM: 3, toHeightM: 12, terrainCategory: 'IV', allowReduction: false });
    expect(expected).toBeGreaterThan(1.5);
    expect(state(1).gustMps).toBeCloseTo(10 * expected, 9);
  });

  it('the site-wide shortcut gives the same gust as the sensor-by-sensor loop, with a mast below z_min among them', () => {
    const all = setup(site({ terrainCategory: 'IV' }), [board(1, 'Tall board', 12)]);
    const listed = setup(site({ terrainCategory: 'IV' }), [board(1, 'Tall board', 12, ['mast-10m', 'pole-3m', 'roof-15m'])]);
    for (const run of [all, listed]) {
      run.feed('mast-10m', 12);
      run.feed('pole-3m', 9);
      run.feed('roof-15m', 12.5);
    }
    expect(all.state(1).gustMps).toBeCloseTo(listed.state(1).gustMps!, 9);
    expect(all.state(1).governingSensorKey).toBe(listed.state(1).governingSensorKey);
  });

  it('a gust trigger the limit has fallen to (denser air) is taken at the limit, and the card says so', () => {
    const row = { ...board(1, 'Board', 4), levelsJson: [{ label: 'Stop and clear', trigger: { kind: 'gust', gustMps: 100 }, actionText: 'Clear.' }] };
    const { state } = setup(site(), [row]);
    expect(state(1).triggerGustsMps[0]).toBeCloseTo(state(1).limitGustMps, 9);
    expect(state(1).warnings.join(' ')).toMatch(/taken at the limit/);
  });

  it('the once-a-second update carries the calculated utilization beside the effective one (a page kept a stale calculated figure)', () => {
    let now = t0;
    const hub = new LiveHub(100);
    const watch = new Watch({ hub, now: () => now });
    const mast = sensor(1, 'mast-10m', 10);
    watch.configure(site(), [mast], [{ ...board(1, 'Rated board', 4), recordJson: { ...board(1, 'Rated board', 4).recordJson as object, ratedGustMps: 12 } }]);
    const updates: Array<Record<string, unknown>> = [];
    hub.subscribe((event) => {
      if (event.kind === 'structures') updates.push(...frameRecords(JSON.parse(event.data) as Frame));
    });
    now += 1_000;
    watch.take(mast, [summary(now, 10)], now);
    watch.tick()?.afterCommit();
    const update = updates.find((u) => u.id === 1)!;
    const state = watch.structureStateById(1)!;
    // Frames round utilization to 0.0001 (server/watch/liveFrames.ts); screens show whole percent.
    expect(update.calculatedUtilization as number).toBeCloseTo(state.calculatedUtilization!, 4);
    expect(update.utilization as number).toBeCloseTo(state.utilization!, 4);
    // The rating governs at 10 of 12 m/s: (10/12)² = 0.694 against a lower calculated figure.
    expect(state.utilization).toBeCloseTo((10 / 12) ** 2, 9);
    expect(state.calculatedUtilization!).toBeLessThan(state.utilization!);
  });

  it('never takes a late reading (from a gateway’s buffer) as live wind', () => {
    const { feed, state } = setup(site(), [board(1, 'Board', 4)]);
    feed('mast-10m', 40, null, 5 * 60_000);
    expect(state(1).noData).toBe(true);
    expect(state(1).level).toBe(0);
  });
});
