/**
 * Gateways: the MQTT credentials that publish readings, each for the sensors it is given.
 * The password is shown once, when the gateway is made (or its password replaced), and stored
 * only as a scrypt hash. Revoking a gateway refuses its next message at once.
 */
import { randomBytes } from 'node:crypto';
import { z } from 'zod';
import { hashPassword } from '../auth/password.ts';
import { maxNameLength, maxPasswordLength } from '../engine/limits.ts';
import { Conflict, Invalid, NotFound } from '../domainErrors.ts';
import type { Storage } from '../storage/storage.ts';

const usernamePattern = /^[A-Za-z0-9._-]{3,64}$/;
/** Long enough that guessing it over MQTT is hopeless even without rate limits. */
export const minGatewayPasswordLength = 16;

export const gatewayInputSchema = z.strictObject({
  name: z.string().trim().min(1, 'name must not be empty').max(maxNameLength),
  username: z.string().regex(usernamePattern, 'username must be 3–64 characters of letters, digits, . _ -'),
  /** Omit to have a strong one made and shown once. */
  password: z.string().min(minGatewayPasswordLength, `password must be at least ${minGatewayPasswordLength} characters`).max(maxPasswordLength).optional(),
  sensorKeys: z.array(z.string()).max(500).default([]),
});
export const gatewayUpdateSchema = z.strictObject({
  name: z.string().trim().min(1).max(maxNameLength).optional(),
  sensorKeys: z.array(z.string()).max(500).optional(),
  /** true: make a new password (shown once); the old one stops working at once. */
  newPassword: z.boolean().optional(),
});

export interface GatewayView {
  id: number;
  name: string;
  username: string;
  sensorKeys: string[];
  createdAtMs: number;
  revokedAtMs: number | null;
}

export function generatePassword(): string {
  return randomBytes(18).toString('base64url'); // 24 characters, 144 bits
}

async function sensorIdsForKeys(storage: Storage, keys: readonly string[]): Promise<number[]> {
  if (keys.length === 0) return [];
  const rows = await storage.sensors.activeWithKeys(keys);
  const unknown = keys.filter((k) => !rows.some((r) => r.key === k));
  if (unknown.length > 0) {
    throw new Invalid(unknown.map((k) => ({ path: 'sensorKeys', message: `no sensor is registered with key "${k}"` })));
  }
  return rows.map((r) => r.id);
}

async function view(storage: Storage, id: number): Promise<GatewayView> {
  const g = await storage.gateways.byId(id);
  if (!g) throw new NotFound(`gateway ${id}`);
  const keys = (await storage.gateways.sensorKeysOf(id)).sort();
  return { id: g.id, name: g.name, username: g.username, sensorKeys: keys, createdAtMs: g.createdAtMs, revokedAtMs: g.revokedAtMs };
}

export async function listGateways(storage: Storage): Promise<GatewayView[]> {
  const views: GatewayView[] = [];
  for (const g of await storage.gateways.all()) views.push(await view(storage, g.id));
  return views;
}

export function getGateway(storage: Storage, id: number): Promise<GatewayView> {
  return view(storage, id);
}

export async function createGateway(
  storage: Storage,
  siteId: number,
  input: z.infer<typeof gatewayInputSchema>,
  actor: string,
  nowMs: number,
): Promise<{ gateway: GatewayView; password: string }> {
  const password = input.password ?? generatePassword();
  const passwordHash = await hashPassword(password);
  const gateway = await storage.transaction(async () => {
    if (await storage.gateways.byUsername(input.username)) {
      throw new Conflict(`a gateway with username "${input.username}" exists`);
    }
    const sensorIds = await sensorIdsForKeys(storage, input.sensorKeys);
    const row = await storage.gateways.insert({ siteId, name: input.name, username: input.username, passwordHash, createdAtMs: nowMs }, sensorIds);
    const after = await view(storage, row.id);
    await storage.audit.record({ actor, entity: 'gateway', entityId: row.id, action: 'create', after }, nowMs);
    return after;
  });
  return { gateway, password };
}

export async function updateGateway(
  storage: Storage,
  id: number,
  patch: z.infer<typeof gatewayUpdateSchema>,
  actor: string,
  nowMs: number,
): Promise<{ gateway: GatewayView; password: string | null }> {
  const password = patch.newPassword ? generatePassword() : null;
  const passwordHash = password ? await hashPassword(password) : null;
  const gateway = await storage.transaction(async () => {
    const before = await view(storage, id);
    if (before.revokedAtMs !== null) throw new Conflict(`gateway ${id} is revoked; make a new one`);
    await storage.gateways.update(id, { ...(patch.name !== undefined ? { name: patch.name } : {}), ...(passwordHash ? { passwordHash } : {}) });
    if (patch.sensorKeys !== undefined) await storage.gateways.setSensors(id, await sensorIdsForKeys(storage, patch.sensorKeys));
    const after = await view(storage, id);
    await storage.audit.record({ actor, entity: 'gateway', entityId: id, action: passwordHash ? 'update, new password' : 'update', before, after }, nowMs);
    return after;
  });
  return { gateway, password };
}

export async function revokeGateway(storage: Storage, id: number, actor: string, nowMs: number): Promise<GatewayView> {
  return await storage.transaction(async () => {
    const before = await view(storage, id);
    if (before.revokedAtMs === null) await storage.gateways.update(id, { revokedAtMs: nowMs });
    const after = await view(storage, id);
    await storage.audit.record({ actor, entity: 'gateway', entityId: id, action: 'revoke', before, after }, nowMs);
    return after;
  });
}
