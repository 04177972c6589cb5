/**
 * The chance trigger (design §2.7 v2, issue 17): a level that rises when the estimated chance that
 * the gust at the structure reaches a fraction of its capacity within T minutes is over p, with the
 * dead band and hold time acting on the chance as they act on the gust (design §2.6).
 *
 * Sources: the chance is Rice's expected up-crossing count N = ν·T·exp(−(x − U)²/(2σ²)),
 * P = 1 − e^(−N) (S. O. Rice, Bell System Technical Journal 23–24, 1944–45; A. G. Davenport,
 * Proc. ICE 28, 1964, for wind), worked by hand below with Math.exp only. The threshold x is the gust
 * at that fraction of the limit, x = v_lim·√f, because every utilization is proportional to the
 * dynamic pressure ½ρv² (EN 1991-1-4 §5.3, F = c_f·q·A). "Over 20 %" is read strictly, the hold and
 * dead band are our own model (design §2.6, common practice for staged wind plans).
 */
import { describe, expect, it } from 'vitest';
import { initialLevelState, levelListSchema, stepLevel, type LevelChance, type LevelState, type LevelStepParams } from '../../../server/levels/index.ts';
import { levelProblems, triggerLadderMps } from '../../../server/levels/index.ts';
import { levelChances, structureForesight, type ForesightView } from '../../../server/watch/structureForesight.ts';

const minuteMs = 60_000;
const t0 = Date.UTC(2026, 5, 20, 14, 0, 0);
const params: LevelStepParams = { deadBandFraction: 0.1, holdTimeMs: 15 * minuteMs };
/** Level 1 on a chance (p = 20 %), levels 2 and 3 on gusts: the ladder's gust for level 1 is 13.9 m/s. */
const ladder = [13.9, 14, 17];
const chanceAt = (chance: number | null): Array<LevelChance | null> => [{ chance, probability: 0.2 }, null, null];

function run(steps: Array<{ atMin: number; gust: number; chance: number | null }>, start: LevelState = initialLevelState(t0)): LevelState[] {
  const states: LevelState[] = [];
  let state = start;
  for (const s of steps) {
    ({ state } = stepLevel(state, { nowMs: t0 + s.atMin * minuteMs, gustMps: s.gust, triggerGustsMps: ladder, chances: chanceAt(s.chance) }, params));
    states.push(state);
  }
  return states;
}

describe('chance trigger: the schema', () => {
  const level = (trigger: unknown) => [{ label: 'Prepare', trigger, actionText: 'Bring the ballast trolley.' }];
  it('takes a fraction of capacity, whole minutes 1–180 and a chance strictly between 0 and 1', () => {
    expect(levelListSchema.safeParse(level({ kind: 'chance', fraction: 1, withinMinutes: 30, probability: 0.2 })).success).toBe(true);
    for (const bad of [
      { kind: 'chance', fraction: 1, withinMinutes: 30, probability: 0 },
      { kind: 'chance', fraction: 1, withinMinutes: 30, probability: 1 },
      { kind: 'chance', fraction: 1, withinMinutes: 0, probability: 0.2 },
      { kind: 'chance', fraction: 1, withinMinutes: 181, probability: 0.2 },
      { kind: 'chance', fraction: 1, withinMinutes: 12.5, probability: 0.2 },
      { kind: 'chance', fraction: 1.2, withinMinutes: 30, probability: 0.2 },
      { kind: 'chance', fraction: 1, withinMinutes: 30, probability: 0.2, extra: 1 },
    ]) {
      const parsed = levelListSchema.safeParse(level(bad));
      expect(parsed.success, JSON.stringify(bad)).toBe(false);
    }
  });
  it('names the offending field', () => {
    const parsed = levelListSchema.safeParse(level({ kind: 'chance', fraction: 1, withinMinutes: 400, probability: 2 }));
    expect(parsed.success).toBe(false);
    const paths = parsed.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['0.trigger.withinMinutes', '0.trigger.probability']));
  });
});

describe('chance trigger: order against the structure', () => {
  const plan = [
    { label: 'Prepare', trigger: { kind: 'chance' as const, fraction: 1, withinMinutes: 30, probability: 0.2 }, actionText: '' },
    { label: 'Lower', trigger: { kind: 'utilization' as const, fraction: 0.8 }, actionText: '' },
    { label: 'Clear', trigger: { kind: 'utilization' as const, fraction: 1 }, actionText: '' },
  ];
  it('accepts a chance of the limit before a level at 80 % (it sets no floor for the levels above)', () => {
    expect(levelProblems(plan, 20)).toEqual([]);
  });
  it('gives the chance level a ladder gust just below the next level, so the gust alone raises it no later', () => {
    // Limit 20 m/s: 80 % of capacity at 20·√0.8 = 17.889 m/s; the chance level's own threshold (20) is lowered to 17.889 × 0.999.
    const l = triggerLadderMps(plan, 20);
    expect(l[1]).toBeCloseTo(17.8885, 3);
    expect(l[0]).toBeCloseTo(17.8885 * 0.999, 3);
    expect(l[2]).toBeCloseTo(20, 6);
  });
  it('refuses a chance level watching a fraction at or below the trigger of a level below it', () => {
    const bad = [plan[1]!, { ...plan[0]!, trigger: { kind: 'chance' as const, fraction: 0.5, withinMinutes: 30, probability: 0.2 } }];
    const problems = levelProblems(bad, 20);
    expect(problems).toHaveLength(1);
    expect(problems[0]!.index).toBe(1);
    expect(problems[0]!.message).toMatch(/watches the chance of 50 % of capacity \(14\.1 m\/s/);
  });
  it('orders fractions against an unbounded limit as the ladder does, instead of refusing them as tied at Infinity', () => {
    // Review case: a structure no wind can overturn or slide in the model has limit Infinity; the ladder
    // takes 120 m/s (the plausible range, design §3), 120·√0.5 = 84.85 < 120·√0.8 = 107.33 m/s, yet the
    // check compared Infinity with Infinity and refused both a chance level and a utilization level.
    for (const second of [{ kind: 'chance' as const, fraction: 0.8, withinMinutes: 30, probability: 0.2 }, { kind: 'utilization' as const, fraction: 0.8 }]) {
      const levels = [{ label: 'Prepare', trigger: { kind: 'utilization' as const, fraction: 0.5 }, actionText: '' }, { label: 'Clear', trigger: second, actionText: '' }];
      expect(levelProblems(levels, Infinity)).toEqual([]);
      const l = triggerLadderMps(levels, Infinity);
      expect(l[0]!).toBeCloseTo(84.853, 2);
      expect(l[1]!).toBeCloseTo(107.331, 2);
    }
    // Still refused when out of order: 120·√0.4 = 75.9 m/s is not above 84.85 m/s.
    expect(levelProblems([{ label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: '' }, { label: 'Clear', trigger: { kind: 'chance', fraction: 0.4, withinMinutes: 30, probability: 0.2 }, actionText: '' }], Infinity)).toHaveLength(1);
  });
  it('a plan the checks accept gives a ladder the level machine takes, even with triggers under the 0.01 m/s floor', () => {
    // Review case: gust triggers 0.004 and 0.008 m/s (the schema takes any gust > 0) and a chance on a
    // fraction of 1e-8 (20·√1e-8 = 0.002 m/s) were both floored to 0.01, a ladder [0.01, 0.01] that
    // stepLevel refuses (it must rise strictly, design §2.6), so every reading of the structure threw.
    const tiny = [
      [{ label: 'A', trigger: { kind: 'gust' as const, gustMps: 0.004 }, actionText: '' }, { label: 'B', trigger: { kind: 'gust' as const, gustMps: 0.008 }, actionText: '' }],
      [{ label: 'A', trigger: { kind: 'chance' as const, fraction: 1e-8, withinMinutes: 30, probability: 0.2 }, actionText: '' }, { label: 'B', trigger: { kind: 'utilization' as const, fraction: 2e-8 }, actionText: '' }],
    ];
    for (const levels of tiny) {
      expect(levelListSchema.safeParse(levels).success).toBe(true);
      expect(levelProblems(levels, 20)).toEqual([]);
      const l = triggerLadderMps(levels, 20);
      expect(l[0]!).toBeLessThan(l[1]!);
      expect(() => stepLevel(initialLevelState(t0), { nowMs: t0, gustMps: 5, triggerGustsMps: l }, params)).not.toThrow();
    }
    // A limit of 0 (engine/utilization.ts: an unbounded utilization, the structure past its limit in
    // still air, e.g. in one sector of a directional assessment) put every fraction level at 0.01 m/s.
    const atZero = triggerLadderMps(plan, 0);
    expect(atZero[0]!).toBeLessThan(atZero[1]!);
    expect(atZero[1]!).toBeLessThan(atZero[2]!);
    expect(() => stepLevel(initialLevelState(t0), { nowMs: t0, gustMps: 5, triggerGustsMps: atZero }, params)).not.toThrow();
  });
});

describe('chance trigger: the level machine', () => {
  it('rises when the chance is over p (strictly), not at p', () => {
    const states = run([
      { atMin: 0, gust: 8, chance: 0.2 },
      { atMin: 1, gust: 8, chance: 0.21 },
    ]);
    expect(states.map((s) => s.level)).toEqual([0, 1]);
  });

  it('an unknown chance holds only the level standing on it: not a lower one in a steady calm (review case)', () => {
    // Ladder [13.9, 14, 17] with level 3 on a chance (p 20 %), levels 1 and 2 on gusts: a gust of 14.2 raises level 2,
    // then a steady calm (σ unknown: no fluctuation) for 4 hours. Level 2 falls after the 15-min hold, as on gusts alone.
    const chances = (c: number | null): Array<LevelChance | null> => [null, null, { chance: c, probability: 0.2 }];
    let state = initialLevelState(t0);
    ({ state } = stepLevel(state, { nowMs: t0, gustMps: 14.2, triggerGustsMps: ladder, chances: chances(0.01) }, params));
    expect(state.level).toBe(2);
    for (let m = 1; m <= 240; m++) ({ state } = stepLevel(state, { nowMs: t0 + m * minuteMs, gustMps: 0, triggerGustsMps: ladder, chances: chances(null) }, params));
    expect(state.level).toBe(0);
  });

  it('an unknown chance never raises a level, and never lets one fall', () => {
    const states = run([
      { atMin: 0, gust: 8, chance: null },
      { atMin: 1, gust: 8, chance: 0.5 },
      { atMin: 2, gust: 8, chance: null },
      { atMin: 40, gust: 8, chance: null },
    ]);
    expect(states.map((s) => s.level)).toEqual([0, 1, 1, 1]);
  });

  it('the measured gust at the ladder gust raises it too, whatever the chance', () => {
    expect(run([{ atMin: 0, gust: 13.9, chance: 0 }]).map((s) => s.level)).toEqual([1]);
  });

  it('holds while the chance stays at or above p × (1 − dead band) = 18 %, falls after 15 min under it', () => {
    const states = run([
      { atMin: 0, gust: 8, chance: 0.3 }, // rises
      { atMin: 1, gust: 8, chance: 0.185 }, // in the band: held
      { atMin: 20, gust: 8, chance: 0.185 }, // still held after 19 min in the band
      { atMin: 21, gust: 8, chance: 0.1 }, // the hold starts
      { atMin: 30, gust: 8, chance: 0.181 }, // back in the band (0.2 × 0.9 is 0.18000000000000002 in binary): restarts
      { atMin: 31, gust: 8, chance: 0.05 }, // starts again
      { atMin: 45, gust: 8, chance: 0.05 }, // 14 min: not yet
      { atMin: 46, gust: 8, chance: 0.05 }, // 15 min: falls to calm
    ]);
    expect(states.map((s) => s.level)).toEqual([1, 1, 1, 1, 1, 1, 1, 0]);
    expect(states[3]!.pendingLowerSinceMs).toBe(t0 + 21 * minuteMs);
    expect(states[4]!.pendingLowerSinceMs).toBeNull();
  });

  it('a drop from a gust level stops at the chance level when its chance held during the hold', () => {
    const states = run([
      { atMin: 0, gust: 14.5, chance: 0.1 }, // gust level 2
      { atMin: 1, gust: 9, chance: 0.19 }, // under level 2's band (12.6); level 1's chance in its band
      { atMin: 8, gust: 9, chance: 0.05 },
      { atMin: 16, gust: 9, chance: 0.05 }, // 15 min since minute 1: drops, to level 1 (its chance held at minute 1)
    ]);
    expect(states.map((s) => s.level)).toEqual([2, 2, 2, 1]);
    // Without that chance the same gusts drop to calm.
    const calm = run([
      { atMin: 0, gust: 14.5, chance: 0.1 },
      { atMin: 1, gust: 9, chance: 0.05 },
      { atMin: 8, gust: 9, chance: 0.05 },
      { atMin: 16, gust: 9, chance: 0.05 },
    ]);
    expect(calm.map((s) => s.level)).toEqual([2, 2, 2, 0]);
  });

  it('with no level on a chance, gives exactly what the gust ladder alone gives (1,000 seeded steps)', () => {
    let seed = 12345;
    const next = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    let a = initialLevelState(t0);
    let b = initialLevelState(t0);
    const gustLadder = [10, 14, 17];
    for (let i = 0; i < 1000; i++) {
      const input = { nowMs: t0 + i * 20_000, gustMps: next() < 0.02 ? null : 6 + next() * 14, triggerGustsMps: gustLadder };
      const ra = stepLevel(a, input, params);
      const rb = stepLevel(b, { ...input, chances: [null, null, null] }, params);
      expect(rb.events).toEqual(ra.events);
      a = ra.state;
      b = rb.state;
      expect(b.level).toBe(a.level);
    }
  });

  it('refuses chances that are not a chance', () => {
    expect(() => stepLevel(initialLevelState(t0), { nowMs: t0, gustMps: 5, triggerGustsMps: ladder, chances: [{ chance: 1.5, probability: 0.2 }] }, params)).toThrow(/chance must be null/);
    expect(() => stepLevel(initialLevelState(t0), { nowMs: t0, gustMps: 5, triggerGustsMps: ladder, chances: [{ chance: 0.1, probability: 0 }] }, params)).toThrow(/probability must be in/);
  });
});

describe('chance trigger: the estimate the watch feeds it', () => {
  const levels = [
    { label: 'Prepare', trigger: { kind: 'chance', fraction: 0.5, withinMinutes: 30, probability: 0.2 } },
    { label: 'Clear', trigger: { kind: 'utilization', fraction: 1 } },
  ];
  const statistics = { status: 'known' as const, source: 'samples' as const, meanMps: 10, sigmaMps: 1.5, upcrossingRateHz: 0.05, upcrossingRateSource: 'counted' as const, peakMps: 14, sampleCount: 600, observedS: 600, upcrossings: 30 };
  it('is Rice’s chance of the gust reaching v_lim·√f within T', () => {
    const f = structureForesight({ sensorKey: 'mast', statistics, heightFactor: 1, means: { atMs: [], meanMps: [] }, gustFactor: 1.4, level: 0, levels, triggerGustsMps: [14.13, 20], limitGustMps: 20, nowMs: t0 }) as ForesightView;
    // x = 20·√0.5 = 14.1421 m/s; N = 0.05 · 1800 · exp(−(4.1421)²/(2·1.5²)) = 90 · exp(−3.81274) = 90 · 0.0220943 = 1.98849; P = 1 − e^−1.98849 = 0.863061.
    expect(f.triggerChances).toHaveLength(1);
    expect(f.triggerChances[0]!.level).toBe(1);
    expect(f.triggerChances[0]!.thresholdGustMps).toBeCloseTo(14.1421, 3);
    expect(f.triggerChances[0]!.chance).toBeCloseTo(0.863061, 4);
    const hand = 1 - Math.exp(-0.05 * 1800 * Math.exp(-((20 * Math.SQRT1_2 - 10) ** 2) / (2 * 1.5 ** 2)));
    expect(f.triggerChances[0]!.chance).toBeCloseTo(hand, 9);
    // Fed to the level machine while fresh; unknown once older than 30 s or when unknown.
    expect(levelChances(levels, f, t0, t0 + 10_000)).toEqual([{ chance: f.triggerChances[0]!.chance, probability: 0.2 }, null]);
    expect(levelChances(levels, f, t0, t0 + 31_000)).toEqual([{ chance: null, probability: 0.2 }, null]);
    expect(levelChances(levels, { estimate: true, unknown: 'mast: too-few-samples' }, t0, t0)).toEqual([{ chance: null, probability: 0.2 }, null]);
    expect(levelChances([levels[1]!], f, t0, t0)).toBeUndefined();
  });
});

describe('chance trigger: the forecast check', () => {
  it('predicts a level on a chance from the hour’s mean and gust (σ through Davenport’s peak factor), and a gust-only hour from its gust with the in-land gust factor', async () => {
    const { predictLevels } = await import('../../../server/foresight/index.ts');
    // Limit 20 m/s; level 1 watches 56.25 % of capacity: x = 20·√0.5625 = 15 m/s within 30 min, p = 20 %.
    const structure = { id: 'quay-banner', triggerGustsMps: [15, 17.89, 20], heightFactor: 1, chanceTriggers: [{ level: 1, thresholdGustMps: 15, withinMinutes: 30, probability: 0.2 }] };
    const rows = [
      { timeMs: t0, meanMps: 10, gustMps: 14.5 },
      { timeMs: t0 + 3_600_000, meanMps: null, gustMps: 14.5 },
    ];
    const [withMean, gustOnly] = predictLevels(rows, [structure]);
    // By hand: ν = 0.1 Hz (the stated default for summaries), T₀ = 600 s, νT₀ = 60: g = √(2 ln 60) + 0.5772/√(2 ln 60) = 3.06330;
    // σ = (14.5 − 10)/3.06330 = 1.46900; N = 0.1 · 1800 · exp(−25/(2 · 1.46900²)) = 180 · 0.0030501 = 0.54902; P = 1 − e^−0.54902 = 0.4225 > 20 %.
    const g = Math.sqrt(2 * Math.log(60)) + 0.5772 / Math.sqrt(2 * Math.log(60));
    const sigma = 4.5 / g;
    const p = 1 - Math.exp(-180 * Math.exp(-25 / (2 * sigma * sigma)));
    expect(p).toBeCloseTo(0.4225, 3);
    expect(withMean!.levels[0]!.level).toBe(1);
    // An hour with a gust and no mean takes U = gust / 1.66 (the in-land gust factor, Harper,
    // Kepert & Ginger 2010, WMO/TD-No. 1555) = 8.7349: σ = (14.5 − 8.7349)/3.06330 = 1.88206,
    // N = 180 · exp(−(15 − 8.7349)²/(2 · 1.88206²)) = 180 · exp(−5.5406) = 0.7063, P = 0.5066 > 20 %
    // (the review's case: leaving it to the gust, 14.5 < 15, predicted calm).
    const u = 14.5 / 1.66;
    const s2 = (14.5 - u) / g;
    expect(1 - Math.exp(-180 * Math.exp(-((15 - u) ** 2) / (2 * s2 * s2)))).toBeCloseTo(0.5066, 3);
    expect(gustOnly!.levels[0]!.level).toBe(1);
    expect(predictLevels([rows[0]!], [{ ...structure, chanceTriggers: [] }])[0]!.levels[0]!.level).toBe(0);
    // A higher p than the chance: not predicted.
    expect(predictLevels([rows[0]!], [{ ...structure, chanceTriggers: [{ ...structure.chanceTriggers[0]!, probability: 0.5 }] }])[0]!.levels[0]!.level).toBe(0);
  });
  it('predicts a level on a chance whose threshold is at or below the hour’s mean, also when the gust gives no σ', async () => {
    const { predictLevels } = await import('../../../server/foresight/index.ts');
    // Review case: an hour of mean 15 m/s and gust 14 m/s (a gust not above its mean gives no σ,
    // summaryStatistics.ts) against a threshold of 14.5 m/s: Rice's P = 1 when x ≤ U (issue 17's
    // formula; S. O. Rice 1944–45) raises the level, where the gust alone (14 < 14.5) does not.
    const structure = { id: 'quay-banner', triggerGustsMps: [14.5, 17.89, 20], heightFactor: 1, chanceTriggers: [{ level: 1, thresholdGustMps: 14.5, withinMinutes: 30, probability: 0.2 }] };
    const row = { timeMs: t0, meanMps: 15, gustMps: 14 };
    expect(predictLevels([row], [{ ...structure, chanceTriggers: [] }])[0]!.levels[0]!.level).toBe(0);
    expect(predictLevels([row], [structure])[0]!.levels[0]!.level).toBe(1);
    // Moved by the height factor as the gust is: at 0.9, U = 13.5 m/s at the structure, below x; no σ, so the ladder decides (12.6 < 14.5).
    expect(predictLevels([row], [{ ...structure, heightFactor: 0.9 }])[0]!.levels[0]!.level).toBe(0);
  });
});
