/**
 * Benchmark 1, ingest throughput: the server (100 sensors, 1,000 structures, every reading
 * assessed and committed before its QoS 1 acknowledgement) against a bare baseline, side by side
 * in one run, with the same publisher (one child process, four gateway connections, the same
 * prepared readings) and the same broker.
 *
 * Every process under test is a child process: the server compiled, as `npm start` runs it
 * (spawnServer, dist/server/main.js), the baselines from bareBroker.ts and countingSubscriber.ts
 * under tsx (its loader transforms the files once at import; nothing per message). Each run starts from scratch (fresh data folder; for Mosquitto a fresh
 * broker, so no session of an earlier run queues messages), warms up with a short burst, then
 * times the main burst.
 *
 * - Embedded broker: the server's readings/s = readings / (first publish → last PUBACK at the
 *   publisher; the server sends a PUBACK only after the commit). The target's baseline is the
 *   design's own (design.md 6): a bare mqtt.js subscriber that only counts, on the same broker
 *   (aedes, no hooks) with the same publisher, timed where it counts. A stricter baseline is
 *   printed beside it: aedes whose `authorizePublish` hook only counts (see bareBroker.ts).
 * - Mosquitto: readings/s = readings / (first publish → the last one counted by the baseline
 *   subscriber, or stored by the server: `database.committedReadings` of /api/health polled
 *   every 25 ms). Mosquitto acknowledges the publisher at once and queues for the subscriber.
 */
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { spawnServer, type ServerProcess } from '../helpers/serverProcess.ts';
import type { BareCommand, BareReply } from './bareBroker.ts';
import { Child, cpuSeconds, sampleMemory, sleep, startMosquitto, track, wallMs } from './common.ts';
import type { SubscriberCommand, SubscriberReply } from './countingSubscriber.ts';
import { copyTemplate, topicPrefix, type Fleet } from './fleet.ts';
import type { PublisherCommand, PublisherConnection, PublisherReply } from './publisher.ts';

export interface IngestOptions {
  templateDir: string;
  workDir: string;
  fleet: Fleet;
  readings: number;
  warmupReadings: number;
  inflight: number;
  stepMs: number;
  seed: number;
  baseMeanMps: number;
  repeats: number;
  mosquitto: boolean;
  /** Extra environment for the server processes (e.g. NODE_OPTIONS=--cpu-prof when profiling). */
  serverEnv: Record<string, string>;
  log: (line: string) => void;
}

export interface IngestRun {
  broker: 'embedded' | 'mosquitto';
  variant: 'server' | 'bare-hook' | 'bare-subscriber';
  repeat: number;
  readings: number;
  seconds: number;
  perS: number;
  /** CPU time the process under test used per reading during the timed burst, µs (null: unknown). */
  cpuUsPerReading: number | null;
  /** Server runs: the same for its main thread alone (the event loop; the commit thread is the rest). */
  mainThreadCpuUsPerReading?: number | null;
  /** Server runs: what the database holds afterwards. */
  stored?: { readings: number; late: number; levelChanges: number; noDataEvents: number; alerts: number };
  /** Server runs: resident memory of the server process during the run. */
  memory?: { maxRssKb: number; hwmKb: number };
}

type Publisher = Child<PublisherCommand, PublisherReply>;

function connections(fleet: Fleet, withCredentials: boolean, tag: string): PublisherConnection[] {
  return fleet.gateways.map((g, i) => ({
    clientId: `bench-${tag}-gw-${i + 1}`,
    ...(withCredentials ? { username: g.username, password: g.password } : {}),
    sensorKeys: g.sensorKeys,
  }));
}

async function startPublisher(o: IngestOptions, url: string, withCredentials: boolean, tag: string): Promise<Publisher> {
  const pub: Publisher = new Child('publisher.ts');
  pub.send({ cmd: 'connect', url, connections: connections(o.fleet, withCredentials, tag), sensors: o.fleet.sensors, topicPrefix, seed: o.seed, baseMeanMps: o.baseMeanMps });
  await pub.next('connected', 30_000);
  return pub;
}

/**
 * Warm-up, then the timed burst. Timestamps: the main burst's readings start 2 s before it
 * starts and advance `stepMs` per sensor round, so a reading is neither more than 10 s ahead of
 * its receipt (it would be kept out of the live state) nor older than the 30-s silence timeout
 * (its sensor would count as silent and every structure would show "no data") for any run of
 * up to about 30 s; the warm-up is stamped 10 s back, before the main burst's first reading.
 */
/**
 * The warm-up burst, then the main one. `sentAtMs` is this process's clock when the main burst was
 * asked for: a run whose end is also timed here (the Mosquitto server run) measures against it,
 * not against the publisher's `startedAtMs`, because two processes' clocks can disagree by
 * seconds after the machine's clock is stepped (seen once: a run of −4.1 s).
 */
async function bursts(o: IngestOptions, pub: Publisher, beforeMain: () => Promise<void> | void, afterWarmup: () => Promise<void>): Promise<Extract<PublisherReply, { kind: 'burst-done' }> & { sentAtMs: number }> {
  const now = Date.now();
  pub.send({ cmd: 'burst', count: o.warmupReadings, inflight: o.inflight, t0Ms: now - 10_000, stepMs: o.stepMs, deadlineMs: wallMs() + 60_000 });
  const warm = await pub.next('burst-done', 65_000);
  if (warm.acked !== o.warmupReadings) throw new Error(`warm-up: ${warm.acked} of ${o.warmupReadings} acknowledged`);
  await afterWarmup();
  await beforeMain();
  const sentAtMs = wallMs();
  pub.send({ cmd: 'burst', count: o.readings, inflight: o.inflight, t0Ms: Date.now() - 2_000, stepMs: o.stepMs, deadlineMs: wallMs() + 120_000 });
  const main = await pub.next('burst-done', 125_000);
  if (main.timedOut || main.acked !== o.readings) throw new Error(`main burst: ${main.acked} of ${o.readings} acknowledged (${main.errors} errors, timed out: ${main.timedOut})`);
  return { ...main, sentAtMs };
}

function storedFigures(dataDir: string): IngestRun['stored'] {
  const db = new Database(path.join(dataDir, 'holdfast.sqlite'), { readonly: true, fileMustExist: true });
  try {
    const one = (sql: string): number => (db.prepare(sql).get() as { n: number }).n;
    return {
      readings: one('SELECT COUNT(*) AS n FROM readings'),
      late: one('SELECT COUNT(*) AS n FROM readings WHERE flags & 1'),
      levelChanges: one('SELECT COUNT(*) AS n FROM level_changes WHERE from_level <> to_level'),
      noDataEvents: one('SELECT COUNT(*) AS n FROM level_changes WHERE no_data = 1'),
      alerts: one('SELECT COUNT(*) AS n FROM alerts'),
    };
  } finally {
    db.close();
  }
}

async function health(server: ServerProcess): Promise<{ broker: { state?: string }; database: { committedReadings: number } }> {
  const res = await fetch(`http://127.0.0.1:${server.httpPort}/api/health`);
  return (await res.json()) as { broker: { state?: string }; database: { committedReadings: number } };
}

/** A server run's figures, with what its database holds afterwards. */
function serverRun(broker: IngestRun['broker'], o: IngestOptions, repeat: number, seconds: number, cpu: { all: number | null; main: number | null }, dataDir: string, mem: { maxRssKb: number; hwmKb: number }): IngestRun {
  return {
    broker,
    variant: 'server',
    repeat,
    readings: o.readings,
    seconds,
    perS: o.readings / seconds,
    cpuUsPerReading: cpu.all,
    mainThreadCpuUsPerReading: cpu.main,
    stored: storedFigures(dataDir),
    memory: { maxRssKb: mem.maxRssKb, hwmKb: mem.hwmKb },
  };
}

/** SIGTERM (the server closes cleanly, and a CPU profile is written), SIGKILL after 10 s. */
export async function stopGracefully(server: ServerProcess): Promise<void> {
  const timer = setTimeout(() => void server.kill('SIGKILL'), 10_000);
  await server.kill('SIGTERM');
  clearTimeout(timer);
}

/** CPU seconds of `pid` between `start()` and `stop()`, as µs per reading (null when /proc is unavailable). */
function cpuMeter(pid: number, tid?: number): { start: () => void; usPerReading: (readings: number) => number | null } {
  let at: number | null = null;
  return {
    start: () => {
      at = cpuSeconds(pid, tid);
    },
    usPerReading: (readings) => {
      const now = cpuSeconds(pid, tid);
      return at === null || now === null ? null : ((now - at) * 1e6) / readings;
    },
  };
}

/** A server's CPU per reading: the whole process, and its main thread (the event loop). */
function serverCpuMeter(pid: number): { start: () => void; usPerReading: (readings: number) => { all: number | null; main: number | null } } {
  const all = cpuMeter(pid);
  const main = cpuMeter(pid, pid);
  return {
    start: () => {
      all.start();
      main.start();
    },
    usPerReading: (readings) => ({ all: all.usPerReading(readings), main: main.usPerReading(readings) }),
  };
}

// ---------- embedded broker ----------

async function embeddedBare(o: IngestOptions, mode: 'hook' | 'subscriber', repeat: number): Promise<IngestRun> {
  const bare: Child<BareCommand, BareReply> = new Child('bareBroker.ts');
  let pub: Publisher | null = null;
  try {
    bare.send({ cmd: 'start', mode, topicFilter: `${topicPrefix}/+/reading` });
    const { port } = await bare.next('listening', 30_000);
    pub = await startPublisher(o, `mqtt://127.0.0.1:${port}`, false, `bare-${mode}`);
    bare.send({ cmd: 'expect', count: o.warmupReadings });
    const cpu = cpuMeter(bare.proc.pid!);
    const main = await bursts(
      o,
      pub,
      () => {
        bare.send({ cmd: 'expect', count: o.readings });
        cpu.start();
      },
      async () => void (await bare.next('counted', 30_000)),
    );
    const counted = await bare.next('counted', 60_000);
    const cpuUsPerReading = cpu.usPerReading(o.readings);
    // The hook counts as it acknowledges; the subscriber variant is timed where it counts.
    const end = mode === 'hook' ? main.finishedAtMs : counted.lastAtMs;
    const seconds = (end - main.startedAtMs) / 1000;
    return { broker: 'embedded', variant: mode === 'hook' ? 'bare-hook' : 'bare-subscriber', repeat, readings: o.readings, seconds, perS: o.readings / seconds, cpuUsPerReading };
  } finally {
    await pub?.kill();
    await bare.kill();
  }
}

async function embeddedServer(o: IngestOptions, repeat: number): Promise<IngestRun> {
  const dataDir = copyTemplate(o.templateDir, path.join(o.workDir, `ingest-embedded-${repeat}`));
  const server = await spawnServer({ ...o.serverEnv, DATA_DIR: dataDir, MQTT_PORT: '0', MQTT_TOPIC_PREFIX: topicPrefix }, 60_000, { compiled: true });
  track(server.proc);
  let pub: Publisher | null = null;
  let memory: ReturnType<typeof sampleMemory> | null = null;
  try {
    pub = await startPublisher(o, `mqtt://127.0.0.1:${server.mqttPort}`, true, 'server');
    memory = sampleMemory(server.proc.pid!);
    const cpu = serverCpuMeter(server.proc.pid!);
    const main = await bursts(o, pub, () => cpu.start(), async () => undefined);
    const cpuUsPerReading = cpu.usPerReading(o.readings);
    const mem = memory.stop();
    memory = null;
    const seconds = (main.finishedAtMs - main.startedAtMs) / 1000;
    await stopGracefully(server);
    return serverRun('embedded', o, repeat, seconds, cpuUsPerReading, dataDir, mem);
  } finally {
    memory?.stop();
    await pub?.kill();
    await server.kill();
  }
}

// ---------- Mosquitto ----------

async function mosquittoBare(o: IngestOptions, repeat: number): Promise<IngestRun> {
  const broker = await startMosquitto(path.join(o.workDir, `mosquitto-bare-${repeat}`));
  const sub: Child<SubscriberCommand, SubscriberReply> = new Child('countingSubscriber.ts');
  let pub: Publisher | null = null;
  try {
    sub.send({ cmd: 'start', url: broker.url, clientId: `bench-bare-sub-${repeat}`, topicFilter: `${topicPrefix}/+/reading` });
    await sub.next('subscribed', 30_000);
    sub.send({ cmd: 'expect', count: o.warmupReadings });
    pub = await startPublisher(o, broker.url, false, `mosq-bare-${repeat}`);
    const cpu = cpuMeter(sub.proc.pid!);
    const main = await bursts(
      o,
      pub,
      () => {
        sub.send({ cmd: 'expect', count: o.readings });
        cpu.start();
      },
      async () => void (await sub.next('counted', 30_000)),
    );
    const counted = await sub.next('counted', 120_000);
    const cpuUsPerReading = cpu.usPerReading(o.readings);
    const seconds = (counted.lastAtMs - main.startedAtMs) / 1000;
    return { broker: 'mosquitto', variant: 'bare-subscriber', repeat, readings: o.readings, seconds, perS: o.readings / seconds, cpuUsPerReading };
  } finally {
    await pub?.kill();
    await sub.kill();
    await broker.stop();
  }
}

async function mosquittoServer(o: IngestOptions, repeat: number): Promise<IngestRun> {
  const broker = await startMosquitto(path.join(o.workDir, `mosquitto-server-${repeat}`));
  const dataDir = copyTemplate(o.templateDir, path.join(o.workDir, `ingest-mosquitto-${repeat}`));
  let server: ServerProcess | null = null;
  let pub: Publisher | null = null;
  let memory: ReturnType<typeof sampleMemory> | null = null;
  try {
    server = await spawnServer({ ...o.serverEnv, DATA_DIR: dataDir, MQTT_URL: broker.url, MQTT_CLIENT_ID: `holdfast-bench-${repeat}`, MQTT_PROTOCOL_VERSION: '5', MQTT_TOPIC_PREFIX: topicPrefix }, 60_000, { compiled: true });
    track(server.proc);
    const s = server;
    const connectedBy = Date.now() + 20_000;
    while ((await health(s)).broker.state !== 'connected') {
      if (Date.now() > connectedBy) throw new Error('server did not connect to mosquitto within 20 s');
      await sleep(50);
    }
    await sleep(300); // the subscription follows the CONNACK
    pub = await startPublisher(o, broker.url, false, `mosq-server-${repeat}`);
    let base = 0;
    const waitStored = async (target: number, timeoutMs: number): Promise<number> => {
      const by = Date.now() + timeoutMs;
      for (;;) {
        const h = await health(s);
        if (h.database.committedReadings >= target) return wallMs();
        if (Date.now() > by) throw new Error(`server stored ${h.database.committedReadings} of ${target} readings within ${timeoutMs} ms`);
        await sleep(25);
      }
    };
    memory = sampleMemory(s.proc.pid!);
    const cpu = serverCpuMeter(s.proc.pid!);
    const main = await bursts(o, pub, () => cpu.start(), async () => {
      await waitStored(o.warmupReadings, 60_000);
      base = (await health(s)).database.committedReadings;
    });
    const end = await waitStored(base + o.readings, 120_000);
    const cpuUsPerReading = cpu.usPerReading(o.readings);
    const mem = memory.stop();
    memory = null;
    // Both ends on this process's clock (bursts says why).
    const seconds = (end - main.sentAtMs) / 1000;
    await stopGracefully(s);
    return serverRun('mosquitto', o, repeat, seconds, cpuUsPerReading, dataDir, mem);
  } finally {
    memory?.stop();
    await pub?.kill();
    await server?.kill();
    await broker.stop();
  }
}

export interface IngestResult {
  runs: IngestRun[];
  /**
   * Ratios are taken per repeat, between runs made one after the other (the machine's other work
   * changes from minute to minute), and the median of the repeats is reported; readings/s are
   * the medians too.
   */
  /** ratio: server ÷ aedes + counting mqtt.js subscriber (the target's baseline); ratioToHook: server ÷ bare aedes hook. */
  embedded: { serverPerS: number; bareHookPerS: number; bareSubscriberPerS: number; ratio: number; ratios: number[]; ratioToHook: number; hookRatios: number[]; cpu: CpuFigures };
  mosquitto: { serverPerS: number; barePerS: number; ratio: number; ratios: number[]; cpu: CpuFigures } | null;
}

/**
 * CPU time per reading of the process under test (median over repeats), and the throughput
 * ratio it implies if each process had a core of its own: baseline CPU ÷ server CPU. It hardly
 * depends on the machine's other work, but it does not see waiting (round trips, a serialized
 * acknowledgement): the wall-clock ratio is the target's figure.
 */
export interface CpuFigures {
  serverUs: number;
  /** The server's main thread alone (median over repeats). */
  serverMainUs: number;
  bareUs: number;
  ratio: number;
}

function rate(runs: IngestRun[], broker: IngestRun['broker'], variant: IngestRun['variant'], repeat: number): number {
  return runs.find((r) => r.broker === broker && r.variant === variant && r.repeat === repeat)?.perS ?? Number.NaN;
}

function medianOf(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length / 2;
  return sorted.length % 2 ? sorted[Math.floor(mid)]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

export async function runIngest(o: IngestOptions): Promise<IngestResult> {
  fs.mkdirSync(o.workDir, { recursive: true });
  const runs: IngestRun[] = [];
  const note = (r: IngestRun): void => {
    runs.push(r);
    o.log(`  ${r.broker} ${r.variant} #${r.repeat}: ${Math.round(r.perS)} readings/s (${r.readings} in ${r.seconds.toFixed(2)} s, ${r.cpuUsPerReading === null ? '?' : r.cpuUsPerReading.toFixed(0)} µs CPU per reading${r.mainThreadCpuUsPerReading != null ? `, ${r.mainThreadCpuUsPerReading.toFixed(0)} on the main thread` : ''})${r.stored ? `, stored ${r.stored.readings} (late ${r.stored.late}), level changes ${r.stored.levelChanges}, no-data events ${r.stored.noDataEvents}, alerts ${r.stored.alerts}` : ''}${r.memory ? `, max RSS ${(r.memory.maxRssKb / 1024).toFixed(0)} MB` : ''}`);
  };
  // Interleaved, so a slow spell of the machine does not favour one side.
  for (let repeat = 1; repeat <= o.repeats; repeat++) {
    note(await embeddedBare(o, 'hook', repeat));
    note(await embeddedServer(o, repeat));
    note(await embeddedBare(o, 'subscriber', repeat));
  }
  if (o.mosquitto) {
    for (let repeat = 1; repeat <= o.repeats; repeat++) {
      note(await mosquittoBare(o, repeat));
      note(await mosquittoServer(o, repeat));
    }
  }
  const repeats = Array.from({ length: o.repeats }, (_, i) => i + 1);
  const series = (broker: IngestRun['broker'], variant: IngestRun['variant']): number[] => repeats.map((i) => rate(runs, broker, variant, i));
  const ratios = repeats.map((i) => rate(runs, 'embedded', 'server', i) / rate(runs, 'embedded', 'bare-subscriber', i));
  const hookRatios = repeats.map((i) => rate(runs, 'embedded', 'server', i) / rate(runs, 'embedded', 'bare-hook', i));
  const mosquittoRatios = repeats.map((i) => rate(runs, 'mosquitto', 'server', i) / rate(runs, 'mosquitto', 'bare-subscriber', i));
  const cpuOf = (broker: IngestRun['broker'], variant: IngestRun['variant']): number =>
    medianOf(runs.filter((r) => r.broker === broker && r.variant === variant && r.cpuUsPerReading !== null).map((r) => r.cpuUsPerReading!));
  const cpuFigures = (broker: IngestRun['broker'], bare: IngestRun['variant']): CpuFigures => {
    const serverUs = cpuOf(broker, 'server');
    const bareUs = cpuOf(broker, bare);
    const serverMainUs = medianOf(runs.filter((r) => r.broker === broker && r.variant === 'server' && r.mainThreadCpuUsPerReading != null).map((r) => r.mainThreadCpuUsPerReading!));
    return { serverUs, serverMainUs, bareUs, ratio: bareUs / serverUs };
  };
  return {
    runs,
    embedded: {
      serverPerS: medianOf(series('embedded', 'server')),
      bareHookPerS: medianOf(series('embedded', 'bare-hook')),
      bareSubscriberPerS: medianOf(series('embedded', 'bare-subscriber')),
      ratio: medianOf(ratios),
      ratios,
      ratioToHook: medianOf(hookRatios),
      hookRatios,
      cpu: cpuFigures('embedded', 'bare-hook'),
    },
    mosquitto: o.mosquitto
      ? { serverPerS: medianOf(series('mosquitto', 'server')), barePerS: medianOf(series('mosquitto', 'bare-subscriber')), ratio: medianOf(mosquittoRatios), ratios: mosquittoRatios, cpu: cpuFigures('mosquitto', 'bare-subscriber') }
      : null,
  };
}
