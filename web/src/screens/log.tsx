/**
 * The log of a day (in the site's time zone) or of the last hours: wind per sensor, utilization
 * per structure, level changes and alerts with their acknowledgements on one timeline, a wind
 * rose, the day's summary, CSV exports, and a printable day report (A4).
 *
 * The plan's actions (design §2.5): configuration switches (the crew's "Done" on an alert's
 * action, or by hand by the competent person, with who, when, from → to and the note) and actions
 * signalled again as overdue are events of the timeline; each level alert says whether and when
 * its action was done and by whom; the report lists the day's actions, how long after the alert
 * each came, and the late ones.
 */
import { useEffect, useMemo, useState } from 'preact/hooks';
import type { JSX } from 'preact';
import type uPlot from 'uplot';
import { api, errorText } from '../api.ts';
import { LevelShape, levelTone } from '../components/levelBadge.tsx';
import { multiSeriesStyle, TimeChart, type Band } from '../components/timeChart.tsx';
import { WindRose } from '../components/windRose.tsx';
import { live } from '../live.ts';
import { prefs } from '../prefs.ts';
import { href } from '../router.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import { chanceText } from '../foresightWords.ts';
import type { AlertRow, ConfigurationChangeEntry, ConfigurationLog, DaySummary, LevelChangeRow, OverdueSignalEntry, StructureDay, StructureLog, WindLog } from '../types.ts';
import { clockTime, dateTime, dayOf, duration, hourMinute, longDate, mpsToSpeed, percent, speed, speedUnitLabels } from '../units.ts';

const exportTables = [
  ['readings', 'Raw readings'],
  ['wind-minutes', 'Wind per minute'],
  ['structure-minutes', 'Structures per minute'],
  ['level-changes', 'Level changes'],
  ['alerts', 'Alerts and acknowledgements'],
  ['audit', 'Changes to the register (audit)'],
  ['configuration-changes', 'Configuration changes (plan actions)'],
] as const;

const lastHours = [6, 12, 24, 48];

/** Union of the x values of several series, each series re-indexed onto it (null where missing). */
export function alignSeries(xs: number[][], ys: Array<Array<number | null>>): uPlot.AlignedData {
  const all = [...new Set(xs.flat())].sort((a, b) => a - b);
  const index = new Map(all.map((x, i) => [x, i]));
  const out: Array<Array<number | null>> = ys.map(() => new Array<number | null>(all.length).fill(null));
  ys.forEach((y, s) => xs[s]!.forEach((x, i) => (out[s]![index.get(x)!] = y[i] ?? null)));
  return [all, ...out] as uPlot.AlignedData;
}

interface LogData {
  wind: WindLog;
  summary: DaySummary;
  levels: LevelChangeRow[];
  alerts: AlertRow[];
  structures: StructureLog[];
  configurationChanges: ConfigurationChangeEntry[];
  overdueSignals: OverdueSignalEntry[];
}

export function LogScreen() {
  const tz = useTimeZone();
  const unit = useStore(prefs).unit;
  const snap = useStore(live).snapshot;
  const today = dayOf(Date.now(), tz);
  const [mode, setMode] = useState<'day' | 'hours'>('day');
  const [day, setDay] = useState(today);
  const [hours, setHours] = useState(24);
  const [data, setData] = useState<LogData | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [loading, setLoading] = useState(false);
  /** Whether the opening day is settled: yesterday when today is quiet so far (nothing raised). */
  const [decided, setDecided] = useState(false);
  const [dayNote, setDayNote] = useState<string | null>(null);

  useEffect(() => {
    api<DaySummary>(`/api/log/summary?day=${today}`)
      .then((t) => {
        const quiet = t.alertCount === 0 && t.structures.every((s) => s.highestLevel === 0);
        if (quiet) {
          setDay(shiftDay(today, -1));
          setDayNote('Today has been quiet so far (no level reached, no alert): showing yesterday.');
        }
      })
      .catch(() => undefined)
      .finally(() => setDecided(true));
    // Only on opening the screen.
  }, []);

  const query = useMemo(() => {
    if (mode === 'day') return `day=${day}`;
    const to = Date.now();
    return `from=${to - hours * 3_600_000}&to=${to}`;
  }, [mode, day, hours]);

  useEffect(() => {
    if (!decided) return;
    let stop = false;
    setLoading(true);
    setError(null);
    (async () => {
      const [wind, summary, levels, alerts, configurations] = await Promise.all([
        api<WindLog>(`/api/log/wind?${query}&points=720`),
        api<DaySummary>(`/api/log/summary?${query}`),
        api<{ levelChanges: LevelChangeRow[] }>(`/api/log/levels?${query}`),
        api<{ alerts: AlertRow[] }>(`/api/log/alerts?${query}`),
        api<ConfigurationLog>(`/api/log/configurations?${query}`),
      ]);
      const structures = await Promise.all(summary.structures.map((s) => api<StructureLog>(`/api/log/structures/${s.id}?${query}&points=720`).catch(() => null)));
      if (!stop) {
        setData({
          wind,
          summary,
          levels: levels.levelChanges,
          alerts: alerts.alerts,
          structures: structures.filter((s): s is StructureLog => s !== null),
          configurationChanges: configurations.configurationChanges,
          overdueSignals: configurations.overdueSignals,
        });
      }
    })()
      .catch((err) => {
        if (!stop) setError(errorText(err));
      })
      .finally(() => {
        if (!stop) setLoading(false);
      });
    return () => {
      stop = true;
    };
  }, [query, decided]);

  const title = mode === 'day' ? `Day report ${longDate(Date.parse(`${day}T12:00:00Z`), 'UTC')}` : `Last ${hours} hours`;
  const csvQuery = query;

  return (
    <main id="main" class="log-page">
      <h1>Log</h1>
      <div class="log-controls no-print">
        <div class="seg" role="group" aria-label="Period">
          <button type="button" class={mode === 'day' ? 'on' : ''} aria-pressed={mode === 'day'} onClick={() => setMode('day')}>
            A day
          </button>
          <button type="button" class={mode === 'hours' ? 'on' : ''} aria-pressed={mode === 'hours'} onClick={() => setMode('hours')}>
            Last hours
          </button>
        </div>
        {mode === 'day' ? (
          <div class="field inline day-picker">
            <label for="log-day">Day ({tz})</label>
            <input
              id="log-day"
              type="date"
              value={day}
              max={today}
              onChange={(e) => {
                if (e.currentTarget.value) setDay(e.currentTarget.value);
                setDayNote(null);
              }}
            />
            <button type="button" onClick={() => (setDay(shiftDay(day, -1)), setDayNote(null))}>
              Day before
            </button>
            <button type="button" disabled={day >= today} onClick={() => (setDay(shiftDay(day, 1)), setDayNote(null))}>
              Day after
            </button>
          </div>
        ) : (
          <div class="seg" role="group" aria-label="Hours">
            {lastHours.map((h) => (
              <button type="button" class={h === hours ? 'on' : ''} aria-pressed={h === hours} onClick={() => setHours(h)}>
                {h} h
              </button>
            ))}
          </div>
        )}
        <button type="button" onClick={() => print()}>
          Print day report
        </button>
      </div>
      <h2 class="print-title">
        {snap?.site.name ?? 'Site'} — {title} <span class="muted small">(times in {tz})</span>
      </h2>
      {dayNote && mode === 'day' ? <p class="muted no-print">{dayNote}</p> : null}
      {error ? <p class="error-box">{error}</p> : null}
      {loading && !data ? <p class="muted">Loading…</p> : null}
      {data ? <LogBody data={data} unit={unit} tz={tz} siteName={snap?.site.name ?? 'Site'} title={title} /> : null}

      <section class="no-print panel" aria-labelledby="csv-h">
        <h2 id="csv-h">Export (CSV)</h2>
        <ul class="plain-list csv-links">
          {exportTables.map(([table, label]) => (
            <li>
              <a class="button" href={`/api/export/${table}.csv?${csvQuery}`} download>
                {label}
              </a>
            </li>
          ))}
        </ul>
      </section>
    </main>
  );
}

function shiftDay(day: string, by: number): string {
  const d = new Date(`${day}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + by);
  return d.toISOString().slice(0, 10);
}

function LogBody({ data, unit, tz, siteName, title }: { data: LogData; unit: Parameters<typeof speed>[1]; tz: string; siteName: string; title: string }) {
  const u = speedUnitLabels[unit];
  const { summary } = data;
  const structureNames = new Map(summary.structures.map((s) => [s.id, s.name]));

  const timeline = useMemo(() => {
    type Item = { atMs: number; key: string; node: JSX.Element };
    const items: Item[] = [];
    for (const c of data.levels) {
      const name = c.structureName ?? structureNames.get(c.structureId) ?? `structure ${c.structureId}`;
      const what = c.noData ? 'no data: wind unknown, level held' : c.toLevel > c.fromLevel ? `level raised ${c.fromLevel} → ${c.toLevel}` : c.toLevel < c.fromLevel ? `level lowered ${c.fromLevel} → ${c.toLevel}` : `readings back, level ${c.toLevel}`;
      items.push({
        atMs: c.atMs,
        key: `c${c.id}`,
        node: (
          <>
            <span class="t-time">{clockTime(c.atMs, tz)}</span>
            <span class="t-what">
              <LevelShape tone={levelTone(c.toLevel, 3, c.noData)} size={18} /> <strong>{name}</strong>: {what}
              {c.gustMps !== null ? ` at ${speed(c.gustMps, unit)}` : ''}
              {c.utilization !== null ? `, ${percent(c.utilization)} of capacity` : ''}
              {c.estimateLevel != null && c.estimateChance30 != null && c.estimateChance10 != null ? (
                <span class="t-estimate">
                  {' '}· the estimate before it: level {c.estimateLevel} {chanceText(c.estimateChance10)} within 10 min, {chanceText(c.estimateChance30)} within 30 min
                </span>
              ) : null}
            </span>
          </>
        ),
      });
    }
    for (const a of data.alerts) {
      const subject = a.structureId !== null ? (structureNames.get(a.structureId) ?? `structure ${a.structureId}`) : 'sensor';
      items.push({
        atMs: a.raisedAtMs,
        key: `a${a.id}`,
        node: (
          <>
            <span class="t-time">{clockTime(a.raisedAtMs, tz)}</span>
            <span class="t-what">
              <strong>Alert</strong> — {subject}: {a.kind === 'level' ? `level ${a.level} · ${a.label}` : a.label}
              {a.gustMps !== null ? ` at ${speed(a.gustMps, unit)}` : ''}
            </span>
            <span class="t-ack">
              {a.acknowledgedAtMs !== null ? (
                <>
                  ✓ acknowledged by {a.acknowledgedBy} at {clockTime(a.acknowledgedAtMs, tz)} ({duration(a.acknowledgedAtMs - a.raisedAtMs)} after)
                  {a.acknowledgeNote ? `: “${a.acknowledgeNote}”` : ''}
                </>
              ) : (
                <strong class="bad-text">not acknowledged</strong>
              )}
              {a.clearedAtMs !== null ? ` · ended ${clockTime(a.clearedAtMs, tz)}` : ''}
            </span>
            {a.kind === 'level' && a.moveToConfiguration !== null ? <AlertAction alert={a} tz={tz} actionDueMs={summary.actionDueMs} /> : null}
          </>
        ),
      });
    }
    for (const c of data.configurationChanges) {
      const name = c.structureName ?? structureNames.get(c.structureId) ?? `structure ${c.structureId}`;
      items.push({
        atMs: c.atMs,
        // After the level change and alert of the same instant (the switch re-assesses the structure).
        key: `k${c.id}`,
        node: (
          <>
            <span class="t-time">{clockTime(c.atMs, tz)}</span>
            <span class="t-what t-config">
              <strong>{name}</strong>: configuration <span class="cfg-from">{c.from}</span> → <strong class="cfg-to">{c.to}</strong>
            </span>
            <span class="t-ack">{configurationWhy(c, tz)}</span>
          </>
        ),
      });
    }
    for (const o of data.overdueSignals) {
      const name = o.structureName ?? (o.structureId !== null ? structureNames.get(o.structureId) : null) ?? 'structure';
      items.push({
        atMs: o.atMs,
        key: `o${o.alertId}`,
        node: (
          <>
            <span class="t-time">{clockTime(o.atMs, tz)}</span>
            <span class="t-what t-overdue">
              <strong class="bad-text">Action overdue</strong> — {name}: {overdueWords(o, tz)}
            </span>
            <span class="t-ack">
              {o.actionDoneAtMs !== null ? (
                <>
                  done in the end by {o.actionDoneBy ?? 'someone'} at {clockTime(o.actionDoneAtMs, tz)} ({duration(o.actionDoneAtMs - o.raisedAtMs)} after the alert)
                </>
              ) : (
                <strong class="bad-text">not marked done</strong>
              )}
            </span>
          </>
        ),
      });
    }
    // Same instant: level change, then alert, then the switch it led to, then an overdue signal.
    const order = (key: string) => ({ c: 0, a: 1, k: 2, o: 3 })[key[0] as 'c' | 'a' | 'k' | 'o'] ?? 4;
    return items.sort((a, b) => a.atMs - b.atMs || order(a.key) - order(b.key));
  }, [data, unit, tz]);

  const roseSamples = data.wind.sensors.flatMap((s) => s.series.tMs.map((_, i) => ({ dirDeg: s.series.dirDeg[i] ?? null, meanMps: s.series.meanMps[i] ?? null })));
  const utilData = useMemo(
    () =>
      alignSeries(
        data.structures.map((s) => s.series.tMs.map((t) => t / 1000)),
        data.structures.map((s) => s.series.utilization.map((v) => (v === null ? null : v * 100))),
      ),
    [data],
  );
  const maxUtil = Math.max(100, ...data.structures.flatMap((s) => s.series.utilization.filter((v): v is number => v !== null).map((v) => v * 100)));

  return (
    <>
      <section aria-labelledby="sum-h" class="report-section">
        <h2 id="sum-h">Summary</h2>
        <p>
          {summary.alertCount} {summary.alertCount === 1 ? 'alert' : 'alerts'}, {summary.unacknowledgedCount === 0 ? 'all acknowledged' : <strong class="bad-text">{summary.unacknowledgedCount} not acknowledged</strong>}.
          {summary.actionCount > 0 ? <ActionCounts summary={summary} /> : null}
        </p>
        <div class="table-scroll">
          <table class="data stack-sm">
            <caption>Structures on the register in this period</caption>
            <thead>
              <tr>
                <th scope="col">Structure</th>
                <th scope="col">Highest gust here</th>
                <th scope="col">Highest utilization</th>
                <th scope="col">Highest level</th>
                <th scope="col">Time at levels 1+</th>
                <th scope="col">No data</th>
                <th scope="col">Alerts</th>
              </tr>
            </thead>
            <tbody>
              {summary.structures.length === 0 ? (
                <tr>
                  <td colSpan={7}>No structure was on the register in this period.</td>
                </tr>
              ) : null}
              {summary.structures.map((s) => (
                <tr>
                  <th scope="row">
                    {s.retiredAtMs === null ? <a href={href(`/structure/${s.id}`)}>{s.name}</a> : s.name}
                    <RegisterNote onRegister={s.onRegister} fromMs={summary.fromMs} toMs={summary.toMs} tz={tz} retiredAtMs={s.retiredAtMs} />
                  </th>
                  <td data-label="Highest gust here">{s.maxGustMps === null ? 'unknown' : `${speed(s.maxGustMps, unit)} at ${hourMinute(s.maxGustAtMs!, tz)}`}</td>
                  <td data-label="Highest utilization">{s.unboundedAtMs !== null ? `unbounded at ${hourMinute(s.unboundedAtMs, tz)}` : s.maxUtilization === null ? 'unknown' : `${percent(s.maxUtilization)} at ${hourMinute(s.maxUtilizationAtMs!, tz)}`}</td>
                  <td data-label="Highest level">
                    <span class="lvl-cell">
                      <LevelShape tone={levelTone(s.highestLevel, Math.max(3, s.msAtLevel.length - 1))} size={18} />
                      {s.highestLevel}
                    </span>
                  </td>
                  <td data-label="Time at levels 1+">{duration(s.msAtLevel.slice(1).reduce((a, b) => a + b, 0))}</td>
                  <td data-label="No data" class={s.msNoData > 0 ? 'bad-text' : ''}>{duration(s.msNoData)}</td>
                  <td data-label="Alerts">{s.alerts.length}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <div class="table-scroll">
          <table class="data stack-sm">
            <caption>Sensors on the register in this period</caption>
            <thead>
              <tr>
                <th scope="col">Sensor</th>
                <th scope="col">Highest gust</th>
                <th scope="col">Mean</th>
                <th scope="col">Readings</th>
              </tr>
            </thead>
            <tbody>
              {summary.sensors.length === 0 ? (
                <tr>
                  <td colSpan={4}>No sensor was on the register in this period: the wind is unknown.</td>
                </tr>
              ) : null}
              {summary.sensors.map((s) => (
                <tr>
                  <th scope="row">
                    {s.name} <span class="muted small">({s.heightM} m)</span>
                    <RegisterNote onRegister={s.onRegister} fromMs={summary.fromMs} toMs={summary.toMs} tz={tz} retiredAtMs={null} />
                  </th>
                  <td data-label="Highest gust">{s.maxGustMps === null ? 'unknown' : `${speed(s.maxGustMps, unit)} at ${hourMinute(s.maxGustAtMs!, tz)}`}</td>
                  <td data-label="Mean">{speed(s.meanMps, unit)}</td>
                  <td data-label="Readings" class={s.readings === 0 ? 'bad-text' : ''}>{s.readings === 0 ? 'none (wind unknown)' : s.readings.toLocaleString('en-GB')}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>

      <PlanActions summary={summary} tz={tz} />
      <ForecastAgainstMeasured summary={summary} tz={tz} />

      <section aria-labelledby="wind-log-h" class="report-section">
        <h2 id="wind-log-h">Wind</h2>
        {data.wind.sensors.length === 0 ? <p class="muted">No sensor was on the register in this period.</p> : null}
        {data.wind.sensors.map((s) => {
          const per = bucketWords(s.series.bucketMs);
          return (
            <TimeChart
              key={s.key}
              title={`${s.name} (anemometer at ${s.heightM} m): highest 3-second gust and mean wind ${per}, in ${u}; direction the wind blows from, in degrees`}
              timeZone={tz}
              height={220}
              xRange={[data.wind.fromMs / 1000, data.wind.toMs / 1000]}
              data={[s.series.tMs.map((t) => t / 1000), s.series.gustMps.map((g) => (g === null ? null : mpsToSpeed(g, unit))), s.series.meanMps.map((m) => (m === null ? null : mpsToSpeed(m, unit))), s.series.dirDeg]}
              series={[
                { label: `Highest gust ${per}, ${u}`, scale: 'speed', colorVar: '--series-gust', width: 2.5, format: (v) => (v === null ? 'unknown' : `${v.toFixed(1)} ${u}`) },
                { label: `Mean wind ${per}, ${u}`, scale: 'speed', colorVar: '--series-mean', width: 2, dash: [10, 5], format: (v) => (v === null ? 'unknown' : `${v.toFixed(1)} ${u}`) },
                { label: 'Direction the wind blows from, ° (dots, right axis)', scale: 'deg', colorVar: '--series-dir', points: true, format: (v) => (v === null ? 'unknown' : `${Math.round(v)}°`) },
              ]}
              axes={[
                { scale: 'speed', label: u, side: 'left' },
                { scale: 'deg', label: 'from, °', side: 'right', range: [0, 360] },
              ]}
            />
          );
        })}
        <WindRose samples={roseSamples} unit={unit} />
      </section>

      <section aria-labelledby="util-h" class="report-section">
        <h2 id="util-h">Utilization per structure</h2>
        {data.structures.length > 0 ? (
          <TimeChart
            title="Highest utilization per minute of each structure, % of load capacity (100 % = the limit)"
            timeZone={tz}
            data={utilData}
            xRange={[data.wind.fromMs / 1000, data.wind.toMs / 1000]}
            series={data.structures.map((s, i) => ({ label: `${s.structure.name}, % of capacity`, scale: 'pct', ...multiSeriesStyle(i), format: (v: number | null) => (v === null ? 'unknown' : `${v.toFixed(0)} %`) }))}
            axes={[{ scale: 'pct', label: '% of capacity', side: 'left', minMax: maxUtil }]}
            bands={utilizationBands(data.structures, maxUtil)}
          />
        ) : (
          <p class="muted">No structures.</p>
        )}
      </section>

      <section aria-labelledby="tl-h" class="report-section">
        <h2 id="tl-h">Level changes, alerts and configuration changes</h2>
        {timeline.length === 0 ? <p class="muted">No level changes, alerts or configuration changes in this period.</p> : null}
        <ul class="timeline">
          {timeline.map((i) => (
            <li key={i.key}>{i.node}</li>
          ))}
        </ul>
      </section>
      <p class="print-only caution">Decision support only: the structure's designer or manufacturer ratings, the site's competent person and local regulations govern. Printed {dateTime(Date.now(), tz)}.</p>
      <SignOff report={`${siteName} — ${title}`} />
    </>
  );
}

/** "Done on alert 8 (Stop and clear) by Sam Okoro, 2 min after the alert" or "by hand by Dana Whitlock", with the note. */
function configurationWhy(c: ConfigurationChangeEntry, tz: string): string {
  const note = c.note ? `: “${c.note}”` : '';
  if (c.reason === 'action-done' && c.alertId !== null) {
    const label = c.alertLabel ? ` (${c.alertLevel !== null ? `level ${c.alertLevel} · ` : ''}${c.alertLabel})` : '';
    const after = c.alertRaisedAtMs !== null ? `, ${duration(c.atMs - c.alertRaisedAtMs)} after the alert` : '';
    const late = c.alertOverdueAtMs !== null && c.alertOverdueAtMs <= c.atMs ? `, late: signalled overdue at ${hourMinute(c.alertOverdueAtMs, tz)}` : '';
    return `“Done” on alert ${c.alertId}${label} by ${c.by}${after}${late}${note}`;
  }
  return `by hand by ${c.by}${note}`;
}

/** "Prepare (→ scrim removed) not done 5 min after the alert: signalled again at 14:02". */
function overdueWords(o: OverdueSignalEntry, tz: string): string {
  const action = `${o.label}${o.moveToConfiguration ? ` (→ ${o.moveToConfiguration})` : ''}`;
  return `${action} not done ${duration(o.atMs - o.raisedAtMs)} after the alert: signalled again at ${hourMinute(o.atMs, tz)}`;
}

/** A level alert's plan action on the timeline: done by whom and when, late, or not marked done. */
function AlertAction({ alert: a, tz, actionDueMs }: { alert: AlertRow; tz: string; actionDueMs: number }) {
  const late = a.overdueAtMs !== null || (a.actionDoneAtMs !== null && a.actionDoneAtMs - a.raisedAtMs > actionDueMs);
  return (
    <span class="t-ack t-action">
      Action → {a.moveToConfiguration}:{' '}
      {a.actionDoneAtMs !== null ? (
        <>
          done by {a.actionDoneBy ?? 'someone'} at {clockTime(a.actionDoneAtMs, tz)} ({duration(a.actionDoneAtMs - a.raisedAtMs)} after){late ? <strong class="bad-text"> · late</strong> : null}
        </>
      ) : (
        <strong class="bad-text">not marked done{a.overdueAtMs !== null ? ` (signalled overdue at ${hourMinute(a.overdueAtMs, tz)})` : ''}</strong>
      )}
    </span>
  );
}

/** " 6 plan actions: 5 done (1 late), 1 not marked done." */
function ActionCounts({ summary }: { summary: DaySummary }) {
  const notDone = summary.actionsNotDoneCount;
  return (
    <>
      {' '}
      {summary.actionCount} plan {summary.actionCount === 1 ? 'action' : 'actions'} moving a structure: {summary.actionsDoneCount} done
      {summary.actionsLateCount > 0 ? <strong class="bad-text"> ({summary.actionsLateCount} late)</strong> : ''}
      {notDone > 0 ? <strong class="bad-text">, {notDone} not marked done</strong> : ''}.
    </>
  );
}

type DayAction = StructureDay['alerts'][number] & { structure: string };

/**
 * How the forecast feed did (issue 17), for the report: each forecast hour's mean and gust beside
 * the measured ones of the site's highest sensor, the difference, and the summary; nothing when no
 * feed was polled that day.
 */
function ForecastAgainstMeasured({ summary, tz }: { summary: DaySummary; tz: string }) {
  const unit = useStore(prefs).unit;
  const check = summary.forecastCheck;
  if (!check || (check.hours.length === 0 && check.pollCount === 0)) return null;
  const diff = (v: number | null): string => (v === null ? '—' : `${v > 0 ? '+' : v < 0 ? '−' : ''}${speed(Math.abs(v), unit)}`);
  const sum = check.summary;
  return (
    <section aria-labelledby="fc-h" class="report-section forecast-check">
      <h2 id="fc-h">Forecast against measured wind</h2>
      <p class="small">
        {check.pollCount} feed polls that day{check.failedPollCount > 0 ? `, ${check.failedPollCount} failed` : ''}. Measured at{' '}
        {check.sensor ? `${check.sensor.name} (${check.sensor.heightM} m)` : 'no sensor (no wind data)'}; the forecast's speeds at {check.forecastHeightM} m, not converted.
        {sum.gustHours > 0 ? ` The measured gust was above the forecast in ${sum.gustUnderForecastHours} of ${sum.gustHours} hours` : ''}
        {sum.largestGustUnderForecastMps !== null && sum.largestGustUnderForecastAtMs !== null ? `, by up to ${speed(sum.largestGustUnderForecastMps, unit)} (${hourMinute(sum.largestGustUnderForecastAtMs, tz)})` : ''}
        {sum.gustHours > 0 ? '.' : ''}
      </p>
      {check.notes.length > 0 ? (
        <ul class="small">
          {check.notes.map((n) => (
            <li>{n}</li>
          ))}
        </ul>
      ) : null}
      {check.hours.length > 0 ? (
        <div class="table-scroll">
          <table class="data stack-sm">
            <caption>Each forecast hour beside the measured wind (forecast − measured)</caption>
            <thead>
              <tr>
                <th scope="col">Hour</th>
                <th scope="col">Forecast mean / gust</th>
                <th scope="col">Measured mean / gust</th>
                <th scope="col">Difference mean / gust</th>
              </tr>
            </thead>
            <tbody>
              {check.hours.map((h) => (
                <tr class={h.gustDifferenceMps !== null && h.gustDifferenceMps < 0 ? 'action-late' : ''}>
                  <th scope="row">{hourMinute(h.timeMs, tz)}</th>
                  <td data-label="Forecast">{h.forecastMeanMps === null ? '—' : speed(h.forecastMeanMps, unit)} / {h.forecastGustMps === null ? '—' : speed(h.forecastGustMps, unit)}</td>
                  <td data-label="Measured">
                    {h.measuredMeanMps === null ? 'no data' : speed(h.measuredMeanMps, unit)} / {h.measuredGustMps === null ? 'no data' : speed(h.measuredGustMps, unit)}
                    {h.counted ? '' : ` (${h.minutesWithData} min of data: not counted)`}
                  </td>
                  <td data-label="Difference">{diff(h.meanDifferenceMps)} / {diff(h.gustDifferenceMps)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </section>
  );
}

/**
 * The day's plan actions, for the report: every level alert whose action moves a structure to
 * another configuration, who marked it done and how long after the alert, late ones marked; then
 * each structure's switches by hand.
 */
function PlanActions({ summary, tz }: { summary: DaySummary; tz: string }) {
  const actions: DayAction[] = summary.structures.flatMap((s) => s.alerts.filter((a) => a.kind === 'level' && a.moveToConfiguration !== null).map((a) => ({ ...a, structure: s.name })));
  actions.sort((a, b) => a.raisedAtMs - b.raisedAtMs);
  const byHand = summary.structures.flatMap((s) => s.configurationChanges.filter((c) => c.reason === 'by-hand').map((c) => ({ ...c, structure: s.name })));
  byHand.sort((a, b) => a.atMs - b.atMs);
  const moved = summary.structures.filter((s) => s.configurationChanges.length > 0 || s.alerts.some((a) => a.moveToConfiguration !== null));
  if (actions.length === 0 && byHand.length === 0) return null;
  return (
    <section aria-labelledby="actions-h" class="report-section plan-actions">
      <h2 id="actions-h">Plan actions and configurations</h2>
      <p class="small muted">
        Actions that move a structure to another configuration (“Done” on the phone), signalled again as overdue when not done {duration(summary.actionDueMs)} after the alert (the site’s setting now).
      </p>
      {actions.length > 0 ? (
        <div class="table-scroll">
          <table class="data stack-sm">
            <caption>Actions of the wind action plan</caption>
            <thead>
              <tr>
                <th scope="col">Structure</th>
                <th scope="col">Alert</th>
                <th scope="col">Moves it to</th>
                <th scope="col">Done by</th>
                <th scope="col">After the alert</th>
                <th scope="col">On time</th>
              </tr>
            </thead>
            <tbody>
              {actions.map((a) => (
                <tr class={a.actionLate || a.actionDoneAtMs === null ? 'action-late' : ''}>
                  <th scope="row">{a.structure}</th>
                  <td data-label="Alert">
                    {hourMinute(a.raisedAtMs, tz)} · level {a.level} · {a.label}
                  </td>
                  <td data-label="Moves it to">{a.moveToConfiguration}</td>
                  <td data-label="Done by">{a.actionDoneAtMs !== null ? `${a.actionDoneBy ?? 'someone'} at ${hourMinute(a.actionDoneAtMs, tz)}` : <strong class="bad-text">not marked done</strong>}</td>
                  <td data-label="After the alert">{a.actionDoneAtMs !== null ? duration(a.actionDoneAtMs - a.raisedAtMs) : '—'}</td>
                  <td data-label="On time">
                    {a.actionLate ? <strong class="bad-text">late{a.overdueAtMs !== null ? `: signalled overdue at ${hourMinute(a.overdueAtMs, tz)}` : ''}</strong> : a.actionDoneAtMs === null ? <strong class="bad-text">not done</strong> : 'yes'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {byHand.length > 0 ? (
        <>
          <h3 class="small-heading">Switched by hand</h3>
          <ul class="plain-list by-hand-list">
            {byHand.map((c) => (
              <li>
                {hourMinute(c.atMs, tz)} · <strong>{c.structure}</strong>: {c.from} → {c.to}, by {c.by}
                {c.note ? `: “${c.note}”` : ''}
              </li>
            ))}
          </ul>
        </>
      ) : null}
      {moved.length > 0 ? (
        <p class="small">
          At the start of the period:{' '}
          {moved.map((s, i) => (
            <>
              {i > 0 ? ' · ' : ''}
              {s.name} <strong>{s.configurationAtStart}</strong>
            </>
          ))}
          .
        </p>
      ) : null}
    </section>
  );
}

/** "per minute", "per 2 min", "per 30 s": the span one point of a chart stands for. */
function bucketWords(bucketMs: number): string {
  if (bucketMs < 60_000) return `per ${Math.round(bucketMs / 1000)} s`;
  const min = Math.round(bucketMs / 60_000);
  return min === 1 ? 'per minute' : `per ${min} min`;
}

/**
 * The level lines of the utilization chart: the limit (100 % of capacity, true of every
 * structure), and the levels set as fractions of capacity when every charted structure has the
 * same ones (the site's defaults, usually). Levels set as a gust sit at different fractions for
 * each structure: those are drawn on each structure's own page.
 */
export function utilizationBands(structures: StructureLog[], maxPct: number): Band[] {
  const limit: Band = { scale: 'pct', from: 100, to: maxPct * 1.1, colorVar: '--l3', label: 'Limit 100 %', legend: 'Limit: 100 % of capacity' };
  // A retired structure has no levels now: the lines are those of the structures still registered.
  const current = structures.filter((s) => s.live !== null && s.live.levels.length > 0);
  // A level on a chance (design §2.7) rises at its fraction by measurement too, so it shares the
  // line of a level at that fraction; the legend names the structures where it may rise sooner.
  const fractionOf = (t: { kind: string; fraction?: number }): number | null => (t.kind === 'utilization' || t.kind === 'chance' ? (t.fraction ?? null) : null);
  const ladders = current.map((s) => s.live!.levels.map((l) => { const f = fractionOf(l.trigger); return f === null ? null : `${l.level}|${l.label}|${Math.round(f * 1000)}`; }));
  const first = ladders[0];
  const shared = first !== undefined && first.every((x) => x !== null) && ladders.every((l) => l.join() === first.join());
  if (!shared) return [limit];
  const levels = current[0]!.live!.levels;
  const n = levels.length;
  const bands: Band[] = [];
  levels.forEach((l, i) => {
    const fraction = fractionOf(l.trigger);
    if (fraction === null) return;
    const fromPct = fraction * 100;
    if (fromPct >= 100) return;
    const next = levels[i + 1];
    const nextFraction = next ? fractionOf(next.trigger) : null;
    const toPct = nextFraction !== null ? Math.min(100, nextFraction * 100) : 100;
    const onChance = current.filter((s) => s.live!.levels[i]?.trigger.kind === 'chance').map((s) => s.structure.name);
    const sooner = onChance.length === 0 ? '' : `, or sooner on its estimated chance at ${onChance.join(', ')}`;
    bands.push({ scale: 'pct', from: fromPct, to: toPct, colorVar: `--${levelTone(l.level, n)}`, label: `${l.level} · ${l.label} ${Math.round(fromPct)} %`, legend: `Level ${l.level} · ${l.label}: from ${Math.round(fromPct)} % of capacity${sooner} (levels as set now)` });
  });
  return [...bands, limit];
}

/** When something joined or left the register inside the period: the figures count from or up to then. */
function RegisterNote({ onRegister, fromMs, toMs, tz, retiredAtMs }: { onRegister: { fromMs: number; toMs: number }; fromMs: number; toMs: number; tz: string; retiredAtMs: number | null }) {
  const notes: string[] = [];
  if (onRegister.fromMs > fromMs) notes.push(`registered ${hourMinute(onRegister.fromMs, tz)}`);
  if (onRegister.toMs < toMs) notes.push(`retired ${hourMinute(onRegister.toMs, tz)}, counted up to then`);
  else if (retiredAtMs !== null) notes.push(`retired later (${dateTime(retiredAtMs, tz)})`);
  return notes.length > 0 ? <span class="register-note">{notes.join(' · ')}</span> : null;
}

/** The box the competent person signs on the printed report. */
function SignOff({ report }: { report: string }) {
  return (
    <section class="sign-off report-section" aria-labelledby="signoff-h">
      <h2 id="signoff-h">Sign-off</h2>
      <p class="sign-intro">
        {report}: reviewed by the site's competent person for temporary structures. <span class="no-print">Print the report and sign it by hand; nothing here is saved.</span>
      </p>
      <div class="sign-grid">
        <div class="sign-field sign-name">
          <span class="sign-label">Competent person (name)</span>
          <span class="sign-line" />
        </div>
        <div class="sign-field sign-date">
          <span class="sign-label">Date</span>
          <span class="sign-line" />
        </div>
        <div class="sign-field sign-signature">
          <span class="sign-label">Signature</span>
          <span class="sign-box" />
        </div>
        <div class="sign-field sign-remarks">
          <span class="sign-label">Remarks (what to follow up, changes to the wind management plan)</span>
          <span class="sign-line" />
          <span class="sign-line" />
          <span class="sign-line" />
          <span class="sign-line" />
        </div>
      </div>
    </section>
  );
}
