/**
 * `npm run bench`: the benchmarks of design.md section 6, each measured side by side with its
 * baseline in one run, printed as one table with the target beside each figure and written as
 * JSON to tests/artifacts/bench.json. Benchmarks are not tests: nothing here passes or fails a
 * build; a figure that misses its target is marked MISS.
 *
 *   1 ingest throughput (embedded broker; Mosquitto when installed)   ingest.ts
 *   2 reading → level change on the live stream                      latency.ts
 *   3 log queries over a generated festival                           festival.ts
 *   4 bytes per stored reading                                        festival.ts
 *   5 resident memory of the server under load                        latency.ts
 *   6 front-end JavaScript, gzipped                                   frontend.ts
 *   7 live stream fan-out: bytes per client, ack p99 with 500 clients fanout.ts
 *
 * Environment (all optional; defaults keep the run to a few minutes on two cores, the first run
 * longer while it generates the festival database, which is then cached):
 *   BENCH_ONLY               comma list of ingest, latency, fanout, logs, frontend (default: all)
 *   BENCH_SENSORS            anemometers on the benchmark site (100)
 *   BENCH_STRUCTURES         registered structures (1000)
 *   BENCH_GATEWAYS           gateway connections of the publisher (4)
 *   BENCH_INGEST_READINGS    readings per timed ingest burst (100000: seconds of steady state, not a JIT warm-up)
 *   BENCH_INGEST_REPEATS     interleaved repeats of each ingest run; ratios per repeat, median reported (3)
 *   BENCH_INFLIGHT           QoS 1 publishes awaiting PUBACK per gateway connection (50)
 *   BENCH_MOSQUITTO          0 skips the Mosquitto runs (default: run them when `mosquitto` is installed)
 *   BENCH_LATENCY_CHANGES    level changes timed on the live stream (200)
 *   BENCH_BACKGROUND_PER_S   background readings per second during the latency run (200)
 *   BENCH_MEMORY_BURST       readings of the full-speed burst during the memory measurement (30000)
 *   BENCH_FANOUT_CLIENTS     live-stream clients during the fan-out benchmark (500)
 *   BENCH_FANOUT_PER_S       readings per second during the fan-out benchmark (100)
 *   BENCH_FANOUT_PHASE_S     seconds per fan-out phase (20; five phases with warm-up and settling)
 *   BENCH_FESTIVAL_SENSORS, BENCH_FESTIVAL_DAYS, BENCH_FESTIVAL_HZ   the generated log (10, 6, 1)
 *   BENCH_QUERY_REPS, BENCH_FULLSCAN_REPS                            timed repetitions (10, 3)
 *   BENCH_PROFILE=1          server processes write CPU profiles to tests/artifacts/profiles/
 *   BENCH_ALLOCATIONS=1      server processes write allocation samples (.heapprofile) there too
 *                            (read them with tests/bench/profileSummary.ts)
 *   BENCH_MEMORY_TRACE=1     the latency server appends process.memoryUsage() to
 *                            tests/artifacts/bench-memory.jsonl every 500 ms (=gc: every 2 s after
 *                            a forced full collection, to see the live heap; slows the server)
 *   BENCH_KEEP=1             keep the servers' data folders in tests/artifacts/bench-work/
 *
 * Ports: 127.0.0.1 and ephemeral ports only.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { spawnServer } from '../helpers/serverProcess.ts';
import { hasBinary, killTracked, procMemoryKb, sleep, track } from './common.ts';
import { festivalDatabase, measureStorage, timeLogQueries, type QueryTiming, type StorageResult } from './festival.ts';
import { writeTemplate, type Fleet } from './fleet.ts';
import { measureFrontend, type FrontendResult } from './frontend.ts';
import { runBreakdown, type BreakdownResult } from './breakdown.ts';
import { runIngest, stopGracefully, type IngestResult } from './ingest.ts';
import { runFanout, type FanoutResult } from './fanout.ts';
import { runLatency, type LatencyResult } from './latency.ts';

const env = process.env;
const num = (name: string, fallback: number): number => {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const v = Number(raw);
  if (!Number.isFinite(v) || v <= 0) throw new Error(`${name} must be a positive number, got "${raw}"`);
  return v;
};

const only = new Set((env.BENCH_ONLY ?? 'ingest,latency,fanout,logs,frontend').split(',').map((s) => s.trim()).filter(Boolean));
const artifacts = path.resolve('tests/artifacts');
const workDir = path.join(artifacts, 'bench-work');
const profileDir = path.join(artifacts, 'profiles');
const jsonFile = path.join(artifacts, 'bench.json');

const settings = {
  sensors: num('BENCH_SENSORS', 100),
  structures: num('BENCH_STRUCTURES', 1000),
  gateways: num('BENCH_GATEWAYS', 4),
  ingestReadings: num('BENCH_INGEST_READINGS', 100_000),
  ingestRepeats: num('BENCH_INGEST_REPEATS', 3),
  inflight: num('BENCH_INFLIGHT', 50),
  mosquitto: env.BENCH_MOSQUITTO === '0' ? false : hasBinary('mosquitto'),
  latencyChanges: num('BENCH_LATENCY_CHANGES', 200),
  backgroundPerS: num('BENCH_BACKGROUND_PER_S', 200),
  memoryBurst: num('BENCH_MEMORY_BURST', 30_000),
  fanoutClients: num('BENCH_FANOUT_CLIENTS', 500),
  fanoutPerS: num('BENCH_FANOUT_PER_S', 100),
  fanoutPhaseMs: num('BENCH_FANOUT_PHASE_S', 20) * 1000,
  festival: { sensors: num('BENCH_FESTIVAL_SENSORS', 10), days: num('BENCH_FESTIVAL_DAYS', 6), hz: num('BENCH_FESTIVAL_HZ', 1), seed: 20260612, startMs: Date.UTC(2026, 5, 8) },
  queryReps: num('BENCH_QUERY_REPS', 10),
  fullScanReps: num('BENCH_FULLSCAN_REPS', 3),
  profile: env.BENCH_PROFILE === '1',
  memoryTrace: env.BENCH_MEMORY_TRACE === '1' || env.BENCH_MEMORY_TRACE === 'gc',
  seed: 20260614,
  /** Mean wind at 10 m of the simulated readings, m/s: a breezy day that leaves the site calm. */
  baseMeanMps: 4.5,
};

function serverEnv(extra: Record<string, string> = {}): Record<string, string> {
  const allocations = env.BENCH_ALLOCATIONS === '1';
  const hooks = settings.profile || allocations || Object.keys(extra).length > 0;
  if (!hooks) return {};
  return {
    NODE_OPTIONS: `--import tsx --import ${path.resolve('tests/bench/serverHook.ts')}${env.BENCH_MEMORY_TRACE === 'gc' ? ' --expose-gc' : ''}`,
    ...(settings.profile ? { BENCH_PROFILE_DIR: profileDir } : {}),
    ...(allocations ? { BENCH_ALLOCATION_DIR: profileDir } : {}),
    ...extra,
  };
}

const log = (line: string): void => console.log(line);

interface Row {
  what: string;
  measured: string;
  target: string;
  verdict: 'ok' | 'MISS' | 'info' | 'n/a';
}

const rows: Row[] = [];
const mb = (kb: number): string => `${(kb / 1024).toFixed(0)} MB`;
const ms = (v: number): string => (v >= 100 ? v.toFixed(0) : v >= 10 ? v.toFixed(1) : v.toFixed(2));

async function memoryContext(): Promise<{ nodeIdleKb: number; emptyServerKb: number }> {
  // What the runtime costs before any register: node itself, and the server with nothing registered.
  const { spawn } = await import('node:child_process');
  const idle = track(spawn(process.execPath, ['--eval', 'setInterval(() => {}, 1000)'], { stdio: 'ignore' }));
  await sleep(2_000);
  const nodeIdleKb = procMemoryKb(idle.pid!)?.rssKb ?? 0;
  idle.kill('SIGKILL');
  const dir = path.join(workDir, 'empty-server');
  fs.rmSync(dir, { recursive: true, force: true });
  const server = await spawnServer({ DATA_DIR: dir, MQTT_PORT: '0' }, 60_000, { compiled: true });
  track(server.proc);
  await sleep(2_000);
  const emptyServerKb = procMemoryKb(server.proc.pid!)?.rssKb ?? 0;
  await stopGracefully(server);
  return { nodeIdleKb, emptyServerKb };
}

async function main(): Promise<void> {
  const started = performance.now();
  fs.mkdirSync(artifacts, { recursive: true });
  fs.rmSync(workDir, { recursive: true, force: true });
  fs.mkdirSync(workDir, { recursive: true });
  if (settings.profile) fs.rmSync(profileDir, { recursive: true, force: true });
  log(`holdfast benchmarks — ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, node ${process.version}, ${new Date().toISOString()}`);

  const result: {
    settings: typeof settings;
    machine: { cpus: number; model: string; memMb: number; node: string };
    fleet?: Omit<Fleet, 'gateways' | 'sensors'> & { sensors: number; gateways: number };
    ingest?: IngestResult;
    breakdown?: BreakdownResult;
    latency?: LatencyResult;
    fanout?: FanoutResult;
    loadAverage: Record<string, number[]>;
    memoryContext?: { nodeIdleKb: number; emptyServerKb: number };
    festival?: { readings: number; generatedSeconds: number | null; cached: boolean };
    logQueries?: QueryTiming[];
    storage?: StorageResult;
    frontend?: FrontendResult;
    rows: Row[];
    seconds: number;
  } = {
    settings,
    machine: { cpus: os.cpus().length, model: os.cpus()[0]?.model ?? '', memMb: Math.round(os.totalmem() / 2 ** 20), node: process.version },
    rows,
    seconds: 0,
    loadAverage: {},
  };
  // Other work on the machine shows in every timing: the 1-minute load average is kept per section.
  const load = (section: string): void => {
    const l = os.loadavg().map((v) => Math.round(v * 100) / 100);
    result.loadAverage[section] = l;
    log(`  (load average ${l.join(' ')} on ${os.cpus().length} cores)`);
  };

  let fleet: Fleet | null = null;
  const templateDir = path.join(workDir, 'template');
  if (only.has('ingest') || only.has('latency') || only.has('fanout')) {
    log(`\nregister: ${settings.sensors} sensors, ${settings.gateways} gateways, ${settings.structures} structures …`);
    fleet = await writeTemplate({ dir: templateDir, sensors: settings.sensors, gateways: settings.gateways, structures: settings.structures, seed: settings.seed, minFirstTriggerMps: 14 });
    result.fleet = { structures: fleet.structures, minFirstTriggerMps: fleet.minFirstTriggerMps, kinds: fleet.kinds, sensors: fleet.sensors.length, gateways: fleet.gateways.length };
    log(`  kinds ${JSON.stringify(fleet.kinds)}, lowest first-level trigger ${fleet.minFirstTriggerMps.toFixed(1)} m/s`);
  }

  // 1. ingest throughput
  if (only.has('ingest') && fleet) {
    log(`\n1. ingest throughput: ${settings.ingestReadings} readings per burst, ${settings.gateways} gateway connections × ${settings.inflight} in flight, ${settings.ingestRepeats} repeat(s)${settings.mosquitto ? '' : ' (Mosquitto not installed or BENCH_MOSQUITTO=0: embedded broker only)'}`);
    const ingest = await runIngest({
      templateDir,
      workDir,
      fleet,
      readings: settings.ingestReadings,
      warmupReadings: 2_000,
      inflight: settings.inflight,
      stepMs: 25,
      seed: settings.seed,
      baseMeanMps: settings.baseMeanMps,
      repeats: settings.ingestRepeats,
      mosquitto: settings.mosquitto,
      serverEnv: serverEnv(),
      log,
    });
    result.ingest = ingest;
    const e = ingest.embedded;
    rows.push({
      what: '1 ingest, embedded broker: server ÷ aedes + counting mqtt.js subscriber',
      measured: `${Math.round(e.serverPerS)} / ${Math.round(e.bareSubscriberPerS)} readings/s; ratio ${e.ratio.toFixed(2)} (${e.ratios.map((r) => r.toFixed(2)).join(', ')})`,
      target: '≥ 0.70',
      verdict: e.ratio >= 0.7 ? 'ok' : 'MISS',
    });
    rows.push({
      what: '  stricter: same server ÷ bare aedes whose hook only counts',
      measured: `${Math.round(e.serverPerS)} / ${Math.round(e.bareHookPerS)} readings/s; ratio ${e.ratioToHook.toFixed(2)} (${e.hookRatios.map((r) => r.toFixed(2)).join(', ')})`,
      // design §6 v2: ≥ 0.5 × the bare broker hook, same publisher, same run.
      target: '≥ 0.50',
      verdict: e.ratioToHook >= 0.5 ? 'ok' : 'MISS',
    });
    rows.push({
      what: '  CPU per reading, server (its main thread) ÷ bare aedes hook (implied ratio)',
      measured: `${e.cpu.serverUs.toFixed(0)} (${e.cpu.serverMainUs.toFixed(0)}) / ${e.cpu.bareUs.toFixed(0)} µs; ${e.cpu.ratio.toFixed(2)}`,
      target: '(info)',
      verdict: 'info',
    });
    if (ingest.mosquitto) {
      const m = ingest.mosquitto;
      rows.push({
        what: '1 ingest, Mosquitto: server ÷ counting mqtt.js subscriber',
        measured: `${Math.round(m.serverPerS)} / ${Math.round(m.barePerS)} readings/s; ratio ${m.ratio.toFixed(2)} (${m.ratios.map((r) => r.toFixed(2)).join(', ')})`,
        target: '≥ 0.70',
        verdict: m.ratio >= 0.7 ? 'ok' : 'MISS',
      });
      rows.push({
        what: '  CPU per reading, server (its main thread) ÷ subscriber (implied ratio)',
        measured: `${m.cpu.serverUs.toFixed(0)} (${m.cpu.serverMainUs.toFixed(0)}) / ${m.cpu.bareUs.toFixed(0)} µs; ${m.cpu.ratio.toFixed(2)}`,
        target: '(info)',
        verdict: 'info',
      });
    } else rows.push({ what: '1 ingest, Mosquitto', measured: 'not run (no mosquitto binary)', target: '≥ 0.70', verdict: 'n/a' });
    load('ingest');
    const breakdown = await runBreakdown({ templateDir, workDir, fleet, readings: 20_000, naturalGroup: 100, largeGroup: 500, seed: settings.seed, baseMeanMps: settings.baseMeanMps });
    result.breakdown = breakdown;
    const commits = breakdown.commitUs.map((c) => `${c.us.toFixed(1)} µs at ${c.perCommit}/commit`).join(', ');
    log(`  in-process, per reading: parse ${breakdown.parseUs.toFixed(1)} µs, watch ${breakdown.takeUs.toFixed(1)} µs (${(100 * breakdown.slowTakeShare).toFixed(1)} % of readings move the site's highest gust and take ${breakdown.slowTakeMeanUs.toFixed(0)} µs re-assessing the structures; the rest ${breakdown.fastTakeMeanUs.toFixed(1)} µs), commit ${commits}`);
    rows.push({
      what: '  in-process µs/reading: parse + watch + commit (1 | 100 | 500 per commit)',
      measured: `${breakdown.parseUs.toFixed(1)} + ${breakdown.takeUs.toFixed(1)} + ${breakdown.commitUs.map((c) => c.us.toFixed(1)).join(' | ')}`,
      target: '(info)',
      verdict: 'info',
    });
    const late = ingest.runs.filter((r) => r.stored).reduce((n, r) => n + (r.stored!.late + r.stored!.noDataEvents), 0);
    if (late > 0) log(`  WARNING: ${late} readings were late or structures lost data during ingest runs: not every reading was assessed live`);
  }

  // 2 and 5. latency and memory
  if (only.has('latency') && fleet) {
    log(`\n2 and 5. level change on the live stream (${settings.latencyChanges} changes, ${settings.backgroundPerS} readings/s background) and resident memory`);
    const memoryFile = path.join(artifacts, 'bench-memory.jsonl');
    if (settings.memoryTrace) fs.rmSync(memoryFile, { force: true });
    const latency = await runLatency({
      templateDir,
      workDir,
      fleet,
      changes: settings.latencyChanges,
      backgroundPerS: settings.backgroundPerS,
      burstReadings: settings.memoryBurst,
      inflight: settings.inflight,
      seed: settings.seed + 7,
      baseMeanMps: settings.baseMeanMps,
      serverEnv: serverEnv(settings.memoryTrace ? { BENCH_MEMORY_FILE: memoryFile } : {}),
      log,
    });
    result.latency = latency;
    load('latency');
    log(`  probe triggers ${latency.probeTriggersMps.map((t) => t.toFixed(2)).join(' / ')} m/s, published ${latency.probeHighMps.toFixed(2)} ↔ ${latency.probeLowMps.toFixed(2)} m/s (other structures' lowest first trigger ${latency.othersMinFirstTriggerMps.toFixed(2)} m/s)`);
    log(`  ${latency.changes} changes timed (${latency.missed} missed): p50 ${ms(latency.p50Ms)} ms, p90 ${ms(latency.p90Ms)} ms, p99 ${ms(latency.p99Ms)} ms, max ${ms(latency.maxMs)} ms (up p99 ${ms(latency.upP99Ms)}, down p99 ${ms(latency.downP99Ms)})`);
    log(`  background: ${latency.backgroundPerS.toFixed(0)} readings/s published (${latency.backgroundSkipped} skipped: a gateway had ${settings.inflight} unacknowledged)`);
    log(`  live stream: ${(latency.stream.bytesPerS / 1024).toFixed(0)} kB/s to one client; events/s ${JSON.stringify(latency.stream.eventsPerS)}`);
    log(`  memory: ${mb(latency.memory.startedRssKb)} after start, max ${mb(latency.memory.latencyPhase.maxRssKb)} during the latency phase, max ${mb(latency.memory.burst.maxRssKb)} during a full-speed burst of ${latency.memory.burst.readings} readings, VmHWM ${mb(latency.memory.hwmKb)}`);
    rows.push({
      what: '2 reading → level change on the live stream',
      measured: `p50 ${ms(latency.p50Ms)} ms, p99 ${ms(latency.p99Ms)} ms (n=${latency.changes}, ${latency.backgroundPerS.toFixed(0)}/s bg)`,
      // design §6 v2: p99 ≤ 20 ms at 200 readings/s background load.
      target: 'p99 ≤ 20 ms',
      verdict: latency.p99Ms <= 20 && latency.missed === 0 ? 'ok' : 'MISS',
    });
    const context = await memoryContext();
    result.memoryContext = context;
    log(`  for comparison: node idle ${mb(context.nodeIdleKb)}, server with an empty register ${mb(context.emptyServerKb)}`);
    // The verdict takes the kernel's peak (VmHWM), which also sees spikes between samples.
    const maxRss = Math.max(latency.memory.latencyPhase.maxRssKb, latency.memory.burst.maxRssKb, latency.memory.hwmKb);
    rows.push({
      what: `5 resident memory (${fleet.sensors.length} sensors, ${fleet.structures} structures, under load)`,
      measured: `peak ${mb(maxRss)} (sampled ${mb(latency.memory.latencyPhase.maxRssKb)} at ${settings.backgroundPerS}/s, ${mb(latency.memory.burst.maxRssKb)} in a burst; VmHWM ${mb(latency.memory.hwmKb)})`,
      target: '≤ 150 MB',
      verdict: maxRss <= 150 * 1024 ? 'ok' : 'MISS',
    });
    rows.push({ what: '  for comparison: node idle / server, empty register', measured: `${mb(context.nodeIdleKb)} / ${mb(context.emptyServerKb)}`, target: '(info)', verdict: 'info' });
  }

  // 7. the live stream's fan-out
  if (only.has('fanout') && fleet) {
    log(`\n7. live stream fan-out: ${settings.fanoutClients} stream clients, ${settings.fanoutPerS} readings/s, ${settings.fanoutPhaseMs / 1000} s per phase`);
    const fan = await runFanout({
      templateDir,
      workDir,
      fleet,
      clients: settings.fanoutClients,
      ratePerS: settings.fanoutPerS,
      phaseMs: settings.fanoutPhaseMs,
      inflight: settings.inflight,
      seed: settings.seed + 11,
      baseMeanMps: settings.baseMeanMps,
      serverEnv: serverEnv(),
      log,
    });
    result.fanout = fan;
    load('fanout');
    const ack = (a: FanoutResult['baseline']): string => `p50 ${ms(a.p50Ms)} ms, p99 ${ms(a.p99Ms)} ms, max ${ms(a.maxMs)} ms (${a.acked} of ${a.published} acknowledged, ${a.skipped} skipped)`;
    log(`  ack with no stream client (baseline, two phases pooled): ${ack(fan.baseline)}`);
    log(`  ack with ${fan.clients} stream clients: ${ack(fan.withClients)}`);
    log(`  per client: ${(fan.bytesPerSPerClient.mean / 1024).toFixed(1)} kB/s mean, ${(fan.bytesPerSPerClient.max / 1024).toFixed(1)} kB/s max; ${fan.clientsOpenAtEnd} of ${fan.clients} still open, ${fan.snapshots} snapshots re-sent; the ${fan.clients} connected and read their snapshots in ${(fan.openingMs / 1000).toFixed(1)} s`);
    rows.push({
      what: `7 stream bytes per client (${fleet.sensors.length} sensors, ${fleet.structures} structures)`,
      measured: `${(fan.bytesPerSPerClient.mean / 1024).toFixed(1)} kB/s mean (max ${(fan.bytesPerSPerClient.max / 1024).toFixed(1)})`,
      target: '≤ 10 kB/s',
      verdict: fan.bytesPerSPerClient.max <= 10 * 1024 ? 'ok' : 'MISS',
    });
    rows.push({
      what: `7 ingest ack p99 with ${fan.clients} stream clients (${settings.fanoutPerS}/s)`,
      measured: `${ms(fan.withClients.p99Ms)} ms (no clients: ${ms(fan.baseline.p99Ms)} ms)`,
      target: 'p99 ≤ 100 ms',
      verdict: fan.withClients.p99Ms <= 100 && fan.clientsOpenAtEnd === fan.clients ? 'ok' : 'MISS',
    });
  }

  // 3 and 4. log queries and storage
  if (only.has('logs')) {
    const f = settings.festival;
    log(`\n3 and 4. log queries and storage: festival of ${f.sensors} sensors × ${f.days} days at ${f.hz} Hz`);
    const festival = await festivalDatabase(path.join(artifacts, 'bench-festival'), f, log);
    result.festival = { readings: festival.readings, generatedSeconds: festival.generatedSeconds, cached: festival.cached };
    log(`  ${festival.readings} readings ${festival.cached ? `(cached in ${path.relative(process.cwd(), festival.file)})` : `generated in ${festival.generatedSeconds?.toFixed(1)} s`}`);
    const queries = timeLogQueries(festival.file, f, settings.queryReps, settings.fullScanReps);
    result.logQueries = queries;
    load('logs');
    for (const q of queries) {
      log(`  ${q.window}: windSeries ${ms(q.indexedMedianMs)} ms median (max ${ms(q.indexedMaxMs)}), ${q.points} points from ${q.rowsScanned} ${q.source === 'minutes' ? 'minute rollups' : 'raw readings'}; full scan ${ms(q.fullScanMedianMs)} ms (${q.speedUp.toFixed(0)}×); with integer buckets ${q.integerBuckets.points} points in ${ms(q.integerBuckets.medianMs)} ms (max ${ms(q.integerBuckets.maxMs)})`);
      rows.push({
        what: `3 log query, ${q.window}`,
        measured: `${ms(q.indexedMedianMs)} ms (max ${ms(q.indexedMaxMs)}), ${q.points} pts; full scan ${ms(q.fullScanMedianMs)} ms`,
        target: '≤ 100 ms, ≤ 2,000 pts',
        verdict: q.indexedMaxMs <= 100 && q.points <= 2_000 ? 'ok' : 'MISS',
      });
    }
    rows.push({
      what: '  same queries, integer bucket division (bench copy of the SQL)',
      measured: `${queries.map((q) => ms(q.integerBuckets.medianMs)).join(' / ')} ms (max ${ms(Math.max(...queries.map((q) => q.integerBuckets.maxMs)))}), ≤ ${Math.max(...queries.map((q) => q.integerBuckets.points))} pts`,
      target: '(info)',
      verdict: 'info',
    });
    const storage = measureStorage(festival.file);
    result.storage = storage;
    for (const t of storage.tables.slice(0, 4)) log(`  dbstat ${t.name}: ${(t.bytes / 2 ** 20).toFixed(1)} MiB in ${t.pages} pages${t.rows !== null ? `, ${t.rows} rows` : ''}`);
    rows.push({
      what: '4 storage per stored reading (file + WAL after checkpoint)',
      measured: `${storage.bytesPerReading.toFixed(1)} B (readings table ${storage.readingsTableBytesPerReading?.toFixed(1) ?? '?'} B)`,
      // design §6 v2: ≤ 30 bytes per stored reading on disk.
      target: '≤ 30 B',
      verdict: storage.bytesPerReading <= 30 ? 'ok' : 'MISS',
    });
  }

  // 6. front end
  if (only.has('frontend')) {
    const fe = measureFrontend();
    result.frontend = fe;
    rows.push({
      what: '6 front-end JS, gzipped (web/dist/assets/*.js)',
      measured: fe.built ? `${(fe.totalGzipBytes / 1024).toFixed(1)} kB gz (${(fe.totalBytes / 1024).toFixed(0)} kB raw, ${fe.files.length} files)` : 'not built',
      target: '≤ 150 kB',
      verdict: fe.built ? (fe.totalGzipBytes <= 150 * 1024 ? 'ok' : 'MISS') : 'n/a',
    });
  }

  result.seconds = (performance.now() - started) / 1000;
  const w = [Math.max(...rows.map((r) => r.what.length), 4), Math.max(...rows.map((r) => r.measured.length), 8), Math.max(...rows.map((r) => r.target.length), 6)];
  const line = (a: string, b: string, c: string, d: string): string => `${a.padEnd(w[0]!)} │ ${b.padEnd(w[1]!)} │ ${c.padEnd(w[2]!)} │ ${d}`;
  log('');
  log(line('what', 'measured', 'target', ''));
  log(`${'─'.repeat(w[0]!)}─┼─${'─'.repeat(w[1]!)}─┼─${'─'.repeat(w[2]!)}─┼─────`);
  for (const r of rows) log(line(r.what, r.measured, r.target, r.verdict));
  log(`\n${result.seconds.toFixed(0)} s; JSON in ${path.relative(process.cwd(), jsonFile)}${settings.profile ? `; CPU profiles in ${path.relative(process.cwd(), profileDir)}` : ''}`);
  fs.writeFileSync(jsonFile, JSON.stringify(result, null, 2));
  if (env.BENCH_KEEP !== '1') fs.rmSync(workDir, { recursive: true, force: true });
}

process.on('SIGINT', () => {
  killTracked();
  process.exit(130);
});
main().then(
  () => process.exit(0),
  (err: unknown) => {
    console.error(err instanceof Error ? (err.stack ?? err.message) : String(err));
    killTracked();
    process.exit(1);
  },
);
