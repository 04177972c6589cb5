/**
 * What the live watch has to say on the stream once its batch is committed (nothing is announced
 * before its commit, or, while the database cannot write, before its rows are held for the retry:
 * writeQueue.ts): messages typed by the stream's event map (liveEvents.ts). A record's
 * payload may be given as a function, read only when it is published, so the stream carries the
 * state as it stands after the commit; the once-a-second frames come as their JSON text. Among
 * them, in their place, the alert book's committed events for the watch's observers (the
 * notification channels: watch/alertEventObservers.ts).
 */
import type { AlertEvent } from '../levels/alertBook.ts';
import type { AlertEventObservers } from '../watch/alertEventObservers.ts';
import type { LiveEventKind, LiveEventMap } from './liveEvents.ts';
import type { LiveHub } from './liveHub.ts';

export type FrameKind = 'winds' | 'structures' | 'foresight';

export type LiveMessage =
  | { [K in Exclude<LiveEventKind, FrameKind>]: { kind: K; payload: LiveEventMap[K] | (() => LiveEventMap[K]) } }[Exclude<LiveEventKind, FrameKind>]
  | { kind: FrameKind; text: string }
  /** Not a stream message: domain events handed to their observers once committed. */
  | { kind: 'alert-events'; events: readonly AlertEvent[]; to: AlertEventObservers };

/** Publishes the messages in order (and hands the alert events over in theirs). */
export function publishMessages(hub: LiveHub, messages: readonly LiveMessage[]): void {
  for (const m of messages) {
    if ('text' in m) hub.publishText(m.kind, m.text);
    else if (m.kind === 'alert-events') m.to.deliver(m.events);
    else hub.publish(m.kind, (typeof m.payload === 'function' ? m.payload() : m.payload) as never);
  }
}
