/**
 * Log queries against real SQLite: a window is answered with at most the points asked for, each
 * point the mean and highest gust of its span, from the rollups when a point spans a minute or
 * more and from the raw readings below that. Named regression: buckets must use integer division
 * (better-sqlite3 binds numbers as REAL; a real division made one bucket per row).
 */
import { describe, expect, it } from 'vitest';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
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

describe('the day report lists only what was on the register that day', async () => {
  const { daySummary, sensorSpells } = await import('../../server/storage/daySummary.ts');
  const { ensureSite, updateSite } = await import('../../server/register/site.ts');
  const { createSensor, retireSensor } = await import('../../server/register/sensors.ts');
  const { createStructure, retireStructure } = await import('../../server/register/structures.ts');
  const { zonedDayWindow } = await import('../../server/http/routes/zonedDay.ts');

  // Invented scenario: Brackenfold Common, site clock Europe/London (BST in June, UTC+1).
  // The day under review is 13 June 2026: 12 June 23:00 UTC to 13 June 23:00 UTC.
  const tz = 'Europe/London';
  const day = zonedDayWindow('2026-06-13', tz)!;
  const at = (iso: string): number => Date.parse(iso);
  const opened = openDatabase(':memory:');
  const { db, sqlite } = opened;
  const storage = new SqliteStorage(opened);
  const site = await ensureSite(storage, at('2026-06-01T08:00:00Z'));
  await updateSite(storage, { timeZone: tz }, 'test', at('2026-06-01T08:00:00Z'));
  const sensor = (key: string, iso: string) => createSensor(storage, site.id, { key, name: key, heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000 }, 'test', at(iso));
  const arch = (name: string, iso: string) =>
    createStructure(
      storage,
      site.id,
      {
        record: { kind: 'custom', name, baseDepthM: 1.5, referenceHeightM: 10, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 1000, xM: 0.75 }] },
        orientationDeg: 0,
        location: '',
        latDeg: null,
        lonDeg: null,
        mobile: false,
        sensorKeys: null,
        levels: null,
      },
      'test',
      at(iso),
    );

  await sensor('old-mast', '2026-06-01T09:00:00Z');
  await retireSensor(storage, 'old-mast', 'test', at('2026-06-05T09:00:00Z'));
  await sensor('north-mast', '2026-06-10T09:00:00Z');
  await sensor('west-mast', '2026-06-10T09:00:00Z');
  // Retired at 12:00 site time on the day, its key registered again two days later.
  await retireSensor(storage, 'west-mast', 'test', at('2026-06-13T11:00:00Z'));
  await sensor('west-mast', '2026-06-15T07:30:00Z');
  // Registered the morning after the day ("created today" when the report is read).
  await sensor('east-pole', '2026-06-14T08:00:00Z');
  // Registered after the day too, but its gateway flushed a buffered reading taken on the day.
  await sensor('gate-pole', '2026-06-14T08:05:00Z');
  const gatePoleId = (sqlite.prepare("SELECT id FROM sensors WHERE key = 'gate-pole'").get() as { id: number }).id;
  const queue = new WriteQueue(sqlite);
  const batch = emptyWriteBatch();
  batch.readings.push({ sensorId: gatePoleId, tsMs: at('2026-06-13T15:00:00Z'), speedMps: 6, gustMps: 9, dirDeg: 250, tempC: null, pressurePa: null, rhPct: null, late: true, rollupGustMps: 9 });
  void queue.enqueue(batch);
  queue.settle();

  const gateArch = await arch('Gate arch', '2026-06-10T09:00:00Z');
  const marquee = await arch('Hospitality marquee', '2026-06-14T09:00:00Z');
  // Up at 10:00 site time on the day, taken down at 16:00.
  const booth = await arch('Ticket booth banner', '2026-06-13T09:00:00Z');
  await retireStructure(storage, booth.id, 'test', at('2026-06-13T15:00:00Z'));
  const oldStage = await arch('Old stage wing', '2026-06-02T09:00:00Z');
  await retireStructure(storage, oldStage.id, 'test', at('2026-06-04T09:00:00Z'));

  const summary = daySummary(db, day.fromMs, day.toMs, at('2026-06-16T12:00:00Z'));

  it('leaves out structures registered after the day’s end and retired before its start', () => {
    expect(summary.structures.map((s) => s.name).sort()).toEqual(['Gate arch', 'Ticket booth banner']);
    expect(summary.structures.map((s) => s.id)).not.toContain(marquee.id);
  });

  it('counts a structure registered and retired during the day from then and up to then (10:00 to 16:00 site time: 6 h)', () => {
    const b = summary.structures.find((s) => s.id === booth.id)!;
    expect(b.onRegister).toEqual({ fromMs: at('2026-06-13T09:00:00Z'), toMs: at('2026-06-13T15:00:00Z') });
    expect(b.retiredAtMs).toBe(at('2026-06-13T15:00:00Z'));
    expect(b.msAtLevel.reduce((a, x) => a + x, 0)).toBe(6 * 3_600_000);
    // Nothing was logged for it: all of its 6 hours are without data, none of the day before it existed.
    expect(b.msNoData).toBe(6 * 3_600_000);
    const g = summary.structures.find((s) => s.id === gateArch.id)!;
    expect(g.onRegister).toEqual(day);
    expect(g.msAtLevel.reduce((a, x) => a + x, 0)).toBe(day.toMs - day.fromMs);
  });

  it('lists the sensors on the register that day, one retired at noon up to then, and one known from its readings', () => {
    expect(summary.sensors.map((s) => s.key)).toEqual(['gate-pole', 'north-mast', 'west-mast']);
    expect(summary.sensors.find((s) => s.key === 'west-mast')!.onRegister).toEqual({ fromMs: day.fromMs, toMs: at('2026-06-13T11:00:00Z') });
    expect(summary.sensors.find((s) => s.key === 'gate-pole')).toMatchObject({ readings: 1, maxGustMps: 9 });
  });

  it('takes a sensor key’s spells from the audit trail: retired on the 13th, registered again on the 15th', () => {
    const day14 = zonedDayWindow('2026-06-14', tz)!;
    const day15 = zonedDayWindow('2026-06-15', tz)!;
    const later = at('2026-06-16T12:00:00Z');
    expect(daySummary(db, day14.fromMs, day14.toMs, later).sensors.map((s) => s.key)).toEqual(['east-pole', 'gate-pole', 'north-mast']);
    const on15 = daySummary(db, day15.fromMs, day15.toMs, later).sensors.find((s) => s.key === 'west-mast');
    expect(on15?.onRegister).toEqual({ fromMs: at('2026-06-15T07:30:00Z'), toMs: day15.toMs });
  });

  it('reads the spells of a key retired by a register import (no audit row per sensor) up to the register’s retired time', () => {
    const spells = sensorSpells({ createdAtMs: 1_000, retiredAtMs: 5_000 }, [{ atMs: 1_000, entity: 'sensor', action: 'create' }, { atMs: 5_000, entity: 'register', action: 'import (replace)' }]);
    expect(spells).toEqual([[1_000, 5_000]]);
    // Retired through the API, brought back by an import: in service again from the import.
    const back = sensorSpells({ createdAtMs: 1_000, retiredAtMs: null }, [
      { atMs: 1_000, entity: 'sensor', action: 'create' },
      { atMs: 3_000, entity: 'sensor', action: 'retire' },
      { atMs: 7_000, entity: 'register', action: 'import (merge)' },
    ]);
    expect(back).toEqual([
      [1_000, 3_000],
      [7_000, Infinity],
    ]);
  });

  it('lists nothing for a day before anything was registered', () => {
    const before = zonedDayWindow('2026-05-20', tz)!;
    const empty = daySummary(db, before.fromMs, before.toMs, at('2026-06-16T12:00:00Z'));
    expect(empty.structures).toEqual([]);
    expect(empty.sensors).toEqual([]);
  });
});
