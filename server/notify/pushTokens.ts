/**
 * The tokens behind a push notification's buttons (design §4b: signed, single use, expiring), made
 * as the acknowledge links of ackTokens.ts are (the same key, HMAC-SHA256, a random nonce stored
 * when used) but marked with their purpose: `pa.<ack|done>.<alertId>.<personId>.<expiresAtMs>.<nonce>.<signature>`.
 * The purpose is under the signature, so an e-mail link is no "Done" button and an
 * "Acknowledge" button no "Done" one.
 */
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

export type PushAction = 'ack' | 'done';

export interface PushActionClaim {
  action: PushAction;
  alertId: number;
  personId: number;
  expiresAtMs: number;
  nonce: string;
}

export type PushActionCheck = { ok: true; claim: PushActionClaim } | { ok: false; reason: 'malformed' | 'bad-signature' | 'expired' };

/** As long as an acknowledge link: a re-signalled alert brings fresh buttons (ackTokens.ts ackLinkLifetimeMs). */
export const pushActionLifetimeMs = 2 * 3_600_000;

function sign(secret: Buffer, text: string): string {
  return createHmac('sha256', secret).update(text).digest('base64url');
}

export function makePushActionToken(secret: Buffer, claim: Omit<PushActionClaim, 'nonce'>): string {
  const text = `pa.${claim.action}.${claim.alertId}.${claim.personId}.${claim.expiresAtMs}.${randomBytes(12).toString('base64url')}`;
  return `${text}.${sign(secret, text)}`;
}

const digits = /^[0-9]{1,15}$/;

export function checkPushActionToken(secret: Buffer, token: string, nowMs: number): PushActionCheck {
  const parts = token.split('.');
  if (parts.length !== 7 || parts[0] !== 'pa' || (parts[1] !== 'ack' && parts[1] !== 'done') || !digits.test(parts[2]!) || !digits.test(parts[3]!) || !digits.test(parts[4]!) || !/^[A-Za-z0-9_-]{16}$/.test(parts[5]!)) {
    return { ok: false, reason: 'malformed' };
  }
  const text = parts.slice(0, 6).join('.');
  const expected = Buffer.from(sign(secret, text));
  const given = Buffer.from(parts[6]!);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false, reason: 'bad-signature' };
  const claim: PushActionClaim = { action: parts[1], alertId: Number(parts[2]), personId: Number(parts[3]), expiresAtMs: Number(parts[4]), nonce: parts[5]! };
  if (nowMs >= claim.expiresAtMs) return { ok: false, reason: 'expired' };
  return { ok: true, claim };
}
