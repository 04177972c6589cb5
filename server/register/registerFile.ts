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
import { z } from 'zod';
import { Conflict, Invalid } from '../domainErrors.ts';
import { issuePaths, type PathIssue as FieldIssue } from '../engine/issueWords.ts';
import type { Storage } from '../storage/storage.ts';
import { CsvError, parseCsv, toCsv, unguard } from './csv.ts';
import { listGateways } from './gateways.ts';
import { listSensors, sensorInputSchema } from './sensors.ts';
import { getSite } from './site.ts';
import { settingsOf, siteFileSchema, siteView } from './siteSettings.ts';
import { createStructure, listStructures, structureInputSchema, updateStructure } from './structures.ts';

export const registerFormat = 'holdfast-register';

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

export async function exportRegister(storage: Storage, nowMs: number): Promise<RegisterFile> {
  const site = await getSite(storage);
  return {
    format: registerFormat,
    version: 1,
    exportedAtMs: nowMs,
    site: settingsOf(siteView(site)),
    sensors: (await listSensors(storage)).map((s) => ({
      key: s.key,
      name: s.name,
      heightM: s.heightM,
      location: s.location,
      latDeg: s.latDeg,
      lonDeg: s.lonDeg,
      unit: s.unit,
      mode: s.mode,
      silenceTimeoutMs: s.silenceTimeoutMs,
    })),
    gateways: (await listGateways(storage))
      .filter((g) => g.revokedAtMs === null)
      .map((g) => ({ name: g.name, username: g.username, sensorKeys: g.sensorKeys })),
    structures: (await listStructures(storage)).map((s) => ({
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
    throw new Invalid([{ path: '', message: err instanceof CsvError ? err.message : String(err) }]);
  }
  const header = rows[0] ?? [];
  const missing = csvHeader.filter((h) => !header.includes(h));
  if (missing.length > 0) throw new Invalid([{ path: 'header', message: `missing columns: ${missing.join(', ')}` }]);
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
  if (issues.length > 0) throw new Invalid(issues);
  const parsed = registerSchema.safeParse({ format: registerFormat, version: 1, site, sensors, gateways, structures });
  if (!parsed.success) {
    throw new Invalid(issuePaths(parsed.error.issues));
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
export async function importRegister(storage: Storage, file: RegisterFile, mode: 'merge' | 'replace', actor: string, nowMs: number): Promise<ImportSummary> {
  // file.site was checked whole by siteFileSchema (the settings' one schema) when the file was read.
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
  if (issues.length > 0) throw new Invalid(issues);

  return await storage.transaction(async () => {
    const summary: ImportSummary = { siteUpdated: true, sensorsAdded: 0, sensorsUpdated: 0, sensorsRetired: 0, structuresAdded: 0, structuresUpdated: 0, structuresRetired: 0, gatewaysSkipped: file.gateways.length };
    const site = await getSite(storage);
    const { defaultLevels, ...siteRest } = file.site;
    await storage.site.update(site.id, { ...siteRest, ...(defaultLevels ? { defaultLevelsJson: defaultLevels } : {}), updatedAtMs: nowMs });

    const existingSensors = new Map((await storage.sensors.all()).map((s) => [s.key, s]));
    for (const s of file.sensors) {
      const old = existingSensors.get(s.key);
      if (old) {
        await storage.sensors.update(old.id, { ...s, retiredAtMs: null });
        if (old.retiredAtMs === null) summary.sensorsUpdated++;
        else summary.sensorsAdded++;
      } else {
        await storage.sensors.insert({ ...s, siteId: site.id, createdAtMs: nowMs });
        summary.sensorsAdded++;
      }
    }
    if (mode === 'replace') {
      for (const old of existingSensors.values()) {
        if (old.retiredAtMs === null && !keys.has(old.key)) {
          await storage.sensors.update(old.id, { retiredAtMs: nowMs });
          summary.sensorsRetired++;
        }
      }
    }

    const existingStructures = new Map((await storage.structures.active()).map((s) => [s.name, s]));
    const structureIssues: FieldIssue[] = [];
    // The same upserts as a single edit through the API (checked whole, name free, an audit row
    // each, its configurations included), here inside the import's one transaction: every
    // structure's problems are gathered, then the whole import is refused if any had one.
    for (const [i, input] of file.structures.entries()) {
      const name = (input.record as { name?: unknown } | null)?.name;
      const old = typeof name === 'string' ? existingStructures.get(name) : undefined;
      try {
        if (old) {
          await updateStructure(storage, old.id, input, actor, nowMs, `import (${mode})`);
          summary.structuresUpdated++;
        } else {
          await createStructure(storage, site.id, input, actor, nowMs, `import (${mode})`);
          summary.structuresAdded++;
        }
      } catch (err) {
        if (err instanceof Invalid) {
          structureIssues.push(...err.issues.map((issue) => ({ path: `register.structures.${i}.${issue.path}`, message: issue.message })));
          continue;
        }
        if (err instanceof Conflict) {
          structureIssues.push({ path: `register.structures.${i}.record.name`, message: err.message });
          continue;
        }
        throw err;
      }
    }
    if (structureIssues.length > 0) throw new Invalid(structureIssues);
    if (mode === 'replace') {
      for (const old of existingStructures.values()) {
        if (!names.has(old.name)) {
          await storage.structures.update(old.id, { retiredAtMs: nowMs });
          summary.structuresRetired++;
        }
      }
    }
    await storage.audit.record({ actor, entity: 'register', entityId: site.id, action: `import (${mode})`, after: summary }, nowMs);
    return summary;
  });
}

