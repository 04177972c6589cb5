/**
 * Who is asking, and may they? Every request's session cookie is resolved to a principal (a
 * person, or a steward's site link). State-changing requests made with a session must carry its
 * CSRF token in the `X-CSRF-Token` header (the cookie is also SameSite=Lax; the header is the
 * second lock). `requireRole` guards each route on the server, whatever the screens show.
 */
import type { Context, MiddlewareHandler } from 'hono';
import { getCookie, setCookie, deleteCookie } from 'hono/cookie';
import type { Accounts, Principal } from '../auth/accounts.ts';
import { roleAllows, type Role } from '../auth/roles.ts';
import { HttpError } from './httpError.ts';

export const sessionCookieName = 'hf_session';

export type AppEnv = { Variables: { principal: Principal | null } };

const stateChanging = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

export interface AccessOptions {
  accounts: Accounts;
  now: () => number;
  /** Paths (exact) that change nothing or come before a session exists: no CSRF check. */
  csrfExempt: ReadonlySet<string>;
}

export function resolvePrincipal(options: AccessOptions): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    const token = getCookie(c, sessionCookieName);
    const principal = token ? await options.accounts.principalOfSession(token, options.now()) : null;
    c.set('principal', principal);
    if (principal && stateChanging.has(c.req.method) && !options.csrfExempt.has(c.req.path)) {
      const sent = c.req.header('x-csrf-token');
      if (!sent || sent !== principal.csrfToken) throw new HttpError(403, 'missing or wrong X-CSRF-Token header');
    }
    await next();
  };
}

/**
 * Browsers' cross-site requests stopped at the door (issue 13 item 11). For every state-changing
 * request under /api (sign-in included):
 * - a body must be sent as `application/json` exactly (parameters such as charset allowed), or as
 *   one of the route's own types (`text/csv` for a register import): `text/plain;
 *   charset=application/json` is a "simple" type a page on another site may send without a
 *   preflight, so it is refused, whatever its parameters say;
 * - a browser's `Sec-Fetch-Site` must be `same-origin` (or `none`: typed by the user), and its
 *   `Origin`, when sent, must be this server's own (its Host, the proxy's X-Forwarded-Host when the
 *   proxy is trusted, or the configured public address). Clients that send neither (curl, scripts,
 *   gateways) are not browsers and cannot carry a victim's cookie across sites.
 * The CSRF token (resolvePrincipal) stays the second lock.
 */
export interface OriginOptions {
  trustProxy: boolean;
  /** Origins accepted besides the request's own host (e.g. PUBLIC_URL's), as `scheme://host[:port]`. */
  extraOrigins: readonly string[];
  /** Paths (exact) that change nothing and are public (the calculators): no origin check. */
  exempt: ReadonlySet<string>;
  /** Media types a path accepts besides application/json (exact path → types). */
  otherBodyTypes: ReadonlyMap<string, readonly string[]>;
}

export function checkRequestOrigin(options: OriginOptions): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    if (!stateChanging.has(c.req.method) || !c.req.path.startsWith('/api/')) return next();
    const type = c.req.header('content-type');
    if (type !== undefined && type.trim() !== '') {
      const media = type.split(';')[0]!.trim().toLowerCase();
      const allowed = options.otherBodyTypes.get(c.req.path) ?? [];
      if (media !== 'application/json' && !allowed.includes(media)) {
        throw new HttpError(415, `send the body as application/json${allowed.length > 0 ? ` or ${allowed.join(' or ')}` : ''} (got "${type.slice(0, 80)}")`);
      }
    }
    if (options.exempt.has(c.req.path)) return next();
    const fetchSite = c.req.header('sec-fetch-site');
    if (fetchSite !== undefined && fetchSite !== 'same-origin' && fetchSite !== 'none') {
      throw new HttpError(403, `refused: a ${fetchSite} request may not change anything here (Sec-Fetch-Site)`);
    }
    const origin = c.req.header('origin');
    if (origin !== undefined && !originIsOurs(c, origin, options)) {
      throw new HttpError(403, `refused: requests from ${origin.slice(0, 100)} may not change anything here (Origin)`);
    }
    await next();
  };
}

function originIsOurs(c: Context, origin: string, options: OriginOptions): boolean {
  if (origin === 'null') return false;
  let parsed: URL;
  try {
    parsed = new URL(origin);
  } catch {
    return false;
  }
  if (options.extraOrigins.includes(parsed.origin)) return true;
  const hosts = [c.req.header('host')];
  if (options.trustProxy) hosts.push(c.req.header('x-forwarded-host')?.split(',').at(-1)?.trim());
  return hosts.some((h) => h !== undefined && h.toLowerCase() === parsed.host.toLowerCase());
}

export function requireRole(role: Role): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    const principal = c.get('principal');
    if (!principal) throw new HttpError(401, 'sign in first');
    if (!roleAllows(principal.role, role)) throw new HttpError(403, `this needs the ${role} role`);
    await next();
  };
}

/** True when the request reached us over TLS (directly, or through a proxy we were told to trust). */
export function requestIsSecure(c: Context, trustProxy: boolean): boolean {
  if (new URL(c.req.url).protocol === 'https:') return true;
  return trustProxy && (c.req.header('x-forwarded-proto') ?? '').split(',')[0]?.trim() === 'https';
}

export function setSessionCookie(c: Context, token: string, expiresAtMs: number, secure: boolean): void {
  setCookie(c, sessionCookieName, token, {
    httpOnly: true,
    sameSite: 'Lax',
    secure,
    path: '/',
    expires: new Date(expiresAtMs),
  });
}

export function clearSessionCookie(c: Context): void {
  deleteCookie(c, sessionCookieName, { path: '/' });
}
