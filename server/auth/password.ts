/**
 * Password hashing with scrypt (memory-hard; RFC 7914) from Node's crypto. Stored as
 * `scrypt$N$r$p$saltB64$hashB64` so the cost can rise later without breaking old hashes.
 * N = 2^15, r = 8, p = 1 uses 32 MiB and about 50 ms per hash on this machine — slow enough to
 * hurt guessing, fast enough for sign-in and MQTT CONNECT.
 */
import { randomBytes, scrypt, timingSafeEqual } from 'node:crypto';

const costN = 2 ** 15;
const blockSizeR = 8;
const parallelP = 1;
const keyLengthBytes = 32;
const maxmemBytes = 64 * 1024 * 1024;

/**
 * One derivation at a time per lane: each holds 32 MiB, and a burst of sign-ins or gateway
 * connections must not multiply the server's memory (measured: 4 at once took resident memory
 * from 226 to 315 MB). The web (people signing in, passwords being set) and the broker (gateways
 * connecting) have a lane each, so a flood of wrong-password CONNECTs cannot make a crew member's
 * sign-in wait behind it, nor a flood of web guesses hold back a gateway (issue 13 item 3): at most
 * two derivations, 64 MiB, run at once. Sign-in speed is not what matters here; the sign-in
 * limiters refuse cheaply, before any derivation, once a username or an address is locked.
 */
export type PasswordLane = 'web' | 'broker';

const lanes: Record<PasswordLane, { tail: Promise<unknown>; waiting: number; started: number }> = {
  web: { tail: Promise.resolve(), waiting: 0, started: 0 },
  broker: { tail: Promise.resolve(), waiting: 0, started: 0 },
};

/** Derivations started in a lane since the process started (for health and tests). */
export function passwordDerivations(lane: PasswordLane): number {
  return lanes[lane].started;
}

/** Derivations queued or running in a lane (for health and tests). */
export function passwordLaneDepth(lane: PasswordLane): number {
  return lanes[lane].waiting;
}

function derive(password: string, salt: Buffer, n: number, r: number, p: number, lane: PasswordLane): Promise<Buffer> {
  const queue = lanes[lane];
  const run = () =>
    new Promise<Buffer>((resolve, reject) => {
      scrypt(password.normalize('NFC'), salt, keyLengthBytes, { N: n, r, p, maxmem: maxmemBytes }, (err, key) => (err ? reject(err) : resolve(key)));
    });
  queue.waiting++;
  queue.started++;
  const result = queue.tail.then(run, run).finally(() => queue.waiting--);
  queue.tail = result.catch(() => undefined);
  return result;
}

export async function hashPassword(password: string, lane: PasswordLane = 'web'): Promise<string> {
  const salt = randomBytes(16);
  const hash = await derive(password, salt, costN, blockSizeR, parallelP, lane);
  return `scrypt$${costN}$${blockSizeR}$${parallelP}$${salt.toString('base64')}$${hash.toString('base64')}`;
}

/** True when `password` matches `stored`; false for a wrong password or a malformed hash. */
export async function verifyPassword(password: string, stored: string, lane: PasswordLane = 'web'): Promise<boolean> {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
  const n = Number(parts[1]);
  const r = Number(parts[2]);
  const p = Number(parts[3]);
  if (![n, r, p].every((v) => Number.isInteger(v) && v > 0)) return false;
  const salt = Buffer.from(parts[4]!, 'base64');
  const expected = Buffer.from(parts[5]!, 'base64');
  if (expected.length !== keyLengthBytes) return false;
  const actual = await derive(password, salt, n, r, p, lane);
  return timingSafeEqual(actual, expected);
}
