/**
 * The body of a public calculator request (POST /api/assess, POST /api/chance): JSON only, and a
 * 400 in the calculator's own form (`{"error", "issues"}`) when it is not JSON at all. These
 * routes answer with their own responses rather than HttpError: they are mounted before the
 * session middleware and keep the contract's error body.
 */
import type { Context } from 'hono';
import type { FieldIssue } from './httpError.ts';

export function invalidInput(c: Context, issues: FieldIssue[]): Response {
  return c.json({ error: 'invalid input', issues }, 400);
}

/** The parsed JSON body, or the response to send instead (415 not JSON, 400 not valid JSON). */
export async function publicJsonBody(c: Context): Promise<{ ok: true; body: unknown } | { ok: false; response: Response }> {
  if (!(c.req.header('content-type') ?? '').toLowerCase().includes('application/json')) {
    return { ok: false, response: c.json({ error: 'send the body as application/json' }, 415) };
  }
  try {
    return { ok: true, body: await c.req.json() };
  } catch {
    // The parser's own message adds nothing a caller can act on.
    return { ok: false, response: invalidInput(c, [{ path: '', message: 'body is not valid JSON' }]) };
  }
}
