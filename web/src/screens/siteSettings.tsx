/**
 * The site's settings (competent person): where it is, how air density is found, whether gusts
 * may be reduced with height and whether direction is used, the levels' dead band and hold time,
 * and the default levels every structure takes unless it has its own. Any other role reads them
 * as text: no inputs and no buttons, with who to ask for a change.
 */
import { useEffect, useRef, useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { Caution } from '../components/caution.tsx';
import { Field } from '../components/field.tsx';
import { ForecastFeedSettings } from './forecastFeedSettings.tsx';
import { LevelsEditor } from '../components/levelsEditor.tsx';
import { ReadOnlyNote } from '../components/readOnlyNote.tsx';
import { draftLevels, levelsToDraft, plainMessage, typedNumber, type LevelRowDraft } from '../register/structureDraft.ts';
import { prefs } from '../prefs.ts';
import { href, useRoute } from '../router.ts';
import { may, session } from '../session.ts';
import { loadSite, site, siteDensity } from '../site.ts';
import { refreshSnapshot } from '../live.ts';
import { useStore } from '../store.ts';
import type { SiteView } from '../types.ts';
import { dateTime, quantity, type SpeedUnit } from '../units.ts';
import { fixedAirDensityRangeKgM3, maxSiteNameLength } from '../../../server/engine/limits.ts';

interface SiteDraft {
  name: string;
  altitudeM: string;
  terrainCategory: string;
  timeZone: string;
  airDensityMode: SiteView['airDensityMode'];
  fixedAirDensityKgM3: string;
  heightReductionEnabled: boolean;
  directionalEnabled: boolean;
  sectorDeg: string;
  deadBandPct: string;
  holdMin: string;
  /** Minutes a plan action that moves a structure may wait before it is signalled as overdue (issue 14); empty: not sent. */
  actionDueMin: string;
  levels: LevelRowDraft[];
}

const terrainHelp: Record<string, string> = {
  '0': '0 — sea or coastal area exposed to the open sea',
  I: 'I — lakes or flat land with no obstacles',
  II: 'II — low vegetation such as grass, isolated obstacles (the usual open field)',
  III: 'III — regular cover of vegetation or buildings, isolated obstacles (villages, suburbs, forest)',
  IV: 'IV — at least 15 % of the area covered with buildings over 15 m (town centres)',
};

function toDraft(s: SiteView, unit: Parameters<typeof levelsToDraft>[1]): SiteDraft {
  return {
    name: s.name,
    altitudeM: String(s.altitudeM),
    terrainCategory: s.terrainCategory,
    timeZone: s.timeZone,
    airDensityMode: s.airDensityMode,
    fixedAirDensityKgM3: s.fixedAirDensityKgM3 === null ? '' : String(s.fixedAirDensityKgM3),
    heightReductionEnabled: s.heightReductionEnabled,
    directionalEnabled: s.directionalEnabled,
    sectorDeg: String(s.directionSectorHalfWidthDeg ?? 45),
    deadBandPct: String(Math.round(s.deadBandFraction * 1000) / 10),
    holdMin: String(Math.round((s.holdTimeMs / 60_000) * 10) / 10),
    actionDueMin: s.actionDueMs === undefined ? '' : String(Math.round((s.actionDueMs / 60_000) * 10) / 10),
    levels: levelsToDraft(s.defaultLevels, unit),
  };
}

const densityModeText: Record<SiteView['airDensityMode'], string> = {
  isa: 'ISA at the site’s altitude (ISO 2533)',
  measured: 'measured on site (a sensor’s temperature, pressure and humidity)',
  fixed: 'a fixed value',
};

/** The settings as text, for a role that cannot change them. */
function SiteSettingsReadOnly({ s, density, unit }: { s: SiteView; density: number | null; unit: SpeedUnit }) {
  const rows: Array<[string, string, string?]> = [
    ['Site name', s.name],
    ['Time zone', s.timeZone, 'Days in the log and times on every screen are in this zone.'],
    ['Altitude', quantity(s.altitudeM, 'm', 0), 'Above sea level.'],
    ['Terrain category (EN 1991-1-4 Table 4.1)', terrainHelp[s.terrainCategory] ?? s.terrainCategory],
    ['Air density', `${densityModeText[s.airDensityMode]}${s.airDensityMode === 'fixed' && s.fixedAirDensityKgM3 !== null ? `: ${quantity(s.fixedAirDensityKgM3, 'kg/m³', 3)}` : ''}`, `Now ${density === null ? 'unknown' : quantity(density, 'kg/m³', 3)}.`],
    [
      'Gusts reduced for structures below the sensor',
      s.heightReductionEnabled ? 'yes' : 'no (the safe default)',
      s.heightReductionEnabled ? 'A structure lower than the sensor takes a lower gust from the EN 1991-1-4 profile.' : 'A structure below the sensor takes the sensor’s gust; one above it a higher gust.',
    ],
    [
      'Wind direction',
      s.directionalEnabled ? `used: directions within ±${s.directionSectorHalfWidthDeg}° of the governing sensor’s 10-minute mean direction` : 'not used (the safe default): every direction is assessed',
      'The wind speed is never reduced for the angle.',
    ],
    ['Dead band', `${Math.round(s.deadBandFraction * 1000) / 10} %`, 'A level is lowered only once the gust is this far below its trigger…'],
    ['Hold time', `${Math.round((s.holdTimeMs / 60_000) * 10) / 10} min`, '…and has stayed there this long. Raising is always at once.'],
    ...(s.actionDueMs === undefined
      ? []
      : [['Time to mark an action done', `${Math.round((s.actionDueMs / 60_000) * 10) / 10} min`, 'A level’s action that moves a structure (“lower the screen”) not marked done this long after its alert is signalled again as overdue.'] as [string, string, string]]),
  ];
  return (
    <>
      <ReadOnlyNote what="the site settings and default levels" ask="the site’s competent person" />
      <section aria-labelledby="ro-site-h">
        <h2 id="ro-site-h">The site, air and wind</h2>
        <dl class="readonly-list">
          {rows.map(([label, value, help]) => (
            <div key={label}>
              <dt>{label}</dt>
              <dd>
                {value}
                {help ? <span class="help">{help}</span> : null}
              </dd>
            </div>
          ))}
        </dl>
        <p class="muted small">Last changed {dateTime(s.updatedAtMs, s.timeZone)}.</p>
      </section>
      <section aria-labelledby="ro-levels-h">
        <h2 id="ro-levels-h">Default levels and actions</h2>
        <p class="help">Every structure without its own levels takes these. 60 % and 80 % of load capacity follow published event guidance; 100 % is the limit.</p>
        <LevelsEditor idPrefix="dl" readOnly levels={levelsToDraft(s.defaultLevels, unit)} unit={unit} errors={new Map()} onChange={() => undefined} />
      </section>
    </>
  );
}

export function SiteSettings() {
  const current = useStore(site);
  const density = useStore(siteDensity);
  const unit = useStore(prefs).unit;
  const who = useStore(session);
  const canEdit = may(who, 'competent-person');
  const { query } = useRoute();
  const levelsRef = useRef<HTMLElement>(null);
  const [d, setD] = useState<SiteDraft | null>(null);
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    if (current && !d) setD(toDraft(current, unit));
    if (!current) void loadSite();
  }, [current]);

  // "#/site?section=levels" (from the first-start checklist) opens at the default levels.
  const toLevels = query.get('section') === 'levels';
  useEffect(() => {
    if (toLevels && d) levelsRef.current?.scrollIntoView({ block: 'start' });
  }, [toLevels, d !== null]);

  if (!d || !current) return <main id="main">Loading…</main>;
  if (!canEdit) {
    return (
      <main id="main" class="form-page">
        <p class="crumbs">
          <a href={href('/register')}>← Structures</a>
        </p>
        <h1>Site settings</h1>
        <Caution />
        <SiteSettingsReadOnly s={current} density={density} unit={unit} />
        <ForecastFeedSettings s={current} canEdit={false} />
      </main>
    );
  }
  const set = (patch: Partial<SiteDraft>) => setD({ ...d, ...patch });
  const e = (k: string) => (issues.get(k) ? plainMessage(issues.get(k)!) : undefined);

  const save = async () => {
    setBusy(true);
    setMessage(null);
    setIssues(new Map());
    const local = new Map<string, string>();
    const n = (text: string, key: string): number | string => {
      const v = typedNumber(text);
      if (v === undefined || Number.isNaN(v)) {
        local.set(key, v === undefined ? 'is required' : 'must be a number');
        return text;
      }
      return v;
    };
    const dead = n(d.deadBandPct, 'deadBandFraction');
    const hold = n(d.holdMin, 'holdTimeMs');
    const due = d.actionDueMin.trim() === '' ? undefined : n(d.actionDueMin, 'actionDueMs');
    const body = {
      name: d.name.trim(),
      altitudeM: n(d.altitudeM, 'altitudeM'),
      terrainCategory: d.terrainCategory,
      timeZone: d.timeZone.trim(),
      airDensityMode: d.airDensityMode,
      fixedAirDensityKgM3: d.fixedAirDensityKgM3.trim() === '' ? null : n(d.fixedAirDensityKgM3, 'fixedAirDensityKgM3'),
      heightReductionEnabled: d.heightReductionEnabled,
      directionalEnabled: d.directionalEnabled,
      directionSectorHalfWidthDeg: n(d.sectorDeg, 'directionSectorHalfWidthDeg'),
      deadBandFraction: typeof dead === 'number' ? dead / 100 : dead,
      holdTimeMs: typeof hold === 'number' ? Math.round(hold * 60_000) : hold,
      ...(due === undefined ? {} : { actionDueMs: typeof due === 'number' ? Math.round(due * 60_000) : due }),
      defaultLevels: draftLevels(d.levels, unit, local),
    };
    if (local.size > 0) {
      setIssues(local);
      setMessage({ ok: false, text: 'Not saved: some fields need attention.' });
      setBusy(false);
      return;
    }
    try {
      await api('/api/site', { method: 'PATCH', body });
      await loadSite();
      void refreshSnapshot();
      setMessage({ ok: true, text: 'Site settings saved. Every structure has been re-assessed with them.' });
    } catch (err) {
      if (err instanceof ApiError && err.issues.length > 0) {
        const m = new Map<string, string>();
        for (const i of err.issues) m.set(i.path.replace(/^defaultLevels/, 'levels'), i.message);
        setIssues(m);
      }
      setMessage({ ok: false, text: `Not saved: ${errorText(err)}` });
    } finally {
      setBusy(false);
    }
  };

  return (
    <main id="main" class="form-page">
      <p class="crumbs">
        <a href={href('/register')}>← Structures</a>
      </p>
      <h1>Site settings</h1>
      <Caution />
      <fieldset class="bare">
        <section>
          <h2>The site</h2>
          <div class="grid2">
            <Field id="st-name" label="Site name" error={e('name')}>
              <input id="st-name" value={d.name} maxLength={maxSiteNameLength} onInput={(ev) => set({ name: ev.currentTarget.value })} />
            </Field>
            <Field id="st-tz" label="Time zone" error={e('timeZone')} help="IANA name, e.g. Europe/London. Days in the log and times on every screen are in this zone.">
              <input id="st-tz" value={d.timeZone} onInput={(ev) => set({ timeZone: ev.currentTarget.value })} />
            </Field>
            <Field id="st-alt" label="Altitude" unit="m" error={e('altitudeM')} help="Above sea level; sets the ISA air density (ISO 2533).">
              <input id="st-alt" inputMode="decimal" value={d.altitudeM} onInput={(ev) => set({ altitudeM: ev.currentTarget.value })} />
            </Field>
            <Field id="st-terrain" label="Terrain category (EN 1991-1-4 Table 4.1)" error={e('terrainCategory')} help="The ground roughness upwind: it shapes how the gust changes with height between a sensor and a structure.">
              <select id="st-terrain" value={d.terrainCategory} onChange={(ev) => set({ terrainCategory: ev.currentTarget.value })}>
                {Object.entries(terrainHelp).map(([k, v]) => (
                  <option value={k}>{v}</option>
                ))}
              </select>
            </Field>
          </div>
        </section>
        <section>
          <h2>Air and wind</h2>
          <div class="grid2">
            <Field
              id="st-density"
              label="Air density"
              error={e('airDensityMode')}
              help={`ISA at the site’s altitude (ISO 2533); measured from a sensor’s temperature, pressure and humidity (WMO CIMO method); or a fixed value (EN 1991-1-4 recommends 1.25 kg/m³). Now: ${density === null ? 'unknown' : quantity(density, 'kg/m³', 3)}.`}
            >
              <select id="st-density" value={d.airDensityMode} onChange={(ev) => set({ airDensityMode: ev.currentTarget.value as SiteDraft['airDensityMode'] })}>
                <option value="isa">ISA at the site’s altitude</option>
                <option value="measured">measured on site</option>
                <option value="fixed">fixed value</option>
              </select>
            </Field>
            <Field id="st-fixed" label="Fixed air density" unit="kg/m³" error={e('fixedAirDensityKgM3')} help={`Used only with “fixed value”; ${fixedAirDensityRangeKgM3.min}–${fixedAirDensityRangeKgM3.max}.`}>
              <input id="st-fixed" inputMode="decimal" value={d.fixedAirDensityKgM3} onInput={(ev) => set({ fixedAirDensityKgM3: ev.currentTarget.value })} />
            </Field>
          </div>
          <label class="check">
            <input type="checkbox" checked={d.heightReductionEnabled} onChange={(ev) => set({ heightReductionEnabled: ev.currentTarget.checked })} />
            Allow gusts to be reduced for structures lower than the sensor
          </label>
          <p class="help">Off (the safe default): a structure below the sensor takes the sensor’s gust; one above it takes a higher gust from the EN 1991-1-4 profile.</p>
          <label class="check">
            <input type="checkbox" checked={d.directionalEnabled} onChange={(ev) => set({ directionalEnabled: ev.currentTarget.checked })} />
            Use wind direction
          </label>
          <p class="help">Off (the safe default): every structure is assessed for wind from every direction around it, and the worst direction governs. On: only the directions within the sector below of the governing sensor’s 10-minute mean direction count, the worst of them governing (needs each structure’s orientation). The wind speed is never reduced for the angle: a gust turns faster than a crew can react.</p>
          <Field id="st-sector" label="Direction sector, ±" unit="°" error={e('directionSectorHalfWidthDeg')} help="Used only with “Use wind direction”: directions within this many degrees either side of the mean direction are assessed (15–180°; default 45°; 180 = every direction).">
            <input id="st-sector" inputMode="decimal" value={d.sectorDeg} disabled={!d.directionalEnabled} onInput={(ev) => set({ sectorDeg: ev.currentTarget.value })} />
          </Field>
        </section>
        <section>
          <h2>Lowering levels</h2>
          <div class="grid2">
            <Field id="st-dead" label="Dead band" unit="%" error={e('deadBandFraction')} help="A level is lowered only once the gust is this far below its trigger (0–50 %; default 10 %): no flapping between levels.">
              <input id="st-dead" inputMode="decimal" value={d.deadBandPct} onInput={(ev) => set({ deadBandPct: ev.currentTarget.value })} />
            </Field>
            <Field id="st-hold" label="Hold time" unit="min" error={e('holdTimeMs')} help="…and only after it has stayed there this long (0–360 min; default 15 min). Raising is always at once.">
              <input id="st-hold" inputMode="decimal" value={d.holdMin} onInput={(ev) => set({ holdMin: ev.currentTarget.value })} />
            </Field>
            <Field
              id="st-due"
              label="Time to mark an action done"
              unit="min"
              error={e('actionDueMs')}
              help="A level’s action that moves a structure to another configuration (“lower the screen”) not marked done this long after its alert is signalled again as overdue, to everyone who can act (1–60 min; default 5 min)."
            >
              <input id="st-due" inputMode="decimal" value={d.actionDueMin} onInput={(ev) => set({ actionDueMin: ev.currentTarget.value })} />
            </Field>
          </div>
        </section>
        <section ref={levelsRef}>
          <h2>Default levels and actions</h2>
          <p class="help">Every structure without its own levels takes these. 60 % and 80 % of load capacity follow published event guidance; 100 % is the limit.</p>
          <LevelsEditor idPrefix="dl" levels={d.levels} unit={unit} errors={issues} onChange={(levels) => set({ levels })} />
        </section>
      </fieldset>
      {message ? (
        <p class={message.ok ? 'ok-box' : 'error-box'} role={message.ok ? 'status' : 'alert'}>
          {message.text}
        </p>
      ) : null}
      <div class="row save-row">
        <button type="button" class="primary" disabled={busy} onClick={() => void save()}>
          {busy ? 'Saving…' : 'Save site settings'}
        </button>
      </div>
      <ForecastFeedSettings s={current} canEdit />
    </main>
  );
}
