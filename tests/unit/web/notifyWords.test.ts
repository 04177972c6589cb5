/**
 * The words of My alerts and Alerts out (web/src/notifyWords.ts), checked against the server's own
 * rules and the README's contract ("Alert notifications"), not against themselves:
 * - what a filter lets through is what server/notify/filter.ts `filterPasses` lets through
 *   (missing data is never calm: no-data and sensor alerts pass a level filter, sensor alerts a
 *   structure filter);
 * - the filters and escalation chains the screens send are accepted by the server's schemas;
 * - an escalation step's time adds to the ones before, as server/notify/escalation.ts
 *   `stepDueTimesMs` has it;
 * - a failed attempt's "next try" is the README's retry schedule (5 s after the first failure);
 * - e-mail without SMTP_URL reaches nobody (README "Configuration": "Without it nobody gets e-mail").
 * Level labels are the site defaults (server/levels/siteDefaultLevels.ts); the names are invented.
 */
import { describe, expect, it } from 'vitest';
import { escalationChainsSchema, stepDueTimesMs } from '../../../server/notify/escalation.ts';
import { filterPasses, notifyFilterSchema } from '../../../server/notify/filter.ts';
import { retryDelayMs } from '../../../server/notify/retrySchedule.ts';
import { siteDefaultLevels } from '../../../server/levels/siteDefaultLevels.ts';
import {
  deliveryState,
  type NotifyFilter,
  escalationBody,
  filterDraft,
  filterFromDraft,
  filterWords,
  lockedPhoneWords,
  moveStep,
  notifyTroubleLine,
  removeStep,
  stepDueMinutes,
  targetWords,
  type Delivery,
  type EscalationStep,
} from '../../../web/src/notifyWords.ts';

const labels = siteDefaultLevels.map((l) => l.label);
const structures = new Map([
  [4, 'Main marquee'],
  [9, 'Stage LED screen'],
]);
const t0 = Date.UTC(2026, 6, 18, 14, 0, 0);
const hm = (ms: number) => new Date(ms).toISOString().slice(11, 16);

/** The kinds of alert the server raises (server/watch/watch.ts OpenAlert.kind), with and without a level. */
const alerts = [
  { name: 'level 1 on the marquee', kind: 'level', level: 1, structureId: 4 },
  { name: 'level 2 on the marquee', kind: 'level', level: 2, structureId: 4 },
  { name: 'level 3 on the screen', kind: 'level', level: 3, structureId: 9 },
  { name: 'no data for the screen', kind: 'no-data', level: null, structureId: 9 },
  { name: 'a sensor silent', kind: 'sensor-silent', level: null, structureId: null },
] as const;

describe('filter words say what the server lets through', () => {
  it('"every alert" lets every kind through (server filterPasses)', () => {
    const filter = { kind: 'all' } as const;
    expect(alerts.every((a) => filterPasses(filter, a as never))).toBe(true);
    expect(filterWords(filter, labels, structures)).toBe('every alert');
  });

  it('a level filter names the level by its label and says no-data and sensor alerts still come, as the server passes them', () => {
    const filter = { kind: 'levels', atLeast: 2 } as const;
    const passed = alerts.filter((a) => filterPasses(filter, a as never)).map((a) => a.name);
    expect(passed).toEqual(['level 2 on the marquee', 'level 3 on the screen', 'no data for the screen', 'a sensor silent']);
    expect(filterWords(filter, labels, structures)).toBe('alerts at level 2 (Prepare) or higher, and every no-data and sensor alert');
  });

  it('a structure filter names the structures and says sensor alerts still come, as the server passes them; a removed structure is named as such', () => {
    const filter: NotifyFilter = { kind: 'structures', structureIds: [4] };
    const passed = alerts.filter((a) => filterPasses(filter, a as never)).map((a) => a.name);
    expect(passed).toEqual(['level 1 on the marquee', 'level 2 on the marquee', 'a sensor silent']);
    expect(filterWords(filter, labels, structures)).toBe('alerts about Main marquee, and every sensor alert');
    expect(filterWords({ kind: 'structures', structureIds: [4, 9, 12] }, labels, structures)).toBe('alerts about Main marquee, Stage LED screen and structure 12 (no longer registered), and every sensor alert');
  });

  it('a level the site does not name is given by number', () => {
    expect(filterWords({ kind: 'levels', atLeast: 5 }, labels, structures)).toBe('alerts at level 5 or higher, and every no-data and sensor alert');
  });
});

describe('the filter as edited', () => {
  it('what the editor sends is accepted by the server schema, and a structure filter without structures is refused by both', () => {
    for (const f of [{ kind: 'all' }, { kind: 'levels', atLeast: 3 }, { kind: 'structures', structureIds: [9, 4] }] as NotifyFilter[]) {
      const built = filterFromDraft(filterDraft(f));
      expect('filter' in built).toBe(true);
      if ('filter' in built) expect(notifyFilterSchema.safeParse(built.filter).success).toBe(true);
    }
    const empty = filterFromDraft({ kind: 'structures', atLeast: 2, structureIds: [] });
    expect(empty).toEqual({ error: 'choose at least one structure (or another filter)' });
    expect(notifyFilterSchema.safeParse({ kind: 'structures', structureIds: [] }).success).toBe(false);
  });

  it('switching kinds keeps the other choices (a level chosen, then structures, then back)', () => {
    const d = { ...filterDraft({ kind: 'levels', atLeast: 3 }), structureIds: [9] };
    expect(filterFromDraft({ ...d, kind: 'structures' })).toEqual({ filter: { kind: 'structures', structureIds: [9] } });
    expect(filterFromDraft(d)).toEqual({ filter: { kind: 'levels', atLeast: 3 } });
  });
});

describe('escalation chains', () => {
  const steps: EscalationStep[] = [
    { afterMinutes: 5, role: 'crew' },
    { afterMinutes: 10, personId: 3 },
    { afterMinutes: 15, role: 'competent-person' },
  ];

  it('each step falls due at the sum of its minutes and those before it, as the server times it', () => {
    const serverMinutes = stepDueTimesMs(t0, steps).map((ms) => (ms - t0) / 60_000);
    expect(stepDueMinutes(steps)).toEqual(serverMinutes);
    expect(stepDueMinutes(steps)).toEqual([5, 15, 30]);
  });

  it('steps move up and down and are removed; a move past either end changes nothing', () => {
    expect(moveStep(steps, 1, -1)).toEqual([steps[1], steps[0], steps[2]]);
    expect(moveStep(steps, 1, 1)).toEqual([steps[0], steps[2], steps[1]]);
    expect(moveStep(steps, 0, -1)).toEqual(steps);
    expect(moveStep(steps, 2, 1)).toEqual(steps);
    expect(removeStep(steps, 0)).toEqual([steps[1], steps[2]]);
  });

  it('the body sent leaves out levels without steps, lists levels in order, and the server schema accepts it', () => {
    const body = escalationBody(
      new Map<number, EscalationStep[]>([
        [3, [steps[2]!]],
        [1, []],
        [2, [steps[0]!, steps[1]!]],
      ]),
    );
    expect(body).toEqual({ chains: [{ level: 2, steps: [steps[0], steps[1]] }, { level: 3, steps: [steps[2]] }] });
    expect(escalationChainsSchema.safeParse(body).success).toBe(true);
  });
});

function delivery(over: Partial<Delivery>): Delivery {
  return { id: 1, deliveryId: 'd-1', channel: 'webhook', target: 'webhook:2', event: 'test', alertId: null, status: 'pending', attempts: 0, createdAtMs: t0, nextAttemptAtMs: t0, deliveredAtMs: null, lastError: null, attemptLog: [], ...over };
}

describe('how a delivery stands', () => {
  it('delivered on the first attempt: a tick and the time', () => {
    const d = delivery({ status: 'delivered', attempts: 1, deliveredAtMs: t0 + 800, attemptLog: [{ atMs: t0 + 500, durationMs: 300, ok: true, result: 'HTTP 200' }] });
    expect(deliveryState(d, t0 + 1000, hm)).toEqual({ tone: 'ok', mark: '✓', words: 'Delivered at 14:00' });
  });

  it('a first attempt refused stands out at once, with the reason and the README’s first retry 5 s later', () => {
    const failedAt = t0 + 20;
    const d = delivery({ attempts: 1, lastError: 'connect ECONNREFUSED 127.0.0.1:9', nextAttemptAtMs: failedAt + retryDelayMs(1), attemptLog: [{ atMs: failedAt, durationMs: 3, ok: false, result: 'connect ECONNREFUSED 127.0.0.1:9' }] });
    expect(deliveryState(d, failedAt, hm)).toEqual({ tone: 'bad', mark: '✖', words: 'Not delivered yet: 1 attempt failed — connect ECONNREFUSED 127.0.0.1:9; next try in 5\u00a0s' });
  });

  it('given up: failed, with the number of attempts and the last reason', () => {
    const d = delivery({ status: 'failed', attempts: 20, lastError: 'HTTP 500', nextAttemptAtMs: null, attemptLog: [{ atMs: t0, durationMs: 12, ok: false, result: 'HTTP 500' }] });
    expect(deliveryState(d, t0, hm)).toEqual({ tone: 'bad', mark: '✖', words: 'Failed: given up after 20 attempts — HTTP 500' });
  });

  it('not tried yet: waiting, not shown as delivered', () => {
    expect(deliveryState(delivery({}), t0, hm)).toEqual({ tone: 'wait', mark: '…', words: 'Waiting to be sent' });
  });

  it('names who it went to from the stored target forms (db/schema.ts notify_outbox.target)', () => {
    const names = { webhooks: new Map([['2', 'Radio desk']]), people: new Map([[7, 'Ana (rigger)']]), meId: 5 };
    expect(targetWords('webhook', 'webhook:2', names)).toBe('webhook “Radio desk”');
    expect(targetWords('webhook', 'webhook:3', names)).toBe('webhook 3 (removed)');
    expect(targetWords('webhook', 'webhook:3')).toBe('webhook 3');
    expect(targetWords('webhook', 'webhook:env', names)).toBe('webhook ALERT_WEBHOOK_URL');
    expect(targetWords('email', 'person:5', names)).toBe('e-mail to you');
    expect(targetWords('email', 'person:7', names)).toBe('e-mail to Ana (rigger)');
    expect(targetWords('email', 'person:8', names)).toBe('e-mail to person 8');
  });
});

describe("the board's line for the competent person", () => {
  const name = (channel: string, target: string) => targetWords(channel, target);
  const error = { atMs: t0, target: 'webhook:2', channel: 'webhook', result: 'HTTP 502' };

  it('says nothing while messages go out (nothing failed, nothing waiting behind an error)', () => {
    expect(notifyTroubleLine({ pending: 0, failed: 0, lastError: null }, 0, t0, name)).toBeNull();
    // Two messages just queued, no error: not news.
    expect(notifyTroubleLine({ pending: 2, failed: 0, lastError: null }, 0, t0, name)).toBeNull();
    // An old error with nothing waiting and no new failure: nothing to do.
    expect(notifyTroubleLine({ pending: 0, failed: 0, lastError: error }, 0, t0 + 60_000, name)).toBeNull();
  });

  it('tells of messages waiting behind a channel that has just failed, with the last error', () => {
    expect(notifyTroubleLine({ pending: 3, failed: 0, lastError: error }, 0, t0 + 60_000, name)).toEqual({ text: 'Alert messages not getting out: 3 waiting · last error: webhook 2: HTTP 502', newFailed: false });
  });

  it('tells of failures until they are marked seen, and again when another fails', () => {
    expect(notifyTroubleLine({ pending: 0, failed: 2, lastError: error }, 0, t0 + 3_600_000, name)?.newFailed).toBe(true);
    expect(notifyTroubleLine({ pending: 0, failed: 2, lastError: error }, 2, t0 + 3_600_000, name)).toBeNull();
    expect(notifyTroubleLine({ pending: 0, failed: 3, lastError: error }, 2, t0 + 3_600_000, name)?.text).toBe('Alert messages not getting out: 3 failed · last error: webhook 2: HTTP 502');
  });
});

describe('what reaches a locked phone', () => {
  it('nothing, when push is not on and no e-mail address is set', () => {
    expect(lockedPhoneWords({ push: 'no-server', email: null, emailAvailable: true, filterText: 'every alert' })).toEqual({ lines: [], nothing: true });
  });

  it('nothing by e-mail when the server has no SMTP_URL, said plainly, even with an address saved', () => {
    const w = lockedPhoneWords({ push: 'off', email: 'ana@site.example', emailAvailable: false, filterText: 'every alert' });
    expect(w.nothing).toBe(true);
    expect(w.lines).toEqual([{ reaches: false, text: 'E-mail to ana@site.example is saved, but this server cannot send e-mail yet (SMTP_URL is not set): nothing goes out by e-mail.' }]);
  });

  it('push on another of the person’s devices reaches them even when this phone has none', () => {
    const w = lockedPhoneWords({ push: 'no-browser', otherPushDevices: 1, email: null, emailAvailable: true, filterText: 'every alert' });
    expect(w).toEqual({ lines: [{ reaches: true, text: 'Push on your other device: every alert.' }], nothing: false });
  });

  it('e-mail and push, each with the filter, when both are on', () => {
    const w = lockedPhoneWords({ push: 'on', email: 'ana@site.example', emailAvailable: true, filterText: 'every alert' });
    expect(w.nothing).toBe(false);
    expect(w.lines.map((l) => l.text)).toEqual(['Push on this phone: every alert, even when it is locked.', 'E-mail to ana@site.example: every alert (raised, signalled again, overdue, escalated).']);
  });
});
