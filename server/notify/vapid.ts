/**
 * The server's VAPID key pair (RFC 8292 §3): a P-256 key made on first start and kept in the data
 * folder (`vapid.json`, mode 0600: the private key lets anyone push to every subscribed phone).
 * Browsers bind each subscription to the public key they were given (`applicationServerKey`), so
 * the key is never replaced on its own: a new key means every phone must subscribe again.
 */
import { createECDH } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import webpush from 'web-push';
import type { Config } from '../config.ts';

export interface VapidKeys {
  /** The uncompressed P-256 point (65 bytes), base64url: what browsers take as applicationServerKey. */
  publicKey: string;
  /** The private scalar (32 bytes), base64url. */
  privateKey: string;
  /** RFC 8292 §2.1 "sub": who to contact about this sender. */
  subject: string;
  /** Where the pair is kept. */
  file: string;
}

export const vapidFileName = 'vapid.json';

/** Fallback when nothing better is configured; README "Alert notifications" says to set VAPID_SUBJECT. */
export const fallbackVapidSubject = 'mailto:holdfast@localhost';

/**
 * RFC 8292 §2.1: a mailto: or https: contact. VAPID_SUBJECT, else the https PUBLIC_URL, else the
 * SMTP_FROM address, else a placeholder that the push services of the big browsers accept today
 * (an https://localhost subject is refused by Apple's, as web-push warns).
 */
export function vapidSubject(config: Pick<Config, 'vapidSubject' | 'publicUrl' | 'smtpFrom'>): string {
  if (config.vapidSubject) return config.vapidSubject;
  if (config.publicUrl && config.publicUrl.startsWith('https://') && !/^https:\/\/localhost(:|$)/.test(config.publicUrl)) return config.publicUrl;
  const address = config.smtpFrom ? (/<([^<>\s]+@[^<>\s]+)>/.exec(config.smtpFrom)?.[1] ?? (/^[^\s@<>]+@[^\s@<>]+$/.test(config.smtpFrom.trim()) ? config.smtpFrom.trim() : null)) : null;
  return address ? `mailto:${address}` : fallbackVapidSubject;
}

function isKeyPair(value: unknown): value is { publicKey: string; privateKey: string } {
  if (typeof value !== 'object' || value === null) return false;
  const v = value as Record<string, unknown>;
  if (typeof v.publicKey !== 'string' || typeof v.privateKey !== 'string') return false;
  const pub = Buffer.from(v.publicKey, 'base64url');
  const priv = Buffer.from(v.privateKey, 'base64url');
  if (pub.length !== 65 || pub[0] !== 0x04 || priv.length !== 32) return false;
  // The pair must belong together: the public point from the private scalar must be the one stored.
  try {
    const ecdh = createECDH('prime256v1');
    ecdh.setPrivateKey(priv);
    return ecdh.getPublicKey().equals(pub);
  } catch {
    return false;
  }
}

/**
 * Reads the pair from `<dataDir>/vapid.json`, making it on first start. A file that cannot be read
 * or holds no valid pair throws with the file's name: it is not replaced, since that would
 * silently cut off every subscribed phone (the caller runs without push and says why).
 */
export function loadVapidKeys(dataDir: string, subject: string, nowMs: number): VapidKeys {
  const file = path.join(dataDir, vapidFileName);
  let text: string | null = null;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw new Error(`cannot read the push key file ${file}: ${(err as Error).message}`);
  }
  if (text === null) {
    const made = webpush.generateVAPIDKeys();
    fs.mkdirSync(dataDir, { recursive: true });
    try {
      // 'wx': two servers starting on one folder cannot both write; mode 0600 whatever the umask.
      fs.writeFileSync(file, `${JSON.stringify({ publicKey: made.publicKey, privateKey: made.privateKey, createdAtMs: nowMs }, null, 2)}\n`, { flag: 'wx', mode: 0o600 });
      fs.chmodSync(file, 0o600);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw new Error(`cannot write the push key file ${file}: ${(err as Error).message}`);
    }
    return loadVapidKeys(dataDir, subject, nowMs);
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    throw new Error(`the push key file ${file} is not JSON: restore it from a backup, or delete it to make a new key (every phone must then subscribe again)`);
  }
  if (!isKeyPair(parsed)) throw new Error(`the push key file ${file} holds no valid P-256 key pair: restore it from a backup, or delete it to make a new key (every phone must then subscribe again)`);
  // Kept private even when it was copied in with looser rights.
  if ((fs.statSync(file).mode & 0o077) !== 0) fs.chmodSync(file, 0o600);
  return { publicKey: parsed.publicKey, privateKey: parsed.privateKey, subject, file };
}
