/**
 * The outbox's types for notify/ and the web app: every message to every recipient is a row before
 * anything is sent (stored by storage/outbox.ts, delivered by dispatcher.ts).
 */
import type { Storage } from '../storage/storage.ts';

export type { NewDelivery, OutboxRow } from '../storage/outbox.ts';
/** The outbox as the storage holds it. */
export type Outbox = Storage['outbox'];
