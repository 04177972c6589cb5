/**
 * A gateway whose clock lags (issue 13 item 2). Silence is about arrival: readings that keep
 * arriving keep a sensor live whatever their stamps say; the lag is its own sensor condition,
 * measured per sensor, alerted once past 10 s with the figure, and a gust goes on the timeline
 * by its own time stamp. Common practice (no published source): a gateway kept by NTP is within
 * a second of true time, so 10 s is far beyond normal and well inside the 60 s "late" bound.
 */
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import type { AlertRow, WriteBatch } from '../../server/storage/writeBatch.ts';
import { Watch, type SiteSettings } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

const t0 = Date.UTC(2026, 7, 8, 15, 0, 0);

const site: SiteSettings = testSite({ name: 'Harrowmere Showfield' });

function sensor(silenceTimeoutMs: number): RegisteredSensor {
  return { id: 1, siteId: 1, key: 'gate-mast', name: 'Gate mast', heightM: 6, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs, createdAtMs: t0, retiredAtMs: null };
}

const board = {
  id: 7,
  name: 'Gate banner',
  kind: 'custom',
  orientationDeg: 0,
  mobile: false,
  sensorKeysJson: null,
  levelsJson: null,
  recordJson: {
    kind: 'custom',
    name: 'Gate banner',
    baseDepthM: 2,
    frictionCoefficient: 0.4,
    referenceHeightM: 3,
    faces: [{ areaM2: 6, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8 }],
    masses: [{ massKg: 3000, xM: 1 }],
    coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80',
  },
};

function summary(tsMs: number, gustMps: number): Reading {
  return { tsMs, speedMps: gustMps / 1.5, gustMps, dirDeg: null, tempC: null, pressurePa: null, rhPct: null };
}

/** Feeds one summary a second, stamped `lagMs` behind receipt, for `seconds`, ticking like the server; returns every alert raised and every structure-minute row written. */
function run(lagMs: number, silenceTimeoutMs: number, seconds: number) {
  let now = t0;
  const watch = new Watch({ hub: new LiveHub(100), now: () => now });
  const s = sensor(silenceTimeoutMs);
  watch.configure(site, [s], [board]);
  const raised: AlertRow[] = [];
  const minutes: WriteBatch['structureMinutes'] = [];
  const collect = (batch: WriteBatch) => {
    raised.push(...batch.alerts);
    minutes.push(...batch.structureMinutes);
  };
  // Past the start grace, so a silent sensor would be alerted.
  now += 60_000;
  for (let i = 0; i < seconds; i++) {
    now += 1_000;
    collect(watch.take(s, [summary(now - lagMs, 5 + (i % 3))], now).batch);
    const ticked = watch.tick();
    if (ticked) collect(ticked.batch);
  }
  return { watch, raised, minutes, now };
}

describe('a gateway whose clock lags (issue 13 item 2)', () => {
  it('lag 6 s, silence timeout 5 s, 40 s of readings: no "sensor silent" alert (the release raised 40); the 6 s offset is measured and shown', () => {
    const { raised, watch, now } = run(6_000, 5_000, 40);
    expect(raised.filter((a) => a.kind === 'sensor-silent')).toEqual([]);
    // 6 s is under the 10 s bound: no clock alert either, but the offset is measured and shown.
    expect(raised.filter((a) => a.kind === 'sensor-clock')).toEqual([]);
    const state = watch.sensorStateByKey('gate-mast')!;
    expect(state.clockOffsetMs).toBe(6_000);
    expect(state.silent).toBe(false);
    expect(state.lastArrivalAtMs).toBe(now);
  });

  it('lag 40 s, silence timeout 30 s, 125 s of readings: no silent alert (the release raised 126), exactly one clock alert saying 40 s behind', () => {
    const { raised, watch } = run(40_000, 30_000, 125);
    expect(raised.filter((a) => a.kind === 'sensor-silent')).toEqual([]);
    const clock = raised.filter((a) => a.kind === 'sensor-clock');
    expect(clock).toHaveLength(1);
    expect(clock[0]!.actionText).toContain('40 s behind');
    expect(watch.structureStateById(7)!.noData).toBe(false);
  });

  it('the clock alert clears once the clock is set right (offset under 5 s), and is not raised again', () => {
    let now = t0 + 60_000;
    const watch = new Watch({ hub: new LiveHub(100), now: () => now });
    const s = sensor(30_000);
    watch.configure(site, [s], [board]);
    const alerts: AlertRow[] = [];
    const cleared: number[] = [];
    const step = (lagMs: number) => {
      now += 1_000;
      const taken = watch.take(s, [summary(now - lagMs, 6)], now).batch;
      const ticked = watch.tick()?.batch;
      for (const b of [taken, ticked]) if (b) (alerts.push(...b.alerts), cleared.push(...b.clearedAlerts.map((c) => c.id)));
    };
    for (let i = 0; i < 60; i++) step(20_000);
    expect(alerts.filter((a) => a.kind === 'sensor-clock')).toHaveLength(1);
    for (let i = 0; i < 120; i++) step(200);
    expect(cleared).toContain(alerts.find((a) => a.kind === 'sensor-clock')!.id);
    expect(alerts.filter((a) => a.kind === 'sensor-clock')).toHaveLength(1);
  });

  it('a gust goes on the timeline by its own time stamp: a 40 s lag puts the minute row 40 s earlier than receipt', () => {
    const { minutes } = run(40_000, 30_000, 125);
    const stamped = new Set<number>();
    for (let i = 0; i < 125; i++) {
      const tsMs = t0 + 60_000 + (i + 1) * 1_000 - 40_000;
      stamped.add(tsMs - (tsMs % 60_000));
    }
    const rowMinutes = new Set(minutes.filter((m) => m.structureId === 7).map((m) => m.minuteMs));
    expect([...rowMinutes].sort()).toEqual([...stamped].sort());
  });

  it('a sensor that really stops is still alerted silent after its timeout', () => {
    let now = t0 + 60_000;
    const watch = new Watch({ hub: new LiveHub(100), now: () => now });
    const s = sensor(5_000);
    watch.configure(site, [s], [board]);
    now += 1_000;
    watch.take(s, [summary(now - 6_000, 6)], now);
    const raised: AlertRow[] = [];
    // 40 s: past the 30 s start grace and the 5 s timeout.
    for (let i = 0; i < 40; i++) {
      now += 1_000;
      const b = watch.tick()?.batch;
      if (b) raised.push(...b.alerts);
    }
    const silent = raised.filter((a) => a.kind === 'sensor-silent');
    expect(silent).toHaveLength(1);
    expect(silent[0]!.label).toBe('Sensor silent');
  });

  it('a clock so far behind that every reading is late (90 s): the silent alert says readings arrive but are unusable, with the figure', () => {
    const { raised } = run(90_000, 30_000, 45);
    const silent = raised.filter((a) => a.kind === 'sensor-silent');
    expect(silent).toHaveLength(1);
    expect(silent[0]!.label).toBe('Sensor readings unusable');
    expect(silent[0]!.actionText).toContain('90 s behind');
    expect(raised.filter((a) => a.kind === 'sensor-clock')).toHaveLength(1);
  });
});

describe('the server clock stepped back (NTP, or set by hand on a site laptop)', () => {
  it('the watch keeps going: readings still raise the level, and a sensor that stops is still called silent on time', () => {
    // The wall clock is this test's `now`; the monotonic clock (performance.now) runs on with real time.
    let now = t0;
    let monotonicMs = 1_000_000;
    const realNow = performance.now;
    performance.now = () => monotonicMs;
    try {
      const watch = new Watch({ hub: new LiveHub(100), now: () => now });
      const s = sensor(30_000);
      watch.configure(site, [s], [board]);
      const limit = watch.structureStateById(7)!.limitGustMps;
      const ladder = watch.structureStateById(7)!.triggerGustsMps;
      const raised: AlertRow[] = [];
      const levels: number[] = [];
      let gatewayMs = t0;
      const second = (gustMps: number | null) => {
        now += 1_000;
        monotonicMs += 1_000;
        gatewayMs += 1_000;
        if (gustMps !== null) {
          const step = watch.take(s, [summary(gatewayMs, gustMps)], now);
          raised.push(...step.batch.alerts);
          levels.push(...step.batch.levelChanges.filter((c) => !c.noData).map((c) => c.toLevel));
        }
        const tick = watch.tick();
        raised.push(...(tick?.batch.alerts ?? []));
        levels.push(...(tick?.batch.levelChanges ?? []).filter((c) => !c.noData).map((c) => c.toLevel));
      };
      for (let i = 0; i < 120; i++) second(0.3 * limit);
      expect(watch.structureStateById(7)!.level).toBe(0);
      // The wall clock steps back an hour; the gateway's clock does not.
      now -= 3_600_000;
      for (let i = 0; i < 10; i++) second((ladder[0]! + ladder[1]!) / 2);
      expect(levels.filter((l) => l > 0)).toEqual([1]);
      expect(raised.filter((a) => a.kind === 'level').map((a) => a.level)).toEqual([1]);
      // The sensor stops: silent after its 30 s, though the wall clock is still an hour behind.
      for (let i = 0; i < 45; i++) second(null);
      expect(raised.filter((a) => a.kind === 'sensor-silent')).toHaveLength(1);
    } finally {
      performance.now = realNow;
    }
  });
});
