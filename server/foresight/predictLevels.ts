/**
 * Forecast check (design §2.5): the level each structure would reach in each forecast row.
 *
 * Each row's gust is taken to the structure by the structure's height factor (computed by the
 * engine from the site's terrain and the structure's height; ratio of gust at the structure to
 * gust at the forecast height) and compared with the structure's trigger gusts, as the live state
 * machine does: a gust equal to a trigger reaches it. Dead band and hold time do not apply: a
 * forecast row predicts the peak, not a sequence of readings.
 *
 * A row with no gust but a mean wind gets a gust estimated as mean × 1.66: the 3-second gust to
 * 10-minute mean ratio for in-land exposure in Harper, Kepert & Ginger (2010), Guidelines for
 * converting between various wind averaging periods in tropical cyclone conditions, WMO/TD-No.
 * 1555. It is the highest of their 10-minute ratios (off-land 1.52, off-sea 1.38, at sea 1.23),
 * above ESDU's 1.448 for open terrain, so it errs towards a higher level. A row with neither
 * gives an unknown level (null), never calm.
 *
 * Configurations (design §2.5, §2.8): a structure may stand in several configurations (a screen
 * raised or lowered), each with its own ladder and reference height, so its own height factor.
 * `predictPlannedLevels` gives the level in every configuration, and the configuration the plan
 * moves it to: the one named by the action (`moveToConfiguration`) of the highest level reached
 * in the configuration it stands in now — the crew act on the highest level's action that moves
 * the structure, and a lower level's when the highest has none (the screen stays lowered at
 * Stop and clear). Where that configuration's own level has an action moving it on again, the plan
 * follows it, never back to a configuration already passed.
 */
import { chanceOfReaching } from './chance.ts';
import { structureGustProcess } from './structureGustProcess.ts';
import { summaryStatistics } from './summaryStatistics.ts';
import { assertTriggerGustsMps, justifiedLevel } from '../levels/justifiedLevel.ts';

/** 3-s gust / 10-min mean, in-land exposure (Harper, Kepert & Ginger 2010, WMO/TD-No. 1555). */
export const inlandGustFactor = 1.66;

export interface ForecastStructure {
  readonly id: string;
  /** Trigger gusts of levels 1..n at the structure, m/s, ascending. */
  readonly triggerGustsMps: readonly number[];
  /** Gust at the structure ÷ gust at the forecast's height (dimensionless, > 0). */
  readonly heightFactor: number;
  /** Levels on a chance trigger (levelDefinition.ts), with the gust at the structure their chance watches. */
  readonly chanceTriggers?: readonly ChanceThreshold[];
}

/** A level on a chance trigger as the forecast check uses it: x at the structure, T and p. */
export interface ChanceThreshold {
  readonly level: number;
  readonly thresholdGustMps: number;
  readonly withinMinutes: number;
  readonly probability: number;
}

export interface ForecastInputRow {
  /** Forecast valid time, ms since the Unix epoch. */
  readonly timeMs: number;
  /** Mean wind at the forecast's height, m/s, or null. */
  readonly meanMps: number | null;
  /** Gust at the forecast's height, m/s, or null. */
  readonly gustMps: number | null;
}

export interface PredictedLevel {
  readonly structureId: string;
  /** The row's gust at the structure, m/s, or null when the row has no wind. */
  readonly gustAtStructureMps: number | null;
  /** Predicted level 0..n, or null (unknown) when the row has no wind. */
  readonly level: number | null;
}

export interface ForecastPrediction {
  readonly timeMs: number;
  /** Gust used at the forecast's height, m/s: given, or estimated from the mean; null if neither. */
  readonly gustMps: number | null;
  /** Where the gust came from: the table's gust, the mean × 1.66, or nothing. */
  readonly gustSource: 'gust' | 'mean' | null;
  /** One entry per structure, in the order given. */
  readonly levels: readonly PredictedLevel[];
}

const isSpeedOrNull = (value: number | null): boolean => value === null || (Number.isFinite(value) && value >= 0);

/**
 * The predicted level of every structure for every row. Throws a RangeError for a row whose time
 * is not finite or whose mean or gust is neither null nor a finite number ≥ 0 m/s, for a structure
 * whose ladder is not ascending or whose height factor is not a finite number > 0, or for an
 * empty or repeated structure id.
 *
 * @example
 * predictLevels([{ timeMs, meanMps: null, gustMps: 16 }], [{ id: 'stage-screen', triggerGustsMps: [15.49, 17.89, 20], heightFactor: 1.1 }])
 * // → [{ timeMs, gustMps: 16, gustSource: 'gust', levels: [{ structureId: 'stage-screen', gustAtStructureMps: 17.6, level: 1 }] }]
 */
export function predictLevels(
  rows: readonly ForecastInputRow[],
  structures: readonly ForecastStructure[],
): ForecastPrediction[] {
  const ids = new Set<string>();
  structures.forEach((structure, index) => {
    if (typeof structure.id !== 'string' || structure.id.length === 0) {
      throw new RangeError(`predictLevels: structures[${index}].id must be a non-empty string, got '${String(structure.id)}'`);
    }
    if (ids.has(structure.id)) {
      throw new RangeError(`predictLevels: structures[${index}].id must be unique, got '${structure.id}' twice`);
    }
    ids.add(structure.id);
    assertTriggerGustsMps(`predictLevels: structures[${index}] (${structure.id})`, structure.triggerGustsMps);
    if (!(Number.isFinite(structure.heightFactor) && structure.heightFactor > 0)) {
      throw new RangeError(
        `predictLevels: structures[${index}].heightFactor must be a finite number > 0, got ${structure.heightFactor}`,
      );
    }
  });

  return rows.map((row, index) => {
    if (!Number.isFinite(row.timeMs)) {
      throw new RangeError(`predictLevels: rows[${index}].timeMs must be a finite time in ms since the epoch, got ${row.timeMs}`);
    }
    if (!isSpeedOrNull(row.gustMps)) {
      throw new RangeError(`predictLevels: rows[${index}].gustMps must be null or a finite number ≥ 0 m/s, got ${row.gustMps}`);
    }
    if (!isSpeedOrNull(row.meanMps)) {
      throw new RangeError(`predictLevels: rows[${index}].meanMps must be null or a finite number ≥ 0 m/s, got ${row.meanMps}`);
    }
    const gustSource = row.gustMps !== null ? 'gust' : row.meanMps !== null ? 'mean' : null;
    const gustMps = row.gustMps ?? (row.meanMps === null ? null : row.meanMps * inlandGustFactor);
    const levels = structures.map((structure): PredictedLevel => {
      if (gustMps === null) return { structureId: structure.id, gustAtStructureMps: null, level: null };
      const gustAtStructureMps = gustMps * structure.heightFactor;
      let level = justifiedLevel(gustAtStructureMps, structure.triggerGustsMps);
      // A level on a chance: the hour's mean and gust give σ through Davenport's peak factor with
      // the stated default ν (foresight/summaryStatistics.ts, as for a sensor that sends summaries),
      // both moved to the structure by the height factor; the level is predicted when the chance is
      // over its p. A row with a gust and no mean takes the mean as gust / 1.66 (the in-land gust
      // factor, as a mean-only row takes its gust): the larger spread is the conservative side.
      if (structure.chanceTriggers !== undefined && structure.chanceTriggers.length > 0) {
        const meanMps = row.meanMps ?? gustMps / inlandGustFactor;
        const stats = summaryStatistics({ meanMps: Math.min(meanMps, gustMps), gustMps });
        const process = stats.status === 'known' ? structureGustProcess(stats, structure.heightFactor) : null;
        const meanAtStructureMps = meanMps * structure.heightFactor;
        for (const t of structure.chanceTriggers) {
          if (t.level <= level) continue;
          // P = 1 when x ≤ U (Rice), whether or not σ follows from the row: a row whose gust is
          // not above its mean gives no σ, yet a threshold at or below its mean is reached.
          if (t.thresholdGustMps <= meanAtStructureMps) level = t.level;
          else if (process !== null && chanceOfReaching({ ...process, thresholdMps: t.thresholdGustMps, durationS: t.withinMinutes * 60 }).probability > t.probability) level = t.level;
        }
      }
      return { structureId: structure.id, gustAtStructureMps, level };
    });
    return { timeMs: row.timeMs, gustMps, gustSource, levels };
  });
}

/** One configuration of a structure in the forecast check: its own ladder and height factor. */
export interface ForecastConfiguration {
  readonly name: string;
  /** Trigger gusts of levels 1..n in this configuration, at the structure, m/s, ascending. */
  readonly triggerGustsMps: readonly number[];
  /** Gust at the structure in this configuration ÷ gust at the forecast's height (> 0). */
  readonly heightFactor: number;
  /** Levels on a chance trigger in this configuration (its own limit gives each threshold). */
  readonly chanceTriggers?: readonly ChanceThreshold[];
}

/** A structure with its configurations and the plan's actions that move it between them. */
export interface ForecastPlannedStructure {
  readonly id: string;
  /** Every configuration, as registered first (the same levels, each with its own ladder). */
  readonly configurations: readonly ForecastConfiguration[];
  /** Index of the configuration it stands in now. */
  readonly currentIndex: number;
  /** Per level 1..n, the index of the configuration its action moves the structure to, or null. */
  readonly moveToIndex: ReadonlyArray<number | null>;
}

export interface PlannedPrediction {
  readonly structureId: string;
  /** The level in each configuration, in the order given. */
  readonly inConfigurations: ReadonlyArray<{ readonly name: string; readonly gustAtStructureMps: number | null; readonly level: number | null }>;
  readonly currentIndex: number;
  /** The configuration the plan moves it to in this row; null when its actions move it nowhere (or the level is unknown). */
  readonly plannedIndex: number | null;
}

/**
 * For every row, each structure's level in every configuration and the configuration its plan
 * moves it to (see the module comment). Throws a RangeError as `predictLevels` does for a row or
 * a configuration, and for a `currentIndex` or `moveToIndex` entry that names no configuration or
 * a `moveToIndex` not one entry per level.
 *
 * @example
 * // A screen: raised ladder [10.7, 12.4, 13.9], lowered [12.1, 13.9, 15.6]; level 2 lowers it.
 * predictPlannedLevels([{ timeMs, meanMps: null, gustMps: 13 }], [{ id: 's', currentIndex: 0, moveToIndex: [null, 1, null],
 *   configurations: [{ name: 'raised', triggerGustsMps: [10.7, 12.4, 13.9], heightFactor: 1 }, { name: 'lowered', triggerGustsMps: [12.1, 13.9, 15.6], heightFactor: 1 }] }])
 * // → [[{ structureId: 's', currentIndex: 0, plannedIndex: 1, inConfigurations: [{ name: 'raised', level: 2, … }, { name: 'lowered', level: 1, … }] }]]
 */
export function predictPlannedLevels(rows: readonly ForecastInputRow[], structures: readonly ForecastPlannedStructure[]): PlannedPrediction[][] {
  const flat: ForecastStructure[] = [];
  structures.forEach((structure, index) => {
    const n = structure.configurations.length;
    if (n < 1) throw new RangeError(`predictPlannedLevels: structures[${index}] (${structure.id}).configurations must hold at least the configuration as registered`);
    if (!(Number.isInteger(structure.currentIndex) && structure.currentIndex >= 0 && structure.currentIndex < n)) {
      throw new RangeError(`predictPlannedLevels: structures[${index}] (${structure.id}).currentIndex must be an index of its ${n} configurations, got ${structure.currentIndex}`);
    }
    const levels = structure.configurations[0]!.triggerGustsMps.length;
    structure.configurations.forEach((configuration, c) => {
      if (configuration.triggerGustsMps.length !== levels) {
        throw new RangeError(`predictPlannedLevels: structures[${index}] (${structure.id}).configurations[${c}] has ${configuration.triggerGustsMps.length} trigger gusts, not one per level (${levels})`);
      }
      flat.push({ id: `${index}:${c}`, triggerGustsMps: configuration.triggerGustsMps, heightFactor: configuration.heightFactor, ...(configuration.chanceTriggers ? { chanceTriggers: configuration.chanceTriggers } : {}) });
    });
    if (structure.moveToIndex.length !== levels) {
      throw new RangeError(`predictPlannedLevels: structures[${index}] (${structure.id}).moveToIndex must have one entry per level (${levels}), got ${structure.moveToIndex.length}`);
    }
    structure.moveToIndex.forEach((target, level) => {
      if (target !== null && !(Number.isInteger(target) && target >= 0 && target < n)) {
        throw new RangeError(`predictPlannedLevels: structures[${index}] (${structure.id}).moveToIndex[${level}] must be null or an index of its ${n} configurations, got ${target}`);
      }
    });
  });
  const predictions = predictLevels(rows, flat);
  return predictions.map((prediction) => {
    let at = 0;
    return structures.map((structure): PlannedPrediction => {
      const inConfigurations = structure.configurations.map((configuration) => {
        const p = prediction.levels[at++]!;
        return { name: configuration.name, gustAtStructureMps: p.gustAtStructureMps, level: p.level };
      });
      return { structureId: structure.id, inConfigurations, currentIndex: structure.currentIndex, plannedIndex: plannedConfigurationIndex(inConfigurations, structure.currentIndex, structure.moveToIndex) };
    });
  });
}

/** The configuration the plan's actions take a structure to from `currentIndex`, or null when they take it nowhere. */
function plannedConfigurationIndex(inConfigurations: ReadonlyArray<{ level: number | null }>, currentIndex: number, moveToIndex: ReadonlyArray<number | null>): number | null {
  const passed = new Set<number>([currentIndex]);
  let at = currentIndex;
  for (;;) {
    const level = inConfigurations[at]!.level;
    // Unknown wind: the plan cannot be judged (and the level shows unknown, never calm).
    if (level === null) return null;
    let target: number | null = null;
    for (let l = level; l >= 1 && target === null; l--) target = moveToIndex[l - 1] ?? null;
    if (target === null || passed.has(target)) break;
    passed.add(target);
    at = target;
  }
  return at === currentIndex ? null : at;
}
