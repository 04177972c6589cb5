/**
 * The checkpoint thread: copying the write-ahead log into the database file, with the two fsyncs
 * that makes durable, runs on a worker thread with its own connection (checkpointWorker.ts)
 * instead of inside the main thread's commits. SQLite's default runs a checkpoint inside the
 * commit that takes the log past 1,000 pages, on the event loop, while the broker and the live
 * path wait: on the benchmark machine that was 30–60 % of the commit's cost per reading and the
 * event loop's longest pauses under a steady feed (`npm run bench`, and a side test of the
 * readings table: 34–38 against 15–24 µs a reading at 20 a commit).
 *
 * - The main connection stops checkpointing on its own (`wal_autocheckpoint = 0`).
 * - The worker runs a PASSIVE checkpoint every 200 ms (sooner while it is behind). PASSIVE never
 *   waits for, and never blocks, the main thread's readers and writer; commits stay where they
 *   were, so the ack-after-commit guarantee and a crash's recovery are SQLite's, unchanged.
 * - The log starts again from its beginning only when a writer finds every frame copied. Under a
 *   steady feed the main thread commits while the worker copies, so that moment may not come:
 *   once the log passes `longLogFrames`, the worker asks for a moment without commits, the main
 *   thread holds the connection (`hold`: commits wait, as behind an open transaction, while the
 *   event loop goes on), the worker copies the rest and answers, and the next commit starts the
 *   log again. `journal_size_limit` then cuts the file back. Without `hold` (a bare connection),
 *   the worker copies the rest without it and the log may take longer to start again.
 * - If the worker fails or exits, the main connection checkpoints on its own again, as SQLite's
 *   default (`onFailure` is told why). Nothing is lost either way: the log holds every commit
 *   until it is copied.
 * - With the commit thread (commitThread.ts) the writer is that thread's connection, which
 *   checkpoints inside its own commits (SQLite's default, off the event loop already); the
 *   rounds here then mostly find nothing to copy.
 *
 * A worker is about 9 MB resident (measured on the benchmark machine with this file's limits).
 * The same worker derives password hashes (`derive`, for auth/password.ts): see checkpointWorker.ts.
 */
import type Database from 'better-sqlite3';
import { performance } from 'node:perf_hooks';
import type { Worker } from 'node:worker_threads';
import { startStorageWorker } from './workerScript.ts';

export interface CheckpointWorkerData {
  file: string;
  intervalMs: number;
  catchUpMs: number;
  longLogFrames: number;
}

/** A password derivation the worker runs for auth/password.ts (`derive`). */
export interface DeriveRequest {
  kind: 'derive';
  id: number;
  password: string;
  salt: Uint8Array;
  n: number;
  r: number;
  p: number;
  keyLength: number;
  maxmem: number;
}
export type CheckpointRequest = { kind: 'stop' } | { kind: 'finish' } | DeriveRequest;
interface CheckpointRun {
  busy: boolean;
  logFrames: number;
  copiedFrames: number;
  tookMs: number;
}
export type CheckpointReply = ({ kind: 'round'; long: boolean } & CheckpointRun) | ({ kind: 'finished' } & CheckpointRun) | { kind: 'failed'; message: string } | { kind: 'stopped' } | { kind: 'derived'; id: number; key: Uint8Array } | { kind: 'derived'; id: number; error: string };

export interface CheckpointThreadOptions {
  /** Pause between checkpoints while the worker keeps up, ms (200). */
  intervalMs?: number;
  /** Pause while commits arrived during the last checkpoint, ms (5). */
  catchUpMs?: number;
  /** Log length past which the main thread finishes a checkpoint itself, frames (4,096: 16 MiB of 4 KiB pages). */
  longLogFrames?: number;
  /** Holds the main connection's commits until released (storage.ts gives its transactions' `hold`). */
  hold?: () => Promise<() => void>;
  /** The worker failed: the main connection checkpoints on its own from now on. */
  onFailure?: (why: string) => void;
}

export interface CheckpointStats {
  rounds: number;
  /** Frames the worker found in the log / had copied, in its last round. */
  logFrames: number;
  copiedFrames: number;
  maxRoundMs: number;
  /** Times the log had grown long and the worker finished it while the main connection was held. */
  finishes: number;
  /** The longest hold of the main connection's commits, ms. */
  maxHoldMs: number;
  /** The longest log a round found, frames; rounds that found it started again since the last. */
  maxLogFrames: number;
  restarts: number;
  /** Checkpoints that failed (a full disk, an I/O error) and the last one's error; the worker goes on. */
  failedRounds: number;
  lastError: string | null;
  /** Why the worker stopped for good (it exited or crashed): the main connection checkpoints again. */
  failure: string | null;
}

/** SQLite's own default (https://www.sqlite.org/pragma.html#pragma_wal_autocheckpoint), restored if the worker fails. */
const sqliteDefaultAutoCheckpointPages = 1000;
/** The log file is cut back to this after it starts again (our choice: a few seconds of a full-speed burst). */
const journalSizeLimitBytes = 64 * 2 ** 20;

export class CheckpointThread {
  readonly stats: CheckpointStats = { rounds: 0, logFrames: 0, copiedFrames: 0, maxRoundMs: 0, finishes: 0, maxHoldMs: 0, maxLogFrames: 0, restarts: 0, failedRounds: 0, lastError: null, failure: null };
  private readonly worker: Worker;
  /**
   * Settles once the worker has answered (or could not start). The server waits for it before loading the
   * register: a worker's start resets the V8 flags heapSettings.ts set (v8Flags.ts), and the main
   * thread's young generation would grow unchecked meanwhile.
   */
  readonly ready: Promise<void>;
  private stopping: Promise<void> | null = null;
  private exited = false;
  private finishing = false;
  private finished: (() => void) | null = null;
  private nextDerivation = 1;
  private readonly derivations = new Map<number, { resolve: (key: Buffer | null) => void; reject: (err: Error) => void }>();
  /** Password derivations the worker ran (health, tests). */
  derived = 0;
  private answered = false;

  constructor(
    private readonly sqlite: Database.Database,
    private readonly options: CheckpointThreadOptions = {},
  ) {
    if (sqlite.memory) throw new Error('a checkpoint thread needs a database file, not :memory:');
    sqlite.pragma('wal_autocheckpoint = 0');
    sqlite.pragma(`journal_size_limit = ${journalSizeLimitBytes}`);
    const data: CheckpointWorkerData = { file: sqlite.name, intervalMs: options.intervalMs ?? 200, catchUpMs: options.catchUpMs ?? 5, longLogFrames: options.longLogFrames ?? 4096 };
    // It holds one prepared statement: the smallest heap V8 allows is plenty.
    this.worker = startStorageWorker('checkpointWorker', data, { maxYoungGenerationSizeMb: 1, maxOldGenerationSizeMb: 8 });
    this.ready = new Promise<void>((resolve) => {
      this.worker.once('message', () => resolve());
      this.worker.once('exit', () => resolve());
    }).then(() => {
      this.answered = true;
      this.keepAliveWhileNeeded();
    });
    this.worker.on('message', (reply: CheckpointReply) => {
      if (reply.kind === 'stopped') return;
      if (reply.kind === 'derived') {
        const waiting = this.derivations.get(reply.id);
        this.derivations.delete(reply.id);
        this.keepAliveWhileNeeded();
        if ('key' in reply) {
          this.derived++;
          waiting?.resolve(Buffer.from(reply.key.buffer, reply.key.byteOffset, reply.key.byteLength));
        } else waiting?.reject(new Error(reply.error));
        return;
      }
      if (reply.kind === 'failed') {
        // A full disk or an I/O error: the worker tries again in a second (the log keeps every frame).
        this.stats.failedRounds++;
        this.stats.lastError = reply.message;
        this.finished?.();
        return;
      }
      if (reply.kind === 'finished') {
        this.finished?.();
        return;
      }
      this.stats.rounds++;
      // Another connection was checkpointing (the commit thread's): this round tells nothing.
      if (reply.busy) return;
      if (reply.logFrames < this.stats.logFrames) this.stats.restarts++;
      this.stats.logFrames = reply.logFrames;
      this.stats.copiedFrames = reply.copiedFrames;
      if (reply.logFrames > this.stats.maxLogFrames) this.stats.maxLogFrames = reply.logFrames;
      if (reply.tookMs > this.stats.maxRoundMs) this.stats.maxRoundMs = reply.tookMs;
      if (reply.long) void this.finishHeld();
    });
    this.worker.on('error', (err) => this.fail(`the checkpoint worker failed: ${err.message}`));
    this.worker.on('exit', (code) => {
      this.exited = true;
      // Derivations it had not answered run where the caller runs them without a worker.
      for (const waiting of this.derivations.values()) waiting.resolve(null);
      this.derivations.clear();
      if (this.stopping === null) this.fail(`the checkpoint worker exited (code ${code})`);
    });
  }

  /**
   * The worker keeps the process alive until its first answer and while a derivation is waiting
   * for it (someone may be awaiting either with nothing else running, such as the server creating
   * its first administrator before it listens); otherwise the server's sockets do.
   */
  private keepAliveWhileNeeded(): void {
    if (this.exited) return;
    if (!this.answered || this.derivations.size > 0) this.worker.ref();
    else this.worker.unref();
  }

  /**
   * One scrypt derivation on the worker (auth/password.ts's `PasswordDeriver`); null once the
   * worker has stopped or is stopping, and then the caller derives it itself.
   */
  derive(job: { password: string; salt: Buffer; n: number; r: number; p: number; keyLength: number; maxmem: number }): Promise<Buffer | null> {
    if (this.exited || this.stopping !== null) return Promise.resolve(null);
    const id = this.nextDerivation++;
    return new Promise<Buffer | null>((resolve, reject) => {
      this.derivations.set(id, { resolve, reject });
      this.keepAliveWhileNeeded();
      const request: CheckpointRequest = { kind: 'derive', id, ...job };
      this.worker.postMessage(request);
    });
  }

  /**
   * The log has grown long: holds the main connection's commits (if it can), has the worker copy
   * the rest, and releases them. The hold is let go after a second whatever happens.
   */
  private async finishHeld(): Promise<void> {
    if (this.finishing || this.stopping !== null || this.exited) return;
    this.finishing = true;
    let release: (() => void) | null = null;
    try {
      release = this.options.hold ? await this.options.hold() : null;
      const heldAt = performance.now();
      if (this.stopping !== null || this.exited) return;
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, 1_000);
        this.finished = () => {
          clearTimeout(timer);
          resolve();
        };
        const request: CheckpointRequest = { kind: 'finish' };
        this.worker.postMessage(request);
      });
      this.stats.finishes++;
      const heldMs = performance.now() - heldAt;
      if (release !== null && heldMs > this.stats.maxHoldMs) this.stats.maxHoldMs = heldMs;
    } finally {
      this.finished = null;
      release?.();
      this.finishing = false;
    }
  }

  private fail(why: string): void {
    if (this.stats.failure !== null) return;
    this.stats.failure = why;
    if (this.sqlite.open) this.sqlite.pragma(`wal_autocheckpoint = ${sqliteDefaultAutoCheckpointPages}`);
    this.options.onFailure?.(why);
  }

  /** Stops the worker (its connection closes; the main connection's close then copies what is left, as SQLite does). */
  stop(): Promise<void> {
    if (this.stopping !== null) return this.stopping;
    if (this.exited) return (this.stopping = Promise.resolve());
    this.stopping = new Promise<void>((resolve) => {
      const timer = setTimeout(() => void this.worker.terminate(), 5_000);
      this.worker.once('exit', () => {
        clearTimeout(timer);
        resolve();
      });
      const request: CheckpointRequest = { kind: 'stop' };
      this.worker.postMessage(request);
    });
    return this.stopping;
  }
}
