/**
 * Alert records, acknowledgement and re-signalling follow design.md §2.4 (our own model). The
 * 2-minute re-signal interval is our choice (common practice).
 */
import { describe, expect, it } from 'vitest';
import {
  AcknowledgementError,
  acknowledge,
  defaultResignalIntervalMs,
  escalationAlert,
  initialLevelState,
  noDataAlert,
  recordSignal,
  resignalDue,
  sensorAlert,
  siteDefaultLevels,
  stepLevel,
  type Alert,
} from '../../../server/levels/index.ts';

const raisedAtMs = Date.UTC(2026, 5, 13, 15, 42, 10); // an invented gusty afternoon

function prepareAlert(): Alert {
  const step = stepLevel(initialLevelState(raisedAtMs), {
    nowMs: raisedAtMs,
    gustMps: 18.2,
    triggerGustsMps: [15.49, 17.89, 20],
  });
  const escalation = step.events.find((e) => e.type === 'escalated');
  if (escalation === undefined || escalation.type !== 'escalated') throw new Error('expected an escalation');
  return escalationAlert(escalation, siteDefaultLevels);
}

/** The error thrown by `action`, checked to be an AcknowledgementError. */
function acknowledgementErrorOf(action: () => unknown): AcknowledgementError {
  try {
    action();
  } catch (error) {
    if (error instanceof AcknowledgementError) return error;
    throw error;
  }
  throw new Error('expected an AcknowledgementError, nothing was thrown');
}

describe('an escalation alert', () => {
  it('carries the level reached, its label and action text, the time and the gust', () => {
    const alert = prepareAlert();
    expect(alert).toEqual({
      kind: 'level',
      level: 2,
      label: 'Prepare',
      actionText: siteDefaultLevels[1]!.actionText,
      raisedAtMs,
      gustMps: 18.2,
      sensorKey: null,
      lastSignalledAtMs: raisedAtMs,
      acknowledgement: null,
    });
  });

  it('cannot come from a de-escalation or name a level the list does not have', () => {
    const base = { fromLevel: 3, toLevel: 2, atMs: raisedAtMs, gustMps: 10 };
    expect(() => escalationAlert({ type: 'de-escalated', ...base }, siteDefaultLevels)).toThrow(/escalated/);
    expect(() => escalationAlert({ type: 'escalated', ...base, toLevel: 4 }, siteDefaultLevels)).toThrow(
      /toLevel.*\[1, 3\].*got 4/,
    );
  });
});

describe('sensor and no-data alerts', () => {
  it('use the same record with their own kind and no level', () => {
    const silent = sensorAlert({ kind: 'sensor-silent', sensorKey: 'mast-north', raisedAtMs });
    expect(silent).toMatchObject({ kind: 'sensor-silent', sensorKey: 'mast-north', level: null, gustMps: null });
    const implausible = sensorAlert({ kind: 'sensor-implausible', sensorKey: 'mast-north', raisedAtMs });
    expect(implausible.kind).toBe('sensor-implausible');
    const noData = noDataAlert({ type: 'no-data', atMs: raisedAtMs });
    expect(noData).toMatchObject({ kind: 'no-data', level: null, raisedAtMs, acknowledgement: null });
  });

  it('tell the crew that no data is unknown, not calm', () => {
    expect(noDataAlert({ type: 'no-data', atMs: raisedAtMs }).actionText).toMatch(/unknown, not calm/);
  });

  it('need a sensor key and a finite time', () => {
    expect(() => sensorAlert({ kind: 'sensor-silent', sensorKey: '', raisedAtMs })).toThrow(/sensorKey/);
    expect(() => sensorAlert({ kind: 'sensor-silent', sensorKey: 'a', raisedAtMs: Number.NaN })).toThrow(/raisedAtMs/);
  });
});

describe('acknowledge', () => {
  it('records who acknowledged, when, and their note (trimmed), leaving the original record unchanged', () => {
    const alert = prepareAlert();
    const atMs = raisedAtMs + 45_000;
    const acknowledged = acknowledge(alert, { by: '  Priya, rigging lead ', note: ' Banners down on the east fence. ', atMs });
    expect(acknowledged.acknowledgement).toEqual({ by: 'Priya, rigging lead', note: 'Banners down on the east fence.', atMs });
    expect(alert.acknowledgement).toBeNull();
  });

  it('takes the note as optional', () => {
    const acknowledged = acknowledge(prepareAlert(), { by: 'Tom', atMs: raisedAtMs });
    expect(acknowledged.acknowledgement).toEqual({ by: 'Tom', note: null, atMs: raisedAtMs });
  });

  it('refuses a second acknowledgement and says who acknowledged first', () => {
    const once = acknowledge(prepareAlert(), { by: 'Tom', atMs: raisedAtMs + 1000 });
    const error = acknowledgementErrorOf(() => acknowledge(once, { by: 'Ana', atMs: raisedAtMs + 2000 }));
    expect(error.code).toBe('already-acknowledged');
    expect(error.message).toContain('Tom');
  });

  it('refuses an empty, blank or overlong name', () => {
    for (const by of ['', '   ', 'x'.repeat(101)]) {
      const error = acknowledgementErrorOf(() => acknowledge(prepareAlert(), { by, atMs: raisedAtMs }));
      expect(error.code).toBe('invalid-name');
    }
  });

  it('refuses an overlong note and a time before the alert was raised', () => {
    const alert = prepareAlert();
    expect(acknowledgementErrorOf(() => acknowledge(alert, { by: 'Tom', note: 'x'.repeat(2001), atMs: raisedAtMs })).code).toBe(
      'invalid-note',
    );
    expect(acknowledgementErrorOf(() => acknowledge(alert, { by: 'Tom', atMs: raisedAtMs - 1 })).code).toBe('invalid-time');
  });
});

describe('re-signalling', () => {
  it('defaults to every 2 minutes (our choice)', () => {
    expect(defaultResignalIntervalMs).toBe(120_000);
  });

  it('is due one interval after the raise, not a millisecond before', () => {
    const alert = prepareAlert();
    expect(resignalDue(alert, raisedAtMs + 119_999)).toEqual({ due: false, nextAtMs: raisedAtMs + 120_000 });
    expect(resignalDue(alert, raisedAtMs + 120_000)).toEqual({ due: true, nextAtMs: raisedAtMs + 120_000 });
  });

  it('moves on one interval from the last signal once it is recorded', () => {
    const signalled = recordSignal(prepareAlert(), raisedAtMs + 120_500);
    expect(resignalDue(signalled, raisedAtMs + 121_000)).toEqual({ due: false, nextAtMs: raisedAtMs + 240_500 });
    expect(resignalDue(signalled, raisedAtMs + 240_500).due).toBe(true);
  });

  it('keeps coming due until the alert is acknowledged, then never', () => {
    const alert = prepareAlert();
    expect(resignalDue(alert, raisedAtMs + 3_600_000).due).toBe(true);
    const acknowledged = acknowledge(alert, { by: 'Tom', atMs: raisedAtMs + 3_600_000 });
    expect(resignalDue(acknowledged, raisedAtMs + 3_600_000)).toEqual({ due: false, nextAtMs: null });
  });

  it('follows a site interval and refuses a non-positive one', () => {
    const alert = prepareAlert();
    expect(resignalDue(alert, raisedAtMs + 30_000, 30_000).due).toBe(true);
    expect(() => resignalDue(alert, raisedAtMs, 0)).toThrow(/intervalMs.*got 0/);
    expect(() => recordSignal(alert, raisedAtMs - 1)).toThrow(/atMs/);
  });
});
