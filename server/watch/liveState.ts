/**
 * The live watch's own state of each sensor and structure (watch.ts keeps one of each in memory),
 * and the small rules around it: a structure's configuration models, the weakest of them, the
 * level restored after a restart, a record that cannot be assessed. Nothing here is shown as it is:
 * watchState.ts holds what screens see.
 */
import { defaultRegisteredConfigurationName, isaSeaLevelDensityKgM3, recordConfigurations, type ProfileRoots, type StructureRecord } from '../engine/index.ts';
import type { WindStatistics } from '../foresight/index.ts';
import type { RegisteredSensor } from '../ingest/registry.ts';
import { initialLevelState, type LevelDefinition, type LevelState } from '../levels/index.ts';
import type { SensorWindState } from '../wind/index.ts';
import type { StructureForesight } from './structureForesight.ts';
import { densityDependent, structureModel, type DensityDependent, type StructureModel, type StructureRow } from './structureModel.ts';

/** √c_e at a height, with and without the z_min clamp (EN 1991-1-4 §4.3.2; design §2.2 v2). */
export interface SensorLive {
  sensor: RegisteredSensor;
  wind: SensorWindState;
  /** The 3-s gust at the newest live reading, m/s; null before the first. */
  gustMps: number | null;
  dirDeg: number | null;
  /** 10-minute vector-mean direction, refreshed once a second with the health check. */
  meanDirDeg: number | null;
  lastLiveAtMs: number | null;
  /** √c_e at the sensor's height, clamped at z_min and not (see `profileRoots`). */
  profile: ProfileRoots;
  lastHealthCheckAtMs: number;
  silentAlertId: number | null;
  implausibleAlertId: number | null;
  /** The open alert for a clock offset beyond clockOffsetAlertMs; null when none. */
  clockAlertId: number | null;
  stuck: boolean;
  /** U, σ and ν of the last 10 minutes (foresight), refreshed every few seconds by the tick; null before the first. */
  statistics: WindStatistics | null;
  /** The 10-minute gust factor (peak 3-s gust / mean, 1–10) at the same refresh; null with too little wind or data. */
  gustFactor: number | null;
  /** The 10-minute mean once a minute over the last hour, for the trend (foresight/meanTrend.ts). */
  meanAtMs: number[];
  meanMps: number[];
}

export interface StructureLive {
  /** The model of the live configuration (one of `configurations`). */
  model: StructureModel;
  /** One model per configuration (design §2.5), the one as registered first; names in `configurationNames`. */
  configurations: StructureModel[];
  configurationNames: string[];
  /** Index of the live configuration in `configurations`. */
  configurationIndex: number;
  /** When and by whom the live configuration was switched to; null: as registered since the register was loaded. */
  configurationSinceMs: number | null;
  configurationBy: string | null;
  /** A configuration the log names that the record no longer has (shown on the card, never silent). */
  configurationWarning: string | null;
  /** What the model was built from (to keep it across a reload of an unchanged register). */
  modelKey: string;
  density: DensityDependent;
  profile: ProfileRoots;
  level: LevelState;
  gustMps: number | null;
  governingSensorKey: string | null;
  /** The wind direction of the governing sensor (for directional assessment and display). */
  windFromDeg: number | null;
  /** Limits and ladder within the current directional sector; null = every direction (`density`). */
  sectorDensity: DensityDependent | null;
  /** The sector `sectorDensity` was computed for. */
  sectorCentreDeg: number;
  sectorHalfWidthDeg: number;
  /** What governs in words, and the case it was built for. */
  words: string | null;
  wordsKey: string | null;
  evaluatedAtMs: number | null;
  minuteMs: number;
  minuteMaxGustMps: number;
  minuteMaxLevel: number;
  minuteDirty: boolean;
  noDataAlertId: number | null;
  error: string | null;
  /** What the last announcement showed (to announce only changes). */
  shown: { level: number; noData: boolean; sensorKey: string | null; gustMps: number | null } | null;
  /** The foresight figures (structureForesight.ts), refreshed every few seconds by the tick. */
  foresight: StructureForesight | null;
  foresightIdentity: string;
  foresightAtMs: number;
}

/**
 * A gust trigger refused on save at or above the limit can still meet it later: denser (colder)
 * air lowers the limit. The ladder then takes it at the limit; the card says so.
 */
export function clampedTriggerWarnings(levels: readonly LevelDefinition[], limitGustMps: number): string[] {
  if (!Number.isFinite(limitGustMps)) return [];
  return levels.flatMap((level, index) =>
    level.trigger.kind === 'gust' && level.trigger.gustMps >= limitGustMps
      ? [
          `Level ${index + 1} (${level.label}) is set at a gust of ${level.trigger.gustMps.toFixed(1)} m/s, at or above the limit of ${limitGustMps.toFixed(1)} m/s in today's air: it is taken at the limit. Lower its trigger.`,
        ]
      : [],
  );
}




export function restoredLevel(restored: { level: number; sinceMs: number } | undefined, nowMs: number): LevelState {
  const initial = initialLevelState(nowMs);
  if (!restored || restored.level <= 0) return initial;
  // After a restart the last logged level holds until readings justify lowering it (with the
  // usual hold): a restart must never make a structure look calmer than it was.
  return { ...initial, level: restored.level, sinceMs: restored.sinceMs };
}

/** The index of the configuration with the lowest effective limit at this density (the first on a tie). */
export function weakestConfiguration(models: readonly StructureModel[], airDensityKgM3: number): number {
  let weakest = 0;
  let lowest = Infinity;
  models.forEach((model, i) => {
    const limit = densityDependent(model, airDensityKgM3).limitGustMps;
    if (limit < lowest) {
      lowest = limit;
      weakest = i;
    }
  });
  return weakest;
}

/** A model per configuration of the record (design §2.5), the one as registered first. */
export function configurationModels(row: StructureRow, siteLevels: readonly LevelDefinition[]): { models: StructureModel[]; names: string[] } {
  const configured = recordConfigurations(row.recordJson as StructureRecord);
  return { models: configured.map((c) => structureModel({ ...row, recordJson: c.record }, siteLevels)), names: configured.map((c) => c.name) };
}

export function brokenStructure(row: StructureRow, err: unknown, nowMs: number, old: StructureLive | undefined): StructureLive {
  const message = err instanceof Error ? err.message : String(err);
  return {
    modelKey: '',
    model: {
      id: row.id,
      name: row.name,
      kind: row.kind,
      orientationDeg: row.orientationDeg,
      mobile: row.mobile,
      sensorKeys: null,
      // Never assessed: a broken structure shows its error and counts as no data.
      stability: { directionsDeg: new Float64Array(0), parts: [null], k: new Float64Array(0), criterion: new Uint8Array(0), edge: new Uint8Array(0), strip: true, ratedGustMps: null },
      referenceHeightM: 1,
      levels: [],
      hasChanceLevel: false,
      ratedGustMps: null,
      warnings: [],
    },
    configurations: [],
    configurationNames: [defaultRegisteredConfigurationName],
    configurationIndex: 0,
    configurationSinceMs: null,
    configurationBy: null,
    configurationWarning: null,
    density: { airDensityKgM3: isaSeaLevelDensityKgM3, calculatedLimitGustMps: 0, limitGustMps: 0, triggerGustsMps: [] },
    profile: { clamped: 1, unclamped: 1 },
    level: old?.level ?? { ...initialLevelState(nowMs) },
    gustMps: null,
    governingSensorKey: null,
    windFromDeg: null,
    sectorDensity: null,
    sectorCentreDeg: Number.NaN,
    sectorHalfWidthDeg: Number.NaN,
    words: null,
    wordsKey: null,
    evaluatedAtMs: null,
    minuteMs: 0,
    minuteMaxGustMps: 0,
    minuteMaxLevel: 0,
    minuteDirty: false,
    noDataAlertId: old?.noDataAlertId ?? null,
    error: `stored record cannot be assessed: ${message}`,
    shown: null,
    foresight: null,
    foresightIdentity: '',
    foresightAtMs: 0,
  };
}
