/** Every API route group of the app (the access routes are mounted separately, before these). */
import { Hono } from 'hono';
import type { AppEnv } from '../access.ts';
import type { ApiContext } from './apiContext.ts';
import { forecastFeedRoutes } from './forecastFeedRoutes.ts';
import { liveRoutes } from './liveRoutes.ts';
import { logRoutes } from './logRoutes.ts';
import { registerRoutes } from './registerRoutes.ts';

export type { ApiContext } from './apiContext.ts';

export function apiRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  api.route('/', liveRoutes(ctx));
  api.route('/', registerRoutes(ctx));
  api.route('/', logRoutes(ctx));
  api.route('/', forecastFeedRoutes(ctx));
  return api;
}
