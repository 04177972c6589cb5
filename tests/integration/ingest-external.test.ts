/**
 * Ingest from an external broker (design.md 3 and 5): Mosquitto at MQTT_TEST_URL (set by
 * .ci/run), and a Mosquitto of the test's own that is restarted mid-stream.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import mqtt from 'mqtt';
import { afterAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';
import { freePort, waitForListener } from '../helpers/ports.ts';

const testUrl = process.env.MQTT_TEST_URL;
const hasMosquitto = (() => {
  try {
    execFileSync('which', ['mosquitto'], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
})();
if (!testUrl) console.warn('MQTT_TEST_URL is not set: the test against the running Mosquitto is skipped (.ci/run sets it)');

const cleanups: Array<() => Promise<void> | void> = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

function stored(ts: TestServer, key: string): number {
  return (ts.server.db.$client.prepare('SELECT COUNT(*) AS n FROM readings r JOIN sensors s ON s.id = r.sensor_id WHERE s.key = ?').get(key) as { n: number }).n;
}

async function serverOn(url: string, clientId: string, key: string): Promise<TestServer> {
  const ts = await startTestServer({ MQTT_URL: url, MQTT_CLIENT_ID: clientId, MQTT_TOPIC_PREFIX: `holdfast-test-${process.pid}` });
  cleanups.push(() => ts.stop());
  const api = new ApiClient(ts.baseUrl);
  await api.signIn(adminUsername, adminPassword);
  expect((await api.json('POST', '/api/sensors', { key, name: 'Test mast', heightM: 10, unit: 'kn' })).status).toBe(201);
  await waitFor(async () => (await api.json('GET', '/api/health')).body.broker.state === 'connected', 10_000, 'connected to the broker');
  // The subscription follows the CONNACK; give it a moment.
  await new Promise((r) => setTimeout(r, 200));
  return ts;
}

describe('an external broker', () => {
  it.runIf(Boolean(testUrl))('stores every reading published through Mosquitto at MQTT_TEST_URL, in the sensor’s unit, and rejects garbage', async () => {
    const ts = await serverOn(testUrl!, `holdfast-test-${process.pid}`, 'ext-mast');
    const prefix = `holdfast-test-${process.pid}`;
    const publisher = await mqtt.connectAsync(testUrl!, { clientId: `holdfast-pub-${process.pid}` });
    const t0 = Date.now() - 60_000;
    const n = 300;
    for (let i = 0; i < n; i++) await publisher.publishAsync(`${prefix}/ext-mast/reading`, JSON.stringify({ ts: t0 + i * 100, speed: 10 }), { qos: 1 });
    await publisher.publishAsync(`${prefix}/ext-mast/reading`, 'not json at all', { qos: 1 });
    await waitFor(() => stored(ts, 'ext-mast') >= n, 10_000, `${n} readings stored`);
    expect(stored(ts, 'ext-mast')).toBe(n);
    // 10 kn = 10 × 1852/3600 m/s = 5.1444 m/s (international knot), stored in cm/s.
    const row = ts.server.db.$client.prepare('SELECT speed_cmps AS s FROM readings LIMIT 1').get() as { s: number };
    expect(row.s).toBe(514);
    await waitFor(() => ts.server.pipeline.counters.rejectedMessages >= 1, 5_000, 'garbage counted');
    await publisher.endAsync();
  });

  it.runIf(hasMosquitto)('reconnects by itself after the broker restarts mid-stream, and loses nothing', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-broker-'));
    // Mosquitto started as root drops to its own user: it must be able to write its state here.
    fs.chmodSync(dir, 0o777);
    cleanups.push(() => fs.rmSync(dir, { recursive: true, force: true }));
    const port = await freePort();
    // Persistence on, queue unlimited: what the README asks of operators.
    fs.writeFileSync(
      path.join(dir, 'mosquitto.conf'),
      `listener ${port} 127.0.0.1\nallow_anonymous true\nmax_queued_messages 0\npersistence true\npersistence_location ${dir}/\n`,
    );
    let broker: ChildProcess = spawn('mosquitto', ['-c', path.join(dir, 'mosquitto.conf')], { stdio: 'ignore' });
    cleanups.push(() => void broker.kill('SIGKILL'));
    const listening = () => waitForListener(port, 'broker listening');
    await listening();
    const ts = await serverOn(`mqtt://127.0.0.1:${port}`, 'holdfast-restart-test', 'restart-mast');
    const prefix = `holdfast-test-${process.pid}`;
    const publisher = mqtt.connect(`mqtt://127.0.0.1:${port}`, { clientId: 'restart-pub', clean: false, reconnectPeriod: 100 });
    cleanups.push(() => void publisher.end(true));
    await new Promise((r) => publisher.once('connect', r));
    const t0 = Date.now() - 10 * 60_000;
    const n = 1_000;
    const acks: Array<Promise<unknown>> = [];
    for (let i = 0; i < n; i++) {
      acks.push(publisher.publishAsync(`${prefix}/restart-mast/reading`, JSON.stringify({ ts: t0 + i * 200, speed: 5 }), { qos: 1 }));
      if (i === 400) {
        // A graceful restart (SIGTERM saves the broker's state) in the middle of the stream.
        await new Promise<void>((resolve) => {
          broker.once('exit', () => resolve());
          broker.kill('SIGTERM');
        });
        await waitFor(async () => ts.server.pipeline && ((await fetch(`${ts.baseUrl}/api/health`).then((r) => r.json())) as any).broker.state !== 'connected', 5_000, 'server notices the broker is gone');
        const health = await fetch(`${ts.baseUrl}/api/health`);
        expect(health.status).toBe(503);
        broker = spawn('mosquitto', ['-c', path.join(dir, 'mosquitto.conf')], { stdio: 'ignore' });
        await listening();
      }
    }
    await Promise.all(acks);
    await waitFor(() => stored(ts, 'restart-mast') >= n, 20_000, `all ${n} stored after the restart`);
    expect(stored(ts, 'restart-mast')).toBe(n);
    const health = (await (await fetch(`${ts.baseUrl}/api/health`)).json()) as any;
    expect(health.broker.state).toBe('connected');
    expect(health.broker.reconnects).toBeGreaterThanOrEqual(1);
    await publisher.endAsync();
  }, 60_000);
});
