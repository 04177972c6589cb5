/**
 * The alert book and the alert words (design.md §2.6, our own model): a raise is the first signal,
 * an unacknowledged alert is signalled again every 2 minutes (our choice, common practice for alarms
 * that need a human answer), an action that moves a structure is signalled once more as overdue,
 * the first acknowledgement is the one kept, and an alert leaves the book only once it is both
 * cleared and acknowledged. The records the store keeps of each event: storage/alertRows.ts.
 * (These checks replace those of the former levels/alert.ts, acknowledge.ts and resignalDue.ts,
 * which the live watch never used: one wording now, the watch's.)
 */
import { describe, expect, it } from 'vitest';
import { AlertBook, defaultResignalIntervalMs, escalationWords, noDataActionText, noDataWords, sensorSilentWords, sensorUnusableWords, siteDefaultLevels, type NewAlert } from '../../../server/levels/index.ts';
import { alertEventRows } from '../../../server/storage/alertRows.ts';
import { emptyWriteBatch } from '../../../server/storage/writeBatch.ts';

const raisedAtMs = Date.UTC(2026, 5, 13, 15, 42, 10); // an invented gusty afternoon
const prepare = (over: Partial<NewAlert> = {}): NewAlert => ({
  kind: 'level',
  structureId: 3,
  sensorId: null,
  sensorKey: null,
  level: 2,
  label: 'Prepare',
  actionText: siteDefaultLevels[1]!.actionText,
  raisedAtMs,
  gustMps: 18.2,
  utilization: 0.83,
  moveToConfiguration: null,
  subject: 'Food hall marquee',
  ...over,
});
const never = () => false;

describe('raising', () => {
  it('gives each alert its id and keeps what raised it; the raise is the first signal', () => {
    const book = new AlertBook();
    book.restore([], 41);
    const { alert, events } = book.raise(prepare(), 300_000);
    expect(alert).toMatchObject({ id: 41, kind: 'level', level: 2, label: 'Prepare', gustMps: 18.2, lastSignalledAtMs: raisedAtMs, acknowledgedAtMs: null, clearedAtMs: null, actionDueAtMs: null });
    expect(events.map((e) => e.type)).toEqual(['alert-raised']);
    expect(book.raise(prepare(), 300_000).alert.id).toBe(42);
    const batch = emptyWriteBatch();
    alertEventRows(events, 7, batch);
    expect(batch.alerts).toEqual([{ id: 41, siteId: 7, kind: 'level', structureId: 3, sensorId: null, level: 2, label: 'Prepare', actionText: siteDefaultLevels[1]!.actionText, raisedAtMs, gustMps: 18.2, utilization: 0.83, moveToConfiguration: null }]);
  });

  it('shows a utilization that is not finite as unknown, and sets the action due time only for an action that moves the structure', () => {
    const book = new AlertBook();
    expect(book.raise(prepare({ utilization: Number.POSITIVE_INFINITY }), 300_000).alert.utilization).toBeNull();
    expect(book.raise(prepare({ moveToConfiguration: 'sides off' }), 300_000).alert.actionDueAtMs).toBe(raisedAtMs + 300_000);
  });
});

describe('re-signalling and overdue actions', () => {
  it('defaults to every 2 minutes (our choice)', () => {
    expect(defaultResignalIntervalMs).toBe(120_000);
  });

  it('is due one interval after the raise, not a millisecond before, then one interval after that signal', () => {
    const book = new AlertBook();
    const { alert } = book.raise(prepare(), 300_000);
    expect(book.due(raisedAtMs + 119_999, 120_000, never)).toEqual([]);
    expect(book.due(raisedAtMs + 120_500, 120_000, never).map((e) => e.type)).toEqual(['alert-resignalled']);
    expect(alert.lastSignalledAtMs).toBe(raisedAtMs + 120_500);
    expect(book.due(raisedAtMs + 240_499, 120_000, never)).toEqual([]);
    expect(book.due(raisedAtMs + 240_500, 120_000, never)).toHaveLength(1);
  });

  it('keeps coming due until acknowledged, then never; refuses a non-positive interval', () => {
    const book = new AlertBook();
    const { alert } = book.raise(prepare(), 300_000);
    expect(book.due(raisedAtMs + 3_600_000, 120_000, never)).toHaveLength(1);
    book.acknowledge(alert.id, { by: 'Tom', note: null, atMs: raisedAtMs + 3_600_000, actor: 'Tom' });
    expect(book.due(raisedAtMs + 7_200_000, 120_000, never)).toEqual([]);
    expect(() => book.due(raisedAtMs, 0, never)).toThrow(/resignalIntervalMs.*got 0/);
  });

  it('signals an action not done in time once as overdue (which counts as its signal), and not when the structure is already there', () => {
    const book = new AlertBook();
    const { alert } = book.raise(prepare({ moveToConfiguration: 'sides off' }), 300_000);
    expect(book.due(raisedAtMs + 299_999, 600_000, never)).toEqual([]);
    expect(book.due(raisedAtMs + 300_000, 600_000, never).map((e) => e.type)).toEqual(['action-overdue']);
    expect(alert.overdueAtMs).toBe(raisedAtMs + 300_000);
    expect(book.due(raisedAtMs + 600_000, 600_000, never)).toEqual([]);
    const other = new AlertBook();
    other.raise(prepare({ moveToConfiguration: 'sides off' }), 300_000);
    expect(other.due(raisedAtMs + 300_000, 600_000, () => true)).toEqual([]);
  });
});

describe('acknowledging, marking done and clearing', () => {
  it('keeps the first acknowledgement only', () => {
    const book = new AlertBook();
    const { alert } = book.raise(prepare(), 300_000);
    expect(book.acknowledge(alert.id, { by: 'Sam (rigger)', note: 'Side walls closed', atMs: raisedAtMs + 60_000, actor: 'sam' }).map((e) => e.type)).toEqual(['alert-acknowledged']);
    expect(book.acknowledge(alert.id, { by: 'Jo', note: null, atMs: raisedAtMs + 90_000, actor: 'jo' })).toEqual([]);
    expect(alert).toMatchObject({ acknowledgedBy: 'Sam (rigger)', acknowledgeNote: 'Side walls closed', acknowledgedAtMs: raisedAtMs + 60_000 });
  });

  it('an action marked done acknowledges the alert too, with "Done: <configuration>" when no note is given', () => {
    const book = new AlertBook();
    const { alert } = book.raise(prepare({ moveToConfiguration: 'sides off' }), 300_000);
    const events = book.actionDone(alert.id, { by: 'Sam', note: null, atMs: raisedAtMs + 100_000, actor: 'sam', configurationName: 'sides off' });
    expect(events.map((e) => e.type)).toEqual(['action-done', 'alert-acknowledged']);
    expect(alert.acknowledgeNote).toBe('Done: sides off');
    const batch = emptyWriteBatch();
    alertEventRows(events, 1, batch);
    expect(batch.actionsDone).toEqual([{ alertId: alert.id, atMs: raisedAtMs + 100_000, by: 'Sam' }]);
    expect(batch.acknowledgements).toEqual([{ alertId: alert.id, atMs: raisedAtMs + 100_000, by: 'Sam', note: 'Done: sides off', actor: 'sam' }]);
    expect(book.actionDone(alert.id, { by: 'Jo', note: null, atMs: raisedAtMs + 200_000, actor: 'jo', configurationName: 'sides off' })).toEqual([]);
  });

  it('an alert stays in the book until it is both cleared and acknowledged; open() lists it until then, newest first', () => {
    const book = new AlertBook();
    const first = book.raise(prepare(), 300_000).alert;
    const second = book.raise(prepare({ raisedAtMs: raisedAtMs + 5_000, level: 3, label: 'Stop and clear' }), 300_000).alert;
    expect(book.open().map((a) => a.id)).toEqual([second.id, first.id]);
    expect(book.clear(first.id, raisedAtMs + 600_000).map((e) => e.type)).toEqual(['alert-cleared']);
    expect(book.clear(first.id, raisedAtMs + 700_000)).toEqual([]);
    expect(book.get(first.id)).toBeDefined();
    book.acknowledge(first.id, { by: 'Tom', note: null, atMs: raisedAtMs + 800_000, actor: 'tom' });
    expect(book.get(first.id)).toBeUndefined();
    expect(book.clearLevelsAbove(3, 1, raisedAtMs + 900_000).map((e) => e.alert.id)).toEqual([second.id]);
  });
});

describe('the words', () => {
  it('tell the crew that no data is unknown, not calm', () => {
    expect(noDataWords).toEqual({ label: 'No wind data', actionText: noDataActionText });
    expect(noDataActionText).toMatch(/unknown, not calm/);
  });

  it('name the sensor and its timeout, and tell silence from readings stamped off the clock', () => {
    const facts = { name: 'North mast', silenceTimeoutMs: 30_000, liveMaxAgeMs: 30_000, aheadToleranceMs: 5_000 };
    expect(sensorSilentWords(facts)).toEqual({ label: 'Sensor silent', actionText: 'No reading from North mast for more than 30 s. Check its power, mounting and gateway. Structures that take their wind from it have one reading fewer; if it was their only one they show "no data".' });
    expect(sensorUnusableWords(facts, 40_000).actionText).toContain('stamped 40 s behind the server');
    expect(sensorUnusableWords(facts, -12_000).actionText).toContain('stamped 12 s ahead of the server');
  });

  it('carry the actions of levels a gust passed at once after the level’s own, and the configuration the highest passed one moves to', () => {
    const levels = [
      { label: 'Watch', trigger: { kind: 'utilization' as const, fraction: 0.6 }, actionText: 'Walk round.' },
      { label: 'Prepare', trigger: { kind: 'utilization' as const, fraction: 0.8 }, actionText: 'Lower the screen.', moveToConfiguration: 'lowered' },
      { label: 'Stop and clear', trigger: { kind: 'utilization' as const, fraction: 1 }, actionText: 'Clear the area.' },
    ];
    const words = escalationWords(levels, 0, 3, (name) => (name === 'lowered' ? 'lowered' : null));
    expect(words.label).toBe('Stop and clear');
    expect(words.actionText).toBe('Clear the area.\nThe gust passed Watch and Prepare at once; do their actions too. Watch: Walk round. Prepare: Lower the screen.');
    expect(words.moveTo).toBe('lowered');
    expect(escalationWords(levels, 2, 3, () => null)).toEqual({ label: 'Stop and clear', actionText: 'Clear the area.', moveTo: null });
  });
});
