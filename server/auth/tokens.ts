/** Random tokens for sessions, CSRF and site links, and the SHA-256 under which they are stored. */
import { createHash, randomBytes } from 'node:crypto';

/** 32 random bytes, URL-safe: 256 bits, beyond guessing. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

export function tokenHash(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
