/**
 * The checkpoint thread's worker (checkpointThread.ts): its own connection to the database file,
 * and every `intervalMs` one PASSIVE checkpoint (https://www.sqlite.org/pragma.html#pragma_wal_checkpoint):
 * it copies the committed frames of the write-ahead log into the database file and syncs both,
 * never waiting for a reader or a writer and never holding up either. When commits arrived while
 * it copied, the next round comes after `catchUpMs` instead. Each round past `longLogFrames`
 * frames tells the main thread, which finishes the copy from its own connection (checkpointThread.ts
 * says why), and waits for its answer.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { performance } from 'node:perf_hooks';
import Database from 'better-sqlite3';
import type { CheckpointReply, CheckpointRequest, CheckpointWorkerData } from './checkpointThread.ts';

const { file, intervalMs, catchUpMs, longLogFrames } = workerData as CheckpointWorkerData;
const port = parentPort!;
const sqlite = new Database(file, { fileMustExist: true });
const checkpoint = sqlite.prepare('PRAGMA wal_checkpoint(PASSIVE)');

let timer: NodeJS.Timeout | undefined;
/** How long a round waits for the main thread's checkpoint before going on without it. */
const mainAnswerTimeoutMs = 1_000;
let stopped = false;

function round(): void {
  timer = undefined;
  if (stopped) return;
  const startedAt = performance.now();
  // One row: busy (0: never, in PASSIVE mode), log (frames in the log), checkpointed (frames copied).
  const r = checkpoint.get() as { busy: number; log: number; checkpointed: number };
  const tookMs = performance.now() - startedAt;
  const behind = r.log > r.checkpointed;
  const long = r.log >= longLogFrames;
  const reply: CheckpointReply = { kind: 'round', logFrames: r.log, copiedFrames: r.checkpointed, tookMs, long };
  port.postMessage(reply);
  // A long log: the main thread finishes this copy, and a checkpoint here meanwhile would only
  // make it find the checkpoint lock taken; the next round waits for its answer (or a second).
  if (long) timer = setTimeout(round, mainAnswerTimeoutMs);
  else timer = setTimeout(round, behind ? catchUpMs : intervalMs);
}

port.on('message', (req: CheckpointRequest) => {
  if (req.kind === 'resume') {
    if (timer !== undefined) clearTimeout(timer);
    timer = setTimeout(round, intervalMs);
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
