/**
 * Watching during the event: the live snapshot, the live stream (Server-Sent Events, resumable
 * with Last-Event-ID), and acknowledging alerts.
 *
 * Stream events (each `data` is JSON):
 * - `snapshot`: everything (site, air, sensors, structures worst first, open alerts) — sent first
 *   on a new connection, and on a resumed one whose missed events are no longer kept;
 * - `winds`: once a second, a frame (server/live/frames.ts) with a row per sensor whose wind or
 *   state changed: `{atMs, columns, ago, rows}`, the cells in the order of `columns`, a column
 *   named in `ago` holding `atMs − value`;
 * - `structure`: one structure's whole state when its level or data state changes (at once);
 * - `structures`: once a second, a frame of the same form with the wind-dependent part of the
 *   structures whose shown state moved (gust by ≥ 0.05 m/s, level, data state, governing sensor);
 * - `foresight`: at most once a second, a frame of the same form with the estimates (chance of the
 *   next level and of the limit within 10 and 30 min, expected peak, time to the next level, and
 *   their inputs: server/watch/structureForesight.ts) of the structures whose shown figures changed;
 *   the frames keep to a budget of characters (about 10 kB/s in all, server/watch/liveFrames.ts),
 *   the most urgent rows first, none waiting more than a few seconds longer than that;
 * - `register`: the register changed (a structure, sensor or site setting): fetch /api/live again;
 * - `health`: storage or broker state changed (`{storageOk, storageError, brokerOk, ...}`);
 * - `alert`: a new alert, or an unacknowledged one signalled again (`resignal: true`);
 * - `alert-update`: an alert acknowledged or cleared;
 * - `ping`: every 15 s, so proxies keep the connection and phones notice a dead one.
 *
 * Acknowledging: one alert (`POST /api/alerts/:id/acknowledge`), or every open alert of one
 * structure or sensor at once (`POST /api/alerts/acknowledge`), the board's default action so a
 * windy spell's Watch, Prepare and Stop for one structure take one tap. Both store the same
 * acknowledgement row and audit entry per alert. The second is stored (committed, or held when
 * the disk refuses) before the stream announces it; while it is being stored its alerts answer
 * 409 to anybody else, so no alert is acknowledged twice.
 */
import { Hono } from 'hono';
import { streamSSE } from 'hono/streaming';
import { z } from 'zod';
import { principalName } from '../../auth/accounts.ts';
import { roleAllows } from '../../auth/roles.ts';
import { maxTextLength } from '../../engine/limits.ts';
import type { StoredAlert } from '../../storage/alerts.ts';
import { acknowledgementBatch } from '../../storage/writeBatch.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { jsonObject, jsonPieces } from '../jsonList.ts';
import { idParam, jsonBody } from '../validate.ts';
import { sseBytes, type LiveEvent } from '../../live/liveHub.ts';
import { SnapshotShare } from '../../live/sharedSnapshot.ts';
import type { OpenAlert } from '../../watch/watch.ts';
import type { ApiContext } from './apiContext.ts';

const noteSchema = z.string({ error: 'must be text' }).trim().max(maxTextLength, { error: `is longer than ${maxTextLength} characters` }).optional();

const acknowledgeSchema = z.strictObject({
  note: noteSchema,
});

/** Every open alert of one structure or one sensor; `alertIds`: only those (what the screen showed). */
const acknowledgeAllSchema = z
  .strictObject({
    structureId: z.number({ error: 'must be a structure id (a whole number)' }).int({ error: 'must be a whole number' }).positive({ error: 'must be a structure id (a whole number above 0)' }).optional(),
    sensorKey: z.string({ error: 'must be a sensor key' }).regex(/^[a-z0-9-]{1,64}$/, { error: 'must be a sensor key: a to z, 0 to 9 and -, at most 64 characters' }).optional(),
    alertIds: z
      .array(z.number({ error: 'must be an alert id (a whole number)' }).int({ error: 'must be a whole number' }).positive({ error: 'must be an alert id (a whole number above 0)' }), { error: 'must be a list of alert ids' })
      .min(1, { error: 'must name at least one alert (or leave it out for all of them)' })
      .max(10_000, { error: 'names more than 10 000 alerts' })
      .optional(),
    note: noteSchema,
  })
  .superRefine((body, ctx) => {
    if ((body.structureId === undefined) === (body.sensorKey === undefined)) {
      ctx.addIssue({ code: 'custom', path: body.structureId === undefined ? ['structureId'] : ['sensorKey'], message: 'name either a structure (structureId) or a sensor (sensorKey), not both and not neither' });
    }
  });

/** "Done: lowered" (with the alert) or a switch by hand: the configuration's name, a note. */
const configurationSwitchSchema = z.strictObject({
  configuration: z.string({ error: 'must be the name of one of the structure\'s configurations' }).trim().min(1, { error: 'must name a configuration' }).max(60, { error: 'is longer than 60 characters' }),
  alertId: z.number({ error: 'must be an alert id (a whole number)' }).int({ error: 'must be a whole number' }).positive({ error: 'must be an alert id (a whole number above 0)' }).optional(),
  note: noteSchema,
});

export const pingIntervalMs = 15_000;
/**
 * A stream client that stops reading (a phone gone to sleep with its socket open, a stalled
 * proxy) is dropped instead of kept forever (issue 13 item 7): when one write has not finished
 * within `streamWriteTimeoutMs`, or more than `streamMaxQueuedChars` of events wait for it while a
 * write has been stuck for `streamStallMs` (a burst to a client that reads is not dropped). It
 * reconnects by itself and resumes from Last-Event-ID (or a fresh snapshot), so it loses nothing
 * it can still show. Common practice: bound what one slow reader can make a server hold.
 */
export const streamWriteTimeoutMs = 30_000;
export const streamMaxQueuedChars = 1024 * 1024;
export const streamStallMs = 2_000;

/**
 * Waking the stream clients after an event, a slice at a time: with hundreds of phones watching,
 * writing one event to all of them in one turn of the event loop held the gateways' PUBACKs for
 * as long (issue 13 item 8: ack p99 2.8 s with 500 clients). Between slices the loop serves the
 * broker and the database. Each client's own order of events is kept (its queue is its own).
 */
const wakeSliceSize = 25;
const wakesDue = new Set<() => void>();
let wakesScheduled = false;

function wakeSoon(wake: () => void): void {
  wakesDue.add(wake);
  if (wakesScheduled) return;
  wakesScheduled = true;
  setImmediate(runWakes);
}

function runWakes(): void {
  let n = 0;
  for (const wake of wakesDue) {
    wakesDue.delete(wake);
    wake();
    if (++n >= wakeSliceSize) break;
  }
  if (wakesDue.size > 0) setImmediate(runWakes);
  else wakesScheduled = false;
}

export function liveRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  /** Alerts being stored by an "acknowledge all", by id: the name of who is acknowledging them. */
  const beingAcknowledged = new Map<number, string>();

  // In pieces, as the stream's snapshot (jsonList.ts): every screen fetches it when the register changes.
  api.get('/live', requireRole('viewer'), (c) => jsonObject(c, ctx.watch.snapshot(), 'structures'));

  // Phones that connect together share one snapshot (live/sharedSnapshot.ts).
  const snapshots = new SnapshotShare(
    () => ctx.hub.lastId,
    () => jsonPieces(ctx.watch.snapshot(), 'structures'),
  );

  api.get('/stream', requireRole('viewer'), (c) => {
    const header = c.req.header('last-event-id') ?? c.req.query('lastEventId');
    const lastSeen = header !== undefined && /^[0-9]{1,15}$/.test(header) ? Number(header) : null;
    const socket = (c.env as { incoming?: { socket?: { destroy(): void } } } | undefined)?.incoming?.socket;
    return streamSSE(c, async (stream) => {
      const queue: LiveEvent[] = [];
      let queuedChars = 0;
      let wake: (() => void) | null = null;
      const drop = (): void => {
        if (stream.aborted) return;
        stream.abort();
        // Free the kernel's buffers too: the socket goes, the phone reconnects.
        socket?.destroy();
      };
      // Set while a write waits for the client (see writeBytes).
      let writingSinceMs: number | null = null;
      /**
       * Not reading: more than streamMaxQueuedChars wait while one write has been stuck for
       * streamStallMs. A burst (a thousand structures getting their data back at once) to a client
       * that keeps reading is not a stall: its writes keep finishing.
       */
      const dropIfStalled = (): void => {
        if (queuedChars <= streamMaxQueuedChars || writingSinceMs === null || Date.now() - writingSinceMs < streamStallMs) return;
        ctx.log?.warn({ queuedChars }, 'live stream client not reading: dropped (it resumes by Last-Event-ID)');
        queue.length = 0;
        queuedChars = 0;
        drop();
      };
      const off = ctx.hub.subscribe((event) => {
        queue.push(event);
        queuedChars += event.data.length;
        dropIfStalled();
        if (wake) wakeSoon(wake);
      });
      stream.onAbort(() => {
        off();
        clearInterval(watchdog);
        wake?.();
      });
      // One watchdog per client instead of a timer per write: a write still waiting after
      // streamWriteTimeoutMs drops the client.
      const watchdog = setInterval(() => {
        if (writingSinceMs !== null && Date.now() - writingSinceMs >= streamWriteTimeoutMs) drop();
        else dropIfStalled();
      }, 1_000);
      watchdog.unref();
      const writeBytes = async (bytes: Uint8Array | string): Promise<void> => {
        writingSinceMs = Date.now();
        await stream.write(bytes);
        writingSinceMs = null;
      };
      /**
       * One event. Data given in pieces (the snapshot: jsonList.ts jsonPieces) is written a piece
       * at a time; JSON has no line break, so the pieces make one `data:` line.
       */
      const write = async (message: { id?: string; event: string; data: string | Iterable<string>; retry?: number }): Promise<void> => {
        const head = `${message.id !== undefined ? `id: ${message.id}\n` : ''}event: ${message.event}\ndata: `;
        const end = `\n${message.retry !== undefined ? `retry: ${message.retry}\n` : ''}\n`;
        if (typeof message.data === 'string') return writeBytes(`${head}${message.data}${end}`);
        await writeBytes(head);
        for (const piece of message.data) {
          if (stream.aborted) return;
          await writeBytes(piece);
        }
        await writeBytes(end);
      };
      // Retry after 2 s when the connection drops (EventSource reconnects by itself).
      await write({ event: 'hello', data: JSON.stringify({ lastEventId: ctx.hub.lastId }), retry: 2000 });
      const missed = lastSeen === null ? null : ctx.hub.since(lastSeen);
      let sentUpTo: number;
      if (missed === null) {
        const snapshot = snapshots.get();
        sentUpTo = snapshot.lastId;
        await write({ id: String(sentUpTo), event: 'snapshot', data: snapshot.pieces });
      } else {
        sentUpTo = lastSeen!;
        for (const e of missed) {
          if (stream.aborted) break;
          await writeBytes(sseBytes(e));
          sentUpTo = e.id;
        }
      }
      let lastPing = Date.now();
      while (!stream.aborted) {
        while (queue.length > 0 && !stream.aborted) {
          const e = queue.shift()!;
          queuedChars -= e.data.length;
          // Already in the snapshot or the replay (events that came while those were written are kept).
          if (e.id <= sentUpTo) continue;
          // Encoded once for every client (liveHub.ts).
          await writeBytes(sseBytes(e));
        }
        if (stream.aborted) break;
        let pingTimer: NodeJS.Timeout | undefined;
        await new Promise<void>((resolve) => {
          wake = resolve;
          pingTimer = setTimeout(resolve, Math.max(0, pingIntervalMs - (Date.now() - lastPing)));
        });
        clearTimeout(pingTimer);
        wake = null;
        if (Date.now() - lastPing >= pingIntervalMs) {
          lastPing = Date.now();
          await write({ event: 'ping', data: String(ctx.now()) });
        }
      }
      off();
      clearInterval(watchdog);
    });
  });

  /**
   * Switches a structure's live configuration (design §2.5). With `alertId`: the crew mark the
   * alert's action done ("Done: lowered", crew role), which acknowledges the alert too. Without:
   * a switch by hand (competent person), e.g. back to raised once the level has cleared. Stored
   * (or held while the disk refuses) before the stream announces it.
   */
  api.post('/structures/:id/configuration', requireRole('crew'), async (c) => {
    const id = idParam(c);
    const body = await jsonBody(c, configurationSwitchSchema);
    const principal = c.get('principal')!;
    if (body.alertId === undefined && !roleAllows(principal.role, 'competent-person')) {
      throw new HttpError(403, 'switching a configuration by hand needs the competent-person role; the crew mark a level\'s action done from its alert');
    }
    const by = principal.kind === 'person' ? principal.person.displayName : principalName(principal);
    const note = body.note && body.note.length > 0 ? body.note : null;
    const result = ctx.watch.switchConfiguration({ structureId: id, name: body.configuration, by, actor: principalName(principal), note, alertId: body.alertId ?? null, atMs: ctx.now() });
    if (!result.ok) throw result.error;
    const { stored } = await ctx.queue.enqueue(result.batch);
    result.announce();
    return c.json({ structure: ctx.watch.structureStateById(id), alert: result.alert, stored });
  });

  api.post('/alerts/:id/acknowledge', requireRole('crew'), async (c) => {
    const id = idParam(c);
    const body = await jsonBody(c, acknowledgeSchema);
    const principal = c.get('principal')!;
    const by = principal.kind === 'person' ? principal.person.displayName : principalName(principal);
    const note = body.note && body.note.length > 0 ? body.note : null;
    const atMs = ctx.now();
    // Every alert not yet acknowledged is open in the watch (rebuilt from the log at start), so the
    // answer does not depend on the disk: an acknowledgement made while the disk is full counts
    // at once and is stored when it can be.
    const open = ctx.watch.openAlert(id);
    if (!open) {
      const stored = await ctx.storage.alerts.byId(id);
      if (!stored) throw HttpError.notFound(`alert ${id}`);
      throw new HttpError(409, `alert ${id} was acknowledged by ${stored.acknowledgedBy ?? 'someone'}${stored.acknowledgedAtMs ? ` at ${new Date(stored.acknowledgedAtMs).toISOString()}` : ''}`);
    }
    if (open.acknowledgedAtMs !== null) {
      throw new HttpError(409, `alert ${id} was acknowledged by ${open.acknowledgedBy} at ${new Date(open.acknowledgedAtMs).toISOString()}`);
    }
    const taking = beingAcknowledged.get(id);
    if (taking !== undefined) throw new HttpError(409, `alert ${id} is being acknowledged by ${taking} just now`);
    // Stored (or held while the disk refuses) before the stream and the notifications say so; while
    // it is being stored, anybody else acknowledging it gets 409.
    beingAcknowledged.set(id, by);
    let stored = true;
    try {
      ({ stored } = await ctx.queue.enqueue(acknowledgementBatch({ alertId: id, atMs, by, note, actor: principalName(principal) })));
    } finally {
      beingAcknowledged.delete(id);
    }
    const alert = ctx.watch.acknowledged(id, by, note, atMs);
    return c.json({ alert, stored });
  });

  api.post('/alerts/acknowledge', requireRole('crew'), async (c) => {
    const body = await jsonBody(c, acknowledgeAllSchema);
    const principal = c.get('principal')!;
    const by = principal.kind === 'person' ? principal.person.displayName : principalName(principal);
    const note = body.note && body.note.length > 0 ? body.note : null;
    const subject =
      body.structureId !== undefined
        ? { words: `structure ${body.structureId}`, owns: (a: OpenAlert) => a.structureId === body.structureId, known: ctx.watch.structureStateById(body.structureId) !== null }
        : { words: `sensor "${body.sensorKey}"`, owns: (a: OpenAlert) => a.sensorKey === body.sensorKey, known: ctx.watch.sensorStateByKey(body.sensorKey!) !== null };
    // The stored rows of the asked-for alerts that are not open for this subject, read first: from
    // the choice below to marking them as being acknowledged nothing awaits, so no other
    // acknowledgement of the same alerts comes between.
    const storedRows = new Map<number, { row: StoredAlert | undefined; sensorKey: string | undefined }>();
    const unread = (open: readonly OpenAlert[]) => (body.alertIds ?? []).filter((id) => !storedRows.has(id) && !open.some((a) => a.id === id));
    let open = ctx.watch.openAlerts().filter(subject.owns);
    for (let ids = unread(open); ids.length > 0; open = ctx.watch.openAlerts().filter(subject.owns), ids = unread(open)) {
      for (const id of ids) {
        const row = await ctx.storage.alerts.byId(id);
        const sensorKey = row !== undefined && body.structureId === undefined && row.sensorId !== null ? (await ctx.storage.sensors.byId(row.sensorId))?.key : undefined;
        storedRows.set(id, { row, sensorKey });
      }
    }
    if (!subject.known && open.length === 0) throw HttpError.notFound(subject.words);

    const waiting = open.filter((a) => a.acknowledgedAtMs === null && !beingAcknowledged.has(a.id));
    let chosen = waiting;
    /** Acknowledged before this call got to them (`acknowledgedAtMs` null: being stored for someone else now). */
    const alreadyAcknowledged: Array<{ id: number; acknowledgedBy: string | null; acknowledgedAtMs: number | null }> = [];
    if (body.alertIds === undefined) {
      for (const a of open) if (a.acknowledgedAtMs === null && beingAcknowledged.has(a.id)) alreadyAcknowledged.push({ id: a.id, acknowledgedBy: beingAcknowledged.get(a.id)!, acknowledgedAtMs: null });
    } else {
      const wanted = new Set(body.alertIds);
      chosen = waiting.filter((a) => wanted.has(a.id));
      const issues: Array<{ path: string; message: string }> = [];
      body.alertIds.forEach((id, i) => {
        if (chosen.some((a) => a.id === id)) return;
        if (beingAcknowledged.has(id)) {
          alreadyAcknowledged.push({ id, acknowledgedBy: beingAcknowledged.get(id)!, acknowledgedAtMs: null });
          return;
        }
        const inMemory = open.find((a) => a.id === id);
        if (inMemory) {
          alreadyAcknowledged.push({ id, acknowledgedBy: inMemory.acknowledgedBy, acknowledgedAtMs: inMemory.acknowledgedAtMs });
          return;
        }
        // Not open any more: acknowledged (and ended) already, or not an alert of this subject at all.
        const { row: stored, sensorKey } = storedRows.get(id)!;
        const ownsStored =
          stored !== undefined &&
          (body.structureId !== undefined
            ? stored.structureId === body.structureId
            : stored.sensorId !== null && sensorKey === body.sensorKey);
        if (stored && ownsStored && stored.acknowledgedAtMs !== null) alreadyAcknowledged.push({ id, acknowledgedBy: stored.acknowledgedBy, acknowledgedAtMs: stored.acknowledgedAtMs });
        else issues.push({ path: `alertIds.${i}`, message: `alert ${id} is not an alert of ${subject.words}` });
      });
      if (issues.length > 0) throw HttpError.invalid(issues);
    }
    // Open and unacknowledged, but not on the caller's screen (raised since): left for them to see.
    const notShown = body.alertIds === undefined ? [] : waiting.filter((a) => !chosen.some((x) => x.id === a.id));

    const atMs = ctx.now();
    for (const a of chosen) beingAcknowledged.set(a.id, by);
    let stored = true;
    try {
      if (chosen.length > 0) {
        ({ stored } = await ctx.queue.enqueue(acknowledgementBatch(...chosen.map((a) => ({ alertId: a.id, atMs, by, note, actor: principalName(principal) })))));
      }
    } finally {
      for (const a of chosen) beingAcknowledged.delete(a.id);
    }
    // Stored (or held while the disk refuses, as for one alert): now the stream may say so.
    const acknowledged = chosen.map((a) => ctx.watch.acknowledged(a.id, by, note, atMs)).filter((a) => a !== null);
    return c.json({ acknowledged, alreadyAcknowledged, notShown, stored });
  });

  return api;
}
