/**
 * The commit thread: the write queue's group commits run on a worker thread with its own SQLite
 * connection (commitWorker.ts), so the event loop keeps taking packets, parsing and assessing
 * while the disk writes. The main thread keeps its connection for queries and for the other,
 * rarer writes (registration, audit, retention); WAL lets a reader see every commit the worker
 * has made, and SQLite's busy timeout orders the two writers.
 *
 * The guarantee is the write queue's: `enqueue` resolves only once the worker reports the
 * batch's transaction committed (or the batch held for retry when the database cannot write),
 * and only then does ingest acknowledge the broker. One group is in flight at a time; what
 * arrives meanwhile waits in `pending` and goes as the next group as soon as the worker answers,
 * so groups grow with the load without any timer (no group window).
 *
 * The worker runs the same `WriteQueue` (in-thread mode) on its connection: the transaction, the
 * per-minute rollups, the backlog of held batches, the bounded drop and the retry timer are that
 * code, unchanged. Its statistics come back with every answer (and once a second while they
 * change, for retries the worker makes on its own) into the main thread's `stats` object.
 *
 * Readings, the bulk of every group, cross as one transferred Float64Array (ten numbers a
 * reading, NaN for an absent value): posting the batches as objects cost the main thread about
 * 2 µs a reading (structured clone), the array 0.2–0.3 µs, against a commit of about 7 µs a
 * reading at 100 a commit (measured on the benchmark machine). The rarer rows go as objects.
 *
 * If the worker dies (a defect, or out of memory), a new one starts from the rollups
 * `rebuildNewestMinutes` recomputes, as after a crash of the process, and the group that was in
 * flight is sent to it again, still unacknowledged until it commits (`enqueue` never rejects
 * while the queue is open). Readings and alerts are inserted once however often they are sent.
 */
import type { Worker } from 'node:worker_threads';
import { batchRowCount, emptyWriteBatch, type ReadingRow, type WriteBatch } from './writeBatch.ts';
import type { WriteOutcome, WriteQueueStats } from './writeQueue.ts';
import { startStorageWorker } from './workerScript.ts';

/** After a worker died before it ever answered, the pause before the next one starts. */
const restartPauseMs = 5_000;

/** Numbers per reading in the transferred array. */
const readingWidth = 10;

/** A group as it crosses to the worker. */
export interface EncodedGroup {
  /** Readings of every batch, in order, `readingWidth` numbers each. */
  readings: Float64Array;
  /** Readings per batch. */
  counts: Uint32Array;
  /** The batches' other rows, for the batches that have any: [index, rows]. */
  rest: Array<[number, Omit<WriteBatch, 'readings'>]>;
}

const orNaN = (v: number | null): number => (v === null ? Number.NaN : v);
const orNull = (v: number): number | null => (Number.isNaN(v) ? null : v);

/** Rows other than readings (those cross as numbers; the rest is cloned). */
function hasRest(b: WriteBatch): boolean {
  return batchRowCount(b) > b.readings.length;
}

export function encodeGroup(batches: readonly WriteBatch[]): EncodedGroup {
  let n = 0;
  for (const b of batches) n += b.readings.length;
  const readings = new Float64Array(n * readingWidth);
  const counts = new Uint32Array(batches.length);
  const rest: EncodedGroup['rest'] = [];
  let o = 0;
  for (let i = 0; i < batches.length; i++) {
    const b = batches[i]!;
    counts[i] = b.readings.length;
    for (const r of b.readings) {
      readings[o] = r.sensorId;
      readings[o + 1] = r.tsMs;
      readings[o + 2] = r.speedMps;
      readings[o + 3] = orNaN(r.gustMps);
      readings[o + 4] = orNaN(r.dirDeg);
      readings[o + 5] = orNaN(r.tempC);
      readings[o + 6] = orNaN(r.pressurePa);
      readings[o + 7] = orNaN(r.rhPct);
      readings[o + 8] = r.late ? 1 : 0;
      readings[o + 9] = r.rollupGustMps;
      o += readingWidth;
    }
    if (hasRest(b)) {
      const { readings: _, ...others } = b;
      rest.push([i, others]);
    }
  }
  return { readings, counts, rest };
}

export function decodeGroup(group: EncodedGroup): WriteBatch[] {
  const { readings: f, counts } = group;
  const batches: WriteBatch[] = [];
  let o = 0;
  for (let i = 0; i < counts.length; i++) {
    const rows: ReadingRow[] = [];
    for (let k = 0; k < counts[i]!; k++) {
      rows.push({
        sensorId: f[o]!,
        tsMs: f[o + 1]!,
        speedMps: f[o + 2]!,
        gustMps: orNull(f[o + 3]!),
        dirDeg: orNull(f[o + 4]!),
        tempC: orNull(f[o + 5]!),
        pressurePa: orNull(f[o + 6]!),
        rhPct: orNull(f[o + 7]!),
        late: f[o + 8] === 1,
        rollupGustMps: f[o + 9]!,
      });
      o += readingWidth;
    }
    batches.push({ ...emptyWriteBatch(), readings: rows });
  }
  for (const [i, others] of group.rest) Object.assign(batches[i]!, others);
  return batches;
}

/** What the worker is told; every request is answered with its `id`, in order. */
export type WorkerRequest =
  | { kind: 'commit'; id: number; nowMs: number; group: EncodedGroup }
  | { kind: 'minutes'; id: number; nowMs: number }
  | { kind: 'settle'; id: number; nowMs: number }
  | { kind: 'close'; id: number; nowMs: number };

export interface WorkerStats extends WriteQueueStats {
  failing: boolean;
}

export type WorkerReply =
  | { kind: 'done'; id: number; stats: WorkerStats; stored?: Uint8Array }
  | { kind: 'stats'; stats: WorkerStats }
  | { kind: 'failed'; id: number; message: string };

export interface CommitThreadOptions {
  /** The database file (the worker opens its own connection to it). */
  file: string;
  now: () => number;
  /** Each sensor's newest stored minute (rebuildNewestMinutes), for the worker's first start. */
  newestMinutes: ReadonlyMap<number, number>;
  /** Recomputes the newest minutes for a worker started after one died (rebuildNewestMinutes on the main connection). */
  rebuildNewestMinutes: () => ReadonlyMap<number, number>;
  /** The main thread's statistics object, kept up to date from the worker's answers. */
  stats: WriteQueueStats;
}

interface Pending {
  batch: WriteBatch;
  resolve: (outcome: WriteOutcome) => void;
  reject: (err: Error) => void;
}

interface Request {
  /** A commit's group is sent again to the next worker if this one dies; other requests fail. */
  commit: boolean;
  resolve: (reply: Extract<WorkerReply, { kind: 'done' }>) => void;
  reject: (err: Error) => void;
}

function startWorker(file: string, newestMinutes: ReadonlyMap<number, number>): Worker {
  // Young generation kept small: the worker holds a group or two of rows at a time (its backlog,
  // while the disk is full, lives in the old generation, which is left unbounded).
  return startStorageWorker('commitWorker', { file, newestMinutes: [...newestMinutes] }, { maxYoungGenerationSizeMb: 4 });
}

export class CommitThread {
  /** Null between a worker's death and the start of the next one. */
  private worker: Worker | null;
  private pending: Pending[] = [];
  /** The group the worker is committing, null while it is idle. */
  private inFlight: Pending[] | null = null;
  private readonly requests = new Map<number, Request>();
  private nextId = 1;
  private scheduled = false;
  private closed = false;
  private failingNow = false;
  /** The current worker has answered at least once (it started). */
  private answered = false;
  /** Counters of workers that died, added to the current worker's (which count from zero). */
  private readonly base = { droppedBacklogReadings: 0, committedBatches: 0, committedReadings: 0, duplicateReadings: 0, failedCommits: 0 };

  constructor(private readonly o: CommitThreadOptions) {
    this.worker = this.spawn(o.newestMinutes);
  }

  get failing(): boolean {
    return this.failingNow;
  }

  enqueue(batch: WriteBatch): Promise<WriteOutcome> {
    return new Promise<WriteOutcome>((resolve, reject) => {
      // After the close, as the in-thread queue on a closed connection: not stored.
      if (this.closed) return resolve({ stored: false });
      this.pending.push({ batch, resolve, reject });
      if (this.inFlight || this.scheduled) return;
      // No group window (WriteQueue's groupWindowMs): the next group gathers while one commits,
      // and the embedded broker reads a gateway's next packets only once every message of its
      // last read is acknowledged, so a window would be added to every round (`npm run bench`:
      // 2 ms cost about a fifth of the ingest rate).
      this.scheduled = true;
      setImmediate(() => this.flush());
    });
  }

  /** Sends what is pending now if the worker is idle (otherwise it goes when the worker answers). */
  flush(): void {
    this.scheduled = false;
    if (this.inFlight || this.pending.length === 0 || this.closed || !this.worker) return;
    const group = this.pending;
    this.pending = [];
    this.inFlight = group;
    const encoded = encodeGroup(group.map((p) => p.batch));
    this.request({ kind: 'commit', id: 0, nowMs: this.o.now(), group: encoded }, [encoded.readings.buffer as ArrayBuffer]).then(
      (reply) => {
        this.inFlight = null;
        const stored = reply.stored!;
        for (let i = 0; i < group.length; i++) group[i]!.resolve({ stored: stored[i] === 1 });
        this.flush();
      },
      (err: Error) => {
        this.inFlight = null;
        for (const p of group) p.reject(err);
        this.flush();
      },
    );
  }

  /** Writes each sensor's open minute (the worker holds them); resolves once written or kept (never rejects). */
  async writeOpenMinutes(): Promise<void> {
    if (this.closed) return;
    await this.request({ kind: 'minutes', id: 0, nowMs: this.o.now() }).catch(() => undefined);
  }

  /** Everything pending, then the open minutes, committed: resolves when the worker is done. */
  async settle(): Promise<void> {
    if (this.closed) return;
    this.flush();
    // What is in flight or pending goes first, a group at a time; then the settle request (the
    // worker handles requests in order).
    while ((this.inFlight || this.pending.length > 0) && !this.closed) {
      await new Promise<void>((resolve) => setTimeout(resolve, 1));
      this.flush();
    }
    await this.request({ kind: 'settle', id: 0, nowMs: this.o.now() }).catch(() => undefined);
  }

  /** Closes the worker's connection and ends the thread (call `settle` first). */
  stop(): void {
    if (this.closed) return;
    this.closed = true;
    void this.request({ kind: 'close', id: 0, nowMs: this.o.now() }).catch(() => undefined);
    this.worker?.unref();
  }

  private request(req: WorkerRequest, transfer: ArrayBuffer[] = []): Promise<Extract<WorkerReply, { kind: 'done' }>> {
    const id = this.nextId++;
    req.id = id;
    const worker = this.worker;
    if (!worker) return Promise.reject(new Error('the commit thread is starting again'));
    return new Promise((resolve, reject) => {
      this.requests.set(id, { commit: req.kind === 'commit', resolve, reject });
      worker.postMessage(req, transfer);
    });
  }

  private spawn(newestMinutes: ReadonlyMap<number, number>): Worker {
    const worker = startWorker(this.o.file, newestMinutes);
    worker.on('message', (reply: WorkerReply) => {
      this.answered = true;
      if (reply.kind !== 'failed') this.takeStats(reply.stats);
      if (reply.kind === 'stats') return;
      const req = this.requests.get(reply.id);
      if (!req) return;
      this.requests.delete(reply.id);
      if (reply.kind === 'done') req.resolve(reply);
      else req.reject(new Error(reply.message));
    });
    worker.on('error', (err) => this.died(worker, err));
    worker.on('exit', (code) => this.died(worker, new Error(`the commit thread exited (code ${code})`)));
    return worker;
  }

  /** The worker is gone: nothing it was given is known to be stored; start another unless closing. */
  private died(worker: Worker, err: Error): void {
    if (worker !== this.worker) return;
    const message = `commit thread failed: ${err.message}`;
    const requests = [...this.requests.values()];
    this.requests.clear();
    for (const r of requests) if (!r.commit || this.closed) r.reject(new Error(message));
    if (this.closed) return;
    // The group in flight is not known to be stored: it goes first to the next worker (its
    // readings and alerts are inserted once however often they are sent), still unacknowledged.
    if (this.inFlight) this.pending = [...this.inFlight, ...this.pending];
    this.inFlight = null;
    for (const k of Object.keys(this.base) as Array<keyof typeof this.base>) this.base[k] = this.o.stats[k];
    // What the dead worker held for retry (the database could not write) is gone with it: counted
    // as dropped, as a crash of the process would lose it (README).
    this.base.droppedBacklogReadings += this.o.stats.backlogRows;
    this.o.stats.backlogRows = 0;
    this.o.stats.lastError = message;
    this.o.stats.lastErrorAtMs = this.o.now();
    this.o.stats.recoveredAtMs = null;
    this.failingNow = true;
    this.worker = null;
    // A worker that cannot start would fail again at once: the next one starts after a pause.
    const restart = (): void => {
      if (this.closed) return;
      this.worker = this.spawn(this.o.rebuildNewestMinutes());
      this.flush();
    };
    if (this.answered) restart();
    else setTimeout(restart, restartPauseMs).unref();
    this.answered = false;
  }

  private takeStats(s: WorkerStats): void {
    const { failing, ...stats } = s;
    this.failingNow = failing;
    // A dead worker's error stays on show until the new worker has one of its own.
    const keepError = stats.lastErrorAtMs === null ? { lastError: this.o.stats.lastError, lastErrorAtMs: this.o.stats.lastErrorAtMs, recoveredAtMs: this.o.stats.recoveredAtMs } : null;
    Object.assign(this.o.stats, stats, keepError);
    for (const k of Object.keys(this.base) as Array<keyof typeof this.base>) this.o.stats[k] += this.base[k];
  }
}
