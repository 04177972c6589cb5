/**
 * What the MQTT side hands a message to. `accept` settles after the message's readings are
 * committed (or after the message was rejected and counted): only then may the broker be told
 * the message was received. It rejects only when the database could not commit; the message is
 * then left unacknowledged so the broker delivers it again.
 */
export interface ReadingSink {
  accept(topic: string, payload: Uint8Array, receivedAtMs: number): Promise<void>;
  /** Counts a refused message (unknown gateway topic...) without looking at its payload. */
  refuse(sensorKey: string, reason: string, detail: string): void;
}
