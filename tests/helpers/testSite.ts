/**
 * Site settings for the live watch's unit tests: an invented site at sea level, ISA air, terrain
 * category II, no height reduction, no wind sector, the default dead band (10 %) and hold time
 * (15 min), the site's default levels. Each test overrides what it is about.
 */
import { siteDefaultLevels } from '../../server/levels/index.ts';
import type { SiteSettings } from '../../server/watch/watch.ts';

export function testSite(overrides: Partial<SiteSettings> = {}): SiteSettings {
  return {
    id: 1,
    name: 'Gullhaven Quay',
    altitudeM: 0,
    terrainCategory: 'II',
    timeZone: 'Europe/London',
    airDensityMode: 'isa',
    fixedAirDensityKgM3: null,
    heightReductionEnabled: false,
    directionalEnabled: false,
    deadBandFraction: 0.1,
    holdTimeMs: 900_000,
    defaultLevels: siteDefaultLevels,
    ...overrides,
  };
}
