/**
 * Gateways: the MQTT credentials that publish readings, each for the sensors it is given.
 * The password is shown once, when the gateway is made (or its password replaced), and stored
 * only as a scrypt hash. Revoking a gateway refuses its next message at once.
 */
import { randomBytes } from 'node:crypto';
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { gatewaySensorsTable, gatewaysTable, sensorsTable } from '../../db/schema.ts';
import { hashPassword } from '../auth/password.ts';
import { HttpError } from '../http/httpError.ts';
import type { Db, Tx } from '../storage/database.ts';
import { recordAudit } from './audit.ts';

const usernamePattern = /^[A-Za-z0-9._-]{3,64}$/;
/** Long enough that guessing it over MQTT is hopeless even without rate limits. */
export const minGatewayPasswordLength = 16;

export const gatewayInputSchema = z.strictObject({
  name: z.string().trim().min(1, 'name must not be empty').max(100),
  username: z.string().regex(usernamePattern, 'username must be 3–64 characters of letters, digits, . _ -'),
  /** Omit to have a strong one made and shown once. */
  password: z.string().min(minGatewayPasswordLength, `password must be at least ${minGatewayPasswordLength} characters`).max(200).optional(),
  sensorKeys: z.array(z.string()).max(500).default([]),
});
export const gatewayUpdateSchema = z.strictObject({
  name: z.string().trim().min(1).max(100).optional(),
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

function sensorIdsForKeys(tx: Tx, keys: readonly string[]): number[] {
  if (keys.length === 0) return [];
  const rows = tx.select({ id: sensorsTable.id, key: sensorsTable.key }).from(sensorsTable).where(and(inArray(sensorsTable.key, [...keys]), isNull(sensorsTable.retiredAtMs))).all();
  const unknown = keys.filter((k) => !rows.some((r) => r.key === k));
  if (unknown.length > 0) {
    throw HttpError.invalid(unknown.map((k) => ({ path: 'sensorKeys', message: `no sensor is registered with key "${k}"` })));
  }
  return rows.map((r) => r.id);
}

function view(tx: Tx, id: number): GatewayView {
  const g = tx.select().from(gatewaysTable).where(eq(gatewaysTable.id, id)).get();
  if (!g) throw HttpError.notFound(`gateway ${id}`);
  const keys = tx
    .select({ key: sensorsTable.key })
    .from(gatewaySensorsTable)
    .innerJoin(sensorsTable, eq(sensorsTable.id, gatewaySensorsTable.sensorId))
    .where(eq(gatewaySensorsTable.gatewayId, id))
    .all()
    .map((r) => r.key)
    .sort();
  return { id: g.id, name: g.name, username: g.username, sensorKeys: keys, createdAtMs: g.createdAtMs, revokedAtMs: g.revokedAtMs };
}

export function listGateways(db: Db): GatewayView[] {
  return db.select({ id: gatewaysTable.id }).from(gatewaysTable).all().map((g) => view(db, g.id));
}

export function getGateway(db: Db, id: number): GatewayView {
  return view(db, id);
}

export async function createGateway(
  db: Db,
  siteId: number,
  input: z.infer<typeof gatewayInputSchema>,
  actor: string,
  nowMs: number,
): Promise<{ gateway: GatewayView; password: string }> {
  const password = input.password ?? generatePassword();
  const passwordHash = await hashPassword(password);
  const gateway = db.transaction((tx) => {
    if (tx.select().from(gatewaysTable).where(eq(gatewaysTable.username, input.username)).get()) {
      throw new HttpError(409, `a gateway with username "${input.username}" exists`);
    }
    const sensorIds = sensorIdsForKeys(tx, input.sensorKeys);
    const row = tx.insert(gatewaysTable).values({ siteId, name: input.name, username: input.username, passwordHash, createdAtMs: nowMs }).returning().get();
    for (const sensorId of sensorIds) tx.insert(gatewaySensorsTable).values({ gatewayId: row.id, sensorId }).run();
    const after = view(tx, row.id);
    recordAudit(tx, { actor, entity: 'gateway', entityId: row.id, action: 'create', after }, nowMs);
    return after;
  });
  return { gateway, password };
}

export async function updateGateway(
  db: Db,
  id: number,
  patch: z.infer<typeof gatewayUpdateSchema>,
  actor: string,
  nowMs: number,
): Promise<{ gateway: GatewayView; password: string | null }> {
  const password = patch.newPassword ? generatePassword() : null;
  const passwordHash = password ? await hashPassword(password) : null;
  const gateway = db.transaction((tx) => {
    const before = view(tx, id);
    if (before.revokedAtMs !== null) throw new HttpError(409, `gateway ${id} is revoked; make a new one`);
    if (patch.name !== undefined) tx.update(gatewaysTable).set({ name: patch.name }).where(eq(gatewaysTable.id, id)).run();
    if (passwordHash) tx.update(gatewaysTable).set({ passwordHash }).where(eq(gatewaysTable.id, id)).run();
    if (patch.sensorKeys !== undefined) {
      const sensorIds = sensorIdsForKeys(tx, patch.sensorKeys);
      tx.delete(gatewaySensorsTable).where(eq(gatewaySensorsTable.gatewayId, id)).run();
      for (const sensorId of sensorIds) tx.insert(gatewaySensorsTable).values({ gatewayId: id, sensorId }).run();
    }
    const after = view(tx, id);
    recordAudit(tx, { actor, entity: 'gateway', entityId: id, action: passwordHash ? 'update, new password' : 'update', before, after }, nowMs);
    return after;
  });
  return { gateway, password };
}

export function revokeGateway(db: Db, id: number, actor: string, nowMs: number): GatewayView {
  return db.transaction((tx) => {
    const before = view(tx, id);
    if (before.revokedAtMs === null) tx.update(gatewaysTable).set({ revokedAtMs: nowMs }).where(eq(gatewaysTable.id, id)).run();
    const after = view(tx, id);
    recordAudit(tx, { actor, entity: 'gateway', entityId: id, action: 'revoke', before, after }, nowMs);
    return after;
  });
}
