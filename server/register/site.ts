/**
 * The site: where the event is (altitude, terrain category, time zone), how air density is
 * found, whether the height transfer may reduce gusts and whether wind direction is used, the
 * dead band and hold time of the levels, and the default levels. One site per server; the
 * schema allows more for a later version that runs several.
 */
import { Invalid, NotFound } from '../domainErrors.ts';
import { siteDefaultLevels } from '../levels/siteDefaultLevels.ts';
import type { Storage } from '../storage/storage.ts';
import type { SiteRow } from '../storage/sites.ts';
import { recommendedAirDensityKgM3, siteDesignDensityKgM3 } from '../engine/index.ts';
import { siteDefaultLevelIssues } from './levelCheck.ts';
import type { SiteUpdate } from './siteSettings.ts';

// The settings' one schema and the forms derived from it (siteSettings.ts).
export { forecastFeedIntervalBoundsMs, forecastFeedUrlSchema, siteUpdateSchema, terrainCategories, type SiteUpdate } from './siteSettings.ts';

export type { SiteRow };

export async function getSite(storage: Storage): Promise<SiteRow> {
  const row = await storage.site.first();
  if (!row) throw new NotFound('site');
  return row;
}

/**
 * Air density of a new site, kg/m³ (design §2.1 v2): the value EN 1991-1-4 §4.5(1) Note 2
 * recommends. ISA at sea level (1.225) under-reads cold air (about 1.34 kg/m³ at −10 °C). The
 * competent person may choose ISA at the site's altitude or another fixed value; an existing
 * site keeps what was chosen. The calculator (POST /api/assess) keeps ISA sea level (design §4).
 */
export const newSiteAirDensityKgM3 = recommendedAirDensityKgM3;

/**
 * On a fresh database: one site with conservative defaults (fixed density 1.25 kg/m³, no height
 * reduction, no direction). An existing site is returned as it is.
 */
export async function ensureSite(storage: Storage, nowMs: number, name = 'Event site'): Promise<SiteRow> {
  const existing = await storage.site.first();
  if (existing) return existing;
  return await storage.site.insert({
    name,
    airDensityMode: 'fixed',
    fixedAirDensityKgM3: newSiteAirDensityKgM3,
    defaultLevelsJson: [...siteDefaultLevels],
    createdAtMs: nowMs,
    updatedAtMs: nowMs,
  });
}

export async function updateSite(storage: Storage, patch: SiteUpdate, actor: string, nowMs: number): Promise<SiteRow> {
  return await storage.transaction(async () => {
    const before = await getSite(storage);
    const { defaultLevels, ...rest } = patch;
    const mode = rest.airDensityMode ?? before.airDensityMode;
    if (mode === 'fixed' && (rest.fixedAirDensityKgM3 ?? before.fixedAirDensityKgM3) === null) {
      throw new Invalid([{ path: 'fixedAirDensityKgM3', message: 'a fixed density is needed when airDensityMode is "fixed"' }]);
    }
    if (defaultLevels || rest.airDensityMode !== undefined || rest.fixedAirDensityKgM3 !== undefined || rest.altitudeM !== undefined) {
      const density = siteDesignDensityKgM3({
        airDensityMode: mode,
        fixedAirDensityKgM3: rest.fixedAirDensityKgM3 === undefined ? before.fixedAirDensityKgM3 : rest.fixedAirDensityKgM3,
        altitudeM: rest.altitudeM ?? before.altitudeM,
      });
      const issues = await siteDefaultLevelIssues(storage, defaultLevels ?? before.defaultLevelsJson, density);
      if (issues.length > 0) throw new Invalid(issues);
    }
    const after = await storage.site.update(before.id, { ...rest, ...(defaultLevels ? { defaultLevelsJson: defaultLevels } : {}), updatedAtMs: nowMs });
    await storage.audit.record({ actor, entity: 'site', entityId: before.id, action: 'update', before, after }, nowMs);
    return after;
  });
}
