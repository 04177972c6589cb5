/**
 * The live stream's fan-out: every event is numbered, serialized once and kept in a ring of the
 * most recent ones, so a phone that lost its connection resumes from `Last-Event-ID` with what
 * it missed; one that was away too long gets a fresh snapshot instead. Dozens of phones cost
 * one JSON.stringify per event, not one per phone.
 */
import type { LiveEventKind, LiveEventMap } from './liveEvents.ts';

export type { LiveEventKind } from './liveEvents.ts';

export interface LiveEvent {
  id: number;
  kind: LiveEventKind;
  /** The JSON text sent as the event's data (one line: JSON.stringify writes no line breaks). */
  data: string;
  /** The whole Server-Sent Events message, encoded once for every client (see `sseBytes`). */
  sse?: Uint8Array;
}

const encoder = new TextEncoder();

/** The event as one encoded SSE message (`id`, `event`, `data`), made once and kept on the event. */
export function sseBytes(event: LiveEvent): Uint8Array {
  event.sse ??= encoder.encode(`id: ${event.id}\nevent: ${event.kind}\ndata: ${event.data}\n\n`);
  return event.sse;
}

export type LiveListener = (event: LiveEvent) => void;

/** An observer inside the server: the event as sent, and the typed record it was made from (null for a frame published as text). */
export type LiveObserver = (event: LiveEvent, record: { [K in LiveEventKind]: { kind: K; payload: LiveEventMap[K] } }[LiveEventKind] | null) => void;

export class LiveHub {
  private readonly ring: LiveEvent[];
  private nextId = 1;
  private start = 0;
  private size = 0;
  private bytes = 0;
  private readonly listeners = new Set<LiveListener>();
  /** Listeners inside the server (tests, tools), not counted as stream clients; alert channels take the watch's alert events instead (watch/alertEventObservers.ts). */
  private readonly observers = new Set<LiveObserver>();

  /**
   * @param capacity most events kept for replay
   * @param maxBytes most characters of event data kept for replay (the oldest go first), so a
   *   large site's big events cannot grow the ring without bound
   */
  constructor(
    private readonly capacity = 2_000,
    private readonly maxBytes = 4 * 1024 * 1024,
  ) {
    this.ring = new Array<LiveEvent>(capacity);
  }

  /** An event of the typed map (liveEvents.ts), serialized once here. */
  publish<K extends LiveEventKind>(kind: K, payload: LiveEventMap[K]): LiveEvent {
    return this.send(kind, JSON.stringify(payload), { kind, payload } as Parameters<LiveObserver>[1]);
  }

  /** An event whose JSON text is already written (the once-a-second frames build their own). */
  publishText(kind: LiveEventKind, data: string): LiveEvent {
    return this.send(kind, data, null);
  }

  private send(kind: LiveEventKind, data: string, record: Parameters<LiveObserver>[1]): LiveEvent {
    if (data.includes('\n')) throw new RangeError(`live event data must be one line (kind ${kind})`);
    const event: LiveEvent = { id: this.nextId++, kind, data };
    if (this.size === this.capacity) this.dropOldest();
    this.ring[(this.start + this.size) % this.capacity] = event;
    this.size++;
    this.bytes += event.data.length;
    while (this.bytes > this.maxBytes && this.size > 1) this.dropOldest();
    for (const listener of this.listeners) listener(event);
    for (const observer of this.observers) observer(event, record);
    return event;
  }

  private dropOldest(): void {
    const oldest = this.ring[this.start]!;
    this.bytes -= oldest.data.length;
    this.start = (this.start + 1) % this.capacity;
    this.size--;
  }

  subscribe(listener: LiveListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Like `subscribe`, for a part of the server (not counted in `listenerCount`); the listener must only queue the event and return. */
  observe(listener: LiveObserver): () => void {
    this.observers.add(listener);
    return () => this.observers.delete(listener);
  }

  get listenerCount(): number {
    return this.listeners.size;
  }

  get lastId(): number {
    return this.nextId - 1;
  }

  /**
   * The events after `lastSeenId`, or null when some of them have already left the ring (the
   * caller must then start from a snapshot).
   */
  since(lastSeenId: number): LiveEvent[] | null {
    if (lastSeenId >= this.lastId) return [];
    const oldest = this.size === 0 ? this.nextId : this.ring[this.start]!.id;
    if (lastSeenId < oldest - 1) return null;
    const out: LiveEvent[] = [];
    for (let i = 0; i < this.size; i++) {
      const event = this.ring[(this.start + i) % this.capacity]!;
      if (event.id > lastSeenId) out.push(event);
    }
    return out;
  }
}
