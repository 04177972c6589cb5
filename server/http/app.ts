/**
 * The HTTP application: every route under /api, the built web app as static files, one error
 * path. Created by the composition root (server/main.ts) with the services it needs; tests build
 * it in-process and call `app.request(...)`.
 */
import { Hono } from 'hono';
import { bodyLimit } from 'hono/body-limit';
import { secureHeaders } from 'hono/secure-headers';
import { HttpError } from './httpError.ts';
import { assessRoute } from './assess.ts';

export interface HealthSource {
  /** The health report; `ok` false answers 503 so probes notice. */
  health(): { ok: boolean } & Record<string, unknown>;
}

export interface AppServices {
  health: HealthSource;
  /** Extra route groups mounted under /api (sensors, structures, log...). */
  routes?: ReadonlyArray<{ path: string; app: Hono }>;
  /** Serves the built web app when given. */
  staticRoot?: string;
}

/** Largest request body accepted (an import of a whole register fits comfortably). */
export const maxBodyBytes = 2 * 1024 * 1024;

export function createApp(services: AppServices): Hono {
  const app = new Hono();

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

  app.get('/api/health', (c) => {
    const report = services.health.health();
    return c.json(report, report.ok ? 200 : 503);
  });
  app.route('/api/assess', assessRoute);
  for (const group of services.routes ?? []) app.route(group.path, group.app);

  app.notFound((c) => c.json({ error: 'not found' }, 404));
  app.onError((err, c) => {
    if (err instanceof HttpError) {
      return c.json(err.issues ? { error: err.message, issues: err.issues } : { error: err.message }, err.status);
    }
    if (err instanceof SyntaxError) {
      return c.json({ error: 'invalid input', issues: [{ path: '', message: 'body is not valid JSON' }] }, 400);
    }
    // Anything else is our fault: log it, tell the caller nothing about the inside.
    console.error(err);
    return c.json({ error: 'internal error' }, 500);
  });
  return app;
}
