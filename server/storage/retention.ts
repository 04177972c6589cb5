/**
 * Raw-reading retention: readings older than the configured number of days (RAW_RETENTION_DAYS)
 * are deleted; the per-minute rollups, level changes, alerts and the audit trail are kept, so the
 * log still answers for any past day (from the rollups) once the raw readings are gone.
 *
 * The clean-up shares the thread with the live watch, so it never holds it for long: readings are
 * keyed on (sensor, time), and a bare `DELETE ... WHERE ts_ms < ?` would scan the whole table
 * (about a second over 5 million readings, every hour, even with nothing to delete). Instead it
 * walks the sensors that have readings along the key, and deletes each sensor's old readings one
 * slice of time at a time (an hour of a 1 Hz sensor is 3,600 rows, a few milliseconds), giving
 * the event loop back between slices.
 */
import type Database from 'better-sqlite3';

export interface RetentionOptions {
  /** Time span deleted per statement. */
  sliceMs?: number;
  /** Called between statements; the default lets pending I/O and timers run. */
  pause?: () => Promise<void>;
  /** Runs each statement (storage.ts: once no transaction is open on the connection); the default runs it at once. */
  run?: <R>(statement: () => R) => Promise<R>;
}

const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/**
 * The ids of the sensors that have raw readings, ascending, found along the primary key (a seek
 * per sensor, not a scan of the table). Each id is looked up when asked for, so the caller may
 * write between ids.
 */
export function* sensorsWithReadings(sqlite: Database.Database): Generator<number> {
  const next = sqlite.prepare('SELECT sensor_id AS id FROM readings WHERE sensor_id > ? ORDER BY sensor_id LIMIT 1');
  let after = Number.MIN_SAFE_INTEGER;
  for (;;) {
    const row = next.get(after) as { id: number } | undefined;
    if (!row) return;
    after = row.id;
    yield row.id;
  }
}

/** Deletes raw readings stamped before `cutoffMs`, slice by slice; resolves with how many went. */
export async function removeRawReadingsBefore(sqlite: Database.Database, cutoffMs: number, options: RetentionOptions = {}): Promise<number> {
  const sliceMs = options.sliceMs ?? 3_600_000;
  if (!(sliceMs > 0)) throw new RangeError(`sliceMs must be > 0, got ${sliceMs}`);
  const pause = options.pause ?? yieldToEventLoop;
  const run = options.run ?? (<R>(statement: () => R): Promise<R> => Promise.resolve(statement()));
  // Each of these uses the primary key (sensor_id, ts_ms): a seek, not a scan.
  const nextSensor = sqlite.prepare('SELECT sensor_id AS id FROM readings WHERE sensor_id > ? ORDER BY sensor_id LIMIT 1');
  const oldest = sqlite.prepare('SELECT MIN(ts_ms) AS ts FROM readings WHERE sensor_id = ?');
  const removeSlice = sqlite.prepare('DELETE FROM readings WHERE sensor_id = ? AND ts_ms < ?');
  let removed = 0;
  // The sensors as sensorsWithReadings walks them, each step through `run`.
  for (let after = Number.MIN_SAFE_INTEGER; ; ) {
    const next = await run(() => nextSensor.get(after) as { id: number } | undefined);
    if (!next) break;
    const sensorId = (after = next.id);
    let from = await run(() => (oldest.get(sensorId) as { ts: number | null }).ts);
    while (from !== null && from < cutoffMs) {
      const upTo = Math.min(cutoffMs, from + sliceMs);
      removed += await run(() => removeSlice.run(sensorId, upTo).changes);
      await pause();
      // Re-read rather than step: a sensor that was away for weeks is not walked hour by hour.
      from = await run(() => (oldest.get(sensorId) as { ts: number | null }).ts);
    }
  }
  return removed;
}
