/**
 * The trigger ladder (design §2.6): each level's trigger turned into the gust at which it rises
 * for one structure, given that structure's effective limit (engine/utilization.ts), and the
 * problems of a level list that would let a structure pass its limit before its level rises.
 * Pure: the limit comes in as a number, so the register's save, the calculator and the live
 * watch all run the same rule on the same figures.
 */
import { maxPlausibleSpeedMps } from '../engine/limits.ts';
import type { LevelDefinition } from './levelDefinition.ts';

/** One problem of a level list, with the level's index and the trigger field at fault. */
export interface LevelProblem {
  index: number;
  field: 'fraction' | 'gustMps';
  message: string;
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

/**
 * Problems of a level list for a structure, to refuse on save (design §2.6 v2): levels out of
 * order once every trigger is a gust, a gust trigger at or above the effective limit, a fraction
 * above 1 (either would let the structure pass its limit before the level rises).
 */
export function levelProblems(levels: readonly LevelDefinition[], limitGustMps: number): LevelProblem[] {
  const problems: LevelProblem[] = [];
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
