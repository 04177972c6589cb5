/**
 * A new site's air density (design §2.1 v2): fixed at 1.25 kg/m³, the value EN 1991-1-4 §4.5(1)
 * Note 2 recommends, in a real SQLite database with the committed migrations. An existing site
 * keeps what its competent person chose.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { airDensityKgM3, isaSeaLevelDensityKgM3 } from '../../server/engine/index.ts';
import { ensureSite, getSite, newSiteAirDensityKgM3, updateSite } from '../../server/register/site.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const dir of dirs) fs.rmSync(dir, { recursive: true, force: true });
});

function freshDatabase() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-site-density-'));
  dirs.push(dir);
  const opened = openDatabase(path.join(dir, 'holdfast.sqlite'));
  return { ...opened, db: new SqliteStorage(opened) };
}

const t0 = Date.UTC(2026, 4, 2, 9, 0, 0);

describe('the site default air density (design §2.1 v2)', () => {
  it('a new site takes a fixed 1.25 kg/m³ (EN 1991-1-4 §4.5(1) Note 2), not ISA sea level 1.225 (ISO 2533)', async () => {
    const { db, sqlite } = freshDatabase();
    const site = await ensureSite(db, t0, 'Brackenfold Common');
    expect(newSiteAirDensityKgM3).toBe(1.25);
    expect(site).toMatchObject({ airDensityMode: 'fixed', fixedAirDensityKgM3: 1.25 });
    // What the watch computes from those settings (server/engine/air.ts, mode 'fixed').
    expect(airDensityKgM3({ mode: 'fixed', densityKgM3: site.fixedAirDensityKgM3! })).toBe(1.25);
    expect(airDensityKgM3({ mode: 'fixed', densityKgM3: site.fixedAirDensityKgM3! })).toBeGreaterThan(isaSeaLevelDensityKgM3);
    // The row as stored, read back past drizzle.
    const row = sqlite.prepare('SELECT air_density_mode AS mode, fixed_air_density_kg_m3 AS density FROM sites').get() as { mode: string; density: number };
    expect(row).toEqual({ mode: 'fixed', density: 1.25 });
    sqlite.close();
  });

  it('an existing site keeps the density its competent person chose: ISA stays ISA after a restart', async () => {
    const { db, sqlite } = freshDatabase();
    await ensureSite(db, t0);
    await updateSite(db, { airDensityMode: 'isa' }, 'competent person', t0 + 60_000);
    expect(await ensureSite(db, t0 + 120_000)).toMatchObject({ airDensityMode: 'isa' });
    expect((await getSite(db)).airDensityMode).toBe('isa');
    sqlite.close();
  });

  it('a site created before this change (the column default, ISA) is not rewritten by a restart', async () => {
    const { db, sqlite } = freshDatabase();
    sqlite.prepare("INSERT INTO sites (name, default_levels_json, created_at_ms, updated_at_ms) VALUES ('Older site', '[]', 0, 0)").run();
    expect(await ensureSite(db, t0)).toMatchObject({ name: 'Older site', airDensityMode: 'isa', fixedAirDensityKgM3: null });
    sqlite.close();
  });
});
