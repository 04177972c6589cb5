/** People, their sessions, and the site links that open read-only sessions. */
import { and, eq, gt, isNull } from 'drizzle-orm';
import { peopleTable, sessionsTable, siteLinksTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type PersonRow = typeof peopleTable.$inferSelect;
export type SessionRow = typeof sessionsTable.$inferSelect;
export type SiteLinkRow = typeof siteLinksTable.$inferSelect;

export class PeopleStore {
  constructor(private readonly db: Db) {}

  count(): number {
    return this.db.select({ id: peopleTable.id }).from(peopleTable).all().length;
  }

  /** Everybody, by username. */
  all(): PersonRow[] {
    return this.db.select().from(peopleTable).orderBy(peopleTable.username).all();
  }

  byId(id: number): PersonRow | undefined {
    return this.db.select().from(peopleTable).where(eq(peopleTable.id, id)).get();
  }

  /** A person by id when not disabled. */
  activeById(id: number): PersonRow | undefined {
    return this.db.select().from(peopleTable).where(and(eq(peopleTable.id, id), isNull(peopleTable.disabledAtMs))).get();
  }

  byUsername(username: string): PersonRow | undefined {
    return this.db.select().from(peopleTable).where(eq(peopleTable.username, username)).get();
  }

  /** People not disabled, by id. */
  active(): PersonRow[] {
    return this.db.select().from(peopleTable).where(isNull(peopleTable.disabledAtMs)).orderBy(peopleTable.id).all();
  }

  /** People not disabled, by display name. */
  activeByDisplayName(): PersonRow[] {
    return this.db.select().from(peopleTable).where(isNull(peopleTable.disabledAtMs)).orderBy(peopleTable.displayName).all();
  }

  /** Administrators not disabled. */
  activeAdmins(): PersonRow[] {
    return this.db.select().from(peopleTable).where(and(eq(peopleTable.role, 'admin'), isNull(peopleTable.disabledAtMs))).all();
  }

  insert(values: Omit<typeof peopleTable.$inferInsert, 'id'>): PersonRow {
    return this.db.insert(peopleTable).values(values).returning().get();
  }

  update(id: number, changes: Partial<Omit<PersonRow, 'id' | 'username' | 'createdAtMs'>>): PersonRow {
    return this.db.update(peopleTable).set(changes).where(eq(peopleTable.id, id)).returning().get();
  }

  // ---- sessions ----

  openSession(values: typeof sessionsTable.$inferInsert): void {
    this.db.insert(sessionsTable).values(values).run();
  }

  session(tokenHash: string): SessionRow | undefined {
    return this.db.select().from(sessionsTable).where(eq(sessionsTable.tokenHash, tokenHash)).get();
  }

  closeSession(tokenHash: string): void {
    this.db.delete(sessionsTable).where(eq(sessionsTable.tokenHash, tokenHash)).run();
  }

  /** Ends every session of a person; the number ended. */
  closeSessionsOf(personId: number): number {
    return this.db.delete(sessionsTable).where(eq(sessionsTable.personId, personId)).run().changes;
  }

  closeSessionsOfLink(siteLinkId: number): void {
    this.db.delete(sessionsTable).where(eq(sessionsTable.siteLinkId, siteLinkId)).run();
  }

  // ---- site links ----

  insertSiteLink(values: Omit<typeof siteLinksTable.$inferInsert, 'id'>): SiteLinkRow {
    return this.db.insert(siteLinksTable).values(values).returning().get();
  }

  siteLink(id: number): SiteLinkRow | undefined {
    return this.db.select().from(siteLinksTable).where(eq(siteLinksTable.id, id)).get();
  }

  siteLinks(): SiteLinkRow[] {
    return this.db.select().from(siteLinksTable).orderBy(siteLinksTable.id).all();
  }

  /** The link with this token hash, not revoked and not expired at `nowMs`. */
  liveSiteLink(tokenHash: string, nowMs: number): SiteLinkRow | undefined {
    return this.db
      .select()
      .from(siteLinksTable)
      .where(and(eq(siteLinksTable.tokenHash, tokenHash), isNull(siteLinksTable.revokedAtMs), gt(siteLinksTable.expiresAtMs, nowMs)))
      .get();
  }

  revokeSiteLink(id: number, atMs: number): void {
    this.db.update(siteLinksTable).set({ revokedAtMs: atMs }).where(eq(siteLinksTable.id, id)).run();
  }
}
