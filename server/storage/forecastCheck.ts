/**
 * How the forecast feed did (design §2.7, §2.8): for each forecast hour of a window, the forecast
 * mean and gust from the last successful poll made before that hour, beside the wind measured
 * over the hour by the site's highest sensor, and the difference (forecast − measured: negative
 * is a forecast that was too low, the case that matters).
 *
 * - The hour of a forecast row at time t is [t, t + 1 h). Only hours that have ended are compared.
 * - The forecast: the row for t in the newest poll made before t (a poll at t or later knew the
 *   hour's weather; the check is of what the site had to plan with). Polls more than 48 hours
 *   before the hour are not used.
 * - The sensor: the highest one (height above ground) with wind data in the window, ties by key.
 *   Its speeds are at its own height, the forecast's at the feed's height: both are named, and
 *   nothing is moved between heights.
 * - Measured mean: the highest of the hour's six 10-minute means (blocks from t, each the mean of
 *   its samples in the per-minute rollups, `wind_minutes`), as a forecast mean is a 10-minute
 *   mean (WMO-No. 8, from memory). Measured gust: the highest gust of the hour's minutes (the
 *   3-second gust, or a summary's gust). An hour without data reads null (unknown), never calm.
 * - The summary counts hours with data in at least half their minutes (common practice: a figure
 *   over a few minutes says little about an hour); every hour lists its minutes with data.
 */
import type { Db } from './database.ts';

const hourMs = 3_600_000;
const blockMs = 600_000;
const minuteMs = 60_000;
/** Polls older than this before the hour are not the forecast the site planned with. */
export const forecastCheckLookbackMs = 48 * hourMs;
/** Longest window the check answers. */
export const forecastCheckMaxWindowMs = 7 * 86_400_000;
/** Minutes with data an hour needs to count in the summary. */
export const forecastCheckMinMinutes = 30;

export interface ForecastCheckHour {
  /** Start of the hour: the forecast row's time. */
  timeMs: number;
  /** The poll the forecast came from, and how long before the hour it was made. */
  polledAtMs: number;
  leadMs: number;
  forecastMeanMps: number | null;
  forecastGustMps: number | null;
  forecastDirFromDeg: number | null;
  /** Highest 10-minute mean of the hour and when its block started; null without data. */
  measuredMeanMps: number | null;
  measuredMeanAtMs: number | null;
  /** Highest gust of the hour and its minute; null without data. */
  measuredGustMps: number | null;
  measuredGustAtMs: number | null;
  minutesWithData: number;
  /** Forecast − measured, m/s; null when either is missing. */
  meanDifferenceMps: number | null;
  gustDifferenceMps: number | null;
  /** In the summary: at least `forecastCheckMinMinutes` minutes with data. */
  counted: boolean;
}

export interface ForecastCheck {
  fromMs: number;
  toMs: number;
  /** The sensor compared with; null when no sensor has data in the window. */
  sensor: { key: string; name: string; heightM: number } | null;
  /** Height the feed's speeds refer to (the site's setting now), m. */
  forecastHeightM: number;
  /** Polls made in the window: all, and those that failed. */
  pollCount: number;
  failedPollCount: number;
  hours: ForecastCheckHour[];
  summary: {
    /** Counted hours with a forecast gust and a measured gust. */
    gustHours: number;
    /** Of those, hours whose measured gust was above the forecast. */
    gustUnderForecastHours: number;
    /** The largest measured − forecast gust (> 0) and its hour; null when the forecast was never too low. */
    largestGustUnderForecastMps: number | null;
    largestGustUnderForecastAtMs: number | null;
    /** Mean of forecast − measured over counted hours, m/s (the bias); null with none. */
    meanGustDifferenceMps: number | null;
    meanHours: number;
    meanMeanDifferenceMps: number | null;
  };
  /** What a reader should know, in sentences. */
  notes: string[];
}

/**
 * The forecast check of [fromMs, toMs) as the log stands at `nowMs`. A window longer than 7 days
 * answers no hours and says so.
 */
export function forecastCheck(db: Db, fromMs: number, toMs: number, nowMs: number): ForecastCheck {
  const sqlite = db.$client;
  const heightRow = sqlite.prepare('SELECT forecast_feed_height_m AS h FROM sites ORDER BY id LIMIT 1').get() as { h: number } | undefined;
  const forecastHeightM = heightRow?.h ?? 10;
  const polls = sqlite.prepare('SELECT COUNT(*) AS n, COALESCE(SUM(ok = 0), 0) AS failed FROM forecast_polls WHERE at_ms >= ? AND at_ms < ?').get(fromMs, toMs) as { n: number; failed: number };
  const empty: ForecastCheck = {
    fromMs,
    toMs,
    sensor: null,
    forecastHeightM,
    pollCount: polls.n,
    failedPollCount: polls.failed,
    hours: [],
    summary: { gustHours: 0, gustUnderForecastHours: 0, largestGustUnderForecastMps: null, largestGustUnderForecastAtMs: null, meanGustDifferenceMps: null, meanHours: 0, meanMeanDifferenceMps: null },
    notes: [],
  };
  if (toMs - fromMs > forecastCheckMaxWindowMs) return { ...empty, notes: ['The forecast check covers at most 7 days at a time: choose a shorter window.'] };

  // The forecast of each hour: rows of successful polls, oldest poll first, so the last one kept
  // for an hour is the newest poll made before it.
  const rows = sqlite
    .prepare(
      `SELECT p.at_ms AS polledAtMs, CAST(json_extract(j.value, '$.timeMs') AS INTEGER) AS t,
              json_extract(j.value, '$.meanMps') AS mean, json_extract(j.value, '$.gustMps') AS gust, json_extract(j.value, '$.dirFromDeg') AS dir
       FROM forecast_polls p, json_each(p.rows_json) j
       WHERE p.ok = 1 AND p.rows_json IS NOT NULL AND p.at_ms >= @look AND p.at_ms < @to
         AND json_extract(j.value, '$.timeMs') >= @from AND json_extract(j.value, '$.timeMs') < @to
         AND json_extract(j.value, '$.timeMs') > p.at_ms AND json_extract(j.value, '$.timeMs') - p.at_ms <= @lookback
         AND json_extract(j.value, '$.timeMs') + @hour <= @now
       ORDER BY p.at_ms, p.id`,
    )
    .all({ look: fromMs - forecastCheckLookbackMs, from: fromMs, to: toMs, now: nowMs, hour: hourMs, lookback: forecastCheckLookbackMs }) as Array<{
    polledAtMs: number;
    t: number;
    mean: number | null;
    gust: number | null;
    dir: number | null;
  }>;
  const byHour = new Map<number, (typeof rows)[number]>();
  for (const r of rows) byHour.set(r.t, r);
  if (byHour.size === 0) {
    return { ...empty, notes: ['No hour of this window has both ended and a forecast from a successful poll made before it: the feed was off or failing, or the hours are still ahead.'] };
  }

  const dataTo = Math.min(toMs + hourMs, nowMs);
  const sensor = sqlite
    .prepare(
      `SELECT s.id, s.key, s.name, s.height_m AS heightM FROM sensors s
       WHERE EXISTS (SELECT 1 FROM wind_minutes w WHERE w.sensor_id = s.id AND w.minute_ms >= ? AND w.minute_ms < ? AND w.sample_count > 0)
       ORDER BY s.height_m DESC, s.key LIMIT 1`,
    )
    .get(fromMs - (fromMs % minuteMs), dataTo) as { id: number; key: string; name: string; heightM: number } | undefined;
  const minutes = new Map<number, { n: number; sum: number; gust: number }>();
  if (sensor) {
    const minuteRows = sqlite
      .prepare('SELECT minute_ms AS m, sample_count AS n, speed_sum_cmps AS s, max_gust_cmps AS g FROM wind_minutes WHERE sensor_id = ? AND minute_ms >= ? AND minute_ms < ? AND sample_count > 0')
      .all(sensor.id, fromMs - (fromMs % minuteMs), dataTo) as Array<{ m: number; n: number; s: number; g: number }>;
    for (const m of minuteRows) minutes.set(m.m, { n: m.n, sum: m.s, gust: m.g });
  }

  const hours: ForecastCheckHour[] = [...byHour.values()]
    .sort((a, b) => a.t - b.t)
    .map((f) => {
      let minutesWithData = 0;
      let gustCmps = -1;
      let gustAtMs: number | null = null;
      let bestMean = -1;
      let bestMeanAtMs: number | null = null;
      for (let block = 0; block < 6; block++) {
        const blockStart = f.t + block * blockMs;
        let n = 0;
        let sum = 0;
        for (let m = Math.ceil(blockStart / minuteMs) * minuteMs; m < blockStart + blockMs; m += minuteMs) {
          const row = minutes.get(m);
          if (!row) continue;
          minutesWithData++;
          n += row.n;
          sum += row.sum;
          if (row.gust > gustCmps) {
            gustCmps = row.gust;
            gustAtMs = m;
          }
        }
        if (n > 0 && sum / n > bestMean) {
          bestMean = sum / n;
          bestMeanAtMs = blockStart;
        }
      }
      const measuredMeanMps = bestMeanAtMs === null ? null : bestMean / 100;
      const measuredGustMps = gustAtMs === null ? null : gustCmps / 100;
      return {
        timeMs: f.t,
        polledAtMs: f.polledAtMs,
        leadMs: f.t - f.polledAtMs,
        forecastMeanMps: f.mean,
        forecastGustMps: f.gust,
        forecastDirFromDeg: f.dir,
        measuredMeanMps,
        measuredMeanAtMs: bestMeanAtMs,
        measuredGustMps,
        measuredGustAtMs: gustAtMs,
        minutesWithData,
        meanDifferenceMps: f.mean === null || measuredMeanMps === null ? null : f.mean - measuredMeanMps,
        gustDifferenceMps: f.gust === null || measuredGustMps === null ? null : f.gust - measuredGustMps,
        counted: minutesWithData >= forecastCheckMinMinutes,
      };
    });

  const counted = hours.filter((h) => h.counted);
  const gusts = counted.filter((h) => h.gustDifferenceMps !== null);
  const means = counted.filter((h) => h.meanDifferenceMps !== null);
  let largest: ForecastCheckHour | null = null;
  for (const h of gusts) if (h.gustDifferenceMps! < 0 && (largest === null || h.gustDifferenceMps! < largest.gustDifferenceMps!)) largest = h;
  const average = (list: number[]): number | null => (list.length === 0 ? null : list.reduce((a, b) => a + b, 0) / list.length);

  const notes: string[] = [];
  if (!sensor) notes.push('No sensor has wind data for these hours: nothing measured to compare with (unknown, not calm).');
  else if (Math.abs(sensor.heightM - forecastHeightM) > 0.5) {
    notes.push(`The forecast speeds are for ${forecastHeightM} m above ground and ${sensor.name} stands at ${sensor.heightM} m: a sensor ${sensor.heightM < forecastHeightM ? 'lower' : 'higher'} than the forecast height reads ${sensor.heightM < forecastHeightM ? 'less' : 'more'} wind; the figures are compared as they are.`);
  }
  const short = hours.length - counted.length;
  if (sensor && short > 0) notes.push(`${short} hour${short === 1 ? ' has' : 's have'} data in fewer than ${forecastCheckMinMinutes} of their minutes: listed, not counted in the summary.`);

  return {
    ...empty,
    sensor: sensor ? { key: sensor.key, name: sensor.name, heightM: sensor.heightM } : null,
    hours,
    summary: {
      gustHours: gusts.length,
      gustUnderForecastHours: gusts.filter((h) => h.gustDifferenceMps! < 0).length,
      largestGustUnderForecastMps: largest === null ? null : -largest.gustDifferenceMps!,
      largestGustUnderForecastAtMs: largest?.timeMs ?? null,
      meanGustDifferenceMps: average(gusts.map((h) => h.gustDifferenceMps!)),
      meanHours: means.length,
      meanMeanDifferenceMps: average(means.map((h) => h.meanDifferenceMps!)),
    },
    notes,
  };
}
