/** Gateways (MQTT credentials, the password as a scrypt hash) and the sensors each may publish for. */
import { and, eq, isNull } from 'drizzle-orm';
import { gatewaySensorsTable, gatewaysTable, sensorsTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type GatewayRow = typeof gatewaysTable.$inferSelect;
export type NewGateway = Omit<typeof gatewaysTable.$inferInsert, 'id'>;

export class GatewayStore {
  constructor(private readonly db: Db) {}

  all(): GatewayRow[] {
    return this.db.select().from(gatewaysTable).orderBy(gatewaysTable.id).all();
  }

  active(): GatewayRow[] {
    return this.db.select().from(gatewaysTable).where(isNull(gatewaysTable.revokedAtMs)).all();
  }

  byId(id: number): GatewayRow | undefined {
    return this.db.select().from(gatewaysTable).where(eq(gatewaysTable.id, id)).get();
  }

  byUsername(username: string): GatewayRow | undefined {
    return this.db.select().from(gatewaysTable).where(eq(gatewaysTable.username, username)).get();
  }

  /** Keys of the sensors a gateway may publish for. */
  sensorKeysOf(id: number): string[] {
    return this.db
      .select({ key: sensorsTable.key })
      .from(gatewaySensorsTable)
      .innerJoin(sensorsTable, eq(sensorsTable.id, gatewaySensorsTable.sensorId))
      .where(eq(gatewaySensorsTable.gatewayId, id))
      .all()
      .map((r) => r.key);
  }

  /** Every gateway–sensor link. */
  links(): Array<{ gatewayId: number; sensorId: number }> {
    return this.db.select().from(gatewaySensorsTable).all();
  }

  /** Links of gateways not revoked to sensors not retired, with the gateway's username. */
  activeLinks(): Array<{ gateway: string; sensorId: number }> {
    return this.db
      .select({ gateway: gatewaysTable.username, sensorId: gatewaySensorsTable.sensorId })
      .from(gatewaySensorsTable)
      .innerJoin(gatewaysTable, eq(gatewaysTable.id, gatewaySensorsTable.gatewayId))
      .innerJoin(sensorsTable, and(eq(sensorsTable.id, gatewaySensorsTable.sensorId), isNull(sensorsTable.retiredAtMs)))
      .where(isNull(gatewaysTable.revokedAtMs))
      .all();
  }

  insert(values: NewGateway, sensorIds: readonly number[]): GatewayRow {
    const row = this.db.insert(gatewaysTable).values(values).returning().get();
    this.setSensors(row.id, sensorIds);
    return row;
  }

  update(id: number, changes: Partial<Pick<GatewayRow, 'name' | 'passwordHash' | 'revokedAtMs'>>): void {
    if (Object.keys(changes).length > 0) this.db.update(gatewaysTable).set(changes).where(eq(gatewaysTable.id, id)).run();
  }

  /** Replaces the sensors a gateway may publish for. */
  setSensors(id: number, sensorIds: readonly number[]): void {
    this.db.delete(gatewaySensorsTable).where(eq(gatewaySensorsTable.gatewayId, id)).run();
    for (const sensorId of sensorIds) this.db.insert(gatewaySensorsTable).values({ gatewayId: id, sensorId }).run();
  }
}
