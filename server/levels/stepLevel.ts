/**
 * The level state machine of one structure (design §2.6). Pure: time comes in with each input.
 *
 * Rules (design §2.6 is our own model; the numbers are defaults the competent person may change):
 * - Escalate at once when the governing gust reaches (≥) a higher level's trigger gust, possibly
 *   several levels at a time; one 'escalated' event names the new level.
 * - De-escalate only after the gust has stayed below the current level's trigger × (1 − dead band)
 *   for the whole hold time. Any reading at or above that lowered threshold restarts the hold.
 *   The band between the lowered threshold and the trigger is what stops a gust hovering around a
 *   trigger from flapping the level; the hold stops a short lull from clearing it.
 * - When the hold has run, the level drops to the highest level whose own lowered threshold the
 *   strongest gust of the hold still reached (0 if none). We use the strongest gust of the hold
 *   rather than the last reading so that one quiet reading cannot skip several levels: the lower
 *   level then runs its own hold, from the moment of the drop (conservative: never shorter).
 * - No data (gust null: no live governing sensor) keeps the level and shows "no data". Missing
 *   data is never calm: the hold is cleared, because time without readings is not time below the
 *   threshold, and starts again from the first reading after data returns.
 *
 * - Chance triggers (design §2.7 v2, levelDefinition.ts): a level on a chance also rises when its
 *   estimated chance is over its trigger p (strictly: "over 20 %"), and is held while the chance
 *   stays at or above p × (1 − dead band), with the same hold time: the dead band and hold act on
 *   the chance as they act on the gust. The ladder's gust for that level still raises it too (the
 *   measured gust reaching the threshold is certain). An unknown chance never raises a level and
 *   never lets the level standing on it fall: unknown is not calm. It holds nothing else.
 *
 * A new state starts with no data (a structure shows "no data" until its first reading), so the
 * first reading produces a 'data-restored' event.
 */
import { assertTriggerGustsMps, justifiedLevel } from './justifiedLevel.ts';

export interface LevelState {
  /** 0 = calm (below every trigger), 1..n = the level reached. */
  readonly level: number;
  /** When the current level was entered, ms since the Unix epoch. */
  readonly sinceMs: number;
  /** Start of the unbroken run of readings below the current level's lowered threshold, or null. */
  readonly pendingLowerSinceMs: number | null;
  /** Highest gust (m/s) of that run, or null when no run is pending. */
  readonly pendingLowerPeakGustMps: number | null;
  /** True while no governing sensor delivers: the structure shows "no data", never "fine". */
  readonly noData: boolean;
  /** When the no-data spell began, ms since the epoch, or null while data flows. */
  readonly noDataSinceMs: number | null;
  /** Time of the last step; steps must not go back in time. Null before the first step. */
  readonly lastStepAtMs: number | null;
  /**
   * The highest level below the current one that a chance held during the pending run (0 or
   * absent: none), so that the drop stops there as it stops where the run's peak gust was.
   */
  readonly pendingLowerChanceLevel?: number;
}

/** A level on a chance trigger: the estimate now and the trigger's p. */
export interface LevelChance {
  /** The estimated chance now, 0..1, or null when it cannot be estimated (unknown is never calm). */
  readonly chance: number | null;
  /** The chance above which the level rises, 0 < p < 1. */
  readonly probability: number;
}

export interface LevelInput {
  /** Time of this reading, ms since the Unix epoch. */
  readonly nowMs: number;
  /** Governing gust at the structure in m/s, or null when no governing sensor is live. */
  readonly gustMps: number | null;
  /** Trigger gusts of levels 1..n for the structure's current assessment, m/s, ascending. */
  readonly triggerGustsMps: readonly number[];
  /** Per level 1..n (index 0 is level 1): the chance of a level on a chance trigger, null for the others. Absent: no level is on a chance. */
  readonly chances?: readonly (LevelChance | null)[];
}

export interface LevelStepParams {
  /** Fraction below a trigger the gust must fall before the hold starts; 0.10 lowers 20 m/s to 18 m/s. */
  readonly deadBandFraction: number;
  /** How long the gust must stay below the lowered threshold before the level drops, ms. */
  readonly holdTimeMs: number;
}

export type LevelEvent =
  | {
      readonly type: 'escalated' | 'de-escalated';
      readonly fromLevel: number;
      readonly toLevel: number;
      readonly atMs: number;
      readonly gustMps: number;
      /** An escalation above what the gust reached, raised by a level's chance (set only then). */
      readonly onEstimate?: true;
    }
  | { readonly type: 'no-data' | 'data-restored'; readonly atMs: number };

export interface LevelStep {
  readonly state: LevelState;
  readonly events: readonly LevelEvent[];
}

/** Design §2.6 defaults: a 10 % dead band and a 15-minute hold (our model, set per site). */
export const defaultLevelStepParams: LevelStepParams = Object.freeze({
  deadBandFraction: 0.1,
  holdTimeMs: 15 * 60 * 1000,
});

/** Upper bound of the dead band: at 1 the lowered threshold would be 0 m/s and never undercut. */
const maxDeadBandFraction = 1;

/**
 * Step parameters with the defaults filled in and checked: merge once per configuration, not per
 * reading. Throws a RangeError for a dead band outside [0, 1) or a hold time that is not a finite
 * number ≥ 0 ms.
 */
export function levelStepParams(overrides: Partial<LevelStepParams> = {}): LevelStepParams {
  const params = { ...defaultLevelStepParams, ...overrides };
  assertLevelStepParams('levelStepParams', params);
  return Object.freeze(params);
}

function assertLevelStepParams(caller: string, params: LevelStepParams): void {
  const { deadBandFraction, holdTimeMs } = params;
  if (!(deadBandFraction >= 0 && deadBandFraction < maxDeadBandFraction)) {
    throw new RangeError(`${caller}: deadBandFraction must be in [0, 1), got ${deadBandFraction}`);
  }
  if (!(Number.isFinite(holdTimeMs) && holdTimeMs >= 0)) {
    throw new RangeError(`${caller}: holdTimeMs must be a finite number ≥ 0 ms, got ${holdTimeMs}`);
  }
}

/** The state of a structure before any reading: calm level, but "no data" until a reading comes. */
export function initialLevelState(nowMs: number): LevelState {
  if (!Number.isFinite(nowMs)) {
    throw new RangeError(`initialLevelState: nowMs must be a finite time in ms since the epoch, got ${nowMs}`);
  }
  return {
    level: 0,
    sinceMs: nowMs,
    pendingLowerSinceMs: null,
    pendingLowerPeakGustMps: null,
    noData: true,
    noDataSinceMs: nowMs,
    lastStepAtMs: null,
  };
}

const noEvents: readonly LevelEvent[] = Object.freeze([]);
const noChances: readonly (LevelChance | null)[] = Object.freeze([]);

function assertChances(levelCount: number, chances: readonly (LevelChance | null)[]): void {
  if (!Array.isArray(chances) || chances.length > levelCount) {
    throw new RangeError(`stepLevel: chances must be an array of at most one entry per level (${levelCount}), got ${String(chances)}`);
  }
  chances.forEach((c, index) => {
    if (c === null || c === undefined) return;
    if (!(c.probability > 0 && c.probability < 1)) {
      throw new RangeError(`stepLevel: chances[${index}].probability must be in (0, 1), got ${c.probability}`);
    }
    if (c.chance !== null && !(c.chance >= 0 && c.chance <= 1)) {
      throw new RangeError(`stepLevel: chances[${index}].chance must be null (unknown) or in [0, 1], got ${c.chance}`);
    }
  });
}

/**
 * Advance the state machine by one reading. Returns the new state and the events it caused, in
 * order ('data-restored' comes before an escalation in the same step).
 *
 * Throws a RangeError when `nowMs` is not finite or earlier than the previous step (replays of
 * old readings belong in a fresh state), when the gust is not null and not a finite number ≥ 0,
 * when the trigger ladder is not ascending, or when the state's level is above the ladder's top
 * (after the level list is edited, the caller starts a new state).
 *
 * @example
 * let state = initialLevelState(t0);
 * ({ state } = stepLevel(state, { nowMs: t0, gustMps: 16, triggerGustsMps: [15.49, 17.89, 20] }));
 * state.level; // → 1
 */
export function stepLevel(
  state: LevelState,
  input: LevelInput,
  params: LevelStepParams = defaultLevelStepParams,
): LevelStep {
  const { nowMs, gustMps, triggerGustsMps } = input;
  const chances = input.chances ?? noChances;
  if (!Number.isFinite(nowMs)) {
    throw new RangeError(`stepLevel: nowMs must be a finite time in ms since the epoch, got ${nowMs}`);
  }
  if (state.lastStepAtMs !== null && nowMs < state.lastStepAtMs) {
    throw new RangeError(
      `stepLevel: nowMs must not be before the previous step (${state.lastStepAtMs} ms), got ${nowMs}`,
    );
  }
  if (gustMps !== null && !(Number.isFinite(gustMps) && gustMps >= 0)) {
    throw new RangeError(`stepLevel: gustMps must be null (no data) or a finite number ≥ 0 m/s, got ${gustMps}`);
  }
  assertTriggerGustsMps('stepLevel', triggerGustsMps);
  if (!(Number.isInteger(state.level) && state.level >= 0 && state.level <= triggerGustsMps.length)) {
    throw new RangeError(
      `stepLevel: state.level must be an integer in [0, ${triggerGustsMps.length}] for this ladder, got ${state.level}`,
    );
  }
  assertChances(triggerGustsMps.length, chances);
  assertLevelStepParams('stepLevel', params);

  if (gustMps === null) {
    if (state.noData) return { state: { ...state, lastStepAtMs: nowMs }, events: noEvents };
    const { pendingLowerChanceLevel: _cleared, ...kept } = state;
    return {
      state: {
        ...kept,
        pendingLowerSinceMs: null,
        pendingLowerPeakGustMps: null,
        noData: true,
        noDataSinceMs: nowMs,
        lastStepAtMs: nowMs,
      },
      events: [{ type: 'no-data', atMs: nowMs }],
    };
  }

  const events: LevelEvent[] = [];
  if (state.noData) events.push({ type: 'data-restored', atMs: nowMs });

  const { deadBandFraction, holdTimeMs } = params;
  let level = state.level;
  let sinceMs = state.sinceMs;
  let pendingSinceMs = state.pendingLowerSinceMs;
  let pendingPeakMps = state.pendingLowerPeakGustMps;

  // Levels 1..n a chance raises (over p) or holds (at or above p lowered by the band). An unknown
  // chance holds only the level that stands on it (the one the machine is at): it cannot keep a
  // lower level up, nor stop a drop, or a calm or steady wind (no fluctuation: σ unknown) would
  // hold a level the gusts no longer justify.
  const raisedByChance = (lvl: number): boolean => {
    const c = chances[lvl - 1];
    return c !== null && c !== undefined && c.chance !== null && c.chance > c.probability;
  };
  let standing = state.level;
  const heldByChance = (lvl: number): boolean => {
    const c = chances[lvl - 1];
    if (c === null || c === undefined) return false;
    return c.chance === null ? lvl === standing : c.chance >= c.probability * (1 - deadBandFraction);
  };
  /** The highest level in [from, to] a chance holds now (0 if none). */
  const highestHeldByChance = (from: number, to: number): number => {
    for (let lvl = to; lvl >= from; lvl--) if (heldByChance(lvl)) return lvl;
    return 0;
  };
  let pendingChanceLevel = state.pendingLowerChanceLevel ?? 0;

  const byGust = justifiedLevel(gustMps, triggerGustsMps);
  let reached = byGust;
  for (let lvl = triggerGustsMps.length; lvl > reached; lvl--) {
    if (raisedByChance(lvl)) {
      reached = lvl;
      break;
    }
  }
  if (reached > level) {
    events.push(reached > byGust ? { type: 'escalated', fromLevel: level, toLevel: reached, atMs: nowMs, gustMps, onEstimate: true } : { type: 'escalated', fromLevel: level, toLevel: reached, atMs: nowMs, gustMps });
    level = reached;
    sinceMs = nowMs;
    pendingSinceMs = null;
    pendingPeakMps = null;
    pendingChanceLevel = 0;
  } else if (level > 0) {
    const loweredMps = triggerGustsMps[level - 1]! * (1 - deadBandFraction);
    if (gustMps >= loweredMps || highestHeldByChance(level, triggerGustsMps.length) > 0) {
      pendingSinceMs = null;
      pendingPeakMps = null;
      pendingChanceLevel = 0;
    } else {
      if (pendingSinceMs === null || pendingPeakMps === null) {
        pendingSinceMs = nowMs;
        pendingPeakMps = gustMps;
        pendingChanceLevel = 0;
      } else if (gustMps > pendingPeakMps) {
        pendingPeakMps = gustMps;
      }
      pendingChanceLevel = Math.max(pendingChanceLevel, highestHeldByChance(1, level - 1));
      if (nowMs - pendingSinceMs >= holdTimeMs) {
        let target = level - 1;
        while (target > pendingChanceLevel && pendingPeakMps < triggerGustsMps[target - 1]! * (1 - deadBandFraction)) target--;
        events.push({ type: 'de-escalated', fromLevel: level, toLevel: target, atMs: nowMs, gustMps });
        level = target;
        standing = target;
        sinceMs = nowMs;
        // The lower level runs its own hold from now if this reading is already below its band.
        if (target > 0 && gustMps < triggerGustsMps[target - 1]! * (1 - deadBandFraction) && highestHeldByChance(target, triggerGustsMps.length) === 0) {
          pendingSinceMs = nowMs;
          pendingPeakMps = gustMps;
          pendingChanceLevel = highestHeldByChance(1, target - 1);
        } else {
          pendingSinceMs = null;
          pendingPeakMps = null;
          pendingChanceLevel = 0;
        }
      }
    }
  }

  return {
    state: {
      level,
      sinceMs,
      pendingLowerSinceMs: pendingSinceMs,
      pendingLowerPeakGustMps: pendingPeakMps,
      noData: false,
      noDataSinceMs: null,
      lastStepAtMs: nowMs,
      ...(pendingChanceLevel > 0 ? { pendingLowerChanceLevel: pendingChanceLevel } : {}),
    },
    events: events.length === 0 ? noEvents : events,
  };
}
