import { describe, expect, it } from 'vitest';
import { validateStructureRecord } from '../../../server/engine/index.ts';
import {
  checkLevelOrder,
  gustAtFractionWithoutUpliftMps,
  levelListSchema,
  siteDefaultLevels,
  type LevelDefinition,
} from '../../../server/levels/index.ts';

const level = (label: string, trigger: LevelDefinition['trigger'], actionText = 'Do the thing.'): LevelDefinition => ({
  label,
  trigger,
  actionText,
});

describe('site default levels', () => {
  it('are Watch, Prepare and Stop and clear, in that order (our names)', () => {
    expect(siteDefaultLevels.map((l) => l.label)).toEqual(['Watch', 'Prepare', 'Stop and clear']);
  });

  it('watch at 60 % and prepare at 80 % of load capacity (Cardiff Council, Bute Park event organisers guide, 2020)', () => {
    expect(siteDefaultLevels[0]!.trigger).toEqual({ kind: 'utilization', fraction: 0.6 });
    expect(siteDefaultLevels[1]!.trigger).toEqual({ kind: 'utilization', fraction: 0.8 });
  });

  it('stop and clear at 100 % of load capacity (common practice)', () => {
    expect(siteDefaultLevels[2]!.trigger).toEqual({ kind: 'utilization', fraction: 1 });
  });

  it('tell the crew what to do at each stage in plain words (common practice)', () => {
    const [watch, prepare, clear] = siteDefaultLevels.map((l) => l.actionText.toLowerCase());
    for (const word of ['wind', 'ballast', 'pegs']) expect(watch).toContain(word);
    for (const word of ['banners', 'scrims', 'screens', 'side walls', 'stewards', 'plan']) expect(prepare).toContain(word);
    for (const word of ['clear', 'exclusion zone', 'downwind', 'tall', 'stop', 'plan']) expect(clear).toContain(word);
  });

  it('pass the level list schema and cannot be changed in place', () => {
    expect(levelListSchema.safeParse(siteDefaultLevels).success).toBe(true);
    expect(Object.isFrozen(siteDefaultLevels)).toBe(true);
    expect(Object.isFrozen(siteDefaultLevels[0])).toBe(true);
    expect(Object.isFrozen(siteDefaultLevels[0]!.trigger)).toBe(true);
  });
});

describe('level list schema (limits are our own)', () => {
  const valid = [
    level('Watch', { kind: 'utilization', fraction: 0.6 }),
    level('Screens down', { kind: 'gust', gustMps: 15 }),
    level('Clear', { kind: 'utilization', fraction: 1 }),
  ];

  it('accepts 1 to 8 levels mixing utilization and gust triggers', () => {
    expect(levelListSchema.safeParse(valid).success).toBe(true);
    expect(levelListSchema.safeParse(valid.slice(0, 1)).success).toBe(true);
    const eight = Array.from({ length: 8 }, (_, i) => level(`L${i + 1}`, { kind: 'gust', gustMps: 5 + i }));
    expect(levelListSchema.safeParse(eight).success).toBe(true);
  });

  it('refuses an empty list and more than 8 levels', () => {
    expect(levelListSchema.safeParse([]).success).toBe(false);
    const nine = Array.from({ length: 9 }, (_, i) => level(`L${i + 1}`, { kind: 'gust', gustMps: 5 + i }));
    expect(levelListSchema.safeParse(nine).success).toBe(false);
  });

  it('refuses an empty or blank label and one longer than 60 characters, and trims labels', () => {
    expect(levelListSchema.safeParse([level('', { kind: 'gust', gustMps: 10 })]).success).toBe(false);
    expect(levelListSchema.safeParse([level('   ', { kind: 'gust', gustMps: 10 })]).success).toBe(false);
    expect(levelListSchema.safeParse([level('x'.repeat(61), { kind: 'gust', gustMps: 10 })]).success).toBe(false);
    expect(levelListSchema.safeParse([level('x'.repeat(60), { kind: 'gust', gustMps: 10 })]).success).toBe(true);
    expect(levelListSchema.parse([level('  Watch ', { kind: 'gust', gustMps: 10 })])[0]!.label).toBe('Watch');
  });

  it('refuses action text longer than 2000 characters', () => {
    expect(levelListSchema.safeParse([level('A', { kind: 'gust', gustMps: 10 }, 'x'.repeat(2001))]).success).toBe(false);
    expect(levelListSchema.safeParse([level('A', { kind: 'gust', gustMps: 10 }, 'x'.repeat(2000))]).success).toBe(true);
  });

  it('takes fractions in (0, 1] (design §2.6 v2: no level beyond the limit) and gusts in (0, 120] m/s only', () => {
    const one = (trigger: unknown) => levelListSchema.safeParse([{ label: 'A', trigger, actionText: '' }]).success;
    expect(one({ kind: 'utilization', fraction: 0 })).toBe(false);
    expect(one({ kind: 'utilization', fraction: 1 })).toBe(true);
    expect(one({ kind: 'utilization', fraction: 1.000001 })).toBe(false);
    expect(one({ kind: 'utilization', fraction: 1.5 })).toBe(false);
    expect(one({ kind: 'utilization', fraction: Number.NaN })).toBe(false);
    expect(one({ kind: 'gust', gustMps: 0 })).toBe(false);
    expect(one({ kind: 'gust', gustMps: 120 })).toBe(true);
    expect(one({ kind: 'gust', gustMps: 120.1 })).toBe(false);
    expect(one({ kind: 'gust', gustMps: Number.POSITIVE_INFINITY })).toBe(false);
    expect(one({ kind: 'beaufort', force: 8 })).toBe(false);
    expect(one({ kind: 'gust', gustMps: 10, fraction: 0.5 })).toBe(false);
  });

  it('refuses same-kind triggers that do not rise with the level, naming the level', () => {
    const result = levelListSchema.safeParse([
      level('A', { kind: 'utilization', fraction: 0.8 }),
      level('B', { kind: 'gust', gustMps: 12 }),
      level('C', { kind: 'utilization', fraction: 0.8 }),
    ]);
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((issue) => issue.path)).toEqual([[2, 'trigger', 'fraction']]);
    expect(result.error!.issues[0]!.message).toContain('level 3');
  });

  it('refuses two levels with the same label', () => {
    const result = levelListSchema.safeParse([
      level('Watch', { kind: 'gust', gustMps: 10 }),
      level('watch', { kind: 'gust', gustMps: 12 }),
    ]);
    expect(result.success).toBe(false);
    expect(result.error!.issues[0]!.path).toEqual([1, 'label']);
  });
});

describe('checkLevelOrder', () => {
  it('finds nothing wrong with strictly rising trigger gusts', () => {
    expect(checkLevelOrder([15.49, 17.89, 20])).toEqual([]);
  });

  it('names each level whose gust is not above every level below it', () => {
    expect(checkLevelOrder([15, 14, 20])).toEqual([1]);
    expect(checkLevelOrder([10, 5, 8, 12])).toEqual([1, 2]);
    expect(checkLevelOrder([10, 10])).toEqual([1]);
  });

  it('names a first level at or below calm (0 m/s) and any NaN', () => {
    expect(checkLevelOrder([0, 5])).toEqual([0]);
    expect(checkLevelOrder([5, Number.NaN, 8])).toEqual([1]);
  });
});

describe('gustAtFractionWithoutUpliftMps', () => {
  it('puts the staged triggers of a 20 m/s limit at 15.49 m/s (60 %) and 17.89 m/s (80 %) (references.md §9)', () => {
    expect(gustAtFractionWithoutUpliftMps(20, 0.6)).toBeCloseTo(15.49, 2);
    expect(gustAtFractionWithoutUpliftMps(20, 0.8)).toBeCloseTo(17.89, 2);
    expect(gustAtFractionWithoutUpliftMps(20, 1)).toBe(20);
  });

  it('gives the gust whose dynamic pressure ½ρv² is that fraction of the pressure at the limit (design §2.3)', () => {
    const airDensityKgM3 = 1.225; // ISO 2533 sea level
    const qPa = (gustMps: number) => 0.5 * airDensityKgM3 * gustMps ** 2;
    for (const fraction of [0.6, 0.8, 1]) {
      expect(qPa(gustAtFractionWithoutUpliftMps(27.5, fraction)) / qPa(27.5)).toBeCloseTo(fraction, 12);
    }
  });

  it('throws a RangeError naming a bad limit or fraction', () => {
    expect(() => gustAtFractionWithoutUpliftMps(0, 0.6)).toThrow(/limitGustMps.*got 0/);
    expect(() => gustAtFractionWithoutUpliftMps(Number.NaN, 0.6)).toThrow(RangeError);
    expect(() => gustAtFractionWithoutUpliftMps(20, 0)).toThrow(/fraction.*\(0, 1\].*got 0/);
    expect(() => gustAtFractionWithoutUpliftMps(20, 2)).toThrow(RangeError);
  });
});

describe("a level's move to a configuration", () => {
  it('may name any configuration a record may have: as long as a configuration name (100 characters), not longer', () => {
    const longest = 'l'.repeat(100);
    // A record accepts a configuration with a name of 100 characters (kinds/recordBase.ts)...
    const record = validateStructureRecord({
      kind: 'banner', name: 'Long-named fence', widthM: 10, heightM: 2, clearanceM: 0.1, feet: 6, ballastPerFootKg: 60, footDepthM: 0.8, selfWeightKg: 100,
      configurations: [{ name: longest, changes: { solidity: 0.3 } }],
    });
    expect(record.ok).toBe(true);
    // ...so a level must be able to move the structure to it.
    const moving = { ...level('Prepare', { kind: 'utilization', fraction: 0.8 }), moveToConfiguration: longest };
    expect(levelListSchema.safeParse([moving]).success).toBe(true);
    const tooLong = levelListSchema.safeParse([{ ...moving, moveToConfiguration: `${longest}x` }]);
    expect(tooLong.success).toBe(false);
    expect(tooLong.error?.issues[0]?.path).toEqual([0, 'moveToConfiguration']);
  });
});
