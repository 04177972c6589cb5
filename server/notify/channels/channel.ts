/**
 * One channel per module (webhook.ts, email.ts; a push channel is one more): it sends one
 * delivery and says how it went. It never throws, and keeps to the time it is given, so a
 * channel that hangs or refuses holds only its own deliveries.
 */
export interface AttemptResult {
  ok: boolean;
  /** In words: "HTTP 200", "HTTP 500", "timed out after 10 s", "250 Accepted", "connect ECONNREFUSED 127.0.0.1:9". */
  result: string;
  /** No retry can help (the webhook was removed, the address is refused): give up now. */
  permanent?: boolean;
}

export interface OutgoingDelivery {
  deliveryId: string;
  /** 'webhook:env', 'webhook:<id>', 'person:<id>'. */
  target: string;
  payload: unknown;
}

export interface Channel {
  readonly name: string;
  /** Longest one attempt may take. */
  readonly timeoutMs: number;
  send(delivery: OutgoingDelivery, signal: AbortSignal): Promise<AttemptResult>;
  close?(): void;
}

/** An error in words, for the attempt log (never a stack). */
export function errorWords(err: unknown): string {
  if (err instanceof Error) {
    const cause = (err as { cause?: unknown }).cause;
    const causeText = cause instanceof Error ? cause.message : '';
    const text = causeText && !err.message.includes(causeText) ? `${err.message}: ${causeText}` : err.message;
    return text.slice(0, 300);
  }
  return String(err).slice(0, 300);
}
