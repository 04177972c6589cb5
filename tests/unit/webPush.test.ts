/**
 * Web Push cryptography (design §4b, issue 16) against its standards:
 * - RFC 8291 appendix A, the worked example ("When I grow up, I want to be a watermelon"): our own
 *   node:crypto encoder (tests/helpers/webPushCrypto.ts, RFC 8291 §3.3–3.4 and RFC 8188 §2) given
 *   the example's sender key and salt reproduces every published intermediate value and the
 *   published message byte for byte, and our decoder opens the published message with the
 *   example's receiver key. The `web-push` package draws its ephemeral key and salt itself (no way
 *   to inject them), so what it sends is checked by decrypting it with that decoder.
 * - RFC 8292 §2–3: the VAPID header web-push makes verifies (ES256 over header and claims, aud the
 *   push resource's origin, exp within 24 h, sub a contact).
 * Then the server's own parts: the button tokens, the notification's content, the key file, the
 * subscription's validation.
 */
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import webpush from 'web-push';
import { describe, expect, it } from 'vitest';
import { ConfigError, configFromEnv } from '../../server/config.ts';
import { makeAckToken } from '../../server/notify/ackTokens.ts';
import { alertPushMessage, buttonsFor } from '../../server/notify/pushMessage.ts';
import { pushSubscribeSchema } from '../../server/notify/pushSubscriptions.ts';
import { checkPushActionToken, makePushActionToken } from '../../server/notify/pushTokens.ts';
import { fallbackVapidSubject, loadVapidKeys, vapidFileName, vapidSubject } from '../../server/notify/vapid.ts';
import type { OpenAlert } from '../../server/watch/watch.ts';
import { browserKeys, decryptAes128gcm, encryptAes128gcm, verifyVapid } from '../helpers/webPushCrypto.ts';

const b64 = (text: string): Buffer => Buffer.from(text, 'base64url');

/** RFC 8291 appendix A (the example's inputs, intermediate values and message, all base64url as published). */
const rfc = {
  plaintext: 'When I grow up, I want to be a watermelon',
  asPublic: 'BP4z9KsN6nGRTbVYI_c7VJSPQTBtkgcy27mlmlMoZIIgDll6e3vCYLocInmYWAmS6TlzAC8wEqKK6PBru3jl7A8',
  asPrivate: 'yfWPiYE-n46HLnH0KqZOF1fJJU3MYrct3AELtAQ-oRw',
  uaPublic: 'BCVxsr7N_eNgVRqvHtD0zTZsEc6-VV-JvLexhqUzORcxaOzi6-AYWXvTBHm4bjyPjs7Vd8pZGH6SRpkNtoIAiw4',
  uaPrivate: 'q1dXpw3UpT5VOmu_cf_v6ih07Aems3njxI-JWgLcM94',
  salt: 'DGv6ra1nlYgDCS1FRnbzlw',
  authSecret: 'BTBZMqHH6r4Tts7J_aSIgg',
  ecdhSecret: 'kyrL1jIIOHEzg3sM2ZWRHDRB62YACZhhSlknJ672kSs',
  prkKey: 'Snr3JMxaHVDXHWJn5wdC52WjpCtd2EIEGBykDcZW32k',
  keyInfo: 'V2ViUHVzaDogaW5mbwAEJXGyvs3942BVGq8e0PTNNmwRzr5VX4m8t7GGpTM5FzFo7OLr4BhZe9MEebhuPI-OztV3ylkYfpJGmQ22ggCLDgT-M_SrDepxkU21WCP3O1SUj0EwbZIHMtu5pZpTKGSCIA5Zent7wmC6HCJ5mFgJkuk5cwAvMBKiiujwa7t45ewP',
  ikm: 'S4lYMb_L0FxCeq0WhDx813KgSYqU26kOyzWUdsXYyrg',
  prk: '09_eUZGrsvxChDCGRCdkLiDXrReGOEVeSCdCcPBSJSc',
  cek: 'oIhVW04MRdy2XN9CiKLxTg',
  nonce: '4h_95klXJ5E_qnoN',
  body:
    'DGv6ra1nlYgDCS1FRnbzlwAAEABBBP4z9KsN6nGRTbVYI_c7VJSPQTBtkgcy27ml' +
    'mlMoZIIgDll6e3vCYLocInmYWAmS6TlzAC8wEqKK6PBru3jl7A_yl95bQpu6cVPT' +
    'pK4Mqgkf1CXztLVBSt2Ks3oZwbuwXPXLWyouBWLVWGNWQexSgSxsj_Qulcy4a-fN',
};

describe('RFC 8291 appendix A: the worked example', () => {
  it('our encoder (RFC 8291 §3.3–3.4) reproduces every intermediate value and the message byte for byte', () => {
    const out = encryptAes128gcm({ plaintext: Buffer.from(rfc.plaintext), uaPublic: b64(rfc.uaPublic), authSecret: b64(rfc.authSecret), asPrivate: b64(rfc.asPrivate), salt: b64(rfc.salt) });
    expect(out.asPublic.toString('base64url')).toBe(rfc.asPublic);
    expect(out.keys.ecdhSecret.toString('base64url')).toBe(rfc.ecdhSecret);
    expect(out.keys.prkKey.toString('base64url')).toBe(rfc.prkKey);
    expect(out.keys.keyInfo.toString('base64url')).toBe(rfc.keyInfo);
    expect(out.keys.ikm.toString('base64url')).toBe(rfc.ikm);
    expect(out.keys.prk.toString('base64url')).toBe(rfc.prk);
    expect(out.keys.cek.toString('base64url')).toBe(rfc.cek);
    expect(out.keys.nonce.toString('base64url')).toBe(rfc.nonce);
    expect(out.body.toString('base64url')).toBe(rfc.body);
  });

  it('our decoder (the receiver\'s side, RFC 8291 §3.4 and RFC 8188 §2) opens the published message with the receiver\'s key', () => {
    const opened = decryptAes128gcm(b64(rfc.body), b64(rfc.uaPrivate), b64(rfc.authSecret));
    expect(opened.plaintext.toString('utf8')).toBe(rfc.plaintext);
    expect(opened.recordSize).toBe(4096);
    expect(opened.salt.toString('base64url')).toBe(rfc.salt);
    expect(opened.asPublic.toString('base64url')).toBe(rfc.asPublic);
  });

  it('our decoder refuses the published message with one bit changed, or with another auth secret', () => {
    const tampered = b64(rfc.body);
    tampered[tampered.length - 20]! ^= 0x01;
    expect(() => decryptAes128gcm(tampered, b64(rfc.uaPrivate), b64(rfc.authSecret))).toThrow();
    expect(() => decryptAes128gcm(b64(rfc.body), b64(rfc.uaPrivate), randomBytes(16))).toThrow();
  });
});

const vapid = webpush.generateVAPIDKeys();
const vapidDetails = { subject: 'mailto:site-office@harbour-festival.example', publicKey: vapid.publicKey, privateKey: vapid.privateKey };

describe('what web-push sends, checked with our RFC code', () => {
  it('decrypts (RFC 8291 §4: one aes128gcm record, rs 4096, the sender key as keyid) to the JSON given', () => {
    const browser = browserKeys(randomBytes(16));
    const message = JSON.stringify({ title: 'Alert: Harbour stage LED wall', body: 'ACTION: Lower the LED wall to its bottom stop.' });
    const details = webpush.generateRequestDetails({ endpoint: 'https://push.service.example/send/abc', keys: { p256dh: browser.p256dh, auth: browser.auth } }, message, { vapidDetails, contentEncoding: 'aes128gcm', TTL: 7200, urgency: 'high' });
    expect(details.headers['Content-Encoding']).toBe('aes128gcm');
    expect(details.headers.TTL).toBe(7200);
    expect(details.headers.Urgency).toBe('high');
    const body = details.body as Buffer;
    const opened = decryptAes128gcm(body, browser.uaPrivate, browser.authSecret);
    expect(opened.plaintext.toString('utf8')).toBe(message);
    expect(opened.recordSize).toBe(4096);
    // A fresh ephemeral key per message (RFC 8291 §3.1), never the VAPID key.
    expect(opened.asPublic.toString('base64url')).not.toBe(vapid.publicKey);
    // Another browser's keys cannot open it.
    const other = browserKeys(browser.authSecret);
    expect(() => decryptAes128gcm(body, other.uaPrivate, other.authSecret)).toThrow();
  });

  it('signs a VAPID JWT that verifies (RFC 8292 §2–3: ES256, aud the endpoint origin, exp ≤ 24 h, sub)', () => {
    const browser = browserKeys(randomBytes(16));
    const endpoint = 'https://push.service.example:8443/send/abc?x=1';
    const details = webpush.generateRequestDetails({ endpoint, keys: { p256dh: browser.p256dh, auth: browser.auth } }, 'x', { vapidDetails, contentEncoding: 'aes128gcm' });
    const check = verifyVapid(String(details.headers.Authorization), endpoint, Date.now());
    expect(check.publicKey).toBe(vapid.publicKey);
    expect(check.claims.aud).toBe('https://push.service.example:8443');
    expect(check.claims.sub).toBe(vapidDetails.subject);
    // A signature made by another key does not verify with this one.
    const forged = String(details.headers.Authorization).replace(/k=[A-Za-z0-9_-]+/, `k=${webpush.generateVAPIDKeys().publicKey}`);
    expect(() => verifyVapid(forged, endpoint, Date.now())).toThrow(/signature/);
    // Sent to another push service, the audience is wrong.
    expect(() => verifyVapid(String(details.headers.Authorization), 'https://other.push.example/x', Date.now())).toThrow(/aud/);
  });
});

const alert: OpenAlert = {
  id: 41, kind: 'level', structureId: 3, sensorKey: 'harbour-mast', level: 2, label: 'Lower the screen', actionText: 'Lower the LED wall to its bottom stop.', raisedAtMs: 1_000, gustMps: 13.04, utilization: 0.75,
  lastSignalledAtMs: 1_000, clearedAtMs: null, acknowledgedAtMs: null, acknowledgedBy: null, acknowledgeNote: null, subject: 'Harbour stage LED wall', moveToConfiguration: 'lowered',
  actionDoneAtMs: null, actionDoneBy: null, actionDueAtMs: 121_000, overdueAtMs: null,
};

describe('the buttons\' tokens (signed, single use, expiring; ackTokens.ts\'s approach)', () => {
  const secret = randomBytes(32);
  it('carry their purpose, alert, person and expiry under the signature', () => {
    const t = makePushActionToken(secret, { action: 'done', alertId: 41, personId: 5, expiresAtMs: 10_000 });
    const check = checkPushActionToken(secret, t, 9_999);
    expect(check).toMatchObject({ ok: true, claim: { action: 'done', alertId: 41, personId: 5, expiresAtMs: 10_000 } });
    expect(checkPushActionToken(secret, t, 10_000)).toEqual({ ok: false, reason: 'expired' });
    expect(checkPushActionToken(randomBytes(32), t, 0)).toEqual({ ok: false, reason: 'bad-signature' });
    // The purpose cannot be swapped: "done" turned into "ack" no longer verifies.
    expect(checkPushActionToken(secret, t.replace('pa.done.', 'pa.ack.'), 0)).toEqual({ ok: false, reason: 'bad-signature' });
    // Another alert, same signature: refused.
    expect(checkPushActionToken(secret, t.replace('.41.', '.42.'), 0)).toEqual({ ok: false, reason: 'bad-signature' });
  });

  it('an e-mail acknowledge link is no notification button', () => {
    const link = makeAckToken(secret, { alertId: 41, personId: 5, expiresAtMs: 10_000 });
    expect(checkPushActionToken(secret, link, 0)).toEqual({ ok: false, reason: 'malformed' });
    expect(checkPushActionToken(secret, '', 0)).toEqual({ ok: false, reason: 'malformed' });
  });
});

describe('the notification', () => {
  it('offers Acknowledge and "Done: lowered" while neither is done, then only what is left', () => {
    expect(buttonsFor(alert, 'alert.raised').map((b) => b.title)).toEqual(['Acknowledge', 'Done: lowered']);
    expect(buttonsFor({ ...alert, acknowledgedAtMs: 2_000, acknowledgedBy: 'Ana' }, 'alert.acknowledged').map((b) => b.title)).toEqual(['Done: lowered']);
    expect(buttonsFor({ ...alert, actionDoneAtMs: 2_000 }, 'alert.resignalled').map((b) => b.title)).toEqual(['Acknowledge']);
    expect(buttonsFor({ ...alert, moveToConfiguration: null }, 'alert.raised').map((b) => b.title)).toEqual(['Acknowledge']);
  });

  it('carries structure, level, gust and the action first, and stays small for a long action', () => {
    const m = alertPushMessage({ event: 'alert.raised', atMs: 1_000, siteName: 'Harbour festival', alert, buttons: [], buttonsExpireAtMs: null });
    expect(m.alert).toMatchObject({ id: 41, level: 2, structure: { id: 3, name: 'Harbour stage LED wall' }, gustMps: 13.04, action: 'Lower the LED wall to its bottom stop.', moveToConfiguration: 'lowered' });
    expect(m.body.startsWith('ACTION: Lower the LED wall')).toBe(true);
    expect(m.body).toContain('gust 13.0 m/s');
    expect(m.tag).toBe('alert-41');
    const long = alertPushMessage({ event: 'alert.raised', atMs: 1_000, siteName: 'S'.repeat(500), alert: { ...alert, actionText: 'x'.repeat(5_000), label: 'L'.repeat(500), subject: 'N'.repeat(500) }, buttons: buttonsFor(alert, 'alert.raised').map((b) => ({ ...b, token: makePushActionToken(randomBytes(32), { action: b.action, alertId: 41, personId: 5, expiresAtMs: 1e13 }) })), buttonsExpireAtMs: 1e13 });
    // RFC 8030 §7.2: a push service must accept 4096 bytes of payload; the record adds 86 (RFC 8291 §4).
    expect(Buffer.byteLength(JSON.stringify(long))).toBeLessThan(4096 - 86 - 17);
  });
});

describe('the VAPID key file', () => {
  it('is made on first start with mode 0600, read back the same, and a damaged one is refused by name (never replaced)', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-vapid-'));
    try {
      const first = loadVapidKeys(dir, 'mailto:a@b.example', 1);
      const file = path.join(dir, vapidFileName);
      expect(fs.statSync(file).mode & 0o777).toBe(0o600);
      expect(b64(first.publicKey)).toHaveLength(65);
      const again = loadVapidKeys(dir, 'mailto:a@b.example', 2);
      expect(again.publicKey).toBe(first.publicKey);
      expect(again.privateKey).toBe(first.privateKey);
      fs.chmodSync(file, 0o644);
      loadVapidKeys(dir, 'mailto:a@b.example', 3);
      expect(fs.statSync(file).mode & 0o777).toBe(0o600);
      // A public key that is not the private key's: refused.
      const other = webpush.generateVAPIDKeys();
      fs.writeFileSync(file, JSON.stringify({ publicKey: other.publicKey, privateKey: first.privateKey }));
      expect(() => loadVapidKeys(dir, 'mailto:a@b.example', 4)).toThrow(file);
      fs.writeFileSync(file, '{not json');
      expect(() => loadVapidKeys(dir, 'mailto:a@b.example', 5)).toThrow(file);
      expect(fs.readFileSync(file, 'utf8')).toBe('{not json');
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  it('takes the subject from VAPID_SUBJECT, else an https PUBLIC_URL, else SMTP_FROM', () => {
    expect(vapidSubject({ vapidSubject: 'mailto:ops@site.example', publicUrl: 'https://wind.site.example', smtpFrom: null })).toBe('mailto:ops@site.example');
    expect(vapidSubject({ vapidSubject: null, publicUrl: 'https://wind.site.example', smtpFrom: 'Wind <wind@site.example>' })).toBe('https://wind.site.example');
    expect(vapidSubject({ vapidSubject: null, publicUrl: 'http://10.0.0.2:8080', smtpFrom: 'Wind watch <wind@site.example>' })).toBe('mailto:wind@site.example');
    expect(vapidSubject({ vapidSubject: null, publicUrl: null, smtpFrom: null })).toBe(fallbackVapidSubject);
  });

  it('refuses a VAPID_SUBJECT that is neither mailto: nor https: (RFC 8292 §2.1), naming the variable', () => {
    expect(configFromEnv({ VAPID_SUBJECT: 'mailto:site-office@harbour-festival.example' }).vapidSubject).toBe('mailto:site-office@harbour-festival.example');
    expect(configFromEnv({ VAPID_SUBJECT: 'https://harbour-festival.example/contact' }).vapidSubject).toBe('https://harbour-festival.example/contact');
    for (const bad of ['http://harbour-festival.example', 'site-office@harbour-festival.example', 'mailto:nobody']) {
      expect(() => configFromEnv({ VAPID_SUBJECT: bad })).toThrow(ConfigError);
      expect(() => configFromEnv({ VAPID_SUBJECT: bad })).toThrow(/VAPID_SUBJECT/);
    }
  });
});

describe('a browser subscription as posted', () => {
  const browser = browserKeys(randomBytes(16));
  const good = { subscription: { endpoint: 'https://push.service.example/send/abc', expirationTime: null, keys: { p256dh: browser.p256dh, auth: browser.auth } }, label: 'Ana\'s phone' };
  const issues = (body: unknown) => {
    const r = pushSubscribeSchema.safeParse(body);
    return r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
  };
  it('is taken when it is a PushSubscription', () => {
    expect(issues(good)).toEqual([]);
    expect(issues({ ...good, subscription: { ...good.subscription, endpoint: 'http://127.0.0.1:9000/push/1' } })).toEqual([]);
  });
  it('is refused naming the field: plain http off this machine, a key not on the P-256 curve, a short auth secret, no label', () => {
    expect(issues({ ...good, subscription: { ...good.subscription, endpoint: 'http://push.service.example/send/abc' } })).toEqual(['subscription.endpoint']);
    const offCurve = Buffer.from(browser.uaPublic);
    offCurve[64]! ^= 0x01;
    expect(issues({ ...good, subscription: { ...good.subscription, keys: { ...good.subscription.keys, p256dh: offCurve.toString('base64url') } } })).toEqual(['subscription.keys.p256dh']);
    expect(issues({ ...good, subscription: { ...good.subscription, keys: { ...good.subscription.keys, auth: randomBytes(8).toString('base64url') } } })).toEqual(['subscription.keys.auth']);
    expect(issues({ ...good, label: ' ' })).toEqual(['label']);
  });
});
