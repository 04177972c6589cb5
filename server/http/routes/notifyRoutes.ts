/**
 * Alert notifications over HTTP (design §4b, issue 16; README "Alert notifications"):
 * - `GET/POST /api/notify/webhooks`, `PATCH/DELETE /api/notify/webhooks/:id` (competent person):
 *   webhooks added in the app, each with its own secret (shown once, when made or renewed) and
 *   filter; the one from ALERT_WEBHOOK_URL is listed as `id: "env"`, read-only;
 * - `POST /api/notify/webhooks/:id/test` (`:id` a number or `env`): a test message;
 * - `GET/PUT /api/notify/escalation` (competent person): the escalation chain per level, and the
 *   steps taken lately;
 * - `GET /api/notify/deliveries` (competent person): the newest deliveries with every attempt;
 * - `GET/PATCH /api/me/notifications`, `POST /api/me/notifications/test` (any signed-in person):
 *   one's own e-mail address and filter;
 * - `GET /notify/ack?t=…` shows what the e-mail's acknowledge link would acknowledge, with a
 *   button; only `POST /notify/ack` (form field `t`) acknowledges, so a mail scanner that fetches
 *   the link acknowledges nothing.
 */
import { randomBytes } from 'node:crypto';
import { Hono } from 'hono';
import { z } from 'zod';
import { principalName } from '../../auth/accounts.ts';
import { checkWebhookUrl, ConfigError } from '../../config.ts';
import { maxUrlLength } from '../../engine/limits.ts';
import { escalationChainsSchema, notifyFilterSchema, type Notifier } from '../../notify/index.ts';
import { allAlerts, storedFilter } from '../../notify/filter.ts';
import type { WebhookRow } from '../../storage/notifications.ts';
import type { Storage } from '../../storage/storage.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { idParam, jsonBody } from '../validate.ts';

export interface NotifyRoutesContext {
  storage: Storage;
  notifier: Notifier;
  now: () => number;
}

const webhookUrlSchema = z
  .string({ error: 'must be the webhook address (http:// or https://)' })
  .trim()
  .max(maxUrlLength, { error: `is longer than ${maxUrlLength} characters` })
  .superRefine((value, ctx) => {
    try {
      checkWebhookUrl(value, 'the address');
    } catch (err) {
      ctx.addIssue({ code: 'custom', message: err instanceof ConfigError ? err.message : 'is not a URL' });
    }
  });
const nameSchema = z.string({ error: 'must be a name' }).trim().min(1, { error: 'must not be empty' }).max(80, { error: 'is longer than 80 characters' });

const webhookCreateSchema = z.strictObject({ name: nameSchema, url: webhookUrlSchema, filter: notifyFilterSchema.optional() });
const webhookUpdateSchema = z.strictObject({
  name: nameSchema.optional(),
  url: webhookUrlSchema.optional(),
  filter: notifyFilterSchema.optional(),
  enabled: z.boolean({ error: 'must be true or false' }).optional(),
  /** true: a new secret is made and shown once; the old one stops working at once. */
  renewSecret: z.literal(true, { error: 'must be true (or left out)' }).optional(),
});

const emailSchema = z
  .string({ error: 'must be an e-mail address' })
  .trim()
  .max(254, { error: 'is longer than 254 characters' })
  .regex(/^[^\s@<>(),;:"\\]+@[^\s@<>(),;:"\\]+\.[^\s@<>(),;:"\\]+$/, { error: 'must be an e-mail address such as name@site.example' });
const personSettingsSchema = z.strictObject({ email: z.union([emailSchema, z.null()]).optional(), filter: notifyFilterSchema.optional() });

function newSecret(): string {
  return `whsec_${randomBytes(24).toString('base64url')}`;
}

function shownWebhook(row: WebhookRow) {
  return { id: row.id, name: row.name, url: row.url, filter: storedFilter(row.filterJson), enabled: row.enabled, source: 'app' as const, createdBy: row.createdBy, createdAtMs: row.createdAtMs, updatedAtMs: row.updatedAtMs };
}

export function notifyRoutes(ctx: NotifyRoutesContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  const { storage, notifier } = ctx;

  // ---------- who can be named in an escalation step ----------

  /**
   * The people an escalation step can name, for the competent person who sets the chains (the
   * full list of people, with usernames and sign-in state, stays the administrator's): id, name
   * and role of everyone not disabled.
   */
  api.get('/notify/people', requireRole('competent-person'), async (c) => {
    const people = await storage.people.activeByDisplayName();
    return c.json({ people: people.map(({ id, displayName, role }) => ({ id, displayName, role })) });
  });

  // ---------- webhooks ----------

  api.get('/notify/webhooks', requireRole('competent-person'), async (c) => {
    const rows = (await storage.notifications.webhooks()).map(shownWebhook);
    const env = notifier.envWebhookUrl ? [{ id: 'env', name: 'ALERT_WEBHOOK_URL', url: notifier.envWebhookUrl, filter: allAlerts, enabled: true, source: 'environment' as const }] : [];
    return c.json({ webhooks: [...env, ...rows] });
  });

  api.post('/notify/webhooks', requireRole('competent-person'), async (c) => {
    const body = await jsonBody(c, webhookCreateSchema);
    const atMs = ctx.now();
    const actor = principalName(c.get('principal'));
    const secret = newSecret();
    const row = await storage.transaction(async () => {
      const made = await storage.notifications.insertWebhook({ name: body.name, url: body.url, secret, filterJson: body.filter ?? allAlerts, enabled: true, createdBy: actor, createdAtMs: atMs, updatedAtMs: atMs });
      await storage.audit.record({ actor, entity: 'notify', entityId: `webhook:${made.id}`, action: 'create', after: shownWebhook(made) }, atMs);
      return made;
    });
    return c.json({ webhook: shownWebhook(row), secret }, 201);
  });

  api.patch('/notify/webhooks/:id', requireRole('competent-person'), async (c) => {
    const id = idParam(c);
    const body = await jsonBody(c, webhookUpdateSchema);
    const before = await storage.notifications.webhook(id);
    if (!before) throw HttpError.notFound(`webhook ${id}`);
    const atMs = ctx.now();
    const actor = principalName(c.get('principal'));
    const secret = body.renewSecret ? newSecret() : null;
    const row = await storage.transaction(async () => {
      const after = await storage.notifications.updateWebhook(id, {
          ...(body.name !== undefined ? { name: body.name } : {}),
          ...(body.url !== undefined ? { url: body.url } : {}),
          ...(body.filter !== undefined ? { filterJson: body.filter } : {}),
          ...(body.enabled !== undefined ? { enabled: body.enabled } : {}),
          ...(secret !== null ? { secret } : {}),
          updatedAtMs: atMs,
        });
      await storage.audit.record({ actor, entity: 'notify', entityId: `webhook:${id}`, action: secret ? 'update (new secret)' : 'update', before: shownWebhook(before), after: shownWebhook(after) }, atMs);
      return after;
    });
    return c.json(secret ? { webhook: shownWebhook(row), secret } : { webhook: shownWebhook(row) });
  });

  api.delete('/notify/webhooks/:id', requireRole('competent-person'), async (c) => {
    const id = idParam(c);
    const before = await storage.notifications.webhook(id);
    if (!before) throw HttpError.notFound(`webhook ${id}`);
    const atMs = ctx.now();
    await storage.transaction(async () => {
      await storage.notifications.deleteWebhook(id);
      await storage.audit.record({ actor: principalName(c.get('principal')), entity: 'notify', entityId: `webhook:${id}`, action: 'delete', before: shownWebhook(before) }, atMs);
    });
    return c.body(null, 204);
  });

  api.post('/notify/webhooks/:id/test', requireRole('competent-person'), async (c) => {
    const raw = c.req.param('id');
    const target = raw === 'env' ? 'webhook:env' : `webhook:${idParam(c)}`;
    const result = await notifier.testWebhook(target);
    if ('error' in result) throw new HttpError(raw === 'env' || result.error.startsWith('no such') ? 404 : 409, result.error);
    return c.json(result, 202);
  });

  // ---------- escalation ----------

  api.get('/notify/escalation', requireRole('competent-person'), async (c) => {
    const chains = (await storage.notifications.chains()).map((r) => ({ level: r.level, steps: r.stepsJson, updatedBy: r.updatedBy, updatedAtMs: r.updatedAtMs }));
    const recent = await storage.notifications.recentSteps(100);
    return c.json({ chains, recent: recent.map((r) => ({ alertId: r.alertId, step: r.step + 1, atMs: r.atMs, target: r.target, reached: r.reached })) });
  });

  api.put('/notify/escalation', requireRole('competent-person'), async (c) => {
    const body = await jsonBody(c, escalationChainsSchema);
    const atMs = ctx.now();
    const actor = principalName(c.get('principal'));
    const before = await storage.notifications.chains();
    await storage.transaction(async () => {
      await storage.notifications.replaceChains(body.chains, actor, atMs);
      await storage.audit.record({ actor, entity: 'notify', entityId: 'escalation', action: 'update', before: before.map((r) => ({ level: r.level, steps: r.stepsJson })), after: body.chains }, atMs);
    });
    return c.json({ chains: body.chains.filter((ch) => ch.steps.length > 0) });
  });

  // ---------- deliveries ----------

  api.get('/notify/deliveries', requireRole('competent-person'), async (c) => {
    const limitText = c.req.query('limit');
    const limit = limitText === undefined ? 100 : Number(limitText);
    if (!Number.isInteger(limit) || limit < 1 || limit > 1000) throw HttpError.invalid([{ path: 'limit', message: 'must be a whole number from 1 to 1000' }]);
    const status = c.req.query('status');
    if (status !== undefined && !['pending', 'delivered', 'failed'].includes(status)) throw HttpError.invalid([{ path: 'status', message: 'must be pending, delivered or failed' }]);
    const alertText = c.req.query('alertId');
    const alertId = alertText === undefined ? undefined : Number(alertText);
    if (alertId !== undefined && (!Number.isInteger(alertId) || alertId < 1)) throw HttpError.invalid([{ path: 'alertId', message: 'must be an alert id (a whole number above 0)' }]);
    return c.json({ ...(await notifier.health()), deliveries: await notifier.outbox.recent(limit, { ...(status ? { status } : {}), ...(alertId !== undefined ? { alertId } : {}) }) });
  });

  // ---------- one's own settings ----------

  const me = principalOf;
  api.get('/me/notifications', requireRole('viewer'), async (c) => {
    const person = me(c);
    const row = await storage.notifications.personSettings(person.id);
    return c.json({ email: row?.email ?? null, filter: row ? storedFilter(row.filterJson) : allAlerts, emailAvailable: notifier.emailConfigured });
  });

  api.patch('/me/notifications', requireRole('viewer'), async (c) => {
    const person = me(c);
    const body = await jsonBody(c, personSettingsSchema);
    const atMs = ctx.now();
    const row = await storage.notifications.personSettings(person.id);
    const email = body.email !== undefined ? body.email : (row?.email ?? null);
    const filter = body.filter ?? (row ? storedFilter(row.filterJson) : allAlerts);
    await storage.notifications.savePersonSettings(person.id, email, filter, atMs);
    return c.json({ email, filter, emailAvailable: notifier.emailConfigured });
  });

  api.post('/me/notifications/test', requireRole('viewer'), async (c) => {
    const person = me(c);
    const result = await notifier.testPerson(person.id);
    if ('error' in result) throw new HttpError(409, result.error);
    return c.json(result, 202);
  });

  return api;
}

function principalOf(c: { get(key: 'principal'): unknown }): { id: number; displayName: string } {
  const p = c.get('principal') as { kind: string; person?: { id: number; displayName: string } } | null;
  if (!p || p.kind !== 'person' || !p.person) throw new HttpError(403, 'notification settings belong to a person: sign in with your own account');
  return p.person;
}

// ---------- the acknowledge link's page ----------

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex"><title>${esc(title)}</title>
<style>body{font-family:system-ui,sans-serif;max-width:32rem;margin:2rem auto;padding:0 1rem;line-height:1.4}button{font-size:1.2rem;padding:.8rem 1.4rem;min-height:48px}.action{font-size:1.2rem;font-weight:bold}</style></head><body>${body}</body></html>`;
}

function esc(text: string): string {
  return text.replace(/[&<>"']/g, (ch) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[ch]!);
}

/** Mounted at /notify (outside /api: the confirm page's form posts a plain form). */
export function acknowledgeLinkRoutes(ctx: NotifyRoutesContext): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  const tokenOf = (t: unknown): string => (typeof t === 'string' ? t.slice(0, 400) : '');

  app.get('/ack', async (c) => {
    c.header('Cache-Control', 'no-store');
    c.header('Referrer-Policy', 'no-referrer');
    const token = tokenOf(c.req.query('t'));
    const result = await ctx.notifier.acknowledgeByLink(token, false);
    if (result.status !== 'confirm') {
      const message = 'message' in result ? result.message : '';
      return c.html(page('Acknowledge', `<h1>Cannot acknowledge</h1><p>${esc(message)}</p>`), result.status === 200 ? 409 : result.status);
    }
    const a = result.alert;
    return c.html(
      page(
        'Acknowledge the alert',
        `<p class="action">ACTION: ${esc(a.actionText || 'follow the wind management plan')}</p>
<p><strong>${esc(a.subject)}</strong>: ${esc(a.label)}${a.gustMps !== null ? `, gust ${a.gustMps.toFixed(1)} m/s` : ''} (alert ${a.id}).</p>
<form method="post" action="/notify/ack"><input type="hidden" name="t" value="${esc(token)}"><button type="submit">Acknowledge</button></form>
<p>Opening this page acknowledged nothing: only the button does.</p>`,
      ),
    );
  });

  app.post('/ack', async (c) => {
    c.header('Cache-Control', 'no-store');
    const type = (c.req.header('content-type') ?? '').split(';')[0]!.trim().toLowerCase();
    let token = '';
    if (type === 'application/x-www-form-urlencoded' || type === 'multipart/form-data') token = tokenOf((await c.req.parseBody()).t);
    else if (type === 'application/json') token = tokenOf(((await c.req.json().catch(() => ({}))) as { t?: unknown }).t);
    else throw new HttpError(415, 'send the form (application/x-www-form-urlencoded) with the field t');
    const result = await ctx.notifier.acknowledgeByLink(token, true);
    const wantsJson = type === 'application/json';
    if (result.status === 200) {
      if (wantsJson) return c.json({ alert: result.alert, acknowledgedBy: result.by });
      return c.html(page('Acknowledged', `<h1>Acknowledged</h1><p>${esc(result.alert.subject)}: ${esc(result.alert.label)} — acknowledged by ${esc(result.by)}.</p><p class="action">ACTION: ${esc(result.alert.actionText || 'follow the wind management plan')}</p>`));
    }
    const status = result.status === 'confirm' ? 500 : result.status;
    const message = 'message' in result ? result.message : 'unexpected';
    if (wantsJson) return c.json({ error: message }, status);
    return c.html(page('Cannot acknowledge', `<h1>Cannot acknowledge</h1><p>${esc(message)}</p>`), status);
  });
  return app;
}
