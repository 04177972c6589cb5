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
    const principal = token ? options.accounts.principalOfSession(token, options.now()) : null;
    c.set('principal', principal);
    if (principal && stateChanging.has(c.req.method) && !options.csrfExempt.has(c.req.path)) {
      const sent = c.req.header('x-csrf-token');
      if (!sent || sent !== principal.csrfToken) throw new HttpError(403, 'missing or wrong X-CSRF-Token header');
    }
    await next();
  };
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
