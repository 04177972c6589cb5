/**
 * Asynchronous transactions on the one SQLite connection (storage.ts). better-sqlite3 runs each
 * statement synchronously, but a transaction's work is async (it awaits store calls, and may
 * await anything else), so other callers run while it is open. On one connection every statement
 * joins whatever transaction is open, so:
 *
 * - one outermost transaction at a time: a second waits until the first has committed or rolled
 *   back (a first-come queue);
 * - a transaction started inside one (in its async context, AsyncLocalStorage) is a savepoint in
 *   it; several nested in the same one run one after another;
 * - a store call from outside the open transaction's async context (another request) waits until
 *   it ends, so it neither joins it nor is rolled back with it; a call from inside runs at once;
 * - the write queue's commits on this connection (writeQueue.ts `gate`) wait the same way, and go
 *   ahead of the waiting callers, so the live path's rows are never part of, or rolled back with,
 *   a transaction someone else opened; retention's deletes are store calls (storage.ts).
 *
 * A call made while no transaction is open runs synchronously, at the call, as before; only its result
 * arrives as a promise. A transaction must not await the write queue (its commit waits for the
 * transaction's end), and should await nothing long: it holds the write lock, so the commit
 * thread's connection waits for it too (up to the busy timeout, connection.ts). A timer or
 * callback set from inside a transaction runs in its async context, so it counts as inside it
 * while it is open.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type Database from 'better-sqlite3';

interface Frame {
  /** The outermost transaction this frame belongs to. */
  readonly root: object;
  /** The transactions nested directly in this frame, chained: savepoints may not interleave. */
  nested: Promise<unknown>;
}

/** Runs `work` now, its result or throw as a promise. */
function settled<R>(work: () => R): Promise<R> {
  try {
    return Promise.resolve(work());
  } catch (err) {
    return Promise.reject(err);
  }
}

export class Transactions {
  private readonly context = new AsyncLocalStorage<Frame>();
  /** The outermost transaction open now. */
  private open: object | null = null;
  /** Callers waiting for the open transaction's end, first come first served. */
  private readonly waiting: Array<() => void> = [];
  /** Write-queue commits waiting for the open transaction's end: they go first. */
  private readonly commits: Array<() => void> = [];
  private savepoints = 0;

  constructor(private readonly sqlite: Database.Database) {}

  /** A store call: now when no transaction is open or the caller is inside it, else after it. */
  call<R>(work: () => R): Promise<R> {
    if (this.open === null || this.inside()) return settled(work);
    return new Promise<R>((resolve, reject) => this.waiting.push(() => settled(work).then(resolve, reject)));
  }

  /** True when no transaction is open (a write-queue commit may run now). */
  get idle(): boolean {
    return this.open === null;
  }

  /** Runs `commit` (synchronous; must not throw) now when no transaction is open, else right after the open one ends. */
  whenIdle(commit: () => void): void {
    if (this.open === null) commit();
    else this.commits.push(commit);
  }

  /**
   * Holds this connection as an open transaction would (store calls and write-queue commits wait)
   * until the returned function is called: a moment with no writer on it, for the checkpoint
   * thread (checkpointThread.ts). Taken once no transaction is open; nothing runs inside it.
   */
  hold(): Promise<() => void> {
    return new Promise((resolve) => {
      const take = (): void => {
        const token = {};
        this.open = token;
        resolve(() => {
          if (this.open === token) this.end();
        });
      };
      if (this.open === null) take();
      else this.waiting.push(take);
    });
  }

  transaction<T>(work: () => Promise<T>): Promise<T> {
    const frame = this.context.getStore();
    if (frame !== undefined && this.open !== null && frame.root === this.open) return this.nested(frame, work);
    if (this.open === null) return this.outermost(work);
    return new Promise<T>((resolve, reject) => this.waiting.push(() => void this.outermost(work).then(resolve, reject)));
  }

  private inside(): boolean {
    const frame = this.context.getStore();
    return frame !== undefined && frame.root === this.open;
  }

  private outermost<T>(work: () => Promise<T>): Promise<T> {
    const root = {};
    this.open = root;
    try {
      // IMMEDIATE: the write lock is taken at BEGIN (waiting on the busy timeout). The commit
      // thread writes on its own connection; a deferred transaction that reads first and then
      // writes would fail with SQLITE_BUSY at once when the thread holds the lock (commitThread.ts).
      this.sqlite.exec('BEGIN IMMEDIATE');
    } catch (err) {
      this.end();
      return Promise.reject(err);
    }
    return this.context.run({ root, nested: Promise.resolve() }, async () => {
      try {
        const result = await work();
        this.sqlite.exec('COMMIT');
        return result;
      } catch (err) {
        // A failed COMMIT may leave the transaction open (SQLITE_BUSY) or have ended it (SQLITE_FULL).
        if (this.sqlite.inTransaction) this.sqlite.exec('ROLLBACK');
        throw err;
      } finally {
        // Whoever waited runs outside this transaction's context.
        this.context.exit(() => this.end());
      }
    });
  }

  private nested<T>(parent: Frame, work: () => Promise<T>): Promise<T> {
    const root = parent.root;
    const run = async (): Promise<T> => {
      if (this.open !== root) throw new Error('the transaction this one was started in has already ended');
      const name = `holdfast_${++this.savepoints}`;
      this.sqlite.exec(`SAVEPOINT ${name}`);
      try {
        const result = await this.context.run({ root, nested: Promise.resolve() }, work);
        this.sqlite.exec(`RELEASE ${name}`);
        return result;
      } catch (err) {
        if (this.open === root && this.sqlite.inTransaction) this.sqlite.exec(`ROLLBACK TO ${name}; RELEASE ${name}`);
        throw err;
      }
    };
    const result = parent.nested.then(run);
    parent.nested = result.catch(() => undefined);
    return result;
  }

  private end(): void {
    this.open = null;
    for (const commit of this.commits.splice(0)) {
      try {
        commit();
      } catch (err) {
        // A commit reports its own failures (writeQueue.ts); one that throws is a defect: loud, but not in the way of the waiting.
        queueMicrotask(() => {
          throw err;
        });
      }
    }
    // A waiting transaction opens at once and stops the round; the callers behind it wait for it.
    while (this.open === null && this.waiting.length > 0) this.waiting.shift()!();
  }
}
