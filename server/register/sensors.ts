/**
 * Registering anemometers: key (the MQTT topic level), name, mounting height, where it stands,
 * the unit its payloads use, whether it sends raw samples or ready summaries, and how long it
 * may stay silent before it raises a sensor alert.
 */
import { z } from 'zod';
import { maxLabelLength, maxNameLength, maxSensorHeightM } from '../engine/limits.ts';
import { speedUnits } from '../engine/units.ts';
import { Conflict, NotFound } from '../domainErrors.ts';
import { sensorKeyPattern } from '../ingest/topic.ts';
import type { SensorRow } from '../storage/sensors.ts';
import type { Storage } from '../storage/storage.ts';

/** design.md 2.4: a sensor silent for longer than its timeout raises an alert; default 30 s. */
export const defaultSilenceTimeoutMs = 30_000;

/** What a sensor sends (design §2.2): raw speed samples (the server computes gust and mean), or ready summaries. */
export const sensorModes = ['samples', 'summaries'] as const;

export const sensorInputSchema = z.strictObject({
  key: z.string().regex(sensorKeyPattern, 'key must be 1–64 characters of a-z, 0-9 and -'),
  name: z.string().trim().min(1, 'name must not be empty').max(maxNameLength),
  /** Height of the cups or sonic head above ground, m. */
  heightM: z.number().gt(0, 'height must be above 0 m').lte(maxSensorHeightM, `height must be at most ${maxSensorHeightM} m`),
  location: z.string().trim().max(maxLabelLength).default(''),
  latDeg: z.number().min(-90).max(90).nullable().default(null),
  lonDeg: z.number().min(-180).max(180).nullable().default(null),
  unit: z.enum(speedUnits).default('m/s'),
  mode: z.enum(sensorModes).default('samples'),
  silenceTimeoutMs: z.number().int().min(2_000, 'at least 2 s').max(3_600_000, 'at most 1 h').default(defaultSilenceTimeoutMs),
});
export type SensorInput = z.infer<typeof sensorInputSchema>;
export const sensorUpdateSchema = sensorInputSchema.omit({ key: true }).partial();

export type SensorRecord = SensorRow;

export async function listSensors(storage: Storage): Promise<SensorRecord[]> {
  return (await storage.sensors.all()).filter((s) => s.retiredAtMs === null);
}

export async function getSensor(storage: Storage, key: string): Promise<SensorRecord> {
  const row = await storage.sensors.byKey(key);
  if (!row || row.retiredAtMs !== null) throw new NotFound(`sensor "${key}"`);
  return row;
}

export async function createSensor(storage: Storage, siteId: number, input: SensorInput, actor: string, nowMs: number): Promise<SensorRecord> {
  return await storage.transaction(async () => {
    const existing = await storage.sensors.byKey(input.key);
    if (existing && existing.retiredAtMs === null) throw new Conflict(`a sensor with key "${input.key}" exists`);
    let row: SensorRecord;
    if (existing) {
      // A retired key comes back into use: keep its id so its history stays with it.
      row = await storage.sensors.update(existing.id, { ...input, siteId, retiredAtMs: null });
    } else {
      row = await storage.sensors.insert({ ...input, siteId, createdAtMs: nowMs });
    }
    await storage.audit.record({ actor, entity: 'sensor', entityId: input.key, action: 'create', after: row }, nowMs);
    return row;
  });
}

export async function updateSensor(storage: Storage, key: string, patch: z.infer<typeof sensorUpdateSchema>, actor: string, nowMs: number): Promise<SensorRecord> {
  return await storage.transaction(async () => {
    const before = await getSensor(storage, key);
    const after = await storage.sensors.update(before.id, patch);
    await storage.audit.record({ actor, entity: 'sensor', entityId: key, action: 'update', before, after }, nowMs);
    return after;
  });
}

/** Retires a sensor: its readings stay in the log, its topic is refused from now on. */
export async function retireSensor(storage: Storage, key: string, actor: string, nowMs: number): Promise<void> {
  await storage.transaction(async () => {
    const before = await getSensor(storage, key);
    await storage.sensors.retire(before.id, nowMs);
    await storage.audit.record({ actor, entity: 'sensor', entityId: key, action: 'retire', before }, nowMs);
  });
}
