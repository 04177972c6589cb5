/**
 * The per-message path: topic → registered sensor → parsed, validated readings → live watch
 * (wind state, structure assessments, levels) → one group commit → announce on the live stream.
 * Anything that is not a valid reading is rejected with a reason and counted, never stored.
 */
import type { WriteQueue } from '../storage/writeQueue.ts';
import type { WriteBatch } from '../storage/writeBatch.ts';
import { parseReadingPayload, type Reading } from './payload.ts';
import type { RegisteredSensor, Registry } from './registry.ts';
import type { IngestRejectReason, RejectionLog } from './rejections.ts';
import type { ReadingSink } from './sink.ts';
import { sensorKeyOfTopic } from './topic.ts';

/** What the live watch does with a sensor's accepted readings. */
export interface ReadingConsumer {
  /**
   * Takes readings (oldest first) and returns the rows to commit with them and what to announce
   * once they are committed. Runs synchronously on the per-message path.
   */
  take(sensor: RegisteredSensor, readings: readonly Reading[], receivedAtMs: number): { batch: WriteBatch; afterCommit: (() => void) | null };
}

export interface IngestCounters {
  messages: number;
  acceptedReadings: number;
  rejectedMessages: number;
  rejectedReadings: number;
  /** Readings acknowledged while the database could not write, held in memory for retry. */
  heldReadings: number;
}

export class IngestPipeline implements ReadingSink {
  readonly counters: IngestCounters = { messages: 0, acceptedReadings: 0, rejectedMessages: 0, rejectedReadings: 0, heldReadings: 0 };

  constructor(
    private readonly topicPrefix: string,
    private readonly registry: Registry,
    private readonly rejections: RejectionLog,
    private readonly consumer: ReadingConsumer,
    private readonly queue: WriteQueue,
  ) {}

  refuse(sensorKey: string, reason: IngestRejectReason, detail: string): void {
    this.counters.messages++;
    this.counters.rejectedMessages++;
    this.rejections.record(sensorKey, reason, detail);
  }

  async accept(topic: string, payload: Uint8Array, receivedAtMs: number): Promise<void> {
    this.counters.messages++;
    const key = sensorKeyOfTopic(this.topicPrefix, topic);
    if (key === null) return this.reject('*', 'bad-topic', `topic "${topic.slice(0, 200)}" is not ${this.topicPrefix}/<sensorKey>/reading`);
    const sensor = this.registry.sensorByKey(key);
    if (!sensor) return this.reject(key, 'unknown-sensor', `no sensor is registered with key "${key}"`);

    let taken: ReturnType<ReadingConsumer['take']>;
    let readings: readonly Reading[];
    try {
      const parsed = parseReadingPayload(payload, { receivedAtMs, unit: sensor.unit });
      if (!parsed.ok) return this.reject(key, parsed.reason, parsed.detail);
      for (const bad of parsed.rejected ?? []) {
        this.counters.rejectedReadings++;
        this.rejections.record(key, bad.reason, bad.detail);
      }
      if (parsed.readings.length === 0) return;
      readings = parsed.readings.length > 1 ? [...parsed.readings].sort((a, b) => a.tsMs - b.tsMs) : parsed.readings;
      taken = this.consumer.take(sensor, readings, receivedAtMs);
    } catch (err) {
      // A defect of ours, not a storage failure: leaving the message unacknowledged would have the
      // broker redeliver it for ever and hold up every message behind it. Rejected, counted and
      // logged (the rejection log names it), nothing stored.
      return this.reject(key, 'internal-error', `the server could not handle this message: ${String(err).slice(0, 200)}`);
    }
    const { batch, afterCommit } = taken;
    // Held (not stored) when the database cannot write: see WriteQueue. Either way the phones hear
    // about it at once and the broker gets its acknowledgement.
    const { stored } = await this.queue.enqueue(batch);
    if (!stored) this.counters.heldReadings += readings.length;
    this.counters.acceptedReadings += readings.length;
    afterCommit?.();
  }

  private reject(sensorKey: string, reason: IngestRejectReason, detail: string): void {
    this.counters.rejectedMessages++;
    this.rejections.record(sensorKey, reason, detail);
  }
}
