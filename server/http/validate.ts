/**
 * Request input: JSON bodies, route parameters and query strings checked against zod schemas.
 * Every problem comes back at once, each with its field path (400), so a form can mark every
 * field in one round trip.
 */
import type { Context } from 'hono';
import type { z } from 'zod';
import { HttpError, fieldIssues } from './httpError.ts';

export async function jsonBody<S extends z.ZodType>(c: Context, schema: S): Promise<z.infer<S>> {
  const type = c.req.header('content-type') ?? '';
  if (!type.toLowerCase().includes('application/json')) {
    throw new HttpError(415, 'send the body as application/json');
  }
  let body: unknown;
  try {
    body = await c.req.json();
  } catch {
    throw HttpError.invalid([{ path: '', message: 'body is not valid JSON' }]);
  }
  return check(schema, body);
}

export function check<S extends z.ZodType>(schema: S, value: unknown, prefix = ''): z.infer<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw HttpError.invalid(fieldIssues(result.error.issues, prefix));
  return result.data;
}

/** A positive integer id from the path, or 404 (an id that cannot exist names nothing). */
export function idParam(c: Context, name = 'id'): number {
  const raw = c.req.param(name) ?? '';
  const id = Number(raw);
  if (!/^[1-9][0-9]{0,14}$/.test(raw) || !Number.isSafeInteger(id)) throw HttpError.notFound(`${name} "${raw.slice(0, 40)}"`);
  return id;
}
