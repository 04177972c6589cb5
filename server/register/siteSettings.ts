/**
 * The site's settings as one zod schema, from which every other form derives (design §5: types
 * come from the zod and drizzle schemas, never written twice):
 *
 * - `siteUpdateSchema`: the body of PATCH /api/site (every field optional);
 * - `siteFileSchema`: the register file's `site` block (register/registerFile.ts), the fields
 *   added after the first files defaulting as the database does;
 * - `SiteSettings` (z.infer) and `SiteView` (GET /api/site, web/src/types.ts), built from the
 *   stored row by `siteView`;
 * - `WatchSiteSettings`: what the live watch takes (watch/watch.ts `SiteSettings`).
 *
 * The stored row is drizzle's (`sitesTable.$inferSelect`, db/schema.ts): its enum columns take the
 * same lists (`terrainCategories`, `airDensityModes`, `forecastSpeedUnits`) and its defaults the
 * same `siteSettingDefaults`. Pure: no database here (the row type is imported as a type only).
 */
import { z } from 'zod';
import { airDensityModes } from '../engine/air.ts';
import { fixedAirDensityRangeKgM3, maxDimensionM, maxSiteNameLength, maxUrlLength, siteAltitudeRangeM } from '../engine/limits.ts';
import { terrainCategories } from '../engine/windProfile.ts';
import { forecastSpeedUnits } from '../foresight/forecastSpeedUnit.ts';
import { levelListSchema, type LevelDefinition } from '../levels/levelDefinition.ts';
import { defaultLevelStepParams } from '../levels/stepLevel.ts';
import type { SiteRow } from '../storage/sites.ts';

export { airDensityModes, forecastSpeedUnits, terrainCategories };

/**
 * Defaults of a new site's settings (db/schema.ts column defaults) and of a register file written
 * before a field existed. Dead band 10 % and hold 15 min: design §2.6; sector ±45°: design §2.2
 * v2; action due after 5 min, feed every 30 min at 10 m: our own (the 10 m is where forecasts give
 * the wind, WMO-No. 8).
 */
export const siteSettingDefaults = {
  altitudeM: 0,
  terrainCategory: 'II',
  timeZone: 'UTC',
  airDensityMode: 'isa',
  heightReductionEnabled: false,
  directionalEnabled: false,
  directionSectorHalfWidthDeg: 45,
  deadBandFraction: defaultLevelStepParams.deadBandFraction,
  holdTimeMs: defaultLevelStepParams.holdTimeMs,
  actionDueMs: 5 * 60_000,
  forecastFeedUrl: null,
  forecastFeedIntervalMs: 30 * 60_000,
  forecastFeedUnit: null,
  forecastFeedHeightM: 10,
} as const;

/** Bounds of the forecast feed's poll interval, ms: 5 minutes to 6 hours. */
export const forecastFeedIntervalBoundsMs = { min: 5 * 60_000, max: 6 * 3_600_000 } as const;

function safeUrl(text: string): URL | null {
  try {
    return new URL(text);
  } catch {
    return null;
  }
}

/** The feed's address: http or https, at most 2000 characters; "" or null switches the feed off. */
export const forecastFeedUrlSchema = z
  .string()
  .trim()
  .max(maxUrlLength, `must be at most ${maxUrlLength} characters`)
  .refine((url) => url === '' || /^https?:$/.test(safeUrl(url)?.protocol ?? ''), 'must be an http:// or https:// address (or empty for no feed)')
  .transform((url) => (url === '' ? null : url))
  .nullable();

function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

/** Every setting, in the order the register file writes them. */
export const siteSettingsShape = {
  name: z.string().trim().min(1, 'name must not be empty').max(maxSiteNameLength),
  altitudeM: z
    .number()
    .min(siteAltitudeRangeM.min, `altitude below −${-siteAltitudeRangeM.min} m is not a place for an event`)
    .max(siteAltitudeRangeM.max, `altitude above ${siteAltitudeRangeM.max} m is outside ISA use here`),
  terrainCategory: z.enum(terrainCategories),
  timeZone: z.string().refine(isTimeZone, 'not an IANA time zone (e.g. Europe/London)'),
  airDensityMode: z.enum(airDensityModes),
  /** Used when airDensityMode is 'fixed'; EN 1991-1-4 recommends 1.25 kg/m³. */
  fixedAirDensityKgM3: z.number().min(fixedAirDensityRangeKgM3.min).max(fixedAirDensityRangeKgM3.max).nullable(),
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
  forecastFeedHeightM: z.number().gt(0, 'must be above 0 m').max(maxDimensionM, `must be at most ${maxDimensionM} m`),
  defaultLevels: levelListSchema,
};

/** The settings of a site, every one given. */
export const siteSettingsSchema = z.strictObject(siteSettingsShape);
export type SiteSettings = z.infer<typeof siteSettingsSchema>;
export type SiteSettingName = keyof SiteSettings;
export const siteSettingNames = Object.keys(siteSettingsShape) as SiteSettingName[];

const fixedNeedsDensity = (site: { airDensityMode?: SiteSettings['airDensityMode'] | undefined; fixedAirDensityKgM3?: number | null | undefined }, ctx: z.RefinementCtx): void => {
  if (site.airDensityMode === 'fixed' && (site.fixedAirDensityKgM3 === undefined || site.fixedAirDensityKgM3 === null)) {
    ctx.addIssue({ code: 'custom', path: ['fixedAirDensityKgM3'], message: 'a fixed density is needed when airDensityMode is "fixed"' });
  }
};

/** PATCH /api/site: any of the settings. */
export const siteUpdateSchema = siteSettingsSchema.partial().superRefine(fixedNeedsDensity);
export type SiteUpdate = z.infer<typeof siteUpdateSchema>;

/** The register file's site block: every setting, those added after the first files with their defaults. */
export const siteFileSchema = siteSettingsSchema
  .extend({
    directionSectorHalfWidthDeg: siteSettingsShape.directionSectorHalfWidthDeg.default(siteSettingDefaults.directionSectorHalfWidthDeg),
    actionDueMs: siteSettingsShape.actionDueMs.default(siteSettingDefaults.actionDueMs),
    // The forecast feed (issue 17); files written before it have none.
    forecastFeedUrl: siteSettingsShape.forecastFeedUrl.default(siteSettingDefaults.forecastFeedUrl),
    forecastFeedIntervalMs: siteSettingsShape.forecastFeedIntervalMs.default(siteSettingDefaults.forecastFeedIntervalMs),
    forecastFeedUnit: siteSettingsShape.forecastFeedUnit.default(siteSettingDefaults.forecastFeedUnit),
    forecastFeedHeightM: siteSettingsShape.forecastFeedHeightM.default(siteSettingDefaults.forecastFeedHeightM),
  })
  .superRefine(fixedNeedsDensity);

/** GET /api/site's `site`: the settings with the row's id and times. */
export type SiteView = SiteSettings & { id: number; createdAtMs: number; updatedAtMs: number };

/** The stored row as the API and the watch see it: `defaultLevelsJson` as `defaultLevels`. */
export function siteView(row: SiteRow): SiteView {
  const { defaultLevelsJson, ...rest } = row;
  return { ...rest, defaultLevels: defaultLevelsJson };
}

/** Only the settings of a view or row, in the schema's order (the register file's site block). */
export function settingsOf(view: SiteView): SiteSettings {
  return Object.fromEntries(siteSettingNames.map((name) => [name, view[name]])) as SiteSettings;
}

/**
 * What the live watch takes: the settings that change an assessment or an alert (not the forecast
 * feed's), with the site's id. The two added later may be absent (their defaults apply).
 */
export type WatchSiteSettings = { id: number } & Pick<
  SiteSettings,
  'name' | 'altitudeM' | 'terrainCategory' | 'timeZone' | 'airDensityMode' | 'fixedAirDensityKgM3' | 'heightReductionEnabled' | 'directionalEnabled' | 'deadBandFraction' | 'holdTimeMs'
> &
  Partial<Pick<SiteSettings, 'actionDueMs' | 'directionSectorHalfWidthDeg'>> & { defaultLevels: readonly LevelDefinition[] };
