/**
 * What the MQTT side hands a message to. `accept` settles after the message's readings are
 * committed (or after the message was rejected and counted): only then may the broker be told
 * the message was received. The one exception is a database that cannot write (disk full,
 * read-only folder): the write queue then holds the rows in memory and settles with them held
 * (writeQueue.ts says why: live alerting comes first), and a crash in that state loses what was
 * held (README, "If the database cannot write"). It rejects only on a defect (a commit worker that
 * failed its group); the message is then left unacknowledged so the broker delivers it again.
 */
import type { IngestRejectReason } from './rejections.ts';

export interface ReadingSink {
  accept(topic: string, payload: Uint8Array, receivedAtMs: number): Promise<void>;
  /** Counts a refused message (unknown gateway topic...) without looking at its payload. */
  refuse(sensorKey: string, reason: IngestRejectReason, detail: string): void;
}
