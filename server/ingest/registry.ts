/**
 * The registered sensors and gateways, held in memory for the per-message path (topic → sensor,
 * username → gateway) and reloaded from the database whenever the register changes.
 */
import { isNull } from 'drizzle-orm';
import { gatewaySensorsTable, gatewaysTable, sensorsTable } from '../../db/schema.ts';
import type { Db } from '../storage/database.ts';
import type { SpeedUnit } from '../engine/units.ts';

export type SensorRow = typeof sensorsTable.$inferSelect;

export interface RegisteredSensor extends Omit<SensorRow, 'unit' | 'mode'> {
  unit: SpeedUnit;
  mode: 'samples' | 'summaries';
}

export interface RegisteredGateway {
  id: number;
  name: string;
  username: string;
  passwordHash: string;
  /** Keys of the sensors this gateway may publish for. */
  sensorKeys: ReadonlySet<string>;
}

export class Registry {
  private sensorsByKey = new Map<string, RegisteredSensor>();
  private sensorsById = new Map<number, RegisteredSensor>();
  private gatewaysByUsername = new Map<string, RegisteredGateway>();
  private listeners: Array<() => void> = [];

  constructor(private readonly db: Db) {
    this.reload();
  }

  /** Re-reads sensors and gateways; call after every change to them. */
  reload(): void {
    const sensors = this.db.select().from(sensorsTable).where(isNull(sensorsTable.retiredAtMs)).all();
    this.sensorsByKey = new Map();
    this.sensorsById = new Map();
    for (const row of sensors) {
      const sensor = row as RegisteredSensor;
      this.sensorsByKey.set(sensor.key, sensor);
      this.sensorsById.set(sensor.id, sensor);
    }
    const gateways = this.db.select().from(gatewaysTable).where(isNull(gatewaysTable.revokedAtMs)).all();
    const links = this.db.select().from(gatewaySensorsTable).all();
    this.gatewaysByUsername = new Map();
    for (const g of gateways) {
      const keys = new Set<string>();
      for (const link of links) {
        if (link.gatewayId !== g.id) continue;
        const sensor = this.sensorsById.get(link.sensorId);
        if (sensor) keys.add(sensor.key);
      }
      this.gatewaysByUsername.set(g.username, { id: g.id, name: g.name, username: g.username, passwordHash: g.passwordHash, sensorKeys: keys });
    }
    for (const listener of this.listeners) listener();
  }

  onReload(listener: () => void): void {
    this.listeners.push(listener);
  }

  sensorByKey(key: string): RegisteredSensor | undefined {
    return this.sensorsByKey.get(key);
  }

  sensorById(id: number): RegisteredSensor | undefined {
    return this.sensorsById.get(id);
  }

  sensors(): RegisteredSensor[] {
    return [...this.sensorsById.values()];
  }

  gatewayByUsername(username: string): RegisteredGateway | undefined {
    return this.gatewaysByUsername.get(username);
  }
}
