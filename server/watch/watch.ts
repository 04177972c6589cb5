/**
 * The live watch: per-sensor wind, per-structure load margin and level, and the open alerts,
 * held in memory and fed by every accepted reading (design.md 2.2–2.7, data flow of 5).
 *
 * Per reading: the sensor's wind state takes it (3-s gust, 10-min mean); if it is live (not a
 * late reading from a buffered batch) the structures it governs are re-evaluated in the same
 * pass; level changes and alerts go into the same write batch as the reading, so they are
 * committed together before the broker is acknowledged.
 *
 * Why the per-reading cost stays flat with many structures: without directional assessment,
 * a structure's gust is max over its sensors of g_s · f(z_s → z_t), and the height factor
 * f = max(1, r(z_t)/r(z_s), u(z_t)/u(z_s)) with r(z) = √c_e(z) (EN 1991-1-4 4.9, clamped at
 * z_min) and u(z) the same unclamped (a mast below z_min: design §2.2 v2) splits, so
 *   max_s g_s·f = max( max_s g_s , r(z_t) · max_s (g_s / r(z_s)), u(z_t) · max_s (g_s / u(z_s)) )
 * (without the first term when the site allows reduction). The three site-wide maxima are found
 * once per reading; each structure then costs two multiplications and a comparison, and none
 * at all when neither maximum moved. Structures with their own sensor list, or a site with
 * directional assessment, take the direct loop over their sensors.
 *
 * What lives elsewhere: alerts in the alert book and their words (levels/alertBook.ts,
 * alertWords.ts), the level machine (levels/stepLevel.ts), the estimates (structureForesight.ts),
 * the stream frames (liveFrames.ts), the in-memory state and its rules (liveState.ts) and what
 * screens see (watchState.ts). Why this file is still long (about 1,400 lines): it is one class
 * because every step of the per-reading path and the tick reads and changes the same in-memory
 * state (sensors, structures, the site-wide gust maxima, the book), and its methods are those steps
 * in order; splitting them across files would pass that state through every call.
 *
 * Loads are never computed here: every figure comes from the engine's per-structure coefficients
 * (engine/stability.ts), the same ones the calculator reports. Without directional assessment
 * every direction around the structure counts; with it, the directions within the site's sector
 * of the governing sensor's 10-minute mean direction (design §2.2 v2). The speed is never reduced
 * by the cosine of an angle.
 */
import {
  beaufortForce,
  caseAtGust,
  defaultRegisteredConfigurationName,
  heightFactorBetween,
  profileRoots,
  sameConfigurationName,
  type ProfileRoots,
  governingWords,
  highestTravelSpeedMps,
  isaSeaLevelDensityKgM3,
  siteAirDensity,
  utilizationAtGust,
  type AssessedDirections,
  type CaseAtGust,
} from '../engine/index.ts';
import { stepLevel, type LevelEvent, type LevelStepParams } from '../levels/index.ts';
import type { Reading } from '../ingest/payload.ts';
import type { ReadingConsumer } from '../ingest/pipeline.ts';
import type { RegisteredSensor } from '../ingest/registry.ts';
import type { LiveHub } from '../live/liveHub.ts';
import { Conflict, Invalid, NotFound } from '../domainErrors.ts';
import type { WriteBatch } from '../storage/writeBatch.ts';
import { batchRowCount, emptyWriteBatch } from '../storage/writeBatch.ts';
import { summaryStatistics, windowStatistics } from '../foresight/index.ts';
import { AlertBook, defaultResignalIntervalMs, type AlertEvent, type NewAlert, type OpenAlert } from '../levels/alertBook.ts';
import { chanceRiseWords, clockOffsetWords, escalationWords, noDataWords, sensorClockWords, sensorImplausibleWords, sensorSilentWords, sensorUnusableWords, type SensorFacts } from '../levels/alertWords.ts';
import { watchEventRows } from '../storage/watchRows.ts';
import type { WatchEvent } from './watchEvents.ts';
import { AlertEventObservers, type AlertEventObserver } from './alertEventObservers.ts';
import { byUrgency } from '../live/liveEvents.ts';
import { publishMessages, type LiveMessage } from '../live/liveMessages.ts';
import { foresightCell, foresightIdentity, levelChances, structureForesight, type StructureForesight } from './structureForesight.ts';
import { acceptReading, threeSecondMeans, clockOffsetAlertMs, clockOffsetClearMs, clockOffsetMs, createSensorWindState, noteArrival, noteTenMinuteMean, sensorSilent, stuckSensors, tenMinuteGustFactor, windSnapshot } from '../wind/index.ts';
import type { FrameRow } from '../live/frames.ts';
import { selectFrame } from '../live/frames.ts';
import {
  structureAgoColumns,
  structureCells,
  structureColumns,
  structureDirectionalColumns,
  structuresFrameBudgetChars,
  structuresOverdueAfterMs,
  structureUrgency,
  windAgoColumns,
  windCells,
  windColumns,
  windsFrameBudgetChars,
  windsOverdueAfterMs,
  windUrgency,
  withAgo,
  foresightAgoColumns,
  foresightColumns,
  foresightFrameBudgetChars,
  foresightOverdueAfterMs,
} from './liveFrames.ts';
import { densityDependent, type DensityDependent, type StructureRow } from './structureModel.ts';
import { maxDimensionM, maxPlausibleSpeedMps } from '../engine/limits.ts';
import { siteSettingDefaults, type WatchSiteSettings } from '../register/siteSettings.ts';

/** A reading older than this at receipt is "late" (from a gateway's buffer): stored, not used live. */
export const liveReadingMaxAgeMs = 60_000;

/** The outcome of `Watch.switchConfiguration`: what to store and then announce, or why not (a domain error, mapped to HTTP once, http/app.ts). */
export type ConfigurationSwitch =
  | { ok: true; batch: WriteBatch; announce: () => void; structure: StructureState; alert: OpenAlert | null }
  | { ok: false; error: Invalid | NotFound | Conflict };

/** How often the foresight figures are refreshed (they move with the 10-minute statistics, not each gust). */
const foresightIntervalMs = 5_000;

/** After start, a structure or sensor must have had this long to report before "no data" alerts. */
const startGraceMs = 30_000;

/** The site settings the watch takes, derived from the settings' one schema (register/siteSettings.ts). */
export type SiteSettings = WatchSiteSettings;


/** An alert in the alert book (levels/alertBook.ts). */
export type { OpenAlert } from '../levels/alertBook.ts';
export type { SensorState, StructureState, StructureUpdate, SystemStatus } from './watchState.ts';
import type { SensorState, StructureState, StructureUpdate, SystemStatus } from './watchState.ts';
import { brokenStructure, clampedTriggerWarnings, configurationModels, restoredLevel, weakestConfiguration, type SensorLive, type StructureLive } from './liveState.ts';

export interface WatchOptions {
  hub: LiveHub;
  /** Storage and broker state, for the snapshot and the `health` stream event. */
  systemStatus?: () => SystemStatus;
  now?: () => number;
  resignalIntervalMs?: number;
  /** Called on level changes and sensor trouble, for the server log. */
  onNotice?: (message: string, detail: Record<string, unknown>) => void;
  /**
   * Take the full paths only: every structure through `evaluate` (no calm shortcut in
   * `evaluateSiteWide`) and the stream's structure rows from the whole card (no `windUpdate`).
   * For the test that compares the two.
   */
  reassessInFull?: boolean;
  /**
   * Structures whose foresight a tick refreshes itself when the 5-s refresh is due; the rest wait
   * for `continueForesight` (the server calls it in slices, between other work, so the refresh of
   * 1,000 structures is not one long pause of the event loop). Default: all of them, in the tick.
   */
  foresightSliceSize?: number;
}

export interface InitialState {
  /** The next free alert id (one above the highest in the database). */
  nextAlertId: number;
  /** Last known level of each structure (from the level-change log), to rebuild after a restart. */
  levels: Map<number, { level: number; sinceMs: number }>;
  /** Alerts still open (not acknowledged, or not cleared). */
  alerts: OpenAlert[];
  /** Each structure's last configuration switch from the log (restored after a restart, never reset silently). */
  configurations?: Map<number, { name: string; atMs: number; by: string }>;
}

export class Watch implements ReadingConsumer {
  private site!: SiteSettings;
  private sensors = new Map<number, SensorLive>();
  private sensorsByKey = new Map<string, SensorLive>();
  private structures = new Map<number, StructureLive>();
  /** Structures taking their wind from every sensor, and those with their own list, by sensor key. */
  private allSensorStructures: StructureLive[] = [];
  private structuresBySensorKey = new Map<string, StructureLive[]>();
  /** Every alert from raise to end (levels/alertBook.ts); the watch says when, the book keeps them. */
  private readonly book = new AlertBook();
  /** Who hears of the book's events once committed (the notification channels: alertEventObservers.ts). */
  private readonly alertObservers = new AlertEventObservers((err) => this.options.onNotice?.('an alert-event observer failed', { err: String(err) }));
  private airDensityKgM3 = isaSeaLevelDensityKgM3;
  /** The density every structure's limits and ladder were last built at (configure, refreshDensity). */
  private ladderAirDensityKgM3 = isaSeaLevelDensityKgM3;
  /** The density when every structure last went to the stream because the density moved (tick). */
  private streamedAirDensityKgM3 = isaSeaLevelDensityKgM3;
  private airDensityBasis: 'isa' | 'measured' | 'fixed' = 'isa';
  /** Site-wide maxima of the decomposition above; recomputed per live reading. */
  private maxGustMps = -1;
  private maxGustPerClamped = -1;
  private maxGustPerUnclamped = -1;
  private maxSensorKey: string | null = null;
  private maxClampedSensorKey: string | null = null;
  private maxUnclampedSensorKey: string | null = null;
  /** The sensors behind the three maxima, for `settleCalm` (set by `prepareCalmShortcut`). */
  private calmClamped: SensorLive | undefined = undefined;
  private calmUnclamped: SensorLive | undefined = undefined;
  private calmFastest: SensorLive | undefined = undefined;
  private readonly startedAtMs: number;
  private readonly wallClock: () => number;
  /** The watch's last time and the monotonic clock then (see `now`). */
  private lastNowMs = -Infinity;
  private lastMonotonicMs = 0;
  /** Structures whose shown state moved and is not yet in a `structures` frame: id → since when. */
  private readonly dirtyStructures = new Map<number, number>();
  /** Sensors whose frame row changed and is not yet sent: key → since when. */
  private readonly windsWaiting = new Map<string, number>();
  /** Each sensor's row as last sent in a `winds` frame (absolute times). */
  private readonly windsSent = new Map<string, string>();
  private lastSystemKey = '';
  private lastForesightAtMs = -Infinity;
  /** Structures whose foresight changed and is not yet in a `foresight` frame: id → since when. */
  private readonly foresightWaiting = new Map<number, number>();
  /** The structures still to refresh in the current foresight round, and that round's time. */
  private foresightQueue: StructureLive[] = [];
  private foresightQueueAt = 0;
  private foresightRoundMs = 0;
  private params!: LevelStepParams;

  constructor(private readonly options: WatchOptions) {
    this.wallClock = options.now ?? Date.now;
    this.startedAtMs = this.now();
  }

  /**
   * The watch's time, ms since the epoch: the wall clock (or `wallMs`, a reading's arrival), but
   * never before a time the watch has used. A clock stepped back (by NTP, or by hand on a site
   * laptop) would otherwise make the level machine refuse the step, and every reading and tick
   * after it fail; while the wall clock is behind, the watch's time goes on with the monotonic
   * clock, so silence and hold timers keep running.
   */
  private now(wallMs: number = this.wallClock()): number {
    const monotonicMs = performance.now();
    const nowMs = wallMs >= this.lastNowMs ? wallMs : this.lastNowMs + Math.max(0, monotonicMs - this.lastMonotonicMs);
    this.lastNowMs = nowMs;
    this.lastMonotonicMs = monotonicMs;
    return nowMs;
  }

  // ---------- configuration ----------

  /**
   * (Re)loads the register. Level states and wind states of sensors and structures that stay
   * are kept; new ones start with no data. Throws nothing for a bad stored record: that
   * structure shows the error and counts as no data.
   */
  configure(site: SiteSettings, sensors: readonly RegisteredSensor[], structures: readonly StructureRow[], initial?: InitialState): void {
    const nowMs = this.now();
    this.site = site;
    this.params = { deadBandFraction: site.deadBandFraction, holdTimeMs: site.holdTimeMs };

    const nextSensors = new Map<number, SensorLive>();
    for (const sensor of sensors) {
      const old = this.sensors.get(sensor.id);
      const keepWind = old && old.sensor.silenceTimeoutMs === sensor.silenceTimeoutMs;
      nextSensors.set(sensor.id, {
        sensor,
        wind: keepWind ? old.wind : createSensorWindState({ sensorKey: sensor.key, silenceTimeoutMs: sensor.silenceTimeoutMs }),
        gustMps: keepWind ? old.gustMps : null,
        dirDeg: keepWind ? old.dirDeg : null,
        meanDirDeg: keepWind ? old.meanDirDeg : null,
        lastLiveAtMs: keepWind ? old.lastLiveAtMs : null,
        profile: this.profileRoots(sensor.heightM),
        lastHealthCheckAtMs: old?.lastHealthCheckAtMs ?? 0,
        silentAlertId: old?.silentAlertId ?? null,
        clockAlertId: old?.clockAlertId ?? null,
        implausibleAlertId: old?.implausibleAlertId ?? null,
        stuck: old?.stuck ?? false,
        statistics: keepWind ? old.statistics : null,
        gustFactor: keepWind ? old.gustFactor : null,
        meanAtMs: keepWind ? old.meanAtMs : [],
        meanMps: keepWind ? old.meanMps : [],
      });
    }
    this.sensors = nextSensors;
    this.sensorsByKey = new Map([...nextSensors.values()].map((s) => [s.sensor.key, s]));

    this.updateAirDensity();
    this.ladderAirDensityKgM3 = this.airDensityKgM3;
    this.streamedAirDensityKgM3 = this.airDensityKgM3;
    const nextStructures = new Map<number, StructureLive>();
    for (const row of structures) {
      const old = this.structures.get(row.id);
      const restored = initial?.levels.get(row.id);
      let live: StructureLive;
      try {
        // A register change reloads every structure: one unchanged keeps its model (its
        // coefficients take a search over every direction to build).
        const modelKey = JSON.stringify([row.name, row.kind, row.recordJson, row.orientationDeg, row.mobile, row.sensorKeysJson, row.levelsJson ?? site.defaultLevels]);
        const kept = old && old.error === null && old.modelKey === modelKey;
        const configured = kept ? { models: old.configurations, names: old.configurationNames } : configurationModels(row, site.defaultLevels);
        // The live configuration: kept across a register reload by name, else the log's last switch.
        const wanted: { name: string; atMs: number | null; by: string | null } | null =
          old && old.error === null ? { name: old.configurationNames[old.configurationIndex]!, atMs: old.configurationSinceMs, by: old.configurationBy } : (initial?.configurations?.get(row.id) ?? null);
        const found = wanted === null ? 0 : configured.names.findIndex((n) => sameConfigurationName(n, wanted.name));
        // The log names a configuration the register no longer has: what the structure is in is
        // unknown, so it is assessed in its weakest configuration (lowest limit) until someone
        // switches it to what it is (engineering review: "as registered" may be the stronger one).
        const configurationIndex = found >= 0 ? found : weakestConfiguration(configured.models, this.airDensityKgM3);
        const model = configured.models[configurationIndex]!;
        live = {
          model,
          configurations: configured.models,
          configurationNames: configured.names,
          configurationIndex,
          configurationSinceMs: found >= 0 ? (wanted?.atMs ?? null) : null,
          configurationBy: found >= 0 ? (wanted?.by ?? null) : null,
          configurationWarning:
            wanted !== null && found < 0
              ? `The log has this structure in configuration "${wanted.name}", which the register no longer has: it is assessed in its weakest configuration, "${configured.names[weakestConfiguration(configured.models, this.airDensityKgM3)]}", until someone checks it on site and switches it to what it is.`
              : null,
          modelKey,
          density: densityDependent(model, this.airDensityKgM3),
          profile: this.profileRoots(model.referenceHeightM),
          // A rebuild from the log (`initial`) takes the log's level, as at a start; a register reload keeps the live one.
          level: initial !== undefined ? restoredLevel(restored, nowMs) : (old?.level ?? restoredLevel(restored, nowMs)),
          gustMps: old?.gustMps ?? null,
          governingSensorKey: old?.governingSensorKey ?? null,
          windFromDeg: old?.windFromDeg ?? null,
          sectorDensity: null,
          sectorCentreDeg: Number.NaN,
          sectorHalfWidthDeg: Number.NaN,
          words: null,
          wordsKey: null,
          evaluatedAtMs: old?.evaluatedAtMs ?? null,
          minuteMs: old?.minuteMs ?? 0,
          minuteMaxGustMps: old?.minuteMaxGustMps ?? 0,
          minuteMaxLevel: old?.minuteMaxLevel ?? 0,
          minuteDirty: old?.minuteDirty ?? false,
          noDataAlertId: old?.noDataAlertId ?? null,
          error: null,
          shown: null,
          foresight: old?.foresight ?? null,
          foresightIdentity: old?.foresightIdentity ?? '',
          foresightAtMs: old?.foresightAtMs ?? 0,
        };
        // A changed ladder can leave the kept level above the levels that now exist.
        if (live.level.level > model.levels.length) live.level = { ...live.level, level: model.levels.length };
      } catch (err) {
        live = brokenStructure(row, err, nowMs, old);
      }
      nextStructures.set(row.id, live);
    }
    this.structures = nextStructures;
    this.allSensorStructures = [];
    this.structuresBySensorKey = new Map();
    for (const s of nextStructures.values()) {
      if (s.error !== null) continue;
      if (s.model.sensorKeys === null) {
        this.allSensorStructures.push(s);
        continue;
      }
      for (const key of s.model.sensorKeys) {
        const list = this.structuresBySensorKey.get(key) ?? [];
        list.push(s);
        this.structuresBySensorKey.set(key, list);
      }
    }
    // A record, the levels or the density may have changed the ladder and the limit: the chances
    // kept from before are worked out again at once, not up to 5 s later.
    for (const s of nextStructures.values()) if (s.foresight !== null) this.refreshForesight(s, nowMs);

    if (initial) {
      this.book.restore(initial.alerts, initial.nextAlertId);
      for (const alert of initial.alerts) {
        if (alert.clearedAtMs === null) {
          if (alert.kind === 'no-data' && alert.structureId !== null) {
            const s = this.structures.get(alert.structureId);
            if (s) s.noDataAlertId = alert.id;
          }
          const sensor = alert.sensorKey ? this.sensorsByKey.get(alert.sensorKey) : undefined;
          if (sensor && alert.kind === 'sensor-silent') sensor.silentAlertId = alert.id;
          if (sensor && alert.kind === 'sensor-implausible') sensor.implausibleAlertId = alert.id;
          if (sensor && alert.kind === 'sensor-clock') sensor.clockAlertId = alert.id;
        }
      }
    }
    this.recomputeMaxima(nowMs);
    // Screens fetch a fresh snapshot (GET /api/live) when the register changed: the event stays small.
    this.options.hub.publish('register', { atMs: nowMs });
  }

  /**
   * √c_e(z) of EN 1991-1-4 4.9 at a height, clamped at z_min (§4.3.2) and unclamped: the height
   * factor of `gustHeightFactor` is max(√(c_e(z_s)/c_e(z_a)), √(c_e,u(z_s)/c_e,u(z_a))), so that
   * a mast below z_min is never credited with the wind at z_min (design §2.2 v2).
   */
  private profileRoots(heightM: number): ProfileRoots {
    // Registered heights are within the profile's range; a stored one outside it is taken at its bound.
    return profileRoots(Math.max(0, Math.min(heightM, maxDimensionM)), this.site.terrainCategory);
  }

  /** The height factor from a sensor to a structure (engine `gustHeightFactor`), with the site's reduction rule. */
  private heightFactor(sensor: SensorLive, structure: StructureLive): number {
    return heightFactorBetween(sensor.profile, structure.profile, this.site.heightReductionEnabled);
  }

  private updateAirDensity(): boolean {
    let measured: { tempC: number; pressurePa: number; rhPct: number | null } | null = null;
    if (this.site.airDensityMode === 'measured') {
      const nowMs = this.now();
      for (const s of this.sensors.values()) {
        const snap = windSnapshot(s.wind, nowMs);
        if (snap.temperatureC !== null && snap.pressurePa !== null) {
          measured = { tempC: snap.temperatureC, pressurePa: snap.pressurePa, rhPct: snap.rhPct };
          break;
        }
      }
    }
    const result = siteAirDensity(this.site, measured);
    // Against the density the ladders were built at, not the last tick's: a slow drift (air
    // cooling over an evening) moves less than the bound from one tick to the next, and the
    // ladders would never follow it.
    const changed = Math.abs(result.densityKgM3 - this.ladderAirDensityKgM3) > 1e-4 || result.basis !== this.airDensityBasis;
    this.airDensityKgM3 = result.densityKgM3;
    this.airDensityBasis = result.basis;
    return changed;
  }

  // ---------- the per-reading path ----------

  take(sensor: RegisteredSensor, readings: readonly Reading[], arrivedAtMs: number): { batch: WriteBatch; afterCommit: (() => void) | null } {
    const receivedAtMs = this.now(arrivedAtMs);
    const batch = emptyWriteBatch();
    const live = this.sensors.get(sensor.id);
    let anyLive = false;
    for (const reading of readings) {
      let rollupGustMps = reading.gustMps ?? reading.speedMps;
      const isLate = reading.tsMs < receivedAtMs - liveReadingMaxAgeMs;
      // Every arrival counts for the clock offset, late ones included (a clock far behind makes
      // every reading late: the offset says why).
      if (live) noteArrival(live.wind, reading.tsMs, receivedAtMs);
      if (live && !isLate) {
        const result = acceptReading(live.wind, reading, receivedAtMs);
        if (typeof result === 'number') {
          rollupGustMps = result;
          live.gustMps = result;
          live.dirDeg = reading.dirDeg ?? live.dirDeg;
          live.lastLiveAtMs = receivedAtMs;
          anyLive = true;
        }
      }
      batch.readings.push({
        sensorId: sensor.id,
        tsMs: reading.tsMs,
        speedMps: reading.speedMps,
        gustMps: reading.gustMps,
        dirDeg: reading.dirDeg,
        tempC: reading.tempC,
        pressurePa: reading.pressurePa,
        rhPct: reading.rhPct,
        late: isLate,
        rollupGustMps,
      });
    }
    if (!live || !anyLive) return { batch, afterCommit: null };

    const announcements: LiveMessage[] = [];
    // Plausibility is judged over seconds to minutes: once a second is enough, and a snapshot per
    // reading would be the costliest step of ingest.
    if (receivedAtMs - live.lastHealthCheckAtMs >= 1_000 || live.silentAlertId !== null) {
      live.lastHealthCheckAtMs = receivedAtMs;
      this.checkSensorHealth(live, receivedAtMs, batch, announcements);
    }
    const moved = this.recomputeMaxima(receivedAtMs);
    // Structures on every sensor change only when a site-wide maximum moved (or with direction);
    // structures with their own sensor list only when one of theirs reported.
    if (moved || this.site.directionalEnabled) this.evaluateSiteWide(receivedAtMs, batch, announcements);
    for (const s of this.structuresBySensorKey.get(sensor.key) ?? noStructures) this.evaluate(s, receivedAtMs, batch, announcements);
    // The sensor's wind goes to the stream in the next once-a-second `winds` frame (tick).
    return { batch, afterCommit: announcements.length > 0 ? () => publishMessages(this.options.hub, announcements) : null };
  }

  /** Recomputes the site-wide maxima over live sensors; true when either moved. */
  private recomputeMaxima(nowMs: number): boolean {
    let maxGust = -1;
    let maxPerClamped = -1;
    let maxPerUnclamped = -1;
    let maxKey: string | null = null;
    let maxClampedKey: string | null = null;
    let maxUnclampedKey: string | null = null;
    for (const s of this.sensors.values()) {
      if (!this.sensorUsable(s, nowMs)) continue;
      const g = s.gustMps!;
      if (g > maxGust) {
        maxGust = g;
        maxKey = s.sensor.key;
      }
      const perClamped = g / s.profile.clamped;
      if (perClamped > maxPerClamped) {
        maxPerClamped = perClamped;
        maxClampedKey = s.sensor.key;
      }
      const perUnclamped = g / s.profile.unclamped;
      if (perUnclamped > maxPerUnclamped) {
        maxPerUnclamped = perUnclamped;
        maxUnclampedKey = s.sensor.key;
      }
    }
    const moved =
      maxGust !== this.maxGustMps || maxPerClamped !== this.maxGustPerClamped || maxPerUnclamped !== this.maxGustPerUnclamped || maxKey !== this.maxSensorKey;
    this.maxGustMps = maxGust;
    this.maxGustPerClamped = maxPerClamped;
    this.maxGustPerUnclamped = maxPerUnclamped;
    this.maxSensorKey = maxKey;
    this.maxClampedSensorKey = maxClampedKey;
    this.maxUnclampedSensorKey = maxUnclampedKey;
    return moved;
  }

  private sensorUsable(s: SensorLive, nowMs: number): boolean {
    return s.gustMps !== null && !sensorSilent(s.wind, nowMs) && s.implausibleAlertId === null && !s.stuck;
  }

  /** The governing gust at the structure, its sensor, that sensor's mean direction and the gust's own time stamp. */
  private governingGust(s: StructureLive, nowMs: number): { gustMps: number; sensorKey: string; dirDeg: number | null; atMs: number } | null {
    if (s.model.sensorKeys === null && !this.site.directionalEnabled) {
      if (this.maxGustMps < 0) return null;
      // max over sensors of g·max(rc_t/rc_s, ru_t/ru_s) (and ≥ g without reduction), term by term.
      const fromClamped = s.profile.clamped * this.maxGustPerClamped;
      const fromUnclamped = s.profile.unclamped * this.maxGustPerUnclamped;
      let gustMps = fromClamped;
      let key = this.maxClampedSensorKey!;
      if (fromUnclamped > gustMps) {
        gustMps = fromUnclamped;
        key = this.maxUnclampedSensorKey!;
      }
      if (!this.site.heightReductionEnabled && this.maxGustMps >= gustMps) {
        gustMps = this.maxGustMps;
        key = this.maxSensorKey!;
      }
      const live = this.sensorsByKey.get(key);
      return { gustMps, sensorKey: key, dirDeg: live?.meanDirDeg ?? null, atMs: live?.wind.newestTsMs ?? nowMs };
    }
    let best: { gustMps: number; sensorKey: string; dirDeg: number | null; atMs: number } | null = null;
    let bestLoad = -1;
    for (const sensor of this.sensors.values()) {
      if (s.model.sensorKeys !== null && !s.model.sensorKeys.has(sensor.sensor.key)) continue;
      if (!this.sensorUsable(sensor, nowMs)) continue;
      const gust = sensor.gustMps! * this.heightFactor(sensor, s);
      // With direction, the sensor whose wind loads the structure most governs, not the fastest.
      const load = this.site.directionalEnabled ? this.effective(s, gust, sensor.meanDirDeg) : gust;
      if (load > bestLoad) {
        bestLoad = load;
        best = { gustMps: gust, sensorKey: sensor.sensor.key, dirDeg: sensor.meanDirDeg, atMs: sensor.wind.newestTsMs };
      }
    }
    return best;
  }

  /** The directions assessed for this structure now: the sector around the mean direction, or all. */
  private sector(s: StructureLive, windFromDeg: number | null): AssessedDirections {
    if (!this.site.directionalEnabled || windFromDeg === null) return null;
    const halfWidthDeg = this.site.directionSectorHalfWidthDeg ?? siteSettingDefaults.directionSectorHalfWidthDeg;
    if (halfWidthDeg >= 180) return null;
    // Whole degrees: the card, the governing sensor and the level ladder all use this same sector.
    return { centreDeg: Math.round(windFromDeg - s.model.orientationDeg), halfWidthDeg };
  }

  /** Effective utilization at this gust over the directions assessed (Infinity when unbounded). */
  private effective(s: StructureLive, gustMps: number, windFromDeg: number | null): number {
    return utilizationAtGust(s.model.stability, gustMps, this.airDensityKgM3, this.sector(s, windFromDeg));
  }

  /** The governing case at this gust: effective and calculated utilization, criterion, direction, part, words. */
  private assess(s: StructureLive, gustMps: number, windFromDeg: number | null) {
    const found = caseAtGust(s.model.stability, gustMps, this.airDensityKgM3, this.sector(s, windFromDeg));
    return { ...found, text: this.governingText(s, found) };
  }

  /** What governs in words, kept per structure until the case changes (the words are built from strings). */
  private governingText(s: StructureLive, found: CaseAtGust): string {
    const key = `${found.element}|${found.directionDeg}|${found.governing}|${found.tippingEdge}`;
    if (s.wordsKey !== key || s.words === null) {
      s.wordsKey = key;
      s.words = governingWords({ element: found.element, directionDeg: found.directionDeg, criterion: found.governing, tippingEdge: found.tippingEdge, frontAzimuthDeg: s.model.orientationDeg, strip: s.model.stability.strip });
    }
    return s.words;
  }

  /**
   * The limits and ladder the level machine runs on now: over every direction, or with
   * directional assessment over the sector around the mean direction (cached per whole degree).
   */
  private currentDensity(s: StructureLive, windFromDeg: number | null): DensityDependent {
    const sector = this.sector(s, windFromDeg);
    if (sector === null) return s.density;
    const cached = s.sectorDensity;
    if (cached === null || s.sectorCentreDeg !== sector.centreDeg || s.sectorHalfWidthDeg !== sector.halfWidthDeg || cached.airDensityKgM3 !== this.airDensityKgM3) {
      s.sectorCentreDeg = sector.centreDeg;
      s.sectorHalfWidthDeg = sector.halfWidthDeg;
      s.sectorDensity = densityDependent(s.model, this.airDensityKgM3, sector);
      return s.sectorDensity;
    }
    return cached;
  }

  private evaluate(s: StructureLive, nowMs: number, batch: WriteBatch, announcements: LiveMessage[]): void {
    if (s.error !== null) return;
    try {
      this.evaluateStructure(s, nowMs, batch, announcements);
    } catch (err) {
      // A structure whose stored data the level machine refuses (or a defect of ours) must not
      // stop the rest of the site: thrown out of take(), every reading would be refused. It shows
      // the error on its card and counts as no data, as a record that cannot be assessed does.
      s.error = `cannot be assessed: ${err instanceof Error ? err.message : String(err)}`;
      this.options.onNotice?.('a structure cannot be assessed', { structureId: s.model.id, name: s.model.name, error: s.error });
      if (!this.dirtyStructures.has(s.model.id)) this.dirtyStructures.set(s.model.id, nowMs);
      announcements.push({ kind: 'structure', payload: () => this.structureState(s) });
    }
  }

  private evaluateStructure(s: StructureLive, nowMs: number, batch: WriteBatch, announcements: LiveMessage[]): void {
    const governing = this.governingGust(s, nowMs);
    const wasNoData = s.level.noData;
    const previousLevel = s.level.level;
    let events: readonly LevelEvent[];
    if (governing === null) {
      ({ state: s.level, events } = stepLevel(s.level, { nowMs, gustMps: null, triggerGustsMps: s.density.triggerGustsMps }, this.params));
      s.gustMps = null;
      s.governingSensorKey = null;
    } else {
      const gustMps = Math.min(governing.gustMps, maxPlausibleSpeedMps);
      const ladder = this.currentDensity(s, governing.dirDeg).triggerGustsMps;
      // Levels on a chance trigger rise on the latest estimate too (structureForesight.ts).
      const chances = levelChances(s.model.levels, s.foresight, s.foresightAtMs, nowMs);
      // Calm, with data, below the first trigger and no chance over its trigger: the state machine would change nothing.
      const calm = s.level.level === 0 && !s.level.noData && gustMps < ladder[0]! && (chances === undefined || !chances.some((c) => c !== null && c.chance !== null && c.chance > c.probability));
      if (calm) events = noLevelEvents;
      else ({ state: s.level, events } = stepLevel(s.level, chances === undefined ? { nowMs, gustMps, triggerGustsMps: ladder } : { nowMs, gustMps, triggerGustsMps: ladder, chances }, this.params));
      s.gustMps = gustMps;
      s.governingSensorKey = governing.sensorKey;
      s.windFromDeg = governing.dirDeg;
      // The gust goes on the timeline by its own time stamp (the governing sensor's newest
      // reading), not by when it arrived: a lagging gateway's gusts land where they happened.
      const gustAtMs = governing.atMs;
      this.noteMinute(s, Number.isFinite(gustAtMs) ? Math.min(gustAtMs, nowMs) : nowMs, gustMps, batch);
    }
    s.evaluatedAtMs = nowMs;
    // Announce (in the once-a-second batch) only what a screen would show differently: a gust
    // moved by 0.05 m/s or more, another governing sensor, or a level or data state change.
    const shown = s.shown;
    if (shown === null || shown.level !== s.level.level || shown.noData !== s.level.noData || shown.sensorKey !== s.governingSensorKey || Math.abs((shown.gustMps ?? -1) - (s.gustMps ?? -1)) >= 0.05) {
      this.markShown(s, nowMs);
    }
    for (const event of events) this.onLevelEvent(s, event, previousLevel, batch, announcements);
    if (previousLevel !== s.level.level || wasNoData !== s.level.noData) {
      announcements.push({ kind: 'structure', payload: () => this.structureState(s) });
    }
  }

  /**
   * `evaluate` for every structure that takes its wind from all sensors, after a site-wide
   * maximum moved (1.6 % of readings with 100 sensors, each then touching every such structure)
   * or, with directional assessment, after every live reading. Without directional assessment a
   * calm structure is settled by `settleCalm`, without the per-structure result objects of
   * `governingGust` and `evaluate`; the tick takes the same shortcut.
   */
  private evaluateSiteWide(nowMs: number, batch: WriteBatch, announcements: LiveMessage[]): void {
    const shortcut = this.prepareCalmShortcut();
    for (const s of this.allSensorStructures) {
      if (s.error !== null) continue;
      if (!shortcut || !this.settleCalm(s, nowMs, batch)) this.evaluate(s, nowMs, batch, announcements);
    }
  }

  /** The governing sensors of the site-wide maxima, looked up once per pass (see `settleCalm`); false when there is no shortcut to take. */
  private prepareCalmShortcut(): boolean {
    if (this.maxGustMps < 0 || this.site.directionalEnabled || this.options.reassessInFull === true) return false;
    this.calmClamped = this.sensorsByKey.get(this.maxClampedSensorKey!);
    this.calmUnclamped = this.sensorsByKey.get(this.maxUnclampedSensorKey!);
    this.calmFastest = this.sensorsByKey.get(this.maxSensorKey!);
    return true;
  }

  /**
   * A structure on every sensor, without directional assessment, settled as `evaluate`'s calm
   * branch would settle it (level 0, with data, no chance trigger, the gust under the first
   * trigger), with `governingGust`'s arithmetic; false, and nothing changed, for any other.
   * Only after `prepareCalmShortcut` returned true in the same pass.
   */
  private settleCalm(s: StructureLive, nowMs: number, batch: WriteBatch): boolean {
    const level = s.level;
    if (level.level !== 0 || level.noData || s.model.hasChanceLevel || s.model.sensorKeys !== null) return false;
    // As governingGust: max over sensors of g·max(rc_t/rc_s, ru_t/ru_s), and ≥ g without reduction.
    let gust = s.profile.clamped * this.maxGustPerClamped;
    let live = this.calmClamped;
    let key = this.maxClampedSensorKey!;
    const fromUnclamped = s.profile.unclamped * this.maxGustPerUnclamped;
    if (fromUnclamped > gust) {
      gust = fromUnclamped;
      live = this.calmUnclamped;
      key = this.maxUnclampedSensorKey!;
    }
    if (!this.site.heightReductionEnabled && this.maxGustMps >= gust) {
      gust = this.maxGustMps;
      live = this.calmFastest;
      key = this.maxSensorKey!;
    }
    const gustMps = Math.min(gust, maxPlausibleSpeedMps);
    if (!(gustMps < s.density.triggerGustsMps[0]!)) return false;
    // evaluate's calm branch: the level machine would change nothing.
    s.gustMps = gustMps;
    s.governingSensorKey = key;
    s.windFromDeg = live?.meanDirDeg ?? null;
    const gustAtMs = live?.wind.newestTsMs ?? nowMs;
    this.noteMinute(s, Number.isFinite(gustAtMs) ? Math.min(gustAtMs, nowMs) : nowMs, gustMps, batch);
    s.evaluatedAtMs = nowMs;
    const shown = s.shown;
    if (shown === null || shown.level !== 0 || shown.noData || shown.sensorKey !== key || Math.abs((shown.gustMps ?? -1) - gustMps) >= 0.05) {
      this.markShown(s, nowMs);
    }
    return true;
  }

  /** Notes what the next announcement will show of the structure, and queues it for the once-a-second frame. */
  private markShown(s: StructureLive, nowMs: number): void {
    const shown = s.shown;
    // In place: a calm structure's shown gust changes on about one site-wide move in eight.
    if (shown === null) s.shown = { level: s.level.level, noData: s.level.noData, sensorKey: s.governingSensorKey, gustMps: s.gustMps };
    else {
      shown.level = s.level.level;
      shown.noData = s.level.noData;
      shown.sensorKey = s.governingSensorKey;
      shown.gustMps = s.gustMps;
    }
    if (!this.dirtyStructures.has(s.model.id)) this.dirtyStructures.set(s.model.id, nowMs);
  }

  private noteMinute(s: StructureLive, atMs: number, gustMps: number, batch: WriteBatch): void {
    const minute = atMs - (atMs % 60_000);
    if (minute < s.minuteMs) {
      // An earlier minute than the one being gathered (another governing sensor whose clock is
      // behind): written as it is; the store keeps the highest per minute.
      batch.structureMinutes.push({ structureId: s.model.id, minuteMs: minute, gustMps, utilization: this.assess(s, gustMps, s.windFromDeg).utilization, level: s.level.level });
      return;
    }
    if (minute !== s.minuteMs) {
      // The minute being gathered is complete: write what it gathered since the last tick.
      if (s.minuteDirty) this.pushMinute(s, batch);
      s.minuteMs = minute;
      s.minuteMaxGustMps = gustMps;
      s.minuteMaxLevel = s.level.level;
      s.minuteDirty = true;
      return;
    }
    if (gustMps > s.minuteMaxGustMps) {
      s.minuteMaxGustMps = gustMps;
      s.minuteDirty = true;
    }
    if (s.level.level > s.minuteMaxLevel) {
      s.minuteMaxLevel = s.level.level;
      s.minuteDirty = true;
    }
  }

  private pushMinute(s: StructureLive, batch: WriteBatch): void {
    s.minuteDirty = false;
    batch.structureMinutes.push({
      structureId: s.model.id,
      minuteMs: s.minuteMs,
      gustMps: s.minuteMaxGustMps,
      utilization: this.assess(s, s.minuteMaxGustMps, s.windFromDeg).utilization,
      level: s.minuteMaxLevel,
    });
  }

  /** `levelBefore`: the level before this step (no-data and data-back rows record the level they happened at). */
  private onLevelEvent(s: StructureLive, event: LevelEvent, levelBefore: number, batch: WriteBatch, announcements: LiveMessage[]): void {
    const utilization = s.gustMps === null ? null : this.assess(s, s.gustMps, s.windFromDeg).utilization;
    switch (event.type) {
      case 'escalated':
      case 'de-escalated': {
        // The estimate in force before a rise goes with it into the log (how the estimates did, design §2.7).
        const f = s.foresight;
        const estimate = event.type === 'escalated' && f !== null && !('unknown' in f) && f.nextLevel !== null && f.nextChance10 !== null && f.nextChance30 !== null ? { level: f.nextLevel, chance10: f.nextChance10, chance30: f.nextChance30 } : null;
        this.record([{ type: 'level-changed', structureId: s.model.id, atMs: event.atMs, fromLevel: event.fromLevel, toLevel: event.toLevel, gustMps: event.gustMps, utilization, estimate }], batch, announcements);
        this.options.onNotice?.(`${s.model.name}: level ${event.fromLevel} → ${event.toLevel}`, { structureId: s.model.id, gustMps: event.gustMps });
        if (event.type === 'escalated') {
          const estimate = event.onEstimate ? this.chanceRise(s, event.toLevel) : '';
          const words = escalationWords(s.model.levels, event.fromLevel, event.toLevel, (name) => this.moveTarget(s, name), event.onEstimate === true);
          const actionText = words.actionText + estimate;
          this.raise(batch, announcements, { kind: 'level', structureId: s.model.id, sensorId: null, sensorKey: null, level: event.toLevel, label: words.label, actionText, raisedAtMs: event.atMs, gustMps: event.gustMps, utilization, moveToConfiguration: words.moveTo, subject: s.model.name });
        } else {
          // Alerts of the levels left behind are cleared (their records stay until acknowledged).
          this.record(this.book.clearLevelsAbove(s.model.id, event.toLevel, event.atMs), batch, announcements);
        }
        break;
      }
      case 'no-data': {
        this.record([{ type: 'data-lost', structureId: s.model.id, atMs: event.atMs, level: levelBefore }], batch, announcements);
        if (s.noDataAlertId === null && event.atMs - this.startedAtMs >= startGraceMs) this.raiseNoData(s, event.atMs, batch, announcements);
        break;
      }
      case 'data-restored': {
        this.record([{ type: 'data-restored', structureId: s.model.id, atMs: event.atMs, level: levelBefore, gustMps: s.gustMps, utilization }], batch, announcements);
        if (s.noDataAlertId !== null) {
          this.record(this.book.clear(s.noDataAlertId, event.atMs), batch, announcements);
          s.noDataAlertId = null;
        }
        // A level alert above the level the structure is at now (restored from a log whose level
        // it no longer matches) ends here, as it would have at the drop: never "in force" below it.
        this.record(this.book.clearLevelsAbove(s.model.id, s.level.level, event.atMs), batch, announcements);
        break;
      }
    }
  }

  /**
   * When a level rose on its chance trigger rather than on the measured gust (levels/stepLevel.ts),
   * the alert says so after the competent person's action: the crew must know it is an estimate.
   */
  private chanceRise(s: StructureLive, toLevel: number): string {
    const f = s.foresight;
    const c = f !== null && !('unknown' in f) ? f.triggerChances.find((t) => t.level === toLevel) : undefined;
    return c === undefined ? '' : chanceRiseWords(c);
  }

  private raiseNoData(s: StructureLive, atMs: number, batch: WriteBatch, announcements: LiveMessage[]): void {
    s.noDataAlertId = this.raise(batch, announcements, { kind: 'no-data', structureId: s.model.id, sensorId: null, sensorKey: null, level: null, ...noDataWords, raisedAtMs: atMs, gustMps: null, utilization: null, moveToConfiguration: null, subject: s.model.name });
  }

  /**
   * Raises an alert in the book: it has its id at once, is open in memory and goes into the
   * batch. The announcement follows the commit — or follows anyway when the disk cannot take it
   * (the caller runs the announcements either way): alerting never waits for storage.
   */
  private raise(batch: WriteBatch, announcements: LiveMessage[], input: NewAlert): number {
    const { alert, events } = this.book.raise(input, this.actionDueMs());
    this.record(events, batch, announcements);
    return alert.id;
  }

  /**
   * Domain events (watchEvents.ts, levels/alertBook.ts) into the batch (storage/watchRows.ts) and
   * into stream messages that go out after the commit: a raise, a re-signal or an overdue action as
   * an `alert` message; a clear, an acknowledgement or an action done as one `alert-update` per
   * alert; then the alert events themselves for the observers (`observeAlertEvents`). A
   * structure's own events reach the stream as its `structure` message (evaluate).
   */
  private record(events: readonly WatchEvent[], batch: WriteBatch, announcements: LiveMessage[]): void {
    if (events.length === 0) return;
    watchEventRows(events, this.site.id, batch);
    const updated = new Map<number, OpenAlert>();
    const alertEvents: AlertEvent[] = [];
    for (const e of events) {
      if (!('alert' in e)) continue;
      alertEvents.push(e);
      const alert = e.alert;
      if (e.type === 'alert-raised') announcements.push({ kind: 'alert', payload: () => ({ ...alert, resignal: false }) });
      else if (e.type === 'alert-resignalled') announcements.push({ kind: 'alert', payload: () => ({ ...alert, resignal: true }) });
      else if (e.type === 'action-overdue') announcements.push({ kind: 'alert', payload: () => ({ ...alert, resignal: true, overdue: true }) });
      else updated.set(alert.id, alert);
    }
    for (const alert of updated.values()) announcements.push({ kind: 'alert-update', payload: alert });
    if (alertEvents.length > 0) announcements.push({ kind: 'alert-events', events: alertEvents, to: this.alertObservers });
  }

  /** A sensor's facts for the alert texts (levels/alertWords.ts). */
  private sensorFacts(live: SensorLive): SensorFacts {
    return { name: live.sensor.name, silenceTimeoutMs: live.sensor.silenceTimeoutMs, liveMaxAgeMs: liveReadingMaxAgeMs, aheadToleranceMs: live.wind.clockAheadToleranceMs };
  }

  private checkSensorHealth(live: SensorLive, nowMs: number, batch: WriteBatch, announcements: LiveMessage[]): void {
    const snap = windSnapshot(live.wind, nowMs);
    live.meanDirDeg = snap.meanDirDeg;
    if (live.silentAlertId !== null) {
      this.record(this.book.clear(live.silentAlertId, nowMs), batch, announcements);
      live.silentAlertId = null;
    }
    const implausible = snap.implausibleReasons.length > 0;
    if (implausible && live.implausibleAlertId === null) {
      this.raiseSensorAlert(live, 'sensor-implausible', nowMs, batch, announcements, snap.implausibleReasons.join(', '));
    } else if (!implausible && live.implausibleAlertId !== null) {
      this.record(this.book.clear(live.implausibleAlertId, nowMs), batch, announcements);
      live.implausibleAlertId = null;
    }
  }

  private raiseSensorAlert(live: SensorLive, kind: 'sensor-silent' | 'sensor-implausible' | 'sensor-clock', atMs: number, batch: WriteBatch, announcements: LiveMessage[], why: string): void {
    const offset = clockOffsetMs(live.wind, atMs);
    // Readings that arrive but cannot be used live (stamped too far behind or ahead) are not silence.
    const arriving = atMs - live.wind.arrivalLastAtMs <= live.sensor.silenceTimeoutMs && offset !== null;
    const facts = this.sensorFacts(live);
    const words = kind === 'sensor-silent' ? (arriving ? sensorUnusableWords(facts, offset) : sensorSilentWords(facts)) : kind === 'sensor-clock' ? sensorClockWords(facts, why) : sensorImplausibleWords(facts, why);
    const id = this.raise(batch, announcements, { kind, structureId: null, sensorId: live.sensor.id, sensorKey: live.sensor.key, level: null, ...words, raisedAtMs: atMs, gustMps: null, utilization: null, moveToConfiguration: null, subject: live.sensor.name });
    if (kind === 'sensor-silent') live.silentAlertId = id;
    else if (kind === 'sensor-clock') live.clockAlertId = id;
    else live.implausibleAlertId = id;
  }

  // ---------- time passing ----------

  /**
   * Once a second: silent sensors, structures left without data, de-escalation holds that run
   * out without new readings, re-signalling of unacknowledged alerts, per-minute history and the
   * batched structure updates on the live stream. Returns what to commit, or null.
   */
  tick(): { batch: WriteBatch; afterCommit: () => void } | null {
    const nowMs = this.now();
    const batch = emptyWriteBatch();
    const announcements: LiveMessage[] = [];

    // Measured air density follows temperature and pressure, which change over minutes: once a
    // second here is plenty, and keeps a look across every sensor off the per-reading path.
    if (this.site.airDensityMode === 'measured' && this.updateAirDensity()) this.refreshDensity();
    // Every margin moves with the density (U = k·½ρv²): once it has moved 0.2 % since the stream
    // last had every structure (our own bound: a fifth of the whole per cent a card shows), each
    // goes out again, or a screen would keep the old margins until the gust moved.
    if (Math.abs(this.airDensityKgM3 - this.streamedAirDensityKgM3) >= 0.002 * this.streamedAirDensityKgM3) {
      this.streamedAirDensityKgM3 = this.airDensityKgM3;
      for (const s of this.structures.values()) if (!this.dirtyStructures.has(s.model.id)) this.dirtyStructures.set(s.model.id, nowMs);
    }

    // Stuck sensors (reading zero while their neighbours read wind) need every sensor's state.
    const stuck = new Set(stuckSensors([...this.sensors.values()].map((s) => s.wind), nowMs).map((s) => s.sensorKey));
    for (const s of this.sensors.values()) {
      const isStuck = stuck.has(s.sensor.key);
      if (isStuck && !s.stuck && s.implausibleAlertId === null) this.raiseSensorAlert(s, 'sensor-implausible', nowMs, batch, announcements, 'reads calm while the other sensors read wind');
      s.stuck = isStuck;
      const silent = sensorSilent(s.wind, nowMs);
      const graceOver = nowMs - this.startedAtMs >= Math.max(startGraceMs, s.sensor.silenceTimeoutMs);
      if (silent && graceOver && s.silentAlertId === null) this.raiseSensorAlert(s, 'sensor-silent', nowMs, batch, announcements, 'silent');
      // A clock offset is its own condition: one alert past the bound, cleared inside the dead
      // band; while nothing arrives the offset is unknown and the alert stays as it is.
      const offset = clockOffsetMs(s.wind, nowMs);
      if (offset !== null && Math.abs(offset) > clockOffsetAlertMs && s.clockAlertId === null) {
        this.raiseSensorAlert(s, 'sensor-clock', nowMs, batch, announcements, clockOffsetWords(offset));
      } else if (offset !== null && Math.abs(offset) < clockOffsetClearMs && s.clockAlertId !== null) {
        this.record(this.book.clear(s.clockAlertId, nowMs), batch, announcements);
        s.clockAlertId = null;
      }
    }
    this.recomputeMaxima(nowMs);

    const shortcut = this.prepareCalmShortcut();
    for (const s of this.structures.values()) {
      if (s.error !== null) continue;
      // Re-evaluate: a sensor may have gone silent (→ no data), or a hold may have run out (a
      // calm structure has neither: settleCalm).
      if (!shortcut || !this.settleCalm(s, nowMs, batch)) this.evaluate(s, nowMs, batch, announcements);
      if (s.level.noData && s.noDataAlertId === null && nowMs - this.startedAtMs >= startGraceMs) this.raiseNoData(s, nowMs, batch, announcements);
      if (s.minuteDirty) this.pushMinute(s, batch);
    }

    const system = this.options.systemStatus?.();
    if (system) {
      const key = `${system.storageOk}|${system.brokerOk}|${system.brokerState}`;
      if (key !== this.lastSystemKey) {
        this.lastSystemKey = key;
        announcements.push({ kind: 'health', payload: system });
      }
    }

    // A level's action that moves the structure, not done in time, is signalled again as overdue
    // (unless it is already in that configuration, switched by hand); unacknowledged alerts are
    // signalled again every interval.
    const alreadyThere = (alert: OpenAlert): boolean => {
      const st = alert.structureId === null ? undefined : this.structures.get(alert.structureId);
      return st !== undefined && alert.moveToConfiguration !== null && sameConfigurationName(st.configurationNames[st.configurationIndex]!, alert.moveToConfiguration);
    };
    this.record(this.book.due(nowMs, this.options.resignalIntervalMs ?? defaultResignalIntervalMs, alreadyThere), batch, announcements);

    if (nowMs - this.lastForesightAtMs >= foresightIntervalMs) {
      this.lastForesightAtMs = nowMs;
      this.updateForesight(nowMs);
    }
    this.frames(nowMs, announcements);

    const empty = batchRowCount(batch) === 0;
    if (empty && announcements.length === 0) return null;
    return { batch, afterCommit: () => publishMessages(this.options.hub, announcements) };
  }

  /** The `foresight` frame (liveFrames.ts): the structures whose estimates changed, within its budget. */
  private foresightFrame(nowMs: number, announcements: LiveMessage[]): void {
    if (this.foresightWaiting.size === 0) return;
    const rows = new Map<number, FrameRow>();
    for (const [id, since] of this.foresightWaiting) {
      const s = this.structures.get(id);
      if (s === undefined) {
        this.foresightWaiting.delete(id);
        continue;
      }
      const f = s.level.noData || s.error !== null ? null : s.foresight;
      const urgency = f === null || 'unknown' in f ? 0 : s.level.level * 10 + Math.max(f.limitChance30, f.nextChance30 ?? 0);
      const atMs = s.foresightAtMs;
      rows.set(id, { cells: () => withAgo([id, foresightCell(f), atMs], foresightColumns, foresightAgoColumns, nowMs), urgency, waitingSinceMs: since });
    }
    const frame = selectFrame(nowMs, foresightColumns, foresightAgoColumns, rows, foresightFrameBudgetChars, foresightOverdueAfterMs);
    for (const id of frame.sent) this.foresightWaiting.delete(id);
    if (frame.data !== null) {
      const data = frame.data;
      announcements.push({ kind: 'foresight', text: data });
    }
  }

  /**
   * Every few seconds: each sensor's 10-minute statistics (U, σ, ν) and, once a minute, its
   * 10-minute mean for the trend; then each structure's foresight from its governing sensor
   * (structureForesight.ts), marked for the stream when what a screen shows of it changed.
   */
  private updateForesight(nowMs: number): void {
    for (const live of this.sensors.values()) {
      const snap = windSnapshot(live.wind, nowMs);
      if (live.wind.newestMode === 'summary') {
        live.statistics =
          snap.mean10minMps !== null && snap.peakGust10minMps !== null && snap.mean10minMps <= maxPlausibleSpeedMps && snap.peakGust10minMps <= maxPlausibleSpeedMps
            ? summaryStatistics({ meanMps: snap.mean10minMps, gustMps: snap.peakGust10minMps })
            : null;
      } else if (live.wind.newestMode === 'raw') {
        live.statistics = windowStatistics(threeSecondMeans(live.wind, nowMs), nowMs);
      } else live.statistics = null;
      live.gustFactor = tenMinuteGustFactor(snap.mean10minMps, snap.peakGust10minMps);
      if (snap.mean10minMps !== null && snap.mean10minMps <= maxPlausibleSpeedMps) noteTenMinuteMean({ atMs: live.meanAtMs, meanMps: live.meanMps }, nowMs, snap.mean10minMps);
    }
    // A round left unfinished (nobody called continueForesight) is finished first.
    this.continueForesight(Infinity);
    this.foresightQueue = [...this.structures.values()];
    this.foresightQueueAt = 0;
    this.foresightRoundMs = nowMs;
    this.continueForesight(this.options.foresightSliceSize ?? Infinity);
  }

  /**
   * Refreshes the foresight of up to `maxCount` more structures of the current round (worked out
   * at the round's time); true while some remain. A structure removed meanwhile is skipped; one
   * added meanwhile waits for the next round, as before.
   */
  continueForesight(maxCount: number): boolean {
    const queue = this.foresightQueue;
    let done = 0;
    while (this.foresightQueueAt < queue.length && done < maxCount) {
      const s = queue[this.foresightQueueAt++]!;
      if (this.structures.get(s.model.id) !== s) continue;
      this.refreshForesight(s, this.foresightRoundMs);
      done++;
    }
    if (this.foresightQueueAt < queue.length) return true;
    this.foresightQueue = [];
    this.foresightQueueAt = 0;
    return false;
  }

  /**
   * One structure's foresight from its governing sensor's statistics, on its ladder and limit now.
   * Run every few seconds, and at once when the ladder changes (a configuration switch, a register
   * reload), so the level machine never weighs a chance worked out for another configuration.
   */
  private refreshForesight(s: StructureLive, nowMs: number): void {
    let next: StructureForesight | null = null;
    const sensor = s.governingSensorKey === null || s.level.noData || s.error !== null ? undefined : this.sensorsByKey.get(s.governingSensorKey);
    if (sensor && sensor.statistics !== null) {
      const current = this.currentDensity(s, s.windFromDeg);
      next = structureForesight({
        sensorKey: sensor.sensor.key,
        statistics: sensor.statistics,
        heightFactor: this.heightFactor(sensor, s),
        means: { atMs: sensor.meanAtMs, meanMps: sensor.meanMps },
        gustFactor: sensor.gustFactor,
        level: s.level.level,
        levels: s.model.levels,
        triggerGustsMps: current.triggerGustsMps,
        limitGustMps: current.limitGustMps,
        nowMs,
      });
    }
    s.foresight = next;
    s.foresightAtMs = nowMs;
    const identity = foresightIdentity(next);
    if (identity !== s.foresightIdentity) {
      s.foresightIdentity = identity;
      if (!this.foresightWaiting.has(s.model.id)) this.foresightWaiting.set(s.model.id, nowMs);
    }
  }

  /**
   * The once-a-second `winds` and `structures` frames (server/watch/liveFrames.ts): the rows of
   * the sensors and structures whose shown figures changed, within each frame's budget, the most
   * urgent first; a row that does not fit waits for the next frame (and comes first once overdue).
   */
  private frames(nowMs: number, announcements: LiveMessage[]): void {
    const windRows = new Map<string, FrameRow>();
    const windIdentity = new Map<string, string>();
    for (const s of this.sensors.values()) {
      const state = this.sensorState(s, nowMs);
      const cells = windCells(state);
      const identity = JSON.stringify(cells);
      const key = state.key;
      // Once waiting, a row goes out even if it changed back: a snapshot may have shown the change.
      if (identity === this.windsSent.get(key) && !this.windsWaiting.has(key)) continue;
      const since = this.windsWaiting.get(key) ?? nowMs;
      this.windsWaiting.set(key, since);
      windIdentity.set(key, identity);
      windRows.set(key, { cells: withAgo(cells, windColumns, windAgoColumns, nowMs), urgency: windUrgency(state), waitingSinceMs: since });
    }
    const winds = selectFrame(nowMs, windColumns, windAgoColumns, windRows, windsFrameBudgetChars, windsOverdueAfterMs);
    for (const key of winds.sent) {
      this.windsSent.set(key, windIdentity.get(key)!);
      this.windsWaiting.delete(key);
    }
    if (winds.data !== null) {
      const data = winds.data;
      announcements.push({ kind: 'winds', text: data });
    }

    this.foresightFrame(nowMs, announcements);
    if (this.dirtyStructures.size === 0) return;
    const directional = this.site.directionalEnabled;
    const columns = directional ? [...structureColumns, ...structureDirectionalColumns] : [...structureColumns];
    const structureRows = new Map<number, FrameRow>();
    for (const [id, since] of this.dirtyStructures) {
      const s = this.structures.get(id);
      if (s === undefined) {
        this.dirtyStructures.delete(id);
        continue;
      }
      const update = this.structureUpdate(s);
      structureRows.set(id, { cells: () => withAgo(structureCells(update, directional), columns, structureAgoColumns, nowMs), urgency: structureUrgency(update), waitingSinceMs: since });
    }
    const budget = structuresFrameBudgetChars + Math.max(0, windsFrameBudgetChars - winds.rowChars);
    const structures = selectFrame(nowMs, columns, structureAgoColumns, structureRows, budget, structuresOverdueAfterMs);
    for (const id of structures.sent) this.dirtyStructures.delete(id);
    if (structures.data !== null) {
      const data = structures.data;
      announcements.push({ kind: 'structures', text: data });
    }
  }

  private refreshDensity(): void {
    this.ladderAirDensityKgM3 = this.airDensityKgM3;
    for (const s of this.structures.values()) {
      if (s.error === null) {
        s.density = densityDependent(s.model, this.airDensityKgM3);
        s.sectorDensity = null;
      }
    }
  }

  // ---------- acknowledgement ----------

  /**
   * Marks an alert acknowledged in memory and announces it: the stream, then the observers (the
   * caller has stored it, or had it held: this is its after-commit step).
   */
  acknowledged(id: number, by: string, note: string | null, atMs: number): OpenAlert | null {
    const alert = this.book.get(id);
    if (!alert) return null;
    const events = this.book.acknowledge(id, { by, note, atMs, actor: by });
    if (events.length > 0) {
      this.options.hub.publish('alert-update', alert);
      this.alertObservers.deliver(events);
    }
    return alert;
  }

  /**
   * The seam for alert channels: `observer` gets the alert book's events (raised, re-signalled,
   * overdue, acknowledged, action done, cleared) after their commit, in order. Returns the unsubscribe.
   */
  observeAlertEvents(observer: AlertEventObserver): () => void {
    return this.alertObservers.observe(observer);
  }

  /** The configuration a level's action moves the structure to, as the structure names it; null when it has none of that name (a site default level). */
  private moveTarget(s: StructureLive, name: string | undefined): string | null {
    if (name === undefined) return null;
    return s.configurationNames.find((n) => sameConfigurationName(n, name)) ?? null;
  }

  private actionDueMs(): number {
    return this.site.actionDueMs ?? siteSettingDefaults.actionDueMs;
  }

  /**
   * Switches a structure's live configuration (design §2.5): by the crew marking a level's action
   * done ("Done: lowered", `alertId` given: the alert's action must move it to `name`; the alert
   * is acknowledged with it when it was not), or by hand by the competent person. The watch
   * changes at once; the caller stores `batch` and only then runs `announce` (stream events).
   * The level is re-evaluated with the new configuration's ladder under the usual dead band and
   * hold time: a lowered screen does not clear Prepare at once.
   */
  switchConfiguration(request: { structureId: number; name: string; by: string; actor: string; note: string | null; alertId: number | null; atMs: number }): ConfigurationSwitch {
    const input = { ...request, atMs: this.now(request.atMs) };
    const s = this.structures.get(input.structureId);
    if (!s) return { ok: false, error: new NotFound(`structure ${input.structureId}`) };
    if (s.error !== null) return { ok: false, error: new Conflict(`structure ${input.structureId} cannot be assessed (${s.error})`) };
    const index = s.configurationNames.findIndex((n) => sameConfigurationName(n, input.name));
    if (index < 0) return { ok: false, error: new Invalid([{ path: 'configuration', message: `"${input.name}" is not a configuration of ${s.model.name}; it has ${s.configurationNames.map((n) => `"${n}"`).join(', ')}` }]) };
    let alert: OpenAlert | null = null;
    if (input.alertId !== null) {
      alert = this.book.get(input.alertId) ?? null;
      if (alert === null || alert.structureId !== input.structureId) return { ok: false, error: new Conflict(`alert ${input.alertId} is not an open alert of ${s.model.name}`) };
      if (alert.moveToConfiguration === null) return { ok: false, error: new Invalid([{ path: 'alertId', message: `the action of alert ${alert.id} (${alert.label}) does not move the structure to another configuration` }]) };
      if (!sameConfigurationName(alert.moveToConfiguration, input.name)) return { ok: false, error: new Invalid([{ path: 'configuration', message: `the action of alert ${alert.id} (${alert.label}) moves ${s.model.name} to "${alert.moveToConfiguration}", not "${input.name}"` }]) };
      if (alert.actionDoneAtMs !== null) return { ok: false, error: new Conflict(`the action of alert ${alert.id} was marked done by ${alert.actionDoneBy ?? 'someone'} at ${new Date(alert.actionDoneAtMs).toISOString()}`) };
    } else if (index === s.configurationIndex) {
      return { ok: false, error: new Conflict(`${s.model.name} is already in configuration "${s.configurationNames[index]}"`) };
    }

    const batch = emptyWriteBatch();
    const announcements: LiveMessage[] = [];
    const fromName = s.configurationNames[s.configurationIndex]!;
    const toName = s.configurationNames[index]!;
    if (index !== s.configurationIndex) {
      this.record([{ type: 'configuration-changed', structureId: s.model.id, atMs: input.atMs, fromName, toName, by: input.by, note: input.note, alertId: alert?.id ?? null, reason: alert ? 'action-done' : 'by-hand', actor: input.actor }], batch, announcements);
      const model = s.configurations[index]!;
      s.configurationIndex = index;
      s.model = model;
      s.density = densityDependent(model, this.airDensityKgM3);
      s.profile = this.profileRoots(model.referenceHeightM);
      s.sectorDensity = null;
      s.sectorCentreDeg = Number.NaN;
      s.sectorHalfWidthDeg = Number.NaN;
      s.words = null;
      s.wordsKey = null;
      s.shown = null;
    }
    s.configurationSinceMs = input.atMs;
    s.configurationBy = input.by;
    s.configurationWarning = null;
    if (alert) this.record(this.book.actionDone(alert.id, { by: input.by, note: input.note, atMs: input.atMs, actor: input.actor, configurationName: toName }), batch, announcements);
    // The new ladder, through the state machine (dead band and hold time as for any drop), with
    // the chances worked out for the new configuration.
    this.refreshForesight(s, input.atMs);
    this.evaluate(s, input.atMs, batch, announcements);
    announcements.push({ kind: 'structure', payload: () => this.structureState(s) });
    return { ok: true, batch, announce: () => publishMessages(this.options.hub, announcements), structure: this.structureState(s), alert };
  }

  // ---------- reading the state ----------

  /** An alert still open in memory (not yet acknowledged, or not yet cleared). */
  openAlert(id: number): OpenAlert | null {
    return this.book.get(id) ?? null;
  }

  structureState(s: StructureLive): StructureState {
    const m = s.model;
    const judged = s.gustMps !== null && !s.level.noData && s.error === null;
    // No wind to judge by: what governs over every direction, so the card can still say it.
    const a = judged ? this.assess(s, s.gustMps!, s.windFromDeg) : s.error === null && m.levels.length > 0 ? this.assess(s, 0, null) : null;
    const current = s.error === null ? this.currentDensity(s, s.windFromDeg) : s.density;
    return {
      ...this.windFields(s, judged ? a : null),
      name: m.name,
      kind: m.kind,
      governing: a?.governing ?? null,
      governingDirectionDeg: a?.directionDeg ?? null,
      governingElement: a?.element ?? null,
      governingText: a?.text ?? null,
      limitGustMps: current.limitGustMps,
      allDirectionsLimitGustMps: s.density.limitGustMps,
      calculatedLimitGustMps: s.density.calculatedLimitGustMps,
      ratedGustMps: m.ratedGustMps,
      airDensityKgM3: s.density.airDensityKgM3,
      referenceHeightM: m.referenceHeightM,
      triggerGustsMps: current.triggerGustsMps,
      levels: m.levels.map((l, i) => ({ level: i + 1, label: l.label, actionText: l.actionText, triggerGustMps: current.triggerGustsMps[i]!, trigger: l.trigger })),
      warnings: [...(s.configurationWarning === null ? [] : [s.configurationWarning]), ...m.warnings, ...clampedTriggerWarnings(m.levels, current.limitGustMps)],
      error: s.error,
      mobile: m.mobile,
      sensorKeys: m.sensorKeys === null ? null : [...m.sensorKeys],
      highestTravelSpeedMps:
        m.mobile && s.gustMps !== null && !s.level.noData && Number.isFinite(s.density.limitGustMps)
          ? highestTravelSpeedMps({ limitGustMps: s.density.limitGustMps, gustMps: Math.min(s.gustMps, maxPlausibleSpeedMps), windFromDeg: null, headingDeg: null }).speedMps
          : null,
      // Only while the gust is known: an estimate never stands in for missing data.
      foresight: s.level.noData || s.error !== null ? null : s.foresight,
      configuration: s.configurationNames[s.configurationIndex] ?? defaultRegisteredConfigurationName,
      configurationSinceMs: s.configurationSinceMs,
      configurationBy: s.configurationBy,
      configurations: s.configurations.map((model, i) => {
        // Each at the air density now (over every direction: the limits a plan is made on).
        const d = i === s.configurationIndex ? s.density : densityDependent(model, this.airDensityKgM3);
        return { name: s.configurationNames[i]!, current: i === s.configurationIndex, limitGustMps: d.limitGustMps, calculatedLimitGustMps: d.calculatedLimitGustMps, triggerGustsMps: d.triggerGustsMps };
      }),
    };
  }

  structureUpdate(s: StructureLive): StructureUpdate {
    if (!this.site.directionalEnabled && this.options.reassessInFull !== true) return this.windUpdate(s);
    const state = this.structureState(s);
    return {
      id: state.id,
      level: state.level,
      levelLabel: state.levelLabel,
      levelSinceMs: state.levelSinceMs,
      noData: state.noData,
      gustMps: state.gustMps,
      governingSensorKey: state.governingSensorKey,
      windFromDeg: state.windFromDeg,
      utilization: state.utilization,
      // With the effective figure, or a page would set a fresh one beside a stale calculated one.
      calculatedUtilization: state.calculatedUtilization,
      margin: state.margin,
      unbounded: state.unbounded,
      evaluatedAtMs: state.evaluatedAtMs,
      // Over every direction the governing case and the limits do not move with the wind (every
      // U = k·q): they come with the structure's full state; with a sector they follow the wind.
      ...(this.site.directionalEnabled
        ? {
            governing: state.governing,
            governingDirectionDeg: state.governingDirectionDeg,
            governingElement: state.governingElement,
            governingText: state.governingText,
            limitGustMps: state.limitGustMps,
            triggerGustsMps: state.triggerGustsMps,
          }
        : {}),
    };
  }

  /**
   * `structureUpdate` over every direction: only the fields that follow the wind, worked out as
   * `structureState` does, without the rest of the card (every configuration's limits, the level
   * list, the warnings), which the once-a-second frame does not send. Building the whole card for
   * every structure whose gust moved made the tick the longest task on the event loop.
   */
  private windUpdate(s: StructureLive): StructureUpdate {
    const judged = s.gustMps !== null && !s.level.noData && s.error === null;
    return this.windFields(s, judged ? caseAtGust(s.model.stability, s.gustMps!, this.airDensityKgM3, this.sector(s, s.windFromDeg)) : null);
  }

  /**
   * The fields of a structure that follow the wind: the stream's row, and the same fields of the
   * card. `found`: the governing case at the structure's gust, null while there is none to judge by.
   */
  private windFields(s: StructureLive, found: CaseAtGust | null): StructureUpdate {
    const utilization = found === null ? null : found.utilization;
    const unbounded = utilization !== null && !Number.isFinite(utilization);
    return {
      id: s.model.id,
      level: s.level.level,
      levelLabel: s.level.level > 0 ? (s.model.levels[s.level.level - 1]?.label ?? null) : null,
      levelSinceMs: s.level.sinceMs,
      noData: s.level.noData || s.error !== null,
      gustMps: s.level.noData ? null : s.gustMps,
      governingSensorKey: s.level.noData ? null : s.governingSensorKey,
      windFromDeg: s.windFromDeg,
      utilization: unbounded ? null : utilization,
      calculatedUtilization: found !== null && Number.isFinite(found.calculatedUtilization) ? found.calculatedUtilization : null,
      margin: utilization === null || unbounded ? null : 1 - utilization,
      unbounded,
      evaluatedAtMs: s.evaluatedAtMs,
    };
  }

  sensorState(s: SensorLive, nowMs: number): SensorState {
    const snap = windSnapshot(s.wind, nowMs);
    const implausible: string[] = [...snap.implausibleReasons];
    if (s.stuck) implausible.push('stuck');
    return {
      key: s.sensor.key,
      name: s.sensor.name,
      heightM: s.sensor.heightM,
      silenceTimeoutMs: s.sensor.silenceTimeoutMs,
      currentGustMps: snap.currentGustMps,
      peakGust10minMps: snap.peakGust10minMps,
      mean10minMps: snap.mean10minMps,
      meanDirDeg: snap.meanDirDeg,
      beaufort: snap.mean10minMps === null ? null : beaufortForce(snap.mean10minMps),
      lastReadingTsMs: snap.lastReadingTsMs,
      lastReceivedAtMs: snap.lastReceivedAtMs,
      lastArrivalAtMs: Number.isFinite(s.wind.arrivalLastAtMs) ? s.wind.arrivalLastAtMs : null,
      clockOffsetMs: clockOffsetMs(s.wind, nowMs),
      silent: snap.silent,
      implausible,
      temperatureC: snap.temperatureC,
      pressurePa: snap.pressurePa,
      rhPct: snap.rhPct,
    };
  }

  /** Everything a screen needs to start: site, air, sensors, structures (worst margin first), open alerts. */
  snapshot(): {
    atMs: number;
    site: { id: number; name: string; timeZone: string; directionalEnabled: boolean; heightReductionEnabled: boolean };
    air: { densityKgM3: number; basis: string };
    sensors: SensorState[];
    structures: StructureState[];
    alerts: OpenAlert[];
    system: SystemStatus | null;
  } {
    const nowMs = this.now();
    const structures = [...this.structures.values()].map((s) => this.structureState(s));
    structures.sort(byUrgency);
    return {
      atMs: nowMs,
      site: { id: this.site.id, name: this.site.name, timeZone: this.site.timeZone, directionalEnabled: this.site.directionalEnabled, heightReductionEnabled: this.site.heightReductionEnabled },
      air: { densityKgM3: this.airDensityKgM3, basis: this.airDensityBasis },
      sensors: [...this.sensors.values()].map((s) => this.sensorState(s, nowMs)),
      structures,
      alerts: this.openAlerts(),
      system: this.options.systemStatus?.() ?? null,
    };
  }

  openAlerts(): OpenAlert[] {
    return this.book.open();
  }

  structureStateById(id: number): StructureState | null {
    const s = this.structures.get(id);
    return s ? this.structureState(s) : null;
  }

  sensorStateByKey(key: string): SensorState | null {
    const s = this.sensorsByKey.get(key);
    return s ? this.sensorState(s, this.now()) : null;
  }

  get currentAirDensityKgM3(): number {
    return this.airDensityKgM3;
  }
}

const noLevelEvents: readonly LevelEvent[] = Object.freeze([]);
const noStructures: readonly StructureLive[] = Object.freeze([]);
