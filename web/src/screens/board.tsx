/**
 * The live board, phone first: the site in one line on top ("2 at Stop and clear · 1 at Prepare ·
 * 1 sensor silent"), then one alert card per structure (and per sensor in trouble), then the
 * site's wind now, then every structure worst first with its level, margin, limit gust and its
 * own current gust; under each structure's card its estimates (design §2.7) in one line tagged as
 * an estimate, the inputs on tap (components/foresightView.tsx).
 *
 * An alert card leads with the structure's current level and that level's action, acknowledged or
 * not; the structure's other alerts are folded into it (alertGroups.ts) and one tap on
 * "Acknowledge all" acknowledges every one of them (POST /api/alerts/acknowledge). No-data and
 * sensor alerts are never folded and never wait behind the "Show more" expander. Crew and above
 * are asked to act; a viewer (or a steward's site link) sees the same state, calmly, without
 * a call to act.
 *
 * Staleness rules (missing data is unknown, never calm):
 * - a structure the server marks `noData` shows "No data — wind unknown" on grey hatching;
 * - a sensor that is silent or implausible says so in words, and its numbers are struck through;
 * - when the live connection is down, the whole board is marked stale with the age of its data,
 *   and every number keeps the age beside it.
 */
import { useEffect, useMemo, useState } from 'preact/hooks';
import { api, errorText } from '../api.ts';
import { groupAlerts, mayFold, type AlertGroup, type SensorAlertGroup, type StructureAlertGroup } from '../alertGroups.ts';
import { armSound, screenKeptOn, soundArmed, tapped } from '../alarm.ts';
import { boardSummary, sensorTrouble as sensorTroubleKind, summaryText } from '../boardSummary.ts';
import { Caution } from '../components/caution.tsx';
import { NotifyHealthLine } from '../components/notifyHealth.tsx';
import { ConfigurationLineView } from '../components/configurationLine.tsx';
import { EstimateTag, ForesightStrip } from '../components/foresightView.tsx';
import { chanceRiseOf } from '../../../server/levels/alertWords.ts';
import { PlanActionDone, PlanActionStatus } from '../components/planAction.tsx';
import { alertAction } from '../configurationState.ts';
import { useNow } from '../components/clock.ts';
import { LevelBadge, LevelShape, levelTone, type Tone } from '../components/levelBadge.tsx';
import { useMedia } from '../components/media.ts';
import { Sparkline } from '../components/sparkline.tsx';
import { StructureFigures } from '../components/structureFigures.tsx';
import { WindArrow } from '../components/windArrow.tsx';
import { live, refreshSnapshot, serverNow, trailMinutes, windTrail } from '../live.ts';
import { prefs, setPref } from '../prefs.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { site, useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { OpenAlert, SensorState, StructureState } from '../types.ts';
import { beaufortText, clockTime, compassPoint, dayAwareClockTime, dayAwareTime, duration, speed, speedNumber, speedUnitLabels, unitSpace } from '../units.ts';
import { maxTextLength } from '../../../server/engine/limits.ts';

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
  const boardTimeZone = useTimeZone();

  return (
    <main id="main" class={`board${connected ? '' : ' is-stale'}`}>
      <h1 class="visually-hidden">Live board</h1>
      {snap ? <SummaryLine structures={snap.structures} sensors={snap.sensors} /> : null}
      <NotifyHealthLine />
      {!connected && state.keptAtMs !== null ? (
        <div class="stale-banner kept-banner" role="alert">
          <strong>OLD DATA — {duration(Math.max(0, Date.now() - state.keptAtMs))} old.</strong> The server cannot be reached: this is the last copy kept on this phone
          {' '}({clockTime(state.keptAtMs, boardTimeZone)}). Nothing here is current. Treat the wind as unknown until this goes away.
        </div>
      ) : !connected ? (
        <div class="stale-banner" role="alert">
          <strong>{state.connection === 'offline' ? 'No network.' : state.snapshot ? 'Connection lost — reconnecting…' : 'Connecting to the site…'}</strong>{' '}
          {dataAgeMs !== null ? `What you see is ${duration(dataAgeMs)} old and may not be true now. ` : 'No live data yet. '}
          Treat the wind as unknown until this goes away.
        </div>
      ) : null}
      <AlarmControls />
      {snap ? (
        <>
          <Alerts alerts={snap.alerts} structures={snap.structures} />
          <SiteWind sensors={snap.sensors} />
          <section aria-labelledby="structures-h">
            <h2 id="structures-h" class="section-h">
              Structures <span class="muted small">worst first</span>
            </h2>
            {snap.structures.length === 0 ? <p class="empty">No structures registered yet.</p> : null}
            <ul class="cards">
              {snap.structures.map((s) => (
                <li key={s.id} class="card-with-foresight">
                  <StructureCard s={s} sensors={snap.sensors} />
                  <BoardForesight s={s} sensors={snap.sensors} />
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

/** The site in one line: structures per level, without data, sensors in trouble. States, never asks. */
function SummaryLine({ structures, sensors }: { structures: StructureState[]; sensors: SensorState[] }) {
  const parts = boardSummary(structures, sensors, serverNow());
  return (
    <p class="board-summary" data-testid="board-summary" aria-label={`On site now: ${summaryText(parts)}`}>
      {parts.map((p, i) => {
        const tone: Tone = p.noData ? 'nodata' : levelTone(p.level, p.levelCount);
        return (
          <span key={p.text} class={`sum-part tone-${tone}${p.sensor ? ' is-sensor' : ''}`}>
            {i > 0 ? <span class="sum-sep" aria-hidden="true"> · </span> : null}
            <LevelShape tone={tone} size={18} />
            <span class="sum-text">{p.text}</span>
          </span>
        );
      })}
    </p>
  );
}

function AlarmControls() {
  const p = useStore(prefs);
  const armed = useStore(soundArmed);
  const hasTapped = useStore(tapped);
  const awake = useStore(screenKeptOn);
  const toggle = async () => {
    if (p.alarmSound) setPref('alarmSound', false);
    else {
      setPref('alarmSound', true);
      await armSound();
    }
  };
  // Before the first tap the browser allows neither sound nor vibration: say so, and offer the tap.
  const waiting = !hasTapped && (p.vibrate || p.alarmSound);
  return (
    <div class="alarm-row">
      <button type="button" class={`toggle${p.alarmSound ? ' on' : ''}`} aria-pressed={p.alarmSound} onClick={toggle}>
        {p.alarmSound ? 'Alarm sound on' : 'Alarm sound off'}
      </button>
      {waiting || (p.alarmSound && !armed) ? (
        <button type="button" class="warn-btn" onClick={() => void (p.alarmSound ? armSound() : null)}>
          {p.alarmSound ? (p.vibrate ? 'Allow sound and vibration' : 'Allow sound') : 'Allow vibration'}
        </button>
      ) : null}
      <span class="muted small">{awake === true ? 'Screen kept on' : awake === false ? 'Screen may sleep' : ''}</span>
    </div>
  );
}

/**
 * Cards shown before the "Show N more" expander. On a phone three, so that the wind and the
 * structures stay within about two screens of the top after a windy spell; on a wide screen (two
 * columns of cards) four. Cards that may never wait behind it (no data, a sensor, a structure at
 * its top level: alertGroups.ts mayFold) do not count towards these.
 */
const phoneWidth = '(max-width: 699px)';
const groupsShown = (narrow: boolean): number => (narrow ? 3 : 4);

function Alerts({ alerts, structures }: { alerts: OpenAlert[]; structures: StructureState[] }) {
  const groups = useMemo(() => groupAlerts(alerts, structures), [alerts, structures]);
  const narrow = useMedia(phoneWidth);
  const canAck = may(useStore(session), 'crew');
  const [showAll, setShowAll] = useState(false);
  if (groups.length === 0) return null;
  const limit = groupsShown(narrow);
  const hidden = new Set<AlertGroup>();
  let foldable = 0;
  for (const g of groups) {
    if (!mayFold(g)) continue;
    foldable += 1;
    if (foldable > limit) hidden.add(g);
  }
  const shown = showAll ? groups : groups.filter((g) => !hidden.has(g));
  const hiddenOpen = [...hidden].filter((g) => g.toAcknowledge.length > 0).length;
  const toAcknowledge = groups.reduce((n, g) => n + g.toAcknowledge.length, 0);
  const structuresWaiting = groups.filter((g) => g.toAcknowledge.length > 0).length;
  return (
    <section aria-labelledby="alerts-h" class="alerts">
      <h2 id="alerts-h" class="section-h">
        Alerts{' '}
        {canAck ? (
          <span class={`count${toAcknowledge > 0 ? ' is-open' : ''}`}>
            {toAcknowledge > 0 ? `${toAcknowledge} to acknowledge${structuresWaiting > 1 ? `, on ${structuresWaiting} cards` : ''}` : 'all acknowledged'}
          </span>
        ) : (
          <span class="muted small">in force</span>
        )}
      </h2>
      <ul class="cards alert-groups">
        {shown.map((g) => (
          <li key={g.key} class="alert-group">
            {g.kind === 'structure' ? <StructureAlertCard g={g} /> : <SensorAlertCard g={g} />}
          </li>
        ))}
      </ul>
      {hidden.size > 0 ? (
        <button type="button" class="more-alerts" aria-expanded={showAll} onClick={() => setShowAll(!showAll)}>
          {showAll
            ? 'Show fewer alerts'
            : `Show ${hidden.size} more ${hidden.size === 1 ? 'structure' : 'structures'} with alerts${canAck && hiddenOpen > 0 ? ` (${hiddenOpen} to acknowledge)` : ''}`}
        </button>
      ) : null}
    </section>
  );
}

interface AckAllAnswer {
  acknowledged: OpenAlert[];
  alreadyAcknowledged: Array<{ id: number; acknowledgedBy: string | null; acknowledgedAtMs: number | null }>;
  notShown: OpenAlert[];
  stored: boolean;
}

/**
 * Acknowledges the alerts a card shows, all at once, on the server (the ids it showed: an alert
 * raised since stays open for the person to see), and shows the answer at once (the stream
 * follows). Returns what the person must be told, or null when all went as asked.
 */
async function acknowledgeAll(subject: { structureId: number } | { sensorKey: string }, ids: number[], note: string): Promise<string | null> {
  const answer = await api<AckAllAnswer>('/api/alerts/acknowledge', { body: { ...subject, alertIds: ids, ...(note ? { note } : {}) } });
  const done = new Map(answer.acknowledged.map((a) => [a.id, a]));
  live.update((st) =>
    st.snapshot
      ? {
          ...st,
          snapshot: {
            ...st.snapshot,
            alerts: st.snapshot.alerts.map((x) => done.get(x.id) ?? x).filter((x) => x.acknowledgedAtMs === null || x.clearedAtMs === null),
          },
        }
      : st,
  );
  const told: string[] = [];
  if (answer.alreadyAcknowledged.length > 0) {
    const names = [...new Set(answer.alreadyAcknowledged.map((a) => a.acknowledgedBy ?? 'someone'))];
    told.push(`${answer.alreadyAcknowledged.length} had already been acknowledged by ${names.join(', ')}.`);
  }
  if (answer.notShown.length > 0) {
    told.push(`${answer.notShown.length === 1 ? 'One alert was' : `${answer.notShown.length} alerts were`} raised since this card was drawn and ${answer.notShown.length === 1 ? 'is' : 'are'} not acknowledged: ${answer.notShown.map((a) => a.label).join(', ')}. Read the card again.`);
  }
  if (told.length > 0) void refreshSnapshot();
  return told.length > 0 ? told.join(' ') : null;
}

/** The acknowledgement of an alert in words: who, when and the note; or that it waits. */
function AckStatus({ a, tz, canAck }: { a: OpenAlert; tz: string; canAck: boolean }) {
  if (a.acknowledgedAtMs !== null) {
    return (
      <span class="ack-done">
        ✓&nbsp;Acknowledged by {a.acknowledgedBy} at {dayAwareClockTime(a.acknowledgedAtMs, tz)}
        {a.acknowledgeNote ? `: “${a.acknowledgeNote}”` : ''}
      </span>
    );
  }
  return canAck ? <strong class="ack-waiting">Not yet acknowledged</strong> : <span class="ack-waiting-calm">not yet acknowledged by the crew</span>;
}

/**
 * The one button a card offers crew and above: acknowledge everything it shows, in one tap, with
 * an optional note opened first. Viewers get no button (the card says whether the crew have).
 */
function AckAll({ subject, alerts, noun, idBase }: { subject: { structureId: number } | { sensorKey: string }; alerts: OpenAlert[]; noun: string; idBase: string }) {
  const [noteOpen, setNoteOpen] = useState(false);
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  if (alerts.length === 0 && !message) return null;
  const send = async () => {
    setBusy(true);
    setMessage(null);
    try {
      const told = await acknowledgeAll(subject, alerts.map((a) => a.id), note.trim());
      setMessage(told);
      setNoteOpen(false);
      setNote('');
    } catch (err) {
      setMessage(`Not acknowledged: ${errorText(err)}`);
      void refreshSnapshot();
    } finally {
      setBusy(false);
    }
  };
  return (
    <div class="ack-area">
      {alerts.length > 0 && noteOpen ? (
        <div class="ack-form">
          <label for={`note-${idBase}`}>Note (optional): what you did or saw</label>
          <textarea id={`note-${idBase}`} rows={2} maxLength={maxTextLength} value={note} onInput={(e) => setNote(e.currentTarget.value)} />
        </div>
      ) : null}
      {alerts.length > 0 ? (
        <div class="ack-buttons">
          <button type="button" class="primary ack-btn" disabled={busy} onClick={() => void send()}>
            {busy ? 'Sending…' : alerts.length === 1 ? 'Acknowledge' : `Acknowledge all ${alerts.length} for this ${noun}`}
          </button>
          {noteOpen ? (
            <button type="button" class="link-btn" disabled={busy} onClick={() => setNoteOpen(false)}>
              No note
            </button>
          ) : (
            <button type="button" class="link-btn" disabled={busy} onClick={() => setNoteOpen(true)}>
              Add a note
            </button>
          )}
        </div>
      ) : null}
      {message ? (
        <p class="error-box" role="alert">
          {message}
        </p>
      ) : null}
    </div>
  );
}

/** One folded alert in one line, wrapped, never cut: label, raised, ended or in force, acknowledged or not. */
function FoldedLine({ a, tz, canAck }: { a: OpenAlert; tz: string; canAck: boolean }) {
  const tone = a.kind === 'level' ? levelTone(a.level, Math.max(a.level ?? 0, 3)) : 'nodata';
  return (
    <li class={`folded-line tone-${tone}`}>
      <LevelShape tone={tone} size={18} />
      <span>
        <strong>{a.kind === 'level' ? `Level ${a.level} · ${a.label}` : a.label}</strong> raised {dayAwareTime(a.raisedAtMs, tz)}
        {a.clearedAtMs !== null ? `, ended ${dayAwareTime(a.clearedAtMs, tz)}` : ', still in force'} · <AckStatus a={a} tz={tz} canAck={canAck} />
      </span>
    </li>
  );
}

/** A no-data alert in full: never folded, the wind there is unknown. */
function NoDataBlock({ a, tz, canAck, headed = false }: { a: OpenAlert; tz: string; canAck: boolean; headed?: boolean }) {
  const ended = a.clearedAtMs !== null;
  return (
    <div class={`nodata-block${ended ? ' ended' : ''}`}>
      {headed ? null : (
        <p class="nodata-h">
          <LevelShape tone="nodata" size={20} /> <strong>{a.label}</strong>
          {ended ? ` — readings came back at ${dayAwareTime(a.clearedAtMs!, tz)}` : ` since ${dayAwareTime(a.raisedAtMs, tz)}: the wind at this structure is unknown`}
        </p>
      )}
      {ended ? null : <p class="alert-action">{a.actionText}</p>}
      <p class="alert-meta">
        Raised {dayAwareTime(a.raisedAtMs, tz)} · <AckStatus a={a} tz={tz} canAck={canAck} />
      </p>
    </div>
  );
}

/**
 * A structure's alerts as one card. It leads with the structure's level now and that level's
 * action, acknowledged or not; below it the no-data alerts in full, the other alerts folded one
 * line each; then for crew one button for all of them.
 */
export function StructureAlertCard({ g }: { g: StructureAlertGroup }) {
  const canAck = may(useStore(session), 'crew');
  const unit = useStore(prefs).unit;
  const tz = useTimeZone();
  const c = g.current;
  const tone = levelTone(c.level, c.levelCount, c.noData);
  const levelName = c.level > 0 ? `Level ${c.level} · ${c.label ?? ''}` : null;
  const heading = c.noData ? 'No data — wind unknown' : (levelName ?? 'Below all levels now');
  const current = g.currentAlert;
  const state = useStore(live).snapshot?.structures.find((x) => x.id === g.structureId);
  // The plan actions of the card's level alerts (design §2.5): the current level's first.
  const nowMs = serverNow();
  const actions = [current, ...g.folded].flatMap((a) => {
    const action = a ? alertAction(a, nowMs) : null;
    return a && action ? [{ a, action }] : [];
  });
  return (
    <article class={`alert-card tone-${tone}${g.toAcknowledge.length === 0 ? ' acked' : ''}`} aria-label={`${g.subject}: ${heading}`}>
      <header>
        <span class="alert-label">
          <LevelShape tone={tone} size={26} /> {heading}
        </span>
        <span class="alert-subject">{g.subject}</span>
      </header>
      {state ? <ConfigurationLineView s={state} unit={unit} timeZone={tz} /> : null}
      {c.noData ? g.noDataAlerts.filter((a) => a.clearedAtMs === null).map((a) => <NoDataBlock key={a.id} a={a} tz={tz} canAck={canAck} headed />) : null}
      {c.level > 0 ? (
        <div class="current-level">
          {c.noData ? <p class="alert-kept">Level kept until readings return: {levelName}</p> : null}
          <p class="alert-action">{c.actionText ?? current?.actionText ?? ''}</p>
          {current && chanceRiseOf(current.actionText) !== null ? <p class="alert-estimate" data-testid="alert-estimate"><EstimateTag /> {chanceRiseOf(current.actionText)}</p> : null}
          <p class="alert-meta">
            {current ? (
              <>
                Reached {dayAwareTime(current.raisedAtMs, tz)}
                {current.gustMps !== null ? ` at ${speed(current.gustMps, unit)}` : ''} · <strong class="alert-holds">in force</strong> · <AckStatus a={current} tz={tz} canAck={canAck} />
              </>
            ) : c.sinceMs !== null ? (
              <>At this level since {dayAwareTime(c.sinceMs, tz)}</>
            ) : null}
          </p>
        </div>
      ) : c.noData ? null : (
        <p class="alert-state is-ended">Below every level now: the alerts below have ended.</p>
      )}
      {actions.map(({ a, action }) => (
        <PlanActionStatus key={a.id} action={action} actionText={a.actionText} timeZone={tz} canAct={canAck} />
      ))}
      {g.noDataAlerts.filter((a) => a.clearedAtMs !== null || !c.noData).map((a) => (
        <NoDataBlock key={a.id} a={a} tz={tz} canAck={canAck} />
      ))}
      {g.folded.length > 0 ? (
        <div class="folded">
          <p class="folded-h">{c.level > 0 ? 'Also for this structure:' : 'Alerts of this structure:'}</p>
          <ul class="folded-lines">
            {g.folded.map((a) => (
              <FoldedLine key={a.id} a={a} tz={tz} canAck={canAck} />
            ))}
          </ul>
        </div>
      ) : null}
      {canAck
        ? actions
            .filter(({ action }) => action.state !== 'done' && !action.ended)
            .map(({ a, action }) => <PlanActionDone key={a.id} structureId={g.structureId} action={action} />)
        : null}
      {canAck ? <AckAll subject={{ structureId: g.structureId }} alerts={g.toAcknowledge} noun="structure" idBase={g.key} /> : null}
    </article>
  );
}

/** A sensor's alerts as one card: each in full (a sensor in trouble is never folded away). */
export function SensorAlertCard({ g }: { g: SensorAlertGroup }) {
  const canAck = may(useStore(session), 'crew');
  const tz = useTimeZone();
  const inForce = g.alerts.filter((a) => a.clearedAtMs === null);
  const heading = (inForce[0] ?? g.alerts[0]!).label;
  return (
    <article class={`alert-card tone-nodata sensor-alert${g.toAcknowledge.length === 0 ? ' acked' : ''}`} aria-label={`${g.subject}: ${heading}`}>
      <header>
        <span class="alert-label">
          <LevelShape tone="nodata" size={26} /> {heading}
        </span>
        <span class="alert-subject">{g.subject}</span>
      </header>
      {g.alerts.map((a) => (
        <div key={a.id} class="sensor-alert-item">
          {a !== g.alerts.find((x) => x.label === heading) ? <p class="nodata-h"><strong>{a.label}</strong></p> : null}
          {a.clearedAtMs !== null ? <p class="alert-state is-ended">Condition ended at {dayAwareTime(a.clearedAtMs, tz)}</p> : null}
          <p class="alert-action">{a.actionText}</p>
          <p class="alert-meta">
            Raised {dayAwareTime(a.raisedAtMs, tz)}
            {a.clearedAtMs === null ? (
              <>
                {' '}
                · <strong class="alert-holds">in force</strong>
              </>
            ) : null}{' '}
            · <AckStatus a={a} tz={tz} canAck={canAck} />
          </p>
        </div>
      ))}
      {canAck ? <AckAll subject={{ sensorKey: g.sensorKey }} alerts={g.toAcknowledge} noun="sensor" idBase={g.key} /> : null}
    </article>
  );
}

function sensorTrouble(s: SensorState, nowMs: number): string | null {
  const kind = sensorTroubleKind(s, nowMs);
  if (kind === null) return null;
  if (kind === 'no reading yet') return kind;
  if (kind === 'implausible') return `implausible: ${s.implausible.join(', ')}`;
  return s.silent ? `silent for ${duration(nowMs - s.lastReceivedAtMs!)}` : `no reading for ${duration(nowMs - s.lastReceivedAtMs!)}`;
}

/** How the levels use the wind, in words, with the site's own hold time and dead band when known. */
function levelRule(): string {
  const st = site.get();
  const drop = st ? `only after ${duration(st.holdTimeMs)} at least ${Math.round(st.deadBandFraction * 100)}${unitSpace}% below it` : 'only after the hold time below it';
  return `Levels and margins use the 3-s gust at each structure's own height: a level rises at once when a gust reaches its trigger, and drops ${drop}.`;
}

function SiteWind({ sensors }: { sensors: SensorState[] }) {
  const unit = useStore(prefs).unit;
  const trails = useStore(windTrail);
  useStore(site);
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
              gust now {speed(s.currentGustMps, unit)} · peak 10 min {speed(s.peakGust10minMps, unit)} · mean {speed(s.mean10minMps, unit)}
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
            <div class="big-figure" data-testid="gust-now">
              <span class="fig-label">Gust now (3 s)</span>
              <span class="fig-value">{speedNumber(lead.currentGustMps, unit)}</span>
              <span class="fig-unit">{speedUnitLabels[unit]}</span>
            </div>
            <div class="mid-figure peak-figure" data-testid="peak-gust">
              <span class="fig-label">Peak gust, 10 min</span>
              <span class="fig-value">{speedNumber(lead.peakGust10minMps, unit)}</span>
              <span class="fig-unit">{speedUnitLabels[unit]}</span>
            </div>
            <div class="mid-figure" data-testid="mean-wind">
              <span class="fig-label">Mean wind, 10 min</span>
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
            <strong>{beaufortText(lead.mean10minMps) ?? 'Beaufort unknown'}</strong> · at {lead.name} ({lead.heightM}&nbsp;m) ·{' '}
            <span class="age">last reading {duration(nowMs - (lead.lastReceivedAtMs ?? nowMs))} ago</span>
          </p>
          <p class="wind-rule muted small">{levelRule()}</p>
          <p class="spark-caption small">
            <strong>Gust (3 s) at {lead.name}</strong>, {speedUnitLabels[unit]}, last {trailMinutes} min
          </p>
          <Sparkline points={points} fromMs={nowMs - trailMinutes * 60_000} toMs={nowMs} unit={unit} label={`Gust (3 s) at ${lead.name}, last ${trailMinutes} minutes`} />
        </div>
      ) : (
        <p class="unknown-box">Wind unknown: no sensor is reporting good readings. Watch the wind by hand and follow the wind management plan.</p>
      )}
      {sensors.length === 0 ? (
        <p class="unknown-box">No sensors registered: the wind on site is unknown.</p>
      ) : narrow && troubles.every((t) => t === null) ? (
        // On a phone, sensors that all report well fold into one line; any trouble unfolds them.
        <details class="sensor-fold">
          <summary>{sensors.length === 1 ? `${sensors[0]!.name} reporting well` : `All ${sensors.length} sensors reporting well`}</summary>
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
  const tz = useTimeZone();
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
      <ConfigurationLineView s={s} unit={unit} timeZone={tz} />
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

/** The structure's estimates under its card (design §2.7): beside the card's link, never inside it, so its tap opens the inputs. */
function BoardForesight({ s, sensors }: { s: StructureState; sensors: SensorState[] }) {
  const unit = useStore(prefs).unit;
  return <ForesightStrip s={s} unit={unit} sensors={sensors} />;
}
