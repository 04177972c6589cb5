/**
 * Soak: runs the server (compiled, as `npm start` does) as its own process under a steady load
 * for a while and reports how its memory grows. `npm run soak` (SOAK_MINUTES, default 10;
 * SOAK_RATE readings/s, default 100; SOAK_SENSORS, default 20; SOAK_STRUCTURES, default 200).
 * Prints a line per sample and a summary; exits 0 (it reports, it does not judge). Loopback only;
 * bounded in time.
 *
 * The resident set saw-tooths as V8 grows and shrinks its heap, so first-versus-last says little;
 * the server is also started with heapProbe.mjs, which forces a full collection every 30 s and
 * records the live heap, and the summary fits a straight line (least squares) through those
 * samples after the first two minutes: the slope is the growth per hour.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import mqtt from 'mqtt';
import { ApiClient } from '../helpers/testServer.ts';
import { spawnServer } from '../helpers/serverProcess.ts';
import { freePort } from '../helpers/ports.ts';
import { WindSimulator } from '../../server/demo/windSimulator.ts';

const minutes = Number(process.env.SOAK_MINUTES ?? 10);
const rate = Number(process.env.SOAK_RATE ?? 100);
const sensorCount = Number(process.env.SOAK_SENSORS ?? 20);
const structureCount = Number(process.env.SOAK_STRUCTURES ?? 200);

function rssMb(pid: number): number {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  return Number(/VmRSS:\s+(\d+)/.exec(status)![1]) / 1024;
}


async function main(): Promise<void> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-soak-'));
  const mqttPort = await freePort();
  const probeFile = path.join(dataDir, 'heap-probe.jsonl');
  const server = await spawnServer(
    {
      DATA_DIR: dataDir,
      MQTT_PORT: String(mqttPort),
      ADMIN_USERNAME: 'soak-admin',
      ADMIN_PASSWORD: 'soak-admin-password',
      NODE_OPTIONS: `--expose-gc --import ${path.resolve('tests/soak/heapProbe.mjs')}`,
      HEAP_PROBE_FILE: probeFile,
    },
    60_000,
    { compiled: true },
  );
  const api = new ApiClient(`http://127.0.0.1:${server.httpPort}`);
  await api.signIn('soak-admin', 'soak-admin-password');
  const keys = Array.from({ length: sensorCount }, (_, i) => `soak-${i}`);
  for (const key of keys) await api.json('POST', '/api/sensors', { key, name: key, heightM: 4 + (keys.indexOf(key) % 8) });
  const gw = await api.json('POST', '/api/gateways', { name: 'Soak gateway', username: 'soak-gw', sensorKeys: keys });
  for (let i = 0; i < structureCount; i++) {
    await api.json('POST', '/api/structures', {
      record: { kind: 'banner', name: `Soak banner ${i}`, widthM: 6 + (i % 10), heightM: 2, clearanceM: 0.1, solidity: 0.5 + (i % 5) / 10, feet: 4, ballastPerFootKg: 60 + (i % 7) * 20, footDepthM: 1.2, selfWeightKg: 120 },
    });
  }
  // A few phones on the live stream.
  const streams = await Promise.all(Array.from({ length: 5 }, () => api.request('GET', '/api/stream')));
  const drains = streams.map((res) => {
    const reader = res.body!.getReader();
    return (async () => {
      for (;;) if ((await reader.read()).done) return;
    })().catch(() => undefined); // the server going away at the end ends the stream
  });

  const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, { username: 'soak-gw', password: gw.body.password });
  const sim = new WindSimulator({ seed: 7, startMs: Date.now(), baseMeanMps: 7, dailySwingMps: 2, baseDirDeg: 250, sensors: keys.map((key, i) => ({ key, heightM: 4 + (i % 8) })), spells: [{ startMs: 60_000, rampMs: 120_000, holdMs: 180_000, peakMeanMps: 14 }] });
  const endAt = Date.now() + minutes * 60_000;
  const intervalMs = Math.max(10, Math.round((1000 * sensorCount) / rate));
  let published = 0;
  const samples: Array<{ atS: number; rssMb: number }> = [];
  const startedAt = Date.now();
  const sample = () => {
    const entry = { atS: Math.round((Date.now() - startedAt) / 1000), rssMb: Math.round(rssMb(server.proc.pid!) * 10) / 10 };
    samples.push(entry);
    console.log(`t=${String(entry.atS).padStart(5)} s  rss=${entry.rssMb.toFixed(1)} MB  published=${published}`);
  };
  sample();
  const sampler = setInterval(sample, 30_000);
  while (Date.now() < endAt) {
    const batch = sim.sample(Date.now());
    await Promise.all(batch.map((s) => client.publishAsync(`wind/${s.key}/reading`, JSON.stringify({ ts: s.tsMs, speed: s.speedMps, dir: s.dirDeg }), { qos: 1 })));
    published += batch.length;
    await new Promise((r) => setTimeout(r, intervalMs));
  }
  clearInterval(sampler);
  sample();
  await client.endAsync();
  await server.kill('SIGTERM');
  void drains;
  const probes = fs.existsSync(probeFile)
    ? fs
        .readFileSync(probeFile, 'utf8')
        .trim()
        .split('\n')
        .map((line) => JSON.parse(line) as { atMs: number; rss: number; heapUsed: number })
    : [];
  console.log(`\nsoak: ${minutes} min, ${published} readings (${(published / (minutes * 60)).toFixed(0)}/s), ${sensorCount} sensors, ${structureCount} structures, 5 stream clients`);
  const rssValues = samples.map((s) => s.rssMb);
  console.log(`resident memory: ${Math.min(...rssValues).toFixed(1)} to ${Math.max(...rssValues).toFixed(1)} MB over the run; first sample ${samples[0]!.rssMb} MB, last ${samples.at(-1)!.rssMb} MB`);
  const settled = probes.filter((p) => p.atMs - startedAt >= 120_000);
  if (settled.length >= 3) {
    const mb = (b: number): number => b / 2 ** 20;
    const slope = (values: number[]): number => leastSquaresSlope(settled.map((p) => (p.atMs - startedAt) / 3_600_000), values);
    const heap = settled.map((p) => mb(p.heapUsed));
    console.log(
      `live heap after a full collection (${settled.length} samples from minute 2 on): ${heap[0]!.toFixed(1)} → ${heap.at(-1)!.toFixed(1)} MB, trend ${slope(heap).toFixed(1)} MB/h; resident set at those moments ${mb(settled[0]!.rss).toFixed(1)} → ${mb(settled.at(-1)!.rss).toFixed(1)} MB, trend ${slope(settled.map((p) => mb(p.rss))).toFixed(1)} MB/h`,
    );
  } else console.log('live heap: too few probe samples after minute 2 for a trend (run longer: SOAK_MINUTES)');
  fs.rmSync(dataDir, { recursive: true, force: true });
  process.exit(0);
}

/** Slope of the least-squares line through (x, y). */
function leastSquaresSlope(x: number[], y: number[]): number {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i]! - mx) * (y[i]! - my);
    sxx += (x[i]! - mx) ** 2;
  }
  return sxx === 0 ? 0 : sxy / sxx;
}

void main();
