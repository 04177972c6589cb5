/**
 * The registered sensors and gateways, held in memory for the per-message path (topic → sensor,
 * username → gateway) and reloaded from the database whenever the register changes. The lookups
 * are synchronous; only the reload waits for the database.
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
  private listeners: Array<() => void | Promise<void>> = [];
  private reloading: Promise<void> = Promise.resolve();

  /** Empty until `reload` (or made loaded by `Registry.load`). */
  constructor(private readonly storage: Pick<Storage, 'sensors' | 'gateways'>) {}

  /** A registry loaded from storage. */
  static async load(storage: Pick<Storage, 'sensors' | 'gateways'>): Promise<Registry> {
    const registry = new Registry(storage);
    await registry.reload();
    return registry;
  }

  /** Re-reads sensors and gateways, then runs the listeners; call (and await) after every change to them. */
  reload(): Promise<void> {
    // One at a time, in the order asked for: a slower earlier read is never applied after a newer one.
    this.reloading = this.reloading.catch(() => undefined).then(() => this.read());
    return this.reloading;
  }

  private async read(): Promise<void> {
    const [sensors, gateways, links] = await Promise.all([this.storage.sensors.active(), this.storage.gateways.active(), this.storage.gateways.links()]);
    this.sensorsByKey = new Map();
    this.sensorsById = new Map();
    for (const row of sensors) {
      const sensor: RegisteredSensor = row;
      this.sensorsByKey.set(sensor.key, sensor);
      this.sensorsById.set(sensor.id, sensor);
    }
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
    for (const listener of this.listeners) await listener();
  }

  onReload(listener: () => void | Promise<void>): void {
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
