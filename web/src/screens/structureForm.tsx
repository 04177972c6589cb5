/**
 * Registering or editing a structure (competent person): a form per kind with help on every
 * field, the calculator's answer as you type (debounced POST /api/assess), the side view, the
 * levels and actions, and where it stands and which sensors govern it.
 *
 * Field errors come from the server's 400 `issues` (the calculator's paths start "structure.",
 * the register's "record."); a local check catches what is empty and needed and text that is not
 * a number. Before a save is tried, only fields the person has touched show their complaints, so a
 * new form does not start as a wall of red; the calculator names every field it is waiting for,
 * by its label, each a link to the field (the first one first), and says it in the form's words
 * (register/fieldWords.ts), never the API's field names.
 *
 * While typing, the answer stays in view: on a phone a strip at the bottom of the form carries the
 * limit gust and what governs (or the field it waits for); on a desktop the calculator is a side
 * panel that opens on the limit and the drawing, the numbers one tab away.
 */
import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { Caution } from '../components/caution.tsx';
import { described, Field } from '../components/field.tsx';
import { ConfigurationsEditor } from '../components/configurationsEditor.tsx';
import { LevelsEditor } from '../components/levelsEditor.tsx';
import { triggerText } from '../components/levelsTable.tsx';
import { DirectionsTable, ElementsList, Warnings } from '../components/assessmentSummary.tsx';
import { PlanView } from '../components/planView.tsx';
import { SideView } from '../components/sideView.tsx';
import { faceColumns, kindFields, kindIntro, kindNames, massColumns, commonFields, panelPresets, panelPresetsSource, upliftColumns, type FieldDef } from '../register/kindFields.ts';
import { fieldControlId, formWords, issueFields, type IssueField } from '../register/fieldWords.ts';
import { formKinds, kindForms } from '../register/kinds/index.ts';
import { bannerRun, draftFromView, draftInput, draftLevels, draftRecord, emptyFaceRow, emptyMassRow, newDraft, plainMessage, switchKind, typedNumber, type Draft } from '../register/structureDraft.ts';
import { refreshSnapshot } from '../live.ts';
import { prefs } from '../prefs.ts';
import { href, navigate, useRoute } from '../router.ts';
import { may, session } from '../session.ts';
import { site, siteDesignDensity } from '../site.ts';
import { useStore } from '../store.ts';
import type { AssessAnswer, SensorView, StructureKind, StructureWithLive } from '../types.ts';
import { kiloNewtonMetres, kiloNewtons, mpsToSpeed, percent, quantity, speed, speedToMps, speedUnitLabels } from '../units.ts';
import { maxLabelLength, maxPlausibleSpeedMps } from '../../../server/engine/limits.ts';

/** Every kind, in the form's order (register/kinds/index.ts). */
const kinds = formKinds;
/** Pause after the last keystroke before asking the calculator, ms. */
const debounceMs = 350;

export function StructureForm({ id }: { id: number | null }) {
  const who = useStore(session);
  const unit = useStore(prefs).unit;
  const siteInfo = useStore(site);
  // The design density, as the save checks the levels: the form and the save agree.
  const density = useStore(siteDesignDensity);
  const siteLevels = siteInfo?.defaultLevels ?? [];
  const canEdit = may(who, 'competent-person');

  const [draft, setDraft] = useState<Draft | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [sensors, setSensors] = useState<SensorView[]>([]);
  const [checkGust, setCheckGust] = useState(() => String(Math.round(mpsToSpeed(20, unit))));
  const [answer, setAnswer] = useState<AssessAnswer | null>(null);
  const [assessIssues, setAssessIssues] = useState<Map<string, string>>(new Map());
  const [saveIssues, setSaveIssues] = useState<Map<string, string>>(new Map());
  const [touched, setTouched] = useState<Set<string>>(new Set());
  const [triedSave, setTriedSave] = useState(false);
  const [saving, setSaving] = useState(false);
  // A new structure is saved and the page moves to its own address: the confirmation travels in the query.
  const justSaved = useRoute().query.get('saved') === '1';
  // `fields`: the fields a refused save names, each a button that takes the person to it. `top`: shown
  // under the heading (a new structure's confirmation: the page has just opened at its top).
  const [message, setMessage] = useState<Message | null>(justSaved ? { ok: true, text: 'Saved. It is on the live board now.', top: true } : null);
  const seq = useRef(0);

  // Load the structure (or start a new draft once the site's default levels are known).
  useEffect(() => {
    if (id === null) {
      if (siteInfo && !draft) setDraft(newDraft(formKinds[0]!, siteLevels, unit));
      return;
    }
    api<{ structure: StructureWithLive }>(`/api/structures/${id}`)
      .then((a) => setDraft(draftFromView(a.structure, siteLevels, unit)))
      .catch((err) => setLoadError(errorText(err)));
    // Loaded once per id; the site's levels only seed a new draft.
  }, [id, siteInfo === null]);

  useEffect(() => {
    api<{ sensors: SensorView[] }>('/api/sensors')
      .then((a) => setSensors(a.sensors))
      .catch(() => setSensors([]));
  }, []);

  // The record as typed, and what is wrong with it before the server is asked (empty and needed, not a number).
  const { record, local, levelsForAssess } = useMemo(() => {
    const found = new Map<string, string>();
    if (!draft) return { record: null, local: found, levelsForAssess: [] as unknown[] };
    const built = draftRecord(draft, unit, found);
    // The calculator takes the triggers only: which configuration a level moves to is the register's.
    const levels = (draft.ownLevels ? draftLevels(draft.levels, unit, found) : siteLevels).map((l) => {
      const { moveToConfiguration: _moveTo, ...trigger } = l as Record<string, unknown>;
      return trigger;
    });
    const orientation = orientationProblem(draft.orientationDeg);
    if (orientation) found.set('orientationDeg', orientation);
    return { record: built, local: found, levelsForAssess: levels };
  }, [draft, unit, siteInfo]);
  const [pending, setPending] = useState(false);
  const [sideTab, setSideTab] = useState<CalcTab>('side');
  const checkGustMps = (() => {
    const n = typedNumber(checkGust);
    return n === undefined || Number.isNaN(n) ? null : speedToMps(n, unit);
  })();
  // The way the front faces, when the form holds a usable one: sides are then named by compass.
  const frontAzimuthDeg = (() => {
    const n = draft ? typedNumber(draft.orientationDeg) : undefined;
    return n === undefined || Number.isNaN(n) || n < 0 || n > 360 ? null : n % 360;
  })();

  // Ask the calculator as the person types.
  useEffect(() => {
    if (!record || checkGustMps === null) return;
    const mine = ++seq.current;
    setPending(true);
    const controller = new AbortController();
    const timer = setTimeout(() => {
      // The calculator needs a name; an unnamed draft is still worth calculating while typing.
      const structure = record.name === '' ? { ...record, name: 'unnamed' } : record;
      const body: Record<string, unknown> = { structure, gustMps: Math.min(maxPlausibleSpeedMps, Math.max(0, checkGustMps)), levels: levelsForAssess };
      if (checkGustMps > 0) body.designGustMps = Math.min(maxPlausibleSpeedMps, checkGustMps);
      // Until the site has loaded, the EN 1991-1-4 §4.5 recommended 1.25 kg/m³ (the save's floor).
      body.airDensityKgM3 = density ?? 1.25;
      if (frontAzimuthDeg !== null) body.frontAzimuthDeg = frontAzimuthDeg;
      api<AssessAnswer>('/api/assess', { body, signal: controller.signal })
        .then((a) => {
          if (mine !== seq.current) return;
          setPending(false);
          setAnswer(a);
          setAssessIssues(new Map(a.levelOrderProblems?.map((p) => [p.path, p.message]) ?? []));
        })
        .catch((err) => {
          if (mine !== seq.current || (err instanceof DOMException && err.name === 'AbortError')) return;
          setPending(false);
          if (err instanceof ApiError && err.status === 400) {
            const m = new Map<string, string>();
            for (const i of err.issues) {
              const path = i.path.startsWith('structure.') ? i.path.slice('structure.'.length) : i.path;
              m.set(path, m.has(path) ? `${m.get(path)}; ${plainMessage(i.message)}` : plainMessage(i.message));
            }
            // Only a configuration is wrong: the record as registered is still calculated (its
            // figures stay in view while a configuration is being typed), the complaints shown.
            const onlyConfigurations = err.issues.length > 0 && err.issues.every((i) => /^structure\.configurations(\.|$)/.test(i.path));
            if (onlyConfigurations && 'configurations' in structure) {
              const { configurations: _configurations, ...bare } = structure;
              setPending(true);
              api<AssessAnswer>('/api/assess', { body: { ...body, structure: bare }, signal: controller.signal })
                .then((a) => {
                  if (mine !== seq.current) return;
                  setPending(false);
                  setAnswer(a);
                  setAssessIssues(new Map([...m, ...(a.levelOrderProblems?.map((p) => [p.path, p.message] as const) ?? [])]));
                })
                .catch((again) => {
                  if (mine !== seq.current || (again instanceof DOMException && again.name === 'AbortError')) return;
                  setPending(false);
                  setAssessIssues(m);
                  setAnswer(null);
                });
              return;
            }
            setAssessIssues(m);
            setAnswer(null);
          } else setMessage({ ok: false, text: errorText(err) });
        });
    }, debounceMs);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [JSON.stringify(record), JSON.stringify(levelsForAssess), checkGustMps, density, frontAzimuthDeg]);

  if (loadError) {
    return (
      <main id="main">
        <p class="crumbs">
          <a href={href('/register')}>← Structures</a>
        </p>
        <h1>Cannot open this structure</h1>
        <p class="error-box">{loadError}</p>
      </main>
    );
  }
  if (!draft) {
    return (
      <main id="main">
        <p class="muted">Loading…</p>
      </main>
    );
  }

  const update = (patch: Partial<Draft>) => setDraft({ ...draft, ...patch });
  const touch = (path: string) => {
    if (!touched.has(path)) setTouched(new Set([...touched, path]));
  };
  /** The complaint to show next to a field: a save's answer first, then the calculator's. */
  const errorFor = (path: string): string | undefined => {
    const fromSave = saveIssues.get(`record.${path}`) ?? saveIssues.get(path);
    if (fromSave) return formWords(plainMessage(fromSave), draft.kind);
    if (!triedSave && !touched.has(path)) return undefined;
    const found = local.get(path) ?? assessIssues.get(path);
    return found === undefined ? undefined : formWords(found, draft.kind);
  };
  const levelErrors = new Map<string, string>();
  for (const [k, v] of [...assessIssues, ...saveIssues, ...local]) if (k.startsWith('levels')) levelErrors.set(k, formWords(plainMessage(v), draft.kind));
  // Every field the calculator or the save is waiting for, in the form's words and page order (a field's own complaint first).
  const attention = inPageOrder(issueFields(new Map([...assessIssues, ...local]), draft.kind));

  const save = async () => {
    setTriedSave(true);
    setMessage(null);
    setSaveIssues(new Map());
    const issues = new Map<string, string>();
    const input = draftInput(draft, unit, issues);
    for (const [k, v] of local) issues.set(k, v);
    if (issues.size > 0) {
      // Refused here, nothing sent: an empty orientation would be stored as north by the API's default.
      // The calculator's own complaints (ranges, cross-field checks) are named with them.
      const fields = inPageOrder(issueFields(new Map([...assessIssues, ...issues]), draft.kind));
      setMessage({ ok: false, text: notSavedText(fields.length), fields });
      return;
    }
    setSaving(true);
    try {
      const answerSaved = id === null ? await api<{ structure: StructureWithLive }>('/api/structures', { body: input }) : await api<{ structure: StructureWithLive }>(`/api/structures/${id}`, { method: 'PATCH', body: input });
      void refreshSnapshot();
      if (id === null) navigate(`/register/${answerSaved.structure.id}?saved=1`);
      else {
        setMessage({ ok: true, text: `Saved “${answerSaved.structure.name}”. It is on the live board now.` });
        setDraft(draftFromView(answerSaved.structure, siteLevels, unit));
      }
    } catch (err) {
      if (err instanceof ApiError && err.issues.length > 0) {
        const m = new Map<string, string>();
        for (const i of err.issues) m.set(i.path, m.has(i.path) ? `${m.get(i.path)}; ${i.message}` : i.message);
        setSaveIssues(m);
        const fields = inPageOrder(issueFields(m, draft.kind));
        setMessage({ ok: false, text: notSavedText(fields.length), fields });
      } else setMessage({ ok: false, text: `Not saved: ${errorText(err)}` });
    } finally {
      setSaving(false);
    }
  };

  const retire = async () => {
    if (id === null || !confirm(`Retire “${draft.name}”? It leaves the live board; its history stays in the log.`)) return;
    try {
      await api(`/api/structures/${id}`, { method: 'DELETE' });
      void refreshSnapshot();
      navigate('/register');
    } catch (err) {
      setMessage({ ok: false, text: errorText(err) });
    }
  };

  const fieldInput = (f: FieldDef) => {
    const fid = fieldControlId(f.path);
    const value = draft.values[f.path] ?? '';
    const err = errorFor(f.path);
    const set = (v: string) => {
      touch(f.path);
      update({ values: { ...draft.values, [f.path]: v } });
    };
    const unitLabel = f.kind === 'speed' ? speedUnitLabels[unit] : f.unit === 'count' ? undefined : f.unit;
    let control;
    if (f.kind === 'bool' || f.kind === 'select') {
      control = (
        <select id={fid} value={value} onChange={(e) => set(e.currentTarget.value)} aria-describedby={described(fid, true, !!err)}>
          {f.optional && f.kind === 'select' && !f.initial ? <option value="">default</option> : null}
          {f.options!.map(([v, label]) => (
            <option value={v}>{label}</option>
          ))}
        </select>
      );
    } else {
      control = (
        <input
          id={fid}
          value={value}
          inputMode={f.kind === 'text' ? 'text' : f.kind === 'int' ? 'numeric' : 'decimal'}
          placeholder={f.placeholder ?? ''}
          aria-invalid={err ? true : undefined}
          aria-describedby={described(fid, true, !!err)}
          onInput={(e) => set(e.currentTarget.value)}
          onBlur={() => touch(f.path)}
        />
      );
    }
    return (
      <Field id={fid} label={f.label} unit={unitLabel} help={formWords(f.help, draft.kind)} error={err} key={f.path}>
        {control}
      </Field>
    );
  };

  /** The check gust: at the top of the panel until there is an answer, then at the head of its numbers (the drawing comes first). */
  const checkField = (show: boolean) =>
    show ? (
      <Field id="sf-check" label="Check gust at the structure" unit={speedUnitLabels[unit]} error={checkGustMps === null ? 'must be a number' : checkGustMps > maxPlausibleSpeedMps ? `at most ${maxPlausibleSpeedMps} m/s` : undefined} help="Loads and forces (in the drawing too) are at this gust; it is also the design gust for the extra ballast. Air density: the design density the levels are checked at on save (the site’s ISA or fixed density, never less than 1.25 kg/m³).">
            <input id="sf-check" inputMode="decimal" value={checkGust} onInput={(e) => setCheckGust(e.currentTarget.value)} />
          </Field>
    ) : null;
  const nameErr = errorFor('name');
  const levelGusts = answer?.levels?.map((l) => (l.triggerGustMps === null ? 'no gust reaches it' : speed(l.triggerGustMps, unit))) ?? [];

  return (
    <main id="main" class="form-page">
      <p class="crumbs">
        <a href={href('/register')}>← Structures</a>
        {id !== null ? (
          <>
            {' · '}
            <a href={href(`/structure/${id}`)}>live view</a>
          </>
        ) : null}
      </p>
      <h1>{id === null ? 'Register a structure' : `Edit: ${draft.name || 'structure'}`}</h1>
      {message?.top ? <MessageBox message={message} /> : null}
      <Caution />
      {!canEdit ? <p class="note-box">You can try numbers here, but only a competent person can save changes to the register.</p> : null}

      <div class="form-layout">
        <div class="form-main">
          <section aria-labelledby="what-h">
            <h2 id="what-h">What it is</h2>
            <div class="field">
              <span class="label-like" id="kind-label">
                Kind
              </span>
              <div class="seg wrap" role="radiogroup" aria-labelledby="kind-label">
                {kinds.map((k) => (
                  <button type="button" role="radio" aria-checked={draft.kind === k} class={draft.kind === k ? 'on' : ''} onClick={() => setDraft(switchKind(draft, k, siteLevels, unit))}>
                    {kindNames[k]}
                  </button>
                ))}
              </div>
              <p class="help">{kindIntro[draft.kind]}</p>
            </div>
            <Field id="sf-name" label="Name" error={nameErr} help="As the crew know it; shown on the board, in alerts and in the log.">
              <input
                id="sf-name"
                value={draft.name}
                maxLength={maxLabelLength}
                aria-describedby={described('sf-name', true, !!nameErr)}
                onInput={(e) => {
                  touch('name');
                  update({ name: e.currentTarget.value });
                }}
              />
            </Field>
          </section>

          <section aria-labelledby="dims-h">
            <h2 id="dims-h">Dimensions, masses and coefficients</h2>
            {kindForms[draft.kind].editor === 'fencePanels' ? (
              <FencePanels draft={draft} fieldInput={fieldInput} setValues={(values) => {
                setTouched(new Set([...touched, ...Object.keys(values)]));
                update({ values: { ...draft.values, ...values } });
              }} />
            ) : null}
            <div class="grid2">{mainFields(draft.kind).map(fieldInput)}</div>
            {alternativeFields(draft.kind).length > 0 ? (
              <details class="alt-fields" open={alternativeFields(draft.kind).some((f) => (draft.values[f.path] ?? '').trim() !== '')}>
                <summary>{kindForms[draft.kind].alternativesSummary ?? 'Or give these instead'}</summary>
                <div class="grid2">{alternativeFields(draft.kind).map(fieldInput)}</div>
              </details>
            ) : null}
            {kindForms[draft.kind].editor === 'rows' ? <CustomRows draft={draft} update={update} errorFor={errorFor} touch={touch} /> : null}
          </section>

          <section aria-labelledby="res-h">
            <h2 id="res-h">Ground, safety factors, rated gust</h2>
            <div class="grid2">{commonFields.filter((f) => f.path !== 'configurationName').map(fieldInput)}</div>
          </section>

          <ConfigurationsEditor
            draft={draft}
            unit={unit}
            answer={answer}
            pending={pending}
            registeredNameField={fieldInput(commonFields.find((f) => f.path === 'configurationName')!)}
            errorFor={errorFor}
            touch={touch}
            onChange={(patch) => update(patch)}
            readOnly={false}
          />

          <section aria-labelledby="lv-h">
            <h2 id="lv-h">Levels and actions</h2>
            <label class="check">
              <input
                type="checkbox"
                checked={!draft.ownLevels}
                onChange={(e) => {
                  const useSite = e.currentTarget.checked;
                  update({ ownLevels: !useSite, levels: useSite ? draft.levels : draft.levels.length > 0 ? draft.levels : [] });
                }}
              />
              Use the site’s default levels
            </label>
            {draft.ownLevels ? (
              <LevelsEditor
                idPrefix="sl"
                levels={draft.levels}
                unit={unit}
                errors={levelErrors}
                gustsText={levelGusts}
                configurations={draft.configurations.map((c) => c.name.trim()).filter((name) => name !== '')}
                onChange={(levels) => update({ levels })}
              />
            ) : (
              <ul class="plain-list">
                {(answer?.levels ?? siteLevels.map((l, i) => ({ level: i + 1, label: l.label, triggerGustMps: null, trigger: l.trigger }))).map((l) => (
                  <li>
                    <strong>
                      {l.level} · {l.label}
                    </strong>
                    : {l.trigger.kind === 'utilization' ? `${Math.round(l.trigger.fraction * 100)}\u00a0% of load capacity` : l.trigger.kind === 'chance' ? triggerText(l.trigger, unit) : `gust ${speed(l.trigger.gustMps, unit)}`}
                    {l.triggerGustMps !== null ? ` → reached at ${speed(l.triggerGustMps, unit)}` : ''}
                  </li>
                ))}
              </ul>
            )}
          </section>

          <section aria-labelledby="where-h">
            <h2 id="where-h">Where it stands and what measures its wind</h2>
            <div class="grid2">
              <Field
                id="sf-orient"
                label="Front faces towards"
                unit="° from north"
                error={errorFor('orientationDeg')}
                help="Azimuth the front side faces, degrees clockwise from north (0 north, 90 east, 180 south, 270 west): take it on site with a compass. Sides and winds are then named by compass, and it is used when the site assesses wind direction. No default: a wrong guess puts the wind on the wrong side."
              >
                <input
                  id="sf-orient"
                  inputMode="decimal"
                  placeholder="e.g. 180 (the front faces south)"
                  value={draft.orientationDeg}
                  aria-invalid={errorFor('orientationDeg') ? true : undefined}
                  aria-describedby={described('sf-orient', true, !!errorFor('orientationDeg'))}
                  onInput={(e) => {
                    touch('orientationDeg');
                    update({ orientationDeg: e.currentTarget.value });
                  }}
                  onBlur={() => touch('orientationDeg')}
                />
              </Field>
              <Field id="sf-loc" label="Location on site" error={errorFor('location')} help="In words the crew know: “west lawn, by the bar”.">
                <input id="sf-loc" maxLength={maxLabelLength} value={draft.location} onInput={(e) => update({ location: e.currentTarget.value })} />
              </Field>
              <Field id="sf-lat" label="Latitude" unit="°" error={errorFor('latDeg')} help="Optional, −90 to 90.">
                <input id="sf-lat" inputMode="decimal" value={draft.latDeg} onInput={(e) => update({ latDeg: e.currentTarget.value })} />
              </Field>
              <Field id="sf-lon" label="Longitude" unit="°" error={errorFor('lonDeg')} help="Optional, −180 to 180.">
                <input id="sf-lon" inputMode="decimal" value={draft.lonDeg} onInput={(e) => update({ lonDeg: e.currentTarget.value })} />
              </Field>
            </div>
            <label class="check">
              <input type="checkbox" checked={draft.mobile} onChange={(e) => update({ mobile: e.currentTarget.checked })} />
              Mobile (a screen on a vehicle, a towed unit)
            </label>
            <fieldset class="sensor-pick">
              <legend>Sensors that govern</legend>
              <p class="help">None ticked: every sensor on the site, the highest gust wins (the safe default). Tick sensors only when others cannot see this structure’s wind.</p>
              {sensors.length === 0 ? <p class="muted">No sensors registered.</p> : null}
              {sensors.map((s, i) => (
                <label class="check" key={s.key}>
                  <input
                    type="checkbox"
                    checked={draft.sensorKeys.includes(s.key)}
                    onChange={(e) => update({ sensorKeys: e.currentTarget.checked ? [...draft.sensorKeys, s.key] : draft.sensorKeys.filter((k) => k !== s.key) })}
                  />
                  {s.name} ({s.key}, {s.heightM} m)
                  {saveIssues.get(`sensorKeys.${i}`) ? <span class="field-error"> {saveIssues.get(`sensorKeys.${i}`)}</span> : null}
                </label>
              ))}
            </fieldset>
          </section>

          {message && !message.top ? <MessageBox message={message} /> : null}
          {canEdit ? (
            <div class="row save-row">
              <button type="button" class="primary" disabled={saving} onClick={() => void save()}>
                {saving ? 'Saving…' : id === null ? 'Register structure' : 'Save changes'}
              </button>
              {id !== null ? (
                <button type="button" class="danger" onClick={() => void retire()}>
                  Retire
                </button>
              ) : null}
            </div>
          ) : null}
          <CalcStrip answer={answer} attention={attention} pending={pending} unit={unit} kind={draft.kind} />
        </div>

        <aside class="form-side" aria-labelledby="calc-h">
          <h2 id="calc-h">Calculated</h2>
          {checkField(!answer)}
          <Attention fields={attention} answered={answer !== null} />
          <Results
            answer={answer}
            waiting={attention.length > 0}
            pending={pending}
            unit={unit}
            frontAzimuthDeg={frontAzimuthDeg}
            kind={draft.kind}
            tab={sideTab}
            setTab={setSideTab}
            checkField={checkField(answer !== null)}
            sideView={answer && record ? <SideView answer={answer} record={record} frontAzimuthDeg={frontAzimuthDeg} /> : null}
            planView={answer ? <PlanView answer={answer} frontAzimuthDeg={frontAzimuthDeg} kind={draft.kind} /> : null}
          />
        </aside>
      </div>
    </main>
  );
}

interface Message {
  ok: boolean;
  text: string;
  /** The fields a refused save names: label, the control to go to (null when none matches) and the complaint. */
  fields?: IssueField[];
  /** Shown under the heading instead of beside the save button. */
  top?: boolean;
}

/** What the side panel shows on a desktop: one drawing or the numbers. */
type CalcTab = 'side' | 'plan' | 'numbers';

const notSavedText = (count: number): string =>
  `Not saved: ${count === 1 ? '1 field needs attention, marked' : `${count} fields need attention, each marked`} in red where it is:`;

/** An empty, unreadable or out-of-range orientation, in words; null when it is a usable azimuth. */
function orientationProblem(text: string): string | null {
  const n = typedNumber(text);
  if (n === undefined) return 'is required: the compass bearing the front faces, 0 to 360° (0 north, 90 east, 180 south, 270 west)';
  if (Number.isNaN(n)) return 'must be a number of degrees, 0 to 360';
  if (n < 0 || n > 360) return 'must be from 0 to 360°';
  return null;
}

/**
 * Takes the person to a field: opens any folded section holding it, brings it to the middle of the
 * screen (clear of the sticky strip and the tabs) and puts the cursor in it.
 */
export function goToControl(controlId: string): void {
  const el = document.getElementById(controlId);
  if (!el) return;
  for (let d = el.closest('details'); d; d = d.parentElement?.closest('details') ?? null) d.open = true;
  el.scrollIntoView({ block: 'center' });
  el.focus({ preventScroll: true });
}

/** Fields in the order they stand on the page (those with no control last), so "the first" is the first one met. */
function inPageOrder<T extends { controlId: string | null }>(items: T[]): T[] {
  if (typeof document === 'undefined') return items;
  const at = (t: T) => (t.controlId ? document.getElementById(t.controlId) : null);
  return items
    .map((item, index) => ({ item, index, el: at(item) }))
    .sort((a, b) => {
      if (a.el && b.el) return a.el.compareDocumentPosition(b.el) & Node.DOCUMENT_POSITION_FOLLOWING ? -1 : 1;
      if (a.el || b.el) return a.el ? -1 : 1;
      return a.index - b.index;
    })
    .map((x) => x.item);
}

function IssueList({ fields, testId }: { fields: IssueField[]; testId?: string }) {
  return (
    <ul class="issue-links" data-testid={testId}>
      {fields.map((f) => (
        <li>
          {f.controlId ? (
            <button type="button" class="link-like" onClick={() => goToControl(f.controlId!)}>
              {f.label}
            </button>
          ) : (
            <strong>{f.label}</strong>
          )}
          : {f.problem}
        </li>
      ))}
    </ul>
  );
}

function MessageBox({ message }: { message: Message }) {
  return (
    <div class={message.ok ? 'ok-box' : 'error-box'} role={message.ok ? 'status' : 'alert'}>
      <p class="message-text">{message.text}</p>
      {message.fields && message.fields.length > 0 ? <IssueList fields={message.fields} /> : null}
    </div>
  );
}

/**
 * What the calculator is waiting for, named field by field (each a link), the first one as a
 * button. With an answer on show (levels out of order, an orientation still to give), it says what
 * must be put right before saving.
 */
function Attention({ fields, answered }: { fields: IssueField[]; answered: boolean }) {
  if (fields.length === 0) return null;
  const first = fields.find((f) => f.controlId !== null);
  const count = fields.length === 1 ? '1 field needs' : `${fields.length} fields need`;
  return (
    <div class="attention-box" role="status" data-testid="calc-attention">
      <p class="attention-h">{answered ? `Before it can be saved, ${count} attention:` : `No limit yet: ${count} attention first:`}</p>
      <IssueList fields={fields} testId="calc-attention-fields" />
      {first ? (
        <button type="button" class="go-first" data-testid="calc-go-first" onClick={() => goToControl(first.controlId!)}>
          Go to {first.label}
        </button>
      ) : null}
    </div>
  );
}

/**
 * The answer while typing on a phone: the limit gust and what governs, or the field the calculator
 * waits for, in a strip that stays at the bottom of the form (above the tabs) until the form's end
 * scrolls into view, where the full answer follows. Hidden on a desktop, where the side panel stays.
 */
function CalcStrip(props: { answer: AssessAnswer | null; attention: IssueField[]; pending: boolean; unit: Parameters<typeof speed>[1]; kind: StructureKind }) {
  const { answer, attention, pending, unit } = props;
  const first = attention.find((f) => f.controlId !== null);
  const toAnswer = () => document.getElementById('calc-h')?.scrollIntoView({ block: 'start' });
  return (
    <div class={`calc-strip${pending ? ' stale' : ''}`} data-testid="calc-strip" aria-label="Calculated limit">
      {answer ? (
        <button type="button" class="cs-answer" onClick={toAnswer}>
          <span class="cs-limit">
            <span class="cs-label">Limit gust{pending ? ' (updating)' : ''}</span>
            <strong data-testid="strip-limit">{answer.limitGustMps === null ? 'no limit found' : speed(answer.limitGustMps, unit)}</strong>
          </span>
          <span class="cs-governs" data-testid="strip-governs">
            {answer.limitGovernedBy === 'rated' ? 'The rated gust governs' : `Governs: ${formWords(answer.governingText, props.kind)}`}
          </span>
          {answer.configurations && answer.configurations.length > 1 ? (
            <span class="cs-configs" data-testid="strip-configurations">
              {answer.configurations
                .slice(1)
                .map((c) => `${c.name} ${c.limitGustMps === null ? 'no limit found' : speed(c.limitGustMps, unit)}`)
                .join(' · ')}
            </span>
          ) : null}
          {attention.length > 0 ? <span class="cs-todo">{attention.length === 1 ? '1 field to put right before saving' : `${attention.length} fields to put right before saving`}</span> : null}
        </button>
      ) : first ? (
        <button type="button" class="cs-answer cs-waiting" onClick={() => goToControl(first.controlId!)}>
          <span class="cs-label">No limit yet: {attention.length === 1 ? '1 field needs' : `${attention.length} fields need`} attention</span>
          <strong class="cs-go" data-testid="strip-go">Go to {first.label} ›</strong>
        </button>
      ) : (
        <p class="cs-answer">{pending ? 'Calculating…' : attention.length > 0 ? 'No limit yet: see the fields named below' : 'Calculating…'}</p>
      )}
    </div>
  );
}

/** Kind fields shown in the main grid: not those its editor shows (a fence's panel fields: FencePanels) nor the folded alternatives. */
const mainFields = (kind: StructureKind): FieldDef[] => kindFields[kind].filter((f) => !f.alternative && !(kindForms[kind].editorFields ?? []).includes(f.path));
const alternativeFields = (kind: StructureKind): FieldDef[] => kindFields[kind].filter((f) => f.alternative);

/**
 * A fence starts from its panels: a common size (or the measured width), how many; the run's
 * length and the feet follow and are said as you type.
 */
function FencePanels(props: { draft: Draft; fieldInput: (f: FieldDef) => preact.JSX.Element; setValues: (values: Record<string, string>) => void }) {
  const { draft } = props;
  const byPath = (path: string) => kindFields[draft.kind].find((f) => f.path === path)!;
  const run = bannerRun(draft.values);
  const isOn = (p: (typeof panelPresets)[number]) => typedNumber(draft.values.panelWidthM ?? '') === p.panelWidthM && typedNumber(draft.values.heightM ?? '') === p.heightM;
  return (
    <fieldset class="fence-panels">
      <legend>Panels</legend>
      <p class="help">Start from the panels: a common size or your own, and how many. The run’s length and the feet follow (a foot at every joint and one at each end).</p>
      <div class="seg wrap" role="group" aria-label="Common panel sizes">
        {panelPresets.map((p) => (
          <button type="button" class={isOn(p) ? 'on' : ''} aria-pressed={isOn(p)} data-preset={p.id} onClick={() => props.setValues({ panelWidthM: String(p.panelWidthM), heightM: String(p.heightM) })}>
            {p.name}: {p.panelWidthM} m wide × {p.heightM} m high
          </button>
        ))}
      </div>
      <p class="help">{panelPresetsSource} A size fills the panel width and the banner height (a banner over the whole panel); change either to match yours.</p>
      <div class="grid2">
        {props.fieldInput(byPath('panelWidthM'))}
        {props.fieldInput(byPath('panels'))}
      </div>
      <p class="fence-run" data-testid="fence-run" aria-live="polite">
        {run
          ? `The run: ${run.panels} ${run.panels === 1 ? 'panel' : 'panels'} × ${round2(run.panelWidthM)} m = ${round2(run.runLengthM)} m long, on ${run.feet} ${run.feet === 1 ? 'foot' : 'feet'}${(draft.values.feet ?? '').trim() !== '' ? ' (as given)' : ' (one at every joint and one at each end)'}.`
          : 'Give the panel width and the number of panels: the run’s length and the feet follow.'}
      </p>
    </fieldset>
  );
}

const round2 = (v: number): string => String(Math.round(v * 100) / 100);

function Results(props: {
  answer: AssessAnswer | null;
  waiting: boolean;
  pending: boolean;
  unit: Parameters<typeof speed>[1];
  frontAzimuthDeg: number | null;
  kind: StructureKind;
  tab: CalcTab;
  setTab: (tab: CalcTab) => void;
  sideView: preact.ComponentChildren;
  planView: preact.ComponentChildren;
  /** The check gust field, at the head of the numbers. */
  checkField: preact.ComponentChildren;
}) {
  const { answer, unit, frontAzimuthDeg, kind, tab } = props;
  if (!answer) {
    // What it waits for is named just above (Attention); nothing is shown as a limit.
    return props.waiting ? null : <p class="unknown-box">Calculating…</p>;
  }
  const u = answer.utilization;
  const util = (v: number | null, unbounded: boolean) => (unbounded ? 'unbounded (resistance gone)' : percent(v));
  const rb = answer.requiredBallast;
  const where = (x: number, y: number) => (answer.expanded.baseWidthM === undefined ? `x = ${x.toFixed(2)} m` : `x = ${x.toFixed(2)} m, y = ${y.toFixed(2)} m`);
  const tabButton = (which: CalcTab, words: string) => (
    <button type="button" role="tab" id={`calc-tab-${which}`} aria-selected={tab === which} aria-controls={`calc-pane-${which}`} class={tab === which ? 'on' : ''} onClick={() => props.setTab(which)}>
      {words}
    </button>
  );
  return (
    <div class={`results${props.pending ? ' stale' : ''}`} aria-live="polite">
      <Warnings warnings={answer.warnings} kind={kind} />
      <div class="limit-box">
        <span class="fig-label">Limit gust{props.pending ? ' (updating…)' : ''}</span>
        <span class="limit-value" data-testid="limit-gust">
          {answer.limitGustMps === null ? 'no limit found' : speed(answer.limitGustMps, unit)}
        </span>
        <span class="governs-text" data-testid="governing-text">
          {answer.limitGovernedBy === 'rated' ? (
            <>
              The rated gust governs. Calculated {speed(answer.calculatedLimitGustMps, unit)}, where <strong>{formWords(answer.governingText, kind)}</strong>.
            </>
          ) : (
            <>
              Governs: <strong>{formWords(answer.governingText, kind)}</strong>
            </>
          )}
        </span>
        <span class="fig-note" data-testid="calc-density">
          At the design air density, {quantity(answer.airDensityKgM3, 'kg/m³', 3)}: the density the levels are checked at when you save. The live board uses the density on the day.
        </span>
      </div>
      {answer.configurations && answer.configurations.length > 1 ? (
        <table class="kv cfg-table" data-testid="calc-configurations">
          <caption>Limit gust in each configuration (same check gust and air)</caption>
          <tbody>
            {answer.configurations.map((c, i) => (
              <tr key={c.name}>
                <th scope="row">
                  {c.name}
                  {i === 0 ? <span class="muted small"> (as registered)</span> : null}
                </th>
                <td>
                  <strong class="nowrap">{c.limitGustMps === null ? 'no limit found' : speed(c.limitGustMps, unit)}</strong>
                  {c.levels && c.levels.length > 0 ? (
                    <span class="muted small">
                      {' '}
                      · levels {c.levels.map((l) => (l.triggerGustMps === null ? '—' : speed(l.triggerGustMps, unit))).join(' / ')}
                    </span>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      {/* On a desktop the panel shows one of these at a time, the side view first; on a phone all, one after the other. */}
      <div class="calc-tabs seg" role="tablist" aria-label="Calculated: the drawings or the numbers">
        {tabButton('side', 'Side view')}
        {tabButton('plan', 'Plan')}
        {tabButton('numbers', 'Numbers')}
      </div>
      <div class={`figures${tab === 'numbers' ? ' pane-off' : ''}`}>
        <p class="help">Forces drawn at the check gust of {speed(answer.gustMps, unit)} (its field heads the numbers).</p>
        <div class={`calc-pane${tab === 'side' ? '' : ' pane-off'}`} id="calc-pane-side" role="tabpanel" aria-labelledby="calc-tab-side" data-testid="calc-pane-side">
          {props.sideView}
        </div>
        <div class={`calc-pane${tab === 'plan' ? '' : ' pane-off'}`} id="calc-pane-plan" role="tabpanel" aria-labelledby="calc-tab-plan" data-testid="calc-pane-plan">
          {props.planView}
        </div>
      </div>
      <div class={`calc-pane${tab === 'numbers' ? '' : ' pane-off'}`} id="calc-pane-numbers" role="tabpanel" aria-labelledby="calc-tab-numbers" data-testid="calc-pane-numbers">
        {props.checkField}
      <ElementsList answer={answer} unit={unit} frontAzimuthDeg={frontAzimuthDeg} kind={kind} />
      <DirectionsTable answer={answer} unit={unit} frontAzimuthDeg={frontAzimuthDeg} kind={kind} />
      <table class="kv">
        <caption>Governing case at the check gust of {speed(answer.gustMps, unit)}</caption>
        <tbody>
          <tr>
            <th scope="row">Dynamic pressure q</th>
            <td>{quantity(answer.qPa, 'Pa', 0)}</td>
          </tr>
          <tr>
            <th scope="row">Horizontal force</th>
            <td>{kiloNewtons(answer.horizontalForceN)}</td>
          </tr>
          <tr>
            <th scope="row">Uplift</th>
            <td>{kiloNewtons(answer.upliftN)}</td>
          </tr>
          <tr>
            <th scope="row">Overturning moment</th>
            <td>{kiloNewtonMetres(answer.overturningMomentNm)}</td>
          </tr>
          <tr>
            <th scope="row">Restoring moment</th>
            <td>{kiloNewtonMetres(answer.restoringMomentNm)}</td>
          </tr>
          <tr>
            <th scope="row">Utilization: overturning</th>
            <td>{util(u.overturning, answer.unbounded.overturning)}</td>
          </tr>
          <tr>
            <th scope="row">Utilization: sliding</th>
            <td>{util(u.sliding, answer.unbounded.sliding)}</td>
          </tr>
          <tr>
            <th scope="row">Utilization: uplift</th>
            <td>{util(u.uplift, answer.unbounded.uplift)}</td>
          </tr>
          <tr class="strong-row">
            <th scope="row">Governing</th>
            <td>
              {answer.governing}: {util(u.governing, answer.unbounded.governing)}
            </td>
          </tr>
          <tr>
            <th scope="row">Of capacity (with the rating)</th>
            <td>{answer.effectiveUtilization === null ? 'unbounded' : percent(answer.effectiveUtilization)}</td>
          </tr>
          <tr>
            <th scope="row">Total mass</th>
            <td>{quantity(answer.expanded.totalMassKg, 'kg', 0)}</td>
          </tr>
          <tr>
            <th scope="row">Gust taken at</th>
            <td>{quantity(answer.expanded.referenceHeightM, 'm', 2)}</td>
          </tr>
        </tbody>
      </table>
      {rb ? (
        <p class={!rb.possible ? 'error-box' : rb.massKg > 0 ? 'note-box' : 'ok-box'} data-testid="required-ballast">
          {!rb.possible
            ? `No extra mass at ${where(rb.xM, rb.yM)} can hold it at ${speed(rb.designGustMps, unit)}: ${formWords(rb.reason, kind)}`
            : rb.massKg > 0
              ? `Extra ballast for a design gust of ${speed(rb.designGustMps, unit)}: ${quantity(Math.ceil(rb.massKg), 'kg', 0)} at ${where(rb.xM, rb.yM)} (middle of the base).`
              : `No extra ballast needed for a design gust of ${speed(rb.designGustMps, unit)}.`}
        </p>
      ) : null}
      <Caution />
      {answer.levels ? (
        <table class="kv">
          <caption>Levels for this structure</caption>
          <tbody>
            {answer.levels.map((l) => (
              <tr>
                <th scope="row">
                  {l.level} · {l.label}
                </th>
                <td>{l.triggerGustMps === null ? 'no gust reaches it' : speed(l.triggerGustMps, unit)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      <details>
        <summary>Sources of the coefficients and assumptions</summary>
        <ul class="sources">
          {answer.sources.map((s) => (
            <li>
              <strong>{formWords(s.item, kind)}</strong> = {s.value}: {formWords(s.source, kind)}
            </li>
          ))}
          {answer.notes.map((n) => (
            <li>{formWords(n, kind)}</li>
          ))}
        </ul>
      </details>
      </div>
    </div>
  );
}

/** Ids of the uplift's controls (issueFields names them too). */
const upliftIds: Readonly<Record<(typeof upliftColumns)[number]['key'], string>> = { planAreaM2: 'sf-up-area', liftCoefficient: 'sf-up-c', xM: 'sf-up-x', yM: 'sf-up-y' };

function CustomRows(props: { draft: Draft; update: (p: Partial<Draft>) => void; errorFor: (path: string) => string | undefined; touch: (path: string) => void }) {
  const { draft, update, errorFor, touch } = props;
  return (
    <>
      <fieldset class="rows-editor">
        <legend>Wind-loaded faces</legend>
        <p class="help">Each face: F = c_f · q · A at its centroid height. {faceColumns.map((c) => `${c.label}${c.unit ? ` (${c.unit})` : ''}: ${c.help}`).join(' ')}</p>
        {errorFor('faces') ? <p class="field-error">{errorFor('faces')}</p> : null}
        {draft.faces.map((f, i) => (
          <div class="row-grid faces" key={i}>
            {faceColumns.map((c) => {
              const path = `faces.${i}.${c.key}`;
              const err = errorFor(path);
              return (
                <div class={`field${err ? ' has-error' : ''}`}>
                  <label for={`face-${i}-${c.key}`}>
                    {c.label}
                    {c.unit ? ` (${c.unit})` : ''}
                  </label>
                  <input
                    id={`face-${i}-${c.key}`}
                    inputMode={c.key === 'label' ? 'text' : 'decimal'}
                    placeholder={c.placeholder}
                    value={f[c.key] ?? ''}
                    onInput={(e) => {
                      touch(path);
                      update({ faces: draft.faces.map((x, j) => (j === i ? { ...x, [c.key]: e.currentTarget.value } : x)) });
                    }}
                  />
                  {err ? <p class="field-error">{err}</p> : null}
                </div>
              );
            })}
            <button type="button" class="row-remove" aria-label={`Remove face ${i + 1}`} disabled={draft.faces.length <= 1} onClick={() => update({ faces: draft.faces.filter((_, j) => j !== i) })}>
              Remove
            </button>
          </div>
        ))}
        <button type="button" onClick={() => update({ faces: [...draft.faces, emptyFaceRow()] })}>
          Add a face
        </button>
      </fieldset>
      <fieldset class="rows-editor">
        <legend>Resisting masses</legend>
        <p class="help">{massColumns.map((c) => `${c.label}${c.unit ? ` (${c.unit})` : ''}: ${c.help}`).join(' ')}</p>
        {errorFor('masses') ? <p class="field-error">{errorFor('masses')}</p> : null}
        {draft.masses.map((m, i) => (
          <div class="row-grid masses" key={i}>
            {massColumns.map((c) => {
              const path = `masses.${i}.${c.key}`;
              const err = errorFor(path);
              return (
                <div class={`field${err ? ' has-error' : ''}`}>
                  <label for={`mass-${i}-${c.key}`}>
                    {c.label}
                    {c.unit ? ` (${c.unit})` : ''}
                  </label>
                  <input
                    id={`mass-${i}-${c.key}`}
                    inputMode={c.key === 'label' ? 'text' : 'decimal'}
                    placeholder={c.placeholder}
                    value={m[c.key] ?? ''}
                    onInput={(e) => {
                      touch(path);
                      update({ masses: draft.masses.map((x, j) => (j === i ? { ...x, [c.key]: e.currentTarget.value } : x)) });
                    }}
                  />
                  {err ? <p class="field-error">{err}</p> : null}
                </div>
              );
            })}
            <button type="button" class="row-remove" aria-label={`Remove mass ${i + 1}`} disabled={draft.masses.length <= 1} onClick={() => update({ masses: draft.masses.filter((_, j) => j !== i) })}>
              Remove
            </button>
          </div>
        ))}
        <button type="button" onClick={() => update({ masses: [...draft.masses, emptyMassRow()] })}>
          Add a mass
        </button>
      </fieldset>
      <label class="check">
        <input type="checkbox" checked={draft.upliftOn} onChange={(e) => update({ upliftOn: e.currentTarget.checked })} />
        Roof or canopy uplift
      </label>
      {draft.upliftOn ? (
        <div class="grid2">
          {upliftColumns.map((c) => {
            const fid = upliftIds[c.key];
            const path = `uplift.${c.key}`;
            return (
              <Field id={fid} label={c.label} unit={c.unit || undefined} error={errorFor(path)} help={c.help}>
                <input
                  id={fid}
                  inputMode="decimal"
                  placeholder={c.placeholder}
                  value={draft.uplift[c.key] ?? ''}
                  onInput={(e) => {
                    touch(path);
                    update({ uplift: { ...draft.uplift, [c.key]: e.currentTarget.value } });
                  }}
                />
              </Field>
            );
          })}
        </div>
      ) : null}
    </>
  );
}
