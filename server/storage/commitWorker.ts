/**
 * The commit thread's worker (commitThread.ts): its own connection to the database file, set up
 * as the main one is (WAL, synchronous NORMAL, foreign keys, busy timeout), and an in-thread
 * `WriteQueue` on it. Requests are handled one at a time, in order; each is answered with the
 * queue's statistics. A commit request is answered once every batch of the group has its
 * outcome (committed, or held for retry), so the main thread acknowledges nothing before its
 * commit. The queue's own retry timer keeps running here; its effect reaches the main thread
 * with the next answer, or within a second.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { performance } from 'node:perf_hooks';
import Database from 'better-sqlite3';
import { decodeGroup, type WorkerReply, type WorkerRequest, type WorkerStats } from './commitThread.ts';
import { configureConnection } from './connection.ts';
import { WriteQueue } from './writeQueue.ts';

const { file, newestMinutes } = workerData as { file: string; newestMinutes: Array<[number, number]> };
const port = parentPort!;
const sqlite = new Database(file, { fileMustExist: true });
configureConnection(sqlite);

// The main thread's clock (tests give the server one): the time it sent the request, moved on by
// the time elapsed here since.
let clock = { mainMs: Date.now(), atMs: performance.now() };
const now = (): number => clock.mainMs + (performance.now() - clock.atMs);
const queue = new WriteQueue(sqlite, now, 0, new Map(newestMinutes));

const stats = (): WorkerStats => ({ ...queue.stats, failing: queue.failing });
let lastSent = '';
const send = (reply: Exclude<WorkerReply, { kind: 'failed' }>): void => {
  lastSent = JSON.stringify(reply.stats);
  port.postMessage(reply);
};

async function handle(req: WorkerRequest): Promise<void> {
  clock = { mainMs: req.nowMs, atMs: performance.now() };
  if (req.kind === 'commit') {
    const outcomes = await Promise.all(decodeGroup(req.group).map((b) => queue.enqueue(b)));
    const stored = new Uint8Array(outcomes.length);
    for (let i = 0; i < outcomes.length; i++) stored[i] = outcomes[i]!.stored ? 1 : 0;
    send({ kind: 'done', id: req.id, stats: stats(), stored });
  } else if (req.kind === 'minutes') {
    await queue.writeOpenMinutes();
    send({ kind: 'done', id: req.id, stats: stats() });
  } else if (req.kind === 'settle') {
    await queue.settle();
    send({ kind: 'done', id: req.id, stats: stats() });
  } else {
    queue.stop();
    sqlite.close();
    send({ kind: 'done', id: req.id, stats: stats() });
    port.close();
  }
}

let chain = Promise.resolve();
port.on('message', (req: WorkerRequest) => {
  chain = chain.then(
    () => handle(req),
    () => handle(req),
  ).catch((err: unknown) => port.postMessage({ kind: 'failed', id: req.id, message: err instanceof Error ? err.message : String(err) } satisfies WorkerReply));
});

// Started: the main thread hears so (and learns the worker can run) before its first request.
send({ kind: 'stats', stats: stats() });

// Retries the queue makes on its own (the disk was full): their outcome reaches the main thread.
setInterval(() => {
  const s = stats();
  if (JSON.stringify(s) !== lastSent) send({ kind: 'stats', stats: s });
}, 1_000).unref();
