/**
 * Watching during the event: the live snapshot, the live stream (Server-Sent Events, resumable
 * with Last-Event-ID), and acknowledging alerts.
 *
 * Stream events (each `data` is JSON):
 * - `snapshot`: everything (site, air, sensors, structures worst first, open alerts) — sent first
 *   on a new connection, and on a resumed one whose missed events are no longer kept;
 * - `wind`: one sensor's wind (at most once a second per sensor);
 * - `structure`: one structure's whole state when its level or data state changes;
 * - `structures`: `{atMs, updates: [...]}` once a second with the wind-dependent part of every
 *   structure whose shown state moved (gust by ≥ 0.05 m/s, level, data state, governing sensor);
 * - `register`: the register changed (a structure, sensor or site setting): fetch /api/live again;
 * - `health`: storage or broker state changed (`{storageOk, storageError, brokerOk, ...}`);
 * - `alert`: a new alert, or an unacknowledged one signalled again (`resignal: true`);
 * - `alert-update`: an alert acknowledged or cleared;
 * - `ping`: every 15 s, so proxies keep the connection and phones notice a dead one.
 */
import { Hono } from 'hono';
import { streamSSE } from 'hono/streaming';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { alertsTable } from '../../../db/schema.ts';
import { principalName } from '../../auth/accounts.ts';
import { emptyWriteBatch } from '../../storage/writeBatch.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { idParam, jsonBody } from '../validate.ts';
import type { ApiContext } from './apiContext.ts';

const acknowledgeSchema = z.strictObject({
  note: z.string().trim().max(2000).optional(),
});

export const pingIntervalMs = 15_000;

export function liveRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();

  api.get('/live', requireRole('viewer'), (c) => c.json(ctx.watch.snapshot()));

  api.get('/stream', requireRole('viewer'), (c) => {
    const header = c.req.header('last-event-id') ?? c.req.query('lastEventId');
    const lastSeen = header !== undefined && /^[0-9]{1,15}$/.test(header) ? Number(header) : null;
    return streamSSE(c, async (stream) => {
      const queue: Array<{ id: number; kind: string; data: string }> = [];
      let wake: (() => void) | null = null;
      const off = ctx.hub.subscribe((event) => {
        queue.push(event);
        wake?.();
      });
      stream.onAbort(() => {
        off();
        wake?.();
      });
      // Retry after 2 s when the connection drops (EventSource reconnects by itself).
      await stream.writeSSE({ event: 'hello', data: JSON.stringify({ lastEventId: ctx.hub.lastId }), retry: 2000 });
      const missed = lastSeen === null ? null : ctx.hub.since(lastSeen);
      if (missed === null) {
        await stream.writeSSE({ id: String(ctx.hub.lastId), event: 'snapshot', data: JSON.stringify(ctx.watch.snapshot()) });
        // Events published before the snapshot are already in it.
        queue.length = 0;
      } else {
        for (const e of missed) await stream.writeSSE({ id: String(e.id), event: e.kind, data: e.data });
        queue.length = 0;
      }
      let lastPing = Date.now();
      while (!stream.aborted) {
        while (queue.length > 0 && !stream.aborted) {
          const e = queue.shift()!;
          await stream.writeSSE({ id: String(e.id), event: e.kind, data: e.data });
        }
        if (stream.aborted) break;
        await new Promise<void>((resolve) => {
          wake = resolve;
          setTimeout(resolve, Math.max(0, pingIntervalMs - (Date.now() - lastPing)));
        });
        wake = null;
        if (Date.now() - lastPing >= pingIntervalMs) {
          lastPing = Date.now();
          await stream.writeSSE({ event: 'ping', data: String(ctx.now()) });
        }
      }
      off();
    });
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
      const stored = ctx.db.select().from(alertsTable).where(eq(alertsTable.id, id)).get();
      if (!stored) throw HttpError.notFound(`alert ${id}`);
      throw new HttpError(409, `alert ${id} was acknowledged by ${stored.acknowledgedBy ?? 'someone'}${stored.acknowledgedAtMs ? ` at ${new Date(stored.acknowledgedAtMs).toISOString()}` : ''}`);
    }
    if (open.acknowledgedAtMs !== null) {
      throw new HttpError(409, `alert ${id} was acknowledged by ${open.acknowledgedBy} at ${new Date(open.acknowledgedAtMs).toISOString()}`);
    }
    const alert = ctx.watch.acknowledged(id, by, note, atMs)!;
    const { stored } = await ctx.queue.enqueue({ ...emptyWriteBatch(), acknowledgements: [{ alertId: id, atMs, by, note, actor: principalName(principal) }] });
    return c.json({ alert, stored });
  });

  return api;
}
