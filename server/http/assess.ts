/**
 * POST /api/assess (design §4, contract): the public calculator. Body
 * `{"structure": <structure record>, "gustMps": <number>, "airDensityKgM3"?: <number>}`; the gust is
 * the gust at the structure itself (no height transfer); the density defaults to ISA sea level,
 * 1.225 kg/m³. Answers 200 with the engine's assessment report, or 400
 * `{error: 'invalid input', issues: [{path, message}]}` naming every offending field. Stores nothing.
 *
 * JSON has no Infinity: an unbounded utilization is null with `unbounded.<criterion>` true, and a
 * limit no gust reaches is null (see server/engine/assess.ts).
 *
 * A record with `configurations` (engine/configuration.ts) is also answered with `configurations`:
 * each configuration's limit, utilization and governing case at the same gust and density, the one
 * as registered first; the top-level figures stay those of the record as registered.
 */
import { Hono } from 'hono';
import { z } from 'zod';
import {
  assessConfigurations,
  assessStructure,
  highestTravelSpeedMps,
  maxPlausibleSpeedMps,
  plausibleAirDensityKgM3,
  recordIssues,
  requiredBallast,
  stabilityCoefficients,
  validateStructureRecord,
} from '../engine/index.ts';
import { levelListSchema, rawTriggerGustsMps } from '../levels/index.ts';
import { structureLevelIssues } from '../register/levelCheck.ts';
import type { FieldIssue } from './httpError.ts';
import { invalidInput, publicJsonBody } from './publicJson.ts';

/** Gust range accepted, m/s: the sensor plausibility bound of design §3 (engine/limits.ts). */
const maxGustMps = maxPlausibleSpeedMps;

const assessBodySchema = z.strictObject({
  // Checked separately, so its issues carry the full record path.
  structure: z.unknown().optional(),
  gustMps: z.number().gte(0, 'must be ≥ 0 m/s').lte(maxGustMps, `must be ≤ ${maxGustMps} m/s`),
  /**
   * Extension (compatible): a level list, answered with each level's equivalent gust for this
   * structure (`levels`), as the register form shows it.
   */
  levels: levelListSchema.optional(),
  /** Extension: the design gust (m/s) for which `requiredBallast` is answered. */
  designGustMps: z.number().gt(0, 'must be > 0 m/s').lte(maxGustMps, `must be ≤ ${maxGustMps} m/s`).optional(),
  /**
   * Extension, for mobile structures (a screen on a vehicle): with `gustMps` as the wind over the
   * ground, the highest travel speed with the face raised (design.md 2.2). Directions in degrees;
   * null or absent = the worst heading, straight into the wind.
   */
  travel: z.strictObject({ windFromDeg: z.number().min(0).max(360).nullable().optional(), headingDeg: z.number().min(0).max(360).nullable().optional() }).optional(),
  /** Extension: where extra ballast would go, m from the front edge (default the middle of the base). */
  ballastXM: z.number().gte(0, 'must be ≥ 0 m').optional(),
  /** Extension: where extra ballast would go, m from the y = 0 end (default the middle of the base). */
  ballastYM: z.number().gte(0, 'must be ≥ 0 m').optional(),
  /** Extension: the azimuth the structure's front faces, degrees; sides are then named by compass point. */
  frontAzimuthDeg: z.number().gte(0, 'must be ≥ 0°').lte(360, 'must be ≤ 360°').optional(),
  airDensityKgM3: z
    .number()
    .gte(plausibleAirDensityKgM3.min, `must be ≥ ${plausibleAirDensityKgM3.min} kg/m³`)
    .lte(plausibleAirDensityKgM3.max, `must be ≤ ${plausibleAirDensityKgM3.max} kg/m³`)
    .optional(),
});

/**
 * The 400 answer, the same body as `HttpError.invalid` renders in app.ts. Answered here rather
 * than thrown so that the route behaves the same mounted or on its own (as in its tests).
 */
function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

export const assessRoute = new Hono();

assessRoute.post('/', async (c) => {
  const read = await publicJsonBody(c);
  if (!read.ok) return read.response;
  const body = read.body;
  const parsedBody = assessBodySchema.safeParse(body);
  const issues: FieldIssue[] = parsedBody.success ? [] : recordIssues(parsedBody.error.issues);
  // The record is checked even when the rest of the body is wrong, so one answer names everything.
  const structureInput = isPlainObject(body) ? body.structure : undefined;
  const structure = structureInput === undefined ? null : validateStructureRecord(structureInput);
  if (structureInput === undefined && isPlainObject(body)) issues.push({ path: 'structure', message: 'is required: a structure record' });
  if (structure && !structure.ok) {
    issues.push(...structure.issues.map((issue) => ({ ...issue, path: issue.path === '' ? 'structure' : `structure.${issue.path}` })));
  }
  if (!parsedBody.success || !structure?.ok) return invalidInput(c, issues);
  const { gustMps, airDensityKgM3, levels, designGustMps, ballastXM, ballastYM, travel, frontAzimuthDeg } = parsedBody.data;
  const report = assessStructure(structure.record, { gustMps, airDensityKgM3, frontAzimuthDeg });
  const density = report.airDensityKgM3;
  const extras: Record<string, unknown> = {};
  const limitMps = report.limitGustMps ?? Infinity;
  if (levels) {
    const gusts = rawTriggerGustsMps(levels, limitMps);
    extras.levels = levels.map((level, i) => ({ level: i + 1, label: level.label, trigger: level.trigger, triggerGustMps: Number.isFinite(gusts[i]!) ? gusts[i] : null }));
    // The save's own check (register/levelCheck.ts), in every configuration, at this density.
    extras.levelOrderProblems = structureLevelIssues(structure.record, levels, density, false);
  }
  if ((structure.record.configurations ?? []).length > 0) {
    // Extension (issue 14): every configuration at the same gust and density, the one as
    // registered first; with `levels`, each configuration's own level gusts.
    extras.configurations = assessConfigurations(structure.record, { gustMps, airDensityKgM3, frontAzimuthDeg }).map((configuration) => {
      if (!levels) return configuration;
      const gusts = rawTriggerGustsMps(levels, configuration.limitGustMps ?? Infinity);
      return { ...configuration, levels: levels.map((level, i) => ({ level: i + 1, label: level.label, triggerGustMps: Number.isFinite(gusts[i]!) ? gusts[i] : null })) };
    });
  }
  if (designGustMps !== undefined) {
    const { baseDepthM } = report.expanded;
    const baseWidthM = report.expanded.baseWidthM ?? 0;
    const xM = ballastXM ?? baseDepthM / 2;
    const yM = ballastYM ?? baseWidthM / 2;
    const placement: FieldIssue[] = [];
    if (xM > baseDepthM) placement.push({ path: 'ballastXM', message: `must be within the base (≤ ${baseDepthM} m)` });
    if (yM > baseWidthM) placement.push({ path: 'ballastYM', message: report.expanded.baseWidthM === undefined ? 'needs a record with baseWidthM' : `must be within the base (≤ ${baseWidthM} m)` });
    if (placement.length > 0) return invalidInput(c, placement);
    const answer = requiredBallast(stabilityCoefficients(report.expanded), designGustMps, density, { xM, yM });
    extras.requiredBallast = { designGustMps, xM, yM, ...answer };
  }
  if (travel && report.limitGustMps !== null) {
    extras.travel = {
      windFromDeg: travel.windFromDeg ?? null,
      headingDeg: travel.headingDeg ?? null,
      ...highestTravelSpeedMps({ limitGustMps: report.limitGustMps, gustMps, windFromDeg: travel.windFromDeg ?? null, headingDeg: travel.headingDeg ?? null }),
    };
  }
  return c.json({ ...report, ...extras });
});
