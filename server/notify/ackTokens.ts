/**
 * Acknowledge links (design §4b: signed, single use, expiring): the token names the alert, the
 * person it was sent to, when it expires and a random nonce, signed with HMAC-SHA256 under a key
 * made on first start and kept in the database (`meta`). It is used up by the acknowledgement
 * (the nonce is stored), so a forwarded or replayed link cannot acknowledge again.
 */
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Storage } from '../storage/storage.ts';

export const ackLinkLifetimeMs = 2 * 3_600_000;

export interface AckClaim {
  alertId: number;
  personId: number;
  expiresAtMs: number;
  nonce: string;
}

export type AckCheck = { ok: true; claim: AckClaim } | { ok: false; reason: 'malformed' | 'bad-signature' | 'expired' };

const secretKey = 'notify_ack_secret';

export async function ackSecret(storage: Pick<Storage, 'meta'>, nowMs: number): Promise<Buffer> {
  const stored = await storage.meta.get(secretKey);
  if (stored !== null) return Buffer.from(stored, 'base64url');
  return Buffer.from(await storage.meta.setIfAbsent(secretKey, randomBytes(32).toString('base64url'), nowMs), 'base64url');
}

function sign(secret: Buffer, text: string): string {
  return createHmac('sha256', secret).update(text).digest('base64url');
}

export function makeAckToken(secret: Buffer, claim: Omit<AckClaim, 'nonce'>): string {
  const text = `${claim.alertId}.${claim.personId}.${claim.expiresAtMs}.${randomBytes(12).toString('base64url')}`;
  return `${text}.${sign(secret, text)}`;
}

export function checkAckToken(secret: Buffer, token: string, nowMs: number): AckCheck {
  const parts = token.split('.');
  if (parts.length !== 5 || !/^[0-9]{1,15}$/.test(parts[0]!) || !/^[0-9]{1,15}$/.test(parts[1]!) || !/^[0-9]{1,15}$/.test(parts[2]!) || !/^[A-Za-z0-9_-]{16}$/.test(parts[3]!)) return { ok: false, reason: 'malformed' };
  const text = parts.slice(0, 4).join('.');
  const expected = Buffer.from(sign(secret, text));
  const given = Buffer.from(parts[4]!);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false, reason: 'bad-signature' };
  const claim: AckClaim = { alertId: Number(parts[0]), personId: Number(parts[1]), expiresAtMs: Number(parts[2]), nonce: parts[3]! };
  if (nowMs >= claim.expiresAtMs) return { ok: false, reason: 'expired' };
  return { ok: true, claim };
}
