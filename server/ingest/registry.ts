/**
 * The registered sensors and gateways, held in memory for the per-message path (topic → sensor,
 * username → gateway) and reloaded from the database whenever the register changes.
 */
import type { SensorRow } from '../storage/sensors.ts';
import type { Storage } from '../storage/storage.ts';

export type { SensorRow };

/** A sensor as registered: the stored row (its unit and mode are enum columns, db/schema.ts). */
export type RegisteredSensor = SensorRow;

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

  constructor(private readonly storage: Pick<Storage, 'sensors' | 'gateways'>) {
    this.reload();
  }

  /** Re-reads sensors and gateways; call after every change to them. */
  reload(): void {
    const sensors = this.storage.sensors.active();
    this.sensorsByKey = new Map();
    this.sensorsById = new Map();
    for (const row of sensors) {
      const sensor: RegisteredSensor = row;
      this.sensorsByKey.set(sensor.key, sensor);
      this.sensorsById.set(sensor.id, sensor);
    }
    const gateways = this.storage.gateways.active();
    const links = this.storage.gateways.links();
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
