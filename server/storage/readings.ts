/** Questions about the raw readings and their minute rollups that are not a series (logQueries.ts) or an export (logExports.ts). */
import { desc, eq } from 'drizzle-orm';
import { readingsTable, windMinutesTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export class ReadingStore {
  constructor(private readonly db: Db) {}

  /**
   * The newest time a sensor has data for: its newest raw reading, else (raw readings past
   * retention are deleted, their minute rollups stay) the start of its newest minute; null for none.
   * By the primary key: one seek.
   */
  newestDataMs(sensorId: number): number | null {
    const raw = this.db.select({ tsMs: readingsTable.tsMs }).from(readingsTable).where(eq(readingsTable.sensorId, sensorId)).orderBy(desc(readingsTable.tsMs)).limit(1).get();
    if (raw) return raw.tsMs;
    const minute = this.db.select({ tsMs: windMinutesTable.minuteMs }).from(windMinutesTable).where(eq(windMinutesTable.sensorId, sensorId)).orderBy(desc(windMinutesTable.minuteMs)).limit(1).get();
    return minute?.tsMs ?? null;
  }
}
