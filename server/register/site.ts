/**
 * The site: where the event is (altitude, terrain category, time zone), how air density is
 * found, whether the height transfer may reduce gusts and whether wind direction is used, the
 * dead band and hold time of the levels, and the default levels. One site per server; the
 * schema allows more for a later version that runs several.
 */
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { sitesTable } from '../../db/schema.ts';
import { HttpError } from '../http/httpError.ts';
import { levelListSchema, type LevelDefinition } from '../levels/levelDefinition.ts';
import { forecastSpeedUnits } from '../levels/forecastSpeedUnit.ts';
import { siteDefaultLevels } from '../levels/siteDefaultLevels.ts';
import type { Db, Tx } from '../storage/database.ts';
import { recordAudit } from './audit.ts';
import { siteDefaultLevelIssues, siteDesignDensityKgM3 } from './levelCheck.ts';

/** Bounds of the forecast feed's poll interval, ms: 5 minutes to 6 hours. */
export const forecastFeedIntervalBoundsMs = { min: 5 * 60_000, max: 6 * 3_600_000 } as const;

/** The feed's address: http or https, at most 2000 characters; "" or null switches the feed off. */
export const forecastFeedUrlSchema = z
  .string()
  .trim()
  .max(2000, 'must be at most 2000 characters')
  .refine((url) => url === '' || /^https?:$/.test(safeUrl(url)?.protocol ?? ''), 'must be an http:// or https:// address (or empty for no feed)')
  .transform((url) => (url === '' ? null : url))
  .nullable();

function safeUrl(text: string): URL | null {
  try {
    return new URL(text);
  } catch {
    return null;
  }
}

export const terrainCategories = ['0', 'I', 'II', 'III', 'IV'] as const;

function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

export const siteUpdateSchema = z
  .strictObject({
    name: z.string().trim().min(1, 'name must not be empty').max(120),
    altitudeM: z.number().min(-500, 'altitude below −500 m is not a place for an event').max(5000, 'altitude above 5000 m is outside ISA use here'),
    terrainCategory: z.enum(terrainCategories),
    timeZone: z.string().refine(isTimeZone, 'not an IANA time zone (e.g. Europe/London)'),
    airDensityMode: z.enum(['isa', 'measured', 'fixed']),
    /** Used when airDensityMode is 'fixed'; EN 1991-1-4 recommends 1.25 kg/m³. */
    fixedAirDensityKgM3: z.number().min(0.9).max(1.5).nullable(),
    heightReductionEnabled: z.boolean(),
    directionalEnabled: z.boolean(),
    /** With directional assessment, the directions within ± this of the 10-minute mean direction are assessed (design §2.2 v2). */
    directionSectorHalfWidthDeg: z.number().min(15, 'must be ≥ 15°: a narrower sector misses a gust that turns').max(180, 'must be ≤ 180° (180 = every direction)'),
    deadBandFraction: z.number().min(0).max(0.5),
    holdTimeMs: z.number().int().min(0).max(6 * 3600_000),
    /** A level's action that moves a structure and is not marked done this long after its alert is signalled again as overdue (design §2.5). */
    actionDueMs: z.number().int().min(60_000, 'must be at least 1 minute (60000 ms)').max(3_600_000, 'must be at most 60 minutes (3600000 ms)'),
    /** The forecast feed polled (design §2.7): an http(s) address, or null (or "") for none. */
    forecastFeedUrl: forecastFeedUrlSchema,
    /** How often the feed is polled: 5 minutes to 6 hours. */
    forecastFeedIntervalMs: z
      .number()
      .int()
      .min(forecastFeedIntervalBoundsMs.min, 'must be at least 5 minutes (300000 ms): a forecast changes more slowly, and the feed’s server would be asked too often')
      .max(forecastFeedIntervalBoundsMs.max, 'must be at most 6 hours (21600000 ms): a forecast older than that is stale'),
    /** Unit of bare numbers in the feed, or null when the file states its units. */
    forecastFeedUnit: z.enum(forecastSpeedUnits, { error: 'must be one of m/s, km/h, kn or mph (or null when the feed states its units)' }).nullable(),
    /** Height the feed's speeds refer to, m (forecasts give 10 m). */
    forecastFeedHeightM: z.number().gt(0, 'must be above 0 m').max(200, 'must be at most 200 m'),
    defaultLevels: levelListSchema,
  })
  .partial()
  .superRefine((site, ctx) => {
    if (site.airDensityMode === 'fixed' && (site.fixedAirDensityKgM3 === undefined || site.fixedAirDensityKgM3 === null)) {
      ctx.addIssue({ code: 'custom', path: ['fixedAirDensityKgM3'], message: 'a fixed density is needed when airDensityMode is "fixed"' });
    }
  });

export type SiteRow = typeof sitesTable.$inferSelect;

export function getSite(db: Tx): SiteRow {
  const row = db.select().from(sitesTable).orderBy(sitesTable.id).limit(1).get();
  if (!row) throw HttpError.notFound('site');
  return row;
}

/**
 * Air density of a new site, kg/m³ (design §2.1 v2): the value EN 1991-1-4 §4.5(1) Note 2
 * recommends. ISA at sea level (1.225) under-reads cold air (about 1.34 kg/m³ at −10 °C). The
 * competent person may choose ISA at the site's altitude or another fixed value; an existing
 * site keeps what was chosen. The calculator (POST /api/assess) keeps ISA sea level (design §4).
 */
export const newSiteAirDensityKgM3 = 1.25;

/**
 * On a fresh database: one site with conservative defaults (fixed density 1.25 kg/m³, no height
 * reduction, no direction). An existing site is returned as it is.
 */
export function ensureSite(db: Db, nowMs: number, name = 'Event site'): SiteRow {
  const existing = db.select().from(sitesTable).orderBy(sitesTable.id).limit(1).get();
  if (existing) return existing;
  return db
    .insert(sitesTable)
    .values({
      name,
      airDensityMode: 'fixed',
      fixedAirDensityKgM3: newSiteAirDensityKgM3,
      defaultLevelsJson: siteDefaultLevels,
      createdAtMs: nowMs,
      updatedAtMs: nowMs,
    })
    .returning()
    .get();
}

export function updateSite(db: Db, patch: z.infer<typeof siteUpdateSchema>, actor: string, nowMs: number): SiteRow {
  return db.transaction((tx) => {
    const before = getSite(tx);
    const { defaultLevels, ...rest } = patch;
    const mode = rest.airDensityMode ?? before.airDensityMode;
    if (mode === 'fixed' && (rest.fixedAirDensityKgM3 ?? before.fixedAirDensityKgM3) === null) {
      throw HttpError.invalid([{ path: 'fixedAirDensityKgM3', message: 'a fixed density is needed when airDensityMode is "fixed"' }]);
    }
    if (defaultLevels || rest.airDensityMode !== undefined || rest.fixedAirDensityKgM3 !== undefined || rest.altitudeM !== undefined) {
      const density = siteDesignDensityKgM3({
        airDensityMode: mode,
        fixedAirDensityKgM3: rest.fixedAirDensityKgM3 === undefined ? before.fixedAirDensityKgM3 : rest.fixedAirDensityKgM3,
        altitudeM: rest.altitudeM ?? before.altitudeM,
      });
      const issues = siteDefaultLevelIssues(tx, defaultLevels ?? (before.defaultLevelsJson as LevelDefinition[]), density);
      if (issues.length > 0) throw HttpError.invalid(issues);
    }
    const after = tx
      .update(sitesTable)
      .set({ ...rest, ...(defaultLevels ? { defaultLevelsJson: defaultLevels } : {}), updatedAtMs: nowMs })
      .where(eq(sitesTable.id, before.id))
      .returning()
      .get();
    recordAudit(tx, { actor, entity: 'site', entityId: before.id, action: 'update', before, after }, nowMs);
    return after;
  });
}
