/**
 * The notifier's pure parts (server/notify): the retry schedule, the hub-event mapping, filters,
 * acknowledge tokens and the webhook signature, this last checked against node:crypto's HMAC
 * (RFC 2104) and against RFC 4231 test case 2 through the same primitive.
 */
import { createHmac } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { checkAckToken, makeAckToken } from '../../server/notify/ackTokens.ts';
import { CommittedAlerts } from '../../server/notify/events.ts';
import { filterPasses, notifyFilterSchema, storedFilter } from '../../server/notify/filter.ts';
import { dueSteps, escalationChainsSchema } from '../../server/notify/escalation.ts';
import { defaultMaxAttempts, defaultRetryDelaysMs, retryDelayMs } from '../../server/notify/retrySchedule.ts';
import { webhookAlert, webhookBodyText, webhookSignature } from '../../server/notify/webhookBody.ts';
import type { OpenAlert } from '../../server/watch/watch.ts';

const base: OpenAlert = {
  id: 7, kind: 'level', structureId: 3, sensorKey: 'north-mast', level: 2, label: 'Lower', actionText: 'Lower the wall.', raisedAtMs: 1_000, gustMps: 13.04, utilization: 0.75,
  lastSignalledAtMs: 1_000, clearedAtMs: null, acknowledgedAtMs: null, acknowledgedBy: null, acknowledgeNote: null, subject: 'LED wall', moveToConfiguration: null,
  actionDoneAtMs: null, actionDoneBy: null, actionDueAtMs: null, overdueAtMs: null,
};

describe('retry schedule', () => {
  it('retries first within 10 s (issue 16), never shortens, and caps the gap at 15 min', () => {
    expect(retryDelayMs(1)).toBeLessThanOrEqual(10_000);
    const gaps = Array.from({ length: defaultMaxAttempts }, (_, i) => retryDelayMs(i + 1));
    for (let i = 1; i < gaps.length; i++) expect(gaps[i]).toBeGreaterThanOrEqual(gaps[i - 1]!);
    expect(Math.max(...gaps)).toBe(900_000);
    expect(gaps.at(-1)).toBe(defaultRetryDelaysMs.at(-1));
    expect(() => retryDelayMs(0)).toThrow(RangeError);
  });
});

describe('alert events to notification events', () => {
  it('tells raised, re-signalled, overdue, acknowledged and cleared apart by the committed alert events', () => {
    const t = new CommittedAlerts();
    const raised = { kind: 'level' as const, structureId: 3, sensorId: null, sensorKey: 'north-mast', level: 2, label: 'Lower', actionText: 'Lower the wall.', raisedAtMs: 1_000, gustMps: 13.04, utilization: 0.75, moveToConfiguration: null, subject: 'LED wall' };
    expect(t.take([{ type: 'alert-raised', alert: { ...base }, raised }]).map((e) => [e.event, e.atMs])).toEqual([['alert.raised', 1_000]]);
    expect(t.take([{ type: 'alert-resignalled', alert: { ...base, lastSignalledAtMs: 121_000 }, atMs: 121_000 }]).map((e) => e.event)).toEqual(['alert.resignalled']);
    expect(t.take([{ type: 'action-overdue', alert: { ...base, overdueAtMs: 301_000, lastSignalledAtMs: 301_000 }, atMs: 301_000 }]).map((e) => [e.event, e.atMs])).toEqual([['alert.overdue', 301_000]]);
    expect(t.take([{ type: 'action-done', alert: { ...base, actionDoneAtMs: 302_000 }, atMs: 302_000, by: 'Ana' }])).toEqual([]);
    expect(t.take([{ type: 'alert-acknowledged', alert: { ...base, acknowledgedAtMs: 400_000, acknowledgedBy: 'Ana' }, atMs: 400_000, by: 'Ana', note: null, actor: 'Ana' }]).map((e) => e.event)).toEqual(['alert.acknowledged']);
    // The clear of an alert acknowledged before announces the clear only, not the acknowledgement again.
    expect(t.take([{ type: 'alert-cleared', alert: { ...base, acknowledgedAtMs: 400_000, acknowledgedBy: 'Ana', clearedAtMs: 500_000 }, atMs: 500_000 }]).map((e) => e.event)).toEqual(['alert.cleared']);
    expect(t.open.has(base.id)).toBe(false);
  });
});

describe('filters', () => {
  it('passes level alerts from n up, and every alert without a level (missing data is never calm)', () => {
    const f = notifyFilterSchema.parse({ kind: 'levels', atLeast: 3 });
    expect(filterPasses(f, base)).toBe(false);
    expect(filterPasses(f, { ...base, level: 3 })).toBe(true);
    expect(filterPasses(f, { ...base, kind: 'no-data', level: null })).toBe(true);
    const s = notifyFilterSchema.parse({ kind: 'structures', structureIds: [4] });
    expect(filterPasses(s, base)).toBe(false);
    expect(filterPasses(s, { ...base, kind: 'sensor-silent', structureId: null, level: null })).toBe(true);
    expect(storedFilter({ kind: 'nonsense' })).toEqual({ kind: 'all' });
    expect(notifyFilterSchema.safeParse({ kind: 'levels', atLeast: 0 }).success).toBe(false);
  });
});

describe('escalation chain', () => {
  it('takes each step after its minutes, counted on from the step before', () => {
    const steps = [{ afterMinutes: 5, role: 'competent-person' as const }, { afterMinutes: 10, personId: 2 }];
    expect(dueSteps(0, steps, new Set(), 4 * 60_000)).toEqual([]);
    expect(dueSteps(0, steps, new Set(), 5 * 60_000)).toEqual([0]);
    expect(dueSteps(0, steps, new Set([0]), 14 * 60_000)).toEqual([]);
    expect(dueSteps(0, steps, new Set([0]), 15 * 60_000)).toEqual([1]);
    const bad = escalationChainsSchema.safeParse({ chains: [{ level: 2, steps: [{ afterMinutes: 5, personId: 1, role: 'crew' }] }, { level: 2, steps: [] }] });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['chains.0.steps.0.personId', 'chains.1.level']);
  });
});

describe('acknowledge tokens', () => {
  const key = Buffer.alloc(32, 7);
  it('accepts its own token until it expires, and refuses a changed one or one under another key', () => {
    const token = makeAckToken(key, { alertId: 12, personId: 3, expiresAtMs: 10_000 });
    expect(checkAckToken(key, token, 9_999)).toMatchObject({ ok: true, claim: { alertId: 12, personId: 3, expiresAtMs: 10_000 } });
    expect(checkAckToken(key, token, 10_000)).toEqual({ ok: false, reason: 'expired' });
    expect(checkAckToken(key, token.replace(/^12\./, '13.'), 0)).toEqual({ ok: false, reason: 'bad-signature' });
    expect(checkAckToken(Buffer.alloc(32, 8), token, 0)).toEqual({ ok: false, reason: 'bad-signature' });
    expect(checkAckToken(key, 'nonsense', 0)).toEqual({ ok: false, reason: 'malformed' });
    expect(makeAckToken(key, { alertId: 12, personId: 3, expiresAtMs: 10_000 })).not.toBe(token);
  });
});

describe('webhook body and signature', () => {
  it('signs "<timestamp>.<body>" with HMAC-SHA256 in hex', () => {
    // RFC 4231 §4.3 test case 2: key "Jefe", data "what do ya want for nothing?".
    expect(createHmac('sha256', 'Jefe').update('what do ya want for nothing?').digest('hex')).toBe('5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843');
    const body = webhookBodyText({ id: 'd1', event: 'alert.raised', atMs: 1_000, site: { name: 'Harbour' }, alert: webhookAlert(base) });
    const { timestamp, signature } = webhookSignature('Jefe', body, 1_784_383_200_123);
    expect(timestamp).toBe('1784383200');
    expect(signature).toBe(`sha256=${createHmac('sha256', 'Jefe').update(`1784383200.${body}`).digest('hex')}`);
    expect(JSON.parse(body)).toEqual({ id: 'd1', event: 'alert.raised', atMs: 1_000, site: { name: 'Harbour' }, alert: { id: 7, kind: 'level', level: 2, label: 'Lower', action: 'Lower the wall.', gustMps: 13.04, structure: { id: 3, name: 'LED wall' }, sensorKey: 'north-mast' } });
    expect(Object.keys(webhookAlert({ ...base, kind: 'sensor-silent', structureId: null, level: null, actionText: '', gustMps: null, acknowledgedBy: 'Ana', acknowledgeNote: 'seen' }))).toEqual(['id', 'kind', 'label', 'sensorKey', 'acknowledgedBy', 'note']);
  });
});

describe('notification settings from the environment', () => {
  it('refuses half a webhook, a short secret, a wrong SMTP scheme and SMTP without a sender, naming the variable', async () => {
    const { configFromEnv } = await import('../../server/config.ts');
    expect(() => configFromEnv({ ALERT_WEBHOOK_URL: 'https://gw.site.example/a' })).toThrow(/ALERT_WEBHOOK_SECRET/);
    expect(() => configFromEnv({ ALERT_WEBHOOK_URL: 'https://gw.site.example/a', ALERT_WEBHOOK_SECRET: 'short' })).toThrow(/ALERT_WEBHOOK_SECRET must be at least 16/);
    expect(() => configFromEnv({ ALERT_WEBHOOK_URL: 'ftp://gw', ALERT_WEBHOOK_SECRET: '0123456789abcdef' })).toThrow(/ALERT_WEBHOOK_URL must start with http/);
    expect(() => configFromEnv({ SMTP_URL: 'http://mail.site.example', SMTP_FROM: 'a@b.example' })).toThrow(/SMTP_URL must start with smtp/);
    expect(() => configFromEnv({ SMTP_URL: 'smtp://u:p@mail.site.example:587' })).toThrow(/SMTP_FROM/);
    const ok = configFromEnv({ SMTP_URL: 'smtps://u:p@mail.site.example', SMTP_FROM: 'a@b.example', ALERT_WEBHOOK_URL: 'http://10.0.0.5/sms', ALERT_WEBHOOK_SECRET: '0123456789abcdef' });
    expect([ok.smtpUrl, ok.smtpFrom, ok.alertWebhookUrl, ok.alertWebhookSecret]).toEqual(['smtps://u:p@mail.site.example', 'a@b.example', 'http://10.0.0.5/sms', '0123456789abcdef']);
  });
});
