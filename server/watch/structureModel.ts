/**
 * A registered structure made ready for the per-reading path: its record expanded into faces,
 * masses and elements once, its stability in every direction reduced to coefficients once (every
 * utilization is k·q, see engine/stability.ts), its level ladder turned into trigger gusts for
 * the current air density, and its height on the wind profile. Everything here depends only on
 * the register and the air density, never on the reading.
 */
import {
  calculatedLimitGustMps,
  compactStability,
  effectiveLimitMps,
  expandStructure,
  maxPlausibleSpeedMps,
  stabilityCoefficients,
  type AssessedDirections,
  type CompactStability,
  type StructureRecord,
} from '../engine/index.ts';
import { type LevelDefinition } from '../levels/index.ts';

export interface StructureModel {
  id: number;
  name: string;
  kind: string;
  orientationDeg: number;
  mobile: boolean;
  /** Keys of the governing sensors; null = every sensor on the site (the highest governs). */
  sensorKeys: ReadonlySet<string> | null;
  /** Governing k of every part and direction (engine/utilization.ts `CompactStability`). */
  stability: CompactStability;
  /** Height the gust is transferred to, m (the structure's top unless set). */
  referenceHeightM: number;
  levels: readonly LevelDefinition[];
  ratedGustMps: number | null;
  /** Sentences of the engine about this record (a strip record: ends not checked). */
  warnings: readonly string[];
}

/** What depends on the air density: recomputed when the density changes. */
export interface DensityDependent {
  airDensityKgM3: number;
  /** Lowest calculated limit over every direction and element, m/s. */
  calculatedLimitGustMps: number;
  /** The effective limit: the lower of the calculated limit and the rating, m/s. */
  limitGustMps: number;
  /** Equivalent gust of each level's trigger, m/s, strictly rising (see `triggerLadderMps`). */
  triggerGustsMps: number[];
}

export interface StructureRow {
  id: number;
  name: string;
  kind: string;
  recordJson: unknown;
  orientationDeg: number;
  mobile: boolean;
  sensorKeysJson: unknown;
  levelsJson: unknown;
}

export function structureModel(row: StructureRow, siteLevels: readonly LevelDefinition[]): StructureModel {
  const { structure, referenceHeightM, warnings } = expandStructure(row.recordJson as StructureRecord);
  const levels = (row.levelsJson as LevelDefinition[] | null) ?? siteLevels;
  const keys = row.sensorKeysJson as string[] | null;
  const stability = compactStability(stabilityCoefficients(structure));
  return {
    id: row.id,
    name: row.name,
    kind: row.kind,
    orientationDeg: row.orientationDeg,
    mobile: row.mobile,
    sensorKeys: keys && keys.length > 0 ? new Set(keys) : null,
    stability,
    referenceHeightM,
    levels,
    ratedGustMps: structure.ratedGustMps ?? null,
    warnings: [
      ...(stability.strip ? ['Strip record (no base width): wind onto the ends was not checked.'] : []),
      ...(warnings ?? []),
    ],
  };
}

/**
 * Each level's equivalent trigger gust (m/s) as the levels say, before any ordering: a fraction f
 * of the effective capacity is reached at v_lim,eff · √f (design §2.3: every utilization is
 * proportional to q, and with a rating the capacity is the lower of the two); a gust trigger is
 * taken as is. `limitGustMps` is the effective limit over the directions assessed.
 */
export function rawTriggerGustsMps(levels: readonly LevelDefinition[], limitGustMps: number): number[] {
  return levels.map((level) => (level.trigger.kind === 'gust' ? level.trigger.gustMps : limitGustMps * Math.sqrt(level.trigger.fraction)));
}

/** The effective limit the ladder and the estimates use: an unbounded one (or above it) taken at the plausible top speed. */
export function cappedLimitMps(limitGustMps: number): number {
  return Number.isFinite(limitGustMps) ? Math.min(limitGustMps, maxPlausibleSpeedMps) : maxPlausibleSpeedMps;
}

/**
 * The levels on a chance trigger with the gust their chance watches: the gust at that fraction of
 * the effective limit, v_lim,eff · √f (as for a utilization trigger, design §2.3).
 */
export function chanceThresholds(
  levels: ReadonlyArray<{ trigger?: { kind: string; fraction?: number; withinMinutes?: number; probability?: number } }>,
  limitGustMps: number,
): Array<{ level: number; thresholdGustMps: number; withinMinutes: number; probability: number }> {
  const limit = cappedLimitMps(limitGustMps);
  return levels.flatMap(({ trigger: t }, i) =>
    t?.kind === 'chance' && t.fraction !== undefined && t.withinMinutes !== undefined && t.probability !== undefined
      ? [{ level: i + 1, thresholdGustMps: limit * Math.sqrt(t.fraction), withinMinutes: t.withinMinutes, probability: t.probability }]
      : [],
  );
}

/**
 * The ladder the level state machine runs on. A gust trigger at or above the effective limit is
 * refused on save; if the limit later falls below it (colder, denser air), it is lowered to the
 * limit, so no level comes after the structure has passed its limit. The ladder is then made
 * strictly rising by lowering the lower level (it escalates earlier, never later).
 */
export function triggerLadderMps(levels: readonly LevelDefinition[], limitGustMps: number): number[] {
  const limit = cappedLimitMps(limitGustMps);
  // The 0.01 m/s floor comes before the lowering, so that two triggers under it (or a limit of
  // 0) still give a strictly rising ladder: stepLevel refuses any other.
  const ladder = rawTriggerGustsMps(levels, limit).map((g) => Math.max(Number.isFinite(g) ? Math.min(g, limit) : limit, 0.01));
  for (let i = ladder.length - 2; i >= 0; i--) {
    if (ladder[i]! >= ladder[i + 1]!) ladder[i] = ladder[i + 1]! * 0.999;
  }
  return ladder;
}

/**
 * Indices of levels out of order (checkLevelOrder, levels/levelOrder.ts), with chance triggers
 * (levels/levelDefinition.ts) in their place: a chance level's threshold gust must be above every
 * gust or utilization trigger below it, but it sets no floor for the levels above, because it
 * may watch a fraction higher than theirs ("Prepare when the limit is likely within 30 min" before
 * "Lower at 80 %"). The ladder still rises: `triggerLadderMps` lowers its gust below the next level's.
 */
function chanceAwareLevelOrder(levels: readonly LevelDefinition[], gusts: readonly number[]): number[] {
  const offending: number[] = [];
  let floor = 0;
  levels.forEach((level, index) => {
    const gust = gusts[index]!;
    if (!(gust > floor)) offending.push(index);
    else if (level.trigger.kind !== 'chance') floor = gust;
  });
  return offending;
}

/** Limits and ladder at this density, over every direction or within a sector of them. */
export function densityDependent(model: StructureModel, airDensityKgM3: number, sector: AssessedDirections = null): DensityDependent {
  const limitGustMps = effectiveLimitMps(model.stability, airDensityKgM3, sector);
  return {
    airDensityKgM3,
    calculatedLimitGustMps: calculatedLimitGustMps(model.stability, airDensityKgM3, sector),
    limitGustMps,
    triggerGustsMps: triggerLadderMps(model.levels, limitGustMps),
  };
}

/**
 * Problems of a level list for a structure, to refuse on save (design §2.6 v2): levels out of
 * order once every trigger is a gust, a gust trigger at or above the effective limit, a fraction
 * above 1 (either would let the structure pass its limit before the level rises).
 */
export function levelProblems(levels: readonly LevelDefinition[], limitGustMps: number): Array<{ index: number; field: 'fraction' | 'gustMps'; message: string }> {
  const problems: Array<{ index: number; field: 'fraction' | 'gustMps'; message: string }> = [];
  // An unbounded limit (no wind reaches it) orders fractions as the ladder does, on the plausible
  // range (`triggerLadderMps`): Infinity · √f would make every fraction level tie with the one below.
  const gusts = rawTriggerGustsMps(levels, Number.isFinite(limitGustMps) ? limitGustMps : maxPlausibleSpeedMps);
  const outOfOrder = new Set(chanceAwareLevelOrder(levels, gusts));
  levels.forEach((level, index) => {
    const field = level.trigger.kind === 'gust' ? 'gustMps' : 'fraction';
    if (level.trigger.kind === 'gust' && Number.isFinite(limitGustMps) && level.trigger.gustMps >= limitGustMps) {
      problems.push({
        index,
        field,
        message: `level ${index + 1} (${level.label}): a trigger gust of ${level.trigger.gustMps} m/s is at or above this structure's limit of ${limitGustMps.toFixed(1)} m/s, so the structure would pass its limit before the level rises; use a lower gust or a fraction of capacity`,
      });
    } else if (level.trigger.kind === 'utilization' && level.trigger.fraction > 1) {
      problems.push({
        index,
        field,
        message: `level ${index + 1} (${level.label}): ${Math.round(level.trigger.fraction * 100)} % of capacity is beyond the structure's limit; use at most 100 %`,
      });
    } else if (outOfOrder.has(index)) {
      const below = Math.max(0, ...gusts.slice(0, index).filter((gust, i) => Number.isFinite(gust) && levels[i]!.trigger.kind !== 'chance'));
      problems.push({
        index,
        field,
        message:
          level.trigger.kind === 'chance'
            ? `level ${index + 1} (${level.label}) watches the chance of ${Math.round(level.trigger.fraction * 100)} % of capacity (${gusts[index]!.toFixed(1)} m/s for this structure), not above the trigger of the levels below it (${below.toFixed(1)} m/s): watch a higher fraction`
            : `level ${index + 1} (${level.label}) triggers at ${gusts[index]!.toFixed(1)} m/s for this structure, not above level ${index} (${below.toFixed(1)} m/s): levels must rise in order`,
      });
    }
  });
  return problems;
}
