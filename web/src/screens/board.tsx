/**
 * The live board, phone first: open alerts with their actions on top, then the site's wind now,
 * then every structure worst first with its level, margin, limit gust and its own current gust.
 *
 * Alerts come grouped by structure (or sensor): the most urgent unacknowledged one in full with
 * its action, the others of the group in one line with one button to acknowledge them all, and
 * acknowledged ones still in force one line each (alertGroups.ts). On a phone only the first three
 * groups show before an expander, so the wind and the structures are never screens away.
 *
 * Staleness rules (missing data is unknown, never calm):
 * - a structure the server marks `noData` shows "No data — wind unknown" on grey hatching;
 * - a sensor that is silent or implausible says so in words, and its numbers are struck through;
 * - when the live connection is down, the whole board is marked stale with the age of its data,
 *   and every number keeps the age beside it.
 */
import { useEffect, useMemo, useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { groupAlerts, groupSize } from '../alertGroups.ts';
import { armSound, screenKeptOn, soundArmed } from '../alarm.ts';
import { Caution } from '../components/caution.tsx';
import { useNow } from '../components/clock.ts';
import { LevelBadge, LevelShape, levelTone } from '../components/levelBadge.tsx';
import { useMedia } from '../components/media.ts';
import { Sparkline } from '../components/sparkline.tsx';
import { StructureFigures } from '../components/structureFigures.tsx';
import { WindArrow } from '../components/windArrow.tsx';
import { live, refreshSnapshot, serverNow, trailMinutes, windTrail } from '../live.ts';
import { prefs, setPref } from '../prefs.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { OpenAlert, SensorState, StructureState } from '../types.ts';
import { beaufortText, clockTime, compassPoint, duration, hourMinute, speed, speedNumber, speedUnitLabels } from '../units.ts';

/**
 * A reading older than its sensor's own silence timeout is flagged on the board by the phone
 * itself, so a board whose stream has dropped still turns stale on time.
 */
const staleAfterMs = (s: SensorState | undefined): number => s?.silenceTimeoutMs ?? 30_000;

export function Board() {
  const state = useStore(live);
  const snap = state.snapshot;
  const connected = state.connection === 'open';
  useNow();
  useEffect(() => {
    if (state.snapshot) void refreshSnapshot();
    // On opening the board only: the stream keeps it current from there.
  }, []);
  const dataAgeMs = state.lastDataAtMs === null ? null : Date.now() - state.lastDataAtMs;

  return (
    <main id="main" class={`board${connected ? '' : ' is-stale'}`}>
      <h1 class="visually-hidden">Live board</h1>
      {!connected ? (
        <div class="stale-banner" role="alert">
          <strong>{state.connection === 'offline' ? 'No network.' : state.snapshot ? 'Connection lost — reconnecting…' : 'Connecting to the site…'}</strong>{' '}
          {dataAgeMs !== null ? `What you see is ${duration(dataAgeMs)} old and may not be true now. ` : 'No live data yet. '}
          Treat the wind as unknown until this goes away.
        </div>
      ) : null}
      <AlarmControls />
      {snap ? (
        <>
          <Alerts alerts={snap.alerts} />
          <SiteWind sensors={snap.sensors} />
          <section aria-labelledby="structures-h">
            <h2 id="structures-h" class="section-h">
              Structures <span class="muted small">worst first</span>
            </h2>
            {snap.structures.length === 0 ? <p class="empty">No structures registered yet.</p> : null}
            <ul class="cards">
              {snap.structures.map((s) => (
                <li key={s.id}>
                  <StructureCard s={s} sensors={snap.sensors} />
                </li>
              ))}
            </ul>
          </section>
        </>
      ) : (
        <p class="unknown-box">Waiting for the first live data. Until it arrives the wind on site is unknown.</p>
      )}
      <Caution />
    </main>
  );
}

function AlarmControls() {
  const p = useStore(prefs);
  const armed = useStore(soundArmed);
  const awake = useStore(screenKeptOn);
  const toggle = async () => {
    if (p.alarmSound) setPref('alarmSound', false);
    else {
      setPref('alarmSound', true);
      await armSound();
    }
  };
  return (
    <div class="alarm-row">
      <button type="button" class={`toggle${p.alarmSound ? ' on' : ''}`} aria-pressed={p.alarmSound} onClick={toggle}>
        {p.alarmSound ? 'Alarm sound on' : 'Alarm sound off'}
      </button>
      {p.alarmSound && !armed ? (
        <button type="button" class="warn-btn" onClick={() => void armSound()}>
          Tap to allow sound
        </button>
      ) : null}
      <span class="muted small">{awake === true ? 'Screen kept on' : awake === false ? 'Screen may sleep' : ''}</span>
    </div>
  );
}

/**
 * Groups shown before the "Show N more alerts" expander. On a phone three, so that the wind and
 * the structures stay within about two screens of the top after a windy spell; on a wide screen
 * (two columns of cards) four.
 */
const phoneWidth = '(max-width: 699px)';
const groupsShown = (narrow: boolean): number => (narrow ? 3 : 4);

function Alerts({ alerts }: { alerts: OpenAlert[] }) {
  const groups = useMemo(() => groupAlerts(alerts), [alerts]);
  const narrow = useMedia(phoneWidth);
  const [showAll, setShowAll] = useState(false);
  if (groups.length === 0) return null;
  const toAcknowledge = alerts.filter((a) => a.acknowledgedAtMs === null).length;
  const limit = groupsShown(narrow);
  const hidden = groups.slice(limit);
  const shown = showAll ? groups : groups.slice(0, limit);
  const hiddenAlerts = hidden.reduce((n, g) => n + groupSize(g), 0);
  const hiddenOpen = hidden.reduce((n, g) => n + (g.head ? 1 + g.rest.length : 0), 0);
  return (
    <section aria-labelledby="alerts-h" class="alerts">
      <h2 id="alerts-h" class="section-h">
        Alerts <span class="count">{toAcknowledge > 0 ? `${toAcknowledge} to acknowledge` : 'all acknowledged'}</span>
      </h2>
      <ul class="cards alert-groups">
        {shown.map((g) => (
          <li key={g.key} class="alert-group">
            {g.head ? <AlertCard key={g.head.id} a={g.head} rest={g.rest} /> : null}
            {g.acked.length > 0 ? (
              <div class={`acked${g.head ? '' : ' acked-only'}`}>
                <p class="acked-h" id={`acked-${g.key}`}>
                  {g.head ? 'Acknowledged, still in force:' : <><strong>{g.subject}</strong> — acknowledged, still in force:</>}
                </p>
                <ul class="ack-lines" aria-labelledby={`acked-${g.key}`}>
                  {g.acked.map((a) => (
                    <AckLine key={a.id} a={a} />
                  ))}
                </ul>
              </div>
            ) : null}
          </li>
        ))}
      </ul>
      {hidden.length > 0 ? (
        <button type="button" class="more-alerts" aria-expanded={showAll} onClick={() => setShowAll(!showAll)}>
          {showAll
            ? 'Show fewer alerts'
            : `Show ${hiddenAlerts} more ${hiddenAlerts === 1 ? 'alert' : 'alerts'}${hiddenOpen > 0 ? ` (${hiddenOpen} to acknowledge)` : ''}`}
        </button>
      ) : null}
    </section>
  );
}

function alertTone(a: OpenAlert): string {
  if (a.kind === 'level') return `tone-${levelTone(a.level, Math.max(a.level ?? 0, 3))}`;
  return 'tone-nodata';
}

interface AckAnswer {
  alert: { acknowledgedAtMs: number; acknowledgedBy: string; acknowledgeNote: string | null };
}

/** Acknowledges one alert on the server and shows the answer at once (the stream follows). */
async function acknowledgeOne(id: number, note: string): Promise<void> {
  const answer = await api<AckAnswer>(`/api/alerts/${id}/acknowledge`, { body: note ? { note } : {} });
  live.update((st) =>
    st.snapshot
      ? {
          ...st,
          snapshot: {
            ...st.snapshot,
            alerts: st.snapshot.alerts
              .map((x) => (x.id === id ? { ...x, acknowledgedAtMs: answer.alert.acknowledgedAtMs, acknowledgedBy: answer.alert.acknowledgedBy, acknowledgeNote: answer.alert.acknowledgeNote } : x))
              .filter((x) => x.acknowledgedAtMs === null || x.clearedAtMs === null),
          },
        }
      : st,
  );
}

/**
 * Acknowledges each alert in turn with the same note. One already acknowledged by someone else
 * (409) counts as done; any other failure stops there and says how far it got.
 */
async function acknowledgeEach(ids: number[], note: string): Promise<string | null> {
  let done = 0;
  let takenElsewhere = false;
  for (const id of ids) {
    try {
      await acknowledgeOne(id, note);
      done += 1;
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) {
        takenElsewhere = true;
        done += 1;
        continue;
      }
      if (done > 0 || takenElsewhere) void refreshSnapshot();
      return `${done} of ${ids.length} acknowledged; the rest were not: ${errorText(err)}`;
    }
  }
  if (takenElsewhere) void refreshSnapshot();
  return null;
}

/** The earlier alerts of a group in one line: "Watch 22:53, Prepare 22:55 — condition ended". */
function restLine(head: OpenAlert, rest: OpenAlert[], tz: string): string {
  const ended = rest.filter((a) => a.clearedAtMs !== null).length;
  const mixed = ended > 0 && ended < rest.length;
  const items = rest.map((a) => `${a.label} ${hourMinute(a.raisedAtMs, tz)}${mixed ? (a.clearedAtMs !== null ? ' (ended)' : ' (in force)') : ''}`);
  const when = rest.every((a) => a.raisedAtMs <= head.raisedAtMs) ? 'earlier' : 'more';
  const state = mixed ? '' : ended > 0 ? ` — condition ${rest.length === 1 ? 'has' : 'have all'} ended` : ' — still in force';
  return `also ${rest.length} ${when}: ${items.join(', ')}${state}`;
}

/**
 * One alert in full (the most urgent of its group): what it is, whether its condition still
 * holds, the action, and for crew and above the Acknowledge button — plus, when the group has
 * more unacknowledged alerts, a line naming them and a button to acknowledge them all.
 */
export function AlertCard({ a, rest = [] }: { a: OpenAlert; rest?: OpenAlert[] }) {
  const s = useStore(session);
  const unit = useStore(prefs).unit;
  const tz = useTimeZone();
  const [mode, setMode] = useState<'one' | 'all' | null>(null);
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const acked = a.acknowledgedAtMs !== null;
  const ended = a.clearedAtMs !== null;
  const canAck = may(s, 'crew') && !acked;
  const all = rest.length + 1;

  const confirm = async () => {
    setBusy(true);
    setError(null);
    try {
      if (mode === 'all') {
        const problem = await acknowledgeEach([a.id, ...rest.map((x) => x.id)], note.trim());
        if (problem) setError(problem);
        else setMode(null);
      } else {
        await acknowledgeOne(a.id, note.trim());
        setMode(null);
      }
    } catch (err) {
      setError(errorText(err));
      if (err instanceof ApiError && err.status === 409) void refreshSnapshot();
    } finally {
      setBusy(false);
    }
  };

  return (
    <article class={`alert-card ${alertTone(a)}${acked ? ' acked' : ''}${ended ? ' ended' : ''}`} aria-label={`${a.label}: ${a.subject}`}>
      <header>
        <span class="alert-label">{a.kind === 'level' ? `Level ${a.level} · ${a.label}` : a.label}</span>
        <span class="alert-subject">{a.subject}</span>
      </header>
      {ended ? <p class="alert-state is-ended">Condition ended at {hourMinute(a.clearedAtMs!, tz)}: not yet acknowledged</p> : null}
      <p class="alert-action">{a.actionText}</p>
      <p class="alert-meta">
        Raised {hourMinute(a.raisedAtMs, tz)}
        {a.gustMps !== null ? ` at ${speed(a.gustMps, unit)}` : ''}
        {ended ? '' : <strong class="alert-holds"> · still in force</strong>}
      </p>
      {rest.length > 0 ? <p class="alert-rest">{restLine(a, rest, tz)}</p> : null}
      {acked ? (
        <p class="ack-done">
          ✓ Acknowledged by {a.acknowledgedBy} at {clockTime(a.acknowledgedAtMs!, tz)}
          {a.acknowledgeNote ? `: “${a.acknowledgeNote}”` : ''}
        </p>
      ) : canAck ? (
        mode ? (
          <div class="ack-form">
            <label for={`note-${a.id}`}>Note (optional): what you did or saw</label>
            <textarea id={`note-${a.id}`} rows={2} maxLength={2000} value={note} onInput={(e) => setNote(e.currentTarget.value)} />
            <div class="row">
              <button type="button" class="primary" disabled={busy} onClick={() => void confirm()}>
                {busy ? 'Sending…' : mode === 'all' ? `Confirm all ${all}` : 'Confirm acknowledgement'}
              </button>
              <button type="button" disabled={busy} onClick={() => setMode(null)}>
                Cancel
              </button>
            </div>
          </div>
        ) : (
          <div class={`ack-buttons${rest.length > 0 ? ' two' : ''}`}>
            <button type="button" class="primary ack-btn" onClick={() => setMode('one')}>
              Acknowledge
            </button>
            {rest.length > 0 ? (
              <button type="button" class="ack-all-btn" onClick={() => setMode('all')}>
                Acknowledge all {all} for {a.subject}
              </button>
            ) : null}
          </div>
        )
      ) : (
        <p class="muted">Not yet acknowledged. Crew and above can acknowledge.</p>
      )}
      {error ? (
        <p class="error-box" role="alert">
          {error}
        </p>
      ) : null}
    </article>
  );
}

/**
 * An acknowledged alert whose condition still holds: one line (its level as shape and label, who
 * acknowledged and when); a tap opens the note and the action.
 */
function AckLine({ a }: { a: OpenAlert }) {
  const tz = useTimeZone();
  const tone = a.kind === 'level' ? levelTone(a.level, Math.max(a.level ?? 0, 3)) : 'nodata';
  return (
    <li class={`ack-line tone-${tone}`}>
      <details>
        <summary>
          <LevelShape tone={tone} size={20} />
          <span class="ack-line-text">
            <strong>{a.label}</strong> · ✓ {a.acknowledgedBy} {hourMinute(a.acknowledgedAtMs!, tz)}
          </span>
        </summary>
        <div class="ack-line-more">
          <p>
            {a.kind === 'level' ? `Level ${a.level} · ${a.label}` : a.label} for {a.subject}, raised {clockTime(a.raisedAtMs, tz)}, acknowledged by {a.acknowledgedBy} at{' '}
            {clockTime(a.acknowledgedAtMs!, tz)}
            {a.acknowledgeNote ? `: “${a.acknowledgeNote}”` : ' (no note)'}. Still in force.
          </p>
          <p class="alert-action">{a.actionText}</p>
        </div>
      </details>
    </li>
  );
}

function sensorTrouble(s: SensorState, nowMs: number): string | null {
  if (s.lastReceivedAtMs === null) return 'no reading yet';
  if (s.silent) return `silent for ${duration(nowMs - s.lastReceivedAtMs)}`;
  if (s.implausible.length > 0) return `implausible: ${s.implausible.join(', ')}`;
  if (nowMs - s.lastReceivedAtMs > staleAfterMs(s)) return `no reading for ${duration(nowMs - s.lastReceivedAtMs)}`;
  return null;
}

function SiteWind({ sensors }: { sensors: SensorState[] }) {
  const unit = useStore(prefs).unit;
  const trails = useStore(windTrail);
  const nowMs = serverNow();
  // The site's wind is the strongest sensor that is reporting well: the one the structures feel.
  const healthy = sensors.filter((s) => sensorTrouble(s, nowMs) === null && s.currentGustMps !== null);
  const lead = healthy.length > 0 ? healthy.reduce((a, b) => ((b.currentGustMps ?? 0) > (a.currentGustMps ?? 0) ? b : a)) : null;
  const points = useMemo(() => (lead ? (trails.get(lead.key) ?? []).map((p) => ({ tMs: p.tMs, value: p.gustMps })) : []), [lead?.key, trails]);
  const narrow = useMedia(phoneWidth);
  const troubles = sensors.map((s) => sensorTrouble(s, nowMs));
  const strip = (
    <ul class="sensor-strip">
      {sensors.map((s, i) => {
        const trouble = troubles[i];
        return (
          <li class={trouble ? 'sensor-bad' : ''} key={s.key}>
            <span class="s-name">{s.name}</span>
            <span class={`s-vals${trouble ? ' struck' : ''}`}>
              gust {speed(s.currentGustMps, unit)} · mean {speed(s.mean10minMps, unit)}
            </span>
            <span class="s-age">{trouble ? <strong class="bad-text">⚠ {trouble}</strong> : `last reading ${duration(nowMs - (s.lastReceivedAtMs ?? nowMs))} ago`}</span>
          </li>
        );
      })}
    </ul>
  );

  return (
    <section aria-labelledby="wind-h" class="wind-panel">
      <h2 id="wind-h" class="section-h">
        Wind now
      </h2>
      {lead ? (
        <div class="wind-now">
          <div class="wind-figures">
            <div class="big-figure">
              <span class="fig-label">Gust</span>
              <span class="fig-value">{speedNumber(lead.currentGustMps, unit)}</span>
              <span class="fig-unit">{speedUnitLabels[unit]}</span>
            </div>
            <div class="mid-figure">
              <span class="fig-label">Mean (10 min)</span>
              <span class="fig-value">{speedNumber(lead.mean10minMps, unit)}</span>
              <span class="fig-unit">{speedUnitLabels[unit]}</span>
            </div>
            <div class="dir-figure">
              <WindArrow fromDeg={lead.meanDirDeg} />
              <span>
                from <strong>{compassPoint(lead.meanDirDeg) ?? 'unknown'}</strong>
                {lead.meanDirDeg !== null ? ` ${Math.round(lead.meanDirDeg)}°` : ''}
              </span>
            </div>
          </div>
          <p class="wind-sub">
            <strong>{beaufortText(lead.mean10minMps) ?? 'Beaufort unknown'}</strong> · highest gust in 10 min {speed(lead.peakGust10minMps, unit)} · at {lead.name} ({lead.heightM}&nbsp;m) ·{' '}
            <span class="age">last reading {duration(nowMs - (lead.lastReceivedAtMs ?? nowMs))} ago</span>
          </p>
          <Sparkline points={points} fromMs={nowMs - trailMinutes * 60_000} toMs={nowMs} label={`gust at ${lead.name}, last ${trailMinutes} minutes`} />
          <p class="muted small spark-caption">Gust at {lead.name}, last {trailMinutes} min</p>
        </div>
      ) : (
        <p class="unknown-box">Wind unknown: no sensor is reporting good readings. Watch the wind by hand and follow the wind management plan.</p>
      )}
      {sensors.length === 0 ? (
        <p class="unknown-box">No sensors registered: the wind on site is unknown.</p>
      ) : narrow && sensors.length > 1 && troubles.every((t) => t === null) ? (
        // On a phone, sensors that all report well fold into one line; any trouble unfolds them.
        <details class="sensor-fold">
          <summary>All {sensors.length} sensors reporting well</summary>
          {strip}
        </details>
      ) : (
        strip
      )}
    </section>
  );
}

export function StructureCard({ s, sensors }: { s: StructureState; sensors: SensorState[] }) {
  const unit = useStore(prefs).unit;
  const nowMs = serverNow();
  const governing = s.governingSensorKey ? sensors.find((x) => x.key === s.governingSensorKey) : undefined;
  const lastAt = governing?.lastReceivedAtMs ?? s.evaluatedAtMs;
  const ageMs = lastAt === null ? null : nowMs - lastAt;
  const stale = !s.noData && ageMs !== null && ageMs > staleAfterMs(governing);
  // The sensors this structure listens to (all when it names none) that are not reporting well.
  const own = s.sensorKeys === null ? sensors : sensors.filter((x) => s.sensorKeys!.includes(x.key));
  const quiet = own.filter((x) => sensorTrouble(x, nowMs) !== null).map((x) => x.name);
  const tone = levelTone(s.level, s.levels.length, s.noData);
  return (
    <a class={`structure-card tone-${tone}${stale ? ' stale' : ''}`} href={href(`/structure/${s.id}`)}>
      <div class="sc-head">
        <span class="sc-name">{s.name}</span>
        <LevelBadge level={s.level} label={s.levelLabel} count={s.levels.length} noData={s.noData} />
      </div>
      {s.error ? <p class="bad-text">This structure's stored record cannot be assessed: {s.error}</p> : null}
      {s.mobile ? (
        <p class="mobile-line">
          Mobile: {s.highestTravelSpeedMps === null ? 'highest travel speed with the face raised unknown' : `travel at most ${speed(s.highestTravelSpeedMps, unit)} with the face raised (into the wind)`}
        </p>
      ) : null}
      <StructureFigures s={s} unit={unit} />
      {s.governingText && !s.error ? (
        <p class="sc-governs" data-testid="card-governs">
          {s.noData ? 'Governs (any wind): ' : 'Governs: '}
          {s.governingText}
        </p>
      ) : null}
      <p class="sc-foot">
        {s.noData ? (
          <strong class="bad-text">
            No live reading reaches it{quiet.length > 0 ? ` (${quiet.join(', ')}: no good reading)` : ''}: treat the wind as unknown.
          </strong>
        ) : ageMs === null ? (
          'no reading yet'
        ) : (
          <span class={stale ? 'bad-text' : ''}>
            last reading {duration(ageMs)} ago{governing ? ` · ${governing.name}` : ''}
          </span>
        )}
        {s.level > 0 ? ` · at level ${s.level} since ${duration(nowMs - s.levelSinceMs)}` : ''} · gust taken at {s.referenceHeightM.toFixed(1)}&nbsp;m
      </p>
    </a>
  );
}
