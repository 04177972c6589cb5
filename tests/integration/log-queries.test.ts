/**
 * Log queries against real SQLite: a window is answered with at most the points asked for, each
 * point the mean and highest gust of its span, from the rollups when a point spans a minute or
 * more and from the raw readings below that. Named regression: buckets must use integer division
 * (better-sqlite3 binds numbers as REAL; a real division made one bucket per row).
 */
import { describe, expect, it } from 'vitest';
import { openDatabase } from '../../server/storage/database.ts';
import { LogQueries } from '../../server/storage/logQueries.ts';
import { emptyWriteBatch } from '../../server/storage/writeBatch.ts';
import { WriteQueue } from '../../server/storage/writeQueue.ts';

const dayStart = Date.UTC(2026, 5, 13);

function seededDay() {
  const { db, sqlite } = openDatabase(':memory:');
  sqlite.prepare("INSERT INTO sites (id, name, default_levels_json, created_at_ms, updated_at_ms) VALUES (1, 'Brackenfold Common', '[]', 0, 0)").run();
  sqlite.prepare("INSERT INTO sensors (id, site_id, key, name, height_m, created_at_ms) VALUES (1, 1, 'north-mast', 'North mast', 10, 0)").run();
  const queue = new WriteQueue(sqlite);
  // One reading a second for a day; speed = 5 m/s + (minute of the hour) / 10, gust 1.5 × speed.
  for (let hour = 0; hour < 24; hour++) {
    const batch = emptyWriteBatch();
    for (let s = 0; s < 3600; s++) {
      const t = dayStart + hour * 3_600_000 + s * 1000;
      const speed = 5 + Math.floor(s / 60) / 10;
      batch.readings.push({ sensorId: 1, tsMs: t, speedMps: speed, gustMps: null, dirDeg: 270, tempC: null, pressurePa: null, rhPct: null, late: false, rollupGustMps: speed * 1.5 });
    }
    void queue.enqueue(batch);
    queue.flush();
  }
  // The day's last minute is still open in memory until the queue settles (as at shutdown).
  queue.settle();
  return { db, sqlite, queries: new LogQueries(sqlite) };
}

describe('the wind history of a day (86 400 readings)', () => {
  const { queries } = seededDay();

  it('answers a day with at most 2 000 points, from the per-minute rollups', () => {
    const series = queries.windSeries(1, dayStart, dayStart + 86_400_000, 2_000);
    expect(series.source).toBe('minutes');
    expect(series.tMs.length).toBeLessThanOrEqual(2_000);
    expect(series.tMs.length).toBeGreaterThan(1_400);
    expect(series.bucketMs).toBe(60_000);
    // Minute 37 of hour 5: every reading 5 + 3.7 m/s; gust 1.5 times that.
    const i = series.tMs.indexOf(dayStart + 5 * 3_600_000 + 37 * 60_000);
    expect(series.meanMps[i]).toBeCloseTo(8.7, 9);
    expect(series.gustMps[i]).toBeCloseTo(13.05, 9);
    expect(series.samples[i]).toBe(60);
    expect(series.dirDeg[i]).toBeCloseTo(270, 6);
  });

  it('answers a 6-hour window in 200 points of 2 minutes, each the mean of its 120 readings', () => {
    const from = dayStart + 3_600_000;
    const series = queries.windSeries(1, from, from + 6 * 3_600_000, 200);
    expect(series.tMs.length).toBe(180);
    expect(series.bucketMs).toBe(120_000);
    // The first bucket: minutes 0 and 1 of hour 1 → speeds 5.0 and 5.1, 60 readings each.
    expect(series.meanMps[0]).toBeCloseTo(5.05, 9);
    expect(series.gustMps[0]).toBeCloseTo(5.1 * 1.5, 9);
    expect(series.samples[0]).toBe(120);
  });

  it('answers a 10-minute window from the raw readings, 100 points of 6 s', () => {
    const from = dayStart + 7_200_000;
    const series = queries.windSeries(1, from, from + 600_000, 100);
    expect(series.source).toBe('readings');
    expect(series.bucketMs).toBe(6_000);
    expect(series.tMs.length).toBe(100);
    expect(series.samples.every((n) => n === 6)).toBe(true);
  });

  it('gives the same buckets as the naive full scan', () => {
    const from = dayStart + 3 * 3_600_000 + 123_000;
    const to = from + 20 * 60_000;
    const fast = queries.windSeries(1, from, to, 400);
    const naive = queries.windSeriesByFullScan(1, from, to, 400);
    expect(fast.tMs).toEqual(naive.tMs);
    fast.meanMps.forEach((m, i) => expect(m).toBeCloseTo(naive.meanMps[i]!, 9));
  });
});

describe('raw-reading retention', () => {
  it('deletes raw readings before the cutoff and keeps the per-minute rollups, so the day still answers', async () => {
    const { removeRawReadingsBefore } = await import('../../server/storage/retention.ts');
    const { sqlite, queries } = seededDay();
    const cutoff = dayStart + 12 * 3_600_000;
    expect(await removeRawReadingsBefore(sqlite, cutoff)).toBe(12 * 3600);
    expect((sqlite.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n).toBe(12 * 3600);
    const morning = queries.windSeries(1, dayStart, cutoff, 1_000);
    expect(morning.source).toBe('minutes');
    expect(morning.tMs.length).toBe(720);
    expect(morning.meanMps[0]).toBeCloseTo(5, 9);
  });

  it('deletes slice by slice per sensor, giving the event loop back between slices, and skips long gaps', async () => {
    const { removeRawReadingsBefore } = await import('../../server/storage/retention.ts');
    const { sqlite } = seededDay();
    // A second sensor with one reading a month before the day and a few inside it.
    sqlite.prepare("INSERT INTO sensors (id, site_id, key, name, height_m, created_at_ms) VALUES (2, 1, 'mast-2', 'Mast 2', 10, 0)").run();
    const insert = sqlite.prepare('INSERT INTO readings (sensor_id, ts_ms, speed_cmps, flags) VALUES (2, ?, 500, 0)');
    for (const ts of [dayStart - 30 * 86_400_000, dayStart + 1_000, dayStart + 13 * 3_600_000]) insert.run(ts);
    const cutoff = dayStart + 6 * 3_600_000;
    let pauses = 0;
    const removed = await removeRawReadingsBefore(sqlite, cutoff, { sliceMs: 3_600_000, pause: async () => void pauses++ });
    // Sensor 1: 6 h × 3 600 readings; sensor 2: the two before the cutoff.
    expect(removed).toBe(6 * 3600 + 2);
    // Sensor 1: six one-hour slices; sensor 2: the month-old reading, then straight to the day's.
    expect(pauses).toBe(6 + 2);
    const left = (id: number) => (sqlite.prepare('SELECT COUNT(*) AS n, MIN(ts_ms) AS first FROM readings WHERE sensor_id = ?').get(id) as { n: number; first: number });
    expect(left(1)).toEqual({ n: 18 * 3600, first: cutoff });
    expect(left(2)).toEqual({ n: 1, first: dayStart + 13 * 3_600_000 });
  });
});
