/**
 * The one seam between the server and its database: `Storage` groups one store per stored
 * concept, and nothing outside storage/ speaks SQL (design §5 v2). The composition root
 * (runtime.ts) opens it once and hands it down; routes, the register, accounts, notifications and
 * the forecast feed take and return domain values (SI units, epoch ms), never rows in stored
 * units (storedUnits.ts converts those) and never database errors by driver code (errors.ts
 * classifies them).
 *
 * `SqliteStorage` is the implementation (better-sqlite3 through drizzle). The store types are the
 * public shapes of its stores, so another implementation (PostgreSQL, the next step) provides the
 * same methods. The methods are synchronous, as better-sqlite3 is; `transaction(work)` runs
 * `work` as one unit (nested calls become savepoints), and every store call made inside it joins
 * that unit. The live path's rows (readings, rollups, level changes, alerts, acknowledgements) are
 * not written here but through the group-commit write queue (writeQueue.ts), which `writes` holds.
 */
import { openDatabase, type Db, type OpenedDatabase } from './database.ts';
import { AlertStore } from './alerts.ts';
import { AuditStore } from './audit.ts';
import { configurationChangesInWindow, ConfigurationHistory, lastConfigurations, overdueSignalsInWindow } from './configurationLog.ts';
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
import { rebuildNewestMinutes, WriteQueue } from './writeQueue.ts';

/** The public shape of a class: what another implementation of a store must provide. */
type Shape<T> = { [K in keyof T]: T[K] };

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
    return new ConfigurationHistory(this.db, beforeMs);
  }

  /** Each structure's last configuration switch. */
  lastConfigurations(): ReturnType<typeof lastConfigurations> {
    return lastConfigurations(this.db);
  }
}

type QueueArguments = ConstructorParameters<typeof WriteQueue> extends [unknown, ...infer Rest] ? Rest : never;

/** The live path's writes and the upkeep of the raw log. */
export class WriteStore {
  constructor(private readonly opened: OpenedDatabase) {}

  /**
   * Recomputes each sensor's newest minute rollup from its raw readings (a crash may have lost
   * what memory held) and returns each sensor's newest minute, for the write queue to start from.
   */
  rebuildNewestMinutes(): Map<number, number> {
    return rebuildNewestMinutes(this.opened.sqlite);
  }

  /** The group-commit queue on this database: the write queue's arguments after the connection (writeQueue.ts). */
  queue(...args: QueueArguments): WriteQueue {
    return new WriteQueue(this.opened.sqlite, ...args);
  }

  /** Deletes raw readings older than the cutoff in small steps (the minute rollups stay). */
  removeRawReadingsBefore(cutoffMs: number, options: RetentionOptions = {}): Promise<number> {
    return removeRawReadingsBefore(this.opened.sqlite, cutoffMs, options);
  }
}

export interface Storage {
  /** Where the data lives, for the health report (a file path, or ':memory:'). */
  readonly location: string;
  /** Runs `work` as one transaction: every store call inside it commits together or not at all. */
  transaction<T>(work: () => T): T;
  readonly site: Shape<SiteStore>;
  readonly sensors: Shape<SensorStore>;
  readonly gateways: Shape<GatewayStore>;
  readonly structures: Shape<StructureStore>;
  readonly audit: Shape<AuditStore>;
  readonly people: Shape<PeopleStore>;
  readonly meta: Shape<MetaStore>;
  readonly alerts: Shape<AlertStore>;
  readonly levelChanges: Shape<LevelChangeStore>;
  readonly readings: Shape<ReadingStore>;
  readonly rejections: Shape<RejectionStore>;
  readonly notifications: Shape<NotificationStore>;
  readonly outbox: Shape<OutboxStore>;
  readonly pushSubscriptions: Shape<PushSubscriptionStore>;
  readonly forecastPolls: Shape<ForecastPollStore>;
  readonly log: Shape<LogStore>;
  readonly writes: Shape<WriteStore>;
  close(): void;
}

export class SqliteStorage implements Storage {
  readonly location: string;
  readonly site: SiteStore;
  readonly sensors: SensorStore;
  readonly gateways: GatewayStore;
  readonly structures: StructureStore;
  readonly audit: AuditStore;
  readonly people: PeopleStore;
  readonly meta: MetaStore;
  readonly alerts: AlertStore;
  readonly levelChanges: LevelChangeStore;
  readonly readings: ReadingStore;
  readonly rejections: RejectionStore;
  readonly notifications: NotificationStore;
  readonly outbox: OutboxStore;
  readonly pushSubscriptions: PushSubscriptionStore;
  readonly forecastPolls: ForecastPollStore;
  readonly log: LogStore;
  readonly writes: WriteStore;

  /** On an opened database (openDatabase): tests that also look at the tables directly keep `opened`. */
  constructor(readonly opened: OpenedDatabase) {
    const { db } = opened;
    this.location = opened.file;
    this.site = new SiteStore(db);
    this.sensors = new SensorStore(db);
    this.gateways = new GatewayStore(db);
    this.structures = new StructureStore(db);
    this.audit = new AuditStore(db);
    this.people = new PeopleStore(db);
    this.meta = new MetaStore(db);
    this.alerts = new AlertStore(db);
    this.levelChanges = new LevelChangeStore(db);
    this.readings = new ReadingStore(db);
    this.rejections = new RejectionStore(db);
    this.notifications = new NotificationStore(db);
    this.outbox = new OutboxStore(db);
    this.pushSubscriptions = new PushSubscriptionStore(db);
    this.forecastPolls = new ForecastPollStore(db);
    this.log = new LogStore(db);
    this.writes = new WriteStore(opened);
  }

  transaction<T>(work: () => T): T {
    // IMMEDIATE: the write lock is taken at BEGIN (waiting on the busy timeout). The commit thread
    // writes on its own connection; a deferred transaction that reads first and then writes would
    // fail with SQLITE_BUSY at once when the thread holds the lock (commitThread.ts).
    return this.opened.sqlite.transaction(work).immediate();
  }

  close(): void {
    this.opened.sqlite.close();
  }
}

/** Opens (and migrates) the SQLite database in `file` (':memory:' for a throwaway one). */
export function openStorage(file: string): SqliteStorage {
  return new SqliteStorage(openDatabase(file));
}
