/**
 * The shared limits (server/engine/limits.ts) hold at every door that takes the value, and the
 * site settings' one schema (server/register/siteSettings.ts) agrees with the stored row.
 */
import { getTableColumns } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { sitesTable } from '../../db/schema.ts';
import { maxDimensionM, maxPlausibleSpeedMps, profileMaximumHeightM, relativeWindMps } from '../../server/engine/index.ts';
import { dimensionM, gustMps } from '../../server/engine/recordFields.ts';
import { parseReadingPayload } from '../../server/ingest/payload.ts';
import { gustTriggerSchema } from '../../server/levels/levelDefinition.ts';
import { siteDefaultLevels } from '../../server/levels/siteDefaultLevels.ts';
import { settingsOf, siteFileSchema, siteSettingDefaults, siteSettingNames, siteUpdateSchema, siteView } from '../../server/register/siteSettings.ts';

const receivedAtMs = Date.UTC(2026, 5, 13, 12);
const reading = (speed: number) => parseReadingPayload(new TextEncoder().encode(JSON.stringify({ ts: receivedAtMs, speed })), { receivedAtMs, unit: 'm/s' });

describe('the plausible speed, 0 ≤ speed ≤ 120 m/s (design.md §3)', () => {
  it('is 120 m/s', () => {
    expect(maxPlausibleSpeedMps).toBe(120);
  });

  it('is where a reading, a gust trigger, a record’s gust and the engine stop accepting', () => {
    expect(reading(120).ok).toBe(true);
    expect(reading(120.01)).toMatchObject({ ok: false, reason: 'out-of-range' });
    expect(gustTriggerSchema.safeParse({ kind: 'gust', gustMps: 120 }).success).toBe(true);
    expect(gustTriggerSchema.safeParse({ kind: 'gust', gustMps: 120.01 }).success).toBe(false);
    expect(gustMps().safeParse(120).success).toBe(true);
    expect(gustMps().safeParse(120.01).error?.issues[0]?.message).toBe('must be ≤ 120 m/s');
    expect(() => relativeWindMps({ windMps: 120, windFromDeg: 0, travelSpeedMps: 0, headingDeg: 0 })).not.toThrow();
    expect(() => relativeWindMps({ windMps: 120.01, windFromDeg: 0, travelSpeedMps: 0, headingDeg: 0 })).toThrow(/windMps must be a finite number in \[0, 120\] m\/s/);
  });
});

describe('the highest dimension, z_max = 200 m (EN 1991-1-4 Table 4.1, from memory of the table)', () => {
  it('is the wind profile’s top and the records’ longest edge', () => {
    expect(profileMaximumHeightM).toBe(200);
    expect(maxDimensionM).toBe(profileMaximumHeightM);
    expect(dimensionM().safeParse(200).success).toBe(true);
    expect(dimensionM().safeParse(200.1).error?.issues[0]?.message).toBe('must be ≤ 200 m');
  });
});

describe('the site settings’ one schema', () => {
  const columns = getTableColumns(sitesTable);
  const firstReleaseSite = {
    name: 'Brackenfold Common',
    altitudeM: 40,
    terrainCategory: 'II',
    timeZone: 'Europe/London',
    airDensityMode: 'isa',
    fixedAirDensityKgM3: null,
    heightReductionEnabled: false,
    directionalEnabled: false,
    deadBandFraction: 0.1,
    holdTimeMs: 900_000,
    defaultLevels: siteDefaultLevels,
  };

  it('gives a register file written before a setting existed the database’s default for it', () => {
    const read = siteFileSchema.parse(firstReleaseSite);
    for (const name of ['directionSectorHalfWidthDeg', 'actionDueMs', 'forecastFeedUrl', 'forecastFeedIntervalMs', 'forecastFeedUnit', 'forecastFeedHeightM'] as const) {
      expect(read[name], name).toBe(siteSettingDefaults[name]);
      // A nullable column without a default reads as null (drizzle has no default to compare).
      expect(columns[name].default ?? null, name).toBe(siteSettingDefaults[name]);
    }
  });

  it('writes every setting of the row in the file, in the file’s order, and nothing else', () => {
    const { defaultLevels, ...stored } = siteFileSchema.parse(firstReleaseSite);
    const settings = settingsOf(siteView({ id: 3, ...stored, defaultLevelsJson: defaultLevels, createdAtMs: 1, updatedAtMs: 2 }));
    expect(Object.keys(settings)).toEqual(siteSettingNames);
    expect(siteFileSchema.parse(settings)).toEqual(settings);
    // Every stored column is a setting, the id, the times or the levels' JSON.
    expect(Object.keys(columns).filter((c) => !(siteSettingNames as string[]).includes(c)).sort()).toEqual(['createdAtMs', 'defaultLevelsJson', 'id', 'updatedAtMs']);
  });

  it('refuses, in the file and in an update alike, a fixed density mode without its density and a terrain category EN 1991-1-4 does not have', () => {
    for (const schema of [siteFileSchema, siteUpdateSchema]) {
      const fixed = schema.safeParse({ ...firstReleaseSite, airDensityMode: 'fixed', fixedAirDensityKgM3: null });
      expect(fixed.error?.issues.map((i) => i.path.join('.'))).toEqual(['fixedAirDensityKgM3']);
      expect(schema.safeParse({ ...firstReleaseSite, terrainCategory: 'V' }).error?.issues.map((i) => i.path.join('.'))).toEqual(['terrainCategory']);
    }
  });
});
