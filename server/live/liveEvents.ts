/**
 * The live stream's events (GET /api/stream), one typed map for the server that sends them and the
 * web app that reads them: the kind of each Server-Sent Event and the JSON its data carries. The
 * once-a-second frames (`winds`, `structures`, `foresight`) are columnar (frames.ts); the rest are
 * whole records. Events sent by the stream route itself (`hello`, `snapshot`, `ping`) are listed
 * apart because the hub never publishes them.
 *
 * Also here, because both ends must agree on them: the order of the board (no data first, then the
 * highest level, then the least margin) and which alerts a screen lists.
 */
import type { OpenAlert } from '../levels/alertBook.ts';
import type { StructureState, SystemStatus, Watch } from '../watch/watch.ts';
import type { Frame } from './frames.ts';

export interface LiveEventMap {
  /** Once a second: the sensors whose shown wind or state changed. */
  winds: Frame;
  /** Once a second: the wind-dependent figures of the structures whose shown state moved. */
  structures: Frame;
  /** Every few seconds at most: the estimates (design §2.7) of the structures whose figures changed. */
  foresight: Frame;
  /** A structure whose level, data state or configuration changed: its whole state. */
  structure: StructureState;
  /** An alert raised, signalled again, or its action overdue. */
  alert: OpenAlert & { resignal: boolean; overdue?: true };
  /** An alert acknowledged, its action done, or its condition ended. */
  'alert-update': OpenAlert;
  /** The server's storage or broker changed state. */
  health: SystemStatus;
  /** The register or the site settings changed: take a new snapshot. */
  register: { atMs: number };
}

export type LiveEventKind = keyof LiveEventMap;

/** Sent by the stream route to one client only. */
export interface StreamOnlyEventMap {
  hello: { atMs: number };
  snapshot: ReturnType<Watch['snapshot']>;
  /** The server's clock, ms since the epoch, as plain text. */
  ping: number;
}

/** The kinds the web app listens for. */
export const streamEventKinds = ['hello', 'snapshot', 'winds', 'structure', 'structures', 'foresight', 'register', 'alert', 'alert-update', 'ping', 'health'] as const satisfies ReadonlyArray<LiveEventKind | keyof StreamOnlyEventMap>;

/** The board's order: no data first, then the highest level, then the least margin. */
export function byUrgency(a: Pick<StructureState, 'noData' | 'level' | 'margin'>, b: Pick<StructureState, 'noData' | 'level' | 'margin'>): number {
  if (a.noData !== b.noData) return a.noData ? -1 : 1;
  if (a.level !== b.level) return b.level - a.level;
  return (a.margin ?? -Infinity) - (b.margin ?? -Infinity);
}

/** Which alerts a screen lists: the alert book's rule (levels/alertBook.ts), here for the web app. */
export { listedAlerts } from '../levels/alertBook.ts';
