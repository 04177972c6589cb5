/**
 * The stream's `snapshot` event, built once for the clients that connect within a second of each
 * other while nothing is announced (the hub's last event id unchanged). After a site's network
 * comes back, every phone reconnects at once, and each built the whole snapshot for itself: with
 * 1,000 structures their states and about 3 MB of JSON (`npm run bench`, benchmark 7: 500
 * clients took 47.6–51.7 s to connect and read theirs, about 0.1 s each; shared, 5.4–5.7 s).
 *
 * Shared, a snapshot is up to a second old, as a fresh one is up to a second behind the
 * once-a-second frames: whatever changed since it was built is in the next frame (the frames
 * carry every row that changed since the last frame went out, live/frames.ts), and anything
 * announced at once (a level change, an alert) has a new event id and so a new snapshot. It is
 * let go a second after it was built, so its text is not kept while nobody connects; and it is
 * kept as text only once a second client asks for it: held for every single reconnect, the
 * text raised the server's resident memory in `npm run bench` from 133–139 to 146–154 MB.
 */
export interface SharedSnapshot {
  /** The hub's last event id when it was built: the stream sends the events after it. */
  lastId: number;
  /** The snapshot's JSON in pieces (http/jsonList.ts jsonPieces); joined, one line. */
  pieces: Iterable<string>;
}

export const sharedSnapshotMs = 1_000;

export class SnapshotShare {
  /** The last snapshot handed out, and its text once a second client asked for the same one. */
  private last: { lastId: number; builtAtMs: number; pieces: readonly string[] | null } | null = null;

  constructor(
    private readonly lastId: () => number,
    private readonly build: () => Iterable<string>,
    private readonly wallMs: () => number = Date.now,
  ) {}

  /**
   * The snapshot for a client connecting now. The first client of a quiet second gets its own,
   * written as it is built (nothing held: one phone reconnecting costs no more memory than
   * before); a second one within the second builds it as text that it and the rest share.
   */
  get(): SharedSnapshot {
    const lastId = this.lastId();
    const nowMs = this.wallMs();
    const last = this.last;
    if (last === null || last.lastId !== lastId || nowMs - last.builtAtMs >= sharedSnapshotMs) {
      this.last = { lastId, builtAtMs: nowMs, pieces: null };
      this.letGo(this.last);
      return { lastId, pieces: this.build() };
    }
    if (last.pieces === null) last.pieces = [...this.build()];
    return { lastId, pieces: last.pieces };
  }

  /** Whether a snapshot's text is held now (tests). */
  get holding(): boolean {
    return this.last?.pieces != null;
  }

  private letGo(entry: NonNullable<SnapshotShare['last']>): void {
    setTimeout(() => {
      if (this.last === entry) this.last = null;
    }, sharedSnapshotMs).unref();
  }
}
