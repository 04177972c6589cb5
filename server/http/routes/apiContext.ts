/** What the API routes work with, handed over by the composition root. */
import type { Accounts } from '../../auth/accounts.ts';
import type { Registry } from '../../ingest/registry.ts';
import type { RejectionLog } from '../../ingest/rejections.ts';
import type { LiveHub } from '../../live/liveHub.ts';
import type { Storage } from '../../storage/storage.ts';
import type { WriteQueue } from '../../storage/writeQueue.ts';
import type { Watch } from '../../watch/watch.ts';
import type { Logger } from '../../log.ts';
import type { ForecastFeed } from '../../forecastFeed/index.ts';

export interface ApiContext {
  /** The one seam to the database (storage/storage.ts). */
  storage: Storage;
  registry: Registry;
  watch: Watch;
  /** The group-commit queue (acknowledgements go through it, so they survive a full disk). */
  queue: WriteQueue;
  hub: LiveHub;
  rejections: RejectionLog;
  accounts: Accounts;
  now: () => number;
  /** Re-reads the register into the live watch after a change. */
  reloadRegister: () => Promise<void>;
  topicPrefix: string;
  health: () => Promise<Record<string, unknown>>;
  /** For what the routes notice that an operator should see (a stream client dropped). */
  log?: Logger;
  /** The forecast feed's poller (design §2.7); absent in contexts built without one. */
  forecastFeed?: ForecastFeed;
}
