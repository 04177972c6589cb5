/**
 * The watch's shortcuts (watch.ts `evaluateSiteWide` for calm structures, `windUpdate` for the
 * stream's structure rows) must change nothing: two watches fed the same readings, one taking the
 * full paths only (`reassessInFull`), must write the same rows, raise the same alerts, publish
 * the same stream and show the same cards.
 * The wind is invented and seeded (demo-style data: this is a check of the code against itself,
 * the physics is checked elsewhere); the gusts sweep from calm to past the first triggers and
 * back, over sensors at different heights, with and without height reduction (design §2.2 v2).
 */
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../../server/demo/random.ts';
import type { Reading } from '../../server/ingest/payload.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import type { StructureRow } from '../../server/watch/structureModel.ts';
import { Watch } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

const t0 = Date.UTC(2026, 5, 13, 14, 0, 0);
const heights = [2, 3, 5, 10, 15, 25];

function sensor(id: number, heightM: number): RegisteredSensor {
  return { id, siteId: 1, key: `mast-${id}`, name: `mast ${id}`, heightM, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs: 30_000, createdAtMs: t0, retiredAtMs: null };
}

/** A level on a chance (design §2.7 v2) and one on a utilization, and gust levels (invented plans). */
const chanceLevels = [
  { label: 'Prepare', trigger: { kind: 'chance', fraction: 0.9, withinMinutes: 30, probability: 0.1 }, actionText: 'Close the lane beside it.' },
  { label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Take it down.' },
];
const gustLevels = [
  { label: 'Watch', trigger: { kind: 'gust', gustMps: 9 }, actionText: 'Watch it.' },
  { label: 'Lower', trigger: { kind: 'gust', gustMps: 13 }, actionText: 'Lower it.' },
  { label: 'Clear', trigger: { kind: 'utilization', fraction: 0.95 }, actionText: 'Clear the area.' },
];

/** Invented boards: tops from 1.5 to 12 m, ballast from light to heavy, so first triggers spread over the gusts fed. */
function board(id: number): StructureRow {
  const topM = 1.5 + ((id * 7) % 21) * 0.5;
  const massKg = 150 + ((id * 13) % 17) * 60;
  return {
    id,
    name: `Board ${id}`,
    kind: 'custom',
    orientationDeg: (id * 37) % 360,
    mobile: false,
    sensorKeysJson: id % 9 === 0 ? ['mast-2', 'mast-4'] : null,
    levelsJson: id % 7 === 0 ? chanceLevels : id % 5 === 0 ? gustLevels : null,
    recordJson: {
      kind: 'custom',
      name: `Board ${id}`,
      baseDepthM: 1.2,
      frictionCoefficient: 0.5,
      referenceHeightM: topM,
      faces: [{ areaM2: 2 + (id % 5), centroidHeightM: topM / 2, cfFront: 1.8, cfBack: 1.8 }],
      masses: [{ massKg, xM: 0.6 }],
      coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80',
    },
  };
}

function run(heightReductionEnabled: boolean, reassessInFull: boolean, seed: number, measuredAir = false): string[] {
  let now = t0;
  const hub = new LiveHub(100_000, 1e9);
  const watch = new Watch({ hub, now: () => now, reassessInFull });
  const sensors = heights.map((h, i) => sensor(i + 1, h));
  watch.configure(testSite({ heightReductionEnabled, ...(measuredAir ? { airDensityMode: 'measured' as const } : {}) }), sensors, Array.from({ length: 60 }, (_, i) => board(i + 1)));
  // Seeded, so a failure can be replayed.
  const next = seededRandom(seed);
  const out: string[] = [];
  for (let step = 0; step < 4_000; step++) {
    now += 150 + Math.floor(next() * 200);
    // A spell: the base wind rises to about 22 m/s and falls again, with gusts around it.
    const base = 4 + 18 * Math.sin((Math.PI * step) / 4_000) ** 2;
    const gust = Math.max(0, base * (0.6 + 0.8 * next()));
    const s = sensors[Math.floor(next() * sensors.length)]!;
    // Now and then a mast stops reporting for a while (silence takes it out of the maxima).
    if (s.id === 6 && step % 1_000 > 700) continue;
    const reading: Reading = { tsMs: now - Math.floor(next() * 3_000), speedMps: gust / 1.4, gustMps: gust, dirDeg: Math.floor(next() * 360), tempC: measuredAir ? -5 + 30 * next() : null, pressurePa: measuredAir ? 99_000 + 3_000 * next() : null, rhPct: null };
    const { batch, afterCommit } = watch.take(s, [reading], now);
    out.push(JSON.stringify(batch));
    afterCommit?.();
    if (step % 7 === 0) {
      const ticked = watch.tick();
      out.push(JSON.stringify(ticked?.batch ?? null));
      ticked?.afterCommit();
    }
    if (step % 250 === 0) out.push(JSON.stringify(watch.snapshot().structures));
  }
  for (const event of hub.since(0) ?? []) out.push(`${event.kind} ${event.data}`);
  out.push(JSON.stringify(watch.snapshot()));
  return out;
}

describe('the calm shortcut when a site-wide gust moves', () => {
  it('rises exactly as the full paths do for a gust exactly at a first trigger (9 m/s on a board under the mast)', () => {
    const outputs = [true, false].map((reassessInFull) => {
      let now = t0;
      const watch = new Watch({ hub: new LiveHub(1_000), now: () => now, reassessInFull });
      const masts = [sensor(1, 10)];
      // Board 5 (gust levels, top under the mast): without height reduction it takes the mast's gust as it is.
      watch.configure(testSite(), masts, [board(5)]);
      const out: string[] = [];
      for (const gust of [6, 8.99, 9, 9, 8.5]) {
        now += 1_000;
        out.push(JSON.stringify(watch.take(masts[0]!, [{ tsMs: now, speedMps: gust / 1.4, gustMps: gust, dirDeg: 200, tempC: null, pressurePa: null, rhPct: null }], now).batch));
        out.push(JSON.stringify(watch.structureStateById(5)));
      }
      return out;
    });
    expect(outputs[1]).toEqual(outputs[0]);
    const state = JSON.parse(outputs[0]!.at(-1)!) as { level: number; triggerGustsMps: number[]; gustMps: number };
    expect(state.triggerGustsMps[0]).toBe(9);
    expect(state.level).toBe(1);
  });

  it('writes, raises, publishes and shows exactly what the full paths do with measured air density (the ladder moves with the air)', () => {
    const full = run(false, true, 20261204, true);
    const shortcut = run(false, false, 20261204, true);
    expect(shortcut.length).toBe(full.length);
    for (let i = 0; i < full.length; i++) expect(shortcut[i], `output ${i}`).toBe(full[i]);
    const last = JSON.parse(full[full.length - 1]!) as { air: { basis: string; densityKgM3: number } };
    expect(last.air.basis).toBe('measured');
    // The density moved during the run (each structure card carries the one it was judged at).
    const densities = new Set(full.filter((line) => line.startsWith('[{')).flatMap((line) => (JSON.parse(line) as Array<{ airDensityKgM3: number }>).map((c) => c.airDensityKgM3)));
    expect(densities.size).toBeGreaterThan(1);
    expect(full.filter((line) => line.includes('"levelChanges":[{')).length).toBeGreaterThan(10);
  });

  for (const heightReductionEnabled of [false, true]) {
    it(`writes, raises, publishes and shows exactly what the full paths do (height reduction ${heightReductionEnabled ? 'on' : 'off'})`, () => {
      const full = run(heightReductionEnabled, true, 20261203);
      const shortcut = run(heightReductionEnabled, false, 20261203);
      expect(shortcut.length).toBe(full.length);
      for (let i = 0; i < full.length; i++) expect(shortcut[i], `output ${i}`).toBe(full[i]);
      // The spell must reach levels, or the comparison would cover only calm structures.
      const last = JSON.parse(full[full.length - 1]!) as { structures: Array<{ level: number }> };
      const levelRows = full.filter((line) => line.includes('"levelChanges":[{')).length;
      expect(levelRows).toBeGreaterThan(10);
      expect(last.structures.length).toBe(60);
      // The stream's once-a-second structure rows are part of what is compared.
      expect(full.filter((line) => line.startsWith('structures ')).length).toBeGreaterThan(100);
    });
  }
});
