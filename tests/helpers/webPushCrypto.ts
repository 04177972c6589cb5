/**
 * Web Push cryptography written from the RFCs on node:crypto alone, for the tests: our own
 * aes128gcm encoder (RFC 8291 §3.3–3.4 key derivation, RFC 8188 §2 record format), with the
 * ephemeral key and salt injectable so RFC 8291 appendix A can be reproduced byte for byte; the
 * receiving browser's decoder (what a phone does with the push message); and the push service's
 * check of the VAPID header (RFC 8292 §2–3: a JWT signed ES256 = ECDSA P-256 with SHA-256, RFC 7518
 * §3.4, the signature as r ‖ s). Independent of the `web-push` package the server sends with, so
 * the tests check that package against the RFCs, not against itself.
 */
import { createCipheriv, createDecipheriv, createECDH, createHmac, createPublicKey, verify } from 'node:crypto';

const hmac = (key: Buffer, data: Buffer): Buffer => createHmac('sha256', key).update(data).digest();

export interface DerivedKeys {
  ecdhSecret: Buffer;
  prkKey: Buffer;
  keyInfo: Buffer;
  ikm: Buffer;
  prk: Buffer;
  cek: Buffer;
  nonce: Buffer;
}

/**
 * RFC 8291 §3.3 (combining the shared and authentication secrets) and §3.4 (the content
 * encryption key and nonce of RFC 8188 §2.2–2.3), each HKDF step of one block written out as its
 * HMAC (RFC 5869 §2.2 extract, §2.3 expand with T(1) only).
 */
export function deriveKeys(input: { ecdhSecret: Buffer; authSecret: Buffer; uaPublic: Buffer; asPublic: Buffer; salt: Buffer }): DerivedKeys {
  const prkKey = hmac(input.authSecret, input.ecdhSecret);
  const keyInfo = Buffer.concat([Buffer.from('WebPush: info\0', 'latin1'), input.uaPublic, input.asPublic]);
  const ikm = hmac(prkKey, Buffer.concat([keyInfo, Buffer.from([1])]));
  const prk = hmac(input.salt, ikm);
  const cek = hmac(prk, Buffer.from('Content-Encoding: aes128gcm\0\x01', 'latin1')).subarray(0, 16);
  const nonce = hmac(prk, Buffer.from('Content-Encoding: nonce\0\x01', 'latin1')).subarray(0, 12);
  return { ecdhSecret: input.ecdhSecret, prkKey, keyInfo, ikm, prk, cek, nonce };
}

/** One record's nonce: the base nonce XOR the record's sequence number (RFC 8188 §2.3). */
function recordNonce(base: Buffer, seq: number): Buffer {
  const out = Buffer.from(base);
  for (let i = 0, rest = seq; i < 6; i++, rest = Math.floor(rest / 256)) out[11 - i]! ^= rest & 0xff;
  return out;
}

/**
 * Encrypts as one aes128gcm record (RFC 8291 §4: a push message is a single record): header
 * salt ‖ rs ‖ idlen ‖ keyid (the sender's public key), then AES-128-GCM of plaintext ‖ 0x02 ‖ padding.
 */
export function encryptAes128gcm(input: { plaintext: Buffer; uaPublic: Buffer; authSecret: Buffer; asPrivate: Buffer; salt: Buffer; recordSize?: number; padding?: number }): { body: Buffer; keys: DerivedKeys; asPublic: Buffer } {
  const ecdh = createECDH('prime256v1');
  ecdh.setPrivateKey(input.asPrivate);
  const asPublic = ecdh.getPublicKey();
  const keys = deriveKeys({ ecdhSecret: ecdh.computeSecret(input.uaPublic), authSecret: input.authSecret, uaPublic: input.uaPublic, asPublic, salt: input.salt });
  const rs = input.recordSize ?? 4096;
  const record = Buffer.concat([input.plaintext, Buffer.from([2]), Buffer.alloc(input.padding ?? 0)]);
  if (record.length + 16 > rs) throw new RangeError(`plaintext of ${input.plaintext.length} bytes does not fit one record of ${rs}`);
  const cipher = createCipheriv('aes-128-gcm', keys.cek, recordNonce(keys.nonce, 0));
  const sealed = Buffer.concat([cipher.update(record), cipher.final(), cipher.getAuthTag()]);
  const header = Buffer.alloc(21);
  input.salt.copy(header, 0);
  header.writeUInt32BE(rs, 16);
  header[20] = asPublic.length;
  return { body: Buffer.concat([header, asPublic, sealed]), keys, asPublic };
}

/**
 * The receiving browser's side (RFC 8291 §3.4 from the user agent's keys, RFC 8188 §2): reads the
 * header, derives the same keys from its private key and auth secret, opens every record and
 * strips the padding and delimiter. Throws on anything that does not authenticate.
 */
export function decryptAes128gcm(body: Buffer, uaPrivate: Buffer, authSecret: Buffer): { plaintext: Buffer; salt: Buffer; recordSize: number; asPublic: Buffer } {
  if (body.length < 21) throw new Error('shorter than the aes128gcm header');
  const salt = body.subarray(0, 16);
  const rs = body.readUInt32BE(16);
  const idlen = body[20]!;
  const asPublic = body.subarray(21, 21 + idlen);
  if (idlen !== 65 || asPublic[0] !== 4) throw new Error(`keyid is not an uncompressed P-256 key (idlen ${idlen})`);
  if (rs < 18) throw new Error(`record size ${rs} is below 18 (RFC 8188 §2)`);
  const ecdh = createECDH('prime256v1');
  ecdh.setPrivateKey(uaPrivate);
  const uaPublic = ecdh.getPublicKey();
  const keys = deriveKeys({ ecdhSecret: ecdh.computeSecret(asPublic), authSecret, uaPublic, asPublic, salt });
  const records = body.subarray(21 + idlen);
  const parts: Buffer[] = [];
  let seq = 0;
  for (let at = 0; at < records.length; at += rs, seq++) {
    const chunk = records.subarray(at, Math.min(at + rs, records.length));
    if (chunk.length < 17) throw new Error('record shorter than its tag');
    const decipher = createDecipheriv('aes-128-gcm', keys.cek, recordNonce(keys.nonce, seq));
    decipher.setAuthTag(chunk.subarray(chunk.length - 16));
    const plain = Buffer.concat([decipher.update(chunk.subarray(0, chunk.length - 16)), decipher.final()]);
    let end = plain.length - 1;
    while (end >= 0 && plain[end] === 0) end--;
    const last = at + rs >= records.length;
    if (end < 0 || plain[end] !== (last ? 2 : 1)) throw new Error(`record ${seq} has no ${last ? 'last-record (0x02)' : 'record (0x01)'} delimiter`);
    parts.push(plain.subarray(0, end));
  }
  return { plaintext: Buffer.concat(parts), salt: Buffer.from(salt), recordSize: rs, asPublic: Buffer.from(asPublic) };
}

export interface VapidCheck {
  header: Record<string, unknown>;
  claims: { aud?: unknown; exp?: unknown; sub?: unknown };
  publicKey: string;
}

/**
 * The push service's check of `Authorization: vapid t=<JWT>, k=<key>` (RFC 8292 §3): the JWT's
 * signature verified with the key `k` (ES256, RFC 7515 §5.2 over "<header>.<claims>" as sent),
 * `aud` the origin of the push resource, `exp` in the future and no more than 24 hours ahead
 * (RFC 8292 §2), `sub` a mailto: or https: contact (§2.1). Throws naming what failed.
 */
export function verifyVapid(authorization: string, endpoint: string, nowMs: number): VapidCheck {
  const m = /^vapid\s+(.+)$/i.exec(authorization.trim());
  if (!m) throw new Error(`Authorization is not the vapid scheme: ${authorization.slice(0, 40)}`);
  const params = new Map<string, string>();
  for (const part of m[1]!.split(',')) {
    const eq = part.indexOf('=');
    if (eq > 0) params.set(part.slice(0, eq).trim().toLowerCase(), part.slice(eq + 1).trim());
  }
  const jwt = params.get('t');
  const k = params.get('k');
  if (!jwt || !k) throw new Error('vapid Authorization lacks t= or k=');
  const [h, c, s, extra] = jwt.split('.');
  if (!h || !c || !s || extra !== undefined) throw new Error('t is not a compact JWS of three parts');
  const header = JSON.parse(Buffer.from(h, 'base64url').toString('utf8')) as Record<string, unknown>;
  const claims = JSON.parse(Buffer.from(c, 'base64url').toString('utf8')) as VapidCheck['claims'];
  if (header.alg !== 'ES256') throw new Error(`JWT alg is ${String(header.alg)}, not ES256`);
  const raw = Buffer.from(k, 'base64url');
  if (raw.length !== 65 || raw[0] !== 4) throw new Error('k is not an uncompressed P-256 public key');
  const key = createPublicKey({ key: { kty: 'EC', crv: 'P-256', x: raw.subarray(1, 33).toString('base64url'), y: raw.subarray(33).toString('base64url') }, format: 'jwk' });
  const signature = Buffer.from(s, 'base64url');
  if (signature.length !== 64) throw new Error(`ES256 signature is ${signature.length} bytes, not 64 (r ‖ s)`);
  if (!verify('sha256', Buffer.from(`${h}.${c}`, 'ascii'), { key, dsaEncoding: 'ieee-p1363' }, signature)) throw new Error('the JWT signature does not verify with k');
  if (claims.aud !== new URL(endpoint).origin) throw new Error(`aud ${String(claims.aud)} is not the push resource's origin ${new URL(endpoint).origin}`);
  if (typeof claims.exp !== 'number') throw new Error('exp is missing');
  if (claims.exp * 1000 <= nowMs) throw new Error('exp is in the past');
  if (claims.exp * 1000 > nowMs + 24 * 3_600_000) throw new Error('exp is more than 24 hours ahead (RFC 8292 §2)');
  if (typeof claims.sub !== 'string' || !/^(mailto:|https:)/.test(claims.sub)) throw new Error(`sub ${String(claims.sub)} is not a mailto: or https: contact`);
  return { header, claims, publicKey: k };
}

/** A browser's subscription keys: a fresh P-256 pair and a 16-byte auth secret (as PushManager makes them). */
export function browserKeys(authSecret: Buffer): { uaPrivate: Buffer; uaPublic: Buffer; authSecret: Buffer; p256dh: string; auth: string } {
  const ecdh = createECDH('prime256v1');
  ecdh.generateKeys();
  const uaPublic = ecdh.getPublicKey();
  return { uaPrivate: ecdh.getPrivateKey(), uaPublic, authSecret, p256dh: uaPublic.toString('base64url'), auth: authSecret.toString('base64url') };
}
