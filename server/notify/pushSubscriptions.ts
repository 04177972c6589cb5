/**
 * Each person's Web Push subscriptions (table `notify_push_subscriptions`), one per browser: what
 * the browser's PushManager gave (the endpoint at its push service, its P-256 key and auth
 * secret) and the label the person gave the device. Subscribing the same browser again (the same
 * endpoint) updates the row, also when another person now signs in on it: a device alerts the
 * person who subscribed it last.
 *
 * This module checks what a browser sends; storage/pushSubscriptions.ts stores it.
 */
import { createPublicKey } from 'node:crypto';
import { z } from 'zod';
import { maxUrlLength } from '../engine/limits.ts';
import type { PushSubscriptionRow } from '../storage/pushSubscriptions.ts';

export type { PushSubscriptionRow };

/** Loopback only: a push service is always https (RFC 8030 §8); http is for a test endpoint on this machine. */
function loopbackHost(hostname: string): boolean {
  return hostname === 'localhost' || hostname === '[::1]' || /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(hostname);
}

const base64url = (field: string) => z.string({ error: `must be the ${field} key, base64url` }).trim().max(200, { error: 'is too long' }).regex(/^[A-Za-z0-9_-]+={0,2}$/, { error: 'must be base64url (A–Z, a–z, 0–9, - and _)' });

/** A P-256 public point, uncompressed (65 bytes, 0x04 ‖ x ‖ y, RFC 8291 §3.1), that lies on the curve. */
function isP256Point(text: string): boolean {
  const raw = Buffer.from(text, 'base64url');
  if (raw.length !== 65 || raw[0] !== 0x04) return false;
  try {
    createPublicKey({ key: { kty: 'EC', crv: 'P-256', x: raw.subarray(1, 33).toString('base64url'), y: raw.subarray(33).toString('base64url') }, format: 'jwk' });
    return true;
  } catch {
    return false;
  }
}

/** The body of POST /api/me/push-subscriptions: the browser's PushSubscription.toJSON() and a label. */
export const pushSubscribeSchema = z.strictObject({
  subscription: z.object(
    {
      endpoint: z
        .string({ error: 'must be the push service address the browser gave (PushSubscription.endpoint)' })
        .trim()
        .max(maxUrlLength, { error: `is longer than ${maxUrlLength} characters` })
        .superRefine((value, ctx) => {
          let url: URL;
          try {
            url = new URL(value);
          } catch {
            ctx.addIssue({ code: 'custom', message: 'is not a URL' });
            return;
          }
          if (url.protocol === 'https:' && url.hostname) return;
          if (url.protocol === 'http:' && loopbackHost(url.hostname)) return;
          ctx.addIssue({ code: 'custom', message: 'must be an https:// address (a push service)' });
        }),
      expirationTime: z.union([z.number(), z.null()]).optional(),
      keys: z.object(
        {
          p256dh: base64url('p256dh').refine(isP256Point, { error: 'must be the browser\'s P-256 public key (65 bytes, uncompressed)' }),
          auth: base64url('auth').refine((t) => Buffer.from(t, 'base64url').length === 16, { error: 'must be the 16-byte auth secret' }),
        },
        { error: 'must hold p256dh and auth (PushSubscription.toJSON().keys)' },
      ),
    },
    { error: 'must be the browser\'s PushSubscription (its toJSON())' },
  ),
  label: z.string({ error: 'must name this device' }).trim().min(1, { error: 'must not be empty' }).max(60, { error: 'is longer than 60 characters' }),
});
export type PushSubscribeBody = z.infer<typeof pushSubscribeSchema>;

export const pushLabelSchema = z.strictObject({ label: z.string({ error: 'must name this device' }).trim().min(1, { error: 'must not be empty' }).max(60, { error: 'is longer than 60 characters' }) });

/** As shown to its owner (the keys stay on the server). */
export function shownSubscription(row: PushSubscriptionRow) {
  let service = '';
  try {
    service = new URL(row.endpoint).host;
  } catch {
    service = '';
  }
  return { id: row.id, label: row.label, endpoint: row.endpoint, service, userAgent: row.userAgent, createdAtMs: row.createdAtMs, updatedAtMs: row.updatedAtMs, lastDeliveredAtMs: row.lastDeliveredAtMs };
}
