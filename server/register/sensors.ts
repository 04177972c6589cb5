/**
 * Registering anemometers: key (the MQTT topic level), name, mounting height, where it stands,
 * the unit its payloads use, whether it sends raw samples or ready summaries, and how long it
 * may stay silent before it raises a sensor alert.
 */
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { gatewaySensorsTable, sensorsTable } from '../../db/schema.ts';
import { speedUnits } from '../engine/units.ts';
import { HttpError } from '../http/httpError.ts';
import { sensorKeyPattern } from '../ingest/topic.ts';
import type { Db, Tx } from '../storage/database.ts';
import { recordAudit } from './audit.ts';

/** design.md 2.4: a sensor silent for longer than its timeout raises an alert; default 30 s. */
export const defaultSilenceTimeoutMs = 30_000;

export const sensorInputSchema = z.strictObject({
  key: z.string().regex(sensorKeyPattern, 'key must be 1–64 characters of a-z, 0-9 and -'),
  name: z.string().trim().min(1, 'name must not be empty').max(100),
  /** Height of the cups or sonic head above ground, m. */
  heightM: z.number().gt(0, 'height must be above 0 m').lte(300, 'height must be at most 300 m'),
  location: z.string().trim().max(200).default(''),
  latDeg: z.number().min(-90).max(90).nullable().default(null),
  lonDeg: z.number().min(-180).max(180).nullable().default(null),
  unit: z.enum(speedUnits).default('m/s'),
  mode: z.enum(['samples', 'summaries']).default('samples'),
  silenceTimeoutMs: z.number().int().min(2_000, 'at least 2 s').max(3_600_000, 'at most 1 h').default(defaultSilenceTimeoutMs),
});
export type SensorInput = z.infer<typeof sensorInputSchema>;
export const sensorUpdateSchema = sensorInputSchema.omit({ key: true }).partial();

export type SensorRecord = typeof sensorsTable.$inferSelect;

export function listSensors(db: Db): SensorRecord[] {
  return db.select().from(sensorsTable).all().filter((s) => s.retiredAtMs === null);
}

export function getSensor(db: Tx, key: string): SensorRecord {
  const row = db.select().from(sensorsTable).where(eq(sensorsTable.key, key)).get();
  if (!row || row.retiredAtMs !== null) throw HttpError.notFound(`sensor "${key}"`);
  return row;
}

export function createSensor(db: Db, siteId: number, input: SensorInput, actor: string, nowMs: number): SensorRecord {
  return db.transaction((tx) => {
    const existing = tx.select().from(sensorsTable).where(eq(sensorsTable.key, input.key)).get();
    if (existing && existing.retiredAtMs === null) throw new HttpError(409, `a sensor with key "${input.key}" exists`);
    let row: SensorRecord;
    if (existing) {
      // A retired key comes back into use: keep its id so its history stays with it.
      row = tx.update(sensorsTable).set({ ...input, siteId, retiredAtMs: null }).where(eq(sensorsTable.id, existing.id)).returning().get();
    } else {
      row = tx.insert(sensorsTable).values({ ...input, siteId, createdAtMs: nowMs }).returning().get();
    }
    recordAudit(tx, { actor, entity: 'sensor', entityId: input.key, action: 'create', after: row }, nowMs);
    return row;
  });
}

export function updateSensor(db: Db, key: string, patch: z.infer<typeof sensorUpdateSchema>, actor: string, nowMs: number): SensorRecord {
  return db.transaction((tx) => {
    const before = getSensor(tx, key);
    const after = tx.update(sensorsTable).set(patch).where(eq(sensorsTable.id, before.id)).returning().get();
    recordAudit(tx, { actor, entity: 'sensor', entityId: key, action: 'update', before, after }, nowMs);
    return after;
  });
}

/** Retires a sensor: its readings stay in the log, its topic is refused from now on. */
export function retireSensor(db: Db, key: string, actor: string, nowMs: number): void {
  db.transaction((tx) => {
    const before = getSensor(tx, key);
    tx.update(sensorsTable).set({ retiredAtMs: nowMs }).where(eq(sensorsTable.id, before.id)).run();
    tx.delete(gatewaySensorsTable).where(eq(gatewaySensorsTable.sensorId, before.id)).run();
    recordAudit(tx, { actor, entity: 'sensor', entityId: key, action: 'retire', before }, nowMs);
  });
}
