/** Every poll of the forecast feed (design §2.7), good or not, with the rows read (SI units) or the reason it failed. */
import { and, desc, eq } from 'drizzle-orm';
import { forecastPollsTable } from '../../db/schema.ts';
import type { ForecastRow } from '../foresight/index.ts';
import type { Db } from './database.ts';

export interface ForecastPoll {
  id: number;
  atMs: number;
  url: string;
  httpStatus: number | null;
  ok: boolean;
  error: string | null;
  format: 'csv' | 'json' | null;
  /** The rows read, in SI units; null when the poll failed. */
  rows: ForecastRow[] | null;
  /** How the body was read, or every problem found in it. */
  notes: string[];
  bytes: number | null;
  durationMs: number;
}

type PollRow = typeof forecastPollsTable.$inferSelect;

function pollOf(row: PollRow): ForecastPoll {
  return {
    id: row.id,
    atMs: row.atMs,
    url: row.url,
    httpStatus: row.httpStatus,
    ok: row.ok,
    error: row.error,
    format: row.format as ForecastPoll['format'],
    rows: (row.rowsJson as ForecastRow[] | null) ?? null,
    notes: (row.notesJson as string[] | null) ?? [],
    bytes: row.bytes,
    durationMs: row.durationMs,
  };
}

export class ForecastPollStore {
  constructor(private readonly db: Db) {}

  /** The newest poll of an address (any address when none is given). */
  last(url?: string | null): ForecastPoll | null {
    const row = this.db
      .select()
      .from(forecastPollsTable)
      .where(url ? eq(forecastPollsTable.url, url) : undefined)
      .orderBy(desc(forecastPollsTable.atMs), desc(forecastPollsTable.id))
      .limit(1)
      .get();
    return row ? pollOf(row) : null;
  }

  /** The newest poll of an address that read (ok) or failed (not ok). */
  lastWith(url: string, ok: boolean): ForecastPoll | null {
    const row = this.db
      .select()
      .from(forecastPollsTable)
      .where(and(eq(forecastPollsTable.url, url), eq(forecastPollsTable.ok, ok)))
      .orderBy(desc(forecastPollsTable.atMs), desc(forecastPollsTable.id))
      .limit(1)
      .get();
    return row ? pollOf(row) : null;
  }

  /** Failed polls of an address stored after the poll with id `afterId`. */
  failuresAfter(url: string, afterId: number): number {
    return this.db.$client.prepare('SELECT COUNT(*) AS n FROM forecast_polls WHERE url = ? AND ok = 0 AND id > ?').pluck().get(url, afterId) as number;
  }

  add(poll: Omit<ForecastPoll, 'id'>): ForecastPoll {
    const row = this.db
      .insert(forecastPollsTable)
      .values({
        atMs: poll.atMs,
        url: poll.url,
        httpStatus: poll.httpStatus,
        ok: poll.ok,
        error: poll.error,
        format: poll.format,
        rowsJson: poll.rows,
        notesJson: poll.notes,
        bytes: poll.bytes,
        durationMs: poll.durationMs,
      })
      .returning()
      .get();
    return pollOf(row);
  }
}
