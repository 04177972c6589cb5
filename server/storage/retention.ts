/**
 * Raw-reading retention: readings older than the configured number of days (RAW_RETENTION_DAYS)
 * are deleted; the per-minute rollups, level changes, alerts and the audit trail are kept, so the
 * log still answers for any past day (from the rollups) once the raw readings are gone.
 */
import type Database from 'better-sqlite3';

/** Deletes raw readings stamped before `cutoffMs`; returns how many went. */
export function removeRawReadingsBefore(sqlite: Database.Database, cutoffMs: number): number {
  return sqlite.prepare('DELETE FROM readings WHERE ts_ms < ?').run(cutoffMs).changes;
}
