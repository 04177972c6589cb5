/**
 * The composition root: opens the database, builds the live watch from the register, starts the
 * MQTT side (embedded broker or external client) and the HTTP server, and runs the once-a-second
 * tick. `startServer` is what `npm start` runs and what the integration tests start on ephemeral
 * ports and a temporary data folder.
 */
import path from 'node:path';
import { serve, type ServerType } from '@hono/node-server';
import { Accounts } from './auth/accounts.ts';
import { derivePasswordsWith } from './auth/password.ts';
import { SignInLimiter } from './auth/signInLimiter.ts';
import type { Config } from './config.ts';
import { createApp } from './http/app.ts';
import { EmbeddedBroker } from './ingest/embeddedBroker.ts';
import { ExternalClient } from './ingest/externalClient.ts';
import { IngestPipeline } from './ingest/pipeline.ts';
import { Registry } from './ingest/registry.ts';
import { RejectionLog } from './ingest/rejections.ts';
import { LiveHub } from './live/liveHub.ts';
import type { Logger } from './log.ts';
import { ensureSite, getSite } from './register/site.ts';
import { siteView } from './register/siteSettings.ts';
import { openAlertOfRow } from './storage/alertRows.ts';
import type { Db, OpenedDatabase } from './storage/database.ts';
import { openStorage, type Storage } from './storage/storage.ts';
import type { WriteQueue } from './storage/writeQueue.ts';
import { Watch, type InitialState, type OpenAlert, type SiteSettings, type SystemStatus } from './watch/watch.ts';
import { apiRoutes, type ApiContext } from './http/routes/apiRoutes.ts';
import { accessRoutes, siteLinkOpener } from './http/routes/accessRoutes.ts';
import { acknowledgeLinkRoutes, notifyRoutes } from './http/routes/notifyRoutes.ts';
import { pushRoutes } from './http/routes/pushRoutes.ts';
import { Notifier, type NotifierOptions } from './notify/index.ts';
import { ForecastFeed, type ForecastFeedOptions } from './forecastFeed/index.ts';

export interface RunningServer {
  config: Config;
  httpPort: number;
  mqttPort: number | null;
  /** The one seam to the database (storage/storage.ts): what the server's parts are given. */
  storage: Storage;
  /** The SQLite database under it, for tests and tools that look at the tables directly. */
  db: Db;
  opened: OpenedDatabase;
  watch: Watch;
  registry: Registry;
  pipeline: IngestPipeline;
  queue: WriteQueue;
  hub: LiveHub;
  accounts: Accounts;
  /** Alert notifications: webhooks, e-mail, the outbox (server/notify). */
  notifier: Notifier;
  /** The forecast feed's poller (server/forecastFeed). */
  forecastFeed: ForecastFeed;
  /** Reloads the register into the watch (after changes made outside the API). */
  reloadRegister(): Promise<void>;
  /** Reloads the register and rebuilds levels and open alerts from the log (after writing to it directly). */
  rebuildFromLog(): Promise<void>;
  /** Runs one tick now (tests). */
  tickNow(): Promise<void>;
  close(): Promise<void>;
}

export interface StartOptions {
  now?: () => number;
  /** Tick period, ms (default 1000). */
  tickMs?: number;
  /** Serve the built web app from this folder (default web/dist when it exists). */
  staticRoot?: string | null;
  /** Runs before the HTTP server starts, with the register in place (the demo seeds here). */
  beforeListen?: (server: RunningServer) => Promise<void> | void;
  /** The notifier's retry schedule, clock and timeouts (tests). */
  notify?: NotifierOptions;
  /** The forecast feed's timer, timeout and size cap (tests turn the timer off and poll by hand). */
  forecastFeed?: ForecastFeedOptions;
  /**
   * Group commits on a worker thread with its own connection (commitThread.ts). Default: off, with
   * either broker: on the two-core benchmark machine the worker competes with the event loop and
   * the publisher for a core, and `npm run bench` measured it slower and heavier with the embedded
   * broker too (median of 3 interleaved repeats: 0.45 against 0.67 of a counting subscriber, 0.31
   * against 0.38 of the bare broker hook, 67 against 49 µs CPU per reading, 168 against 125 MB
   * peak), as before with an external one (0.75 against 0.90–0.96 of a counting subscriber).
   */
  commitThread?: boolean;
  /**
   * Checkpoints (copying the write-ahead log into the database file) on a worker thread instead
   * of inside the event loop's commits (checkpointThread.ts). Default: on. `npm run bench` on the
   * two-core machine, median of 3 interleaved repeats: embedded broker 0.80 of a counting
   * subscriber and 0.53 of the bare hook, Mosquitto 0.81, against 0.57–0.69, 0.40–0.47 and
   * 0.57–0.71 in four runs without it; about 8 MB more resident (the worker).
   */
  checkpointThread?: boolean;
}

/** The site as the watch takes it: the settings' one schema (register/siteSettings.ts) over the stored row. */
export async function siteSettings(storage: Storage): Promise<SiteSettings> {
  return siteView(await getSite(storage));
}

function activeStructures(storage: Storage) {
  return storage.structures.active();
}

/** Last level of each structure and the alerts still open, to rebuild the watch after a restart. */
export async function initialState(storage: Storage): Promise<InitialState> {
  // The last logged row of each structure, in one pass over the (small) level-change log.
  const levels = await storage.levelChanges.lastLevels();
  const sensorKeys = new Map((await storage.sensors.all()).map((s) => [s.id, s]));
  const structureNames = await storage.structures.names();
  const actionDueMs = (await getSite(storage)).actionDueMs;
  const alertRows = await storage.alerts.open();
  const alerts: OpenAlert[] = alertRows.map((r) => {
    const sensor = r.sensorId !== null ? sensorKeys.get(r.sensorId) : undefined;
    return openAlertOfRow(r, { sensor, structureName: r.structureId !== null ? structureNames.get(r.structureId) : undefined, actionDueMs });
  });
  const maxId = await storage.alerts.maxId();
  // Each structure's last configuration switch: after a restart it is assessed as it stands.
  const configurations = await storage.log.lastConfigurations();
  return { levels, alerts, nextAlertId: maxId + 1, configurations };
}

/** Structures a foresight slice refreshes: 2–5 ms on the benchmark machine (20–50 ms a round of 1,000, profiled under `npm run bench`). */
const foresightSliceSize = 100;

export async function startServer(config: Config, log: Logger, options: StartOptions = {}): Promise<RunningServer> {
  const now = options.now ?? Date.now;
  // The one place the database is opened; everything below is given `storage`.
  const storage = openStorage(path.join(config.dataDir, 'holdfast.sqlite'), {
    checkpointThread: options.checkpointThread ?? true,
    onCheckpointFailure: (why) => log.error({ why }, 'checkpoints are back on the main thread (SQLite default); nothing is lost, but commits may pause the live path'),
  });
  await storage.checkpoints?.ready;
  // Password derivations on the checkpoint worker too: one thread, one reused scrypt block (auth/password.ts).
  const checkpoints = storage.checkpoints;
  const passwordsBackToPool = checkpoints ? derivePasswordsWith((job) => checkpoints.derive(job)) : () => undefined;
  const { opened } = storage;
  const { db } = opened;
  await ensureSite(storage, now());

  const accounts = new Accounts(storage);
  const registry = await Registry.load(storage);
  const rejections = await RejectionLog.open(storage.rejections, log, now, (key) => registry.sensorByKey(key) !== undefined);
  // Each sensor's newest minute rollup lived in memory until the last stop: recompute it.
  const newestMinutes = await storage.writes.rebuildNewestMinutes();
  // No group window with either broker: a batch commits on the next turn with whatever arrived
  // meanwhile, and the embedded broker reads a gateway's next packets only once its last read is
  // acknowledged, so a window is added to every round (`npm run bench`, embedded, median of 3:
  // 2 ms gave 0.32 of the bare broker hook against 0.45 without, and 57 against 45 µs CPU a reading).
  const queue = storage.writes.queue(now, 0, newestMinutes, { commitThread: options.commitThread ?? false });
  const hub = new LiveHub();
  let systemStatus: () => SystemStatus = () => ({ storageOk: true, storageError: null, storageBacklogRows: 0, brokerOk: true, brokerState: 'starting' });
  const watch = new Watch({ hub, now, onNotice: (message, detail) => log.info(detail, message), systemStatus: () => systemStatus(), foresightSliceSize });
  // One reload at a time, in the order asked: a slower earlier read must never be applied after a newer one.
  let reloads: Promise<void> = Promise.resolve();
  const reloadRegister = (): Promise<void> =>
    (reloads = reloads.catch(() => undefined).then(async () => watch.configure(await siteSettings(storage), registry.sensors(), await activeStructures(storage))));
  watch.configure(await siteSettings(storage), registry.sensors(), await activeStructures(storage), await initialState(storage));
  registry.onReload(reloadRegister);

  const pipeline = new IngestPipeline(config.topicPrefix, registry, rejections, watch, queue);

  let broker: EmbeddedBroker | null = null;
  let external: ExternalClient | null = null;
  if (config.mqttUrl) {
    external = new ExternalClient({
      url: config.mqttUrl,
      clientId: config.mqttClientId,
      protocolVersion: config.mqttProtocolVersion,
      username: config.mqttUsername,
      password: config.mqttPassword,
      caFile: config.mqttCaFile,
      certFile: config.mqttCertFile,
      keyFile: config.mqttKeyFile,
      topicPrefix: config.topicPrefix,
      sink: pipeline,
      log,
      now,
    });
    void external.start().catch(() => undefined);
  } else {
    broker = new EmbeddedBroker({ host: config.mqttHost, port: config.mqttPort, topicPrefix: config.topicPrefix, registry, sink: pipeline, log, now, refusals: rejections.refusals });
    try {
      await broker.start();
    } catch (err) {
      await broker.stop().catch(() => undefined);
      queue.stop(); // ends the commit thread, which would keep the process alive
      await storage.close();
      passwordsBackToPool();
      throw err;
    }
  }

  let tickRunning = false;
  let storageWasFailing = false;
  // The rest of a foresight round, a slice per turn of the event loop, so readings that arrive
  // meanwhile are taken between slices (a round of 1,000 structures was a pause of 20–50 ms
  // every 5 s in `npm run bench`). The test hook `tickNow` finishes the round before it returns.
  const continueForesight = (): void => {
    if (watch.continueForesight(foresightSliceSize)) setImmediate(continueForesight);
  };
  const tick = async (sliced: boolean): Promise<void> => {
    if (tickRunning) return;
    tickRunning = true;
    try {
      void queue.writeOpenMinutes();
      const result = watch.tick();
      if (sliced) setImmediate(continueForesight);
      else watch.continueForesight(Infinity);
      if (result) {
        // Held in memory when the database cannot write: reported once below, on the change of state.
        await queue.enqueue(result.batch);
        result.afterCommit();
      }
      if (queue.failing !== storageWasFailing) {
        storageWasFailing = queue.failing;
        if (queue.failing) log.error({ err: queue.stats.lastError, backlogRows: queue.stats.backlogRows }, 'DATABASE CANNOT WRITE: readings, level changes and alerts are held in memory and retried; alerting continues; a crash now would lose what is held');
        else log.warn({ committedAfterRetry: true }, 'database writes again: the kept rows are stored');
      }
    } finally {
      tickRunning = false;
    }
  };
  const tickNow = (): Promise<void> => tick(false);
  // A tick that throws is a defect: logged loudly, and the next tick runs as usual (an unhandled
  // rejection would end the process and every alert with it).
  const tickTimer = setInterval(() => void tick(true).catch((err: unknown) => log.error({ err }, 'the 1 Hz watch tick failed; it runs again in a second')), options.tickMs ?? 1_000);

  let retentionRunning = false;
  let closing = false;
  const runRetention = (): void => {
    if (retentionRunning || closing) return;
    retentionRunning = true;
    const cutoff = now() - config.rawRetentionDays * 86_400_000;
    storage.writes.removeRawReadingsBefore(cutoff, { pause: () => new Promise((resolve, reject) => setImmediate(() => (closing ? reject(new Error('server closing')) : resolve()))) })
      .then(
        (removed) => {
          if (removed > 0) log.info({ removed, cutoff }, 'raw readings past retention removed (per-minute rollups kept)');
        },
        (err: unknown) => {
          if (!closing) log.error({ err: String(err) }, 'retention clean-up failed');
        },
      )
      .finally(() => {
        retentionRunning = false;
      });
  };
  // A minute after start (a server restarted every night still cleans up), then hourly.
  const retentionFirst = setTimeout(runRetention, 60_000);
  retentionFirst.unref();
  const retentionTimer = setInterval(runRetention, 3_600_000);
  retentionTimer.unref();

  // Fed by the watch's alert events, handed over after their commit (design §5 v2).
  let publicBase = config.publicUrl ?? '';
  const notifier = await Notifier.open({ storage, config, watch, queue, now, log, publicBase: () => publicBase }, options.notify);
  await notifier.start();

  // The forecast feed (design §2.7): its own unref'd timer and requests, never in ingest's way.
  const forecastFeed = new ForecastFeed({ storage, now, log }, options.forecastFeed);
  await forecastFeed.start();

  const limiter = new SignInLimiter();
  // 30 failures in 15 minutes from one address: a crew behind one router, not a password list.
  const addressLimiter = new SignInLimiter({ maxFailures: 30, windowMs: 15 * 60_000 });
  const health = async () => {
    const notify = await notifier.health();
    const forecastFeedHealth = await forecastFeed.health();
    const brokerHealth = broker ? broker.health() : external!.health();
    const brokerOk = broker ? brokerHealth && (brokerHealth as { listening: boolean }).listening : external!.connected;
    const dbOk = !queue.failing;
    return {
      ok: Boolean(brokerOk) && dbOk,
      broker: brokerHealth,
      database: {
        ok: dbOk,
        file: storage.location,
        committedReadings: queue.stats.committedReadings,
        duplicateReadings: queue.stats.duplicateReadings,
        failedCommits: queue.stats.failedCommits,
        backlogRows: queue.stats.backlogRows,
        droppedBacklogReadings: queue.stats.droppedBacklogReadings,
        // The newest failure, whether it still holds or is past: `error` is what fails now (null
        // when writes work), `lastError` the newest failure with its time and, once writes work
        // again, when they recovered, and `status` says it in words.
        error: dbOk ? null : queue.stats.lastError,
        lastError: queue.stats.lastError,
        lastErrorAtMs: queue.stats.lastErrorAtMs,
        recoveredAtMs: queue.stats.recoveredAtMs,
        status: storageStatusWords(dbOk, queue.stats),
      },
      ingest: { ...pipeline.counters, rejectedTotal: rejections.totalCount },
      liveStreamClients: hub.listenerCount,
      notify,
      forecastFeed: forecastFeedHealth,
      atMs: now(),
    };
  };

  systemStatus = () => {
    const brokerOk = broker ? broker.health().listening : external!.connected;
    return {
      storageOk: !queue.failing,
      storageError: queue.failing ? (queue.stats.lastError ?? 'the database cannot write') : null,
      storageBacklogRows: queue.stats.backlogRows,
      brokerOk,
      brokerState: broker ? (brokerOk ? 'listening' : 'stopped') : external!.health().state,
    };
  };

  const running: RunningServer = {
    config,
    httpPort: 0,
    mqttPort: broker ? broker.port : null,
    storage,
    db,
    opened,
    watch,
    registry,
    pipeline,
    queue,
    hub,
    accounts,
    notifier,
    forecastFeed,
    reloadRegister,
    rebuildFromLog: async () => watch.configure(await siteSettings(storage), registry.sensors(), await activeStructures(storage), await initialState(storage)),
    tickNow,
    close: async () => undefined,
  };

  // A change of the site settings may change the feed's address, interval or unit: it polls at once.
  const reloadAfterChange = async (): Promise<void> => {
    await reloadRegister();
    await forecastFeed.settingsChanged();
  };
  const ctx: ApiContext = { storage, registry, watch, queue, hub, rejections, accounts, now, reloadRegister: reloadAfterChange, topicPrefix: config.topicPrefix, health, log, forecastFeed };
  const staticRoot = options.staticRoot === undefined ? path.resolve('web/dist') : options.staticRoot;
  const app = createApp({
    health: { health },
    log,
    access: { accounts, now, csrfExempt: new Set(['/api/session', '/api/setup', '/api/assess', '/api/chance', '/notify/ack']) },
    origin: { trustProxy: config.trustProxy, extraOrigins: config.publicUrl ? [new URL(config.publicUrl).origin] : [], exempt: new Set(['/api/assess', '/api/chance']), otherBodyTypes: new Map([['/api/register/import', ['text/csv']]]) },
    routes: [
      { path: '/api', app: accessRoutes({ accounts, limiter, addressLimiter, now, trustProxy: config.trustProxy, proxyHops: config.proxyHops, publicUrl: config.publicUrl }) },
      { path: '/api', app: apiRoutes(ctx) },
      { path: '/api', app: notifyRoutes({ storage, notifier, now }) },
      { path: '/api', app: pushRoutes({ notifier, now }) },
      { path: '/notify', app: acknowledgeLinkRoutes({ storage, notifier, now }) },
      { path: '/link', app: siteLinkOpener({ accounts, limiter, addressLimiter, now, trustProxy: config.trustProxy, proxyHops: config.proxyHops }) },
    ],
    staticRoot,
  });

  await options.beforeListen?.(running);

  // After the demo's seeding, so a demo (which has its own sign-ins) prints no setup code.
  const first = await accounts.prepareFirstAdmin({ username: config.adminUsername, password: config.adminPassword }, now());
  if (first && 'created' in first) log.info({ username: first.created.username }, 'first administrator created from ADMIN_USERNAME / ADMIN_PASSWORD');
  if (first && 'setupCode' in first) {
    log.warn(
      { setupCode: first.setupCode },
      `nobody can sign in yet: open the web app and create the first administrator with setup code ${first.setupCode} (shown once; restart for a new one)`,
    );
  }


  const server: ServerType = await new Promise((resolve, reject) => {
    const s = serve({ fetch: app.fetch, port: config.httpPort, hostname: config.httpHost }, () => resolve(s));
    s.once('error', (err: NodeJS.ErrnoException) => {
      reject(err.code === 'EADDRINUSE' ? new Error(`HTTP port ${config.httpPort} is already in use: set PORT to a free port`) : err);
    });
  });
  const address = server.address();
  running.httpPort = address && typeof address === 'object' ? address.port : config.httpPort;
  if (!config.publicUrl) publicBase = `http://${config.httpHost === '0.0.0.0' || config.httpHost === '::' ? 'localhost' : config.httpHost.includes(':') ? `[${config.httpHost}]` : config.httpHost}:${running.httpPort}`;
  log.info({ url: `http://${config.httpHost === '0.0.0.0' ? 'localhost' : config.httpHost}:${running.httpPort}/`, mqttPort: running.mqttPort, mqttUrl: external ? external.health().url : null, dataDir: config.dataDir }, 'server started');

  running.close = async () => {
    closing = true;
    clearInterval(tickTimer);
    clearTimeout(retentionFirst);
    clearInterval(retentionTimer);
    await new Promise<void>((resolve) => {
      server.close(() => resolve());
      // SSE connections stay open: end them so close completes.
      (server as unknown as { closeAllConnections?: () => void }).closeAllConnections?.();
    });
    await broker?.stop();
    await external?.stop();
    await notifier.stop();
    await forecastFeed.stop();
    await queue.settle();
    queue.stop();
    await rejections.flush();
    await storage.close();
    passwordsBackToPool();
  };
  return running;
}

/** The database's state in words: "writing", "cannot write since … (…)", or "writing; last error at …, recovered at …". */
export function storageStatusWords(ok: boolean, stats: { lastError: string | null; lastErrorAtMs: number | null; recoveredAtMs: number | null }): string {
  const at = (ms: number | null) => (ms === null ? 'an unknown time' : new Date(ms).toISOString());
  if (!ok) return `cannot write since ${at(stats.lastErrorAtMs)} (${stats.lastError ?? 'unknown error'}); rows are held in memory and retried`;
  if (stats.lastErrorAtMs === null) return 'writing';
  // A failure of the open-minute write alone does not fill the backlog: it is past once a later write worked.
  return stats.recoveredAtMs === null
    ? `writing; last error at ${at(stats.lastErrorAtMs)} (${stats.lastError ?? 'unknown error'})`
    : `writing; last error at ${at(stats.lastErrorAtMs)} (${stats.lastError ?? 'unknown error'}), recovered at ${at(stats.recoveredAtMs)}`;
}
