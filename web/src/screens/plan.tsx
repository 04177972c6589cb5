/**
 * Planning: a forecast table pasted or uploaded (POST /api/forecast) becomes every structure's
 * predicted level hour by hour, as a grid; and the wind action plan for the site office wall
 * (every structure, its levels with wind speeds in the chosen unit and in km/h, and the actions),
 * printable on A4.
 */
import { useEffect, useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { Caution } from '../components/caution.tsx';
import { Field } from '../components/field.tsx';
import { LevelShape, levelTone } from '../components/levelBadge.tsx';
import { LevelsTable } from '../components/levelsTable.tsx';
import { live } from '../live.ts';
import { prefs } from '../prefs.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { ForecastAnswer, StructureWithLive } from '../types.ts';
import { compassPoint, dateTime, dayOf, speed, speedUnitLabels, speedUnits, type SpeedUnit } from '../units.ts';
import { typedNumber } from '../register/structureDraft.ts';

/** An example table for tomorrow noon to 15:00 (site time), so it always lies ahead. */
function exampleTable(timeZone: string): string {
  const tomorrow = dayOf(Date.now() + 86_400_000, timeZone);
  const rows = [
    ['12:00', 22, 38, 'SW'],
    ['13:00', 28, 47, 'WSW'],
    ['14:00', 34, 58, 'W'],
    ['15:00', 30, 51, 'W'],
  ];
  return ['time,mean (km/h),gust (km/h),direction', ...rows.map(([t, m, g, d]) => `${tomorrow} ${t},${m},${g},${d}`)].join('\n');
}

export function Plan() {
  const [tab, setTab] = useState<'forecast' | 'plan'>('forecast');
  return (
    <main id="main" class="plan-page">
      <h1 class="no-print">Plan</h1>
      <div class="seg no-print" role="tablist" aria-label="Plan">
        <button type="button" role="tab" aria-selected={tab === 'forecast'} class={tab === 'forecast' ? 'on' : ''} onClick={() => setTab('forecast')}>
          Forecast check
        </button>
        <button type="button" role="tab" aria-selected={tab === 'plan'} class={tab === 'plan' ? 'on' : ''} onClick={() => setTab('plan')}>
          Wind action plan
        </button>
      </div>
      {tab === 'forecast' ? <ForecastCheck /> : <ActionPlan />}
    </main>
  );
}

function ForecastCheck() {
  const tz = useTimeZone();
  const unit = useStore(prefs).unit;
  const [text, setText] = useState('');
  const [tableUnit, setTableUnit] = useState<SpeedUnit | ''>('');
  const [height, setHeight] = useState('10');
  const [answer, setAnswer] = useState<ForecastAnswer | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const example = exampleTable(tz);

  const check = async () => {
    setBusy(true);
    setError(null);
    setProblems([]);
    try {
      const h = typedNumber(height);
      const body: Record<string, unknown> = { text };
      if (tableUnit) body.unit = tableUnit;
      if (h !== undefined && !Number.isNaN(h)) body.heightM = h;
      setAnswer(await api<ForecastAnswer>('/api/forecast', { body }));
    } catch (err) {
      setAnswer(null);
      if (err instanceof ApiError && err.issues.length > 0) setProblems(err.issues.map((i) => `${i.path}: ${i.message}`));
      else setError(errorText(err));
    } finally {
      setBusy(false);
    }
  };

  return (
    <section aria-labelledby="fc-h">
      <h2 id="fc-h">Forecast check</h2>
      <p>Paste a forecast table (from a spreadsheet or a weather service) with a header row naming time, mean, gust and direction, or load a CSV file. Each row’s gust is moved to each structure’s height and compared with its levels; a row with only a mean gets a gust of 1.66 × the mean (in-land exposure).</p>
      <Caution />
      <Field id="fc-text" label="Forecast table" help="Tab, semicolon or comma separated. Times without an offset are in the site’s time zone. The unit comes from the header (“gust (km/h)”) or the box below." wide>
        <textarea id="fc-text" rows={8} class="mono" placeholder={example} value={text} onInput={(e) => setText(e.currentTarget.value)} />
      </Field>
      <div class="grid2">
        <Field id="fc-unit" label="Speed unit when the header names none">
          <select id="fc-unit" value={tableUnit} onChange={(e) => setTableUnit(e.currentTarget.value as SpeedUnit | '')}>
            <option value="">from the header</option>
            {speedUnits.map((u) => (
              <option value={u}>{speedUnitLabels[u]}</option>
            ))}
          </select>
        </Field>
        <Field id="fc-height" label="Height of the forecast speeds" unit="m" help="Forecasts give the wind at 10 m.">
          <input id="fc-height" inputMode="decimal" value={height} onInput={(e) => setHeight(e.currentTarget.value)} />
        </Field>
      </div>
      <div class="row">
        <label class="button file-button">
          Load a CSV file
          <input
            type="file"
            class="visually-hidden"
            accept=".csv,.txt,.tsv,text/csv,text/plain"
            onChange={async (e) => {
              const f = e.currentTarget.files?.[0];
              if (f) setText(await f.text());
              e.currentTarget.value = '';
            }}
          />
        </label>
        <button type="button" onClick={() => setText(example)}>
          Use the example
        </button>
        <button type="button" class="primary" disabled={busy || text.trim() === ''} onClick={() => void check()}>
          {busy ? 'Checking…' : 'Check the forecast'}
        </button>
      </div>
      {error ? <p class="error-box">{error}</p> : null}
      {problems.length > 0 ? (
        <div class="error-box" role="alert">
          <p>The table could not be read:</p>
          <ul>
            {problems.map((p) => (
              <li>{p}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {answer ? (
        <>
          {answer.ignoredColumns.length > 0 ? <p class="muted">Columns not used: {answer.ignoredColumns.join(', ')}.</p> : null}
          <div class="table-scroll">
            <table class="data forecast-grid">
              <caption>Predicted level per structure (gust at the structure’s height, {speedUnitLabels[unit]})</caption>
              <thead>
                <tr>
                  <th scope="col">Time ({tz})</th>
                  <th scope="col">Forecast gust</th>
                  {answer.structures.map((s) => (
                    <th scope="col">{s.name}</th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {answer.rows.map((r) => (
                  <tr>
                    <th scope="row">{dateTime(r.timeMs, tz)}</th>
                    <td>
                      {speed(r.gustMps, unit)}
                      {r.gustSource === 'mean' ? <span class="muted small"> (from the mean)</span> : null}
                      {r.dirFromDeg !== null ? <span class="muted small"> from {compassPoint(r.dirFromDeg)}</span> : null}
                    </td>
                    {answer.structures.map((s, i) => {
                      const p = r.levels[i];
                      const level = p?.level ?? null;
                      const count = s.levels.length;
                      const tone = levelTone(level, count, level === null);
                      return (
                        <td class={`grid-cell tone-${tone}`}>
                          <span class="lvl-cell">
                            <LevelShape tone={tone} size={18} />
                            <span>{level === null ? 'unknown' : level === 0 ? 'below all' : `${level} · ${s.levels[level - 1]?.label ?? ''}`}</span>
                          </span>
                          <span class="muted small">{p?.gustAtStructureMps != null ? `gust here ${speed(p.gustAtStructureMps, unit)}` : ''}</span>
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      ) : null}
    </section>
  );
}

function ActionPlan() {
  const unit = useStore(prefs).unit;
  const tz = useTimeZone();
  const snap = useStore(live).snapshot;
  const [list, setList] = useState<StructureWithLive[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    api<{ structures: StructureWithLive[] }>('/api/structures')
      .then((a) => setList(a.structures))
      .catch((err) => setError(errorText(err)));
  }, []);
  return (
    <section aria-labelledby="ap-h" class="action-plan">
      <div class="row no-print">
        <button type="button" class="primary" onClick={() => print()}>
          Print the plan
        </button>
      </div>
      <h2 id="ap-h">Wind action plan — {snap?.site.name ?? 'site'}</h2>
      <p class="muted">
        Gusts are at each structure’s own height, in {speedUnitLabels[unit]} and km/h. Printed {dateTime(Date.now(), tz)}. The wind management plan and the competent person’s instructions come first.
      </p>
      <Caution />
      {error ? <p class="error-box">{error}</p> : null}
      {(list ?? []).map((s) => (
        <article class="plan-structure" key={s.id}>
          <h3>
            {s.name}
            {s.location ? <span class="muted small"> — {s.location}</span> : null}
          </h3>
          {s.live ? (
            <>
              <p class="small">
                Limit gust {speed(s.live.limitGustMps, unit)}
                {unit !== 'km/h' ? ` (${speed(s.live.limitGustMps, 'km/h')})` : ''} at {s.live.referenceHeightM.toFixed(1)}&nbsp;m · {s.levels ? 'own levels' : 'site levels'}
              </p>
              <LevelsTable levels={s.live.levels} unit={unit} />
            </>
          ) : (
            <p class="unknown-box">Not assessed: check this structure’s record.</p>
          )}
        </article>
      ))}
      <p class="small plan-key">
        Shapes: <LevelShape tone="l0" size={16} /> below all levels · <LevelShape tone="l1" size={16} /> lower level · <LevelShape tone="l2" size={16} /> middle level · <LevelShape tone="l3" size={16} /> top level ·{' '}
        <LevelShape tone="nodata" size={16} /> no data: wind unknown, act on the plan.
      </p>
    </section>
  );
}
