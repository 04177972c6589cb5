/**
 * People, sessions, site links and the first administrator.
 *
 * - Sessions last 12 hours (a long event day); the cookie carries a random token whose SHA-256
 *   is the session's key. Signing out deletes the session; "sign out everywhere" deletes all of
 *   a person's sessions; disabling a person or changing their password does the same.
 * - Site links give read-only (viewer) access without an account; revoking or expiring a link
 *   ends the sessions opened through it at their next request.
 * - First start: with ADMIN_USERNAME and ADMIN_PASSWORD set, that administrator is created;
 *   otherwise a one-time setup code is made, printed in the server log and stored hashed, and
 *   the first administrator is created with it. There is never a default password.
 */
import { and, eq, gt, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { metaTable, peopleTable, sessionsTable, siteLinksTable } from '../../db/schema.ts';
import { HttpError } from '../http/httpError.ts';
import type { Db } from '../storage/database.ts';
import { recordAudit } from '../register/audit.ts';
import { hashPassword, verifyPassword } from './password.ts';
import { roles, type Role } from './roles.ts';
import { newToken, tokenHash } from './tokens.ts';

export const sessionLifetimeMs = 12 * 3600_000;
export const minPasswordLength = 12;
const setupCodeKey = 'setup-code-sha256';

export const usernameSchema = z.string().regex(/^[a-z0-9._-]{2,64}$/, 'username must be 2–64 characters of a-z, 0-9, . _ -');
export const passwordSchema = z.string().min(minPasswordLength, `password must be at least ${minPasswordLength} characters`).max(200);

export const personInputSchema = z.strictObject({
  username: usernameSchema,
  displayName: z.string().trim().min(1, 'name must not be empty').max(100),
  role: z.enum(roles),
  password: passwordSchema,
});
export const personUpdateSchema = z.strictObject({
  displayName: z.string().trim().min(1).max(100).optional(),
  role: z.enum(roles).optional(),
  password: passwordSchema.optional(),
  disabled: z.boolean().optional(),
});

export interface Person {
  id: number;
  username: string;
  displayName: string;
  role: Role;
  createdAtMs: number;
  disabledAtMs: number | null;
}

/** Who is behind a request: a person, or a steward holding a site link. */
export type Principal =
  | { kind: 'person'; person: Person; role: Role; sessionTokenHash: string; csrfToken: string }
  | { kind: 'link'; linkId: number; label: string; role: 'viewer'; sessionTokenHash: string; csrfToken: string };

export function principalName(p: Principal | null): string {
  if (!p) return 'anonymous';
  return p.kind === 'person' ? `${p.person.displayName} (${p.person.username})` : `site link "${p.label}"`;
}

function toPerson(row: typeof peopleTable.$inferSelect): Person {
  return { id: row.id, username: row.username, displayName: row.displayName, role: row.role as Role, createdAtMs: row.createdAtMs, disabledAtMs: row.disabledAtMs };
}

export class Accounts {
  constructor(private readonly db: Db) {}

  countPeople(): number {
    return this.db.select({ id: peopleTable.id }).from(peopleTable).all().length;
  }

  listPeople(): Person[] {
    return this.db.select().from(peopleTable).orderBy(peopleTable.username).all().map(toPerson);
  }

  async createPerson(input: z.infer<typeof personInputSchema>, actor: string, nowMs: number): Promise<Person> {
    const passwordHash = await hashPassword(input.password);
    return this.db.transaction((tx) => {
      if (tx.select().from(peopleTable).where(eq(peopleTable.username, input.username)).get()) {
        throw new HttpError(409, `username "${input.username}" is taken`);
      }
      const row = tx
        .insert(peopleTable)
        .values({ username: input.username, displayName: input.displayName, role: input.role, passwordHash, createdAtMs: nowMs })
        .returning()
        .get();
      const person = toPerson(row);
      recordAudit(tx, { actor, entity: 'person', entityId: person.username, action: 'create', after: person }, nowMs);
      return person;
    });
  }

  async updatePerson(id: number, patch: z.infer<typeof personUpdateSchema>, actor: string, nowMs: number): Promise<Person> {
    const passwordHash = patch.password ? await hashPassword(patch.password) : null;
    return this.db.transaction((tx) => {
      const beforeRow = tx.select().from(peopleTable).where(eq(peopleTable.id, id)).get();
      if (!beforeRow) throw HttpError.notFound(`person ${id}`);
      const before = toPerson(beforeRow);
      const becomesNonAdmin = (patch.role !== undefined && patch.role !== 'admin') || patch.disabled === true;
      if (before.role === 'admin' && becomesNonAdmin) {
        const admins = tx.select().from(peopleTable).where(and(eq(peopleTable.role, 'admin'), isNull(peopleTable.disabledAtMs))).all();
        if (admins.length <= 1) throw new HttpError(409, 'the last administrator cannot be demoted or disabled');
      }
      const set: Partial<typeof peopleTable.$inferInsert> = {};
      if (patch.displayName !== undefined) set.displayName = patch.displayName;
      if (patch.role !== undefined) set.role = patch.role;
      if (passwordHash) set.passwordHash = passwordHash;
      if (patch.disabled !== undefined) set.disabledAtMs = patch.disabled ? nowMs : null;
      const after = toPerson(tx.update(peopleTable).set(set).where(eq(peopleTable.id, id)).returning().get());
      // A new password, a new role or a disabled account ends every open session of the person.
      if (passwordHash || patch.role !== undefined || patch.disabled) tx.delete(sessionsTable).where(eq(sessionsTable.personId, id)).run();
      recordAudit(tx, { actor, entity: 'person', entityId: after.username, action: passwordHash ? 'update, new password' : 'update', before, after }, nowMs);
      return after;
    });
  }

  /** Checks a username and password; the person, or null (same answer for unknown and wrong). */
  async checkPassword(username: string, password: string): Promise<Person | null> {
    const row = this.db.select().from(peopleTable).where(eq(peopleTable.username, username)).get();
    // Hash anyway for an unknown user, so timing does not tell which usernames exist.
    const ok = await verifyPassword(password, row?.passwordHash ?? 'scrypt$32768$8$1$AAAAAAAAAAAAAAAAAAAAAA==$AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA=');
    if (!row || !ok || row.disabledAtMs !== null) return null;
    return toPerson(row);
  }

  openSession(owner: { personId: number } | { siteLinkId: number }, nowMs: number, lifetimeMs = sessionLifetimeMs): { token: string; csrfToken: string; expiresAtMs: number } {
    const token = newToken();
    const csrfToken = newToken();
    const expiresAtMs = nowMs + lifetimeMs;
    this.db
      .insert(sessionsTable)
      .values({
        tokenHash: tokenHash(token),
        personId: 'personId' in owner ? owner.personId : null,
        siteLinkId: 'siteLinkId' in owner ? owner.siteLinkId : null,
        csrfToken,
        createdAtMs: nowMs,
        expiresAtMs,
      })
      .run();
    return { token, csrfToken, expiresAtMs };
  }

  /** The principal behind a session cookie, or null when the session is unknown, expired or revoked. */
  principalOfSession(token: string, nowMs: number): Principal | null {
    const hash = tokenHash(token);
    const session = this.db.select().from(sessionsTable).where(eq(sessionsTable.tokenHash, hash)).get();
    if (!session) return null;
    if (session.expiresAtMs <= nowMs) {
      this.db.delete(sessionsTable).where(eq(sessionsTable.tokenHash, hash)).run();
      return null;
    }
    if (session.personId !== null) {
      const row = this.db.select().from(peopleTable).where(eq(peopleTable.id, session.personId)).get();
      if (!row || row.disabledAtMs !== null) return null;
      const person = toPerson(row);
      return { kind: 'person', person, role: person.role, sessionTokenHash: hash, csrfToken: session.csrfToken };
    }
    if (session.siteLinkId !== null) {
      const link = this.db.select().from(siteLinksTable).where(eq(siteLinksTable.id, session.siteLinkId)).get();
      if (!link || link.revokedAtMs !== null || link.expiresAtMs <= nowMs) return null;
      return { kind: 'link', linkId: link.id, label: link.label, role: 'viewer', sessionTokenHash: hash, csrfToken: session.csrfToken };
    }
    return null;
  }

  closeSession(sessionTokenHash: string): void {
    this.db.delete(sessionsTable).where(eq(sessionsTable.tokenHash, sessionTokenHash)).run();
  }

  closeAllSessionsOf(personId: number): number {
    return this.db.delete(sessionsTable).where(eq(sessionsTable.personId, personId)).run().changes;
  }

  // ---- site links ----

  createSiteLink(label: string, lifetimeMs: number, actor: string, nowMs: number): { id: number; token: string; expiresAtMs: number } {
    const token = newToken();
    const expiresAtMs = nowMs + lifetimeMs;
    const row = this.db.transaction((tx) => {
      const r = tx.insert(siteLinksTable).values({ tokenHash: tokenHash(token), label, createdBy: actor, createdAtMs: nowMs, expiresAtMs }).returning().get();
      recordAudit(tx, { actor, entity: 'site-link', entityId: r.id, action: 'create', after: { label, expiresAtMs } }, nowMs);
      return r;
    });
    return { id: row.id, token, expiresAtMs };
  }

  listSiteLinks(): Array<{ id: number; label: string; createdBy: string; createdAtMs: number; expiresAtMs: number; revokedAtMs: number | null }> {
    return this.db
      .select({ id: siteLinksTable.id, label: siteLinksTable.label, createdBy: siteLinksTable.createdBy, createdAtMs: siteLinksTable.createdAtMs, expiresAtMs: siteLinksTable.expiresAtMs, revokedAtMs: siteLinksTable.revokedAtMs })
      .from(siteLinksTable)
      .orderBy(siteLinksTable.id)
      .all();
  }

  /** The link a token opens, if it is live. */
  liveSiteLink(token: string, nowMs: number): { id: number; label: string; expiresAtMs: number } | null {
    const link = this.db
      .select()
      .from(siteLinksTable)
      .where(and(eq(siteLinksTable.tokenHash, tokenHash(token)), isNull(siteLinksTable.revokedAtMs), gt(siteLinksTable.expiresAtMs, nowMs)))
      .get();
    return link ? { id: link.id, label: link.label, expiresAtMs: link.expiresAtMs } : null;
  }

  revokeSiteLink(id: number, actor: string, nowMs: number): void {
    this.db.transaction((tx) => {
      const link = tx.select().from(siteLinksTable).where(eq(siteLinksTable.id, id)).get();
      if (!link) throw HttpError.notFound(`site link ${id}`);
      tx.update(siteLinksTable).set({ revokedAtMs: link.revokedAtMs ?? nowMs }).where(eq(siteLinksTable.id, id)).run();
      tx.delete(sessionsTable).where(eq(sessionsTable.siteLinkId, id)).run();
      recordAudit(tx, { actor, entity: 'site-link', entityId: id, action: 'revoke', before: { label: link.label } }, nowMs);
    });
  }

  // ---- first administrator ----

  /**
   * On a database with nobody in it: creates the configured administrator, or makes a one-time
   * setup code (returned, to be printed in the log). Returns null when people exist already.
   */
  async prepareFirstAdmin(config: { username: string | null; password: string | null }, nowMs: number): Promise<{ created: Person } | { setupCode: string } | null> {
    if (this.countPeople() > 0) return null;
    if (config.username && config.password) {
      const created = await this.createPerson(
        { username: config.username, displayName: config.username, role: 'admin', password: config.password },
        'configuration (ADMIN_USERNAME)',
        nowMs,
      );
      return { created };
    }
    const setupCode = newToken().slice(0, 24);
    this.db
      .insert(metaTable)
      .values({ key: setupCodeKey, value: tokenHash(setupCode), updatedAtMs: nowMs })
      .onConflictDoUpdate({ target: metaTable.key, set: { value: tokenHash(setupCode), updatedAtMs: nowMs } })
      .run();
    return { setupCode };
  }

  get setupPending(): boolean {
    return this.countPeople() === 0 && this.db.select().from(metaTable).where(eq(metaTable.key, setupCodeKey)).get() !== undefined;
  }

  /** Uses the setup code once to create the first administrator. */
  async completeSetup(code: string, input: { username: string; displayName: string; password: string }, nowMs: number): Promise<Person> {
    const stored = this.db.select().from(metaTable).where(eq(metaTable.key, setupCodeKey)).get();
    if (!stored || this.countPeople() > 0) throw new HttpError(409, 'setup is already done');
    if (tokenHash(code) !== stored.value) throw new HttpError(403, 'wrong setup code');
    const person = await this.createPerson({ ...input, role: 'admin' }, 'setup code', nowMs);
    this.db.delete(metaTable).where(eq(metaTable.key, setupCodeKey)).run();
    return person;
  }
}
