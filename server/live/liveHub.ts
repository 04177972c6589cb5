/**
 * The live stream's fan-out: every event is numbered, serialized once and kept in a ring of the
 * most recent ones, so a phone that lost its connection resumes from `Last-Event-ID` with what
 * it missed; one that was away too long gets a fresh snapshot instead. Dozens of phones cost
 * one JSON.stringify per event, not one per phone.
 */
export type LiveEventKind = 'wind' | 'structure' | 'alert' | 'alert-update' | 'sensor' | 'health' | 'snapshot';

export interface LiveEvent {
  id: number;
  kind: LiveEventKind;
  /** The JSON text sent as the event's data. */
  data: string;
}

export type LiveListener = (event: LiveEvent) => void;

export class LiveHub {
  private readonly ring: LiveEvent[];
  private nextId = 1;
  private start = 0;
  private size = 0;
  private readonly listeners = new Set<LiveListener>();

  constructor(private readonly capacity = 2_000) {
    this.ring = new Array<LiveEvent>(capacity);
  }

  publish(kind: LiveEventKind, payload: unknown): LiveEvent {
    const event: LiveEvent = { id: this.nextId++, kind, data: JSON.stringify(payload) };
    const slot = (this.start + this.size) % this.capacity;
    this.ring[slot] = event;
    if (this.size < this.capacity) this.size++;
    else this.start = (this.start + 1) % this.capacity;
    for (const listener of this.listeners) listener(event);
    return event;
  }

  subscribe(listener: LiveListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
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
