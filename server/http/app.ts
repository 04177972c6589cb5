/**
 * The HTTP application: every route under /api, the built web app as static files, one error
 * path. Created by the composition root (server/main.ts) with the services it needs; tests build
 * it in-process and call `app.request(...)`.
 */
import fs from 'node:fs';
import path from 'node:path';
import { serveStatic } from '@hono/node-server/serve-static';
import { Hono } from 'hono';
import { bodyLimit } from 'hono/body-limit';
import { secureHeaders } from 'hono/secure-headers';
import { Conflict, DomainError, Invalid, NotFound, Refused } from '../domainErrors.ts';
import { classifyStorageError, storageErrorWords, type StorageErrorKind } from '../storage/errors.ts';
import { HttpError } from './httpError.ts';
import { assessRoute } from './assess.ts';
import { chanceRoute } from './chance.ts';
import { checkRequestOrigin, resolvePrincipal, type AccessOptions, type AppEnv, type OriginOptions } from './access.ts';
import type { Logger } from '../log.ts';

export interface HealthSource {
  /** The health report; `ok` false answers 503 so probes notice. */
  health(): Promise<{ ok: boolean } & Record<string, unknown>>;
}

export interface AppServices {
  health: HealthSource;
  log: Logger;
  access: AccessOptions;
  /** Cross-site requests refused (content type, Sec-Fetch-Site, Origin); see checkRequestOrigin. */
  origin: OriginOptions;
  /** Route groups and where they are mounted (sensors, structures, log...). */
  routes?: ReadonlyArray<{ path: string; app: Hono<AppEnv> }>;
  /** Serves the built web app when given. */
  staticRoot?: string | null;
}

/** Largest request body accepted (an import of a whole register fits comfortably). */
export const maxBodyBytes = 2 * 1024 * 1024;

export function createApp(services: AppServices): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  app.use(
    '*',
    secureHeaders({
      contentSecurityPolicy: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:'],
        connectSrc: ["'self'"],
        objectSrc: ["'none'"],
        frameAncestors: ["'none'"],
        baseUri: ["'self'"],
      },
    }),
  );
  app.use(
    '/api/*',
    bodyLimit({
      maxSize: maxBodyBytes,
      onError: () => {
        throw new HttpError(413, `request body larger than ${maxBodyBytes} bytes`);
      },
    }),
  );

  app.use('*', checkRequestOrigin(services.origin));
  app.use('*', resolvePrincipal(services.access));

  app.get('/api/health', async (c) => {
    const report = await services.health.health();
    return c.json(report, report.ok ? 200 : 503);
  });
  app.route('/api/assess', assessRoute);
  app.route('/api/chance', chanceRoute);
  for (const group of services.routes ?? []) app.route(group.path, group.app);

  app.all('/api/*', (c) => c.json({ error: 'not found' }, 404));
  if (services.staticRoot && fs.existsSync(path.join(services.staticRoot, 'index.html'))) {
    const root = path.relative(process.cwd(), services.staticRoot) || '.';
    app.use('/assets/*', async (c, next) => {
      await next();
      // Built assets carry a content hash in their names: cache them for a year.
      if (c.res.status === 200) c.header('Cache-Control', 'public, max-age=31536000, immutable');
    });
    app.use('*', serveStatic({ root }));
    // Every other path is a screen of the single-page app.
    app.get('*', serveStatic({ root, path: 'index.html' }));
  }
  app.notFound((c) => c.json({ error: 'not found' }, 404));
  app.onError((err, c) => {
    const domain = err instanceof DomainError ? domainErrorResponse(err) : null;
    if (domain) return c.json(domain.body, domain.status);
    if (err instanceof HttpError) {
      return c.json(err.issues ? { error: err.message, issues: err.issues } : { error: err.message }, err.status);
    }
    if (err instanceof SyntaxError) {
      return c.json({ error: 'invalid input', issues: [{ path: '', message: 'body is not valid JSON' }] }, 400);
    }
    // A database error, by kind (storage/errors.ts): a duplicate or a broken rule is the caller's
    // conflict; a disk that is full, read-only, failing or locked, or a damaged file, is the
    // server's state, answered 503 in words (never the driver's text or the SQL) and logged.
    const stored = classifyStorageError(err);
    if (stored) {
      const status = storageErrorStatus[stored];
      if (status === 503) services.log.error({ err: err instanceof Error ? err.message : String(err), kind: stored, path: c.req.path }, 'request failed: the database cannot serve it');
      return c.json({ error: storageErrorWords[stored] }, status);
    }
    // Anything else is our fault: log it, tell the caller nothing about the inside.
    services.log.error({ err: err instanceof Error ? { message: err.message, stack: err.stack } : String(err), path: c.req.path }, 'request failed');
    return c.json({ error: 'internal error' }, 500);
  });
  return app;
}

/** The HTTP status of each kind of database error: mapped here once. */
export const storageErrorStatus: Record<StorageErrorKind, 409 | 503> = {
  unique: 409,
  constraint: 409,
  'disk-full': 503,
  'read-only': 503,
  io: 503,
  busy: 503,
  corrupt: 503,
};

/**
 * The one mapping of domain errors (server/domainErrors.ts) to HTTP: Invalid 400 with every field
 * issue, Refused 403, NotFound 404, Conflict 409; the body `{error, issues?}` as every route answers.
 */
export function domainErrorResponse(err: DomainError): { status: 400 | 403 | 404 | 409; body: { error: string; issues?: Invalid['issues'] } } | null {
  if (err instanceof Invalid) return { status: 400, body: { error: err.message, issues: err.issues } };
  if (err instanceof Refused) return { status: 403, body: { error: err.message } };
  if (err instanceof NotFound) return { status: 404, body: { error: err.message } };
  if (err instanceof Conflict) return { status: 409, body: { error: err.message } };
  // A DomainError class not mapped here is a bug: logged and answered 500 like any other.
  return null;
}
