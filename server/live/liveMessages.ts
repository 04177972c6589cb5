/**
 * What the live watch has to say on the stream once its batch is committed (nothing is announced
 * before its commit, or, while the database cannot write, before its rows are held for the retry:
 * writeQueue.ts): messages typed by the stream's event map (liveEvents.ts). A record's
 * payload may be given as a function, read only when it is published, so the stream carries the
 * state as it stands after the commit; the once-a-second frames come as their JSON text.
 */
import type { LiveEventKind, LiveEventMap } from './liveEvents.ts';
import type { LiveHub } from './liveHub.ts';

export type FrameKind = 'winds' | 'structures' | 'foresight';

export type LiveMessage =
  | { [K in Exclude<LiveEventKind, FrameKind>]: { kind: K; payload: LiveEventMap[K] | (() => LiveEventMap[K]) } }[Exclude<LiveEventKind, FrameKind>]
  | { kind: FrameKind; text: string };

/** Publishes the messages in order. */
export function publishMessages(hub: LiveHub, messages: readonly LiveMessage[]): void {
  for (const m of messages) {
    if ('text' in m) hub.publishText(m.kind, m.text);
    else hub.publish(m.kind, (typeof m.payload === 'function' ? m.payload() : m.payload) as never);
  }
}
