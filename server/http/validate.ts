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

/**
 * A PATCH body: checked like `jsonBody`, then only the fields the request named are kept. (A
 * schema's defaults fill in absent fields — right for a new record, wrong for a change: a PATCH
 * that names one field must leave the others as they are.)
 */
export async function jsonPatchBody<S extends z.ZodType>(c: Context, schema: S): Promise<Partial<z.infer<S>>> {
  const parsed = (await jsonBody(c, schema)) as Record<string, unknown>;
  const raw = (await c.req.json()) as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(parsed)) if (Object.prototype.hasOwnProperty.call(raw, key)) out[key] = parsed[key];
  return out as Partial<z.infer<S>>;
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
