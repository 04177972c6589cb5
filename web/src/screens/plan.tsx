/**
 * Planning: a forecast table pasted or uploaded (POST /api/forecast) becomes every structure's
 * predicted level hour by hour, as a grid; and the wind action plan for the site office wall
 * (every structure, its levels with wind speeds in the chosen unit and in km/h, and the actions),
 * printable on A4.
 *
 * Configurations (design §2.5, §2.8): a structure whose plan moves it to another configuration
 * ("Prepare: lower the screen" → "lowered") shows, per forecast row, its level in the
 * configuration it stands in now and in the one the plan moves it to ("Raised: Prepare · Lowered:
 * Watch"); the printed plan gives each configuration's levels, and the checked forecast's hours
 * per structure in both.
 */
import type { Ref } from 'preact';
import { useEffect, useRef, useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { Caution } from '../components/caution.tsx';
import { Field } from '../components/field.tsx';
import { ForecastFeedPanel } from './forecastFeedPanel.tsx';
import { LevelShape, levelTone, type Tone } from '../components/levelBadge.tsx';
import { LevelsTable } from '../components/levelsTable.tsx';
import { live } from '../live.ts';
import { prefs } from '../prefs.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { ForecastAnswer, ForecastRowConfigurations, LevelDefinition, SiteView, StructureWithLive } from '../types.ts';
import { compassPoint, dateTime, dayOf, hourMinute, longDate, speed, speedUnitLabels, speedUnits, unitSpace, type SpeedUnit } from '../units.ts';
import { typedNumber } from '../register/structureDraft.ts';

/**
 * An example table for tomorrow noon to 15:00 (site time), so it always lies ahead: a date column
 * and a time column, units in the cells.
 */
function exampleTable(timeZone: string): string {
  const tomorrow = dayOf(Date.now() + 86_400_000, timeZone);
  const rows = [
    ['12:00', 22, 38, 'SW'],
    ['13:00', 28, 47, 'WSW'],
    ['14:00', 34, 58, 'W'],
    ['15:00', 30, 51, 'W'],
  ];
  return ['date,time,mean,gust,direction', ...rows.map(([t, m, g, d]) => `${tomorrow},${t},${m} km/h,${g} km/h,${d}`)].join('\n');
}

type DateOrderChoice = '' | 'day-first' | 'month-first';
type ForecastRowAnswer = ForecastAnswer['rows'][number];
type ForecastStructureAnswer = ForecastAnswer['structures'][number];

/** Plain names of the request's fields, for problems that are not in the table itself. */
const fieldNames: Readonly<Record<string, string>> = {
  unit: 'Speed unit',
  dateOrder: 'Date order',
  heightM: 'Height of the forecast speeds',
  text: 'Forecast table',
};

/** A problem for a person: table problems carry their line and column in the message already. */
function problemText(issue: { path: string; message: string }): string {
  if (issue.path.startsWith('text.')) return issue.message;
  const name = fieldNames[issue.path];
  return name ? `${name}: ${issue.message}` : issue.message;
}

export function Plan() {
  const [tab, setTab] = useState<'forecast' | 'plan'>('forecast');
  // The last forecast checked: the printed plan lists its hours per structure too.
  const [answer, setAnswer] = useState<ForecastAnswer | null>(null);
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
      {tab === 'forecast' ? <ForecastFeedPanel /> : null}
      {tab === 'forecast' ? <ForecastCheck answer={answer} setAnswer={setAnswer} /> : <ActionPlan forecast={answer} />}
    </main>
  );
}

function ForecastCheck({ answer, setAnswer }: { answer: ForecastAnswer | null; setAnswer: (answer: ForecastAnswer | null) => void }) {
  const tz = useTimeZone();
  const unit = useStore(prefs).unit;
  const [text, setText] = useState('');
  const [tableUnit, setTableUnit] = useState<SpeedUnit | ''>('');
  const [dateOrder, setDateOrder] = useState<DateOrderChoice>('');
  const [height, setHeight] = useState('10');
  const [error, setError] = useState<string | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const problemsRef = useRef<HTMLDivElement>(null);
  const resultRef = useRef<HTMLHeadingElement>(null);
  const example = exampleTable(tz);

  // After a check, bring the answer or the problems into view: on a phone they sit below the form.
  useEffect(() => {
    if (problems.length > 0 || error) problemsRef.current?.scrollIntoView({ block: 'start' });
  }, [problems, error]);
  useEffect(() => {
    if (answer) resultRef.current?.scrollIntoView({ block: 'start' });
  }, [answer]);

  const check = async () => {
    setBusy(true);
    setError(null);
    setProblems([]);
    try {
      const h = typedNumber(height);
      const body: Record<string, unknown> = { text };
      if (tableUnit) body.unit = tableUnit;
      if (dateOrder) body.dateOrder = dateOrder;
      if (h !== undefined && !Number.isNaN(h)) body.heightM = h;
      setAnswer(await api<ForecastAnswer>('/api/forecast', { body }));
    } catch (err) {
      setAnswer(null);
      if (err instanceof ApiError && err.issues.length > 0) setProblems(err.issues.map(problemText));
      else setError(errorText(err));
    } finally {
      setBusy(false);
    }
  };

  return (
    <section aria-labelledby="fc-h">
      <h2 id="fc-h">Forecast check</h2>
      <p>Paste a forecast table (from a spreadsheet or a weather service) with a header row naming the time, mean, gust and direction, or load a CSV file. Each row’s gust is moved to each structure’s height and compared with its levels; a row with only a mean gets a gust of 1.66 × the mean (in-land exposure).</p>
      <Caution />
      <Field
        id="fc-text"
        label="Forecast table"
        help={
          <>
            Tab, semicolon or comma separated. Date and time in one column or in two (“date,time,mean,gust,dir”). Units in the header (“gust (km/h)”), in the cells (“8 mph”) or chosen below. Times without an offset are in the site’s time zone ({tz}).
          </>
        }
        wide
      >
        <textarea id="fc-text" rows={8} class="mono" placeholder={example} value={text} onInput={(e) => setText(e.currentTarget.value)} />
      </Field>
      <details class="fc-formats">
        <summary>What the table may hold</summary>
        <ul>
          <li>Speeds in m/s, km/h, mph or kn (kt, knots); one unit per column — a column that changes unit is refused, not converted.</li>
          <li>Mean wind as a Beaufort force (“Bft 6”): read as the top of its band (force 6 as 13.8 m/s). Force 12 and Beaufort gusts are refused.</li>
          <li>Dates as 2026-06-14, or 14/06/2026 and 06/14/2026 with the date order chosen below, named in the header (“date (dd/mm/yyyy)”) or shown by a date like 13/06/2026. A table where both orders fit is refused.</li>
          <li>Times as 14:00, 14:00:00, 2 pm, or 1400 in a time column of its own; an offset may follow (14:00Z, 14:00+01:00).</li>
          <li>Directions in degrees from north or as compass points (WSW); empty, “-” or “NA” means missing, never calm.</li>
        </ul>
      </details>
      <div class="grid2">
        <Field id="fc-unit" label="Speed unit of bare numbers when the header names none">
          <select id="fc-unit" value={tableUnit} onChange={(e) => setTableUnit(e.currentTarget.value as SpeedUnit | '')}>
            <option value="">from the header or the cells</option>
            {speedUnits.map((u) => (
              <option value={u}>{speedUnitLabels[u]}</option>
            ))}
          </select>
        </Field>
        <Field id="fc-order" label="Dates like 03/12/2026">
          <select id="fc-order" value={dateOrder} onChange={(e) => setDateOrder(e.currentTarget.value as DateOrderChoice)}>
            <option value="">detect — refuse if both orders fit</option>
            <option value="day-first">day first: 03/12 is 3 December</option>
            <option value="month-first">month first: 03/12 is March 12</option>
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
      <div ref={problemsRef} class="fc-problems-anchor">
        {error ? <p class="error-box">{error}</p> : null}
        {problems.length > 0 ? (
          <div class="error-box fc-problems" role="alert">
            <p>The table could not be read; nothing was checked:</p>
            <ul>
              {problems.map((p) => (
                <li>{p}</li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>
      {answer ? <ForecastResult answer={answer} unit={unit} tz={tz} headingRef={resultRef} /> : null}
    </section>
  );
}

const toneRank: Readonly<Record<Tone, number>> = { l0: 0, l1: 1, l2: 2, l3: 3, nodata: 4 };

/** One structure's predicted standing in one forecast row. */
interface Standing {
  structure: ForecastStructureAnswer;
  /** The level in the configuration it stands in now and in the one the plan moves it to ("Raised: Prepare · Lowered: Watch"); null when the plan moves it nowhere. */
  planned: string | null;
  level: number | null;
  gustHereMps: number | null;
  tone: Tone;
  /** Gust here ÷ the top level's trigger: how close it comes, for ordering within a tone. */
  closeness: number;
}

/** Every structure's standing in a row, worst first: unknown, then by tone, level and closeness to the top level. */
function standings(answer: ForecastAnswer, row: ForecastRowAnswer): Standing[] {
  return answer.structures
    .map((structure, i): Standing => {
      const p = row.levels[i];
      const level = p?.level ?? null;
      const gustHereMps = p?.gustAtStructureMps ?? null;
      const top = structure.levels.at(-1)?.triggerGustMps ?? null;
      return {
        structure,
        planned: plannedWords(structure, row.configurations?.[i]),
        level,
        gustHereMps,
        tone: levelTone(level, structure.levels.length, level === null),
        closeness: gustHereMps !== null && top ? gustHereMps / top : 0,
      };
    })
    .sort((a, b) => compareStandings(b, a));
}

/** > 0 when `a` is worse than `b`: unknown first, then the tone, the level, and how close to the top level. */
function compareStandings(a: Standing, b: Standing): number {
  return toneRank[a.tone] - toneRank[b.tone] || (a.level ?? 0) - (b.level ?? 0) || a.closeness - b.closeness;
}

/** "Raised" from "raised": a configuration's name at the start of a phrase. */
const capitalized = (name: string): string => name.charAt(0).toUpperCase() + name.slice(1);

/** A level by its label ("Prepare"), "below all levels", or "unknown". */
function levelLabel(structure: ForecastStructureAnswer, level: number | null): string {
  if (level === null) return 'unknown';
  if (level === 0) return 'below all levels';
  return structure.levels[level - 1]?.label ?? `level ${level}`;
}

/**
 * The level in the configuration the structure stands in now and in the one its plan moves it to
 * in this row: "Raised: Prepare · Lowered: Watch". Null when the plan moves it nowhere (or the
 * answer has no configurations: an older server).
 */
export function plannedWords(structure: ForecastStructureAnswer, row: ForecastRowConfigurations | undefined): string | null {
  if (!row || row.planned === null) return null;
  const now = row.inConfigurations[row.current];
  const planned = row.inConfigurations[row.planned];
  if (!now || !planned) return null;
  return `${capitalized(now.name)}: ${levelLabel(structure, now.level)} · ${capitalized(planned.name)}: ${levelLabel(structure, planned.level)}`;
}

function levelWords(s: Standing): string {
  if (s.level === null) return 'Unknown — no wind given';
  if (s.level === 0) return 'Below all levels';
  return `Level ${s.level} · ${s.structure.levels[s.level - 1]?.label ?? ''}`;
}

/** What comes next for the structure: the next level's gust, or that it is at its top level. */
function nextWords(s: Standing, unit: SpeedUnit): string | null {
  if (s.level === null) return null;
  const levels = s.structure.levels;
  const next = levels[s.level];
  if (next) return `${next.label} from ${speed(next.triggerGustMps, unit)}`;
  const top = levels.at(-1);
  return top ? `at its top level (from ${speed(top.triggerGustMps, unit)})` : null;
}

function ForecastResult({ answer, unit, tz, headingRef }: { answer: ForecastAnswer; unit: SpeedUnit; tz: string; headingRef: Ref<HTMLHeadingElement> }) {
  // A phone shows the hour view and keeps the full grid folded; a wide screen opens both.
  const [wide] = useState(() => typeof matchMedia === 'function' && matchMedia('(min-width: 720px)').matches);
  const perRow = answer.rows.map((row) => ({ row, ranked: standings(answer, row) }));
  const known = perRow.filter((r) => r.ranked[0] && r.ranked[0].level !== null);
  // The first row at the highest standing (a later row only replaces it when strictly worse).
  const worst = known.reduce<(typeof perRow)[number] | null>((best, r) => (best === null || compareStandings(r.ranked[0]!, best.ranked[0]!) > 0 ? r : best), null);
  const unknownRows = answer.rows.filter((r) => r.gustMps === null).length;
  const days: Array<{ day: string; rows: typeof perRow }> = [];
  for (const r of perRow) {
    const day = dayOf(r.row.timeMs, tz);
    if (days.at(-1)?.day !== day) days.push({ day, rows: [] });
    days.at(-1)!.rows.push(r);
  }

  return (
    <div class="fc-result">
      <h3 id="fc-result-h" ref={headingRef} tabIndex={-1}>
        Predicted levels, {answer.rows.length} row{answer.rows.length === 1 ? '' : 's'}
      </h3>
      {answer.notChecked.length > 0 ? (
        <div class="unknown-box" role="note">
          <p>Not checked — predicted level unknown:</p>
          <ul>
            {answer.notChecked.map((s) => (
              <li>
                {s.name}: {s.reason}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {answer.structures.length === 0 ? (
        <p class="unknown-box">No structure with levels is registered, so no level can be predicted.</p>
      ) : (
        <>
          {worst ? (
            <p class={`fc-overall tone-${worst.ranked[0]!.tone}`}>
              <LevelShape tone={worst.ranked[0]!.tone} size={24} />
              <span>
                Highest predicted: <strong>{levelWords(worst.ranked[0]!)}</strong> — {worst.ranked[0]!.structure.name}, {dateTime(worst.row.timeMs, tz)}
              </span>
            </p>
          ) : null}
          <section class="fc-hours" aria-labelledby="fc-hours-h">
            <h3 id="fc-hours-h">Worst level each hour</h3>
            <p class="muted small">
              Each line is the highest level any structure reaches, which structure, and the gust. Tap a line for every structure. Times in {tz}; speeds in {speedUnitLabels[unit]}.
            </p>
            {days.map((d) => (
              <div class="fc-day">
                <h4>{longDate(d.rows[0]!.row.timeMs, tz)}</h4>
                <ol class="fc-hour-list">
                  {d.rows.map((r) => (
                    <HourItem row={r.row} ranked={r.ranked} unit={unit} tz={tz} heightM={answer.heightM} />
                  ))}
                </ol>
              </div>
            ))}
          </section>
          {unknownRows > 0 ? (
            <p class="unknown-box small">
              {unknownRows} row{unknownRows === 1 ? ' gives' : 's give'} no wind: the level there is unknown, not calm.
            </p>
          ) : null}
          {answer.notes.length > 0 || answer.ignoredColumns.length > 0 ? (
            <div class="fc-notes">
              <p class="small">How the table was read:</p>
              <ul class="small">
                {answer.notes.map((n) => (
                  <li>{n}</li>
                ))}
                {answer.ignoredColumns.length > 0 ? <li>Columns not used: {answer.ignoredColumns.join(', ')}.</li> : null}
              </ul>
            </div>
          ) : null}
          <details class="fc-grid-more" open={wide}>
            <summary>Every structure, row by row (table)</summary>
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
                        const tone = levelTone(level, s.levels.length, level === null);
                        return (
                          <td class={`grid-cell tone-${tone}`}>
                            <span class="lvl-cell">
                              <LevelShape tone={tone} size={18} />
                              <span>{level === null ? 'unknown' : level === 0 ? 'below all' : `${level} · ${s.levels[level - 1]?.label ?? ''}`}</span>
                            </span>
                            <span class="muted small">{p?.gustAtStructureMps != null ? `gust here ${speed(p.gustAtStructureMps, unit)}` : ''}</span>
                            {(() => {
                              const words = plannedWords(s, r.configurations?.[i]);
                              return words ? <span class="fc-planned small">{words}</span> : null;
                            })()}
                          </td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </details>
        </>
      )}
    </div>
  );
}

/** One forecast row: the worst standing in the summary line, every structure when opened. */
function HourItem({ row, ranked, unit, tz, heightM }: { row: ForecastRowAnswer; ranked: Standing[]; unit: SpeedUnit; tz: string; heightM: number }) {
  const worst = ranked[0]!;
  const alike = ranked.filter((s) => s !== worst && s.level === worst.level && s.level !== null && s.level > 0 && s.tone === worst.tone).length;
  const forecast = [
    row.meanMps !== null ? `mean ${speed(row.meanMps, unit)}` : null,
    row.gustMps !== null ? `gust ${speed(row.gustMps, unit)}${row.gustSource === 'mean' ? ' (1.66 × the mean)' : ''}` : null,
    row.dirFromDeg !== null ? `from ${compassPoint(row.dirFromDeg)}` : null,
  ].filter((p) => p !== null);
  return (
    <li class={`fc-hour tone-${worst.tone}`}>
      <details>
        <summary>
          <span class="fc-time">{hourMinute(row.timeMs, tz)}</span>
          <span class="fc-level">
            <LevelShape tone={worst.tone} size={22} />
            <strong>{levelWords(worst)}</strong>
          </span>
          {worst.level === null ? (
            <span class="fc-which">Every structure unknown: this row gives no gust and no mean.</span>
          ) : (
            <>
              <span class="fc-which">
                {worst.level === 0 ? 'Nearest its first level: ' : ''}
                {worst.structure.name}
                {alike > 0 ? ` and ${alike} more at this level` : ''}
              </span>
              <span class="fc-gust">
                Gust {speed(row.gustMps, unit)} forecast{row.gustSource === 'mean' ? ' (from the mean)' : ''} · {speed(worst.gustHereMps, unit)} at its height
              </span>
            </>
          )}
        </summary>
        <div class="fc-detail">
          <p class="small">
            Forecast at {heightM}
            {unitSpace}m: {forecast.length > 0 ? forecast.join(', ') : 'no wind given'}.
          </p>
          <ul class="fc-structures">
            {ranked.map((s) => {
              const next = nextWords(s, unit);
              return (
                <li class={`fc-structure tone-${s.tone}`}>
                  <LevelShape tone={s.tone} size={20} />
                  <span class="fc-structure-text">
                    <strong>{s.structure.name}</strong>
                    <span>{levelWords(s)}</span>
                    {s.planned ? <span class="fc-planned">{s.planned}</span> : null}
                    <span class="muted small">
                      {s.gustHereMps !== null ? `gust ${speed(s.gustHereMps, unit)} at ${s.structure.referenceHeightM.toFixed(1)}${unitSpace}m` : 'gust unknown'}
                      {next ? ` · ${next}` : ''}
                    </span>
                  </span>
                </li>
              );
            })}
          </ul>
        </div>
      </details>
    </li>
  );
}

function ActionPlan({ forecast }: { forecast: ForecastAnswer | null }) {
  const unit = useStore(prefs).unit;
  const tz = useTimeZone();
  const snap = useStore(live).snapshot;
  const [list, setList] = useState<StructureWithLive[] | null>(null);
  const [siteLevels, setSiteLevels] = useState<LevelDefinition[]>([]);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    api<{ structures: StructureWithLive[] }>('/api/structures')
      .then((a) => setList(a.structures))
      .catch((err) => setError(errorText(err)));
    api<{ site: SiteView }>('/api/site')
      .then((answer) => setSiteLevels(answer.site.defaultLevels))
      .catch(() => undefined);
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
          {s.live ? <PlanConfigurations structure={s} siteLevels={siteLevels} unit={unit} /> : <p class="unknown-box">Not assessed: check this structure’s record.</p>}
          {forecast ? <PlanForecastHours structure={s} forecast={forecast} unit={unit} tz={tz} /> : null}
        </article>
      ))}
      <p class="small plan-key">
        Shapes: <LevelShape tone="l0" size={16} /> below all levels · <LevelShape tone="l1" size={16} /> lower level · <LevelShape tone="l2" size={16} /> middle level · <LevelShape tone="l3" size={16} /> top level ·{' '}
        <LevelShape tone="nodata" size={16} /> no data: wind unknown, act on the plan.
      </p>
    </section>
  );
}

/** The levels' actions that move the structure, by level (the structure's own levels, else the site's). */
function moveTargets(s: StructureWithLive, siteLevels: readonly LevelDefinition[]): Array<string | null> {
  const defined = (s.levels ?? siteLevels) as ReadonlyArray<LevelDefinition & { moveToConfiguration?: string }>;
  return (s.live?.levels ?? []).map((_, i) => defined[i]?.moveToConfiguration ?? null);
}

/**
 * A structure on the printed plan: its levels in the configuration it stands in now, and, when it
 * has others, each of them with its own limit and level gusts (the same engine, design §2.5).
 */
function PlanConfigurations({ structure: s, siteLevels, unit }: { structure: StructureWithLive; siteLevels: readonly LevelDefinition[]; unit: SpeedUnit }) {
  const state = s.live!;
  const configurations = Array.isArray(state.configurations) ? state.configurations : [];
  const moves = moveTargets(s, siteLevels);
  const levelRows = (triggers: ReadonlyArray<number | null>) =>
    state.levels.map((l, i) => ({ level: l.level, label: l.label, actionText: l.actionText, trigger: l.trigger, triggerGustMps: triggers[i] ?? null, moveToConfiguration: moves[i] ?? null }));
  const limitWords = (limitGustMps: number) => `limit gust ${speed(limitGustMps, unit)}${unit !== 'km/h' ? ` (${speed(limitGustMps, 'km/h')})` : ''}`;
  if (configurations.length <= 1) {
    return (
      <>
        <p class="small">
          {capitalized(limitWords(state.limitGustMps))} at {state.referenceHeightM.toFixed(1)}&nbsp;m · {s.levels ? 'own levels' : 'site levels'}
        </p>
        <LevelsTable levels={levelRows(state.triggerGustsMps)} unit={unit} />
      </>
    );
  }
  const current = configurations.find((c) => c.current) ?? null;
  const ordered = current ? [current, ...configurations.filter((c) => c !== current)] : configurations;
  const planMoves = state.levels.map((l, i) => (moves[i] ? `${l.label} → ${moves[i]}` : null)).filter((m) => m !== null);
  return (
    <>
      <p class="small">
        {configurations.length} configurations · {s.levels ? 'own levels' : 'site levels'}
        {planMoves.length > 0 ? ` · the plan moves it: ${planMoves.join(', ')}` : ''}
      </p>
      {ordered.map((c) => (
        <div class={`plan-configuration${c.current ? ' is-current' : ''}`}>
          <h4>
            {capitalized(c.name)}
            {c.current ? ' (now)' : ''} — {limitWords(c.limitGustMps)}
          </h4>
          <LevelsTable levels={levelRows(c.current ? state.triggerGustsMps : c.triggerGustsMps)} unit={unit} />
        </div>
      ))}
      {current === null ? <p class="unknown-box small">The configuration it stands in now is unknown: act on the lowest limit.</p> : null}
    </>
  );
}

/** The checked forecast's hours for one structure on the printed plan: the level now, and in the configuration the plan moves it to. */
function PlanForecastHours({ structure: s, forecast, unit, tz }: { structure: StructureWithLive; forecast: ForecastAnswer; unit: SpeedUnit; tz: string }) {
  const index = forecast.structures.findIndex((f) => f.id === s.id);
  if (index < 0) return null;
  const structure = forecast.structures[index]!;
  const withPlan = forecast.rows.some((r) => r.configurations?.[index]?.planned != null);
  return (
    <div class="table-scroll plan-forecast">
      <table class="data">
        <caption>
          Forecast checked, hour by hour (times in {tz}){withPlan ? ': the level now, and after the action the plan calls for' : ''}
        </caption>
        <thead>
          <tr>
            <th scope="col">Time</th>
            <th scope="col">Gust here</th>
            <th scope="col">Level</th>
          </tr>
        </thead>
        <tbody>
          {forecast.rows.map((r) => {
            const p = r.levels[index];
            const level = p?.level ?? null;
            const planned = plannedWords(structure, r.configurations?.[index]);
            return (
              <tr class={`tone-${levelTone(level, structure.levels.length, level === null)}`}>
                <th scope="row">{dateTime(r.timeMs, tz)}</th>
                <td>{speed(p?.gustAtStructureMps ?? null, unit)}</td>
                <td>{planned ?? (level === null ? 'unknown' : level === 0 ? 'below all levels' : `${level} · ${structure.levels[level - 1]?.label ?? ''}`)}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
