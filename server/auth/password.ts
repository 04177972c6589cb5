/**
 * Password hashing with scrypt (memory-hard; RFC 7914) from Node's crypto. Stored as
 * `scrypt$N$r$p$saltB64$hashB64` so the cost can change without breaking old hashes: a stored
 * hash is checked with the parameters written in it.
 *
 * New hashes use N = 2^13, r = 8, p = 10: 8 MiB and about 140 ms a derivation on the benchmark
 * machine. OWASP's Password Storage Cheat Sheet asks for scrypt at N = 2^17, r = 8, p = 1 as a
 * minimum and lists lower N with higher p as equivalent, down to N = 2^13, r = 8, p = 10 (that
 * table is from memory). The first release's N = 2^15, r = 8, p = 1 (32 MiB, about 80 ms) was
 * below that minimum, and its 32 MiB were a new block each time: a sign-in under load took the
 * server's resident memory 32 MiB past its resting size (VmHWM in `npm run bench`).
 *
 * Where derivations run: on the checkpoint thread's worker when the server has one
 * (`derivePasswordsWith`; storage/checkpointThread.ts), otherwise on libuv's thread pool. One
 * thread matters for memory: glibc keeps a freed block under 32 MiB in the arena of the thread
 * that freed it, so on the pool's four threads four 8 MiB blocks stay resident; on one thread, one
 * (measured beside this file: 12 derivations on the pool took a process from 42 to 75 MB, on one
 * worker thread from 52 to 61 MB).
 */
import { randomBytes, scrypt, timingSafeEqual } from 'node:crypto';

const costN = 2 ** 13;
const blockSizeR = 8;
const parallelP = 10;
const keyLengthBytes = 32;
/** Room for hashes stored by the first release (32 MiB) as well as new ones. */
const maxmemBytes = 64 * 1024 * 1024;

/** One scrypt derivation, as handed to a `PasswordDeriver`. */
export interface ScryptJob {
  password: string;
  salt: Buffer;
  n: number;
  r: number;
  p: number;
  keyLength: number;
  maxmem: number;
}

/** Runs a derivation on another thread; resolves null when it cannot (it then runs on the pool here). */
export type PasswordDeriver = (job: ScryptJob) => Promise<Buffer | null>;

let deriver: PasswordDeriver | null = null;

/** Derivations go to `d` from now on; the returned function puts them back on the pool (if `d` is still the one in use). */
export function derivePasswordsWith(d: PasswordDeriver): () => void {
  deriver = d;
  return () => {
    if (deriver === d) deriver = null;
  };
}

function scryptOnPool(job: ScryptJob): Promise<Buffer> {
  return new Promise<Buffer>((resolve, reject) => {
    scrypt(job.password, job.salt, job.keyLength, { N: job.n, r: job.r, p: job.p, maxmem: job.maxmem }, (err, key) => (err ? reject(err) : resolve(key)));
  });
}

async function runJob(job: ScryptJob): Promise<Buffer> {
  const elsewhere = deriver ? await deriver(job) : null;
  return elsewhere ?? scryptOnPool(job);
}

/**
 * One derivation at a time per lane, so a burst of sign-ins or gateway connections cannot
 * multiply the memory derivations take (measured with the first release's 32 MiB: 4 at once took
 * resident memory from 226 to 315 MB). The web (people signing in, passwords being set) and the
 * broker (gateways connecting) have a lane each, so a flood of wrong-password CONNECTs cannot make
 * a crew member's sign-in wait behind it, nor a flood of web guesses hold back a gateway (issue 13
 * item 3): on the worker a web derivation waits for at most one broker derivation. Sign-in speed
 * is not what matters here; the sign-in limiters refuse cheaply, before any derivation, once a
 * username or an address is locked.
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
  const run = () => runJob({ password: password.normalize('NFC'), salt, n, r, p, keyLength: keyLengthBytes, maxmem: maxmemBytes });
  queue.waiting++;
  queue.started++;
  const result = queue.tail.then(run, run).finally(() => queue.waiting--);
  queue.tail = result.catch(() => undefined);
  return result;
}

/** A well-formed hash no password matches: checked for an unknown username, so the answer takes as long as for a known one. */
export const unmatchablePasswordHash = `scrypt$${costN}$${blockSizeR}$${parallelP}$${Buffer.alloc(16).toString('base64')}$${Buffer.alloc(keyLengthBytes).toString('base64')}`;

/** True when `stored` was made with today's parameters; a hash from the first release is made again at the next sign-in. */
export function passwordHashIsCurrent(stored: string): boolean {
  return stored.startsWith(`scrypt$${costN}$${blockSizeR}$${parallelP}$`);
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
