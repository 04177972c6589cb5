/**
 * Plan screen, "From the feed" (issue 17): what the forecast feed polled by the server says for
 * the next 12 hours (GET /api/forecast/feed), refreshed every minute. The last poll's time and
 * age, OK or failed with the reason in plain words, **stale** in red when no poll has succeeded
 * for twice the interval, and each structure's predicted level hour by hour. A feed that is
 * failing or stale is never shown as calm: its problems come first, and an hour without wind
 * reads unknown.
 */
import { useEffect, useState } from 'preact/hooks';
import { api, errorText } from '../api.ts';
import { LevelShape, levelTone } from '../components/levelBadge.tsx';
import { prefs } from '../prefs.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import { dateTime, duration, hourMinute, speed } from '../units.ts';

interface FeedHour {
  timeMs: number;
  gustAtStructureMps: number | null;
  level: number | null;
  plannedConfiguration: string | null;
  plannedLevel: number | null;
}

interface FeedAnswer {
  configured: boolean;
  url: string | null;
  intervalMs: number;
  heightM: number;
  lastPoll: { atMs: number; ok: boolean; httpStatus: number | null; error: string | null; rowCount: number } | null;
  lastSuccessAtMs: number | null;
  ageMs: number | null;
  stale: boolean;
  consecutiveFailures: number;
  problems: string[];
  predictions: {
    polledAtMs: number;
    rows: Array<{ timeMs: number; gustMps: number | null; gustSource: 'gust' | 'mean' | null }>;
    structures: Array<{ id: number; name: string; configuration: string; levels: Array<{ level: number; label: string }>; hours: FeedHour[]; highestLevel: number | null; highestAtMs: number | null; unknownHours: number }>;
    notChecked: Array<{ id: number; name: string; reason: string }>;
  } | null;
}

const refreshMs = 60_000;

/**
 * `structureId`: only that structure's row (its structure page: "the forecast's predicted level
 * for the next 12 hours"); otherwise every structure (the Plan screen).
 */
export function ForecastFeedPanel({ structureId }: { structureId?: number } = {}) {
  const tz = useTimeZone();
  const unit = useStore(prefs).unit;
  const [feed, setFeed] = useState<FeedAnswer | null>(null);
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let alive = true;
    const load = async () => {
      try {
        const answer = await api<FeedAnswer>('/api/forecast/feed');
        if (alive) {
          setFeed(answer);
          setError(null);
        }
      } catch (err) {
        if (alive) setError(errorText(err));
      }
    };
    void load();
    const timer = setInterval(() => void load(), refreshMs);
    return () => {
      alive = false;
      clearInterval(timer);
    };
  }, []);

  if (error) {
    return (
      <section class="feed-panel" aria-labelledby="feed-h">
        <h2 id="feed-h">From the feed</h2>
        <p class="error-box" role="alert">The feed’s state cannot be read: {error}. The hours ahead are unknown.</p>
      </section>
    );
  }
  if (!feed || !feed.configured) {
    return feed ? (
      <section class="feed-panel" aria-labelledby="feed-h">
        <h2 id="feed-h">From the feed</h2>
        <p class="muted">No forecast feed is set (Site settings, “Forecast feed”).{structureId === undefined ? ' Paste a forecast below instead.' : ' The Plan screen checks a pasted forecast.'}</p>
      </section>
    ) : null;
  }
  const last = feed.lastPoll;
  const all = feed.predictions;
  const p = all && structureId !== undefined ? { ...all, structures: all.structures.filter((x) => x.id === structureId), notChecked: all.notChecked.filter((x) => x.id === structureId) } : all;
  return (
    <section class={`feed-panel${feed.stale ? ' feed-stale' : ''}`} aria-labelledby="feed-h">
      <h2 id="feed-h">
        {structureId === undefined ? 'From the feed' : 'Forecast from the feed, next 12 hours'} {feed.stale ? <span class="feed-flag">STALE</span> : last && !last.ok ? <span class="feed-flag">FAILING</span> : null}
      </h2>
      <p class="small">
        {last === null
          ? 'Not polled yet.'
          : `Last poll ${dateTime(last.atMs, tz)} (${duration(Date.now() - last.atMs)} ago): ${last.ok ? `OK, ${last.rowCount} rows` : 'failed'}.`}{' '}
        {feed.lastSuccessAtMs !== null && !(last?.ok ?? false) ? `Forecast shown from the poll of ${dateTime(feed.lastSuccessAtMs, tz)}.` : ''} Polled every {duration(feed.intervalMs)}; speeds at {feed.heightM} m.
      </p>
      {feed.problems.length > 0 ? (
        <div class="error-box" role="alert">
          <p class="message-text">{feed.stale ? 'Do not rely on this forecast:' : 'The feed has a problem:'}</p>
          <ul>
            {feed.problems.map((text) => (
              <li>{text}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {p && p.rows.length > 0 ? (
        <div class="feed-grid-wrap" role="region" aria-label="Predicted levels, hour by hour" tabIndex={0}>
          <table class="feed-grid">
            <caption class="visually-hidden">Predicted level per structure for each forecast hour</caption>
            <thead>
              <tr>
                <th scope="col">Structure</th>
                {p.rows.map((r) => (
                  <th scope="col">
                    {hourMinute(r.timeMs, tz)}
                    <span class="help">{r.gustMps === null ? 'no wind' : `${speed(r.gustMps, unit)}${r.gustSource === 'mean' ? ' est.' : ''}`}</span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {p.structures.map((s) => (
                <tr>
                  <th scope="row">
                    {s.name}
                    <span class="help">
                      {s.highestLevel === null ? 'unknown' : s.highestLevel === 0 ? 'below every level' : `${s.levels[s.highestLevel - 1]?.label ?? `Level ${s.highestLevel}`} at ${hourMinute(s.highestAtMs!, tz)}`}
                      {s.unknownHours > 0 ? `; ${s.unknownHours} h unknown` : ''}
                    </span>
                  </th>
                  {s.hours.map((h) => {
                    const tone = levelTone(h.level, s.levels.length);
                    const words = h.level === null ? 'unknown' : h.level === 0 ? 'below levels' : (s.levels[h.level - 1]?.label ?? `Level ${h.level}`);
                    return (
                      <td class={`tone-${tone}`} title={h.gustAtStructureMps === null ? 'no wind in this row' : `gust here ${speed(h.gustAtStructureMps, unit)}`}>
                        <LevelShape tone={tone} size={18} /> <span>{words}</span>
                        {h.plannedConfiguration !== null ? <span class="help">{h.plannedConfiguration}: {h.plannedLevel === null ? 'unknown' : h.plannedLevel === 0 ? 'below levels' : (s.levels[h.plannedLevel - 1]?.label ?? `Level ${h.plannedLevel}`)}</span> : null}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {p && p.notChecked.length > 0 ? <p class="small">Not checked: {p.notChecked.map((n) => `${n.name} (${n.reason})`).join('; ')}.</p> : null}
      <p class="muted small">An estimate from the forecast, never a measurement: the live gust on the board governs.</p>
    </section>
  );
}
