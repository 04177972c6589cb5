/**
 * One structure: its live level and margin, a chart of the gust at its height and its
 * utilization over the last hours with the level thresholds as bands, its levels and actions,
 * and its alert history.
 */
import { useEffect, useMemo, useState } from 'preact/hooks';
import type uPlot from 'uplot';
import { api, errorText } from '../api.ts';
import { DirectionsTable, ElementsList, Warnings } from '../components/assessmentSummary.tsx';
import { Caution } from '../components/caution.tsx';
import { ConfigurationLineView } from '../components/configurationLine.tsx';
import { ConfigurationsSection } from '../components/configurationsTable.tsx';
import { ForesightSection } from '../components/foresightView.tsx';
import { ForecastFeedPanel } from './forecastFeedPanel.tsx';
import { useNow } from '../components/clock.ts';
import { LevelBadge } from '../components/levelBadge.tsx';
import { LevelsTable } from '../components/levelsTable.tsx';
import { PlanView } from '../components/planView.tsx';
import { SideView } from '../components/sideView.tsx';
import { StructureFigures } from '../components/structureFigures.tsx';
import { TimeChart, type Band } from '../components/timeChart.tsx';
import { live, serverNow } from '../live.ts';
import { prefs } from '../prefs.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { AlertActionFields, AlertRow, AssessAnswer, StructureLog, StructureState, StructureWithLive } from '../types.ts';
import { dateTime, duration, mpsToSpeed, percent, quantity, speed, speedUnitLabels, type SpeedUnit } from '../units.ts';
import { maxPlausibleSpeedMps } from '../../../server/engine/limits.ts';
import { levelTone } from '../components/levelBadge.tsx';

const windows = [
  { hours: 1, label: '1 h' },
  { hours: 3, label: '3 h' },
  { hours: 12, label: '12 h' },
  { hours: 24, label: '24 h' },
];

/** The chart's history is refetched this often while the page is open (per-minute rollups). */
const refreshMs = 30_000;

export function levelBands(s: StructureState, unitFactor: (mps: number) => number, scale: string): Band[] {
  const n = s.levels.length;
  return s.levels.map((l, i) => ({
    scale,
    from: unitFactor(l.triggerGustMps),
    to: i + 1 < n ? unitFactor(s.levels[i + 1]!.triggerGustMps) : unitFactor(l.triggerGustMps * 1.5),
    colorVar: `--${levelTone(l.level, n)}`,
    label: `${l.level} · ${l.label}`,
  }));
}

export function StructurePage({ id }: { id: number }) {
  const snap = useStore(live).snapshot;
  const s = snap?.structures.find((x) => x.id === id) ?? null;
  const unit = useStore(prefs).unit;
  const tz = useTimeZone();
  const who = useStore(session);
  useNow();
  const [hours, setHours] = useState(3);
  const [windowTo, setWindowTo] = useState(() => Date.now());
  const [log, setLog] = useState<StructureLog | null>(null);
  const [history, setHistory] = useState<AlertRow[] | null>(null);
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let stop = false;
    const load = async () => {
      try {
        const to = Date.now() + 60_000;
        const answer = await api<StructureLog>(`/api/log/structures/${id}?from=${to - hours * 3_600_000}&to=${to}&points=720`);
        if (!stop) {
          setWindowTo(to);
          setLog(answer);
          setError(null);
        }
      } catch (err) {
        if (!stop) setError(errorText(err));
      }
    };
    void load();
    const timer = setInterval(() => void load(), refreshMs);
    return () => {
      stop = true;
      clearInterval(timer);
    };
  }, [id, hours]);

  useEffect(() => {
    const to = Date.now() + 60_000;
    api<StructureLog>(`/api/log/structures/${id}?from=${to - 7 * 86_400_000}&to=${to}&points=10`)
      .then((a) => setHistory(a.alerts.slice().reverse()))
      .catch((err) => setError(errorText(err)));
  }, [id]);

  const toUnit = (mps: number) => mpsToSpeed(mps, unit);
  const data = useMemo((): uPlot.AlignedData => {
    if (!log) return [[], [], []];
    const t = log.series.tMs.map((ms) => ms / 1000);
    const gust: Array<number | null> = log.series.gustMps.map((g) => toUnit(g));
    const util: Array<number | null> = log.series.utilization.map((u) => (u === null ? null : u * 100));
    // The live value as the last point, so the chart ends "now" between the minute rollups.
    if (s && !s.noData && s.gustMps !== null && s.evaluatedAtMs !== null && (t.at(-1) ?? 0) < s.evaluatedAtMs / 1000) {
      t.push(s.evaluatedAtMs / 1000);
      gust.push(toUnit(s.gustMps));
      util.push(s.utilization === null ? null : s.utilization * 100);
    }
    return [t, gust, util];
  }, [log, unit, s?.evaluatedAtMs, s?.gustMps]);

  const name = s?.name ?? log?.structure.name ?? `Structure ${id}`;
  if (!snap && !log) {
    return (
      <main id="main">
        <p class="unknown-box">Loading… until live data arrives this structure's wind is unknown.</p>
      </main>
    );
  }
  if (snap && !s && !log && error) {
    return (
      <main id="main">
        <h1>Structure not found</h1>
        <p class="error-box">{error}</p>
      </main>
    );
  }
  const top = s ? Math.max(...s.levels.map((l) => l.triggerGustMps), s.limitGustMps) : 0;

  return (
    <main id="main">
      <p class="crumbs">
        <a href={href('/')}>← Live board</a>
      </p>
      <h1>{name}</h1>
      {s ? (
        <section class={`structure-live tone-${levelTone(s.level, s.levels.length, s.noData)}`} aria-label="Now">
          <LevelBadge level={s.level} label={s.levelLabel} count={s.levels.length} noData={s.noData} big />
          <p class="governs-lead" data-testid="live-governs">
            Limit <strong class="nowrap">{speed(s.limitGustMps, unit)}</strong>
            {Math.abs(s.allDirectionsLimitGustMps - s.limitGustMps) > 0.05 ? <span class="small"> (wind from its sector now; every direction: {speed(s.allDirectionsLimitGustMps, unit)})</span> : null}
            {' · '}
            {s.governingText ? (
              <>
                governs: <strong>{s.governingText}</strong>
              </>
            ) : (
              'what governs is unknown until the structure is assessed'
            )}
          </p>
          <Warnings warnings={s.warnings} />
          <StructureFigures s={s} unit={unit} detailed />
          <ConfigurationLineView s={s} unit={unit} timeZone={tz} />
          <p class="muted">
            {s.ratedGustMps !== null && s.calculatedUtilization !== null && s.utilization !== null && Math.abs(s.calculatedUtilization - s.utilization) > 0.005
              ? `Utilization ${percent(s.utilization)} of capacity is set by the rated gust (calculated ${percent(s.calculatedUtilization)}). `
              : ''}
            Calculated limit {speed(s.calculatedLimitGustMps, unit)}
            {s.ratedGustMps !== null ? `, rated ${speed(s.ratedGustMps, unit)}` : ', no rated gust given'}; gust taken at {quantity(s.referenceHeightM, 'm')}; air {quantity(s.airDensityKgM3, 'kg/m³', 3)}.
            {s.evaluatedAtMs !== null ? ` Last assessed ${duration(serverNow() - s.evaluatedAtMs)} ago.` : ' Not assessed yet.'}
            {s.level > 0 ? ` At level ${s.level} since ${dateTime(s.levelSinceMs, tz)}.` : ''}
          </p>
          {s.mobile ? (
            <p class="mobile-line">
              Mobile: {s.highestTravelSpeedMps === null ? 'the highest travel speed with the face raised is unknown' : `the highest travel speed with the face raised, heading into the wind, is ${speed(s.highestTravelSpeedMps, unit)} in the current gust`}.
            </p>
          ) : null}
          {s.error ? <p class="error-box">{s.error}</p> : null}
        </section>
      ) : (
        <p class="unknown-box">No live state for this structure: its wind is unknown.</p>
      )}
      <Caution />

      {s ? <ForesightSection s={s} unit={unit} sensors={snap?.sensors ?? []} /> : null}
      {s ? <ForecastFeedPanel structureId={s.id} /> : null}

      {s ? <ConfigurationsSection s={s} unit={unit} timeZone={tz} canSwitch={may(who, 'competent-person')} /> : null}

      <section aria-labelledby="chart-h">
        <h2 id="chart-h">Gust and utilization</h2>
        <div class="seg" role="group" aria-label="Time window">
          {windows.map((w) => (
            <button type="button" class={w.hours === hours ? 'on' : ''} aria-pressed={w.hours === hours} onClick={() => setHours(w.hours)}>
              {w.label}
            </button>
          ))}
        </div>
        {error ? <p class="error-box">{error}</p> : null}
        {log && log.series.tMs.length === 0 && data[0].length === 0 ? <p class="unknown-box">No readings in this window: the wind here was unknown.</p> : null}
        {s ? (
          <TimeChart
            title={`Highest gust per minute at ${name} (${speedUnitLabels[unit]}) and utilization (%), with level thresholds as bands`}
            timeZone={tz}
            data={data}
            series={[
              { label: `gust here (${speedUnitLabels[unit]})`, scale: 'speed', colorVar: '--series-gust', width: 2, format: (v) => (v === null ? '—' : `${v.toFixed(1)} ${speedUnitLabels[unit]}`) },
              { label: 'utilization (%)', scale: 'pct', colorVar: '--series-util', width: 2, dash: [6, 4], format: (v) => (v === null ? '—' : `${v.toFixed(0)} %`) },
            ]}
            axes={[
              { scale: 'speed', label: `gust, ${speedUnitLabels[unit]}`, side: 'left', minMax: toUnit(top) * 1.12 },
              { scale: 'pct', label: 'utilization, %', side: 'right', minMax: 100 },
            ]}
            bands={levelBands(s, toUnit, 'speed')}
            xRange={[(windowTo - hours * 3_600_000) / 1000, windowTo / 1000]}
          />
        ) : null}
      </section>

      {s ? <HowCalculated key={id} id={id} s={s} unit={unit} /> : null}

      {s ? (
        <section aria-labelledby="levels-h">
          <h2 id="levels-h">Levels and actions</h2>
          <LevelsTable levels={s.levels} unit={unit} />
          {may(who, 'competent-person') ? (
            <p>
              <a class="button" href={href(`/register/${id}`)}>
                Edit structure and levels
              </a>
            </p>
          ) : null}
        </section>
      ) : null}

      <section aria-labelledby="hist-h">
        <h2 id="hist-h">Alerts, last 7 days</h2>
        {history === null ? <p class="muted">Loading…</p> : history.length === 0 ? <p class="muted">No alerts for this structure in the last 7 days.</p> : null}
        <ul class="timeline">
          {(history ?? []).map((a) => (
            <li key={a.id}>
              <span class="t-time">{dateTime(a.raisedAtMs, tz)}</span>
              <span class="t-what">
                <strong>{a.kind === 'level' ? `Level ${a.level} · ${a.label}` : a.label}</strong>
                {a.gustMps !== null ? ` at ${speed(a.gustMps, unit)}` : ''}
              </span>
              <span class="t-ack">
                {a.acknowledgedAtMs !== null ? `✓ ${a.acknowledgedBy}, ${dateTime(a.acknowledgedAtMs, tz)}${a.acknowledgeNote ? `: “${a.acknowledgeNote}”` : ''}` : <strong class="bad-text">not acknowledged</strong>}
              </span>
              <ActionHistory a={a} tz={tz} />
            </li>
          ))}
        </ul>
      </section>
    </main>
  );
}

/** The gust the figures below are drawn at: the current one, or the limit when calm or unknown, m/s. */
function figureGustMps(s: StructureState): { gustMps: number; atLimit: boolean } {
  const limit = [s.limitGustMps, s.allDirectionsLimitGustMps, s.calculatedLimitGustMps].find((v) => typeof v === 'number' && Number.isFinite(v) && v > 0);
  if (!s.noData && s.gustMps !== null && s.gustMps >= 1) return { gustMps: Math.min(maxPlausibleSpeedMps, s.gustMps), atLimit: false };
  return { gustMps: Math.min(maxPlausibleSpeedMps, limit ?? 20), atLimit: true };
}

/**
 * The stored record through the calculator (POST /api/assess) at the current gust, or at the limit
 * when calm: the side and plan views, the parts and every direction. Re-asked when the gust moves
 * by half a metre per second, not on every reading.
 */
function HowCalculated({ id, s, unit }: { id: number; s: StructureState; unit: SpeedUnit }) {
  const [view, setView] = useState<StructureWithLive | null>(null);
  const [answer, setAnswer] = useState<AssessAnswer | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const { gustMps, atLimit } = figureGustMps(s);
  // At the limit exactly (so it reads 100 %), else the current gust to the half metre per second.
  const gustKey = atLimit ? Math.round(gustMps * 1000) / 1000 : Math.round(gustMps * 2) / 2;

  useEffect(() => {
    api<{ structure: StructureWithLive }>(`/api/structures/${id}`)
      .then((a) => setView(a.structure))
      .catch((err) => setProblem(errorText(err)));
    // The record changes only when someone saves it; the snapshot's updatedAt is not streamed, so once per visit.
  }, [id]);

  useEffect(() => {
    if (!view) return;
    const controller = new AbortController();
    const timer = setTimeout(() => {
      const body = { structure: view.record, gustMps: gustKey, airDensityKgM3: s.airDensityKgM3, frontAzimuthDeg: view.orientationDeg % 360 };
      api<AssessAnswer>('/api/assess', { body, signal: controller.signal })
        .then((a) => {
          setAnswer(a);
          setProblem(null);
        })
        .catch((err) => {
          if (err instanceof DOMException && err.name === 'AbortError') return;
          setProblem(`The stored record could not be calculated here: ${errorText(err)}`);
        });
    }, 400);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [view, gustKey, s.airDensityKgM3]);

  return (
    <section aria-labelledby="calc-h" class="how-calculated">
      <h2 id="calc-h">What the numbers assume</h2>
      {problem ? <p class="error-box">{problem}</p> : null}
      {!answer && !problem ? <p class="muted">Calculating…</p> : null}
      {answer && view ? (
        <>
          <p>
            Drawn {atLimit ? <>at the limit gust of {speed(answer.gustMps, unit)} (no wind to speak of now)</> : <>at the current gust here, {speed(answer.gustMps, unit)}</>}, over every direction: governs{' '}
            <strong data-testid="calc-governs">{answer.governingText}</strong>, {answer.effectiveUtilization === null ? 'utilization unbounded' : `${percent(answer.effectiveUtilization)} of capacity`}, limit {speed(answer.limitGustMps, unit)}
            {answer.limitGovernedBy === 'rated' ? ' (the rated gust)' : ''}.
          </p>
          <div class="figures">
            <SideView answer={answer} record={view.record as unknown as Record<string, unknown>} frontAzimuthDeg={view.orientationDeg % 360} />
            <PlanView answer={answer} frontAzimuthDeg={view.orientationDeg % 360} />
          </div>
          <ElementsList answer={answer} unit={unit} frontAzimuthDeg={view.orientationDeg % 360} />
          <DirectionsTable answer={answer} unit={unit} frontAzimuthDeg={view.orientationDeg % 360} />
        </>
      ) : null}
    </section>
  );
}

/**
 * A level alert's plan action in the history (issue 14): who marked it done and when, or that it
 * was not done (and overdue when it was signalled so). Nothing when the row has no action.
 */
function ActionHistory({ a, tz }: { a: AlertRow; tz: string }) {
  const f = a as AlertRow & AlertActionFields;
  if (typeof f.moveToConfiguration !== 'string' || f.moveToConfiguration === '') return null;
  if (typeof f.actionDoneAtMs === 'number') {
    return (
      <span class="t-action" data-testid="history-action-done">
        ✓ Done: {f.moveToConfiguration}
        {f.actionDoneBy ? ` by ${f.actionDoneBy}` : ''}, {dateTime(f.actionDoneAtMs, tz)}
        {typeof f.overdueAtMs === 'number' ? ` (late: signalled overdue ${dateTime(f.overdueAtMs, tz)})` : ''}
      </span>
    );
  }
  return (
    <span class="t-action">
      <strong class="bad-text">
        Not marked done: {f.moveToConfiguration}
        {typeof f.overdueAtMs === 'number' ? ` (signalled overdue ${dateTime(f.overdueAtMs, tz)})` : ''}
      </strong>
    </span>
  );
}
