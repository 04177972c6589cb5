/**
 * The webhook channel: POSTs the delivery's body (fixed when it was queued, so every retry
 * carries the same id) to the webhook's address, signed with its secret at the attempt's time.
 * A 2xx answer is delivered; anything else, a refused connection or a timeout is retried.
 */
import { webhookSignature } from '../webhookBody.ts';
import { errorWords, type AttemptResult, type Channel, type OutgoingDelivery } from './channel.ts';

export interface WebhookEndpoint {
  url: string;
  secret: string;
}

export interface WebhookPayload {
  /** The body text exactly as sent and signed. */
  body: string;
}

export class WebhookChannel implements Channel {
  readonly name = 'webhook';

  constructor(
    /** The webhook a target names, as it is now (a changed address or secret applies to retries); null when removed. */
    private readonly endpoint: (target: string) => Promise<WebhookEndpoint | null>,
    private readonly now: () => number = Date.now,
    readonly timeoutMs = 10_000,
  ) {}

  async send(delivery: OutgoingDelivery, signal: AbortSignal): Promise<AttemptResult> {
    const endpoint = await this.endpoint(delivery.target);
    if (endpoint === null) return { ok: false, result: 'the webhook was removed or switched off', permanent: true };
    const { body } = delivery.payload as WebhookPayload;
    const { timestamp, signature } = webhookSignature(endpoint.secret, body, this.now());
    try {
      const res = await fetch(endpoint.url, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'user-agent': 'holdfast-alerts', 'x-signature-timestamp': timestamp, 'x-signature': signature },
        body,
        redirect: 'manual',
        signal,
      });
      // The answer's body is not needed; read it so the connection is freed.
      await res.arrayBuffer().catch(() => undefined);
      return { ok: res.status >= 200 && res.status < 300, result: `HTTP ${res.status}` };
    } catch (err) {
      if (signal.aborted) return { ok: false, result: `timed out after ${Math.round(this.timeoutMs / 1000)} s` };
      return { ok: false, result: errorWords(err) };
    }
  }
}
