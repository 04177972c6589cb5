/**
 * `npm run demo`: the normal server with the invented demo site (see demoSite.ts). On first start
 * it registers the site, sensors, a gateway, demo sign-ins and the structures, and writes a past
 * windy day into the log by running the real watch over simulated readings in simulated time;
 * then simulated anemometers publish over MQTT through the demo gateway like real ones, with a
 * scripted windy spell a few minutes after start and again every 40 minutes.
 *
 * The plan's actions (design §2.5): on the past day and live, a simulated crew member marks each
 * action that moves a structure ("Prepare: lower the LED screen") done through the watch, as the
 * route does, a minute or two after its alert (demoCrew.ts), and the competent person puts the
 * structure back once the wind has dropped. On the past day the first fence action comes late,
 * so the log shows it signalled again as overdue before it was done.
 */
import mqtt, { type MqttClient } from 'mqtt';
import type { Config } from '../config.ts';
import { LiveHub } from '../live/liveHub.ts';
import type { Logger } from '../log.ts';
import { createGateway } from '../register/gateways.ts';
import { createSensor } from '../register/sensors.ts';
import { getSite, updateSite } from '../register/site.ts';
import { createStructure, listStructures } from '../register/structures.ts';
import { readingTopic } from '../ingest/topic.ts';
import { siteSettings, startServer, type RunningServer } from '../runtime.ts';
import type { Storage } from '../storage/storage.ts';
import { zonedDayWindow } from '../http/routes/zonedDay.ts';
import { Watch } from '../watch/watch.ts';
import { mpsToSpeed, type SpeedUnit } from '../engine/units.ts';
import { demoAcknowledgeNotes, demoGatewayUsername, demoPeople, demoSensors, demoSiteName, demoStructures, demoTimeZone } from './demoSite.ts';
import { seededRandom } from './random.ts';
import { WindSimulator } from './windSimulator.ts';
import { DemoCrew } from './demoCrew.ts';

const seededKey = 'demo-seeded';
/** The demo site's people on the past day: two crew, then the competent person. */
const pastDayCrew = ['Sam Okoro (site crew)', 'Priya Nandakumar (stage manager)', 'Dana Whitlock (competent person)'] as const;
const gatewayPasswordKey = 'demo-gateway-password';
const actor = 'demo set-up';

function meta(storage: Storage, key: string): Promise<string | null> {
  return storage.meta.get(key);
}

function setMeta(storage: Storage, key: string, value: string, nowMs: number): Promise<void> {
  return storage.meta.set(key, value, nowMs);
}

/** Registers the demo site once per data folder. */
async function seedRegister(server: RunningServer, nowMs: number): Promise<void> {
  const { storage: db, accounts } = server;
  if (await meta(db, seededKey)) return;
  await updateSite(db, { name: demoSiteName, altitudeM: 85, terrainCategory: 'II', timeZone: demoTimeZone, airDensityMode: 'measured' }, actor, nowMs);
  const site = await getSite(db);
  for (const person of demoPeople) {
    if (!(await accounts.listPeople()).some((p) => p.username === person.username)) await accounts.createPerson(person, actor, nowMs);
  }
  for (const sensor of demoSensors) await createSensor(db, site.id, sensor, actor, nowMs);
  const { password } = await createGateway(db, site.id, { name: 'Site gateway (demo)', username: demoGatewayUsername, sensorKeys: demoSensors.map((s) => s.key) }, actor, nowMs);
  await setMeta(db, gatewayPasswordKey, password, nowMs);
  for (const structure of demoStructures) await createStructure(db, site.id, structure, actor, nowMs);
  await server.registry.reload();
  await server.reloadRegister();
}

/** Spells for the live demo: the first 3 minutes after start, then every 40 minutes for a day. */
function liveSpells(startMs: number, simStartMs: number) {
  const spells = [];
  for (let i = 0; i < 36; i++) {
    spells.push({ startMs: startMs - simStartMs + 3 * 60_000 + i * 40 * 60_000, rampMs: 4 * 60_000, holdMs: 8 * 60_000, peakMeanMps: i % 3 === 1 ? 13 : 11 });
  }
  return spells;
}

/**
 * Writes yesterday (in the site's time zone) into the log: simulated readings every 5 s from
 * each sensor go through a watch of their own in simulated time, so the level changes, alerts
 * and per-minute history are exactly what the live system would have recorded.
 */
function pastDay(nowMs: number): { day: string; window: { fromMs: number; toMs: number } } {
  const today = new Intl.DateTimeFormat('en-CA', { timeZone: demoTimeZone }).format(new Date(nowMs));
  const [y, m, d] = today.split('-').map(Number) as [number, number, number];
  const day = new Date(Date.UTC(y, m - 1, d - 1)).toISOString().slice(0, 10);
  return { day, window: zonedDayWindow(day, demoTimeZone)! };
}

/**
 * When the demo site was registered: the evening before the past day (the build day), so the
 * register, its audit rows and the day report agree that every structure and sensor existed on
 * the windy day (a day report lists only what was on the register that day).
 */
export function demoRegisteredAtMs(nowMs: number): number {
  return pastDay(nowMs).window.fromMs - 5 * 3_600_000;
}

async function writePastDay(server: RunningServer, nowMs: number, seed: number, log: Logger): Promise<void> {
  const { storage: db } = server;
  const { day: yesterday, window } = pastDay(nowMs);
  let simNow = window.fromMs;
  const watch = new Watch({ hub: new LiveHub(50), now: () => simNow });
  const sensors = server.registry.sensors();
  const structures = (await listStructures(db)).map((s) => ({ ...s, recordJson: s.record, sensorKeysJson: s.sensorKeys, levelsJson: s.levels }));
  const settings = await siteSettings(db);
  watch.configure(settings, sensors, structures);
  const queue = db.writes.queue(() => simNow);
  const noon = window.fromMs + 12 * 3_600_000;
  const simulator = new WindSimulator({
    seed,
    startMs: window.fromMs,
    baseMeanMps: 4.5,
    dailySwingMps: 1.5,
    baseDirDeg: 240,
    sensors: demoSensors.map((s) => ({ key: s.key, heightM: s.heightM })),
    // A front through the afternoon: gusts high enough to take the weaker structures to their limits.
    spells: [
      { startMs: noon + 1.5 * 3_600_000 - window.fromMs, rampMs: 90 * 60_000, holdMs: 100 * 60_000, peakMeanMps: 12.5 },
      { startMs: noon + 7 * 3_600_000 - window.fromMs, rampMs: 30 * 60_000, holdMs: 20 * 60_000, peakMeanMps: 9 },
    ],
  });
  const byKey = new Map(sensors.map((s) => [s.key, s]));
  const kinds = new Map((await db.structures.all()).map((s) => [s.id, s.kind]));
  // The crew act on the plan in simulated time, through the watch, as the live route does.
  const crewRandom = seededRandom(seed + 2);
  const demoCrew = new DemoCrew({
    watch,
    store: (batch) => queue.enqueue(batch),
    random: crewRandom,
    kindOf: (id) => kinds.get(id) ?? null,
    crew: pastDayCrew.slice(0, 2),
    competentPerson: pastDayCrew[2]!,
    doneAfterMs: [50_000, 200_000],
    actionDueMs: settings.actionDueMs ?? 5 * 60_000,
    lateKind: 'banner',
    calmForMs: 20 * 60_000,
  });
  const stepMs = 5_000;
  let pending = 0;
  for (simNow = window.fromMs; simNow < window.toMs; simNow += stepMs) {
    for (const sample of simulator.sample(simNow)) {
      const sensor = byKey.get(sample.key)!;
      const { batch } = watch.take(sensor, [{ tsMs: sample.tsMs, speedMps: sample.speedMps, gustMps: null, dirDeg: sample.dirDeg, tempC: sample.tempC, pressurePa: sample.pressureHpa * 100, rhPct: sample.rhPct }], simNow);
      void queue.enqueue(batch);
      pending++;
    }
    const tick = watch.tick();
    if (tick) void queue.enqueue(tick.batch);
    demoCrew.step(simNow);
    if (++pending > 2_000) {
      queue.flush();
      pending = 0;
    }
  }
  await queue.settle();

  // The crew acknowledged every other alert within a few minutes, with what they did to that
  // structure (those whose action they marked done were acknowledged with it).
  const random = seededRandom(seed + 1);
  const crew = pastDayCrew;
  // By id: the order the crew's random picks were drawn in.
  const alerts = (await db.alerts.raisedInWindow(window.fromMs, window.toMs)).sort((a, b) => a.id - b.id);
  for (const a of alerts) {
    if (a.acknowledgedAtMs !== null) continue;
    const by = crew[Math.floor(random() * crew.length)]!;
    const options = demoAcknowledgeNotes(a.kind, a.structureId === null ? null : (kinds.get(a.structureId) ?? null), a.level);
    const note = options[Math.floor(random() * options.length)]!;
    const atMs = a.raisedAtMs + Math.round(30_000 + random() * 210_000);
    await db.alerts.acknowledge(a.id, atMs, by, note);
    await db.audit.record({ actor: by, entity: 'alert', entityId: a.id, action: 'acknowledge', after: { by, note } }, atMs);
  }
  log.info({ day: yesterday, readings: queue.stats.committedReadings, alerts: alerts.length, actionsDone: demoCrew.counts.done, late: demoCrew.counts.late, switchedBack: demoCrew.counts.back }, 'demo: past windy day written to the log');
}

function startSimulator(server: RunningServer, config: Config, password: string, log: Logger): { stop: () => Promise<void> } {
  const startMs = Date.now();
  const simulator = new WindSimulator({
    seed: config.demoSeed,
    startMs,
    baseMeanMps: 5,
    dailySwingMps: 1.5,
    baseDirDeg: 235,
    sensors: demoSensors.map((s) => ({ key: s.key, heightM: s.heightM })),
    spells: liveSpells(startMs, startMs),
  });
  const url = config.mqttUrl ?? `mqtt://127.0.0.1:${server.mqttPort}`;
  const client: MqttClient = mqtt.connect(url, { username: demoGatewayUsername, password, clientId: `demo-gateway-${process.pid}`, reconnectPeriod: 2_000 });
  client.on('error', (err) => log.warn({ err: err.message }, 'demo gateway: MQTT error'));
  const units = new Map(demoSensors.map((s) => [s.key, s.unit as SpeedUnit]));
  const timer = setInterval(() => {
    if (!client.connected) return;
    for (const sample of simulator.sample(Date.now())) {
      const unit = units.get(sample.key) ?? 'm/s';
      const payload = JSON.stringify({
        ts: new Date(sample.tsMs).toISOString(),
        speed: Math.round(mpsToSpeed(sample.speedMps, unit) * 100) / 100,
        dir: sample.dirDeg,
        ...(sample.key === 'north-mast' ? { tempC: sample.tempC, pressureHpa: sample.pressureHpa, rh: sample.rhPct } : {}),
      });
      client.publish(readingTopic(config.topicPrefix, sample.key), payload, { qos: 1 });
    }
  }, 1_000);
  log.info({ url, sensors: demoSensors.map((s) => s.key) }, 'demo: simulated anemometers publishing once a second; a windy spell starts in 3 minutes and returns every 40 minutes');
  return {
    stop: async () => {
      clearInterval(timer);
      await client.endAsync();
    },
  };
}

/**
 * The live demo's crew: each action that moves a structure is marked done by the site crew about
 * two minutes after its alert (time for a visitor to press Done first), through the watch as the
 * route does; the competent person switches the structure back once the wind has stayed down.
 */
async function startLiveCrew(server: RunningServer, seed: number, log: Logger): Promise<{ stop: () => void }> {
  // Read at start; a structure registered later is looked up the first time the crew meets it
  // (its kind is known from the next step on).
  const kinds = new Map((await server.storage.structures.all()).map((s) => [s.id, s.kind]));
  const actionDueMs = (await getSite(server.storage)).actionDueMs;
  const crew = new DemoCrew({
    watch: server.watch,
    store: (batch) => server.queue.enqueue(batch),
    random: seededRandom(seed + 3),
    kindOf: (id) => {
      if (!kinds.has(id)) {
        void server.storage.structures.byId(id).then(
          (row) => {
            if (row) kinds.set(id, row.kind);
          },
          () => undefined,
        );
      }
      return kinds.get(id) ?? null;
    },
    crew: [demoPeople.find((p) => p.role === 'crew')!.displayName],
    competentPerson: demoPeople.find((p) => p.role === 'competent-person')!.displayName,
    doneAfterMs: [100_000, 160_000],
    actionDueMs,
    lateKind: null,
    calmForMs: 10 * 60_000,
  });
  const timer = setInterval(() => {
    try {
      crew.step(Date.now());
    } catch (err) {
      log.warn({ err: err instanceof Error ? err.message : String(err) }, 'demo crew: could not act');
    }
  }, 1_000);
  return { stop: () => clearInterval(timer) };
}

export async function runDemo(config: Config, log: Logger): Promise<RunningServer> {
  const server = await startServer(config, log, {
    beforeListen: async (s) => {
      const nowMs = Date.now();
      if (!(await meta(s.storage, seededKey))) {
        await seedRegister(s, demoRegisteredAtMs(nowMs));
        await writePastDay(s, nowMs, config.demoSeed, log);
        await setMeta(s.storage, seededKey, new Date(nowMs).toISOString(), nowMs);
        // The live watch starts from what the past day left in the log.
        await s.rebuildFromLog();
      }
    },
  });
  const password = await meta(server.storage, gatewayPasswordKey);
  if (!password) throw new Error('demo gateway password missing: delete the data folder and start the demo again');
  const simulator = startSimulator(server, config, password, log);
  const crew = await startLiveCrew(server, config.demoSeed, log);
  log.warn(
    { signIns: demoPeople.map((p) => `${p.username} / ${p.password} (${p.role})`) },
    `DEMO ONLY — sign in at http://localhost:${server.httpPort}/ with these demo accounts. Never use them on a real site.`,
  );
  const close = server.close;
  server.close = async () => {
    crew.stop();
    await simulator.stop();
    await close();
  };
  return server;
}
