/** Registered anemometers (retired ones stay, so their history keeps its name). */
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { gatewaySensorsTable, sensorsTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type SensorRow = typeof sensorsTable.$inferSelect;
export type NewSensor = Omit<typeof sensorsTable.$inferInsert, 'id'>;
export type SensorChanges = Partial<Omit<SensorRow, 'id' | 'key' | 'createdAtMs'>>;

export class SensorStore {
  constructor(private readonly db: Db) {}

  /** Every sensor, retired ones too. */
  all(): SensorRow[] {
    return this.db.select().from(sensorsTable).all();
  }

  active(): SensorRow[] {
    return this.db.select().from(sensorsTable).where(isNull(sensorsTable.retiredAtMs)).all();
  }

  /** A sensor by key, retired or not. */
  byKey(key: string): SensorRow | undefined {
    return this.db.select().from(sensorsTable).where(eq(sensorsTable.key, key)).get();
  }

  byId(id: number): SensorRow | undefined {
    return this.db.select().from(sensorsTable).where(eq(sensorsTable.id, id)).get();
  }

  /** The active sensors among these keys. */
  activeWithKeys(keys: readonly string[]): SensorRow[] {
    if (keys.length === 0) return [];
    return this.db.select().from(sensorsTable).where(and(inArray(sensorsTable.key, [...keys]), isNull(sensorsTable.retiredAtMs))).all();
  }

  insert(values: NewSensor): SensorRow {
    return this.db.insert(sensorsTable).values(values).returning().get();
  }

  update(id: number, changes: SensorChanges): SensorRow {
    return this.db.update(sensorsTable).set(changes).where(eq(sensorsTable.id, id)).returning().get();
  }

  /** Retires a sensor and takes it off every gateway. */
  retire(id: number, atMs: number): void {
    this.db.update(sensorsTable).set({ retiredAtMs: atMs }).where(eq(sensorsTable.id, id)).run();
    this.db.delete(gatewaySensorsTable).where(eq(gatewaySensorsTable.sensorId, id)).run();
  }
}
