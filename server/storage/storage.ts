/**
 * The one seam between the server and its database: `Storage` groups one store per stored
 * concept, and nothing outside storage/ speaks SQL (design §5 v2). The composition root
 * (runtime.ts) opens it once and hands it down; routes, the register, accounts, notifications and
 * the forecast feed take and return domain values (SI units, epoch ms), never rows in stored
 * units (storedUnits.ts converts those) and never database errors by driver code (errors.ts
 * classifies them).
 *
 * `SqliteStorage` is the implementation (better-sqlite3 through drizzle): its store classes are
 * synchronous, as better-sqlite3 is, and `Stored<T>` is the asynchronous face every caller sees,
 * so a PostgreSQL implementation (node-postgres, async) provides, without a change outside
 * storage/:
 * - each store's methods as in `Stored<...Store>`: the same arguments, the same domain values,
 *   as promises; errors classified to the same kinds (errors.ts);
 * - `transaction(work)`: `work` (async) as one unit, BEGIN ... COMMIT, rolled back when it throws;
 *   every store call made in its async context (AsyncLocalStorage) joins it, a transaction
 *   started in it is a savepoint, and a call from elsewhere is not part of it (on a pool: the
 *   transaction holds its own client; here, on one connection, transactions.ts makes others wait);
 * - `writes`: the live path's group-commit write queue (writeQueue.ts: synchronous enqueue, its
 *   own commits, each batch acknowledged after its commit), never part of a caller's transaction;
 * - `close()`.
 * The live path's rows (readings, rollups, level changes, alerts, acknowledgements) are not
 * written through the stores but through that queue.
 */
import { openDatabase, type Db, type OpenedDatabase } from './database.ts';
import { CheckpointThread, type CheckpointThreadOptions } from './checkpointThread.ts';
import { AlertStore } from './alerts.ts';
import { AuditStore } from './audit.ts';
import { configurationChangesInWindow, ConfigurationHistory, configurationSwitchesBefore, lastConfigurations, overdueSignalsInWindow } from './configurationLog.ts';
import { daySummary, sensorsInWindow } from './daySummary.ts';
import { forecastCheck } from './forecastCheck.ts';
import { ForecastPollStore } from './forecastPolls.ts';
import { GatewayStore } from './gateways.ts';
import { LevelChangeStore } from './levelChanges.ts';
import { LogExports } from './logExports.ts';
import { LogQueries } from './logQueries.ts';
import { MetaStore } from './meta.ts';
import { NotificationStore } from './notifications.ts';
import { OutboxStore } from './outbox.ts';
import { PeopleStore } from './people.ts';
import { PushSubscriptionStore } from './pushSubscriptions.ts';
import { ReadingStore } from './readings.ts';
import { RejectionStore } from './rejections.ts';
import { removeRawReadingsBefore, type RetentionOptions } from './retention.ts';
import { SensorStore } from './sensors.ts';
import { SiteStore } from './sites.ts';
import { StructureStore } from './structures.ts';
import { Transactions } from './transactions.ts';
import { rebuildNewestMinutes, WriteQueue } from './writeQueue.ts';

/** The public shape of a class: what another implementation of a store must provide. */
type Shape<T> = { [K in keyof T]: T[K] };

/**
 * A store as callers see it: each method `(...a) => R` as `(...a) => Promise<Awaited<R>>`, and
 * each store it holds (the log's series and exports) the same way.
 */
export type Stored<T> = {
  readonly [K in keyof T]: T[K] extends (...args: infer A) => infer R ? (...args: A) => Promise<Awaited<R>> : Stored<T[K]>;
};

/** `store` with every method run through `call` (transactions.ts): the synchronous SQLite store behind `Stored<T>`. */
function stored<T extends object>(store: T, call: <R>(work: () => R) => Promise<R>): Stored<T> {
  const held = new Map<PropertyKey, unknown>();
  const face = new Proxy(store, {
    get(target, key) {
      if (held.has(key)) return held.get(key);
      const value: unknown = Reflect.get(target, key);
      let wrapped: unknown = value;
      if (typeof value === 'function') wrapped = (...args: unknown[]): Promise<unknown> => call((): unknown => Reflect.apply(value, target, args));
      else if (typeof value === 'object' && value !== null) wrapped = stored(value, call);
      held.set(key, wrapped);
      return wrapped;
    },
  });
  // The proxy's methods return promises of what the store's return: `Stored<T>` says so.
  return face as unknown as Stored<T>;
}

/** Reviewing the log: series, the day's summary, the forecast check, the plan's actions, exports. */
export class LogStore {
  readonly series: LogQueries;
  readonly exports: LogExports;

  constructor(private readonly db: Db) {
    this.series = new LogQueries(db.$client);
    this.exports = new LogExports(db);
  }

  daySummary(fromMs: number, toMs: number, nowMs: number): ReturnType<typeof daySummary> {
    return daySummary(this.db, fromMs, toMs, nowMs);
  }

  sensorsInWindow(fromMs: number, toMs: number): ReturnType<typeof sensorsInWindow> {
    return sensorsInWindow(this.db, fromMs, toMs);
  }

  forecastCheck(fromMs: number, toMs: number, nowMs: number): ReturnType<typeof forecastCheck> {
    return forecastCheck(this.db, fromMs, toMs, nowMs);
  }

  configurationChanges(fromMs: number, toMs: number, structureId?: number): ReturnType<typeof configurationChangesInWindow> {
    return configurationChangesInWindow(this.db, fromMs, toMs, structureId);
  }

  overdueSignals(fromMs: number, toMs: number, structureId?: number): ReturnType<typeof overdueSignalsInWindow> {
    return overdueSignalsInWindow(this.db, fromMs, toMs, structureId);
  }

  /** Which configuration each structure stood in at a moment before `beforeMs`. */
  configurationHistory(beforeMs: number): ConfigurationHistory {
    return new ConfigurationHistory(configurationSwitchesBefore(this.db, beforeMs));
  }

  /** Each structure's last configuration switch. */
  lastConfigurations(): ReturnType<typeof lastConfigurations> {
    return lastConfigurations(this.db);
  }
}

type QueueArguments = ConstructorParameters<typeof WriteQueue> extends [unknown, ...infer Rest] ? Rest : never;

/** The live path's writes and the upkeep of the raw log. */
export class WriteStore {
  constructor(
    private readonly opened: OpenedDatabase,
    private readonly transactions: Transactions,
  ) {}

  /**
   * Recomputes each sensor's newest minute rollup from its raw readings (a crash may have lost
   * what memory held) and returns each sensor's newest minute, for the write queue to start from.
   */
  rebuildNewestMinutes(): Promise<Map<number, number>> {
    return this.transactions.call(() => rebuildNewestMinutes(this.opened.sqlite));
  }

  /**
   * The group-commit queue on this database: the write queue's arguments after the connection
   * (writeQueue.ts). Its commits on this connection wait for an open transaction's end.
   */
  queue(...[now, groupWindowMs, newestMinutes, options = {}]: QueueArguments): WriteQueue {
    return new WriteQueue(this.opened.sqlite, now, groupWindowMs, newestMinutes, { ...options, gate: this.transactions });
  }

  /** Deletes raw readings older than the cutoff in small steps (the minute rollups stay), each outside any open transaction. */
  removeRawReadingsBefore(cutoffMs: number, options: Omit<RetentionOptions, 'run'> = {}): Promise<number> {
    return removeRawReadingsBefore(this.opened.sqlite, cutoffMs, { ...options, run: (statement) => this.transactions.call(statement) });
  }
}

export interface Storage {
  /** Where the data lives, for the health report (a file path, or ':memory:'). */
  readonly location: string;
  /**
   * Runs `work` as one transaction: every store call made in it (in its async context) commits
   * together or not at all; nested calls are savepoints; calls from elsewhere are not part of it.
   */
  transaction<T>(work: () => Promise<T>): Promise<T>;
  readonly site: Stored<SiteStore>;
  readonly sensors: Stored<SensorStore>;
  readonly gateways: Stored<GatewayStore>;
  readonly structures: Stored<StructureStore>;
  readonly audit: Stored<AuditStore>;
  readonly people: Stored<PeopleStore>;
  readonly meta: Stored<MetaStore>;
  readonly alerts: Stored<AlertStore>;
  readonly levelChanges: Stored<LevelChangeStore>;
  readonly readings: Stored<ReadingStore>;
  readonly rejections: Stored<RejectionStore>;
  readonly notifications: Stored<NotificationStore>;
  readonly outbox: Stored<OutboxStore>;
  readonly pushSubscriptions: Stored<PushSubscriptionStore>;
  readonly forecastPolls: Stored<ForecastPollStore>;
  readonly log: Stored<LogStore>;
  /** The live path's write queue (synchronous enqueue, its own commits) and the raw log's upkeep. */
  readonly writes: Shape<WriteStore>;
  close(): Promise<void>;
}

export class SqliteStorage implements Storage {
  readonly location: string;
  readonly site: Stored<SiteStore>;
  readonly sensors: Stored<SensorStore>;
  readonly gateways: Stored<GatewayStore>;
  readonly structures: Stored<StructureStore>;
  readonly audit: Stored<AuditStore>;
  readonly people: Stored<PeopleStore>;
  readonly meta: Stored<MetaStore>;
  readonly alerts: Stored<AlertStore>;
  readonly levelChanges: Stored<LevelChangeStore>;
  readonly readings: Stored<ReadingStore>;
  readonly rejections: Stored<RejectionStore>;
  readonly notifications: Stored<NotificationStore>;
  readonly outbox: Stored<OutboxStore>;
  readonly pushSubscriptions: Stored<PushSubscriptionStore>;
  readonly forecastPolls: Stored<ForecastPollStore>;
  readonly log: Stored<LogStore>;
  readonly writes: WriteStore;
  private readonly transactions: Transactions;

  /** Set with `checkpointThread`: copies the log into the file off the event loop (checkpointThread.ts). */
  readonly checkpoints: CheckpointThread | null;

  /** On an opened database (openDatabase): tests that also look at the tables directly keep `opened`. */
  constructor(
    readonly opened: OpenedDatabase,
    options: StorageOptions = {},
  ) {
    const { db } = opened;
    const transactions = (this.transactions = new Transactions(opened.sqlite));
    this.checkpoints = options.checkpointThread ? new CheckpointThread(opened.sqlite, { ...options.checkpoints, hold: () => transactions.hold(), onFailure: options.onCheckpointFailure }) : null;
    const call = <R>(work: () => R): Promise<R> => transactions.call(work);
    this.location = opened.file;
    this.site = stored(new SiteStore(db), call);
    this.sensors = stored(new SensorStore(db), call);
    this.gateways = stored(new GatewayStore(db), call);
    this.structures = stored(new StructureStore(db), call);
    this.audit = stored(new AuditStore(db), call);
    this.people = stored(new PeopleStore(db), call);
    this.meta = stored(new MetaStore(db), call);
    this.alerts = stored(new AlertStore(db), call);
    this.levelChanges = stored(new LevelChangeStore(db), call);
    this.readings = stored(new ReadingStore(db), call);
    this.rejections = stored(new RejectionStore(db), call);
    this.notifications = stored(new NotificationStore(db), call);
    this.outbox = stored(new OutboxStore(db), call);
    this.pushSubscriptions = stored(new PushSubscriptionStore(db), call);
    this.forecastPolls = stored(new ForecastPollStore(db), call);
    this.log = stored(new LogStore(db), call);
    this.writes = new WriteStore(opened, transactions);
  }

  transaction<T>(work: () => Promise<T>): Promise<T> {
    return this.transactions.transaction(work);
  }

  /** Closes the connection once no transaction is open (the checkpoint thread first). */
  async close(): Promise<void> {
    await this.checkpoints?.stop();
    return this.transactions.call(() => {
      this.opened.sqlite.close();
    });
  }
}

export interface StorageOptions {
  /** Checkpoints on a worker thread instead of inside the main thread's commits (checkpointThread.ts); a file only. */
  checkpointThread?: boolean;
  /** The checkpoint thread failed (the main connection checkpoints on its own again). */
  onCheckpointFailure?: (why: string) => void;
  /** The checkpoint thread's timing and long-log mark (tests; checkpointThread.ts has the defaults). */
  checkpoints?: Pick<CheckpointThreadOptions, 'intervalMs' | 'catchUpMs' | 'longLogFrames'>;
}

/** Opens (and migrates) the SQLite database in `file` (':memory:' for a throwaway one). */
export function openStorage(file: string, options: StorageOptions = {}): SqliteStorage {
  return new SqliteStorage(openDatabase(file), options);
}
