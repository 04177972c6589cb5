/**
 * Registering structures: the engine record (kind and dimensions, coefficients with sources,
 * masses and ballast, safety factors, rated gust) plus where it stands and faces, which sensors
 * govern it, whether it moves, and its own levels when the site's defaults do not fit.
 * Every change is written to the audit trail in the same transaction.
 */
import { z } from 'zod';
import { maxLabelLength, recordConfigurations, sameConfigurationName, siteDesignDensityKgM3, validateStructureRecord, type StructureRecord } from '../engine/index.ts';
import type { PathIssue as FieldIssue } from '../engine/issueWords.ts';
import { Conflict, Invalid, NotFound } from '../domainErrors.ts';
import { levelListSchema, type LevelDefinition } from '../levels/index.ts';
import type { Storage } from '../storage/storage.ts';
import type { StructureRow } from '../storage/structures.ts';
import { structureLevelIssues } from './levelCheck.ts';
import { getSite } from './site.ts';

export const structureInputSchema = z.strictObject({
  /** The engine record: kind, name, dimensions, coefficients, masses (design.md 4). */
  record: z.unknown(),
  /** Azimuth the front faces toward, degrees clockwise from north. */
  orientationDeg: z.number().min(0).max(360).default(0),
  location: z.string().trim().max(maxLabelLength).default(''),
  latDeg: z.number().min(-90).max(90).nullable().default(null),
  lonDeg: z.number().min(-180).max(180).nullable().default(null),
  mobile: z.boolean().default(false),
  /** Sensors whose wind governs; null or [] = every sensor on the site, the highest wins. */
  sensorKeys: z.array(z.string()).max(200).nullable().default(null),
  /** Own levels; null = the site's defaults. */
  levels: levelListSchema.nullable().default(null),
});
export type StructureInput = z.infer<typeof structureInputSchema>;
export const structureUpdateSchema = structureInputSchema.partial();

export type { StructureRow };

export interface StructureView {
  id: number;
  name: string;
  kind: string;
  record: StructureRecord;
  orientationDeg: number;
  location: string;
  latDeg: number | null;
  lonDeg: number | null;
  mobile: boolean;
  sensorKeys: string[] | null;
  /** Own levels, or null when the site's defaults apply. */
  levels: LevelDefinition[] | null;
  createdAtMs: number;
  updatedAtMs: number;
}

export function structureView(row: StructureRow): StructureView {
  return {
    id: row.id,
    name: row.name,
    kind: row.kind,
    record: row.recordJson as StructureRecord,
    orientationDeg: row.orientationDeg,
    location: row.location,
    latDeg: row.latDeg,
    lonDeg: row.lonDeg,
    mobile: row.mobile,
    sensorKeys: (row.sensorKeysJson as string[] | null) ?? null,
    levels: (row.levelsJson as LevelDefinition[] | null) ?? null,
    createdAtMs: row.createdAtMs,
    updatedAtMs: row.updatedAtMs,
  };
}

/**
 * Checks a structure as a whole: the record (every field), that its sensors exist, and that its
 * levels' trigger gusts rise from level to level and stay below the effective limit at the
 * site's design density. Returns the parsed
 * record or throws 400 naming every problem.
 */
export async function checkStructure(storage: Storage, input: StructureInput): Promise<StructureRecord> {
  const issues: FieldIssue[] = [];
  const validation = validateStructureRecord(input.record);
  if (!validation.ok) issues.push(...validation.issues.map((i) => ({ path: i.path ? `record.${i.path}` : 'record', message: i.message })));
  if (input.sensorKeys && input.sensorKeys.length > 0) {
    const known = new Set((await storage.sensors.active()).map((r) => r.key));
    input.sensorKeys.forEach((key, i) => {
      if (!known.has(key)) issues.push({ path: `sensorKeys.${i}`, message: `no sensor is registered with key "${key}"` });
    });
  }
  if (!validation.ok) throw new Invalid(issues);
  const record = validation.record;
  try {
    const site = await getSite(storage);
    // Mixed utilization and gust triggers can only be ordered once the structure is known; a
    // gust trigger at or above the effective limit would let the structure pass its limit first.
    // The same check the form's calculator shows (POST /api/assess at the design density).
    issues.push(...structureLevelIssues(record, input.levels ?? site.defaultLevelsJson, siteDesignDensityKgM3(site), input.levels === null));
    const configured = recordConfigurations(record);
    // A level's action may move the structure only to a configuration it has.
    (input.levels ?? []).forEach((level, i) => {
      if (level.moveToConfiguration === undefined) return;
      if (!configured.some((c) => sameConfigurationName(c.name, level.moveToConfiguration!))) {
        issues.push({ path: `levels.${i}.moveToConfiguration`, message: `"${level.moveToConfiguration}" is not a configuration of this structure (it has ${configured.map((c) => `"${c.name}"`).join(', ')}); add it under configurations first` });
      }
    });
  } catch (err) {
    issues.push({ path: 'record', message: err instanceof Error ? err.message : String(err) });
  }
  if (issues.length > 0) throw new Invalid(issues);
  return record;
}

export async function listStructures(storage: Storage): Promise<StructureView[]> {
  return (await storage.structures.activeByName()).map(structureView);
}

export async function getStructureRow(storage: Storage, id: number): Promise<StructureRow> {
  const row = await storage.structures.byId(id);
  if (!row || row.retiredAtMs !== null) throw new NotFound(`structure ${id}`);
  return row;
}

/** The table's columns for a checked structure (the record's name and kind are columns too). */
export function structureColumns(input: StructureInput, record: StructureRecord) {
  return {
    name: record.name,
    kind: record.kind,
    recordJson: record,
    orientationDeg: input.orientationDeg,
    location: input.location,
    latDeg: input.latDeg,
    lonDeg: input.lonDeg,
    mobile: input.mobile,
    sensorKeysJson: input.sensorKeys && input.sensorKeys.length > 0 ? input.sensorKeys : null,
    levelsJson: input.levels,
  };
}

/** Structures are known by name on the board, in the log and in register files: one active structure per name. */
async function assertNameFree(storage: Storage, name: string, exceptId: number | null): Promise<void> {
  const clash = (await storage.structures.activeNamed(name)).find((r) => r.id !== exceptId);
  if (clash) throw new Conflict(`a structure named "${name}" is registered (id ${clash.id}); choose another name`);
}

/**
 * Registers a structure: checked whole, its name free, one audit row. A register import calls it
 * per structure inside its own transaction (a savepoint here), with its own `action` words.
 */
export async function createStructure(storage: Storage, siteId: number, input: StructureInput, actor: string, nowMs: number, action = 'create'): Promise<StructureView> {
  return await storage.transaction(async () => {
    const record = await checkStructure(storage, input);
    await assertNameFree(storage, record.name, null);
    const row = await storage.structures.insert({ siteId, ...structureColumns(input, record), createdAtMs: nowMs, updatedAtMs: nowMs });
    const view = structureView(row);
    await storage.audit.record({ actor, entity: 'structure', entityId: row.id, action, after: view }, nowMs);
    return view;
  });
}

/** Changes a structure: the result checked whole, its name free, one audit row with before and after. */
export async function updateStructure(storage: Storage, id: number, patch: z.infer<typeof structureUpdateSchema>, actor: string, nowMs: number, action = 'update'): Promise<StructureView> {
  return await storage.transaction(async () => {
    const before = structureView(await getStructureRow(storage, id));
    const merged: StructureInput = {
      record: patch.record ?? before.record,
      orientationDeg: patch.orientationDeg ?? before.orientationDeg,
      location: patch.location ?? before.location,
      latDeg: patch.latDeg === undefined ? before.latDeg : patch.latDeg,
      lonDeg: patch.lonDeg === undefined ? before.lonDeg : patch.lonDeg,
      mobile: patch.mobile ?? before.mobile,
      sensorKeys: patch.sensorKeys === undefined ? before.sensorKeys : patch.sensorKeys,
      levels: patch.levels === undefined ? before.levels : patch.levels,
    };
    const record = await checkStructure(storage, merged);
    await assertNameFree(storage, record.name, id);
    const row = await storage.structures.update(id, { ...structureColumns(merged, record), updatedAtMs: nowMs });
    const after = structureView(row);
    await storage.audit.record({ actor, entity: 'structure', entityId: id, action, before, after }, nowMs);
    return after;
  });
}

/** Retires a structure: it leaves the live board, its history stays in the log. */
export async function retireStructure(storage: Storage, id: number, actor: string, nowMs: number): Promise<void> {
  await storage.transaction(async () => {
    const before = structureView(await getStructureRow(storage, id));
    await storage.structures.update(id, { retiredAtMs: nowMs, updatedAtMs: nowMs });
    await storage.audit.record({ actor, entity: 'structure', entityId: id, action: 'retire', before }, nowMs);
  });
}
