/**
 * The whole register as one file, JSON or CSV, for moving a site's plan between servers,
 * keeping it with the event's paperwork, or editing many structures in a spreadsheet.
 *
 * JSON: `{format: "holdfast-register", version: 1, exportedAtMs, site, sensors, gateways,
 * structures}`. Gateways carry their name, username and sensors, never a password: an import
 * does not create credentials (make them again; the old passwords stay with the old server).
 *
 * CSV: one row per item, an `entity` column saying which (site, sensor, gateway, structure); the
 * columns that do not apply stay empty. Structure records and level lists are JSON text in their
 * cells, so the round trip loses nothing.
 *
 * Import validates everything first and changes nothing when anything is wrong. 'merge' adds and
 * updates (sensors by key, structures by name); 'replace' also retires what the file leaves out.
 */
import { eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { sensorsTable, sitesTable, structuresTable } from '../../db/schema.ts';
import { HttpError, type FieldIssue } from '../http/httpError.ts';
import type { Db } from '../storage/database.ts';
import { recordAudit } from './audit.ts';
import { CsvError, parseCsv, toCsv, unguard } from './csv.ts';
import { listGateways } from './gateways.ts';
import { listSensors, sensorInputSchema } from './sensors.ts';
import { getSite, siteUpdateSchema } from './site.ts';
import { checkStructure, listStructures, structureColumns, structureInputSchema, structureView } from './structures.ts';

export const registerFormat = 'holdfast-register';

const siteFileSchema = z.strictObject({
  name: z.string(),
  altitudeM: z.number(),
  terrainCategory: z.string(),
  timeZone: z.string(),
  airDensityMode: z.string(),
  fixedAirDensityKgM3: z.number().nullable(),
  heightReductionEnabled: z.boolean(),
  directionalEnabled: z.boolean(),
  directionSectorHalfWidthDeg: z.number().min(15).max(180).default(45),
  deadBandFraction: z.number(),
  holdTimeMs: z.number(),
  actionDueMs: z.number().min(60_000).max(3_600_000).default(300_000),
  // The forecast feed (issue 17); files written before it have none.
  forecastFeedUrl: z.string().nullable().default(null),
  forecastFeedIntervalMs: z.number().default(30 * 60_000),
  forecastFeedUnit: z.string().nullable().default(null),
  forecastFeedHeightM: z.number().default(10),
  defaultLevels: z.unknown(),
});

const structureFileSchema = structureInputSchema;
const gatewayFileSchema = z.strictObject({ name: z.string(), username: z.string(), sensorKeys: z.array(z.string()) });

export const registerSchema = z.strictObject({
  format: z.literal(registerFormat),
  version: z.literal(1),
  exportedAtMs: z.number().optional(),
  site: siteFileSchema,
  sensors: z.array(sensorInputSchema).max(1000),
  gateways: z.array(gatewayFileSchema).max(1000).default([]),
  structures: z.array(structureFileSchema).max(5000),
});
export type RegisterFile = z.infer<typeof registerSchema>;

export function exportRegister(db: Db, nowMs: number): RegisterFile {
  const site = getSite(db);
  return {
    format: registerFormat,
    version: 1,
    exportedAtMs: nowMs,
    site: {
      name: site.name,
      altitudeM: site.altitudeM,
      terrainCategory: site.terrainCategory,
      timeZone: site.timeZone,
      airDensityMode: site.airDensityMode,
      fixedAirDensityKgM3: site.fixedAirDensityKgM3,
      heightReductionEnabled: site.heightReductionEnabled,
      directionalEnabled: site.directionalEnabled,
      directionSectorHalfWidthDeg: site.directionSectorHalfWidthDeg,
      deadBandFraction: site.deadBandFraction,
      holdTimeMs: site.holdTimeMs,
      actionDueMs: site.actionDueMs,
      forecastFeedUrl: site.forecastFeedUrl,
      forecastFeedIntervalMs: site.forecastFeedIntervalMs,
      forecastFeedUnit: site.forecastFeedUnit,
      forecastFeedHeightM: site.forecastFeedHeightM,
      defaultLevels: site.defaultLevelsJson,
    },
    sensors: listSensors(db).map((s) => ({
      key: s.key,
      name: s.name,
      heightM: s.heightM,
      location: s.location,
      latDeg: s.latDeg,
      lonDeg: s.lonDeg,
      unit: s.unit as RegisterFile['sensors'][number]['unit'],
      mode: s.mode as 'samples' | 'summaries',
      silenceTimeoutMs: s.silenceTimeoutMs,
    })),
    gateways: listGateways(db)
      .filter((g) => g.revokedAtMs === null)
      .map((g) => ({ name: g.name, username: g.username, sensorKeys: g.sensorKeys })),
    structures: listStructures(db).map((s) => ({
      record: s.record,
      orientationDeg: s.orientationDeg,
      location: s.location,
      latDeg: s.latDeg,
      lonDeg: s.lonDeg,
      mobile: s.mobile,
      sensorKeys: s.sensorKeys,
      levels: s.levels,
    })),
  };
}

const csvHeader = [
  'entity',
  'key',
  'name',
  'heightM',
  'location',
  'latDeg',
  'lonDeg',
  'unit',
  'mode',
  'silenceTimeoutMs',
  'orientationDeg',
  'mobile',
  'sensorKeys',
  'levels_json',
  'record_json',
  'settings_json',
] as const;

export function registerCsv(file: RegisterFile): string {
  type Cell = string | number | boolean | null;
  const rows: Array<Partial<Record<(typeof csvHeader)[number], Cell>>> = [];
  const { name, ...settings } = file.site;
  rows.push({ entity: 'site', name, settings_json: JSON.stringify(settings) });
  for (const s of file.sensors) {
    rows.push({ entity: 'sensor', key: s.key, name: s.name, heightM: s.heightM, location: s.location, latDeg: s.latDeg, lonDeg: s.lonDeg, unit: s.unit, mode: s.mode, silenceTimeoutMs: s.silenceTimeoutMs });
  }
  for (const g of file.gateways) rows.push({ entity: 'gateway', key: g.username, name: g.name, sensorKeys: g.sensorKeys.join(' ') });
  for (const s of file.structures) {
    rows.push({
      entity: 'structure',
      name: (s.record as { name?: string }).name ?? '',
      location: s.location,
      latDeg: s.latDeg,
      lonDeg: s.lonDeg,
      orientationDeg: s.orientationDeg,
      mobile: s.mobile,
      sensorKeys: (s.sensorKeys ?? []).join(' '),
      levels_json: s.levels === null ? '' : JSON.stringify(s.levels),
      record_json: JSON.stringify(s.record),
    });
  }
  return toCsv(csvHeader, rows.map((row) => csvHeader.map((column) => row[column] ?? '')));
}

/** Reads a register CSV back into the JSON shape; 400 naming the line and column of any problem. */
export function registerFromCsv(text: string): RegisterFile {
  let rows: string[][];
  try {
    rows = parseCsv(text);
  } catch (err) {
    throw HttpError.invalid([{ path: '', message: err instanceof CsvError ? err.message : String(err) }]);
  }
  const header = rows[0] ?? [];
  const missing = csvHeader.filter((h) => !header.includes(h));
  if (missing.length > 0) throw HttpError.invalid([{ path: 'header', message: `missing columns: ${missing.join(', ')}` }]);
  // Undo the spreadsheet guard of csv.ts: a quote mark put before = + - @ on export.
  const col = (row: string[], name: (typeof csvHeader)[number]): string => unguard(row[header.indexOf(name)] ?? '');
  const num = (v: string): number | null => (v.trim() === '' ? null : Number(v));
  const issues: FieldIssue[] = [];
  const json = (v: string, line: number, column: string): unknown => {
    if (v.trim() === '') return null;
    try {
      return JSON.parse(v);
    } catch {
      issues.push({ path: `line ${line}.${column}`, message: 'is not valid JSON' });
      return null;
    }
  };
  let site: unknown = null;
  const sensors: unknown[] = [];
  const gateways: unknown[] = [];
  const structures: unknown[] = [];
  rows.slice(1).forEach((row, i) => {
    const line = i + 2;
    const entity = col(row, 'entity');
    const keys = col(row, 'sensorKeys').trim();
    switch (entity) {
      case 'site': {
        const settings = json(col(row, 'settings_json'), line, 'settings_json');
        site = { name: col(row, 'name'), ...(settings as object) };
        break;
      }
      case 'sensor':
        sensors.push({
          key: col(row, 'key'),
          name: col(row, 'name'),
          heightM: num(col(row, 'heightM')),
          location: col(row, 'location'),
          latDeg: num(col(row, 'latDeg')),
          lonDeg: num(col(row, 'lonDeg')),
          unit: col(row, 'unit'),
          mode: col(row, 'mode'),
          silenceTimeoutMs: num(col(row, 'silenceTimeoutMs')),
        });
        break;
      case 'gateway':
        gateways.push({ name: col(row, 'name'), username: col(row, 'key'), sensorKeys: keys === '' ? [] : keys.split(/\s+/) });
        break;
      case 'structure':
        structures.push({
          record: json(col(row, 'record_json'), line, 'record_json'),
          orientationDeg: num(col(row, 'orientationDeg')) ?? 0,
          location: col(row, 'location'),
          latDeg: num(col(row, 'latDeg')),
          lonDeg: num(col(row, 'lonDeg')),
          mobile: col(row, 'mobile') === 'true',
          sensorKeys: keys === '' ? null : keys.split(/\s+/),
          levels: json(col(row, 'levels_json'), line, 'levels_json'),
        });
        break;
      default:
        issues.push({ path: `line ${line}.entity`, message: `"${entity}" is not site, sensor, gateway or structure` });
    }
  });
  if (issues.length > 0) throw HttpError.invalid(issues);
  const parsed = registerSchema.safeParse({ format: registerFormat, version: 1, site, sensors, gateways, structures });
  if (!parsed.success) {
    throw HttpError.invalid(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message })));
  }
  return parsed.data;
}

export interface ImportSummary {
  siteUpdated: boolean;
  sensorsAdded: number;
  sensorsUpdated: number;
  sensorsRetired: number;
  structuresAdded: number;
  structuresUpdated: number;
  structuresRetired: number;
  gatewaysSkipped: number;
}

/** Applies a register file in one transaction, after checking all of it. */
export function importRegister(db: Db, file: RegisterFile, mode: 'merge' | 'replace', actor: string, nowMs: number): ImportSummary {
  const siteCheck = siteUpdateSchema.safeParse(file.site);
  if (!siteCheck.success) {
    throw HttpError.invalid(siteCheck.error.issues.map((i) => ({ path: ['register', 'site', ...i.path.map(String)].join('.'), message: i.message })));
  }
  const keys = new Set<string>();
  const names = new Set<string>();
  const issues: FieldIssue[] = [];
  file.sensors.forEach((s, i) => {
    if (keys.has(s.key)) issues.push({ path: `register.sensors.${i}.key`, message: `"${s.key}" is listed twice` });
    keys.add(s.key);
  });
  file.structures.forEach((s, i) => {
    const name = (s.record as { name?: unknown } | null)?.name;
    if (typeof name === 'string') {
      if (names.has(name)) issues.push({ path: `register.structures.${i}.record.name`, message: `"${name}" is listed twice` });
      names.add(name);
    }
  });
  if (issues.length > 0) throw HttpError.invalid(issues);

  return db.transaction((tx) => {
    const summary: ImportSummary = { siteUpdated: true, sensorsAdded: 0, sensorsUpdated: 0, sensorsRetired: 0, structuresAdded: 0, structuresUpdated: 0, structuresRetired: 0, gatewaysSkipped: file.gateways.length };
    const site = getSite(tx);
    const { defaultLevels, ...siteRest } = siteCheck.data;
    tx.update(sitesTable)
      .set({ ...siteRest, ...(defaultLevels ? { defaultLevelsJson: defaultLevels } : {}), updatedAtMs: nowMs })
      .where(eq(sitesTable.id, site.id))
      .run();

    const existingSensors = new Map(tx.select().from(sensorsTable).all().map((s) => [s.key, s]));
    for (const s of file.sensors) {
      const old = existingSensors.get(s.key);
      if (old) {
        tx.update(sensorsTable).set({ ...s, retiredAtMs: null }).where(eq(sensorsTable.id, old.id)).run();
        if (old.retiredAtMs === null) summary.sensorsUpdated++;
        else summary.sensorsAdded++;
      } else {
        tx.insert(sensorsTable).values({ ...s, siteId: site.id, createdAtMs: nowMs }).run();
        summary.sensorsAdded++;
      }
    }
    if (mode === 'replace') {
      for (const old of existingSensors.values()) {
        if (old.retiredAtMs === null && !keys.has(old.key)) {
          tx.update(sensorsTable).set({ retiredAtMs: nowMs }).where(eq(sensorsTable.id, old.id)).run();
          summary.sensorsRetired++;
        }
      }
    }

    const existingStructures = new Map(tx.select().from(structuresTable).where(isNull(structuresTable.retiredAtMs)).all().map((s) => [s.name, s]));
    const structureIssues: FieldIssue[] = [];
    file.structures.forEach((input, i) => {
      let record;
      try {
        record = checkStructure(tx, input);
      } catch (err) {
        if (err instanceof HttpError && err.issues) {
          structureIssues.push(...err.issues.map((issue) => ({ path: `register.structures.${i}.${issue.path}`, message: issue.message })));
          return;
        }
        throw err;
      }
      const values = { ...structureColumns(input, record), updatedAtMs: nowMs };
      const old = existingStructures.get(record.name);
      // Each structure's record (its configurations included) goes into the audit trail, as a change through the API does.
      if (old) {
        const after = structureView(tx.update(structuresTable).set(values).where(eq(structuresTable.id, old.id)).returning().get()!);
        recordAudit(tx, { actor, entity: 'structure', entityId: old.id, action: `import (${mode})`, before: structureView(old), after }, nowMs);
        summary.structuresUpdated++;
      } else {
        const after = structureView(tx.insert(structuresTable).values({ ...values, siteId: site.id, createdAtMs: nowMs }).returning().get());
        recordAudit(tx, { actor, entity: 'structure', entityId: after.id, action: `import (${mode})`, after }, nowMs);
        summary.structuresAdded++;
      }
    });
    if (structureIssues.length > 0) throw HttpError.invalid(structureIssues);
    if (mode === 'replace') {
      for (const old of existingStructures.values()) {
        if (!names.has(old.name)) {
          tx.update(structuresTable).set({ retiredAtMs: nowMs }).where(eq(structuresTable.id, old.id)).run();
          summary.structuresRetired++;
        }
      }
    }
    recordAudit(tx, { actor, entity: 'register', entityId: site.id, action: `import (${mode})`, after: summary }, nowMs);
    return summary;
  });
}

