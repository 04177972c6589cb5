/**
 * Benchmark 2, reading → level change on the live stream, and benchmark 5, resident memory,
 * on one server process (spawnServer: the compiled `dist/server/main.js`, as `npm start` runs it, embedded broker) with
 * the benchmark register (100 sensors, 1,000 structures taking their wind from every sensor).
 *
 * Latency: a signed-in client reads /api/stream (Server-Sent Events) while a publisher child
 * process sends raw samples from the 100 sensors at a steady background rate. A probe sensor,
 * registered through the HTTP API with its own gateway, governs one weak probe structure (a
 * hoarding whose first level triggers near 9 m/s, far below every other structure's first
 * trigger). The site's hold time is set to 0 (PATCH /api/site) so a level can drop at once; the
 * dead band still applies. The benchmark publishes summaries `{ts, speed, gust}` from the probe,
 * alternately between the probe's first two triggers (→ level 1) and below its lowered first
 * trigger (→ level 0), and times each from just before `publish()` to the arrival of the
 * `structure` event with the new level on the stream, in the same process and clock. The probe's
 * gust is also the site's highest at times, so it makes the server re-assess the other 1,000
 * structures as a real gust would.
 *
 * Memory: VmRSS of the server process, sampled every 250 ms from /proc/<pid>/status, while the
 * latency phase runs and then during a full-speed burst from the same publisher.
 */
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import mqtt from 'mqtt';
import { spawnServer } from '../helpers/serverProcess.ts';
import { ApiClient } from '../helpers/testServer.ts';
import { Child, procMemoryKb, quantile, sampleMemory, sleep, track, wallMs } from './common.ts';
import { copyTemplate, topicPrefix, type Fleet } from './fleet.ts';
import { stopGracefully } from './ingest.ts';
import type { PublisherCommand, PublisherReply } from './publisher.ts';

export interface LatencyOptions {
  templateDir: string;
  workDir: string;
  fleet: Fleet;
  changes: number;
  backgroundPerS: number;
  burstReadings: number;
  inflight: number;
  seed: number;
  baseMeanMps: number;
  serverEnv: Record<string, string>;
  log: (line: string) => void;
}

export interface LatencyResult {
  changes: number;
  missed: number;
  p50Ms: number;
  p90Ms: number;
  p99Ms: number;
  maxMs: number;
  upP99Ms: number;
  downP99Ms: number;
  backgroundPublished: number;
  backgroundSkipped: number;
  /** Background readings actually published per second over the latency phase. */
  backgroundPerS: number;
  probeTriggersMps: number[];
  probeHighMps: number;
  probeLowMps: number;
  othersMinFirstTriggerMps: number;
  stream: { bytesPerS: number; eventsPerS: Record<string, number> };
  memory: {
    startedRssKb: number;
    latencyPhase: { maxRssKb: number };
    burst: { maxRssKb: number; readings: number; perS: number };
    hwmKb: number;
  };
}

const adminUser = 'bench-admin';
const adminPassword = 'bench-admin-password';

/** The probe structure: a light hoarding (invented), so its levels sit far below the site's. */
const probeRecord = {
  kind: 'custom',
  name: 'Probe hoarding (benchmark)',
  baseDepthM: 1.2,
  faces: [{ label: 'board 4 m²', areaM2: 4, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8 }],
  masses: [{ label: 'ballast', massKg: 400, xM: 0.6 }],
  coefficientSource: 'benchmark data: invented hoarding, EN 1991-1-4 7.4.3 signboard c_f 1.80',
};

interface StreamWatch {
  /** Resolves with the arrival time (performance.now()) of the probe's structure event at `level`. */
  waitLevel(level: number, timeoutMs: number): Promise<number | null>;
  /** Forgets probe events that arrived while nobody waited. */
  reset(): void;
  bytes: number;
  events: Map<string, number>;
  close(): void;
}

/** Reads the SSE stream; only single-structure events of the probe are parsed (batches are only counted). */
async function watchStream(api: ApiClient, probeId: number): Promise<StreamWatch> {
  const res = await api.request('GET', '/api/stream');
  if (res.status !== 200 || !res.body) throw new Error(`GET /api/stream answered ${res.status}`);
  const reader = res.body.getReader();
  const decoder = new TextDecoder();
  const marker = `data: {"id":${probeId},`;
  let buffer = '';
  let searchFrom = 0;
  let waiter: { level: number; resolve: (at: number | null) => void } | null = null;
  const seen: Array<{ level: number; at: number }> = [];
  const w: StreamWatch = {
    bytes: 0,
    events: new Map(),
    waitLevel: (level, timeoutMs) => {
      const already = seen.findIndex((s) => s.level === level);
      if (already >= 0) {
        const at = seen[already]!.at;
        seen.length = 0;
        return Promise.resolve(at);
      }
      return new Promise((resolve) => {
        const t = setTimeout(() => {
          waiter = null;
          resolve(null);
        }, timeoutMs);
        waiter = {
          level,
          resolve: (at) => {
            clearTimeout(t);
            waiter = null;
            resolve(at);
          },
        };
      });
    },
    reset: () => {
      seen.length = 0;
    },
    close: () => void reader.cancel().catch(() => undefined),
  };
  const onBlock = (block: string, at: number): void => {
    const e = /(?:^|\n)event: ?([^\n]*)/.exec(block);
    const kind = e?.[1] ?? 'message';
    w.events.set(kind, (w.events.get(kind) ?? 0) + 1);
    if (kind !== 'structure') return;
    const i = block.indexOf(marker);
    if (i < 0) return;
    const end = block.indexOf('\n', i);
    const state = JSON.parse(block.slice(i + 6, end < 0 ? undefined : end)) as { id: number; level: number; noData: boolean };
    if (state.noData) return;
    if (waiter && waiter.level === state.level) waiter.resolve(at);
    else seen.push({ level: state.level, at });
  };
  void (async () => {
    for (;;) {
      const { value, done } = await reader.read().catch(() => ({ value: undefined, done: true as const }));
      if (done || !value) return;
      const at = performance.now();
      w.bytes += value.byteLength;
      buffer += decoder.decode(value, { stream: true });
      let start = 0;
      for (;;) {
        const cut = buffer.indexOf('\n\n', searchFrom);
        if (cut < 0) break;
        onBlock(buffer.slice(start, cut), at);
        start = cut + 2;
        searchFrom = start;
      }
      buffer = buffer.slice(start);
      searchFrom = Math.max(0, buffer.length - 1);
    }
  })();
  return w;
}

export async function runLatency(o: LatencyOptions): Promise<LatencyResult> {
  const dataDir = copyTemplate(o.templateDir, path.join(o.workDir, 'latency'));
  const server = await spawnServer({ ...o.serverEnv, DATA_DIR: dataDir, MQTT_PORT: '0', MQTT_TOPIC_PREFIX: topicPrefix, ADMIN_USERNAME: adminUser, ADMIN_PASSWORD: adminPassword }, 60_000, { compiled: true });
  track(server.proc);
  const pid = server.proc.pid!;
  const startedRssKb = procMemoryKb(pid)?.rssKb ?? 0;
  const pub: Child<PublisherCommand, PublisherReply> = new Child('publisher.ts');
  let probe: mqtt.MqttClient | null = null;
  let stream: StreamWatch | null = null;
  let memory: ReturnType<typeof sampleMemory> | null = null;
  try {
    const base = `http://127.0.0.1:${server.httpPort}`;
    const api = new ApiClient(base);
    const signIn = await api.signIn(adminUser, adminPassword);
    if (signIn.status !== 200) throw new Error(`sign-in answered ${signIn.status}`);
    const call = async <T>(method: string, pathname: string, body?: unknown): Promise<T> => {
      const r = await api.json<T>(method, pathname, body);
      if (r.status >= 300) throw new Error(`${method} ${pathname} answered ${r.status}: ${JSON.stringify(r.body).slice(0, 500)}`);
      return r.body;
    };
    await call('PATCH', '/api/site', { holdTimeMs: 0 });
    await call('POST', '/api/sensors', { key: 'probe-mast', name: 'Probe mast (benchmark)', heightM: 10 });
    const gw = await call<{ password: string }>('POST', '/api/gateways', { name: 'Probe gateway (benchmark)', username: 'probe-gw', sensorKeys: ['probe-mast'] });
    const created = await call<{ structure: { id: number; live: { triggerGustsMps: number[] } } }>('POST', '/api/structures', { record: probeRecord, orientationDeg: 270, sensorKeys: ['probe-mast'] });
    const probeId = created.structure.id;
    const triggers = created.structure.live.triggerGustsMps;
    const all = await call<{ structures: Array<{ id: number; live: { triggerGustsMps: number[] } }> }>('GET', '/api/structures');
    const othersMin = Math.min(...all.structures.filter((s) => s.id !== probeId).map((s) => s.live.triggerGustsMps[0] ?? Infinity));
    const high = (triggers[0]! + triggers[1]!) / 2;
    const low = triggers[0]! * 0.8;
    if (!(high < othersMin)) throw new Error(`probe gust ${high.toFixed(2)} m/s would raise other structures (lowest first trigger ${othersMin.toFixed(2)} m/s)`);

    stream = await watchStream(api, probeId);
    probe = mqtt.connect(`mqtt://127.0.0.1:${server.mqttPort}`, { username: 'probe-gw', password: gw.password, clientId: 'bench-probe-gw', reconnectPeriod: 0, protocolVersion: 4 });
    await new Promise<void>((resolve, reject) => {
      probe!.once('connect', () => resolve());
      probe!.once('error', reject);
    });
    const probeTopic = `${topicPrefix}/probe-mast/reading`;
    let lastTs = 0;
    const publishProbe = (gustMps: number): number => {
      const ts = Math.max(Date.now(), lastTs + 1);
      lastTs = ts;
      const payload = `{"ts":${ts},"speed":${(gustMps / 1.5).toFixed(2)},"gust":${gustMps.toFixed(2)},"dir":270}`;
      const t0 = performance.now();
      probe!.publish(probeTopic, payload, { qos: 1 });
      return t0;
    };

    pub.send({ cmd: 'connect', url: `mqtt://127.0.0.1:${server.mqttPort}`, connections: o.fleet.gateways.map((g, i) => ({ clientId: `bench-bg-gw-${i + 1}`, username: g.username, password: g.password, sensorKeys: g.sensorKeys })), sensors: o.fleet.sensors, topicPrefix, seed: o.seed, baseMeanMps: o.baseMeanMps });
    await pub.next('connected', 30_000);
    memory = sampleMemory(pid);
    // Long enough for the whole latency phase; stopped by killing the publisher if it ends sooner.
    const backgroundMs = 30_000 + o.changes * 400;
    const backgroundStart = performance.now();
    pub.send({ cmd: 'rate', ratePerS: o.backgroundPerS, durationMs: backgroundMs, inflight: o.inflight });
    await sleep(3_000);

    // Prime: the probe structure leaves "no data" at level 0.
    publishProbe(low);
    await stream.waitLevel(0, 5_000);
    await sleep(200);

    const up: number[] = [];
    const down: number[] = [];
    let missed = 0;
    const streamStart = { bytes: stream.bytes, at: performance.now(), events: new Map(stream.events) };
    for (let i = 0; i < o.changes && missed < 10; i++) {
      const goingUp = i % 2 === 0;
      stream.reset();
      const t0 = publishProbe(goingUp ? high : low);
      const at = await stream.waitLevel(goingUp ? 1 : 0, 3_000);
      if (at === null) {
        missed++;
        // Make sure the next step starts from a known level.
        publishProbe(low);
        await stream.waitLevel(0, 3_000);
        if (!goingUp) i++;
      } else (goingUp ? up : down).push(at - t0);
      await sleep(30 + ((i * 17) % 41));
    }
    const streamSeconds = (performance.now() - streamStart.at) / 1000;
    const eventsPerS: Record<string, number> = {};
    for (const [k, n] of stream.events) eventsPerS[k] = Math.round((10 * (n - (streamStart.events.get(k) ?? 0))) / streamSeconds) / 10;
    const streamBytesPerS = (stream.bytes - streamStart.bytes) / streamSeconds;
    const latencyMemory = memory.stop();
    memory = null;
    pub.send({ cmd: 'stop' });
    const background = await pub.next('rate-done', 10_000);
    const backgroundSeconds = (performance.now() - backgroundStart) / 1000;
    await pub.kill();

    // Memory under a full-speed burst from the same register and publisher setup.
    const burstPub: Child<PublisherCommand, PublisherReply> = new Child('publisher.ts');
    let burst = { maxRssKb: 0, readings: 0, perS: 0 };
    try {
      burstPub.send({ cmd: 'connect', url: `mqtt://127.0.0.1:${server.mqttPort}`, connections: o.fleet.gateways.map((g, i) => ({ clientId: `bench-burst-gw-${i + 1}`, username: g.username, password: g.password, sensorKeys: g.sensorKeys })), sensors: o.fleet.sensors, topicPrefix, seed: o.seed + 1, baseMeanMps: o.baseMeanMps });
      await burstPub.next('connected', 30_000);
      const m = sampleMemory(pid);
      burstPub.send({ cmd: 'burst', count: o.burstReadings, inflight: o.inflight, t0Ms: Date.now() + 100, stepMs: 25, deadlineMs: wallMs() + 90_000 });
      const done = await burstPub.next('burst-done', 95_000);
      await sleep(1_500); // a tick or two after the burst
      const mem = m.stop();
      burst = { maxRssKb: mem.maxRssKb, readings: done.acked, perS: done.acked / ((done.finishedAtMs - done.startedAtMs) / 1000) };
    } finally {
      await burstPub.kill();
    }
    const hwmKb = procMemoryKb(pid)?.hwmKb ?? 0;

    const both = [...up, ...down];
    return {
      changes: both.length,
      missed,
      p50Ms: quantile(both, 0.5),
      p90Ms: quantile(both, 0.9),
      p99Ms: quantile(both, 0.99),
      maxMs: Math.max(...both),
      upP99Ms: quantile(up, 0.99),
      downP99Ms: quantile(down, 0.99),
      backgroundPublished: background.published,
      backgroundSkipped: background.skipped,
      backgroundPerS: background.published / backgroundSeconds,
      probeTriggersMps: triggers,
      probeHighMps: high,
      probeLowMps: low,
      othersMinFirstTriggerMps: othersMin,
      stream: { bytesPerS: streamBytesPerS, eventsPerS },
      memory: { startedRssKb, latencyPhase: { maxRssKb: latencyMemory.maxRssKb }, burst, hwmKb },
    };
  } finally {
    memory?.stop();
    stream?.close();
    await probe?.endAsync(true).catch(() => undefined);
    await pub.kill();
    await stopGracefully(server);
  }
}
