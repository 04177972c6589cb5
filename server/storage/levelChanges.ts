/** The level-change log: every rise and fall of a structure's level, and a level lost for want of data. */
import { and, asc, eq, gte, lt } from 'drizzle-orm';
import { levelChangesTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export type StoredLevelChange = typeof levelChangesTable.$inferSelect;

export class LevelChangeStore {
  constructor(private readonly db: Db) {}

  /** Changes in [from, to), oldest first (of one structure when given; at most `limit` when given). */
  inWindow(fromMs: number, toMs: number, options: { structureId?: number; limit?: number } = {}): StoredLevelChange[] {
    const conditions = [gte(levelChangesTable.atMs, fromMs), lt(levelChangesTable.atMs, toMs)];
    if (options.structureId !== undefined) conditions.push(eq(levelChangesTable.structureId, options.structureId));
    const query = this.db.select().from(levelChangesTable).where(and(...conditions)).orderBy(asc(levelChangesTable.atMs));
    return options.limit === undefined ? query.all() : query.limit(options.limit).all();
  }

  /** Each structure's last logged level and since when: one pass over the (small) log. */
  lastLevels(): Map<number, { level: number; sinceMs: number }> {
    const rows = this.db.$client
      .prepare(
        `SELECT structure_id AS id, to_level AS level, at_ms AS atMs FROM (
           SELECT structure_id, to_level, at_ms, ROW_NUMBER() OVER (PARTITION BY structure_id ORDER BY at_ms DESC, id DESC) AS rn FROM level_changes
         ) WHERE rn = 1`,
      )
      .all() as Array<{ id: number; level: number; atMs: number }>;
    return new Map(rows.map((r) => [r.id, { level: r.level, sinceMs: r.atMs }]));
  }
}
