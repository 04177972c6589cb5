/**
 * Where a reading's time goes inside the server, without MQTT: the benchmark register loaded
 * into the server's own Registry, Watch and WriteQueue in this process, fed the same simulated
 * raw samples as the ingest benchmark (100 sensors, 25 ms apart per sensor, stamped just before
 * now so they are live). Per reading: payload parsing (parseReadingPayload), the live watch
 * (Watch.take: wind state, maxima, structures), and the group commit (WriteQueue.flush) for
 * commits of 1 reading (a lone message), of `naturalGroup` readings and of `largeGroup` (the write
 * queue commits at most 500 batches at once). Enqueueing is timed with the commit: a full group
 * is committed from inside `enqueue`.
 *
 * Readings whose take() is slow are the ones that move the site's highest gust and so re-assess
 * every structure that takes its wind from all sensors; they are counted by time (> 100 µs).
 */
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { WindSimulator } from '../../server/demo/windSimulator.ts';
import { parseReadingPayload } from '../../server/ingest/payload.ts';
import { Registry } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import { initialState, siteSettings } from '../../server/runtime.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { WriteQueue } from '../../server/storage/writeQueue.ts';
import { Watch } from '../../server/watch/watch.ts';
import { median } from './common.ts';
import { copyTemplate, type Fleet } from './fleet.ts';

export interface BreakdownResult {
  readings: number;
  parseUs: number;
  takeUs: number;
  takeMedianUs: number;
  slowTakeShare: number;
  slowTakeMeanUs: number;
  fastTakeMeanUs: number;
  commitUs: Array<{ perCommit: number; us: number }>;
}

async function open(templateDir: string, dir: string) {
  copyTemplate(templateDir, dir);
  const opened = openDatabase(path.join(dir, 'holdfast.sqlite'));
  const { sqlite } = opened;
  const storage = new SqliteStorage(opened);
  const registry = await Registry.load(storage);
  const watch = new Watch({ hub: new LiveHub() });
  watch.configure(await siteSettings(storage), registry.sensors(), await storage.structures.active(), await initialState(storage));
  return { sqlite, registry, watch, queue: new WriteQueue(sqlite) };
}

function messages(fleet: Fleet, count: number, seed: number, baseMeanMps: number): Array<{ key: string; payload: Buffer }> {
  const t0 = Date.now() - 2_000;
  const sim = new WindSimulator({ seed, startMs: t0, baseMeanMps, dailySwingMps: 0.5, spells: [], sensors: fleet.sensors, baseDirDeg: 240 });
  const out: Array<{ key: string; payload: Buffer }> = [];
  for (let r = 0; out.length < count; r++) {
    const ts = t0 + r * 25;
    for (const s of sim.sample(ts)) if (out.length < count) out.push({ key: s.key, payload: Buffer.from(`{"ts":${ts},"speed":${s.speedMps},"dir":${s.dirDeg}}`) });
  }
  return out;
}

/** Runs the pipeline's steps over `count` readings, committing every `perCommit`; returns per-reading times. */
async function feed(templateDir: string, dir: string, msgs: Array<{ key: string; payload: Buffer }>, perCommit: number) {
  const { sqlite, registry, watch, queue } = await open(templateDir, dir);
  try {
    const takes: number[] = [];
    let parseMs = 0;
    let commitMs = 0;
    for (let i = 0; i < msgs.length; i += perCommit) {
      const end = Math.min(msgs.length, i + perCommit);
      for (let k = i; k < end; k++) {
        const m = msgs[k]!;
        const sensor = registry.sensorByKey(m.key)!;
        const receivedAtMs = Date.now();
        let t = performance.now();
        const parsed = parseReadingPayload(m.payload, { receivedAtMs, unit: 'm/s' });
        parseMs += performance.now() - t;
        if (!parsed.ok) throw new Error(`breakdown: payload rejected: ${parsed.reason}`);
        t = performance.now();
        const { batch } = watch.take(sensor, parsed.readings, receivedAtMs);
        takes.push(performance.now() - t);
        t = performance.now();
        void queue.enqueue(batch);
        commitMs += performance.now() - t;
      }
      const t = performance.now();
      queue.flush();
      commitMs += performance.now() - t;
    }
    if (queue.stats.committedReadings !== msgs.length) throw new Error(`breakdown (${perCommit}/commit): ${queue.stats.committedReadings} of ${msgs.length} committed (${queue.stats.lastError ?? "no error"}, ${queue.stats.duplicateReadings} duplicates, ${queue.stats.failedCommits} failed)`);
    return { takes, parseMs, commitMs };
  } finally {
    sqlite.close();
  }
}

export async function runBreakdown(o: { templateDir: string; workDir: string; fleet: Fleet; readings: number; naturalGroup: number; largeGroup: number; seed: number; baseMeanMps: number }): Promise<BreakdownResult> {
  const msgs = messages(o.fleet, o.readings, o.seed, o.baseMeanMps);
  const us = (ms: number): number => (1000 * ms) / msgs.length;
  const groups = [...new Set([1, o.naturalGroup, o.largeGroup])];
  const commitUs: BreakdownResult['commitUs'] = [];
  let main: Awaited<ReturnType<typeof feed>> | null = null;
  for (const g of groups) {
    const r = await feed(o.templateDir, path.join(o.workDir, `breakdown-${g}`), msgs, g);
    commitUs.push({ perCommit: g, us: us(r.commitMs) });
    if (g === o.naturalGroup) main = r;
  }
  const takes = main!.takes;
  const slow = takes.filter((t) => t > 0.1);
  const fast = takes.filter((t) => t <= 0.1);
  const sum = (a: number[]): number => a.reduce((x, y) => x + y, 0);
  return {
    readings: msgs.length,
    parseUs: us(main!.parseMs),
    takeUs: us(sum(takes)),
    takeMedianUs: median(takes) * 1000,
    slowTakeShare: slow.length / takes.length,
    slowTakeMeanUs: slow.length ? (1000 * sum(slow)) / slow.length : 0,
    fastTakeMeanUs: fast.length ? (1000 * sum(fast)) / fast.length : 0,
    commitUs,
  };
}
