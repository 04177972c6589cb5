/**
 * POST /api/chance (design.md §2.7, contract): the public chance calculator. Body
 * `{"meanMps", "sigmaMps", "thresholdMps", "minutes", "upcrossingRateHz"}` → 200
 * `{"probability", "expectedUpcrossings", "expectedPeakGustMps"}` with T = minutes × 60 s (the
 * formulas of server/foresight/chance.ts: Rice 1944-45, Davenport 1964), plus `peakFactor` and
 * `durationS` so the figure can be traced to its inputs. Invalid input → 400
 * `{error: 'invalid input', issues: [{path, message}]}` naming every offending field, the body
 * /api/assess answers. Stores nothing; like /api/assess it is exempt from the origin and CSRF
 * checks (server/runtime.ts), since it changes nothing.
 */
import { Hono } from 'hono';
import { z } from 'zod';
import { maxPlausibleSpeedMps, recordIssues } from '../engine/index.ts';
import { chanceOfReaching } from '../foresight/index.ts';
import { invalidInput, publicJsonBody } from './publicJson.ts';

/** Speeds accepted, m/s: the sensor plausibility bound of design §3 (as /api/assess's gust). */
const maxSpeedMps = maxPlausibleSpeedMps;
/** Up-crossing rates accepted, Hz: far above any 3-s mean speed's (a sanity bound). */
const maxUpcrossingRateHz = 10;

const chanceBodySchema = z.strictObject({
  meanMps: z.number().gte(0, 'must be ≥ 0 m/s').lte(maxSpeedMps, `must be ≤ ${maxSpeedMps} m/s`),
  sigmaMps: z.number().gt(0, 'must be > 0 m/s').lte(maxSpeedMps, `must be ≤ ${maxSpeedMps} m/s`),
  thresholdMps: z.number().gte(0, 'must be ≥ 0 m/s').lte(maxSpeedMps, `must be ≤ ${maxSpeedMps} m/s`),
  minutes: z.number().gte(1, 'must be at least 1 minute').lte(180, 'must be at most 180 minutes'),
  upcrossingRateHz: z.number().gt(0, 'must be > 0 Hz').lte(maxUpcrossingRateHz, `must be ≤ ${maxUpcrossingRateHz} Hz`),
});

export const chanceRoute = new Hono();

chanceRoute.post('/', async (c) => {
  const read = await publicJsonBody(c);
  if (!read.ok) return read.response;
  const parsed = chanceBodySchema.safeParse(read.body);
  if (!parsed.success) return invalidInput(c, recordIssues(parsed.error.issues));
  const { meanMps, sigmaMps, thresholdMps, minutes, upcrossingRateHz } = parsed.data;
  const durationS = minutes * 60;
  const chance = chanceOfReaching({ meanMps, sigmaMps, upcrossingRateHz, thresholdMps, durationS });
  return c.json({
    probability: chance.probability,
    expectedUpcrossings: chance.expectedUpcrossings,
    expectedPeakGustMps: chance.expectedPeakGustMps,
    peakFactor: chance.peakFactor,
    durationS,
  });
});
