/** Registered structures (retired ones stay, so their history keeps its name). */
import { and, eq, isNull } from 'drizzle-orm';
import { structuresTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type StructureRow = typeof structuresTable.$inferSelect;
export type NewStructure = Omit<typeof structuresTable.$inferInsert, 'id'>;
export type StructureChanges = Partial<Omit<StructureRow, 'id' | 'siteId' | 'createdAtMs'>>;

export class StructureStore {
  constructor(private readonly db: Db) {}

  /** Every structure, retired ones too. */
  all(): StructureRow[] {
    return this.db.select().from(structuresTable).all();
  }

  /** The structures on the register now. */
  active(): StructureRow[] {
    return this.db.select().from(structuresTable).where(isNull(structuresTable.retiredAtMs)).all();
  }

  /** The structures on the register now, by name. */
  activeByName(): StructureRow[] {
    return this.db.select().from(structuresTable).where(isNull(structuresTable.retiredAtMs)).orderBy(structuresTable.name).all();
  }

  /** Active structures without levels of their own (they follow the site's default levels). */
  activeOnSiteLevels(): StructureRow[] {
    return this.db.select().from(structuresTable).where(and(isNull(structuresTable.retiredAtMs), isNull(structuresTable.levelsJson))).all();
  }

  /** A structure by id, retired or not. */
  byId(id: number): StructureRow | undefined {
    return this.db.select().from(structuresTable).where(eq(structuresTable.id, id)).get();
  }

  /** Active structures with this name (at most one, by the register's rule). */
  activeNamed(name: string): StructureRow[] {
    return this.db.select().from(structuresTable).where(and(eq(structuresTable.name, name), isNull(structuresTable.retiredAtMs))).all();
  }

  /** Every structure's name by id, retired ones too. */
  names(): Map<number, string> {
    return new Map(this.db.select({ id: structuresTable.id, name: structuresTable.name }).from(structuresTable).all().map((s) => [s.id, s.name]));
  }

  insert(values: NewStructure): StructureRow {
    return this.db.insert(structuresTable).values(values).returning().get();
  }

  update(id: number, changes: StructureChanges): StructureRow {
    return this.db.update(structuresTable).set(changes).where(eq(structuresTable.id, id)).returning().get();
  }
}
