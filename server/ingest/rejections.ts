/**
 * Rejected payloads: counted per sensor key and reason (kept in the database, visible through the
 * API), logged at most once per interval per sensor and reason, never stored as readings.
 * Counts are flushed to the database in the background so a flood of garbage costs one write a
 * second, not one per message.
 *
 * Refusals at the embedded broker (a login refused at CONNECT, a publish to a topic the gateway
 * may not use, a subscription) are kept in memory only, in `BrokerRefusals`: who (client id,
 * username, address), when, which topic, the reason, and of a refused publish no more than a
 * short excerpt of its payload. Grouped by who and why, so a gateway retrying every few seconds
 * fills one line, not the book; at most `maxRefusalGroups` groups, the stalest dropped first.
 */
import { rejectReasons } from './payloads/parseResult.ts';
import type { RejectionCount, RejectionStore } from '../storage/rejections.ts';
import type { Stored } from '../storage/storage.ts';
import type { Logger } from '../log.ts';

export type { RejectionCount };

/**
 * Every reason a message is rejected and counted: a payload's or a reading's (payloads/parseResult.ts),
 * and the message's own: a topic that is not a reading topic, a key no sensor has, a gateway
 * publishing for a sensor it is not linked to, and a server defect while handling it.
 */
export const ingestRejectReasons = [...rejectReasons, 'bad-topic', 'unknown-sensor', 'not-permitted', 'internal-error'] as const;
export type IngestRejectReason = (typeof ingestRejectReasons)[number];

/** How often the same sensor and reason may reach the log. */
export const rejectionLogIntervalMs = 60_000;
/**
 * Most sensor keys counted one by one (issue 13 item 9: 1,000 distinct unknown keys made 1,000
 * entries and log lines in 2.5 s). Past it, a key that is not a registered sensor's is counted in
 * one "other keys" entry per reason (its detail names the latest key); registered sensors always
 * keep their own entry.
 */
export const maxRejectionKeys = 200;
/** The key of the bucket for keys past `maxRejectionKeys`. */
export const otherKeysBucket = '(other keys)';
/** Most rejection log lines per interval across all keys; the rest are summed in one line. */
export const maxRejectionLogLinesPerInterval = 20;
const flushIntervalMs = 1_000;
const maxDetailLength = 300;

export class RejectionLog {
  private readonly counts = new Map<string, RejectionCount>();
  private readonly dirty = new Set<string>();
  private readonly lastLoggedAtMs = new Map<string, number>();
  private timer: NodeJS.Timeout | null = null;
  private total = 0;
  /** Refusals at the embedded broker since this server started (memory only, bounded). */
  readonly refusals: BrokerRefusals;

  private readonly sensorKeys = new Set<string>();
  private logWindowStartMs = -Infinity;
  private logLinesInWindow = 0;
  private unloggedInWindow = 0;

  /** The log with the counts stored so far (the constructor's arguments, `stored` read from `store`). */
  static async open(store: Pick<Stored<RejectionStore>, 'all' | 'save'>, log: Logger, now: () => number = Date.now, isRegistered: (sensorKey: string) => boolean = () => false): Promise<RejectionLog> {
    return new RejectionLog(store, log, now, isRegistered, await store.all());
  }

  /**
   * @param isRegistered whether a key is a registered sensor's (those are never bucketed); by
   *   default no key is, and every key past the cap goes to the bucket.
   * @param stored the counts stored so far (`open` reads them).
   */
  constructor(
    private readonly store: Pick<Stored<RejectionStore>, 'save'>,
    private readonly log: Logger,
    private readonly now: () => number = Date.now,
    private readonly isRegistered: (sensorKey: string) => boolean = () => false,
    stored: readonly RejectionCount[] = [],
  ) {
    this.refusals = new BrokerRefusals(now);
    for (const row of stored) {
      this.counts.set(`${row.sensorKey}\u0000${row.reason}`, row);
      this.sensorKeys.add(row.sensorKey);
      this.total += row.count;
    }
  }

  record(givenKey: string, reason: IngestRejectReason, detail: string): void {
    const atMs = this.now();
    const bucketed = !this.sensorKeys.has(givenKey) && this.sensorKeys.size >= maxRejectionKeys && !this.isRegistered(givenKey);
    const sensorKey = bucketed ? otherKeysBucket : givenKey;
    if (!bucketed) this.sensorKeys.add(sensorKey);
    const key = `${sensorKey}\u0000${reason}`;
    const fullDetail = bucketed ? `key "${givenKey.slice(0, 64)}": ${detail}` : detail;
    const shortDetail = fullDetail.length > maxDetailLength ? fullDetail.slice(0, maxDetailLength) + '…' : fullDetail;
    let entry = this.counts.get(key);
    if (!entry) {
      entry = { sensorKey, reason, count: 0, firstAtMs: atMs, lastAtMs: atMs, lastDetail: shortDetail };
      this.counts.set(key, entry);
    }
    entry.count++;
    entry.lastAtMs = atMs;
    entry.lastDetail = shortDetail;
    this.total++;
    this.dirty.add(key);
    const last = this.lastLoggedAtMs.get(key);
    if (last === undefined || atMs - last >= rejectionLogIntervalMs) {
      // Across keys too: at most maxRejectionLogLinesPerInterval lines a minute, then one line
      // with how many were left out.
      if (atMs - this.logWindowStartMs >= rejectionLogIntervalMs) {
        if (this.unloggedInWindow > 0) this.log.warn({ notLogged: this.unloggedInWindow }, 'more payloads rejected than logged in the last minute (counts are complete: GET /api/rejections)');
        this.logWindowStartMs = atMs;
        this.logLinesInWindow = 0;
        this.unloggedInWindow = 0;
      }
      if (this.logLinesInWindow < maxRejectionLogLinesPerInterval) {
        this.logLinesInWindow++;
        this.lastLoggedAtMs.set(key, atMs);
        this.log.warn({ sensorKey, reason, detail: shortDetail, countSoFar: entry.count }, 'payload rejected');
      } else {
        this.unloggedInWindow++;
      }
    }
    if (!this.timer) {
      this.timer = setTimeout(() => void this.flush(), flushIntervalMs);
      this.timer.unref();
    }
  }

  /** Writes changed counts to the database. */
  async flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (this.dirty.size === 0) return;
    const keys = [...this.dirty];
    this.dirty.clear();
    try {
      await this.store.save(keys.map((key) => this.counts.get(key)!));
    } catch (err) {
      // The counts stay in memory and are retried on the next rejection or flush.
      for (const key of keys) this.dirty.add(key);
      this.log.error({ err: String(err) }, 'could not store rejection counts');
    }
  }

  list(sensorKey?: string): RejectionCount[] {
    const all = [...this.counts.values()].map((e) => ({ ...e }));
    return sensorKey === undefined ? all : all.filter((e) => e.sensorKey === sensorKey);
  }

  get totalCount(): number {
    return this.total;
  }
}

/** What the broker refused: a connection (login), a publish, or a subscription. */
export type RefusalKind = 'connect' | 'publish' | 'subscribe';

/**
 * Why, as a code (the screens put it in words):
 * connect: `no-username`, `unknown-username` (no gateway has it, or it was revoked), `no-password`,
 * `wrong-password`, `check-failed` (the password check itself failed), `protocol` (the CONNECT
 * was refused before any login: an MQTT version the broker does not speak, a bad packet);
 * publish: `unknown-sensor` (no registered sensor has the topic's key), `other-sensor` (a
 * registered sensor of another gateway), `not-reading-topic`, `gateway-revoked` (revoked after it
 * connected); subscribe: `subscribe` (gateways publish; nobody subscribes here).
 */
export type RefusalReason =
  | 'no-username'
  | 'unknown-username'
  | 'no-password'
  | 'wrong-password'
  /** Too many failed sign-ins for this username or from this address: refused without checking. */
  | 'locked'
  /** The client id is in use by another gateway's live connection. */
  | 'client-id-taken'
  | 'check-failed'
  | 'protocol'
  | 'unknown-sensor'
  | 'other-sensor'
  | 'not-reading-topic'
  | 'gateway-revoked'
  | 'subscribe';

export interface RefusalInput {
  kind: RefusalKind;
  reason: RefusalReason;
  /** One plain sentence. */
  detail: string;
  clientId: string | null;
  username: string | null;
  /** The client's IP address, when the socket still had one. */
  address: string | null;
  topic: string | null;
  /** A refused publish's payload: only `excerptBytes` of it are kept. */
  payload?: Uint8Array | null;
}

export interface BrokerRefusal {
  kind: RefusalKind;
  reason: RefusalReason;
  detail: string;
  /** The client id of the latest refusal in this group (mqtt.js makes a new one per connection). */
  clientId: string | null;
  username: string | null;
  address: string | null;
  topic: string | null;
  /** The first bytes of the latest refused payload, control characters shown as "·"; null for no payload. */
  excerpt: string | null;
  count: number;
  firstAtMs: number;
  lastAtMs: number;
}

/** Groups kept at most (who and why); the group refused least recently is dropped first. */
export const maxRefusalGroups = 100;
/** Of a refused publish, this many bytes of the payload are kept, no more. */
export const excerptBytes = 48;
const maxFieldLength = 200;

const clip = (text: string | null | undefined, max = maxFieldLength): string | null => (text == null ? null : text.length > max ? text.slice(0, max) + '…' : text);

/** The first `excerptBytes` of a payload as text: invalid UTF-8 as U+FFFD, control characters as "·". */
export function payloadExcerpt(payload: Uint8Array): string {
  const head = payload.subarray(0, excerptBytes);
  const text = new TextDecoder('utf-8', { fatal: false }).decode(head).replace(/[\u0000-\u001f\u007f]/g, '·');
  return payload.length > excerptBytes ? `${text}…` : text;
}

export class BrokerRefusals {
  private readonly groups = new Map<string, BrokerRefusal>();
  private total = 0;
  private dropped = 0;
  readonly sinceMs: number;

  constructor(
    private readonly now: () => number = Date.now,
    private readonly maxGroups = maxRefusalGroups,
  ) {
    this.sinceMs = now();
  }

  record(input: RefusalInput): void {
    const atMs = this.now();
    const username = clip(input.username, 64);
    const topic = clip(input.topic);
    const address = clip(input.address, 64);
    const key = [input.kind, input.reason, username ?? '', address ?? '', topic ?? ''].join('\u0000');
    let group = this.groups.get(key);
    if (group) {
      // Most recent last in the map's order: delete and set again.
      this.groups.delete(key);
    } else {
      if (this.groups.size >= this.maxGroups) {
        const stalest = this.groups.keys().next().value as string;
        this.groups.delete(stalest);
        this.dropped++;
      }
      group = { kind: input.kind, reason: input.reason, detail: '', clientId: null, username, address, topic, excerpt: null, count: 0, firstAtMs: atMs, lastAtMs: atMs };
    }
    group.count++;
    group.lastAtMs = atMs;
    group.detail = clip(input.detail, 300) ?? '';
    group.clientId = clip(input.clientId, 64);
    group.excerpt = input.payload ? payloadExcerpt(input.payload) : null;
    this.groups.set(key, group);
    this.total++;
  }

  /** Newest first. */
  list(): BrokerRefusal[] {
    return [...this.groups.values()].reverse().map((g) => ({ ...g }));
  }

  /** Every refusal recorded since start, dropped groups included. */
  get totalCount(): number {
    return this.total;
  }

  /** Groups dropped to stay within the bound. */
  get droppedGroups(): number {
    return this.dropped;
  }

  get maxGroupCount(): number {
    return this.maxGroups;
  }
}
