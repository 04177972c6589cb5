/**
 * The forecast feed over HTTP (design §2.7, issue 17):
 * - GET /api/forecast/feed (viewer): the feed's state — its last poll (ok or failed, with the
 *   reason), the age of the forecast in use, stale (no successful poll within twice the
 *   interval) — and each structure's predicted level for every forecast row of the next 12 hours,
 *   read as POST /api/forecast reads a pasted table (predictLevels, every configuration).
 * - POST /api/forecast/feed/poll (competent person): poll now, answer the poll.
 * - GET /api/log/forecast (viewer): forecast against measured wind for a window of at most 7
 *   days (storage/forecastCheck.ts).
 */
import { Hono } from 'hono';
import { gustHeightFactor } from '../../engine/index.ts';
import type { ForecastFeed, ForecastFeedStatus, ForecastPoll } from '../../forecastFeed/index.ts';
import { redactedUrl } from '../../forecastFeed/index.ts';
import { predictLevels, predictPlannedLevels, type ForecastRow } from '../../foresight/index.ts';
import { getSite } from '../../register/site.ts';
import { forecastCheckMaxWindowMs } from '../../storage/forecastCheck.ts';
import { chanceThresholds, triggerLadderMps } from '../../levels/index.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { HttpError } from '../httpError.ts';
import type { ApiContext } from './apiContext.ts';
import { forecastConfigurations, windowOf } from './logRoutes.ts';

/** How far ahead the board shows the feed's forecast. */
export const feedHorizonMs = 12 * 3_600_000;
const hourMs = 3_600_000;

const pollView = (p: ForecastPoll | null) =>
  p === null
    ? null
    : { id: p.id, atMs: p.atMs, ok: p.ok, httpStatus: p.httpStatus, error: p.error, format: p.format, rowCount: p.rows?.length ?? 0, rows: p.rows ?? [], notes: p.notes, bytes: p.bytes, durationMs: p.durationMs };

/** What is wrong with the feed, in plain words, most serious first; empty when nothing is. */
function feedProblems(s: ForecastFeedStatus, nowMs: number, rowsAhead: number, lastRowMs: number | null): string[] {
  if (!s.configured) return [];
  const out: string[] = [];
  const words = (ms: number) => durationWords(ms);
  if (s.lastSuccess === null) out.push('No forecast has been read from the feed yet: the hours ahead are unknown, not calm.');
  else if (s.stale) out.push(`The forecast is stale: the last good poll was ${words(s.ageMs!)} ago, more than twice the interval (${words(2 * s.settings.intervalMs)}).`);
  if (s.lastPoll && !s.lastPoll.ok) out.push(`The last poll failed (${s.consecutiveFailures} in a row): ${s.lastPoll.error ?? 'no reason given'}.`);
  if (s.lastSuccess !== null && rowsAhead === 0) out.push('The feed has no forecast for the next 12 hours.');
  else if (s.lastSuccess !== null && lastRowMs !== null && lastRowMs + hourMs < nowMs + feedHorizonMs) out.push(`The feed’s forecast ends before the next 12 hours do (last hour from ${new Date(lastRowMs).toISOString()}).`);
  return out;
}

export function durationWords(ms: number): string {
  const minutes = Math.round(ms / 60_000);
  if (minutes < 60) return `${minutes} min`;
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

export function forecastFeedRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  const viewer = requireRole('viewer');
  const editor = requireRole('competent-person');
  const feed = (): ForecastFeed => {
    if (!ctx.forecastFeed) throw new HttpError(503, 'the forecast feed is not running on this server');
    return ctx.forecastFeed;
  };

  api.get('/forecast/feed', viewer, async (c) => {
    const nowMs = feed().now();
    const s = await feed().status(nowMs);
    const rows = (s.lastSuccess?.rows ?? []).filter((r) => r.timeMs > nowMs - hourMs && r.timeMs <= nowMs + feedHorizonMs);
    const lastRowMs = s.lastSuccess?.rows?.reduce((max, r) => Math.max(max, r.timeMs), -Infinity) ?? null;
    return c.json({
      configured: s.configured,
      url: s.settings.url === null ? null : redactedUrl(s.settings.url),
      intervalMs: s.settings.intervalMs,
      unit: s.settings.unit,
      heightM: s.settings.heightM,
      lastPoll: pollView(s.lastPoll),
      lastSuccessAtMs: s.lastSuccess?.atMs ?? null,
      ageMs: s.ageMs,
      stale: s.stale,
      consecutiveFailures: s.consecutiveFailures,
      nextPollAtMs: s.nextPollAtMs,
      problems: feedProblems(s, nowMs, rows.length, lastRowMs === null || !Number.isFinite(lastRowMs) ? null : lastRowMs),
      predictions: s.lastSuccess === null ? null : { fromMs: nowMs, toMs: nowMs + feedHorizonMs, polledAtMs: s.lastSuccess.atMs, ...(await feedPredictions(ctx, rows, s.settings.heightM)) },
    });
  });

  api.post('/forecast/feed/poll', editor, async (c) => {
    const poll = await feed().pollNow();
    if (poll === null) throw HttpError.invalid([{ path: 'forecastFeedUrl', message: 'no forecast feed is set: give its address in the site settings first' }]);
    return c.json({ poll: pollView(poll) });
  });

  api.get('/log/forecast', viewer, async (c) => {
    const { fromMs, toMs } = windowOf((n) => c.req.query(n), ctx.now(), (await getSite(ctx.storage)).timeZone);
    if (toMs - fromMs > forecastCheckMaxWindowMs) throw HttpError.invalid([{ path: 'from', message: 'the forecast check spans at most 7 days' }]);
    // The newest minute of each sensor is summed in memory: write it first, as the other log reads do.
    await ctx.queue.writeOpenMinutes();
    return c.json(await ctx.storage.log.forecastCheck(fromMs, toMs, ctx.now()));
  });

  return api;
}

/**
 * Each structure's predicted level in each row, as POST /api/forecast answers a pasted table:
 * the ladder over every direction at the air density now, the row's gust moved from the feed's
 * height to the structure's, every configuration and the one the plan moves it to.
 */
async function feedPredictions(ctx: ApiContext, rows: readonly ForecastRow[], heightM: number) {
  const site = await getSite(ctx.storage);
  const all = ctx.watch.snapshot().structures;
  const states = all.filter((s) => !s.error && s.triggerGustsMps.length > 0);
  const ladders = states.map((s) => (s.limitGustMps === s.allDirectionsLimitGustMps ? s.triggerGustsMps : triggerLadderMps(s.levels, s.allDirectionsLimitGustMps)));
  const heightFactor = (toHeightM: number) => gustHeightFactor({ fromHeightM: heightM, toHeightM, terrainCategory: site.terrainCategory, allowReduction: site.heightReductionEnabled });
  const predictions = predictLevels(
    rows,
    states.map((s, i) => ({ id: String(s.id), triggerGustsMps: ladders[i]!, heightFactor: heightFactor(s.referenceHeightM), chanceTriggers: chanceThresholds(s.levels, s.allDirectionsLimitGustMps) })),
  );
  const siteLevels = site.defaultLevelsJson;
  const planned = await Promise.all(states.map((s, i) => forecastConfigurations(ctx, s, ladders[i]!, heightFactor, siteLevels)));
  const plans = predictPlannedLevels(rows, planned.map((p) => p.structure));
  return {
    rows: predictions.map((p, i) => ({ timeMs: p.timeMs, meanMps: rows[i]!.meanMps, gustMps: p.gustMps, gustSource: p.gustSource, dirFromDeg: rows[i]!.dirFromDeg })),
    structures: states.map((s, k) => {
      const { structure: plannedStructure } = planned[k]!;
      const hours = predictions.map((p, i) => {
        const plan = plans[i]![k]!;
        const plannedIndex = plan.plannedIndex;
        return {
          timeMs: p.timeMs,
          gustAtStructureMps: p.levels[k]!.gustAtStructureMps,
          level: p.levels[k]!.level,
          // Where the plan's actions move it in this hour, and its level there.
          plannedConfiguration: plannedIndex === null ? null : plannedStructure.configurations[plannedIndex]!.name,
          plannedLevel: plannedIndex === null ? null : plan.inConfigurations[plannedIndex]!.level,
        };
      });
      const known = hours.filter((h) => h.level !== null);
      const highest = known.reduce<(typeof hours)[number] | null>((best, h) => (best === null || h.level! > best.level! ? h : best), null);
      return {
        id: s.id,
        name: s.name,
        referenceHeightM: s.referenceHeightM,
        configuration: plannedStructure.configurations[plannedStructure.currentIndex]!.name,
        levels: s.levels.map((l, j) => ({ level: l.level, label: l.label, triggerGustMps: ladders[k]![j]! })),
        hours,
        /** The highest predicted level and its first hour; null when no hour is known. */
        highestLevel: highest?.level ?? null,
        highestAtMs: highest?.timeMs ?? null,
        unknownHours: hours.length - known.length,
      };
    }),
    notChecked: all
      .filter((s) => !states.includes(s))
      .map((s) => ({ id: s.id, name: s.name, reason: s.error ? `its record cannot be assessed: ${s.error}` : 'it has no levels' })),
  };
}
