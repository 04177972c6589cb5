/**
 * The checkpoint thread's worker (checkpointThread.ts): its own connection to the database file,
 * and every `intervalMs` one PASSIVE checkpoint (https://www.sqlite.org/pragma.html#pragma_wal_checkpoint):
 * it copies the committed frames of the write-ahead log into the database file and syncs both,
 * never waiting for a reader or a writer and never holding up either. When commits arrived while
 * it copied, the next round comes after `catchUpMs` instead. A round that finds the log past
 * `longLogFrames` frames asks the main thread for a moment without commits and waits; given it
 * (a `finish` request), it checkpoints once more, so that every frame is copied and the next
 * commit starts the log again, and answers.
 *
 * It also derives password hashes for auth/password.ts (a `derive` request, scrypt run here
 * synchronously): one thread whose 8 MiB scrypt block is made once and reused, without a second
 * worker's 9 MB. A derivation (about 140 ms) delays a round, which then finds more to copy; none
 * runs while a long round waits for its `finish`, since the main thread may be holding its
 * commits for it then: they wait until the finish is done.
 */
import { scryptSync } from 'node:crypto';
import { parentPort, workerData } from 'node:worker_threads';
import { performance } from 'node:perf_hooks';
import Database from 'better-sqlite3';
import type { CheckpointReply, CheckpointRequest, CheckpointWorkerData, DeriveRequest } from './checkpointThread.ts';

const { file, intervalMs, catchUpMs, longLogFrames } = workerData as CheckpointWorkerData;
const port = parentPort!;
const sqlite = new Database(file, { fileMustExist: true });
const checkpoint = sqlite.prepare('PRAGMA wal_checkpoint(PASSIVE)');
/** How long a long round waits for the main thread's `finish` before going on without it. */
const finishTimeoutMs = 1_000;

let timer: NodeJS.Timeout | undefined;
let stopped = false;
/** A long round asked the main thread for a moment without commits and its `finish` has not come yet. */
let awaitingFinish = false;
const derivations: DeriveRequest[] = [];

function deriveWaiting(): void {
  while (!awaitingFinish && !stopped && derivations.length > 0) {
    const job = derivations.shift()!;
    let reply: CheckpointReply;
    try {
      const key = scryptSync(job.password, job.salt, job.keyLength, { N: job.n, r: job.r, p: job.p, maxmem: job.maxmem });
      reply = { kind: 'derived', id: job.id, key };
    } catch (err) {
      reply = { kind: 'derived', id: job.id, error: err instanceof Error ? err.message : String(err) };
    }
    port.postMessage(reply);
  }
}

/**
 * One PASSIVE checkpoint. Its row: busy (1 when another connection was checkpointing, and then
 * log and checkpointed are −1: sqlite3_wal_checkpoint_v2, https://www.sqlite.org/c3ref/wal_checkpoint_v2.html),
 * log (frames in the log), checkpointed (frames copied).
 */
function run(): { busy: boolean; logFrames: number; copiedFrames: number; tookMs: number } {
  const startedAt = performance.now();
  const r = checkpoint.get() as { busy: number; log: number; checkpointed: number };
  return { busy: r.busy !== 0, logFrames: r.log, copiedFrames: r.checkpointed, tookMs: performance.now() - startedAt };
}

function schedule(ms: number): void {
  if (timer !== undefined) clearTimeout(timer);
  timer = stopped ? undefined : setTimeout(round, ms);
}

/** After a failed checkpoint (a full disk, an I/O error), the pause before the next try. */
const failedPauseMs = 1_000;

function round(): void {
  timer = undefined;
  if (stopped) return;
  if (awaitingFinish) {
    // The finish did not come within its time: go on without it.
    awaitingFinish = false;
    deriveWaiting();
  }
  let r: ReturnType<typeof run>;
  try {
    r = run();
  } catch (err) {
    // Nothing is lost (the log keeps every frame); the worker tries again, and stays.
    const reply: CheckpointReply = { kind: 'failed', message: err instanceof Error ? err.message : String(err) };
    port.postMessage(reply);
    schedule(failedPauseMs);
    return;
  }
  const long = !r.busy && r.logFrames >= longLogFrames;
  const reply: CheckpointReply = { kind: 'round', ...r, long };
  port.postMessage(reply);
  awaitingFinish = long;
  if (r.busy) schedule(catchUpMs);
  else if (long) schedule(finishTimeoutMs);
  else schedule(r.logFrames > r.copiedFrames ? catchUpMs : intervalMs);
}

port.on('message', (req: CheckpointRequest) => {
  if (req.kind === 'derive') {
    derivations.push(req);
    deriveWaiting();
    return;
  }
  if (req.kind === 'finish') {
    if (stopped) return;
    let reply: CheckpointReply;
    try {
      reply = { kind: 'finished', ...run() };
    } catch (err) {
      reply = { kind: 'failed', message: err instanceof Error ? err.message : String(err) };
    }
    port.postMessage(reply);
    schedule(reply.kind === 'failed' ? failedPauseMs : intervalMs);
    awaitingFinish = false;
    deriveWaiting();
    return;
  }
  stopped = true;
  if (timer !== undefined) clearTimeout(timer);
  sqlite.close();
  const reply: CheckpointReply = { kind: 'stopped' };
  port.postMessage(reply);
  port.close();
});

round();
