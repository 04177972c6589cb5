/**
 * The forecast feed (design §2.7, issue 17): the server polls a forecast from the address in the
 * site settings at the site's interval, reads it with the forecast table's parser
 * (foresight/parseForecastFeed.ts) and keeps every poll in `forecast_polls`, good or not.
 *
 * It never holds up ingest: the request is asynchronous with its own timer (unref'd, so it keeps
 * no process alive), one poll at a time (a poll asked for while one runs waits for it), a timeout
 * over the whole exchange (default 15 s) and a size cap (default 1 MB). A feed that fails —
 * refused, timed out, an HTTP error, too big, not text, not a table — is a stored failed poll
 * with the reason in words, retried with back-off (pollDelay.ts). Settings are read at each poll;
 * a change of address, interval or unit polls at once.
 */
import { performance } from 'node:perf_hooks';
import { parseForecastFeed, type ForecastSpeedUnit } from '../foresight/index.ts';
import type { Logger } from '../log.ts';
import { getSite } from '../register/site.ts';
import type { ForecastPoll } from '../storage/forecastPolls.ts';
import type { Storage } from '../storage/storage.ts';
import { fetchErrorWords, fetchFeed } from './fetchFeed.ts';
import { feedIsStale, nextPollDelayMs } from './pollDelay.ts';

export interface ForecastFeedOptions {
  /** Poll on the feed's own timer (default true). Off: only `pollNow()` polls (tests drive it). */
  timers?: boolean;
  /** Longest one poll may take, headers and body, ms (default 15 s). */
  timeoutMs?: number;
  /** Largest body read, bytes (default 1 MB). */
  maxBytes?: number;
  /** The feed's clock: poll times, ages and staleness (default the server's clock; tests move it). */
  now?: () => number;
}

export type { ForecastPoll };

export interface ForecastFeedSettings {
  url: string | null;
  intervalMs: number;
  unit: ForecastSpeedUnit | null;
  heightM: number;
}

export interface ForecastFeedStatus {
  configured: boolean;
  settings: ForecastFeedSettings;
  /** The newest poll of this address, good or not; null before the first. */
  lastPoll: ForecastPoll | null;
  /** The newest successful poll of this address: the forecast in use. */
  lastSuccess: ForecastPoll | null;
  /** Age of the forecast in use (now − its poll time), ms; null with none. */
  ageMs: number | null;
  /** No successful poll within twice the interval (always true when configured and none yet). */
  stale: boolean;
  consecutiveFailures: number;
  /** When the next poll is due on the timer; null when none is planned. */
  nextPollAtMs: number | null;
}

export const defaultFeedTimeoutMs = 15_000;
export const defaultFeedMaxBytes = 1_048_576;

export class ForecastFeed {
  private readonly timers: boolean;
  private readonly timeoutMs: number;
  private readonly maxBytes: number;
  private timer: NodeJS.Timeout | null = null;
  private nextAtMs: number | null = null;
  private running: Promise<ForecastPoll | null> | null = null;
  private readonly closing = new AbortController();
  private stopped = false;
  private settingsKey = '';
  /** Failed polls in a row of the address set now (reset from the database when it changes). */
  private failures = 0;

  private readonly deps: { storage: Storage; now: () => number; log?: Logger };

  constructor(deps: { storage: Storage; now: () => number; log?: Logger }, options: ForecastFeedOptions = {}) {
    this.deps = { ...deps, now: options.now ?? deps.now };
    this.timers = options.timers ?? true;
    this.timeoutMs = options.timeoutMs ?? defaultFeedTimeoutMs;
    this.maxBytes = options.maxBytes ?? defaultFeedMaxBytes;
  }

  /** The feed's clock. */
  now(): number {
    return this.deps.now();
  }

  async settings(): Promise<ForecastFeedSettings> {
    const site = await getSite(this.deps.storage);
    return { url: site.forecastFeedUrl, intervalMs: site.forecastFeedIntervalMs, unit: site.forecastFeedUnit, heightM: site.forecastFeedHeightM };
  }

  /** Plans the first poll: at once when the address has never been polled, else when the last poll's next one falls due. */
  async start(): Promise<void> {
    const s = await this.settings();
    this.settingsKey = settingsKey(s);
    this.failures = await this.storedFailures(s.url);
    if (s.url === null) return;
    const last = await this.lastPoll(s.url);
    const due = last === null ? 0 : last.atMs + nextPollDelayMs(s.intervalMs, this.failures) - this.deps.now();
    this.schedule(Math.max(0, due));
  }

  /** After the site settings changed: a new address, interval or unit is polled at once. */
  async settingsChanged(): Promise<void> {
    const s = await this.settings();
    const key = settingsKey(s);
    if (key === this.settingsKey) return;
    this.settingsKey = key;
    this.failures = await this.storedFailures(s.url);
    if (s.url === null) this.cancelTimer();
    else this.schedule(0);
  }

  /**
   * Polls now (after the poll running, if any: one at a time) and stores the result; null when no
   * feed is set or the server is closing. Never rejects.
   */
  pollNow(): Promise<ForecastPoll | null> {
    const previous = this.running;
    const next = (async () => {
      if (previous) await previous;
      return this.stopped ? null : this.pollOnce();
    })();
    const tracked = next.finally(() => {
      if (this.running === tracked) this.running = null;
    });
    this.running = tracked;
    return tracked;
  }

  async stop(): Promise<void> {
    this.stopped = true;
    this.cancelTimer();
    this.closing.abort();
    await this.running?.catch(() => undefined);
  }

  /** The newest poll of an address (any address when none is given). */
  lastPoll(url?: string | null): Promise<ForecastPoll | null> {
    return this.deps.storage.forecastPolls.last(url);
  }

  lastSuccess(url: string): Promise<ForecastPoll | null> {
    return this.deps.storage.forecastPolls.lastWith(url, true);
  }

  async status(nowMs = this.deps.now()): Promise<ForecastFeedStatus> {
    const settings = await this.settings();
    if (settings.url === null) {
      return { configured: false, settings, lastPoll: null, lastSuccess: null, ageMs: null, stale: false, consecutiveFailures: 0, nextPollAtMs: null };
    }
    const lastPoll = await this.lastPoll(settings.url);
    const lastSuccess = lastPoll?.ok ? lastPoll : await this.lastSuccess(settings.url);
    return {
      configured: true,
      settings,
      lastPoll,
      lastSuccess,
      ageMs: lastSuccess === null ? null : nowMs - lastSuccess.atMs,
      stale: feedIsStale(lastSuccess?.atMs ?? null, settings.intervalMs, nowMs),
      consecutiveFailures: await this.storedFailures(settings.url),
      nextPollAtMs: this.nextAtMs,
    };
  }

  /** For /api/health: configured, ok (the last poll read and the forecast not stale; null without a feed), stale, the newest failure. */
  async health(): Promise<{ configured: boolean; ok: boolean | null; stale: boolean; lastError: string | null; lastErrorAtMs: number | null; lastSuccessAtMs: number | null }> {
    const s = await this.status();
    if (!s.configured) return { configured: false, ok: null, stale: false, lastError: null, lastErrorAtMs: null, lastSuccessAtMs: null };
    const failed = await this.deps.storage.forecastPolls.lastWith(s.settings.url!, false);
    return {
      configured: true,
      ok: s.lastPoll?.ok === true && !s.stale,
      stale: s.stale,
      lastError: failed?.error ?? null,
      lastErrorAtMs: failed?.atMs ?? null,
      lastSuccessAtMs: s.lastSuccess?.atMs ?? null,
    };
  }

  private schedule(delayMs: number): void {
    if (!this.timers || this.stopped) return;
    this.cancelTimer();
    this.nextAtMs = this.deps.now() + delayMs;
    this.timer = setTimeout(() => void this.onTimer(), delayMs);
    this.timer.unref();
  }

  private cancelTimer(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.nextAtMs = null;
  }

  private async onTimer(): Promise<void> {
    this.timer = null;
    this.nextAtMs = null;
    await this.pollNow();
    const s = await this.settings();
    // A timer set meanwhile (settings changed during the poll) stands.
    if (s.url !== null && this.timer === null) this.schedule(nextPollDelayMs(s.intervalMs, this.failures));
  }

  /** Failed polls of this address since its last successful one (what the back-off counts). */
  private async storedFailures(url: string | null): Promise<number> {
    if (url === null) return 0;
    const good = await this.lastSuccess(url);
    return this.deps.storage.forecastPolls.failuresAfter(url, good?.id ?? 0);
  }

  private async pollOnce(): Promise<ForecastPoll | null> {
    const { storage, now, log } = this.deps;
    let settings: ForecastFeedSettings;
    let timeZone: string;
    try {
      settings = await this.settings();
      timeZone = (await getSite(storage)).timeZone;
    } catch (err) {
      log?.error({ err: fetchErrorWords(err) }, 'forecast feed: the site settings cannot be read');
      return null;
    }
    if (settings.url === null) return null;
    const url = settings.url;
    const atMs = now();
    const started = performance.now();
    const fetched = await fetchFeed(url, { timeoutMs: this.timeoutMs, maxBytes: this.maxBytes, signal: this.closing.signal });
    if (this.stopped) return null;
    let result: Omit<ForecastPoll, 'id' | 'atMs' | 'url' | 'durationMs'>;
    if (!fetched.ok) {
      result = { httpStatus: fetched.httpStatus, ok: false, error: fetched.error, format: null, rows: null, notes: [], bytes: fetched.bytes };
    } else {
      try {
        const read = parseForecastFeed(fetched.body, fetched.contentType, { ...(settings.unit ? { unit: settings.unit } : {}), timeZone });
        result = read.ok
          ? { httpStatus: fetched.httpStatus, ok: true, error: null, format: read.format, rows: [...read.rows], notes: [...read.notes], bytes: fetched.bytes }
          : { httpStatus: fetched.httpStatus, ok: false, error: `the feed cannot be read: ${read.error}`.slice(0, 2000), format: read.format, rows: null, notes: [...read.problems], bytes: fetched.bytes };
      } catch (err) {
        // A bad stored unit or time zone (RangeError): the poll fails with the reason, the server runs on.
        result = { httpStatus: fetched.httpStatus, ok: false, error: `the feed cannot be read: ${fetchErrorWords(err)}`, format: null, rows: null, notes: [], bytes: fetched.bytes };
      }
    }
    const durationMs = Math.round(performance.now() - started);
    const wasFailing = this.failures > 0;
    this.failures = result.ok ? 0 : this.failures + 1;
    if (!result.ok && !wasFailing) log?.warn({ url: redactedUrl(url), error: result.error }, 'forecast feed poll failed: the board shows the feed as failed');
    if (result.ok && wasFailing) log?.info({ url: redactedUrl(url), rows: result.rows?.length ?? 0 }, 'forecast feed read again');
    try {
      return await storage.forecastPolls.add({ atMs, url, durationMs, ...result });
    } catch (err) {
      log?.error({ err: fetchErrorWords(err) }, 'forecast feed: the poll cannot be stored');
      return { id: 0, atMs, url, durationMs, ...result };
    }
  }
}

function settingsKey(s: ForecastFeedSettings): string {
  return JSON.stringify([s.url, s.intervalMs, s.unit]);
}

/**
 * An address fit to show anyone signed in: the password and every query value hidden (a feed's
 * key often rides in the query): "https://forecast.example/site.csv?key=…".
 */
export function redactedUrl(url: string): string {
  try {
    const u = new URL(url);
    const names = [...u.searchParams.keys()];
    const query = names.length === 0 ? '' : `?${[...new Set(names)].map((n) => `${encodeURIComponent(n)}=…`).join('&')}`;
    const user = u.username ? `${u.username}${u.password ? ':…' : ''}@` : '';
    return `${u.protocol}//${user}${u.host}${u.pathname}${query}`;
  } catch {
    return 'an address that cannot be read';
  }
}
