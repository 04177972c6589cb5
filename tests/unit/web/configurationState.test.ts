/**
 * What the board says about configurations and plan actions (web/src/configurationState.ts).
 *
 * The rules checked come from outside the code: the issue's own example of the card's line
 * ("Raised · limit 14.2 m/s · lowered 23.8 m/s", the current configuration first and marked) and of
 * the overdue line ("Not done: lower the screen — overdue since 14:07"); design §2.5 (an action
 * not marked done within the set time is overdue) and the house rule that missing data is unknown,
 * never safe: a configuration the server does not name is "unknown", never the one as registered,
 * and a limit that is not a number is never printed as one. Structures and times are invented.
 */
import { describe, expect, it } from 'vitest';
import { actionPhrase, alertAction, configurationLine, configurationsNow, doneText, overdueText } from '../../../web/src/configurationState.ts';
import type { OpenAlert, StructureState } from '../../../web/src/types.ts';
import { siteDefaultLevels } from '../../../server/levels/siteDefaultLevels.ts';

const t0 = Date.UTC(2026, 5, 13, 12, 0, 0); // 14:00 in Europe/Berlin (summer time, UTC+2)
const tz = 'Europe/Berlin';
const min = 60_000;

type Configurations = StructureState['configurations'];

function screen(over: Partial<StructureState> = {}): StructureState {
  return {
    id: 1, name: 'Stage screen', kind: 'screen', level: 0, levelLabel: null, levelSinceMs: t0, noData: false, gustMps: 6, governingSensorKey: 'mast-a', windFromDeg: 250,
    utilization: 0.2, calculatedUtilization: 0.2, governing: 'overturning', governingDirectionDeg: 0, governingElement: null, governingText: null, margin: 0.8, unbounded: false,
    limitGustMps: 14.2, allDirectionsLimitGustMps: 14.2, calculatedLimitGustMps: 14.2, ratedGustMps: null, airDensityKgM3: 1.225, referenceHeightM: 8, triggerGustsMps: [8.5, 11.4, 12.7],
    levels: [], warnings: [], evaluatedAtMs: t0, error: null, mobile: false, sensorKeys: null, highestTravelSpeedMps: null,
    configuration: 'Raised', configurationSinceMs: null, configurationBy: null, foresight: null,
    configurations: [
      { name: 'Raised', current: true, limitGustMps: 14.2, calculatedLimitGustMps: 14.2, triggerGustsMps: [8.5, 11.4, 12.7] },
      { name: 'lowered', current: false, limitGustMps: 23.8, calculatedLimitGustMps: 23.8, triggerGustsMps: [14.3, 19.1, 21.3] },
    ],
    ...over,
  };
}

function levelAlert(over: Partial<OpenAlert> = {}): OpenAlert {
  return {
    id: 7, kind: 'level', structureId: 1, sensorKey: null, level: 2, label: 'Prepare', actionText: 'Lower the screen. Keep the area below clear.', raisedAtMs: t0, gustMps: 11.6, utilization: null,
    lastSignalledAtMs: t0, clearedAtMs: null, acknowledgedAtMs: null, acknowledgedBy: null, acknowledgeNote: null, subject: 'Stage screen',
    moveToConfiguration: 'lowered', actionDoneAtMs: null, actionDoneBy: null, actionDueAtMs: t0 + 5 * min, overdueAtMs: null,
    ...over,
  };
}

/** The state as a server without the configuration fields sends it (before issue 14). */
function withoutConfigurationFields(s: StructureState): StructureState {
  const { configuration: _c, configurationSinceMs: _s, configurationBy: _b, configurations: _l, ...rest } = s;
  return rest as StructureState;
}

describe('the card’s configuration line (the issue’s example: “Raised · limit 14.2 m/s · lowered 23.8 m/s”)', () => {
  it('reads as the issue’s example, the current configuration first and marked', () => {
    const line = configurationLine(screen(), 'm/s')!;
    expect(line.text).toBe('Raised · limit 14.2\u00a0m/s · lowered 23.8\u00a0m/s');
    expect(line.parts.map((p) => [p.name, p.current])).toEqual([['Raised', true], ['lowered', false]]);
  });

  it('puts the current configuration first when it is not the one as registered, with its own limit', () => {
    const lowered = screen({
      configuration: 'lowered',
      configurationSinceMs: t0,
      configurationBy: 'Jo Marsh',
      configurations: [
        { name: 'Raised', current: false, limitGustMps: 14.2, calculatedLimitGustMps: 14.2, triggerGustsMps: [8.5, 11.4, 12.7] },
        { name: 'lowered', current: true, limitGustMps: 23.8, calculatedLimitGustMps: 23.8, triggerGustsMps: [14.3, 19.1, 21.3] },
      ],
    });
    expect(configurationLine(lowered, 'm/s')!.text).toBe('lowered · limit 23.8\u00a0m/s · Raised 14.2\u00a0m/s');
    expect(configurationsNow(lowered)).toMatchObject({ current: 'lowered', sinceMs: t0, by: 'Jo Marsh' });
  });

  it('speaks the chosen unit (13.6 kn = 7 m/s: 1 kn = 1852/3600 m/s, the SI Brochure’s definition of the knot)', () => {
    const s = screen({ configurations: [
      { name: 'Raised', current: true, limitGustMps: 7, calculatedLimitGustMps: 7, triggerGustsMps: [] },
      { name: 'lowered', current: false, limitGustMps: 14, calculatedLimitGustMps: 14, triggerGustsMps: [] },
    ] });
    expect(configurationLine(s, 'kn')!.text).toBe('Raised · limit 14\u00a0knots · lowered 27\u00a0knots');
  });

  it('says nothing for a structure without configurations, and nothing when the server sends no configuration fields', () => {
    const single: Configurations = [{ name: 'as registered', current: true, limitGustMps: 14.2, calculatedLimitGustMps: 14.2, triggerGustsMps: [] }];
    expect(configurationLine(screen({ configuration: 'as registered', configurations: single }), 'm/s')).toBeNull();
    expect(configurationLine(withoutConfigurationFields(screen()), 'm/s')).toBeNull();
  });

  it('is “Configuration unknown” when the name is missing or names none of the list, or the list marks another: never the one as registered', () => {
    const { configuration: _c, ...noName } = screen({ configurations: screen().configurations.map((c) => ({ ...c, current: false })) });
    for (const s of [noName as StructureState, screen({ configuration: 'half way' }), screen({ configuration: 'lowered' })]) {
      const line = configurationLine(s, 'm/s')!;
      expect(line.currentKnown).toBe(false);
      expect(line.text).toBe('Configuration unknown · Raised 14.2\u00a0m/s · lowered 23.8\u00a0m/s');
      expect(line.parts.every((p) => !p.current)).toBe(true);
    }
  });

  it('prints a limit that is not a number as unknown, never as a figure', () => {
    const s = screen({ configurations: [
      { name: 'Raised', current: true, limitGustMps: 14.2, calculatedLimitGustMps: 14.2, triggerGustsMps: [] },
      { name: 'lowered', current: false, limitGustMps: null as unknown as number, calculatedLimitGustMps: Number.NaN, triggerGustsMps: [] },
    ] });
    expect(configurationLine(s, 'm/s')!.text).toBe('Raised · limit 14.2\u00a0m/s · lowered unknown');
  });

  it('a switched structure whose list is not sent shows its name with the live state’s own limit', () => {
    const { configurations: _l, ...rest } = screen({ configuration: 'lowered', configurationSinceMs: t0, limitGustMps: 23.8 });
    expect(configurationLine(rest as StructureState, 'm/s')!.text).toBe('lowered · limit 23.8\u00a0m/s');
  });
});

describe('a level alert’s plan action (design §2.5: not marked done within the set time, it is overdue)', () => {
  it('is to do before its due time, overdue from it, and done once marked (who and when)', () => {
    expect(alertAction(levelAlert(), t0 + 4 * min)).toMatchObject({ alertId: 7, moveTo: 'lowered', state: 'to-do', overdueSinceMs: null, ended: false });
    expect(alertAction(levelAlert(), t0 + 5 * min)).toMatchObject({ state: 'overdue', overdueSinceMs: t0 + 5 * min });
    // Signalled overdue by the server: overdue whatever the phone's clock says.
    expect(alertAction(levelAlert({ overdueAtMs: t0 + 5 * min }), t0)).toMatchObject({ state: 'overdue', overdueSinceMs: t0 + 5 * min });
    const done = alertAction(levelAlert({ actionDoneAtMs: t0 + 9 * min, actionDoneBy: 'Jo Marsh', overdueAtMs: t0 + 5 * min }), t0 + 20 * min)!;
    expect(done).toMatchObject({ state: 'done', doneAtMs: t0 + 9 * min, doneBy: 'Jo Marsh' });
    expect(doneText(done, tz)).toBe('Done: lowered by Jo Marsh at 14:09');
  });

  it('there is none for a level that moves the structure nowhere, for other alerts, and when the server does not say', () => {
    expect(alertAction(levelAlert({ moveToConfiguration: null }), t0)).toBeNull();
    expect(alertAction(levelAlert({ kind: 'no-data', level: null }), t0)).toBeNull();
    const { moveToConfiguration: _m, ...old } = levelAlert();
    expect(alertAction(old as OpenAlert, t0)).toBeNull();
  });

  it('an action without a done time is not done (the crew are asked; the server refuses a second Done)', () => {
    const { actionDoneAtMs: _d, actionDueAtMs: _due, ...partial } = levelAlert();
    expect(alertAction(partial as OpenAlert, t0 + 60 * min)).toMatchObject({ state: 'to-do', dueAtMs: null });
  });

  it('an ended level’s action not done is marked ended (no longer asked for)', () => {
    expect(alertAction(levelAlert({ clearedAtMs: t0 + 30 * min }), t0 + 31 * min)).toMatchObject({ state: 'overdue', ended: true });
  });

  it('reads as the issue’s example: “Not done: lower the screen — overdue since 14:07”', () => {
    const action = alertAction(levelAlert({ actionDueAtMs: t0 + 7 * min }), t0 + 8 * min)!;
    expect(overdueText(action, 'Lower the screen. Keep the area below clear.', tz)).toBe('Not done: lower the screen — overdue since 14:07');
  });

  it('takes the action’s first sentence when it is a short command, keeps a capitalised word, and falls back to the configuration', () => {
    expect(actionPhrase('Lower the screen; then clear the area', 'lowered')).toBe('lower the screen');
    expect(actionPhrase('LED wall down to the deck.', 'lowered')).toBe('LED wall down to the deck');
    expect(actionPhrase('', 'sides off')).toBe('move it to “sides off”');
    expect(actionPhrase(null, 'sides off')).toBe('move it to “sides off”');
    // The site's default Prepare text starts with the why (server/levels/siteDefaultLevels.ts).
    expect(actionPhrase(siteDefaultLevels[1]!.actionText, 'lowered')).toBe('move it to “lowered”');
  });
});
