/**
 * A level on a chance trigger in the live watch (design §2.7 v2, issue 17): "Prepare when the
 * chance of the limit within 60 min is over 5 %". The watch feeds the level machine the chance it
 * estimates from the governing sensor's last 10 minutes (Rice's up-crossing count, S. O. Rice, Bell
 * System Technical Journal 23–24, 1944–45; Davenport, Proc. ICE 28, 1964), so the level rises on a
 * gusty wind whose measured gusts stay under every trigger, raises the level alert with the
 * competent person's action, and falls back once the chance has stayed under 5 % × (1 − 10 %) for
 * the hold time (15 min, design §2.4). The wind is an invented seeded AR(1) process; the checks
 * are on the rule (chance over p, gusts under the ladder), not on invented figures.
 */
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import { normal, seededRandom } from '../../server/demo/random.ts';
import type { ForesightView } from '../../server/watch/structureForesight.ts';
import { Watch } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

describe('a level on a chance trigger, live', () => {
  it('rises on the chance with every gust under the ladder, alerts with its action, and falls back after the hold', () => {
    const t0 = Date.UTC(2026, 7, 1, 12, 0, 0);
    let now = t0;
    const watch = new Watch({ hub: new LiveHub(1000), now: () => now });
    const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };
    const levels = [
      { label: 'Prepare', trigger: { kind: 'chance', fraction: 1, withinMinutes: 60, probability: 0.05 }, actionText: 'Bring the second ballast pallet to the banner.' },
      { label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Unclip the banner and roll it.' },
    ];
    watch.configure(testSite(), [mast], [
      {
        id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: levels,
        recordJson: { kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 4000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' },
      },
    ]);
    const state0 = watch.structureStateById(1)!;
    const limit = state0.limitGustMps;
    const ladder = state0.triggerGustsMps;
    // Level 1 is on a chance: its gust on the ladder is just under level 2's (the limit), so only the chance can raise it early.
    expect(ladder[0]!).toBeLessThan(ladder[1]!);
    expect(ladder[0]!).toBeGreaterThan(0.99 * limit);

    const random = seededRandom(11);
    let wind = 0;
    let highestSample = 0;
    const raised: Array<{ level: number | null; actionText: string }> = [];
    const changes: Array<{ fromLevel: number; toLevel: number; atMs: number }> = [];
    // 1 Hz samples: mean m, standard deviation s (AR(1) at 0.8 has variance (0.6 s)² / (1 − 0.64) = s²), held under 90 % of the ladder's first gust.
    const feed = (seconds: number, meanMps: number, sigmaMps: number): void => {
      for (let i = 0; i < seconds; i++) {
        now += 1_000;
        wind = 0.8 * wind + 0.6 * sigmaMps * normal(random);
        const speedMps = Math.min(0.9 * ladder[0]!, Math.max(0, meanMps + wind));
        highestSample = Math.max(highestSample, speedMps);
        const reading: Reading = { tsMs: now, speedMps, gustMps: null, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null };
        const step = watch.take(mast, [reading], now);
        for (const a of step?.batch.alerts ?? []) if (a.kind === 'level') raised.push({ level: a.level, actionText: a.actionText });
        changes.push(...(step?.batch.levelChanges ?? []).filter((c) => !c.noData));
        const tick = watch.tick();
        changes.push(...(tick?.batch.levelChanges ?? []).filter((c) => !c.noData));
      }
    };
    // A light wind: the chance of the limit is tiny, nothing rises.
    feed(7 * 60, 0.25 * limit, 0.04 * limit);
    expect(watch.structureStateById(1)!.level).toBe(0);
    const calm = watch.structureStateById(1)!.foresight as ForesightView;
    expect(calm.triggerChances[0]!.chance).toBeLessThan(0.05);

    // A gusty wind at 60 % of the limit, σ 12 % of the limit: its chance of the limit within an hour is well over 5 %.
    feed(12 * 60, 0.6 * limit, 0.12 * limit);
    const risen = watch.structureStateById(1)!;
    expect(risen.level).toBe(1);
    const f = risen.foresight as ForesightView;
    expect(f.triggerChances[0]!.chance).toBeGreaterThan(0.05);
    expect(highestSample).toBeLessThan(ladder[0]!);
    expect(changes.filter((c) => c.toLevel > c.fromLevel).map((c) => c.toLevel)).toEqual([1]);
    expect(raised.map((a) => a.level)).toEqual([1]);
    // The crew read the competent person's action, then that the level rose on an estimate, with its figures.
    expect(raised[0]!.actionText).toMatch(/^Bring the second ballast pallet to the banner.\n\nRaised on the estimate, not a measured gust: a \d+(\.\d)? % chance of a gust of \d+\.\d m\/s within 60 min \(the level rises over 5 %\)\.$/);

    // Calm again: the 10-minute window empties of the gusty spell, the chance falls under 4.5 %, and the level holds 15 min more before it falls.
    feed(10 * 60, 0.25 * limit, 0.04 * limit);
    expect(watch.structureStateById(1)!.level).toBe(1);
    feed(20 * 60, 0.25 * limit, 0.04 * limit);
    expect(watch.structureStateById(1)!.level).toBe(0);
    const fall = changes.find((c) => c.toLevel < c.fromLevel)!;
    expect(fall).toBeDefined();
    // Not before the window had left the gusty spell (10 min after it ended) plus the 15-min hold.
    const spellEndedMs = t0 + (7 + 12) * 60_000;
    expect(fall.atMs).toBeGreaterThanOrEqual(spellEndedMs + 15 * 60_000);
  });
  it('a rise on the estimate past a gust level does not say the gust passed it', () => {
    // Review case: "Watch" at a gust of 95 % of the limit, "Prepare" on the chance of the limit within
    // 60 min over 5 %, "Take down" at the limit. Every gust stays under 0.9 × Watch's gust, so the
    // estimate raises 0 → 2 past Watch; the alert said "The gust passed Watch at once", which no gust did.
    const t0 = Date.UTC(2026, 7, 1, 12, 0, 0);
    let now = t0;
    const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };
    const recordJson = { kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 4000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' };
    const structure = (levelsJson: unknown) => ({ id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson, recordJson });
    const probe = new Watch({ hub: new LiveHub(1000), now: () => now });
    probe.configure(testSite(), [mast], [structure([{ label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: '' }])]);
    const limit = probe.structureStateById(1)!.limitGustMps;
    const levels = [
      { label: 'Watch', trigger: { kind: 'gust', gustMps: 0.95 * limit }, actionText: 'Tell the stage manager.' },
      { label: 'Prepare', trigger: { kind: 'chance', fraction: 1, withinMinutes: 60, probability: 0.05 }, actionText: 'Bring the second ballast pallet to the banner.' },
      { label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Unclip the banner and roll it.' },
    ];
    const watch = new Watch({ hub: new LiveHub(1000), now: () => now });
    watch.configure(testSite(), [mast], [structure(levels)]);
    const ladder = watch.structureStateById(1)!.triggerGustsMps;
    const random = seededRandom(11);
    let wind = 0;
    const raised: Array<{ level: number | null; actionText: string }> = [];
    for (let i = 0; i < 19 * 60; i++) {
      now += 1_000;
      // The same seeded AR(1) wind as above: 7 min light, then 12 min gusty (mean 60 %, σ 12 % of the limit), held under 0.9 × Watch's gust.
      const [meanMps, sigmaMps] = i < 7 * 60 ? [0.25 * limit, 0.04 * limit] : [0.6 * limit, 0.12 * limit];
      wind = 0.8 * wind + 0.6 * sigmaMps * normal(random);
      const speedMps = Math.min(0.9 * ladder[0]!, Math.max(0, meanMps + wind));
      const step = watch.take(mast, [{ tsMs: now, speedMps, gustMps: null, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null }], now);
      for (const a of step?.batch.alerts ?? []) if (a.kind === 'level') raised.push({ level: a.level, actionText: a.actionText });
      watch.tick();
    }
    expect(raised.map((a) => a.level)).toEqual([2]);
    const text = raised[0]!.actionText;
    expect(text).toMatch(/^Bring the second ballast pallet to the banner\./);
    // Watch's action is still to do, and the words say the level rose past it on the estimate.
    expect(text).toContain('Watch: Tell the stage manager.');
    expect(text).not.toMatch(/gust passed/);
    expect(text).toMatch(/Raised on the estimate, not a measured gust: a \d+(\.\d)? % chance of a gust of \d+\.\d m\/s within 60 min/);
  });

  it('a configuration switch weighs the chance worked out for the new configuration at once, not the old one for up to 5 s', () => {
    const t0 = Date.UTC(2026, 7, 1, 12, 0, 0);
    let now = t0;
    const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };
    const face = (areaM2: number) => [{ areaM2, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }];
    // Rolled, the banner shows a quarter of its area: its limit is twice as high (U = k·q, k ∝ A, so v_lim ∝ 1/√A).
    const recordJson = {
      kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: face(8), masses: [{ massKg: 4000, xM: 1 }],
      coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80', configurations: [{ name: 'rolled', changes: { faces: face(2) } }],
    };
    const levels = [
      { label: 'Prepare', trigger: { kind: 'chance', fraction: 1, withinMinutes: 60, probability: 0.05 }, actionText: 'Bring the second ballast pallet to the banner.' },
      { label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Unclip the banner and roll it.' },
    ];
    const watch = new Watch({ hub: new LiveHub(1000), now: () => now });
    watch.configure(testSite(), [mast], [{ id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: levels, recordJson }]);
    const limit = watch.structureStateById(1)!.limitGustMps;
    const ladder = watch.structureStateById(1)!.triggerGustsMps;
    const random = seededRandom(11);
    let wind = 0;
    for (let i = 0; i < 19 * 60; i++) {
      now += 1_000;
      const [meanMps, sigmaMps] = i < 7 * 60 ? [0.25 * limit, 0.04 * limit] : [0.6 * limit, 0.12 * limit];
      wind = 0.8 * wind + 0.6 * sigmaMps * normal(random);
      watch.take(mast, [{ tsMs: now, speedMps: Math.min(0.9 * ladder[0]!, Math.max(0, meanMps + wind)), gustMps: null, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null }], now);
      watch.tick();
    }
    const before = watch.structureStateById(1)!;
    expect(before.level).toBe(1);
    expect((before.foresight as ForesightView).triggerChances[0]!.thresholdGustMps).toBeCloseTo(limit, 0);

    const switched = watch.switchConfiguration({ structureId: 1, name: 'rolled', by: 'Deck crew', actor: 'crew', note: null, alertId: null, atMs: now });
    expect(switched.ok).toBe(true);
    const after = watch.structureStateById(1)!;
    expect(after.limitGustMps).toBeCloseTo(2 * limit, 6);
    // In the same moment, the chance is of the rolled banner's limit (to the 0.1 m/s a screen shows), and far smaller.
    const f = after.foresight as ForesightView;
    expect(f.triggerChances[0]!.thresholdGustMps).toBeCloseTo(after.limitGustMps, 0);
    expect(f.triggerChances[0]!.chance).toBeLessThan((before.foresight as ForesightView).triggerChances[0]!.chance);
  });
});
