/**
 * After a restart (design §5: "the watch rebuilds each structure's level from the last row of
 * level_changes, re-opens the alerts that are not yet acknowledged or cleared"), a level alert
 * above the level the structure is at once readings come back is ended, as it would have been had
 * the server seen the drop: the board must not show yesterday's Prepare as still in force under
 * "below all levels now". Invented scenario: a quay banner that stood at Prepare when the server
 * stopped last night.
 */
import { describe, expect, it } from 'vitest';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import type { OpenAlert } from '../../server/levels/alertBook.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import { Watch } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

describe('level alerts restored after a restart', () => {
  it('are ended once readings show the structure below their level, and their end is stored', () => {
    const t0 = Date.UTC(2026, 7, 2, 9, 0, 0);
    const yesterday = t0 - 16 * 3_600_000;
    let now = t0;
    const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs: 60_000, createdAtMs: yesterday, retiredAtMs: null };
    const recordJson = { kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 4000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' };
    const alert = (id: number, level: number, raisedAtMs: number): OpenAlert => ({
      id, kind: 'level', structureId: 1, sensorKey: null, level, label: level === 1 ? 'Watch' : 'Prepare', actionText: 'Check the ballast.', raisedAtMs, gustMps: 15, utilization: 0.7,
      lastSignalledAtMs: raisedAtMs, clearedAtMs: null, acknowledgedAtMs: raisedAtMs + 60_000, acknowledgedBy: 'Deck crew', acknowledgeNote: null, subject: 'Quay banner',
      moveToConfiguration: null, actionDoneAtMs: null, actionDoneBy: null, actionDueAtMs: null, overdueAtMs: null,
    });
    const watch = new Watch({ hub: new LiveHub(100), now: () => now });
    watch.configure(testSite(), [mast], [{ id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: null, recordJson }], {
      nextAlertId: 3,
      levels: new Map([[1, { level: 2, sinceMs: yesterday }]]),
      alerts: [alert(1, 1, yesterday - 600_000), alert(2, 2, yesterday)],
    });
    const ladder = watch.structureStateById(1)!.triggerGustsMps;
    const cleared: number[] = [];
    // 20 minutes of calm: past the 15-minute hold (design §2.6) that keeps a restored level up.
    for (let i = 0; i < 20 * 60; i++) {
      now += 1_000;
      const step = watch.take(mast, [{ tsMs: now, speedMps: 0.2 * ladder[0]!, gustMps: 0.3 * ladder[0]!, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null }], now);
      cleared.push(...step.batch.clearedAlerts.map((c) => c.id));
      const tick = watch.tick();
      cleared.push(...(tick?.batch.clearedAlerts ?? []).map((c) => c.id));
    }
    const state = watch.structureStateById(1)!;
    expect(state.noData).toBe(false);
    // Yesterday's level holds for the hold time after the restart, then falls: the wind is calm.
    expect(state.level).toBe(0);
    expect(cleared.sort()).toEqual([1, 2]);
    expect(watch.openAlerts().filter((a) => a.structureId === 1 && a.clearedAtMs === null)).toEqual([]);
  });

  it('a rebuild from the log on a running watch (the demo writes its past day, then rebuilds) takes the level in the log, not the live one', () => {
    const { watch, mast, structure, alerts, yesterday, clock } = setup();
    watch.configure(testSite(), [mast], [structure]);
    expect(watch.structureStateById(1)!.level).toBe(0);
    watch.configure(testSite(), [mast], [structure], { nextAlertId: 3, levels: new Map([[1, { level: 2, sinceMs: yesterday }]]), alerts });
    expect(watch.structureStateById(1)!.level).toBe(2);
    // Readings come back calm: the level holds (restart hold), and its alerts stay in force with it.
    const cleared = clock.calm(watch, mast, 60);
    expect(watch.structureStateById(1)!.level).toBe(2);
    expect(cleared).toEqual([]);
  });

  it('level alerts restored above the level the log gives (a log that no longer matches them) end when readings come back', () => {
    const { watch, mast, structure, alerts, clock } = setup();
    watch.configure(testSite(), [mast], [structure], { nextAlertId: 3, levels: new Map(), alerts });
    expect(watch.structureStateById(1)!.level).toBe(0);
    const cleared = clock.calm(watch, mast, 5);
    expect(cleared.sort()).toEqual([1, 2]);
    expect(watch.openAlerts().filter((a) => a.structureId === 1 && a.clearedAtMs === null)).toEqual([]);
  });
});

function setup() {
  const t0 = Date.UTC(2026, 7, 2, 9, 0, 0);
  const yesterday = t0 - 16 * 3_600_000;
  let now = t0;
  const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs: 60_000, createdAtMs: yesterday, retiredAtMs: null };
  const recordJson = { kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 4000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' };
  const structure = { id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: null, recordJson };
  const alert = (id: number, level: number, raisedAtMs: number): OpenAlert => ({
    id, kind: 'level', structureId: 1, sensorKey: null, level, label: level === 1 ? 'Watch' : 'Prepare', actionText: 'Check the ballast.', raisedAtMs, gustMps: 15, utilization: 0.7,
    lastSignalledAtMs: raisedAtMs, clearedAtMs: null, acknowledgedAtMs: raisedAtMs + 60_000, acknowledgedBy: 'Deck crew', acknowledgeNote: null, subject: 'Quay banner',
    moveToConfiguration: null, actionDoneAtMs: null, actionDoneBy: null, actionDueAtMs: null, overdueAtMs: null,
  });
  const watch = new Watch({ hub: new LiveHub(100), now: () => now });
  const clock = {
    /** `seconds` of calm summaries (a gust at a third of the first trigger), ticking; the ids of the alerts ended. */
    calm(w: Watch, sensor: RegisteredSensor, seconds: number): number[] {
      const ladder = w.structureStateById(1)!.triggerGustsMps;
      const cleared: number[] = [];
      for (let i = 0; i < seconds; i++) {
        now += 1_000;
        cleared.push(...w.take(sensor, [{ tsMs: now, speedMps: 0.2 * ladder[0]!, gustMps: 0.3 * ladder[0]!, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null }], now).batch.clearedAlerts.map((c) => c.id));
        cleared.push(...(w.tick()?.batch.clearedAlerts ?? []).map((c) => c.id));
      }
      return cleared;
    },
  };
  return { watch, mast, structure, alerts: [alert(1, 1, yesterday - 600_000), alert(2, 2, yesterday)], yesterday, clock };
}
