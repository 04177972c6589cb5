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
import { z } from 'zod';
import { maxNameLength, maxPasswordLength } from '../engine/limits.ts';
import { Conflict, NotFound, Refused } from '../domainErrors.ts';
import type { PersonRow } from '../storage/people.ts';
import type { Storage } from '../storage/storage.ts';
import { hashPassword, passwordHashIsCurrent, unmatchablePasswordHash, verifyPassword } from './password.ts';
import { roles, type Role } from './roles.ts';
import { newToken, tokenHash } from './tokens.ts';

export const sessionLifetimeMs = 12 * 3600_000;
export const minPasswordLength = 12;
const setupCodeKey = 'setup-code-sha256';

export const usernameSchema = z.string().regex(/^[a-z0-9._-]{2,64}$/, 'username must be 2–64 characters of a-z, 0-9, . _ -');
export const passwordSchema = z.string().min(minPasswordLength, `password must be at least ${minPasswordLength} characters`).max(maxPasswordLength);

export const personInputSchema = z.strictObject({
  username: usernameSchema,
  displayName: z.string().trim().min(1, 'name must not be empty').max(maxNameLength),
  role: z.enum(roles),
  password: passwordSchema,
});
export const personUpdateSchema = z.strictObject({
  displayName: z.string().trim().min(1).max(maxNameLength).optional(),
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

function toPerson(row: PersonRow): Person {
  return { id: row.id, username: row.username, displayName: row.displayName, role: row.role, createdAtMs: row.createdAtMs, disabledAtMs: row.disabledAtMs };
}

export class Accounts {
  constructor(private readonly storage: Storage) {}

  countPeople(): Promise<number> {
    return this.storage.people.count();
  }

  async listPeople(): Promise<Person[]> {
    return (await this.storage.people.all()).map(toPerson);
  }

  async createPerson(input: z.infer<typeof personInputSchema>, actor: string, nowMs: number): Promise<Person> {
    const passwordHash = await hashPassword(input.password);
    const { storage } = this;
    return await storage.transaction(async () => {
      if (await storage.people.byUsername(input.username)) {
        throw new Conflict(`username "${input.username}" is taken`);
      }
      const row = await storage.people.insert({ username: input.username, displayName: input.displayName, role: input.role, passwordHash, createdAtMs: nowMs });
      const person = toPerson(row);
      await storage.audit.record({ actor, entity: 'person', entityId: person.username, action: 'create', after: person }, nowMs);
      return person;
    });
  }

  async updatePerson(id: number, patch: z.infer<typeof personUpdateSchema>, actor: string, nowMs: number): Promise<Person> {
    const passwordHash = patch.password ? await hashPassword(patch.password) : null;
    const { storage } = this;
    return await storage.transaction(async () => {
      const beforeRow = await storage.people.byId(id);
      if (!beforeRow) throw new NotFound(`person ${id}`);
      const before = toPerson(beforeRow);
      const becomesNonAdmin = (patch.role !== undefined && patch.role !== 'admin') || patch.disabled === true;
      if (before.role === 'admin' && becomesNonAdmin) {
        const admins = await storage.people.activeAdmins();
        if (admins.length <= 1) throw new Conflict('the last administrator cannot be demoted or disabled');
      }
      const set: Parameters<Storage['people']['update']>[1] = {};
      if (patch.displayName !== undefined) set.displayName = patch.displayName;
      if (patch.role !== undefined) set.role = patch.role;
      if (passwordHash) set.passwordHash = passwordHash;
      if (patch.disabled !== undefined) set.disabledAtMs = patch.disabled ? nowMs : null;
      const after = toPerson(await storage.people.update(id, set));
      // A new password, a new role or a disabled account ends every open session of the person.
      if (passwordHash || patch.role !== undefined || patch.disabled) await storage.people.closeSessionsOf(id);
      await storage.audit.record({ actor, entity: 'person', entityId: after.username, action: passwordHash ? 'update, new password' : 'update', before, after }, nowMs);
      return after;
    });
  }

  /** Checks a username and password; the person, or null (same answer for unknown and wrong). */
  async checkPassword(username: string, password: string): Promise<Person | null> {
    const row = await this.storage.people.byUsername(username);
    // Hash anyway for an unknown user, so timing does not tell which usernames exist.
    const ok = await verifyPassword(password, row?.passwordHash ?? unmatchablePasswordHash);
    if (!row || !ok || row.disabledAtMs !== null) return null;
    // A hash from the first release's parameters is made again with today's, while the password is at hand.
    if (!passwordHashIsCurrent(row.passwordHash)) await this.storage.people.update(row.id, { passwordHash: await hashPassword(password) });
    return toPerson(row);
  }

  async openSession(owner: { personId: number } | { siteLinkId: number }, nowMs: number, lifetimeMs = sessionLifetimeMs): Promise<{ token: string; csrfToken: string; expiresAtMs: number }> {
    const token = newToken();
    const csrfToken = newToken();
    const expiresAtMs = nowMs + lifetimeMs;
    await this.storage.people.openSession({
      tokenHash: tokenHash(token),
      personId: 'personId' in owner ? owner.personId : null,
      siteLinkId: 'siteLinkId' in owner ? owner.siteLinkId : null,
      csrfToken,
      createdAtMs: nowMs,
      expiresAtMs,
    });
    return { token, csrfToken, expiresAtMs };
  }

  /** The principal behind a session cookie, or null when the session is unknown, expired or revoked. */
  async principalOfSession(token: string, nowMs: number): Promise<Principal | null> {
    const hash = tokenHash(token);
    const session = await this.storage.people.session(hash);
    if (!session) return null;
    if (session.expiresAtMs <= nowMs) {
      await this.storage.people.closeSession(hash);
      return null;
    }
    if (session.personId !== null) {
      const row = await this.storage.people.byId(session.personId);
      if (!row || row.disabledAtMs !== null) return null;
      const person = toPerson(row);
      return { kind: 'person', person, role: person.role, sessionTokenHash: hash, csrfToken: session.csrfToken };
    }
    if (session.siteLinkId !== null) {
      const link = await this.storage.people.siteLink(session.siteLinkId);
      if (!link || link.revokedAtMs !== null || link.expiresAtMs <= nowMs) return null;
      return { kind: 'link', linkId: link.id, label: link.label, role: 'viewer', sessionTokenHash: hash, csrfToken: session.csrfToken };
    }
    return null;
  }

  async closeSession(sessionTokenHash: string): Promise<void> {
    await this.storage.people.closeSession(sessionTokenHash);
  }

  closeAllSessionsOf(personId: number): Promise<number> {
    return this.storage.people.closeSessionsOf(personId);
  }

  // ---- site links ----

  async createSiteLink(label: string, lifetimeMs: number, actor: string, nowMs: number): Promise<{ id: number; token: string; expiresAtMs: number }> {
    const token = newToken();
    const expiresAtMs = nowMs + lifetimeMs;
    const { storage } = this;
    const row = await storage.transaction(async () => {
      const r = await storage.people.insertSiteLink({ tokenHash: tokenHash(token), label, createdBy: actor, createdAtMs: nowMs, expiresAtMs });
      await storage.audit.record({ actor, entity: 'site-link', entityId: r.id, action: 'create', after: { label, expiresAtMs } }, nowMs);
      return r;
    });
    return { id: row.id, token, expiresAtMs };
  }

  async listSiteLinks(): Promise<Array<{ id: number; label: string; createdBy: string; createdAtMs: number; expiresAtMs: number; revokedAtMs: number | null }>> {
    return (await this.storage.people.siteLinks()).map(({ id, label, createdBy, createdAtMs, expiresAtMs, revokedAtMs }) => ({ id, label, createdBy, createdAtMs, expiresAtMs, revokedAtMs }));
  }

  /** The link a token opens, if it is live. */
  async liveSiteLink(token: string, nowMs: number): Promise<{ id: number; label: string; expiresAtMs: number } | null> {
    const link = await this.storage.people.liveSiteLink(tokenHash(token), nowMs);
    return link ? { id: link.id, label: link.label, expiresAtMs: link.expiresAtMs } : null;
  }

  async revokeSiteLink(id: number, actor: string, nowMs: number): Promise<void> {
    const { storage } = this;
    await storage.transaction(async () => {
      const link = await storage.people.siteLink(id);
      if (!link) throw new NotFound(`site link ${id}`);
      await storage.people.revokeSiteLink(id, link.revokedAtMs ?? nowMs);
      await storage.people.closeSessionsOfLink(id);
      await storage.audit.record({ actor, entity: 'site-link', entityId: id, action: 'revoke', before: { label: link.label } }, nowMs);
    });
  }

  // ---- first administrator ----

  /**
   * On a database with nobody in it: creates the configured administrator, or makes a one-time
   * setup code (returned, to be printed in the log). Returns null when people exist already.
   */
  async prepareFirstAdmin(config: { username: string | null; password: string | null }, nowMs: number): Promise<{ created: Person } | { setupCode: string } | null> {
    if ((await this.countPeople()) > 0) return null;
    if (config.username && config.password) {
      const created = await this.createPerson(
        { username: config.username, displayName: config.username, role: 'admin', password: config.password },
        'configuration (ADMIN_USERNAME)',
        nowMs,
      );
      return { created };
    }
    const setupCode = newToken().slice(0, 24);
    await this.storage.meta.set(setupCodeKey, tokenHash(setupCode), nowMs);
    return { setupCode };
  }

  async setupPending(): Promise<boolean> {
    return (await this.countPeople()) === 0 && (await this.storage.meta.get(setupCodeKey)) !== null;
  }

  /** Uses the setup code once to create the first administrator. */
  async completeSetup(code: string, input: { username: string; displayName: string; password: string }, nowMs: number): Promise<Person> {
    const stored = await this.storage.meta.get(setupCodeKey);
    if (stored === null || (await this.countPeople()) > 0) throw new Conflict('setup is already done');
    if (tokenHash(code) !== stored) throw new Refused('wrong setup code');
    const person = await this.createPerson({ ...input, role: 'admin' }, 'setup code', nowMs);
    await this.storage.meta.delete(setupCodeKey);
    return person;
  }
}
