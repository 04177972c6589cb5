/**
 * The benchmark site: Brackenfold Common at festival scale (invented). 100 anemometers, four
 * gateways of 25 sensors each, and 1,000 structures of every kind (marquees, fence scrims, LED
 * screens, band shells, custom arches), seeded so every run registers the same register. Every
 * structure takes its wind from every sensor (the default) and uses the site's default levels.
 *
 * The register is written once into a template data folder through the server's own register
 * functions (the same validation and audit trail as the HTTP API); each server the benchmarks
 * start gets a fresh copy of it.
 */
import fs from 'node:fs';
import path from 'node:path';
import { seededRandom, type Random } from '../../server/demo/random.ts';
import { isaAirDensityKgM3, validateStructureRecord } from '../../server/engine/index.ts';
import { siteDefaultLevels } from '../../server/levels/siteDefaultLevels.ts';
import { createGateway } from '../../server/register/gateways.ts';
import { createSensor } from '../../server/register/sensors.ts';
import { ensureSite, getSite, updateSite } from '../../server/register/site.ts';
import { createStructure, type StructureInput } from '../../server/register/structures.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { densityDependent, structureModel } from '../../server/watch/structureModel.ts';

export const benchSiteName = 'Brackenfold Common — festival week (benchmark site, invented)';
export const topicPrefix = 'wind';
const actor = 'benchmark set-up';

export interface BenchSensor {
  key: string;
  heightM: number;
}

export interface BenchGateway {
  username: string;
  password: string;
  sensorKeys: string[];
}

export interface Fleet {
  sensors: BenchSensor[];
  gateways: BenchGateway[];
  structures: number;
  /** Lowest first-level trigger gust of any structure at the site's ISA density, m/s. */
  minFirstTriggerMps: number;
  /** Count of structures per kind. */
  kinds: Record<string, number>;
}

export function benchSensors(count: number): BenchSensor[] {
  return Array.from({ length: count }, (_, i) => ({
    key: `mast-${String(i + 1).padStart(3, '0')}`,
    // Masts, poles and stage roofs: 3 to 12 m.
    heightM: 3 + ((i * 37) % 10),
  }));
}

export function benchGateways(sensors: readonly BenchSensor[], count: number): BenchGateway[] {
  const gateways: BenchGateway[] = [];
  for (let g = 0; g < count; g++) {
    gateways.push({
      username: `bench-gw-${g + 1}`,
      password: `brackenfold-bench-gateway-${g + 1}`,
      sensorKeys: sensors.filter((_, i) => i % count === g).map((s) => s.key),
    });
  }
  return gateways;
}

const pick = <T>(random: Random, items: readonly T[]): T => items[Math.floor(random() * items.length)]!;
const between = (random: Random, lo: number, hi: number, step = 0.1): number => Math.round((lo + (hi - lo) * random()) / step) * step;

/** One invented structure; `strength` scales its ballast (raised until it is not absurdly weak). */
function structureRecord(i: number, random: Random, strength: number): Record<string, unknown> {
  const n = String(i + 1).padStart(4, '0');
  switch (i % 5) {
    case 0: {
      const widthM = pick(random, [3, 4.5, 6, 9, 12]);
      const lengthM = widthM * pick(random, [1, 1.5, 2, 3]);
      const eave = pick(random, [2.1, 2.3, 2.5, 3]);
      return {
        kind: 'tent',
        name: `Marquee ${n}`,
        lengthM,
        widthM,
        eaveHeightM: eave,
        ridgeHeightM: Math.round((eave + widthM * 0.25) * 10) / 10,
        wallsClosed: random() < 0.7,
        legs: 2 * Math.max(2, Math.round(lengthM / 3) + 1),
        ballastPerLegKg: Math.round(between(random, 150, 600, 10) * strength),
        selfWeightKg: Math.round(lengthM * widthM * 9),
        surface: pick(random, ['grass', 'hard']),
      };
    }
    case 1:
      return {
        kind: 'banner',
        name: `Fence scrim ${n}`,
        widthM: pick(random, [3.5, 7, 10.5, 14]),
        heightM: pick(random, [1.8, 2, 2.2]),
        clearanceM: 0.1,
        solidity: pick(random, [0.5, 0.55, 0.7]),
        feet: pick(random, [2, 3, 4, 5]),
        ballastPerFootKg: Math.round(between(random, 80, 250, 5) * strength),
        footDepthM: pick(random, [1.2, 1.4, 1.6]),
        selfWeightKg: 120,
        surface: 'grass',
      };
    case 2:
      return {
        kind: 'screen',
        name: `LED screen ${n}`,
        widthM: pick(random, [3, 4, 5, 6]),
        heightM: pick(random, [2, 2.5, 3]),
        bottomHeightM: pick(random, [2.5, 3, 3.5]),
        supportTowers: 2,
        towerMassKg: 450,
        screenMassKg: 900,
        outriggerDepthM: pick(random, [3, 4, 5]),
        ballastPerTowerKg: Math.round(between(random, 1000, 2500, 50) * strength),
        ratedGustMps: pick(random, [18, 20, 22]),
        surface: 'hard',
      };
    case 3:
      return {
        kind: 'shell',
        name: `Band shell ${n}`,
        radiusM: pick(random, [3, 4, 5]),
        form: pick(random, ['open', 'closed']),
        selfWeightKg: 2400,
        frontBallastKg: Math.round(between(random, 600, 1200, 50) * strength),
        backBallastKg: Math.round(between(random, 1500, 3000, 50) * strength),
        surface: 'grass',
      };
    default: {
      const ballast = Math.round(between(random, 300, 700, 10) * strength);
      return {
        kind: 'custom',
        name: `Sponsor arch ${n}`,
        baseDepthM: 1.5,
        faces: [
          { label: 'header panel', areaM2: pick(random, [4, 6, 8]), centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 },
          { label: 'two legs', areaM2: 2.4, centroidHeightM: 1.5, cfFront: 1.2, cfBack: 1.2 },
        ],
        masses: [
          { label: 'arch frame', massKg: 220, xM: 0.75 },
          { label: 'water ballast, front', massKg: ballast, xM: 0.1 },
          { label: 'water ballast, back', massKg: ballast, xM: 1.4 },
        ],
        surface: 'grass',
        coefficientSource: 'benchmark data: invented; header panel as EN 1991-1-4 7.4.3 signboard (1.80), legs taken at 1.2',
      };
    }
  }
}

function firstTriggerMps(record: Record<string, unknown>, densityKgM3: number): number {
  const v = validateStructureRecord(record);
  if (!v.ok) throw new Error(`invented structure is invalid: ${JSON.stringify(v.issues)}`);
  const model = structureModel({ id: 0, name: v.record.name, kind: v.record.kind, recordJson: v.record, orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: null }, siteDefaultLevels);
  return densityDependent(model, densityKgM3).triggerGustsMps[0]!;
}

/**
 * Structures whose first level triggers at or above `minFirstTriggerMps`: ballast is raised
 * (at most 12 times) until the invented structure is at least that strong, so the benchmark
 * wind keeps most of the site calm and a probe structure can be driven across its own levels
 * without raising the rest.
 */
export function benchStructures(count: number, seed: number, minFirstTriggerMps: number, densityKgM3: number): Array<{ input: StructureInput; firstTriggerMps: number }> {
  const random = seededRandom(seed);
  const out: Array<{ input: StructureInput; firstTriggerMps: number }> = [];
  for (let i = 0; i < count; i++) {
    const state = random();
    let strength = 1;
    let record = structureRecord(i, seededRandom(Math.floor(state * 2 ** 31)), strength);
    let trigger = firstTriggerMps(record, densityKgM3);
    for (let k = 0; k < 12 && trigger < minFirstTriggerMps; k++) {
      strength *= 1.4;
      record = structureRecord(i, seededRandom(Math.floor(state * 2 ** 31)), strength);
      trigger = firstTriggerMps(record, densityKgM3);
    }
    out.push({
      firstTriggerMps: trigger,
      input: {
        record,
        orientationDeg: Math.round(random() * 359),
        location: `Zone ${String.fromCharCode(65 + (i % 8))}`,
        latDeg: null,
        lonDeg: null,
        mobile: false,
        sensorKeys: null,
        levels: null,
      },
    });
  }
  return out;
}

export interface TemplateOptions {
  dir: string;
  sensors: number;
  gateways: number;
  structures: number;
  seed: number;
  minFirstTriggerMps: number;
}

/** Writes the register into `dir/holdfast.sqlite` (a fresh data folder) and describes it. */
export async function writeTemplate(o: TemplateOptions): Promise<Fleet> {
  fs.rmSync(o.dir, { recursive: true, force: true });
  fs.mkdirSync(o.dir, { recursive: true });
  const nowMs = Date.now();
  const opened = openDatabase(path.join(o.dir, 'holdfast.sqlite'));
  const { sqlite } = opened;
  const db = new SqliteStorage(opened);
  try {
    await ensureSite(db, nowMs, benchSiteName);
    await updateSite(db, { name: benchSiteName, altitudeM: 0, terrainCategory: 'II', timeZone: 'Europe/London', airDensityMode: 'isa' }, actor, nowMs);
    const site = await getSite(db);
    const sensors = benchSensors(o.sensors);
    for (const s of sensors) {
      await createSensor(db, site.id, { key: s.key, name: `Mast ${s.key.slice(5)}`, heightM: s.heightM, location: 'festival field', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000 }, actor, nowMs);
    }
    const gateways = benchGateways(sensors, o.gateways);
    for (const g of gateways) {
      await createGateway(db, site.id, { name: `Field gateway ${g.username.slice(9)}`, username: g.username, password: g.password, sensorKeys: g.sensorKeys }, actor, nowMs);
    }
    const structures = benchStructures(o.structures, o.seed, o.minFirstTriggerMps, isaAirDensityKgM3(0));
    const kinds: Record<string, number> = {};
    for (const s of structures) {
      await createStructure(db, site.id, s.input, actor, nowMs);
      const kind = (s.input.record as { kind: string }).kind;
      kinds[kind] = (kinds[kind] ?? 0) + 1;
    }
    sqlite.pragma('wal_checkpoint(TRUNCATE)');
    return { sensors, gateways, structures: structures.length, minFirstTriggerMps: Math.min(...structures.map((s) => s.firstTriggerMps)), kinds };
  } finally {
    sqlite.close();
  }
}

/** A fresh data folder with a copy of the template. */
export function copyTemplate(templateDir: string, dir: string): string {
  fs.rmSync(dir, { recursive: true, force: true });
  fs.cpSync(templateDir, dir, { recursive: true });
  return dir;
}
