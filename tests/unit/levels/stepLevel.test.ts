/**
 * The rules checked here (escalate at once, dead band, hold time, no data kept, never calm) are
 * our own model from design.md §2.6; the 60 %/80 % triggers follow the Cardiff Council Bute Park
 * event organisers' guide (2020); the 10 % band and 15-minute hold are design defaults.
 */
import { describe, expect, it } from 'vitest';
import {
  defaultLevelStepParams,
  gustAtFractionWithoutUpliftMps,
  initialLevelState,
  levelStepParams,
  stepLevel,
  type LevelEvent,
  type LevelState,
  type LevelStepParams,
} from '../../../server/levels/index.ts';

const minuteMs = 60_000;
const t0 = Date.UTC(2026, 5, 13, 14, 0); // an invented afternoon at a showground

/** Staged triggers of a structure with a 20 m/s limit and no uplift: 60 %, 80 %, 100 % of load. */
const ladderMps = [0.6, 0.8, 1].map((fraction) => gustAtFractionWithoutUpliftMps(20, fraction));
const [watchMps, prepareMps, clearMps] = ladderMps as [number, number, number];

type Reading = readonly [offsetMs: number, gustMps: number | null];

/** Feeds readings (time offset from t0, gust) through the machine; returns every state and event. */
function run(readings: readonly Reading[], params: LevelStepParams = defaultLevelStepParams, start?: LevelState) {
  let state = start ?? initialLevelState(t0);
  const states: LevelState[] = [];
  const events: LevelEvent[] = [];
  for (const [offsetMs, gustMps] of readings) {
    const step = stepLevel(state, { nowMs: t0 + offsetMs, gustMps, triggerGustsMps: ladderMps }, params);
    state = step.state;
    states.push(state);
    events.push(...step.events);
  }
  return { state, states, events, levels: states.map((s) => s.level) };
}

/** A reading every `everyMs` from `fromMs` (inclusive) to `toMs` (inclusive) at `gustMps`. */
function steady(fromMs: number, toMs: number, everyMs: number, gustMps: number | null): Reading[] {
  const readings: Reading[] = [];
  for (let at = fromMs; at <= toMs; at += everyMs) readings.push([at, gustMps]);
  return readings;
}

const changes = (events: readonly LevelEvent[]) =>
  events.filter((e) => e.type === 'escalated' || e.type === 'de-escalated');

describe('staged triggers of a 20 m/s limit', () => {
  it('are 15.49, 17.89 and 20 m/s (references.md §9: limit·√fraction)', () => {
    expect(watchMps).toBeCloseTo(15.49, 2);
    expect(prepareMps).toBeCloseTo(17.89, 2);
    expect(clearMps).toBe(20);
  });
});

describe('defaults', () => {
  it('are a 10 % dead band and a 15-minute hold (design.md §2.6)', () => {
    expect(defaultLevelStepParams).toEqual({ deadBandFraction: 0.1, holdTimeMs: 15 * minuteMs });
    expect(levelStepParams()).toEqual(defaultLevelStepParams);
    expect(levelStepParams({ holdTimeMs: 5 * minuteMs })).toEqual({ deadBandFraction: 0.1, holdTimeMs: 5 * minuteMs });
  });

  it('refuse a dead band outside [0, 1) or a negative hold', () => {
    expect(() => levelStepParams({ deadBandFraction: 1 })).toThrow(/deadBandFraction.*\[0, 1\).*got 1/);
    expect(() => levelStepParams({ deadBandFraction: -0.1 })).toThrow(RangeError);
    expect(() => levelStepParams({ holdTimeMs: -1 })).toThrow(/holdTimeMs.*got -1/);
    expect(() => levelStepParams({ holdTimeMs: Number.NaN })).toThrow(RangeError);
  });
});

describe('a new structure', () => {
  it('shows no data until its first reading: missing data is never calm', () => {
    const state = initialLevelState(t0);
    expect(state.noData).toBe(true);
    expect(state.level).toBe(0);
  });

  it('reports the first reading as data restored', () => {
    const { events, state } = run([[0, 3]]);
    expect(events).toEqual([{ type: 'data-restored', atMs: t0 }]);
    expect(state.noData).toBe(false);
    expect(state.level).toBe(0);
  });
});

describe('escalation', () => {
  it('happens when the gust equals the trigger exactly', () => {
    const { levels, events } = run([[0, 10], [1000, watchMps]]);
    expect(levels).toEqual([0, 1]);
    expect(changes(events)).toEqual([{ type: 'escalated', fromLevel: 0, toLevel: 1, atMs: t0 + 1000, gustMps: watchMps }]);
  });

  it('does not happen just below the trigger', () => {
    const { levels, events } = run([[0, 10], [1000, watchMps - 0.001], [2000, prepareMps - 0.001]]);
    expect(levels).toEqual([0, 0, 1]);
    expect(changes(events).map((e) => e.type === 'escalated' && e.toLevel)).toEqual([1]);
  });

  it('jumps several levels in one event when a gust reaches a high trigger at once', () => {
    const { levels, events } = run([[0, 8], [1000, 21]]);
    expect(levels).toEqual([0, 3]);
    expect(changes(events)).toEqual([{ type: 'escalated', fromLevel: 0, toLevel: 3, atMs: t0 + 1000, gustMps: 21 }]);
  });

  it('is immediate even while a de-escalation hold is running', () => {
    const { levels, state } = run([[0, 18.5], [minuteMs, 10], [2 * minuteMs, 20.2]]);
    expect(levels).toEqual([2, 2, 3]);
    expect(state.pendingLowerSinceMs).toBeNull();
  });

  it('puts data-restored before the escalation of the same reading', () => {
    const { events } = run([[0, 19]]);
    expect(events.map((e) => e.type)).toEqual(['data-restored', 'escalated']);
  });
});

describe('dead band', () => {
  it('keeps the level while the gust stays between the lowered threshold and the trigger, however long', () => {
    // Level 3 trigger 20 m/s, lowered threshold 18 m/s: 18.5 m/s for an hour starts no hold.
    const { state, events } = run([[0, 20], ...steady(10_000, 60 * minuteMs, 10_000, 18.5)]);
    expect(state.level).toBe(3);
    expect(state.pendingLowerSinceMs).toBeNull();
    expect(changes(events)).toHaveLength(1);
  });

  it('counts a gust exactly at the lowered threshold as not below it', () => {
    const { state } = run([[0, 20], ...steady(10_000, 30 * minuteMs, 10_000, clearMps * 0.9)]);
    expect(state.level).toBe(3);
  });
});

describe('hold time', () => {
  it('lowers the level exactly when the gust has been below the lowered threshold for the hold time', () => {
    const belowFromMs = minuteMs;
    const { states, events } = run([
      [0, 20],
      [belowFromMs, 17],
      [belowFromMs + 15 * minuteMs - 1, 17],
      [belowFromMs + 15 * minuteMs, 17],
    ]);
    expect(states.map((s) => s.level)).toEqual([3, 3, 3, 2]);
    expect(states[1]!.pendingLowerSinceMs).toBe(t0 + belowFromMs);
    expect(changes(events).at(-1)).toEqual({
      type: 'de-escalated',
      fromLevel: 3,
      toLevel: 2,
      atMs: t0 + belowFromMs + 15 * minuteMs,
      gustMps: 17,
    });
  });

  it('restarts when a reading comes back inside the dead band', () => {
    const { states } = run([
      [0, 20],
      [minuteMs, 12], // hold starts
      [10 * minuteMs, 18.5], // inside the band of level 3: hold cleared
      [11 * minuteMs, 12], // hold starts again
      [16 * minuteMs, 12], // 15 min after the first start: not yet
      [26 * minuteMs - 1, 12],
      [26 * minuteMs, 12], // 15 min after the restart
    ]);
    expect(states.map((s) => s.level)).toEqual([3, 3, 3, 3, 3, 3, 0]);
    expect(states[2]!.pendingLowerSinceMs).toBeNull();
    expect(states[3]!.pendingLowerSinceMs).toBe(t0 + 11 * minuteMs);
  });

  it('drops straight to the level the gust justifies when it fell well below every band', () => {
    // 5 m/s is below 0.9 × 15.49 = 13.94 m/s, so nothing holds the structure above calm.
    const { levels, events } = run([[0, 21], ...steady(minuteMs, 16 * minuteMs, minuteMs, 5)]);
    expect(levels.at(-1)).toBe(0);
    expect(changes(events).at(-1)).toMatchObject({ type: 'de-escalated', fromLevel: 3, toLevel: 0 });
  });

  it('stops at the level whose band the strongest gust of the hold still reached, then runs that level’s own hold', () => {
    // 16.5 m/s is below level 3's threshold (18) but inside level 2's band (16.10..17.89).
    const { states, events } = run([
      [0, 21],
      [minuteMs, 5],
      [8 * minuteMs, 16.5],
      [15 * minuteMs, 5],
      [16 * minuteMs, 5], // hold of level 3 complete
      [31 * minuteMs - 1, 5],
      [31 * minuteMs, 5], // hold of level 2, from the drop, complete
    ]);
    expect(states.map((s) => s.level)).toEqual([3, 3, 3, 3, 2, 2, 0]);
    expect(changes(events).slice(1).map((e) => e.type === 'de-escalated' && [e.fromLevel, e.toLevel])).toEqual([
      [3, 2],
      [2, 0],
    ]);
  });

  it('uses the competent person’s settings when given', () => {
    const params = levelStepParams({ deadBandFraction: 0.2, holdTimeMs: 5 * minuteMs });
    // Level 1: trigger 15.49, lowered threshold 12.39 with a 20 % band.
    const { levels } = run([[0, 16], [minuteMs, 13], [2 * minuteMs, 12], [7 * minuteMs, 12]], params);
    expect(levels).toEqual([1, 1, 1, 0]);
  });
});

describe('no flapping', () => {
  // A gust hovering around the watch trigger: 15.6 / 15.3 m/s every 10 s for two hours.
  const hovering = Array.from({ length: 720 }, (_, i): Reading => [i * 10_000, i % 2 === 0 ? 15.6 : 15.3]);

  it('a gust oscillating around a trigger raises the level once and never lowers it', () => {
    const { events, state } = run(hovering);
    expect(changes(events)).toHaveLength(1);
    expect(state.level).toBe(1);
  });

  it('without dead band and hold the same series would flap on every reading (what the band and hold prevent)', () => {
    const { events } = run(hovering, levelStepParams({ deadBandFraction: 0, holdTimeMs: 0 }));
    // 720 readings, each alternately above and below the trigger: every one changes the level.
    expect(changes(events).length).toBe(hovering.length);
  });

  it('a gust oscillating around the lowered threshold keeps restarting the hold and never lowers the level', () => {
    // Lowered threshold of level 1: 0.9 × 15.49 = 13.94 m/s.
    const around = Array.from({ length: 720 }, (_, i): Reading => [(i + 1) * 10_000, i % 2 === 0 ? 13.8 : 14.1]);
    const { events, state } = run([[0, 16], ...around]);
    expect(changes(events)).toHaveLength(1);
    expect(state.level).toBe(1);
  });
});

describe('no data', () => {
  it('keeps the level, shows no data and raises one no-data event', () => {
    const { state, events, states } = run([[0, 18.5], ...steady(minuteMs, 60 * minuteMs, minuteMs, null)]);
    expect(states.every((s) => s.level === 2)).toBe(true);
    expect(state.noData).toBe(true);
    expect(state.noDataSinceMs).toBe(t0 + minuteMs);
    expect(events.filter((e) => e.type === 'no-data')).toEqual([{ type: 'no-data', atMs: t0 + minuteMs }]);
  });

  it('does not count time without data as time below the threshold', () => {
    const { states, events } = run([
      [0, 18.5], // level 2
      [minuteMs, 5], // hold starts
      [10 * minuteMs, null], // no data for 20 minutes: hold dropped
      [30 * minuteMs, 5], // data restored: hold starts again
      [44 * minuteMs, 5],
      [45 * minuteMs, 5],
    ]);
    expect(states.map((s) => s.level)).toEqual([2, 2, 2, 2, 2, 0]);
    expect(states[2]!.pendingLowerSinceMs).toBeNull();
    expect(states[3]!.pendingLowerSinceMs).toBe(t0 + 30 * minuteMs);
    expect(events.map((e) => e.type)).toEqual(['data-restored', 'escalated', 'no-data', 'data-restored', 'de-escalated']);
  });

  it('ends with data-restored, and a restoring reading above a trigger escalates at once', () => {
    const { events, state } = run([[0, 10], [minuteMs, null], [2 * minuteMs, null], [3 * minuteMs, 20.5]]);
    expect(events.slice(1)).toEqual([
      { type: 'no-data', atMs: t0 + minuteMs },
      { type: 'data-restored', atMs: t0 + 3 * minuteMs },
      { type: 'escalated', fromLevel: 0, toLevel: 3, atMs: t0 + 3 * minuteMs, gustMps: 20.5 },
    ]);
    expect(state.noData).toBe(false);
    expect(state.noDataSinceMs).toBeNull();
  });
});

describe('input checks', () => {
  const state = initialLevelState(t0);
  const input = { nowMs: t0, gustMps: 10, triggerGustsMps: ladderMps };

  it('refuse a gust that is NaN, infinite or negative (null is the only way to say no data)', () => {
    expect(() => stepLevel(state, { ...input, gustMps: Number.NaN })).toThrow(/gustMps.*got NaN/);
    expect(() => stepLevel(state, { ...input, gustMps: Number.POSITIVE_INFINITY })).toThrow(RangeError);
    expect(() => stepLevel(state, { ...input, gustMps: -1 })).toThrow(RangeError);
  });

  it('refuse a step back in time', () => {
    const { state: later } = stepLevel(state, { ...input, nowMs: t0 + 1000 });
    expect(() => stepLevel(later, { ...input, nowMs: t0 })).toThrow(/nowMs.*previous step/);
    expect(() => stepLevel(later, { ...input, nowMs: t0 + 1000 })).not.toThrow();
  });

  it('refuse triggers that do not rise strictly, and a level the ladder does not have', () => {
    expect(() => stepLevel(state, { ...input, triggerGustsMps: [15, 15, 20] })).toThrow(/triggerGustsMps\[1\]/);
    expect(() => stepLevel(state, { ...input, triggerGustsMps: [] })).toThrow(RangeError);
    const atThree = { ...state, level: 3 };
    expect(() => stepLevel(atThree, { ...input, triggerGustsMps: [15, 18] })).toThrow(/state\.level.*\[0, 2\].*got 3/);
  });

  it('refuse bad parameters passed directly', () => {
    expect(() => stepLevel(state, input, { deadBandFraction: 1.2, holdTimeMs: 0 })).toThrow(/deadBandFraction/);
  });
});
