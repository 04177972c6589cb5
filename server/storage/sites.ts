/** The site row (one per server; the schema allows more for a later version). */
import { eq } from 'drizzle-orm';
import { sitesTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type SiteRow = typeof sitesTable.$inferSelect;
export type NewSite = Omit<typeof sitesTable.$inferInsert, 'id'>;
export type SiteChanges = Partial<Omit<SiteRow, 'id' | 'createdAtMs'>>;

export class SiteStore {
  constructor(private readonly db: Db) {}

  /** The (first) site, or undefined on a fresh database. */
  first(): SiteRow | undefined {
    return this.db.select().from(sitesTable).orderBy(sitesTable.id).limit(1).get();
  }

  insert(values: NewSite): SiteRow {
    return this.db.insert(sitesTable).values(values).returning().get();
  }

  update(id: number, changes: SiteChanges): SiteRow {
    return this.db.update(sitesTable).set(changes).where(eq(sitesTable.id, id)).returning().get();
  }
}
