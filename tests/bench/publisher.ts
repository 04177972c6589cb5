/**
 * The benchmarks' publisher, run as a child process (`fork`, IPC) so it has its own core and the
 * process under test is alone in its own: several gateway connections, each publishing for its
 * own sensors at QoS 1 with a bounded number of messages awaiting their PUBACK.
 *
 * Readings come from the seeded wind simulator (server/demo/windSimulator.ts) as raw samples
 * `{ts, speed, dir}` — the commonest gateway payload.
 *
 * Modes:
 * - `burst`: `count` readings, prepared before the clock starts, published as fast as the
 *   in-flight window allows. Timestamps run from `t0Ms` in steps of `stepMs` per sensor, so
 *   every reading has its own (sensor, time), arrives in order, is at most a minute old at
 *   receipt (live, so it is assessed) and no sensor sends faster than its wind state's raw ring
 *   holds (sample-rate check).
 * - `rate`: `ratePerS` readings a second, stamped with the time of publishing, for `durationMs`.
 *
 * Every loop is bounded by a count and a deadline.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { performance } from 'node:perf_hooks';
import { WindSimulator } from '../../server/demo/windSimulator.ts';
import { wallMs } from './common.ts';

export interface PublisherConnection {
  clientId: string;
  username?: string;
  password?: string;
  sensorKeys: string[];
}

export interface SensorSpec {
  key: string;
  heightM: number;
}

export type PublisherCommand =
  | { cmd: 'connect'; url: string; connections: PublisherConnection[]; sensors: SensorSpec[]; topicPrefix: string; seed: number; baseMeanMps: number }
  | { cmd: 'burst'; count: number; inflight: number; t0Ms: number; stepMs: number; deadlineMs: number }
  | { cmd: 'rate'; ratePerS: number; durationMs: number; inflight: number }
  /** Ends a running `rate` early (it then replies `rate-done`). */
  | { cmd: 'stop' }
  | { cmd: 'close' };

export type PublisherReply =
  | { kind: 'connected'; atMs: number }
  | { kind: 'burst-done'; startedAtMs: number; finishedAtMs: number; published: number; acked: number; errors: number; timedOut: boolean }
  /** `ackMs`: each acknowledged publish's time from publish to PUBACK, ms (publish order). */
  | { kind: 'rate-done'; published: number; acked: number; errors: number; skipped: number; ackMs: number[] }
  | { kind: 'closed' }
  | { kind: 'error'; message: string };

interface Conn {
  client: MqttClient;
  keys: Set<string>;
}

let conns: Conn[] = [];
let sensors: SensorSpec[] = [];
let prefix = 'wind';
let simulator: WindSimulator | null = null;
let simSeed = 1;
let simMean = 5;
let stopRequested = false;

function send(reply: PublisherReply): void {
  process.send?.(reply);
}

function newSimulator(startMs: number): WindSimulator {
  return new WindSimulator({ seed: simSeed, startMs, baseMeanMps: simMean, dailySwingMps: 0.5, spells: [], sensors, baseDirDeg: 240 });
}

async function connect(c: Extract<PublisherCommand, { cmd: 'connect' }>): Promise<void> {
  sensors = c.sensors;
  prefix = c.topicPrefix;
  simSeed = c.seed;
  simMean = c.baseMeanMps;
  conns = await Promise.all(
    c.connections.map(
      (spec) =>
        new Promise<Conn>((resolve, reject) => {
          const client = mqtt.connect(c.url, {
            clientId: spec.clientId,
            ...(spec.username ? { username: spec.username } : {}),
            ...(spec.password ? { password: spec.password } : {}),
            reconnectPeriod: 0,
            connectTimeout: 10_000,
            protocolVersion: 4,
          });
          client.once('connect', () => resolve({ client, keys: new Set(spec.sensorKeys) }));
          client.once('error', (err) => reject(err));
        }),
    ),
  );
  send({ kind: 'connected', atMs: wallMs() });
}

/** Publishes each connection's queue with at most `inflight` awaiting PUBACK; resolves when all are acknowledged or the deadline passes. */
function publishQueues(queues: Array<Array<{ topic: string; payload: string }>>, inflight: number, deadlineMs: number): Promise<{ published: number; acked: number; errors: number; timedOut: boolean }> {
  let published = 0;
  let acked = 0;
  let errors = 0;
  const total = queues.reduce((n, q) => n + q.length, 0);
  return new Promise((resolve) => {
    let finished = false;
    const finish = (timedOut: boolean): void => {
      if (finished) return;
      finished = true;
      clearTimeout(timer);
      resolve({ published, acked, errors, timedOut });
    };
    const timer = setTimeout(() => finish(true), Math.max(0, deadlineMs - wallMs()));
    if (total === 0) return finish(false);
    queues.forEach((queue, ci) => {
      const client = conns[ci]!.client;
      let next = 0;
      const sendOne = (): void => {
        if (finished || next >= queue.length) return;
        const m = queue[next++]!;
        published++;
        client.publish(m.topic, m.payload, { qos: 1 }, (err) => {
          if (err) errors++;
          else acked++;
          if (acked + errors === total) finish(false);
          else sendOne();
        });
      };
      for (let k = 0; k < inflight; k++) sendOne();
    });
  });
}

async function burst(c: Extract<PublisherCommand, { cmd: 'burst' }>): Promise<void> {
  // Prepared before the clock starts: the publisher's own work is the same for every subscriber.
  const sim = newSimulator(c.t0Ms);
  const queues: Array<Array<{ topic: string; payload: string }>> = conns.map(() => []);
  const connOfKey = new Map<string, number>();
  conns.forEach((conn, i) => conn.keys.forEach((k) => connOfKey.set(k, i)));
  const rounds = Math.ceil(c.count / sensors.length);
  let made = 0;
  for (let r = 0; r < rounds && made < c.count; r++) {
    const ts = c.t0Ms + r * c.stepMs;
    for (const s of sim.sample(ts)) {
      if (made >= c.count) break;
      const ci = connOfKey.get(s.key);
      if (ci === undefined) continue;
      queues[ci]!.push({ topic: `${prefix}/${s.key}/reading`, payload: `{"ts":${ts},"speed":${s.speedMps},"dir":${s.dirDeg}}` });
      made++;
    }
  }
  const startedAtMs = wallMs();
  const result = await publishQueues(queues, c.inflight, c.deadlineMs);
  send({ kind: 'burst-done', startedAtMs, finishedAtMs: wallMs(), ...result });
}

async function rate(c: Extract<PublisherCommand, { cmd: 'rate' }>): Promise<void> {
  if (!simulator) simulator = newSimulator(Date.now());
  const sim = simulator;
  const connOfKey = new Map<string, Conn>();
  for (const conn of conns) for (const k of conn.keys) connOfKey.set(k, conn);
  const pendingPerConn = new Map<Conn, number>();
  const lastTs = new Map<string, number>();
  let published = 0;
  let acked = 0;
  let errors = 0;
  let skipped = 0;
  const ackMs: number[] = [];
  const start = Date.now();
  const tickMs = 10;
  const endAt = start + c.durationMs;
  let due = 0;
  let samples: Array<{ key: string; speedMps: number; dirDeg: number }> = [];
  let cursor = 0;
  stopRequested = false;
  await new Promise<void>((resolve) => {
    const timer = setInterval(() => {
      const now = Date.now();
      if (now >= endAt || stopRequested) {
        clearInterval(timer);
        resolve();
        return;
      }
      // Readings due by now at the chosen rate (catch up after a late timer, at most 1 s worth).
      const target = Math.floor(((now - start) / 1000) * c.ratePerS);
      let toSend = Math.min(target - due, c.ratePerS);
      due = target;
      for (; toSend > 0; toSend--) {
        if (cursor >= samples.length) {
          samples = sim.sample(now);
          cursor = 0;
        }
        const s = samples[cursor++]!;
        const conn = connOfKey.get(s.key);
        if (!conn) continue;
        const pending = pendingPerConn.get(conn) ?? 0;
        if (pending >= c.inflight) {
          skipped++;
          continue;
        }
        const ts = Math.max(now, (lastTs.get(s.key) ?? 0) + 1);
        lastTs.set(s.key, ts);
        pendingPerConn.set(conn, pending + 1);
        published++;
        const sentAt = performance.now();
        conn.client.publish(`${prefix}/${s.key}/reading`, `{"ts":${ts},"speed":${s.speedMps},"dir":${s.dirDeg}}`, { qos: 1 }, (err) => {
          pendingPerConn.set(conn, (pendingPerConn.get(conn) ?? 1) - 1);
          if (err) errors++;
          else {
            acked++;
            ackMs.push(performance.now() - sentAt);
          }
        });
      }
    }, tickMs);
  });
  // Wait (at most 5 s) for the last PUBACKs, so the slowest are not left out of the figures.
  const settleBy = Date.now() + 5_000;
  while (acked + errors < published && Date.now() < settleBy) await new Promise((r) => setTimeout(r, 20));
  send({ kind: 'rate-done', published, acked, errors, skipped, ackMs });
}

async function close(): Promise<void> {
  await Promise.all(conns.map((c) => c.client.endAsync(true).catch(() => undefined)));
  conns = [];
  send({ kind: 'closed' });
}

process.on('message', (message: PublisherCommand) => {
  const run = async (): Promise<void> => {
    switch (message.cmd) {
      case 'connect':
        return connect(message);
      case 'burst':
        return burst(message);
      case 'rate':
        return rate(message);
      case 'stop':
        stopRequested = true;
        return;
      case 'close':
        await close();
        process.exit(0);
    }
  };
  run().catch((err: unknown) => send({ kind: 'error', message: err instanceof Error ? err.message : String(err) }));
});
process.on('disconnect', () => process.exit(0));
