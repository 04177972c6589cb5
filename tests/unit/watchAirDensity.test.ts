/**
 * The live watch with measured air density (design §2.1): the limits and level ladder follow the
 * air as it drifts slowly, and a change of density alone reaches the screens. Also: one structure
 * whose stored data the level machine refuses does not stop the rest of the site.
 *
 * Checked against the ideal-gas law for dry air, ρ = p / (R·T) with R = 287.05 J/(kg·K)
 * (ISO 2533 standard atmosphere; the same relation as references.md's air density): 1.292 kg/m³
 * at 0 °C and 101 325 Pa. At a fixed load (U = k·½ρv²) a gust limit scales with 1/√ρ, so every
 * trigger set as a share of the limit scales with it too. The site, masts and boards are invented.
 */
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import type { StructureRow } from '../../server/watch/structureModel.ts';
import { Watch } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

const t0 = Date.UTC(2026, 10, 20, 16, 0, 0);
const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };

function board(id: number, levelsJson: unknown = null): StructureRow {
  return {
    id,
    name: `Quay board ${id}`,
    kind: 'custom',
    orientationDeg: 0,
    mobile: false,
    sensorKeysJson: null,
    levelsJson,
    recordJson: {
      kind: 'custom',
      name: `Quay board ${id}`,
      baseDepthM: 1.2,
      frictionCoefficient: 0.5,
      referenceHeightM: 4,
      faces: [{ areaM2: 4, centroidHeightM: 2, cfFront: 1.8, cfBack: 1.8 }],
      masses: [{ massKg: 600, xM: 0.6 }],
      coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80',
    },
  };
}

function reading(tsMs: number, gustMps: number, tempC: number | null): Reading {
  return { tsMs, speedMps: gustMps / 1.4, gustMps, dirDeg: 200, tempC, pressurePa: tempC === null ? null : 101_325, rhPct: null };
}

const dryAirDensity = (tempC: number, pressurePa: number) => pressurePa / (287.05 * (tempC + 273.15));

describe('measured air density in the live watch', () => {
  it('moves the limits and ladder with a slow drift of the air, not only with a jump (an evening cooling from 15 to 0 °C over 2 h)', () => {
    let now = t0;
    const watch = new Watch({ hub: new LiveHub(100), now: () => now });
    watch.configure(testSite({ airDensityMode: 'measured' }), [mast], [board(1)]);
    const feed = (tempC: number) => {
      now += 1_000;
      watch.take(mast, [reading(now, 7, tempC)], now);
      watch.tick()?.afterCommit();
    };
    feed(15);
    feed(15);
    const start = watch.structureStateById(1)!;
    // Each second the density moves about 2e-5 kg/m³: less than the watch's bound for a change.
    for (let i = 0; i < 7_200; i++) feed(15 - (15 * i) / 7_200);
    feed(0);
    const site = watch.snapshot().air;
    const end = watch.structureStateById(1)!;
    expect(site.basis).toBe('measured');
    expect(site.densityKgM3).toBeCloseTo(dryAirDensity(0, 101_325), 3);
    expect(dryAirDensity(0, 101_325)).toBeCloseTo(1.292, 3);
    // The card's limits and ladder are at the air now (within the watch's 1e-4 kg/m³ bound) ...
    expect(Math.abs(end.airDensityKgM3 - site.densityKgM3)).toBeLessThanOrEqual(1e-4);
    // ... so every trigger came down with 1/√ρ (before the fix they stayed at 15 °C's).
    const scale = Math.sqrt(start.airDensityKgM3 / end.airDensityKgM3);
    expect(end.triggerGustsMps.length).toBe(start.triggerGustsMps.length);
    end.triggerGustsMps.forEach((trigger, i) => expect(trigger).toBeCloseTo(start.triggerGustsMps[i]! * scale, 6));
    expect(end.limitGustMps).toBeCloseTo(start.limitGustMps * scale, 6);
    expect(end.triggerGustsMps[0]!).toBeLessThan(0.975 * start.triggerGustsMps[0]!);
  });

  it('sends every structure on the stream again when the density alone moves its margins', () => {
    let now = t0;
    const hub = new LiveHub(10_000);
    const watch = new Watch({ hub, now: () => now });
    watch.configure(testSite({ airDensityMode: 'measured' }), [mast], [board(1)]);
    const feed = (tempC: number) => {
      now += 1_000;
      watch.take(mast, [reading(now, 7, tempC)], now)?.afterCommit?.();
      watch.tick()?.afterCommit();
    };
    for (let i = 0; i < 30; i++) feed(30);
    const before = watch.structureStateById(1)!;
    const lastId = hub.lastId;
    // A cold front: 30 → -5 °C at a steady gust of 7 m/s (utilization rises by ρ's ratio, about 13 %).
    for (let i = 0; i < 3; i++) feed(-5);
    const after = watch.structureStateById(1)!;
    expect(after.utilization! / before.utilization!).toBeCloseTo(dryAirDensity(-5, 101_325) / dryAirDensity(30, 101_325), 3);
    const rows = (hub.since(lastId) ?? [])
      .filter((e) => e.kind === 'structures')
      .flatMap((e) => {
        const frame = JSON.parse(e.data) as { columns: string[]; rows: unknown[][] };
        const u = frame.columns.indexOf('utilization');
        return frame.rows.filter((r) => r[0] === 1).map((r) => r[u] as number);
      });
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.at(-1)!).toBeCloseTo(after.utilization!, 3);
  });
});

describe('a structure the level machine cannot run', () => {
  it('shows its error and counts as no data, while the rest of the site goes on (a stored level list that is empty)', () => {
    let now = t0;
    const watch = new Watch({ hub: new LiveHub(100), now: () => now });
    watch.configure(testSite(), [mast], [board(1), board(2, [])]);
    now += 1_000;
    const { batch } = watch.take(mast, [reading(now, 4, null)], now);
    expect(batch.readings.length).toBe(1);
    expect(() => watch.tick()).not.toThrow();
    const healthy = watch.structureStateById(1)!;
    const broken = watch.structureStateById(2)!;
    expect(healthy.gustMps).toBe(4);
    expect(healthy.noData).toBe(false);
    expect(broken.noData).toBe(true);
    expect(broken.error).toMatch(/level list has 0 levels/);
  });

  it('is set apart when its state fails in the level machine during the watch, not only at load (a restored level that is not a number)', () => {
    let now = t0;
    const notices: string[] = [];
    const watch = new Watch({ hub: new LiveHub(100), now: () => now, onNotice: (message) => notices.push(message) });
    watch.configure(testSite(), [mast], [board(1), board(2)], { nextAlertId: 1, levels: new Map([[2, { level: Number.NaN, sinceMs: t0 - 60_000 }]]), alerts: [] });
    now += 1_000;
    const { batch } = watch.take(mast, [reading(now, 4, null)], now);
    expect(batch.readings.length).toBe(1);
    expect(() => watch.tick()).not.toThrow();
    expect(watch.structureStateById(1)!.gustMps).toBe(4);
    const broken = watch.structureStateById(2)!;
    expect(broken.noData).toBe(true);
    expect(broken.error).toMatch(/cannot be assessed/);
    expect(notices).toContain('a structure cannot be assessed');
  });
});
