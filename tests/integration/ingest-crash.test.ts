/**
 * Nothing the broker handed over is lost when the server dies (design.md 5, durability; issue
 * "redelivery after a subscriber kill loses nothing and duplicates nothing"). The server runs as
 * a child process and is killed with SIGKILL mid-stream, then started again on the same data
 * folder; the publisher keeps publishing at QoS 1 throughout.
 *
 * - Embedded broker: the server is the broker; the gateway's unacknowledged publishes are resent
 *   by the gateway after it reconnects to the restarted server.
 * - Mosquitto (when the `mosquitto` binary is installed): the server is a persistent-session
 *   subscriber; the broker keeps what it had not been acknowledged and delivers it again.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, describe, expect, it } from 'vitest';
import { ApiClient, waitFor } from '../helpers/testServer.ts';
import { spawnServer, type ServerProcess } from '../helpers/serverProcess.ts';
import { freePort, waitForListener } from '../helpers/ports.ts';

const admin = { ADMIN_USERNAME: 'crash-admin', ADMIN_PASSWORD: 'crash-admin-password' };
const cleanups: Array<() => Promise<void> | void> = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});


function countStored(dataDir: string, sql = 'SELECT COUNT(*) AS n FROM readings'): number {
  const db = new Database(path.join(dataDir, 'holdfast.sqlite'), { readonly: true, fileMustExist: true });
  try {
    return (db.prepare(sql).get() as { n: number }).n;
  } finally {
    db.close();
  }
}

async function registerSensor(httpPort: number, withGateway: boolean): Promise<string | null> {
  const api = new ApiClient(`http://127.0.0.1:${httpPort}`);
  expect((await api.signIn(admin.ADMIN_USERNAME, admin.ADMIN_PASSWORD)).status).toBe(200);
  expect((await api.json('POST', '/api/sensors', { key: 'crash-mast', name: 'Crash test mast', heightM: 10 })).status).toBe(201);
  if (!withGateway) return null;
  const gw = await api.json('POST', '/api/gateways', { name: 'Crash gateway', username: 'crash-gw', sensorKeys: ['crash-mast'] });
  expect(gw.status).toBe(201);
  return gw.body.password as string;
}

/**
 * Publishes `total` readings at QoS 1, `inFlight` at a time, and calls `onProgress` with how many
 * were acknowledged; resolves when every one has been acknowledged.
 */
async function publishAll(client: MqttClient, total: number, t0: number, onProgress: (acked: number) => Promise<void>): Promise<void> {
  let acked = 0;
  let next = 0;
  const inFlight = 20;
  await new Promise<void>((resolve, reject) => {
    const sendOne = (): void => {
      if (next >= total) return;
      const i = next++;
      client.publish('wind/crash-mast/reading', JSON.stringify({ ts: t0 + i * 250, speed: 4 + (i % 40) / 10 }), { qos: 1 }, (err) => {
        if (err) return reject(err);
        acked++;
        void onProgress(acked).then(() => {
          if (acked === total) resolve();
          else sendOne();
        }, reject);
      });
    };
    for (let k = 0; k < inFlight; k++) sendOne();
  });
}

describe('a server killed with SIGKILL mid-stream', () => {
  it('loses nothing and duplicates nothing with the embedded broker (killed twice)', async () => {
    const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-crash-'));
    const mqttPort = await freePort();
    const env = { ...admin, DATA_DIR: dataDir, MQTT_PORT: String(mqttPort) };
    let server: ServerProcess = await spawnServer(env);
    cleanups.push(async () => {
      await server.kill();
      fs.rmSync(dataDir, { recursive: true, force: true });
    });
    const password = (await registerSensor(server.httpPort, true))!;
    const client = mqtt.connect(`mqtt://127.0.0.1:${mqttPort}`, { username: 'crash-gw', password, clientId: 'crash-gw-1', reconnectPeriod: 100 });
    cleanups.push(() => void client.end(true));
    await new Promise((r) => client.once('connect', r));

    const total = 3_000;
    const killAt = [800, 1_900];
    let restarting: Promise<void> | null = null;
    await publishAll(client, total, Date.now() - 20 * 60_000, async (acked) => {
      if (killAt.length > 0 && acked >= killAt[0]! && !restarting) {
        killAt.shift();
        restarting = (async () => {
          await server.kill('SIGKILL');
          server = await spawnServer(env);
          restarting = null;
        })();
      }
    });
    await (restarting ?? Promise.resolve());
    // A last kill right after the stream (what memory held of the newest minute is lost), then a
    // start (which recomputes it from the raw readings) and a clean stop.
    await server.kill('SIGKILL');
    server = await spawnServer(env);
    await server.kill('SIGTERM');
    expect(killAt, 'both kills happened mid-stream').toEqual([]);
    expect(countStored(dataDir)).toBe(total);
    // The per-minute rollups count every stored reading once.
    expect(countStored(dataDir, 'SELECT SUM(sample_count) AS n FROM wind_minutes')).toBe(total);
  }, 60_000);

  const mosquitto = (() => {
    try {
      execFileSync('which', ['mosquitto'], { stdio: 'ignore' });
      return true;
    } catch {
      return false;
    }
  })();

  it.runIf(mosquitto)('loses nothing and duplicates nothing with Mosquitto as the broker (persistent session, MQTT 5 and 3.1.1)', async () => {
    for (const protocol of ['5', '4']) {
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-mosq-'));
      const port = await freePort();
      // Our own broker: an unlimited queue, as the README tells operators (the default of 1000 drops readings).
      fs.writeFileSync(path.join(dir, 'mosquitto.conf'), `listener ${port} 127.0.0.1\nallow_anonymous true\nmax_queued_messages 0\npersistence false\n`);
      const broker: ChildProcess = spawn('mosquitto', ['-c', path.join(dir, 'mosquitto.conf')], { stdio: 'ignore' });
      cleanups.push(() => void broker.kill('SIGKILL'));
      await waitForListener(port, 'mosquitto listening');
      const env = { ...admin, DATA_DIR: dir, MQTT_URL: `mqtt://127.0.0.1:${port}`, MQTT_PROTOCOL_VERSION: protocol, MQTT_CLIENT_ID: `holdfast-crash-${protocol}` };
      let server = await spawnServer(env);
      cleanups.push(async () => {
        await server.kill();
        fs.rmSync(dir, { recursive: true, force: true });
      });
      await registerSensor(server.httpPort, false);
      // Wait until the server's subscription is in place (health says connected).
      await waitFor(async () => {
        const res = await fetch(`http://127.0.0.1:${server.httpPort}/api/health`);
        return ((await res.json()) as { broker: { state: string } }).broker.state === 'connected';
      }, 10_000, 'server connected to mosquitto');

      const publisher = mqtt.connect(`mqtt://127.0.0.1:${port}`, { clientId: `crash-pub-${protocol}`, reconnectPeriod: 100 });
      cleanups.push(() => void publisher.end(true));
      await new Promise((r) => publisher.once('connect', r));
      const total = 2_000;
      let killed = false;
      let restarted: Promise<void> | null = null;
      await publishAll(publisher, total, Date.now() - 20 * 60_000, async (acked) => {
        if (!killed && acked >= 700) {
          killed = true;
          restarted = (async () => {
            await server.kill('SIGKILL');
            // Readings keep arriving at the broker while the server is down.
            await new Promise((r) => setTimeout(r, 300));
            server = await spawnServer(env);
          })();
        }
      });
      await restarted;
      expect(killed, 'the kill happened mid-stream').toBe(true);
      await waitFor(() => countStored(dir) >= total, 20_000, `all ${total} readings stored (MQTT ${protocol === '5' ? '5' : '3.1.1'})`);
      await new Promise((r) => setTimeout(r, 300));
      expect(countStored(dir)).toBe(total);
      await server.kill('SIGTERM');
      await publisher.endAsync();
    }
  }, 90_000);
});

describe('after a SIGKILL the restarted server', () => {
  it('rebuilds each structure’s level and the open alerts from the log, and its live stream works again', async () => {
    const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-rebuild-'));
    const mqttPort = await freePort();
    const env = { ...admin, DATA_DIR: dataDir, MQTT_PORT: String(mqttPort) };
    let server = await spawnServer(env);
    cleanups.push(async () => {
      await server.kill();
      fs.rmSync(dataDir, { recursive: true, force: true });
    });
    const password = (await registerSensor(server.httpPort, true))!;
    let api = new ApiClient(`http://127.0.0.1:${server.httpPort}`);
    await api.signIn(admin.ADMIN_USERNAME, admin.ADMIN_PASSWORD);
    const created = await api.json('POST', '/api/structures', {
      record: { kind: 'custom', name: 'Rebuild board', baseDepthM: 2, frictionCoefficient: 0.4, faces: [{ areaM2: 10, centroidHeightM: 2, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 3000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80' },
    });
    const id = created.body.structure.id as number;
    const triggers = created.body.structure.live.triggerGustsMps as number[];
    const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, { username: 'crash-gw', password, reconnectPeriod: 0 });
    const gust = triggers[1]! + 0.3;
    await client.publishAsync('wind/crash-mast/reading', JSON.stringify({ ts: Date.now(), speed: gust / 1.5, gust }), { qos: 1 });
    await client.endAsync();
    const before = await waitFor(async () => {
      const live = (await api.json('GET', '/api/live')).body;
      const s = live.structures.find((x: any) => x.id === id);
      return s?.level === 2 ? live : null;
    }, 5_000, 'level 2 before the kill');
    const alertId = before.alerts.find((a: any) => a.structureId === id && a.level === 2).id;

    await server.kill('SIGKILL');
    server = await spawnServer(env);
    api = new ApiClient(`http://127.0.0.1:${server.httpPort}`);
    await api.signIn(admin.ADMIN_USERNAME, admin.ADMIN_PASSWORD);
    const after = (await api.json('GET', '/api/live')).body;
    const s = after.structures.find((x: any) => x.id === id);
    // The level holds (a restart never makes a structure look calmer) and shows no data until the sensor reports.
    expect(s).toMatchObject({ level: 2, levelLabel: 'Prepare', noData: true });
    expect(after.alerts.map((a: any) => a.id)).toContain(alertId);

    const res = await api.request('GET', '/api/stream');
    const reader = res.body!.getReader();
    let text = '';
    while (!text.includes('event: snapshot')) text += new TextDecoder().decode((await reader.read()).value);
    await reader.cancel();
    expect(text).toContain(`"id":${id}`);
    // Acknowledging after the restart works, and new alerts do not reuse the old one's id.
    expect((await api.json('POST', `/api/alerts/${alertId}/acknowledge`, { note: 'after restart' })).status).toBe(200);
    await server.kill('SIGTERM');
  }, 60_000);
});
