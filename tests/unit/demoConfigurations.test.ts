/**
 * The demo site's configurations (server/demo/demoSite.ts; design §2.5, issue 14): every demo
 * record validates with its configurations, every level list validates and each action's
 * `moveToConfiguration` names a configuration of its record, and the engine's limits move the way
 * the physics says they must:
 *
 * - LED screen lowered (the board's foot from 3.5 m to 0.5 m) on towers that stay standing (the
 *   towers keep their height: engine/configuration.ts): the board's force is the same (c_f 1.80
 *   both ways, EN 1991-1-4 §7.4.3), but its resultant comes down with the board (the force acts
 *   at z_g + h/2), so the overturning moment falls. Raised, the end tower tipping about its back
 *   feet governs (the eccentric load of §7.4.3 puts 0.75 of the board on it); lowered, the
 *   overturning falls by about half and the tower sliding on its rubber pads governs: the
 *   limit rises, by the ratio of the two criteria.
 * - Fence with the scrim removed (solidity 0.55 → 0.2, a demo value for bare mesh panels): a
 *   lower solidity gives a lower force coefficient (EN 1991-1-4 §7.4.3 with the solidity of
 *   §7.11, as coded in boardCoefficient.ts), so less force and a higher limit.
 * - Marquee with all four sides off: a canopy. The drag falls (no walls, only the roof's
 *   elevation) but the roof lift rises (EN 1991-1-4 §7.3 canopy net lift 1.5 against the closed
 *   box's roof zones with c_pi +0.2, as coded in kinds/tent.ts), and the lift takes weight off the
 *   legs, so sliding resistance falls too. The engine weighs both: for this marquee the drag wins
 *   and sides off holds to a higher gust, sliding governing both ways. While the walls come off,
 *   one side open facing the wind with the others closed is worse than either (a dominant
 *   opening: EN 1991-1-4 §7.2.9, from memory of the clause): the action text asks for the side
 *   facing the wind last.
 */
import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assessConfigurations, assessStructure, recordConfigurations, validateStructureRecord, type StructureRecord } from '../../server/engine/index.ts';
import { levelListSchema } from '../../server/levels/index.ts';
import { demoStructures } from '../../server/demo/demoSite.ts';

function demoRecord(name: string): StructureRecord {
  const input = demoStructures.find((s) => (s.record as { name: string }).name === name);
  expect(input, name).toBeDefined();
  const checked = validateStructureRecord(input!.record);
  if (!checked.ok) throw new Error(`${name}: ${JSON.stringify(checked.issues)}`);
  return checked.record;
}

/** A figure the engine gives as a number, or null when unbounded: every demo structure has a limit, so null fails the test. */
function known(value: number | null): number {
  expect(value).not.toBeNull();
  return value!;
}

/** The calculator's figures for each configuration at one gust (ISA sea-level air, the calculator's default). */
function byName(record: StructureRecord, gustMps = 12) {
  return new Map(assessConfigurations(record, { gustMps }).map((c) => [c.name, c]));
}

describe('the demo register', () => {
  it('every record validates with its configurations, and every level list with its actions', () => {
    for (const s of demoStructures) {
      const checked = validateStructureRecord(s.record);
      expect(checked.ok, JSON.stringify(checked.ok ? null : checked.issues)).toBe(true);
      if (!checked.ok || s.levels === null) continue;
      const levels = levelListSchema.safeParse(s.levels);
      expect(levels.success, JSON.stringify(levels.error?.issues)).toBe(true);
      const names = recordConfigurations(checked.record).map((c) => c.name);
      for (const level of s.levels) if (level.moveToConfiguration !== undefined) expect(names).toContain(level.moveToConfiguration);
    }
  });

  it('the screen, the fence and the marquee each have one configuration besides the one as registered, named by their Prepare action', () => {
    const expected: Record<string, [string, string]> = {
      'Stage-left LED screen': ['raised', 'lowered'],
      'North fence scrim': ['scrim on', 'scrim removed'],
      'Food hall marquee': ['sides on', 'sides off'],
    };
    for (const [name, configurations] of Object.entries(expected)) {
      expect(recordConfigurations(demoRecord(name)).map((c) => c.name)).toEqual(configurations);
      const levels = demoStructures.find((s) => (s.record as { name: string }).name === name)!.levels!;
      expect(levels.find((l) => l.label === 'Prepare')!.moveToConfiguration).toBe(configurations[1]);
    }
  });
});

describe('the engine’s limits in the demo configurations', () => {
  it('the LED screen lowered: a higher limit, the overturning much reduced; the tower tipping governs raised, its sliding lowered', () => {
    const c = byName(demoRecord('Stage-left LED screen'));
    const raised = c.get('raised')!;
    const lowered = c.get('lowered')!;
    expect(known(lowered.limitGustMps)).toBeGreaterThan(known(raised.limitGustMps));
    expect(raised.governing).toBe('overturning');
    expect(lowered.governing).toBe('sliding');
    // The board's moment arm falls from 3.5 + 1.5 = 5 m to 0.5 + 1.5 = 2 m (to 0.4 of it); the towers'
    // own wind, at half their unchanged height, does not move: the overturning utilization falls by about half.
    expect(known(lowered.utilization.overturning)).toBeLessThan(0.55 * known(raised.utilization.overturning));
    // Sliding hardly moves with the height (the board's c_f is 1.80 both ways; the towers are the same): within 5 %.
    expect(Math.abs(known(lowered.utilization.sliding) / known(raised.utilization.sliding) - 1)).toBeLessThan(0.05);
  });

  it('the fence with the scrim removed: less force, a higher limit', () => {
    const record = demoRecord('North fence scrim');
    const c = byName(record);
    expect(known(c.get('scrim removed')!.limitGustMps)).toBeGreaterThan(known(c.get('scrim on')!.limitGustMps));
    const [on, off] = recordConfigurations(record).map((x) => assessStructure(x.record, { gustMps: 12 }));
    expect(off!.horizontalForceN).toBeLessThan(on!.horizontalForceN);
    // Sliding governs both (no lift on a fence): the limit goes with 1/√F at the same gust.
    expect(on!.governing).toBe('sliding');
    expect(off!.governing).toBe('sliding');
    expect(known(c.get('scrim removed')!.limitGustMps) / known(c.get('scrim on')!.limitGustMps)).toBeCloseTo(Math.sqrt(on!.horizontalForceN / off!.horizontalForceN), 2);
  });

  it('the marquee with its sides off: less drag, more roof lift; the drag governs the change, so the limit is higher (sliding both ways)', () => {
    const record = demoRecord('Food hall marquee');
    const [on, off] = recordConfigurations(record).map((x) => assessStructure(x.record, { gustMps: 12 }));
    expect(off!.horizontalForceN).toBeLessThan(on!.horizontalForceN);
    expect(off!.upliftN).toBeGreaterThan(on!.upliftN);
    expect(on!.governing).toBe('sliding');
    expect(off!.governing).toBe('sliding');
    expect(known(off!.limitGustMps)).toBeGreaterThan(known(on!.limitGustMps));
  });

  it('while the walls come off, one side open with the others closed holds to a lower gust than either (the side facing the wind last)', () => {
    const record = demoRecord('Food hall marquee');
    const { configurations: _c, configurationName: _n, ...tent } = record as StructureRecord & { configurations?: unknown; configurationName?: unknown };
    const oneOpen = validateStructureRecord({ ...tent, wallsClosed: undefined, sides: { front: 'open', back: 'closed', endY0: 'closed', endYW: 'closed' } });
    if (!oneOpen.ok) throw new Error(JSON.stringify(oneOpen.issues));
    const c = byName(record);
    const partly = assessStructure(oneOpen.record, { gustMps: 12 });
    expect(known(partly.limitGustMps)).toBeLessThan(known(c.get('sides on')!.limitGustMps));
    expect(known(partly.limitGustMps)).toBeLessThan(known(c.get('sides off')!.limitGustMps));
    // The closed walls keep the drag and the dominant opening lifts the roof.
    expect(partly.upliftN).toBeGreaterThan(assessStructure(recordConfigurations(record)[0]!.record, { gustMps: 12 }).upliftN);
  });
});

describe('the README’s account of the demo configurations', () => {
  it('gives the limits the engine computes, to 0.1 m/s at ISA sea-level air', () => {
    const readme = fs.readFileSync('README.md', 'utf8').replace(/\s+/g, ' ');
    const limit = (name: string, configuration: string) => known(byName(demoRecord(name)).get(configuration)!.limitGustMps).toFixed(1);
    expect(readme).toContain(`screen raised ${limit('Stage-left LED screen', 'raised')} m/s, lowered ${limit('Stage-left LED screen', 'lowered')} m/s`);
    expect(readme).toContain(`marquee sides on ${limit('Food hall marquee', 'sides on')} m/s, sides off ${limit('Food hall marquee', 'sides off')} m/s`);
    expect(readme).toContain(`fence ${limit('North fence scrim', 'scrim on')} m/s with the scrim, ${limit('North fence scrim', 'scrim removed')} m/s without`);
    const { configurations: _c, configurationName: _n, ...tent } = demoRecord('Food hall marquee') as StructureRecord & { configurations?: unknown; configurationName?: unknown };
    const oneOpen = validateStructureRecord({ ...tent, wallsClosed: undefined, sides: { front: 'open', back: 'closed', endY0: 'closed', endYW: 'closed' } });
    if (!oneOpen.ok) throw new Error(JSON.stringify(oneOpen.issues));
    expect(readme).toContain(`would hold only to ${known(assessStructure(oneOpen.record, { gustMps: 12 }).limitGustMps).toFixed(1)} m/s`);
  });
});
