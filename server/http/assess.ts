/**
 * POST /api/assess (design §4, contract): the public calculator. Body
 * `{"structure": <structure record>, "gustMps": <number>, "airDensityKgM3"?: <number>}`; the gust is
 * the gust at the structure itself (no height transfer); the density defaults to ISA sea level,
 * 1.225 kg/m³. Answers 200 with the engine's assessment report, or 400
 * `{error: 'invalid input', issues: [{path, message}]}` naming every offending field. Stores nothing.
 *
 * JSON has no Infinity: an unbounded utilization is null with `unbounded.<criterion>` true, and a
 * limit no gust reaches is null (see server/engine/assess.ts).
 */
import { Hono } from 'hono';
import { z } from 'zod';
import { assessStructure, plausibleAirDensityKgM3, recordIssues, validateStructureRecord, type RecordIssue } from '../engine/index.ts';
import { HttpError } from './httpError.ts';

/** Gust range accepted, m/s: the sensor plausibility bound of design §3. */
const maxGustMps = 120;

const assessBodySchema = z.strictObject({
  // Checked separately, so its issues carry the full record path.
  structure: z.unknown(),
  gustMps: z.number().gte(0, 'must be ≥ 0 m/s').lte(maxGustMps, `must be ≤ ${maxGustMps} m/s`),
  airDensityKgM3: z
    .number()
    .gte(plausibleAirDensityKgM3.min, `must be ≥ ${plausibleAirDensityKgM3.min} kg/m³`)
    .lte(plausibleAirDensityKgM3.max, `must be ≤ ${plausibleAirDensityKgM3.max} kg/m³`)
    .optional(),
});

async function jsonBody(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch {
    // The parser's own message adds nothing a caller can act on.
    throw HttpError.invalid([{ path: '', message: 'body is not valid JSON' }]);
  }
}

export const assessRoute = new Hono();

assessRoute.post('/', async (c) => {
  const body = await jsonBody(c.req.raw);
  const parsedBody = assessBodySchema.safeParse(body);
  const issues: RecordIssue[] = parsedBody.success ? [] : recordIssues(parsedBody.error.issues);
  const isObject = typeof body === 'object' && body !== null && !Array.isArray(body);
  const structure = isObject ? validateStructureRecord((body as { structure?: unknown }).structure) : null;
  if (structure && !structure.ok) {
    issues.push(...structure.issues.map((issue) => ({ ...issue, path: issue.path === '' ? 'structure' : `structure.${issue.path}` })));
  }
  if (!parsedBody.success || !structure?.ok || issues.length > 0) throw HttpError.invalid(issues);
  const { gustMps, airDensityKgM3 } = parsedBody.data;
  return c.json(assessStructure(structure.record, { gustMps, airDensityKgM3 }));
});
