/**
 * The per-minute wind rollups (`wind_minutes`): per sensor and minute the sample count, the sum
 * of speeds (cm/s), the highest gust (cm/s) and the sums Σ sin θ, Σ cos θ and the count of the
 * directions. The write queue keeps each sensor's newest minute in memory and writes it through
 * this one upsert; so does the rebuild after a start (writeQueue.ts `rebuildNewestMinutes`).
 *
 * One conflict rule: a row is a sum of contributions. Whatever is upserted onto an existing
 * minute is added to its count and sums, and the highest gust is the larger of the two. The
 * rebuild after a start used to replace the stored sums instead (when it counted at least as
 * many readings); it now adds the difference between what it recounted and what is stored, which
 * leaves the same row (the wind-minutes integration tests compare every row with SQLite's own
 * GROUP BY of the raw readings, and a minute that retention partly deleted is left alone as
 * before). Additive is the rule the live path needs: a minute written in pieces (once a second,
 * or a late reading for an older minute) must never lose a piece.
 */

export const upsertWindMinuteSql = `INSERT INTO wind_minutes (sensor_id, minute_ms, sample_count, speed_sum_cmps, max_gust_cmps, dir_sin_sum, dir_cos_sum, dir_count)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?)
       ON CONFLICT (sensor_id, minute_ms) DO UPDATE SET
         sample_count = sample_count + excluded.sample_count,
         speed_sum_cmps = speed_sum_cmps + excluded.speed_sum_cmps,
         max_gust_cmps = max(max_gust_cmps, excluded.max_gust_cmps),
         dir_sin_sum = dir_sin_sum + excluded.dir_sin_sum,
         dir_cos_sum = dir_cos_sum + excluded.dir_cos_sum,
         dir_count = dir_count + excluded.dir_count`;

/** A minute's sums as `upsertWindMinuteSql` takes them (after sensor and minute). */
export interface MinuteSums {
  count: number;
  speedSumCmps: number;
  maxGustCmps: number;
  dirSin: number;
  dirCos: number;
  dirCount: number;
}

/** The stored row of one minute, for the rebuild to compare with what it recounted. */
export const storedWindMinuteSql =
  'SELECT sample_count AS count, speed_sum_cmps AS speedSumCmps, max_gust_cmps AS maxGustCmps, dir_sin_sum AS dirSin, dir_cos_sum AS dirCos, dir_count AS dirCount FROM wind_minutes WHERE sensor_id = ? AND minute_ms = ?';

/**
 * What to upsert so that a stored minute holds what was recounted from the raw readings: the
 * difference of the sums (the gust goes through `max`). Null when nothing is to be written: the
 * recount has fewer readings than the stored row (retention deleted part of the minute; the
 * stored sums stand) or they are equal.
 */
export function recountDelta(stored: MinuteSums | undefined, recounted: MinuteSums): MinuteSums | null {
  if (!stored) return recounted;
  if (recounted.count < stored.count) return null;
  const delta = {
    count: recounted.count - stored.count,
    speedSumCmps: recounted.speedSumCmps - stored.speedSumCmps,
    maxGustCmps: recounted.maxGustCmps,
    dirSin: recounted.dirSin - stored.dirSin,
    dirCos: recounted.dirCos - stored.dirCos,
    dirCount: recounted.dirCount - stored.dirCount,
  };
  const same = delta.count === 0 && delta.speedSumCmps === 0 && delta.dirCount === 0 && delta.dirSin === 0 && delta.dirCos === 0 && recounted.maxGustCmps <= stored.maxGustCmps;
  return same ? null : delta;
}
