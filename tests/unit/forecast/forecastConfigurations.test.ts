/**
 * The forecast check in every configuration (design §2.5, §2.8; issue 14): a structure's level in
 * the configuration it stands in and in the one its plan's action moves it to, each on its own
 * ladder, against trigger gusts worked by hand.
 *
 * A level at a fraction f of capacity is reached at v_lim·√f (design §2.6: every utilization is
 * proportional to q = ½ρv², so U = f at v = v_lim·√f). The limits are hand-worked below for an
 * invented LED screen (the same record as tests/unit/configuration.test.ts), from:
 * - c_f = 1.80 of a signboard above the ground by h/4 or more, and the resultant off centre by
 *   e = ±0.25·b: EN 1991-1-4 §7.4.3 (references.md §1, verified);
 * - q = ½ρv², ρ = 1.225 kg/m³ (ISA sea level, ISO 2533);
 * - g = 9.80665 m/s² (standard gravity, 3rd CGPM 1901);
 * - γ = 1.5 on the overturning moment: common practice for ballasted temporary structures.
 */
import { describe, expect, it } from 'vitest';
import { recordConfigurations, validateStructureRecord } from '../../../server/engine/index.ts';
import { type LevelDefinition } from '../../../server/levels/index.ts';
import { predictPlannedLevels, type ForecastPlannedStructure } from '../../../server/foresight/index.ts';
import { densityDependent, structureModel } from '../../../server/watch/structureModel.ts';

const t0 = Date.UTC(2026, 7, 9, 12);

const screen = {
  kind: 'screen', name: 'Harbour LED wall', configurationName: 'raised', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2,
  towerMassKg: 400, screenMassKg: 600, outriggerDepthM: 3, ballastPerTowerKg: 1500, frictionCoefficient: 0.7, towerWidthM: 0, headerTrussDepthM: 0,
  configurations: [{ name: 'lowered', changes: { bottomHeightM: 1.2 } }],
};

const levels: LevelDefinition[] = [
  { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: 'Crew to the screen.' },
  { label: 'Lower the screen', trigger: { kind: 'utilization', fraction: 0.7 }, actionText: 'Lower it to its bottom stop.', moveToConfiguration: 'lowered' },
  { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 0.9 }, actionText: 'Stop the show; clear the area.' },
];
const fractions = [0.5, 0.7, 0.9];

/**
 * Hand calculation of the limit gust of the near tower, overturning about the back outrigger feet,
 * with the board's centre at z_e = z_g + h/2 (see the module comment for the sources):
 *   at v = 20 m/s, q = 0.5 × 1.225 × 400 = 245 Pa; the near tower takes 0.5 + 0.25·6/6 = 0.75 of
 *   F = 1.80 × 245 × 24 m² → 7938 N; M_h = 7938 × z_e; M_w = g·(400·1.5 + 750·3 + 300·1.5) = 32 361.9 N·m;
 *   U = 1.5·M_h/M_w: raised (z_e 5 m) 1.8397, lowered (z_e 3.2 m) 1.1774; v_lim = 20/√U.
 */
function handLimitMps(bottomHeightM: number): number {
  const q = 0.5 * 1.225 * 20 ** 2;
  const forceN = (0.5 + (0.25 * 6) / 6) * 1.8 * q * 6 * 4;
  const restoringNm = 9.80665 * (400 * 1.5 + 750 * 3 + 750 * 0 + 300 * 1.5);
  const utilization = (1.5 * forceN * (bottomHeightM + 4 / 2)) / restoringNm;
  return 20 / Math.sqrt(utilization);
}

function planned(heightFactors: [number, number] = [1, 1], currentIndex = 0): ForecastPlannedStructure {
  const checked = validateStructureRecord(screen);
  if (!checked.ok) throw new Error(JSON.stringify(checked.issues));
  const configured = recordConfigurations(checked.record);
  const row = { id: 7, name: screen.name, kind: 'screen', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: levels };
  return {
    id: 'harbour-led',
    configurations: configured.map((c, i) => ({ name: c.name, triggerGustsMps: densityDependent(structureModel({ ...row, recordJson: c.record }, []), 1.225).triggerGustsMps, heightFactor: heightFactors[i]! })),
    currentIndex,
    moveToIndex: levels.map((l) => (l.moveToConfiguration === undefined ? null : configured.findIndex((c) => c.name === l.moveToConfiguration))),
  };
}

describe('the ladders of both configurations, built by the engine as the watch builds them', () => {
  it('match limit·√fraction with the limits worked by hand: raised 14.75 m/s, lowered 18.43 m/s', () => {
    expect(handLimitMps(3)).toBeCloseTo(14.75, 2);
    expect(handLimitMps(1.2)).toBeCloseTo(18.43, 2);
    const [raised, lowered] = planned().configurations;
    expect(raised!.name).toBe('raised');
    expect(lowered!.name).toBe('lowered');
    raised!.triggerGustsMps.forEach((g, i) => expect(g).toBeCloseTo(handLimitMps(3) * Math.sqrt(fractions[i]!), 6));
    lowered!.triggerGustsMps.forEach((g, i) => expect(g).toBeCloseTo(handLimitMps(1.2) * Math.sqrt(fractions[i]!), 6));
    // By hand: raised 10.43 / 12.34 / 13.99 m/s, lowered 13.03 / 15.42 / 17.49 m/s.
    expect(raised!.triggerGustsMps.map((g) => Number(g.toFixed(2)))).toEqual([10.43, 12.34, 13.99]);
    expect(lowered!.triggerGustsMps.map((g) => Number(g.toFixed(2)))).toEqual([13.03, 15.42, 17.49]);
  });
});

describe('predictPlannedLevels', () => {
  const rows = [11, 13, 14.5, 16, null].map((gustMps, i) => ({ timeMs: t0 + i * 3_600_000, meanMps: null, gustMps }));

  it('gives the level in each configuration and the one the plan moves it to, hour by hour', () => {
    const result = predictPlannedLevels(rows, [planned()]).map((r) => r[0]!);
    const summary = result.map((p) => ({ levels: p.inConfigurations.map((c) => c.level), planned: p.plannedIndex }));
    expect(summary).toEqual([
      // 11 m/s: raised Prepare (10.43 ≤ 11 < 12.34), whose action moves nothing.
      { levels: [1, 0], planned: null },
      // 13 m/s: raised "Lower the screen" (12.34 ≤ 13 < 13.99) → lowered, where 13 < 13.03: below all levels.
      { levels: [2, 0], planned: 1 },
      // 14.5 m/s: raised "Stop and clear" (≥ 13.99), which has no action of its own: "Lower the
      // screen" below it has, so the plan has it lowered → lowered Prepare (13.03 ≤ 14.5 < 15.42).
      { levels: [3, 1], planned: 1 },
      // 16 m/s: lowered "Lower the screen" (15.42 ≤ 16 < 17.49): it stays lowered.
      { levels: [3, 2], planned: 1 },
      // No wind in the row: unknown in both, never calm, and no plan.
      { levels: [null, null], planned: null },
    ]);
    expect(result[1]!.inConfigurations.map((c) => c.name)).toEqual(['raised', 'lowered']);
    expect(result[1]!.currentIndex).toBe(0);
  });

  it('standing lowered already, the plan moves it nowhere', () => {
    const result = predictPlannedLevels(rows, [planned([1, 1], 1)]).map((r) => r[0]!);
    expect(result.map((p) => p.plannedIndex)).toEqual([null, null, null, null, null]);
    expect(result[3]!.inConfigurations[1]!.level).toBe(2);
  });

  it('takes each configuration’s gust at its own height: a factor of 0.9 for the lowered wall turns 16 m/s into 14.4 m/s there', () => {
    const [p] = predictPlannedLevels([{ timeMs: t0, meanMps: null, gustMps: 16 }], [planned([1, 0.9])])[0]!;
    expect(p!.inConfigurations[0]!.gustAtStructureMps).toBe(16);
    expect(p!.inConfigurations[1]!.gustAtStructureMps).toBeCloseTo(14.4, 12);
    // 13.03 ≤ 14.4 < 15.42: lowered Prepare.
    expect(p!.inConfigurations[1]!.level).toBe(1);
  });

  it('follows an action that moves it on again, never back to a configuration already passed', () => {
    // Invented ladders: level 1 moves A → B, level 2 moves B → C, and C's level 1 would move it to B again.
    const s: ForecastPlannedStructure = {
      id: 'chain',
      configurations: [
        { name: 'A', triggerGustsMps: [5, 10], heightFactor: 1 },
        { name: 'B', triggerGustsMps: [8, 11], heightFactor: 1 },
        { name: 'C', triggerGustsMps: [12, 20], heightFactor: 1 },
      ],
      currentIndex: 0,
      moveToIndex: [1, 2],
    };
    const [a, b] = predictPlannedLevels(
      [
        { timeMs: t0, meanMps: null, gustMps: 9 },
        { timeMs: t0 + 1, meanMps: null, gustMps: 12 },
      ],
      [s],
    );
    // 9 m/s: A level 1 → B, where 9 is level 1 (its action: B, already there) → stays B.
    expect(a![0]!.plannedIndex).toBe(1);
    // 12 m/s: A level 2 → C; in C, level 1 → B; in B, level 2 would move it to C again, already passed: it ends at B.
    expect(b![0]!.inConfigurations.map((c) => c.level)).toEqual([2, 2, 1]);
    expect(b![0]!.plannedIndex).toBe(1);
  });

  it('refuses a current configuration or an action target that names no configuration, and a ladder per configuration of the wrong length', () => {
    const good = planned();
    expect(() => predictPlannedLevels(rows, [{ ...good, currentIndex: 2 }])).toThrow(RangeError);
    expect(() => predictPlannedLevels(rows, [{ ...good, moveToIndex: [null, 5, null] }])).toThrow(/moveToIndex\[1\]/);
    expect(() => predictPlannedLevels(rows, [{ ...good, moveToIndex: [null, 1] }])).toThrow(/one entry per level/);
    expect(() => predictPlannedLevels(rows, [{ ...good, configurations: [good.configurations[0]!, { name: 'short', triggerGustsMps: [5], heightFactor: 1 }] }])).toThrow(/not one per level/);
  });
});
