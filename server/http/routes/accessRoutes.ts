/**
 * Sign-in, sign-out, first-administrator setup, people (administrators) and site links
 * (competent person). Mounted at /api; the site-link opener at /link/:token.
 */
import { Hono } from 'hono';
import { z } from 'zod';
import { personInputSchema, personUpdateSchema, principalName, type Accounts } from '../../auth/accounts.ts';
import type { SignInLimiter } from '../../auth/signInLimiter.ts';
import { maxNameLength, maxPasswordLength } from '../../engine/limits.ts';
import { clearSessionCookie, requestIsSecure, requireRole, setSessionCookie, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import { idParam, jsonBody, jsonPatchBody } from '../validate.ts';

export interface AccessRouteDeps {
  accounts: Accounts;
  /** Failures per username (5 in 15 minutes). */
  limiter: SignInLimiter;
  /** Failures per address (more: one router may carry a whole crew). */
  addressLimiter: SignInLimiter;
  now: () => number;
  trustProxy: boolean;
  /** Trusted proxies appending to X-Forwarded-For (config.proxyHops); default 1 when trustProxy. */
  proxyHops?: number;
  /** PUBLIC_URL as an origin: site links are made with it; null takes the request's own address. */
  publicUrl?: string | null;
}

/** The address site links are made with, where it came from, and what to warn about. */
export interface LinkAddress {
  origin: string;
  source: 'PUBLIC_URL' | 'request';
  /** Set when the address came from the request: phones elsewhere may not reach it. */
  warning: string | null;
}

const loopbackHost = /^(localhost|127(\.\d{1,3}){3}|\[::1\])$/i;

/**
 * PUBLIC_URL when configured; otherwise the address this request came in on (behind a trusted
 * proxy, its X-Forwarded-Proto and X-Forwarded-Host), with a warning.
 */
export function linkAddress(c: { req: { url: string; header(name: string): string | undefined } }, publicUrl: string | null | undefined, trustProxy: boolean): LinkAddress {
  if (publicUrl) return { origin: publicUrl, source: 'PUBLIC_URL', warning: null };
  let url = new URL(c.req.url);
  if (trustProxy) {
    const proto = (c.req.header('x-forwarded-proto') ?? '').split(',')[0]!.trim();
    const host = (c.req.header('x-forwarded-host') ?? '').split(',')[0]!.trim();
    try {
      // Built afresh: the URL host setter would keep our own port when the forwarded host has none.
      url = new URL(`${proto === 'http' || proto === 'https' ? `${proto}:` : url.protocol}//${host && /^[A-Za-z0-9.:[\]-]+$/.test(host) ? host : url.host}`);
    } catch {
      // A forwarded host that is not a host: keep the request's own address.
    }
  }
  const origin = url.origin;
  const warning = loopbackHost.test(url.hostname)
    ? `PUBLIC_URL is not set, so links use ${origin}: this computer's own address. No phone can open it. Open this screen at the address phones use, or set PUBLIC_URL (README, Configuration).`
    : `PUBLIC_URL is not set, so links use ${origin}, the address this browser reached the server at. Phones on another network (mobile data, another Wi-Fi) may not reach it. Set PUBLIC_URL to an address every steward's phone can reach (README, Configuration).`;
  return { origin, source: 'request', warning };
}

const signInSchema = z.strictObject({ username: z.string().min(1).max(64), password: z.string().min(1).max(maxPasswordLength) });
const setupSchema = z.strictObject({
  code: z.string().min(1).max(100),
  username: personInputSchema.shape.username,
  displayName: personInputSchema.shape.displayName,
  password: personInputSchema.shape.password,
});
const siteLinkSchema = z.strictObject({
  label: z.string().trim().min(1, 'label must not be empty').max(maxNameLength),
  /** How long the link works, hours (at most 31 days: a festival and its build and break). */
  validHours: z.number().gt(0).max(31 * 24).default(72),
});

/**
 * The client's address for the sign-in limit. Behind `proxyHops` trusted proxies it is the
 * X-Forwarded-For entry the outermost of them appended (the n-th from the right): the entries to
 * its left are whatever the client sent and would let it pick its own address (issue 13 item 6).
 * With fewer entries than trusted proxies the request did not come through them: the socket's
 * address is used.
 */
export function clientAddress(c: { req: { header(name: string): string | undefined } }, proxyHops: number, fallback: string): string {
  if (proxyHops > 0) {
    const entries = (c.req.header('x-forwarded-for') ?? '').split(',').map((e) => e.trim()).filter((e) => e.length > 0);
    if (entries.length >= proxyHops) return entries[entries.length - proxyHops]!;
  }
  return fallback;
}

export function accessRoutes(deps: AccessRouteDeps): Hono<AppEnv> {
  const { accounts, limiter, now } = deps;
  const api = new Hono<AppEnv>();

  api.get('/session', async (c) => {
    const p = c.get('principal');
    if (!p) return c.json({ signedIn: false, setupPending: await accounts.setupPending() });
    return c.json({
      signedIn: true,
      kind: p.kind,
      name: principalName(p),
      role: p.role,
      person: p.kind === 'person' ? p.person : null,
      csrfToken: p.csrfToken,
    });
  });

  api.post('/session', async (c) => {
    const input = await jsonBody(c, signInSchema);
    const remote = (c.env as { incoming?: { socket?: { remoteAddress?: string } } } | undefined)?.incoming?.socket?.remoteAddress ?? 'local';
    const userKeys = [`user:${input.username.toLowerCase()}`];
    const addressKeys = [`addr:${clientAddress(c, deps.proxyHops ?? (deps.trustProxy ? 1 : 0), remote)}`];
    const waitMs = Math.max(limiter.retryAfterMs(userKeys, now()), deps.addressLimiter.retryAfterMs(addressKeys, now()));
    if (waitMs > 0) {
      c.header('Retry-After', String(Math.ceil(waitMs / 1000)));
      throw new HttpError(429, `too many failed sign-ins; try again in ${Math.ceil(waitMs / 60_000)} min`);
    }
    const undoUser = limiter.begin(userKeys, now());
    const undoAddress = deps.addressLimiter.begin(addressKeys, now());
    const person = await accounts.checkPassword(input.username, input.password);
    if (!person) throw new HttpError(401, 'wrong username or password');
    undoUser();
    undoAddress();
    limiter.succeed(userKeys[0]!);
    const session = await accounts.openSession({ personId: person.id }, now());
    setSessionCookie(c, session.token, session.expiresAtMs, requestIsSecure(c, deps.trustProxy));
    return c.json({ signedIn: true, person, role: person.role, csrfToken: session.csrfToken, expiresAtMs: session.expiresAtMs });
  });

  api.delete('/session', async (c) => {
    const p = c.get('principal');
    if (p) await accounts.closeSession(p.sessionTokenHash);
    clearSessionCookie(c);
    return c.json({ signedIn: false });
  });

  api.post('/session/everywhere', requireRole('viewer'), async (c) => {
    const p = c.get('principal')!;
    if (p.kind !== 'person') throw new HttpError(403, 'a site link has no other sessions');
    const closed = await accounts.closeAllSessionsOf(p.person.id);
    clearSessionCookie(c);
    return c.json({ signedIn: false, closedSessions: closed });
  });

  api.get('/setup', async (c) => c.json({ setupPending: await accounts.setupPending() }));
  api.post('/setup', async (c) => {
    const input = await jsonBody(c, setupSchema);
    const person = await accounts.completeSetup(input.code, input, now());
    return c.json({ person }, 201);
  });

  api.get('/people', requireRole('admin'), async (c) => c.json({ people: await accounts.listPeople() }));
  api.post('/people', requireRole('admin'), async (c) => {
    const input = await jsonBody(c, personInputSchema);
    return c.json({ person: await accounts.createPerson(input, principalName(c.get('principal')), now()) }, 201);
  });
  api.patch('/people/:id', requireRole('admin'), async (c) => {
    const patch = await jsonPatchBody(c, personUpdateSchema);
    return c.json({ person: await accounts.updatePerson(idParam(c), patch, principalName(c.get('principal')), now()) });
  });

  api.get('/site-links', requireRole('competent-person'), async (c) => c.json({ siteLinks: await accounts.listSiteLinks(), linkAddress: linkAddress(c, deps.publicUrl, deps.trustProxy) }));
  api.post('/site-links', requireRole('competent-person'), async (c) => {
    const input = await jsonBody(c, siteLinkSchema);
    const link = await accounts.createSiteLink(input.label, input.validHours * 3600_000, principalName(c.get('principal')), now());
    const address = linkAddress(c, deps.publicUrl, deps.trustProxy);
    return c.json({ id: link.id, label: input.label, expiresAtMs: link.expiresAtMs, url: `${address.origin}/link/${link.token}`, linkAddress: address }, 201);
  });
  api.delete('/site-links/:id', requireRole('competent-person'), async (c) => {
    await accounts.revokeSiteLink(idParam(c), principalName(c.get('principal')), now());
    return c.json({ revoked: true });
  });

  return api;
}

/** GET /link/:token — opens a read-only session for a steward and goes to the live board. */
export function siteLinkOpener(deps: AccessRouteDeps): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  app.get('/:token', async (c) => {
    const link = await deps.accounts.liveSiteLink(c.req.param('token'), deps.now());
    if (!link) return c.text('This site link is not valid: it may have expired or been withdrawn. Ask the site office for a new one.', 404);
    const lifetime = Math.max(0, link.expiresAtMs - deps.now());
    const session = await deps.accounts.openSession({ siteLinkId: link.id }, deps.now(), lifetime);
    setSessionCookie(c, session.token, session.expiresAtMs, requestIsSecure(c, deps.trustProxy));
    c.header('Referrer-Policy', 'no-referrer');
    return c.redirect('/', 303);
  });
  return app;
}
