/**
 * Alert notifications in words (README "Alert notifications", design §4b): what a filter lets
 * through, who a delivery went to, how it went, the escalation chain's times, and the one line the
 * board shows the competent person when messages are not getting out. Pure (no DOM, no fetch), so
 * the wording is tested against the server's own rules (tests/unit/web/notifyWords.test.ts).
 */
import type { NotifyFilter } from '../../server/notify/filter.ts';
import type { EscalationStep } from '../../server/notify/escalation.ts';
import type { Outbox } from '../../server/notify/outbox.ts';
import type { Role } from '../../server/auth/roles.ts';

export type { NotifyFilter, EscalationStep };

/** One row of GET /api/notify/deliveries. */
export type Delivery = Awaited<ReturnType<Outbox['recent']>>[number];

/** `/api/health`'s `notify` (and the counts GET /api/notify/deliveries repeats). */
export interface NotifyHealth {
  pending: number;
  failed: number;
  lastError: { atMs: number; target: string; channel: string; result: string } | null;
  email?: boolean;
  webhooks?: number;
}

/** GET/PATCH /api/me/notifications */
export interface MyNotifications {
  email: string | null;
  filter: NotifyFilter;
  emailAvailable: boolean;
}

/** GET /api/notify/webhooks (one entry); the environment's webhook has `id: "env"`. */
export interface WebhookView {
  id: number | 'env';
  name: string;
  url: string;
  filter: NotifyFilter;
  enabled: boolean;
  source: 'app' | 'environment';
  createdBy?: string;
  createdAtMs?: number;
  updatedAtMs?: number;
}

/** GET /api/notify/escalation */
export interface EscalationAnswer {
  chains: Array<{ level: number; steps: EscalationStep[]; updatedBy?: string; updatedAtMs?: number }>;
  recent: Array<{ alertId: number; step: number; atMs: number; target: string; reached: string }>;
}

/** Names the screens know, to say "webhook “Radio desk”" rather than "webhook:3". */
export interface TargetNames {
  webhooks?: ReadonlyMap<string, string>;
  people?: ReadonlyMap<number, string>;
  /** The signed-in person's id: their own deliveries read "you". */
  meId?: number | null;
}

/** "level 2 (Prepare)", or "level 5" when the site's levels do not name it. */
export function levelName(level: number, labels: readonly string[]): string {
  const label = labels[level - 1];
  return label ? `level ${level} (${label})` : `level ${level}`;
}

/**
 * What a filter lets through, in words. Follows server/notify/filter.ts: alerts that have no level
 * (no data, a sensor silent or implausible) pass a level filter, and alerts about a sensor pass a
 * structure filter — missing data is never calm.
 */
export function filterWords(filter: NotifyFilter, levelLabels: readonly string[], structureNames: ReadonlyMap<number, string>): string {
  if (filter.kind === 'all') return 'every alert';
  if (filter.kind === 'levels') return `alerts at ${levelName(filter.atLeast, levelLabels)} or higher, and every no-data and sensor alert`;
  const names = filter.structureIds.map((id) => structureNames.get(id) ?? `structure ${id} (no longer registered)`);
  return `alerts about ${listWords(names)}, and every sensor alert`;
}

/** "A", "A and B", "A, B and C". */
export function listWords(items: readonly string[]): string {
  if (items.length <= 1) return items[0] ?? 'nothing';
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

const eventNames: Readonly<Record<string, string>> = {
  'alert.raised': 'alert raised',
  'alert.resignalled': 'alert signalled again',
  'alert.escalated': 'alert escalated',
  'alert.acknowledged': 'alert acknowledged',
  'alert.cleared': 'alert cleared',
  'alert.overdue': 'action overdue',
  test: 'test message',
};

export function eventWords(event: string): string {
  return eventNames[event] ?? event;
}

export const roleGroupNames: Readonly<Record<Role, string>> = {
  viewer: 'every viewer',
  crew: 'every crew member',
  'competent-person': 'every competent person',
  admin: 'every administrator',
};

/** Who a delivery went to: "webhook “Radio desk”", "e-mail to you", "push to Ana". */
export function targetWords(channel: string, target: string, names: TargetNames = {}): string {
  const how = channel === 'email' ? 'e-mail' : channel === 'push' ? 'push' : channel === 'webhook' ? 'webhook' : channel;
  if (target === 'webhook:env') return 'webhook ALERT_WEBHOOK_URL';
  const [kind, rest = ''] = splitTarget(target);
  if (kind === 'webhook') {
    // Without the list of webhooks the number is all there is; with it, a missing one was removed.
    if (!names.webhooks) return `webhook ${rest}`;
    const name = names.webhooks.get(rest);
    return name ? `webhook “${name}”` : `webhook ${rest} (removed)`;
  }
  if (kind === 'person') {
    const id = Number(rest);
    if (names.meId !== undefined && names.meId !== null && id === names.meId) return `${how} to you`;
    const name = names.people?.get(id);
    return `${how} to ${name ?? `person ${rest}`}`;
  }
  if (kind === 'role') return `${how} to ${roleGroupNames[rest as Role] ?? rest}`;
  if (kind === 'push') return `push to device ${rest}`;
  return `${how} to ${target}`;
}

/** An escalation step's target in words ("person:3" / "role:crew" as stored, or the step itself). */
export function stepTargetWords(step: Pick<EscalationStep, 'personId' | 'role'>, people: ReadonlyMap<number, string>): string {
  if (step.role !== undefined) return roleGroupNames[step.role];
  if (step.personId !== undefined) return people.get(step.personId) ?? `person ${step.personId}`;
  return 'nobody chosen yet';
}

function splitTarget(target: string): [string, string] {
  const i = target.indexOf(':');
  return i < 0 ? [target, ''] : [target.slice(0, i), target.slice(i + 1)];
}

export type DeliveryTone = 'ok' | 'bad' | 'wait';

export interface DeliveryState {
  tone: DeliveryTone;
  /** A symbol beside the words, so the state is never told by colour alone. */
  mark: '✓' | '✖' | '…';
  words: string;
}

/**
 * How a delivery stands. A pending delivery whose last attempt failed is shown as failing (it
 * stands out like a failed one): the receiver is not getting it now, whatever the retries may do.
 * `time` formats a time of day in the site's zone.
 */
export function deliveryState(d: Pick<Delivery, 'status' | 'attempts' | 'lastError' | 'nextAttemptAtMs' | 'deliveredAtMs' | 'attemptLog'>, nowMs: number, time: (ms: number) => string): DeliveryState {
  const tries = `${d.attempts} attempt${d.attempts === 1 ? '' : 's'}`;
  if (d.status === 'delivered') {
    return { tone: 'ok', mark: '✓', words: `Delivered${d.deliveredAtMs !== null ? ` at ${time(d.deliveredAtMs)}` : ''}${d.attempts > 1 ? ` after ${tries}` : ''}` };
  }
  const last = d.attemptLog.length > 0 ? d.attemptLog[d.attemptLog.length - 1]! : null;
  const reason = last && !last.ok ? last.result : d.lastError;
  if (d.status === 'failed') return { tone: 'bad', mark: '✖', words: `Failed: given up after ${tries}${reason ? ` — ${reason}` : ''}` };
  if (d.attempts === 0) return { tone: 'wait', mark: '…', words: 'Waiting to be sent' };
  const next = d.nextAttemptAtMs === null ? '' : d.nextAttemptAtMs <= nowMs ? '; trying again now' : `; next try in ${shortWait(d.nextAttemptAtMs - nowMs)}`;
  return { tone: 'bad', mark: '✖', words: `Not delivered yet: ${tries} failed${reason ? ` — ${reason}` : ''}${next}` };
}

/** "5 s", "2 min", "1 h 15 min": a wait ahead. */
export function shortWait(ms: number): string {
  const s = Math.max(1, Math.ceil(ms / 1000));
  if (s < 90) return `${s}\u00a0s`;
  const min = Math.round(s / 60);
  if (min < 90) return `${min}\u00a0min`;
  return `${Math.floor(min / 60)}\u00a0h ${min % 60}\u00a0min`;
}

/** The delivery filters of the panel; `undefined` is every status. */
export const deliveryStatuses = ['pending', 'delivered', 'failed'] as const;
export type DeliveryStatus = (typeof deliveryStatuses)[number];

// ---------- escalation chains ----------

/** Minutes after the alert at which each step falls due: each step's minutes add to the ones before (server/notify/escalation.ts). */
export function stepDueMinutes(steps: readonly Pick<EscalationStep, 'afterMinutes'>[]): number[] {
  let at = 0;
  return steps.map((s) => (at += s.afterMinutes));
}

/** The steps with one moved up (delta −1) or down (+1); out of range leaves them as they are. */
export function moveStep<T>(steps: readonly T[], index: number, delta: -1 | 1): T[] {
  const to = index + delta;
  if (index < 0 || index >= steps.length || to < 0 || to >= steps.length) return [...steps];
  const out = [...steps];
  [out[index], out[to]] = [out[to]!, out[index]!];
  return out;
}

export function removeStep<T>(steps: readonly T[], index: number): T[] {
  return steps.filter((_, i) => i !== index);
}

/**
 * The body of PUT /api/notify/escalation from the chains as edited: levels in order, chains
 * without steps left out (the server stores none for them either).
 */
export function escalationBody(chains: ReadonlyMap<number, readonly EscalationStep[]>): { chains: Array<{ level: number; steps: EscalationStep[] }> } {
  return {
    chains: [...chains.entries()]
      .filter(([, steps]) => steps.length > 0)
      .sort(([a], [b]) => a - b)
      .map(([level, steps]) => ({ level, steps: steps.map((s) => (s.role !== undefined ? { afterMinutes: s.afterMinutes, role: s.role } : { afterMinutes: s.afterMinutes, personId: s.personId! })) })),
  };
}

// ---------- the board's line for the competent person ----------

/** A channel counts as failing now when its newest failed attempt is this recent and messages still wait. */
export const failingNowWithinMs = 15 * 60_000;

/**
 * The line the board shows the competent person about messages not getting out, or null when
 * there is nothing to tell (so the board stays uncluttered). Shown when more deliveries have
 * failed than the person has marked as seen, or when messages wait while a channel has just
 * failed; a few messages briefly waiting to go are not news.
 */
export function notifyTroubleLine(h: NotifyHealth | null, seenFailed: number, nowMs: number, targetName: (channel: string, target: string) => string): { text: string; newFailed: boolean } | null {
  if (!h) return null;
  const newFailed = h.failed > seenFailed;
  const failingNow = h.pending > 0 && h.lastError !== null && nowMs - h.lastError.atMs <= failingNowWithinMs;
  if (!newFailed && !failingNow) return null;
  const parts: string[] = [];
  if (h.failed > 0) parts.push(`${h.failed} failed`);
  if (h.pending > 0) parts.push(`${h.pending} waiting`);
  const last = h.lastError ? ` · last error: ${h.lastError.target === '*' ? '' : `${targetName(h.lastError.channel, h.lastError.target)}: `}${h.lastError.result}` : '';
  return { text: `Alert messages not getting out: ${parts.join(', ')}${last}`, newFailed };
}

// ---------- what reaches a locked phone ----------

export type PushChoiceState = 'checking' | 'no-server' | 'no-browser' | 'blocked' | 'off' | 'on' | 'error';

/**
 * What reaches this person when the phone is locked or the board is closed, one sentence per
 * channel, and whether anything does at all.
 */
export function lockedPhoneWords(p: { push: PushChoiceState; otherPushDevices?: number; email: string | null; emailAvailable: boolean; filterText: string }): { lines: Array<{ reaches: boolean; text: string }>; nothing: boolean } {
  const lines: Array<{ reaches: boolean; text: string }> = [];
  if (p.push === 'on') lines.push({ reaches: true, text: `Push on this phone: ${p.filterText}, even when it is locked.` });
  const others = p.otherPushDevices ?? 0;
  if (others > 0) lines.push({ reaches: true, text: `Push on ${others === 1 ? 'your other device' : `your ${others} other devices`}: ${p.filterText}.` });
  if (p.email && p.emailAvailable) lines.push({ reaches: true, text: `E-mail to ${p.email}: ${p.filterText} (raised, signalled again, overdue, escalated).` });
  if (p.email && !p.emailAvailable) lines.push({ reaches: false, text: `E-mail to ${p.email} is saved, but this server cannot send e-mail yet (SMTP_URL is not set): nothing goes out by e-mail.` });
  return { lines, nothing: !lines.some((l) => l.reaches) };
}

// ---------- the filter as edited ----------

/** A filter being edited: every choice kept, so switching kind back and forth loses nothing. */
export interface FilterDraft {
  kind: NotifyFilter['kind'];
  atLeast: number;
  structureIds: number[];
}

export function filterDraft(filter: NotifyFilter): FilterDraft {
  return { kind: filter.kind, atLeast: filter.kind === 'levels' ? filter.atLeast : 2, structureIds: filter.kind === 'structures' ? [...filter.structureIds] : [] };
}

/** The filter to save, or why it cannot be saved. */
export function filterFromDraft(d: FilterDraft): { filter: NotifyFilter } | { error: string } {
  if (d.kind === 'all') return { filter: { kind: 'all' } };
  if (d.kind === 'levels') return { filter: { kind: 'levels', atLeast: d.atLeast } };
  if (d.structureIds.length === 0) return { error: 'choose at least one structure (or another filter)' };
  return { filter: { kind: 'structures', structureIds: [...d.structureIds].sort((a, b) => a - b) } };
}
