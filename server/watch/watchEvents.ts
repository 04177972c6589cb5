/**
 * The live watch's domain events (design §5 v2): what happened to a structure or an alert, in the
 * order it happened. The alert book's events are levels/alertBook.ts's; the structure's are here.
 * storage/watchRows.ts turns them into the rows of one write batch; after the commit the watch's
 * stream messages (live/liveMessages.ts) and the notifications follow.
 */
import type { AlertEvent } from '../levels/alertBook.ts';

export type StructureEvent =
  /** The level rose or fell (levels/stepLevel.ts); a rise carries the estimate in force just before it (design §2.7). */
  | { type: 'level-changed'; structureId: number; atMs: number; fromLevel: number; toLevel: number; gustMps: number; utilization: number | null; estimate: { level: number; chance10: number; chance30: number } | null }
  /** The last live governing sensor went: "no data", the level held. */
  | { type: 'data-lost'; structureId: number; atMs: number; level: number }
  /** Readings came back. */
  | { type: 'data-restored'; structureId: number; atMs: number; level: number; gustMps: number | null; utilization: number | null }
  /** The live configuration switched (design §2.5): the crew's Done or a switch by hand. */
  | {
      type: 'configuration-changed';
      structureId: number;
      atMs: number;
      fromName: string;
      toName: string;
      by: string;
      note: string | null;
      /** The alert whose action was marked done; null for a switch by hand. */
      alertId: number | null;
      reason: 'action-done' | 'by-hand';
      /** Who, for the audit trail (the signed-in principal). */
      actor: string;
    };

export type WatchEvent = AlertEvent | StructureEvent;
