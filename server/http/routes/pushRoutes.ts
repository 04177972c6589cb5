/**
 * Web Push over HTTP (design §4b, issue 16; README "Alert notifications"):
 * - `GET /api/push/key` (public): the server's VAPID public key, for PushManager.subscribe's
 *   `applicationServerKey`, and whether push works on this server;
 * - `GET /api/me/push-subscriptions`, `POST` (the browser's PushSubscription and a label; the same
 *   endpoint again renews it), `PATCH /:id` (label), `DELETE /:id`, `POST /:id/test` (a test push):
 *   a person's own devices (any signed-in person; a site link has none);
 * - `POST /api/push/action` (`{"t": <token>}`): a notification's button, posted by the service
 *   worker without the app open. The token authenticates (signed, single use, expiring); no
 *   session or CSRF token is needed, so the worker sends no cookie. 200 done; 400 not a token; 403
 *   a forged one or a person who can no longer act; 409 used already, or the alert already
 *   acknowledged / its action done; 410 expired.
 */
import { Hono } from 'hono';
import { pushLabelSchema, pushSubscribeSchema, shownSubscription, type Notifier } from '../../notify/index.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { idParam, jsonBody } from '../validate.ts';

export interface PushRoutesContext {
  notifier: Notifier;
  now: () => number;
}

function personOf(c: { get(key: 'principal'): unknown }): { id: number; displayName: string } {
  const p = c.get('principal') as { kind: string; person?: { id: number; displayName: string } } | null;
  if (!p || p.kind !== 'person' || !p.person) throw new HttpError(403, 'push notifications belong to a person: sign in with your own account');
  return p.person;
}

export function pushRoutes(ctx: PushRoutesContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  const push = ctx.notifier.push;

  api.get('/push/key', (c) => {
    c.header('Cache-Control', 'no-cache');
    return c.json({ publicKey: push.keys?.publicKey ?? null, enabled: push.channel !== null, problem: push.problem });
  });

  api.get('/me/push-subscriptions', requireRole('viewer'), async (c) => {
    const person = personOf(c);
    return c.json({ subscriptions: (await push.subscriptions.ofPerson(person.id)).map(shownSubscription), enabled: push.channel !== null, publicKey: push.keys?.publicKey ?? null });
  });

  api.post('/me/push-subscriptions', requireRole('viewer'), async (c) => {
    const person = personOf(c);
    if (!push.channel) throw new HttpError(409, `Web Push is off on this server: ${push.problem ?? 'no key'}`);
    const body = await jsonBody(c, pushSubscribeSchema);
    const { row, created } = await push.subscriptions.save(person.id, body, c.req.header('user-agent') ?? null, ctx.now());
    return c.json({ subscription: shownSubscription(row) }, created ? 201 : 200);
  });

  api.patch('/me/push-subscriptions/:id', requireRole('viewer'), async (c) => {
    const person = personOf(c);
    const id = idParam(c);
    const body = await jsonBody(c, pushLabelSchema);
    const row = await push.subscriptions.relabel(person.id, id, body.label, ctx.now());
    if (!row) throw HttpError.notFound(`push subscription ${id}`);
    return c.json({ subscription: shownSubscription(row) });
  });

  api.delete('/me/push-subscriptions/:id', requireRole('viewer'), async (c) => {
    const person = personOf(c);
    const id = idParam(c);
    if (!(await push.subscriptions.remove(person.id, id))) throw HttpError.notFound(`push subscription ${id}`);
    return c.body(null, 204);
  });

  api.post('/me/push-subscriptions/:id/test', requireRole('viewer'), async (c) => {
    const person = personOf(c);
    const id = idParam(c);
    const result = await ctx.notifier.testPush(person.id, id, person.displayName);
    if ('error' in result) throw new HttpError(result.status, result.error);
    return c.json(result, 202);
  });

  api.post('/push/action', async (c) => {
    c.header('Cache-Control', 'no-store');
    let token = '';
    try {
      const body = (await c.req.json()) as { t?: unknown };
      token = typeof body?.t === 'string' ? body.t.slice(0, 400) : '';
    } catch {
      token = '';
    }
    if (token === '') return c.json({ error: 'send {"t": "<the notification button\'s token>"}', issues: [{ path: 't', message: 'must be the token from the notification' }] }, 400);
    const answer = await push.act(token);
    if (answer.status === 200) return c.json({ action: answer.action, message: answer.message, by: answer.by, alert: answer.alert });
    return c.json({ error: answer.message }, answer.status);
  });

  return api;
}
