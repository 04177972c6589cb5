/**
 * Password hashing (server/auth/password.ts): today's scrypt parameters, hashes stored with other
 * parameters still checked with their own, derivations on the checkpoint thread's worker when the
 * server gives it one and on libuv's pool otherwise, and an older hash made again at sign-in.
 *
 * Reference values: RFC 7914 §12 ("Test Vectors for scrypt"), the vectors for
 * P = "password", S = "NaCl", N = 1024, r = 8, p = 16 and P = "pleaseletmein",
 * S = "SodiumChloride", N = 16384, r = 8, p = 1 (dkLen 64; a stored hash keeps the first 32
 * bytes, which are the dkLen-32 output: scrypt ends in PBKDF2-HMAC-SHA256, RFC 7914 §6, whose
 * output blocks do not depend on dkLen, RFC 8018 §5.2).
 */
import { execFileSync } from 'node:child_process';
import { scryptSync } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { Accounts } from '../../server/auth/accounts.ts';
import { derivePasswordsWith, hashPassword, passwordHashIsCurrent, verifyPassword } from '../../server/auth/password.ts';
import { CheckpointThread } from '../../server/storage/checkpointThread.ts';
import { openStorage } from '../../server/storage/storage.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

function freshFile(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-passwords-'));
  dirs.push(dir);
  return path.join(dir, 'holdfast.sqlite');
}

/** A stored hash in the server's format from an RFC 7914 §12 vector (the first 32 of its 64 bytes). */
function storedFromVector(n: number, r: number, p: number, salt: string, hex64: string): string {
  return `scrypt$${n}$${r}$${p}$${Buffer.from(salt, 'utf8').toString('base64')}$${Buffer.from(hex64, 'hex').subarray(0, 32).toString('base64')}`;
}

// RFC 7914 §12, the second and third vectors.
const vectorNaCl = storedFromVector(1024, 8, 16, 'NaCl', 'fdbabe1c9d3472007856e7190d01e9fe7c6ad7cbc8237830e77376634b3731622eaf30d92e22a3886ff109279d9830dac727afb94a83ee6d8360cbdfa2cc0640');
const vectorSodiumChloride = storedFromVector(16384, 8, 1, 'SodiumChloride', '7023bdcb3afd7348461c06cd81fd38ebfda8fbba904f8e3ea9b543f6545da1f2d5432955613f0fcf62d49705242a9af9e61e85dc0d651e40dfcf017b45575887');

describe('password hashes', () => {
  it('are made with N = 2^13, r = 8, p = 10 (OWASP Password Storage Cheat Sheet: an equivalent of its scrypt minimum), a 16-byte salt and a 32-byte key', async () => {
    const stored = await hashPassword('an invented crew password');
    const [scheme, n, r, p, salt, key] = stored.split('$');
    expect([scheme, n, r, p]).toEqual(['scrypt', '8192', '8', '10']);
    expect(Buffer.from(salt!, 'base64')).toHaveLength(16);
    // The key is scrypt's own output for these parameters (Node's OpenSSL binding as the reference).
    expect(Buffer.from(key!, 'base64').equals(scryptSync('an invented crew password', Buffer.from(salt!, 'base64'), 32, { N: 8192, r: 8, p: 10, maxmem: 64 * 2 ** 20 }))).toBe(true);
    expect(passwordHashIsCurrent(stored)).toBe(true);
    expect(await verifyPassword('an invented crew password', stored)).toBe(true);
    expect(await verifyPassword('an invented crew passworD', stored)).toBe(false);
  });

  it('stored with other parameters are checked with their own (RFC 7914 §12 vectors, on the pool)', async () => {
    expect(await verifyPassword('password', vectorNaCl)).toBe(true);
    expect(await verifyPassword('pleaseletmein', vectorSodiumChloride)).toBe(true);
    expect(await verifyPassword('pleaseletmeIn', vectorSodiumChloride)).toBe(false);
    expect(passwordHashIsCurrent(vectorSodiumChloride)).toBe(false);
  });

  it('are derived on the checkpoint worker once it is given them, with the same results, and on the pool again once it has stopped', async () => {
    const storage = openStorage(freshFile(), { checkpointThread: true });
    const checkpoints = storage.checkpoints!;
    await checkpoints.ready;
    const back = derivePasswordsWith((job) => checkpoints.derive(job));
    try {
      expect(await verifyPassword('password', vectorNaCl, 'broker')).toBe(true);
      expect(await verifyPassword('pleaseletmein', vectorSodiumChloride)).toBe(true);
      expect(await verifyPassword('not the password', vectorSodiumChloride)).toBe(false);
      const stored = await hashPassword('an invented gateway password', 'broker');
      expect(await verifyPassword('an invented gateway password', stored)).toBe(true);
      // Both lanes at once: each answer goes to its own caller.
      const both = await Promise.all([verifyPassword('password', vectorNaCl, 'broker'), verifyPassword('wrong', vectorNaCl, 'web'), verifyPassword('pleaseletmein', vectorSodiumChloride, 'web')]);
      expect(both).toEqual([true, false, true]);
      expect(checkpoints.derived).toBe(8);
      await storage.close();
      // Stopped: the thread says so and the derivation runs here.
      expect(await checkpoints.derive({ password: 'x', salt: Buffer.alloc(16), n: 1024, r: 8, p: 1, keyLength: 32, maxmem: 64 * 2 ** 20 })).toBeNull();
      expect(await verifyPassword('pleaseletmein', vectorSodiumChloride)).toBe(true);
      expect(checkpoints.derived).toBe(8);
    } finally {
      back();
      await storage.close();
    }
  });

  it('wait on the worker while a long round waits for the main thread to hold its commits (they would wait behind it)', async () => {
    const sqlite = new Database(freshFile());
    sqlite.pragma('journal_mode = WAL');
    sqlite.exec('CREATE TABLE filler (x BLOB)');
    sqlite.pragma('wal_autocheckpoint = 0');
    const insert = sqlite.prepare('INSERT INTO filler VALUES (randomblob(3000))');
    for (let i = 0; i < 300; i++) insert.run();
    const events: string[] = [];
    let asked = false;
    const thread: CheckpointThread = new CheckpointThread(sqlite, {
      longLogFrames: 50,
      hold: async () => {
        if (!asked) {
          asked = true;
          void thread.derive({ password: 'password', salt: Buffer.from('NaCl'), n: 1024, r: 8, p: 16, keyLength: 32, maxmem: 64 * 2 ** 20 }).then((key) => {
            events.push('derived');
            // RFC 7914 §12, the second vector's first 32 bytes.
            expect(key?.toString('hex')).toBe('fdbabe1c9d3472007856e7190d01e9fe7c6ad7cbc8237830e77376634b373162');
          });
        }
        await new Promise((r) => setTimeout(r, 300));
        events.push('held');
        return () => events.push('released');
      },
    });
    try {
      const end = Date.now() + 10_000;
      while (!events.includes('derived') && Date.now() < end) await new Promise((r) => setTimeout(r, 20));
      expect(events.slice(0, 3)).toEqual(['held', 'released', 'derived']);
      expect(thread.stats.finishes).toBeGreaterThan(0);
    } finally {
      await thread.stop();
      sqlite.close();
    }
  });

  it('keep the process alive while the worker derives one with nothing else running', () => {
    const out = execFileSync(process.execPath, ['--import', 'tsx', path.resolve('tests/fixtures/derivePasswordOnWorker.ts')], { encoding: 'utf8', env: { ...process.env, NODE_OPTIONS: '' }, timeout: 60_000 });
    expect(out.trim()).toBe('scrypt$8192$8$10 on the worker: 1');
  }, 70_000);

  it('made with older parameters are made again at the next sign-in, and only with the right password', async () => {
    const storage = openStorage(freshFile());
    try {
      const accounts = new Accounts(storage);
      // The first release's parameters (N = 2^15, r = 8, p = 1), made here with Node's scrypt.
      const salt = Buffer.from('00112233445566778899aabbccddeeff', 'hex');
      const old = `scrypt$32768$8$1$${salt.toString('base64')}$${scryptSync('an invented steward password', salt, 32, { N: 32768, r: 8, p: 1, maxmem: 64 * 2 ** 20 }).toString('base64')}`;
      const row = await storage.people.insert({ username: 'steward-north', displayName: 'North gate steward', role: 'crew', passwordHash: old, createdAtMs: 0 });
      expect(await accounts.checkPassword('steward-north', 'not the password')).toBeNull();
      expect((await storage.people.byId(row.id))!.passwordHash).toBe(old);
      expect((await accounts.checkPassword('steward-north', 'an invented steward password'))?.username).toBe('steward-north');
      const remade = (await storage.people.byId(row.id))!.passwordHash;
      expect(remade).not.toBe(old);
      expect(remade.startsWith('scrypt$8192$8$10$')).toBe(true);
      expect((await accounts.checkPassword('steward-north', 'an invented steward password'))?.username).toBe('steward-north');
      expect((await storage.people.byId(row.id))!.passwordHash).toBe(remade);
    } finally {
      await storage.close();
    }
  });
});
