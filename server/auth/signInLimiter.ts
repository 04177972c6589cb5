/**
 * Sign-in rate limiting: after `maxFailures` failed attempts within `windowMs` for the same key
 * (a username; an address has its own limiter with a higher limit, since a site's crew often
 * shares one address behind the same router), further attempts are refused until the window has passed.
 * A successful sign-in clears the username's count. In memory: a restart forgets, which costs an
 * attacker a restart they cannot cause.
 */
export interface SignInLimiterOptions {
  maxFailures: number;
  windowMs: number;
}

export class SignInLimiter {
  private readonly failures = new Map<string, number[]>();

  constructor(private readonly options: SignInLimiterOptions = { maxFailures: 5, windowMs: 15 * 60_000 }) {}

  /** Milliseconds until another attempt is allowed for any of `keys`, 0 when allowed now. */
  retryAfterMs(keys: readonly string[], nowMs: number): number {
    let wait = 0;
    for (const key of keys) {
      const recent = this.recent(key, nowMs);
      if (recent.length >= this.options.maxFailures) wait = Math.max(wait, recent[0]! + this.options.windowMs - nowMs);
    }
    return wait;
  }

  /**
   * Counts an attempt as failed before its password is checked, and returns the undo for when it
   * turns out right. Counting first matters: twenty guesses sent at once must not all pass the
   * check while the first password is still being hashed.
   */
  begin(keys: readonly string[], nowMs: number): () => void {
    this.fail(keys, nowMs);
    return () => {
      for (const key of keys) {
        const times = this.failures.get(key);
        if (!times) continue;
        const i = times.lastIndexOf(nowMs);
        if (i >= 0) times.splice(i, 1);
        if (times.length === 0) this.failures.delete(key);
      }
    };
  }

  fail(keys: readonly string[], nowMs: number): void {
    for (const key of keys) {
      const recent = this.recent(key, nowMs);
      recent.push(nowMs);
      this.failures.set(key, recent);
    }
    if (this.failures.size > 10_000) this.prune(nowMs);
  }

  succeed(key: string): void {
    this.failures.delete(key);
  }

  private recent(key: string, nowMs: number): number[] {
    return (this.failures.get(key) ?? []).filter((t) => nowMs - t < this.options.windowMs);
  }

  private prune(nowMs: number): void {
    for (const [key, times] of this.failures) {
      if (times.every((t) => nowMs - t >= this.options.windowMs)) this.failures.delete(key);
    }
  }
}
