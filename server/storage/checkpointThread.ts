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
 *   once the log passes `longLogFrames`, the worker says so and the main thread runs one PASSIVE
 *   checkpoint itself, between its commits. The worker has copied all but the newest frames, so
 *   this one is short, and the next commit starts the log again. `journal_size_limit` then cuts
 *   the file back.
 * - If the worker fails or exits, the main connection checkpoints on its own again, as SQLite's
 *   default (`onFailure` is told why). Nothing is lost either way: the log holds every commit
 *   until it is copied.
 *
 * A worker is about 9 MB resident (measured on the benchmark machine with this file's limits).
 */
import type Database from 'better-sqlite3';
import type { Worker } from 'node:worker_threads';
import { startStorageWorker } from './workerScript.ts';

export interface CheckpointWorkerData {
  file: string;
  intervalMs: number;
  catchUpMs: number;
  longLogFrames: number;
}

export type CheckpointRequest = { kind: 'stop' } | { kind: 'resume' };
export type CheckpointReply = { kind: 'round'; logFrames: number; copiedFrames: number; tookMs: number; long: boolean } | { kind: 'stopped' };

export interface CheckpointThreadOptions {
  /** Pause between checkpoints while the worker keeps up, ms (200). */
  intervalMs?: number;
  /** Pause while commits arrived during the last checkpoint, ms (5). */
  catchUpMs?: number;
  /** Log length past which the main thread finishes a checkpoint itself, frames (4,096: 16 MiB of 4 KiB pages). */
  longLogFrames?: number;
  /** Runs the main thread's checkpoint outside any open transaction (storage.ts gives its transaction gate). */
  onMain?: (work: () => void) => unknown;
  /** The worker failed: the main connection checkpoints on its own from now on. */
  onFailure?: (why: string) => void;
}

export interface CheckpointStats {
  rounds: number;
  /** Frames the worker found in the log / had copied, in its last round. */
  logFrames: number;
  copiedFrames: number;
  maxRoundMs: number;
  /** Checkpoints the main thread ran because the log had grown long. */
  mainCheckpoints: number;
  /** The longest log a round found, frames; rounds that found it started again since the last. */
  maxLogFrames: number;
  restarts: number;
  failure: string | null;
}

/** SQLite's own default (https://www.sqlite.org/pragma.html#pragma_wal_autocheckpoint), restored if the worker fails. */
const sqliteDefaultAutoCheckpointPages = 1000;
/** The log file is cut back to this after it starts again (our choice: a few seconds of a full-speed burst). */
const journalSizeLimitBytes = 64 * 2 ** 20;

export class CheckpointThread {
  readonly stats: CheckpointStats = { rounds: 0, logFrames: 0, copiedFrames: 0, maxRoundMs: 0, mainCheckpoints: 0, maxLogFrames: 0, restarts: 0, failure: null };
  private readonly worker: Worker;
  /**
   * Settles once the worker has answered (or could not start). The server waits for it before loading the
   * register: a worker's start resets the V8 flags heapSettings.ts set (v8Flags.ts), and the main
   * thread's young generation would grow unchecked meanwhile.
   */
  readonly ready: Promise<void>;
  private stopping: Promise<void> | null = null;
  private exited = false;
  private lastLogFrames = 0;

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
    // It keeps the process alive only until its first answer (someone may be awaiting `ready`
    // with nothing else running); after that, the server's sockets do.
    this.ready = new Promise<void>((resolve) => {
      this.worker.once('message', () => resolve());
      this.worker.once('exit', () => resolve());
    }).then(() => {
      this.worker.unref();
    });
    this.worker.on('message', (reply: CheckpointReply) => {
      if (reply.kind !== 'round') return;
      this.stats.rounds++;
      this.stats.logFrames = reply.logFrames;
      this.stats.copiedFrames = reply.copiedFrames;
      if (reply.logFrames < this.stats.maxLogFrames && reply.logFrames < this.lastLogFrames) this.stats.restarts++;
      this.lastLogFrames = reply.logFrames;
      if (reply.logFrames > this.stats.maxLogFrames) this.stats.maxLogFrames = reply.logFrames;
      if (reply.tookMs > this.stats.maxRoundMs) this.stats.maxRoundMs = reply.tookMs;
      if (reply.long) this.checkpointOnMain();
    });
    this.worker.on('error', (err) => this.fail(`the checkpoint worker failed: ${err.message}`));
    this.worker.on('exit', (code) => {
      this.exited = true;
      if (this.stopping === null) this.fail(`the checkpoint worker exited (code ${code})`);
    });
  }

  /** The worker waits (up to a second) for this one's answer, so the checkpoint lock is free here. */
  private checkpointOnMain(): void {
    const resume = (): void => {
      if (this.stopping !== null || this.exited) return;
      const request: CheckpointRequest = { kind: 'resume' };
      this.worker.postMessage(request);
    };
    const work = (): void => {
      if (!this.sqlite.open || this.stats.failure !== null) return;
      this.sqlite.pragma('wal_checkpoint(PASSIVE)');
      this.stats.mainCheckpoints++;
    };
    try {
      const waiting = this.options.onMain ? this.options.onMain(work) : work();
      // A failed checkpoint loses nothing (the log keeps every frame); the next long round tries again.
      if (waiting instanceof Promise) waiting.then(resume, resume);
      else resume();
    } catch {
      resume();
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
