/**
 * The board's alert cards and its one-line summary, from the live state (web/src/alertGroups.ts,
 * web/src/boardSummary.ts), and how margins and the trend scale read (web/src/components/).
 *
 * The rules checked come from outside the code: design.md §2.6 ("a structure's card always leads
 * with its current level and action; acknowledged alerts never hide it"; "a structure whose
 * governing sensors are all silent shows 'no data', never 'fine'"), §2.3 (margin = 1 − effective
 * utilization) and the issue's own example of the summary line ("2 at Stop and clear · 1 at
 * Prepare · 1 sensor silent"). The states are invented for the test; the labels and actions are
 * the site defaults (server/levels/siteDefaultLevels.ts).
 */
import { describe, expect, it } from 'vitest';
import { siteDefaultLevels } from '../../../server/levels/siteDefaultLevels.ts';
import { groupAlerts, mayFold, type StructureAlertGroup } from '../../../web/src/alertGroups.ts';
import { boardSummary, summaryText } from '../../../web/src/boardSummary.ts';
import { marginWords } from '../../../web/src/components/marginWords.ts';
import { niceTop } from '../../../web/src/components/niceTop.ts';
import type { OpenAlert, SensorState, StructureState } from '../../../web/src/types.ts';

const t0 = Date.UTC(2026, 5, 13, 21, 0, 0);
const min = 60_000;
const gusts = [8, 11, 14];

function structure(id: number, name: string, over: Partial<StructureState> = {}): StructureState {
  return {
    id,
    name,
    kind: 'custom',
    level: 0,
    levelLabel: null,
    levelSinceMs: t0,
    noData: false,
    gustMps: 5,
    governingSensorKey: 'mast-a',
    windFromDeg: 250,
    utilization: 0.2,
    calculatedUtilization: 0.2,
    governing: 'overturning',
    governingDirectionDeg: 0,
    governingElement: null,
    governingText: null,
    margin: 0.8,
    unbounded: false,
    limitGustMps: 15,
    allDirectionsLimitGustMps: 15,
    calculatedLimitGustMps: 15,
    ratedGustMps: null,
    airDensityKgM3: 1.25,
    referenceHeightM: 3.5,
    triggerGustsMps: gusts,
    levels: siteDefaultLevels.map((l, i) => ({ level: i + 1, label: l.label, actionText: l.actionText, triggerGustMps: gusts[i]!, trigger: { kind: 'gust' as const, gustMps: gusts[i]! } })),
    warnings: [],
    evaluatedAtMs: t0,
    error: null,
    mobile: false,
    sensorKeys: null,
    highestTravelSpeedMps: null,
    foresight: null,
    configuration: 'as registered',
    configurationSinceMs: null,
    configurationBy: null,
    configurations: [{ name: 'as registered', current: true, limitGustMps: 20, calculatedLimitGustMps: 20, triggerGustsMps: gusts }],
    ...over,
  };
}

let nextId = 1;
function levelAlert(structureId: number, subject: string, level: number, raisedAtMs: number, over: Partial<OpenAlert> = {}): OpenAlert {
  const def = siteDefaultLevels[level - 1]!;
  return {
    id: nextId++,
    kind: 'level',
    structureId,
    sensorKey: null,
    level,
    label: def.label,
    actionText: def.actionText,
    raisedAtMs,
    gustMps: gusts[level - 1]! + 0.5,
    utilization: null,
    lastSignalledAtMs: raisedAtMs,
    clearedAtMs: null,
    acknowledgedAtMs: null,
    acknowledgedBy: null,
    acknowledgeNote: null,
    subject,
    moveToConfiguration: null,
    actionDoneAtMs: null,
    actionDoneBy: null,
    actionDueAtMs: null,
    overdueAtMs: null,
    ...over,
  };
}

function otherAlert(kind: 'no-data' | 'sensor-silent', raisedAtMs: number, over: Partial<OpenAlert>): OpenAlert {
  return {
    id: nextId++,
    kind,
    structureId: null,
    sensorKey: null,
    level: null,
    label: kind === 'no-data' ? 'No wind data' : 'Sensor silent',
    actionText: kind === 'no-data' ? 'Watch the wind by hand.' : 'Check its power, mounting and gateway.',
    raisedAtMs,
    gustMps: null,
    utilization: null,
    lastSignalledAtMs: raisedAtMs,
    clearedAtMs: null,
    acknowledgedAtMs: null,
    acknowledgedBy: null,
    acknowledgeNote: null,
    subject: '',
    moveToConfiguration: null,
    actionDoneAtMs: null,
    actionDoneBy: null,
    actionDueAtMs: null,
    overdueAtMs: null,
    ...over,
  };
}

function sensor(key: string, over: Partial<SensorState> = {}): SensorState {
  return {
    key,
    name: key,
    heightM: 10,
    silenceTimeoutMs: 30_000,
    currentGustMps: 5,
    peakGust10minMps: 6,
    mean10minMps: 3,
    meanDirDeg: 250,
    beaufort: 2,
    lastReadingTsMs: t0,
    lastReceivedAtMs: t0,
    lastArrivalAtMs: t0,
    clockOffsetMs: 0,
    silent: false,
    implausible: [],
    temperatureC: null,
    pressurePa: null,
    rhPct: null,
    ...over,
  };
}

describe('one card per structure, led by its current level', () => {
  it('after Stop is acknowledged, the card still leads with level 3 and its action; Watch and Prepare are folded into it and still to acknowledge', () => {
    const banner = structure(1, 'Car park banner', { level: 3, levelLabel: 'Stop and clear', levelSinceMs: t0 + 4 * min, margin: -3.31, utilization: 4.31 });
    const watch = levelAlert(1, banner.name, 1, t0);
    const prepare = levelAlert(1, banner.name, 2, t0 + 2 * min);
    const stop = levelAlert(1, banner.name, 3, t0 + 4 * min, { acknowledgedAtMs: t0 + 5 * min, acknowledgedBy: 'Jo Marsh' });
    const [card, ...others] = groupAlerts([stop, prepare, watch], [banner]);
    expect(others).toEqual([]);
    const g = card as StructureAlertGroup;
    expect(g.kind).toBe('structure');
    expect(g.current).toMatchObject({ level: 3, label: 'Stop and clear', actionText: siteDefaultLevels[2]!.actionText, noData: false });
    expect(g.currentAlert?.id).toBe(stop.id);
    expect(g.folded.map((a) => a.label)).toEqual(['Prepare', 'Watch']);
    expect(g.toAcknowledge.map((a) => a.id).sort()).toEqual([watch.id, prepare.id].sort());
    // Still waiting for acknowledgements in force: with the cards that need acting on.
    expect(g.tier).toBe(0);
  });

  it('leads with the level the structure is at now, not with a higher alert whose condition has ended', () => {
    const banner = structure(1, 'Car park banner', { level: 2, levelLabel: 'Prepare' });
    const prepare = levelAlert(1, banner.name, 2, t0);
    const stop = levelAlert(1, banner.name, 3, t0 + 2 * min, { clearedAtMs: t0 + 9 * min });
    const g = groupAlerts([stop, prepare], [banner])[0] as StructureAlertGroup;
    expect(g.current.level).toBe(2);
    expect(g.currentAlert?.id).toBe(prepare.id);
    expect(g.folded.map((a) => a.id)).toEqual([stop.id]);
    expect(g.toAcknowledge).toHaveLength(2);
  });

  it('puts no data above every level and never lets it wait behind the expander; a sensor card neither', () => {
    const tent = structure(2, 'Food tent', { level: 1, levelLabel: 'Watch' });
    const screen = structure(3, 'Stage screen', { noData: true, gustMps: null, margin: null, utilization: null });
    const banner = structure(1, 'Car park banner', { level: 3, levelLabel: 'Stop and clear' });
    const alerts = [
      levelAlert(2, tent.name, 1, t0 + 3 * min),
      levelAlert(1, banner.name, 3, t0 + 2 * min),
      otherAlert('no-data', t0 + min, { structureId: 3, subject: screen.name }),
      otherAlert('sensor-silent', t0 + min, { sensorKey: 'mast-b', subject: 'Mast B' }),
    ];
    const groups = groupAlerts(alerts, [banner, tent, screen]);
    // A silent sensor ranks below a level in force (the structures it leaves without wind have
    // no-data cards of their own), but it is never folded: only the Watch card may wait.
    expect(groups.map((g) => g.subject)).toEqual(['Stage screen', 'Car park banner', 'Food tent', 'Mast B']);
    expect(groups.map(mayFold)).toEqual([false, false, true, false]);
    const screenCard = groups[0] as StructureAlertGroup;
    expect(screenCard.current.noData).toBe(true);
    expect(screenCard.noDataAlerts).toHaveLength(1);
    expect(screenCard.folded).toEqual([]);
  });

  it('keeps a fully acknowledged structure after those still to acknowledge, still led by its level', () => {
    const a = structure(1, 'Car park banner', { level: 3, levelLabel: 'Stop and clear' });
    const b = structure(2, 'Food tent', { level: 1, levelLabel: 'Watch' });
    const acked = { acknowledgedAtMs: t0 + 6 * min, acknowledgedBy: 'Jo Marsh' };
    const groups = groupAlerts([levelAlert(1, a.name, 3, t0, acked), levelAlert(2, b.name, 1, t0 + min)], [a, b]);
    expect(groups.map((g) => [g.subject, g.tier])).toEqual([
      ['Food tent', 0],
      ['Car park banner', 2],
    ]);
    expect((groups[1] as StructureAlertGroup).current.label).toBe('Stop and clear');
  });
});

describe('the summary line states the site', () => {
  it('reads like the issue\'s example: structures per level, top first, then no data, then sensors', () => {
    const structures = [
      structure(1, 'Car park banner', { level: 3, levelLabel: 'Stop and clear' }),
      structure(2, 'Bar fence', { level: 3, levelLabel: 'Stop and clear' }),
      structure(3, 'Food tent', { level: 2, levelLabel: 'Prepare' }),
      structure(4, 'Stage screen', { noData: true }),
      structure(5, 'Info point'),
    ];
    const sensors = [sensor('mast-a'), sensor('mast-b', { silent: true, lastReceivedAtMs: t0 - 5 * min })];
    expect(summaryText(boardSummary(structures, sensors, t0))).toBe('2 at Stop and clear · 1 at Prepare · 1 without wind data · 1 below its levels · 1 sensor silent');
  });

  it('says all is below the levels only when every structure has data; a sensor past its own timeout counts as silent', () => {
    const calm = [structure(1, 'A'), structure(2, 'B')];
    expect(summaryText(boardSummary(calm, [sensor('mast-a')], t0))).toBe('all 2 structures below their levels');
    // The phone's own clock: 31 s after the last reading of a sensor with a 30-s timeout.
    expect(summaryText(boardSummary(calm, [sensor('mast-a')], t0 + 31_000))).toBe('all 2 structures below their levels · 1 sensor silent');
    expect(summaryText(boardSummary([structure(1, 'A', { noData: true })], [], t0))).toBe('1 without wind data · no sensors registered');
  });
});

describe('margins in words', () => {
  it('says a margin past the limit in words with how far, never as a negative percentage', () => {
    // Effective utilization 4.31 → margin 1 − 4.31 = −3.31 (design §2.3): 331 % of capacity past the limit.
    expect(marginWords(-3.31, false, false)).toEqual({ value: 'over the limit', note: 'by 331\u00a0% of its capacity', over: true });
    expect(marginWords(0.38, false, false)).toEqual({ value: '38\u00a0%', note: null, over: false });
    // −0.4 % rounds to 0 %: shown as 0 %, not as a sign.
    expect(marginWords(-0.004, false, false).value).toBe('0\u00a0%');
    expect(marginWords(null, true, false).value).toBe('none left');
    expect(marginWords(0.5, false, true).value).toBe('unknown');
    expect(marginWords(null, false, false).value).toBe('unknown');
  });
});

describe('the trend scale', () => {
  it('tops at a round number at or above the highest value, at most half as much again', () => {
    expect([0.7, 1, 9.2, 12.5, 16, 30, 31, 47].map(niceTop)).toEqual([0.8, 1, 10, 15, 20, 30, 40, 50]);
    for (let v = 0.11; v < 200; v *= 1.07) {
      expect(niceTop(v)).toBeGreaterThanOrEqual(v);
      expect(niceTop(v)).toBeLessThanOrEqual(v * 1.5 + 1e-9);
    }
    expect(niceTop(0)).toBe(1);
  });
});
