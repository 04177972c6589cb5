/**
 * The anemometers: each one's health (last reading age, silent, implausible, rejected payloads by
 * reason), its gust and mean; registering and editing them; and the gateways that publish for
 * them (competent person only): make one (its password is shown once, with the topic and an
 * example command), give it a new password, revoke it. What the broker refused (logins,
 * publishes to topics of no sensor or of another gateway's sensor, subscriptions) is listed with
 * who, when, which topic and why (competent person); other roles read the screen, no buttons.
 */
import { useEffect, useState } from 'preact/hooks';
import { api, ApiError, errorText, issuesByPath } from '../api.ts';
import { useNow } from '../components/clock.ts';
import { Field } from '../components/field.tsx';
import { ReadOnlyNote } from '../components/readOnlyNote.tsx';
import { SpeedValue } from '../components/speedValue.tsx';
import { live, refreshSnapshot, serverNow } from '../live.ts';
import { prefs } from '../prefs.ts';
import { may, session } from '../session.ts';
import { loadSite, site, useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { BrokerRefusal, GatewayView, RefusalReason, RefusalsAnswer, RejectionCount, SensorView } from '../types.ts';
import { beaufortText, clockTime, dateTime, duration, longDate, speedUnitLabels, speedUnits, type SpeedUnit } from '../units.ts';
import { plainMessage, typedNumber } from '../register/structureDraft.ts';
import { isBelowMinimumHeight, profileMaximumHeightM, terrainCategories, terrainParameters, type TerrainCategory } from '../../../server/engine/windProfile.ts';

export function Sensors() {
  const canEdit = may(useStore(session), 'competent-person');
  const [list, setList] = useState<SensorView[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [editing, setEditing] = useState<SensorView | 'new' | null>(null);
  const [reload, setReload] = useState(0);
  const snap = useStore(live).snapshot;
  useNow();

  useEffect(() => {
    api<{ sensors: SensorView[] }>('/api/sensors')
      .then((a) => setList(a.sensors))
      .catch((err) => setError(errorText(err)));
  }, [reload]);

  return (
    <main id="main">
      <h1>Sensors</h1>
      {!canEdit ? <ReadOnlyNote what="each sensor's health and what it sent" ask="the site’s competent person" /> : null}
      {error ? <p class="error-box">{error}</p> : null}
      {list === null && !error ? <p class="muted">Loading…</p> : null}
      {list && list.length === 0 ? <p class="unknown-box">No sensors registered: the wind on site is unknown until one reports.</p> : null}
      <ul class="cards">
        {(list ?? []).map((s) => (
          <li key={s.key}>
            <SensorCard s={{ ...s, live: snap?.sensors.find((x) => x.key === s.key) ?? s.live }} canEdit={canEdit} onEdit={() => setEditing(s)} />
          </li>
        ))}
      </ul>
      {canEdit ? (
        editing ? (
          <SensorForm
            sensor={editing === 'new' ? null : editing}
            onDone={() => {
              setEditing(null);
              setReload(reload + 1);
            }}
          />
        ) : (
          <button type="button" class="primary" onClick={() => setEditing('new')}>
            Register a sensor
          </button>
        )
      ) : null}
      {canEdit ? <Refusals sensors={list ?? []} /> : <RefusalCount />}
      {canEdit ? <Gateways sensors={list ?? []} /> : null}
    </main>
  );
}

function SensorCard({ s, canEdit, onEdit }: { s: SensorView; canEdit: boolean; onEdit: () => void }) {
  const unit = useStore(prefs).unit;
  const tz = useTimeZone();
  const l = s.live;
  const nowMs = serverNow();
  const age = l?.lastReceivedAtMs == null ? null : nowMs - l.lastReceivedAtMs;
  // The gateway's clock as measured from arrivals: its own condition, not silence (server/wind/clockOffset.ts).
  const offsetMs = l?.clockOffsetMs ?? null;
  const clockWords = offsetMs === null ? 'unknown (nothing arrived in the last minute)' : Math.abs(offsetMs) < 2_000 ? 'on time' : `${duration(Math.abs(offsetMs))} ${offsetMs > 0 ? 'behind' : 'ahead'}`;
  const clockOff = offsetMs !== null && Math.abs(offsetMs) > 10_000;
  const arriving = l?.lastArrivalAtMs != null && nowMs - l.lastArrivalAtMs <= s.silenceTimeoutMs;
  const trouble =
    !l || (l.lastReceivedAtMs === null && !arriving)
      ? 'no reading yet'
      : l.silent
        ? arriving
          ? `readings arrive but cannot be used: clock ${clockWords}`
          : `silent (no reading for ${duration(age ?? 0)})`
        : l.implausible.length > 0
          ? `implausible: ${l.implausible.join(', ')}`
          : clockOff
            ? `clock ${clockWords}: set the gateway's clock`
            : null;
  return (
    <article class={`sensor-card${trouble ? ' sensor-bad' : ''}`}>
      <header>
        <h2 class="card-h">{s.name}</h2>
        <span class={trouble ? 'state-bad' : 'state-ok'}>{trouble ? `⚠ ${trouble}` : '✓ reporting'}</span>
      </header>
      <dl class="sc-figures">
        <div>
          <dt>Gust (3 s)</dt>
          <dd class={trouble && l?.lastReceivedAtMs != null ? 'struck' : ''}>
            <SpeedValue mps={l?.currentGustMps} unit={unit} />
          </dd>
        </div>
        <div>
          <dt>Mean (10 min)</dt>
          <dd class={trouble && l?.lastReceivedAtMs != null ? 'struck' : ''}>
            <SpeedValue mps={l?.mean10minMps} unit={unit} />
            {l?.mean10minMps != null ? <span class="fig-note">{beaufortText(l.mean10minMps)}</span> : null}
          </dd>
        </div>
        <div>
          <dt>Last reading</dt>
          <dd class="fig-age">{age === null ? 'never' : `${duration(age)} ago`}</dd>
        </div>
        <div>
          <dt>Clock</dt>
          <dd class={`fig-age${clockOff ? ' state-bad' : ''}`} title="How far the time stamps lag the server's clock, from the readings' arrival (10 s or more raises a sensor alert)">
            {clockWords}
          </dd>
        </div>
      </dl>
      <p class="muted small">
        key <code>{s.key}</code> · {s.heightM}&nbsp;m high · {s.location || 'no location given'} · payloads in {s.unit}, {s.mode === 'samples' ? 'raw samples' : 'ready summaries'} · silent after {Math.round(s.silenceTimeoutMs / 1000)} s · topic <code>{s.topic}</code>
        {l?.temperatureC != null ? ` · ${l.temperatureC.toFixed(1)} °C` : ''}
        {l?.pressurePa != null ? ` · ${(l.pressurePa / 100).toFixed(1)} hPa` : ''}
        {l?.rhPct != null ? ` · ${Math.round(l.rhPct)}\u00a0% RH` : ''}
      </p>
      {s.rejections.length > 0 ? (
        <table class="kv">
          <caption>Rejected payloads (never stored)</caption>
          <thead>
            <tr>
              <th scope="col">Reason</th>
              <th scope="col">Count</th>
              <th scope="col">Last</th>
            </tr>
          </thead>
          <tbody>
            {s.rejections.map((r) => (
              <tr>
                <td>
                  {r.reason}
                  <br />
                  <span class="muted small">{r.lastDetail}</span>
                </td>
                <td>{r.count}</td>
                <td>{dateTime(r.lastAtMs, tz)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : (
        <p class="muted small">No rejected payloads.</p>
      )}
      {canEdit ? (
        <button type="button" onClick={onEdit}>
          Edit {s.name}
        </button>
      ) : null}
    </article>
  );
}

/** How often the refusals are asked for again while the screen is open. */
const refusalPollMs = 5_000;

const refusalWords: Record<RefusalReason, string> = {
  'no-username': 'no username',
  'unknown-username': 'unknown username',
  'no-password': 'no password',
  'wrong-password': 'wrong password',
  locked: 'too many failed sign-ins: locked for a while',
  'client-id-taken': 'client id used by another gateway',
  'check-failed': 'the password check failed',
  protocol: 'refused before signing in',
  'unknown-sensor': 'no sensor has this key',
  'other-sensor': 'another gateway’s sensor',
  'not-reading-topic': 'not a reading topic',
  'gateway-revoked': 'gateway revoked',
  subscribe: 'subscribing is not allowed',
};

function refusalTitle(r: BrokerRefusal): string {
  if (r.kind === 'connect') return r.reason === 'protocol' ? 'Connection refused' : 'Login refused';
  return r.kind === 'publish' ? 'Message refused' : 'Subscription refused';
}

/**
 * What the embedded broker refused since the server started (kept in memory, grouped by who and
 * why), newest first; and messages the external broker passed on for no registered sensor.
 */
function Refusals({ sensors }: { sensors: SensorView[] }) {
  const tz = useTimeZone();
  const [answer, setAnswer] = useState<RefusalsAnswer | null>(null);
  const [stray, setStray] = useState<RejectionCount[]>([]);
  const [error, setError] = useState<string | null>(null);
  const registered = new Set(sensors.map((s) => s.key));

  useEffect(() => {
    let stop = false;
    const load = async () => {
      try {
        const [a, r] = await Promise.all([api<RefusalsAnswer>('/api/refusals'), api<{ rejections: RejectionCount[] }>('/api/rejections')]);
        if (stop) return;
        setAnswer(a);
        setStray(r.rejections.filter((x) => x.reason === 'unknown-sensor' || x.reason === 'bad-topic'));
        setError(null);
      } catch (err) {
        if (!stop) setError(errorText(err));
      }
    };
    void load();
    const timer = setInterval(() => void load(), refusalPollMs);
    return () => {
      stop = true;
      clearInterval(timer);
    };
  }, []);

  const strayNow = stray.filter((x) => !registered.has(x.sensorKey)).sort((a, b) => b.lastAtMs - a.lastAtMs);
  return (
    <section class="panel refusals" aria-labelledby="rf-h">
      <h2 id="rf-h">Refused at the broker</h2>
      {error ? <p class="error-box">{error}</p> : null}
      {answer === null && !error ? <p class="muted">Loading…</p> : null}
      {answer?.broker === 'external' ? (
        <p class="help">Readings come through an external broker (MQTT_URL): it checks the gateways’ logins and topics itself, so its own log shows what it refused. Below: messages it passed on for no registered sensor.</p>
      ) : answer ? (
        <p class="help">
          Logins, messages and subscriptions the embedded broker refused since the server started ({dateTime(answer.sinceMs, tz)}): {answer.total} in all. Nothing refused is stored as a reading; of a refused message only its first bytes are kept here, in memory.
          {answer.droppedGroups > 0 ? ` Only the newest ${answer.maxGroups} kinds are kept: ${answer.droppedGroups} older ones were dropped.` : ''}
        </p>
      ) : null}
      {answer && answer.broker === 'embedded' && answer.refusals.length === 0 ? <p class="ok-box">Nothing refused since the server started.</p> : null}
      {answer && answer.refusals.length > 0 ? (
        <ul class="refusal-list">
          {answer.refusals.map((r) => (
            <li key={`${r.kind}${r.reason}${r.username}${r.address}${r.topic}`}>
              <article class="refusal">
                <h3 class="refusal-h">
                  ⚠ {refusalTitle(r)}: {refusalWords[r.reason]}
                </h3>
                <p class="refusal-detail">{r.detail}.</p>
                <dl class="refusal-facts">
                  {r.topic !== null ? (
                    <div>
                      <dt>Topic</dt>
                      <dd>
                        <code>{r.topic}</code>
                      </dd>
                    </div>
                  ) : null}
                  <div>
                    <dt>Who</dt>
                    <dd>
                      {r.username !== null ? (
                        <>
                          username <code>{r.username}</code>
                        </>
                      ) : (
                        'no username'
                      )}
                      {r.clientId ? (
                        <>
                          {' '}
                          · client id <code>{r.clientId}</code>
                        </>
                      ) : null}
                      {r.address ? (
                        <>
                          {' '}
                          · from <code>{r.address}</code>
                        </>
                      ) : null}
                    </dd>
                  </div>
                  <div>
                    <dt>When</dt>
                    <dd>
                      {clockTime(r.lastAtMs, tz)} on {longDate(r.lastAtMs, tz)}
                      {r.count > 1 ? ` · ${r.count} times since ${clockTime(r.firstAtMs, tz)}${longDate(r.firstAtMs, tz) === longDate(r.lastAtMs, tz) ? '' : ` on ${longDate(r.firstAtMs, tz)}`}` : ''}
                    </dd>
                  </div>
                  {r.excerpt !== null ? (
                    <div>
                      <dt>Message began</dt>
                      <dd>
                        <code class="excerpt">{r.excerpt || '(empty)'}</code>
                      </dd>
                    </div>
                  ) : null}
                </dl>
              </article>
            </li>
          ))}
        </ul>
      ) : null}
      {strayNow.length > 0 ? (
        <table class="kv stray-topics">
          <caption>Messages for no registered sensor (never stored)</caption>
          <thead>
            <tr>
              <th scope="col">Topic key</th>
              <th scope="col">Count</th>
              <th scope="col">Last</th>
            </tr>
          </thead>
          <tbody>
            {strayNow.map((x) => (
              <tr key={`${x.sensorKey}${x.reason}`}>
                <td>
                  <code>{x.sensorKey === '*' ? 'not a reading topic' : x.sensorKey}</code>
                  <br />
                  <span class="muted small">{x.lastDetail}</span>
                </td>
                <td>{x.count}</td>
                <td>{dateTime(x.lastAtMs, tz)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </section>
  );
}

/** For roles that cannot see who was refused: how many, from the public health report. */
function RefusalCount() {
  const [counts, setCounts] = useState<{ connections: number; publishes: number } | null>(null);
  useEffect(() => {
    fetch('/api/health')
      .then((r) => r.json() as Promise<{ broker?: { kind?: string; refusedConnections?: number; refusedPublishes?: number } }>)
      .then((h) => {
        if (h.broker?.kind === 'embedded') setCounts({ connections: h.broker.refusedConnections ?? 0, publishes: h.broker.refusedPublishes ?? 0 });
      })
      .catch(() => undefined);
  }, []);
  if (!counts || counts.connections + counts.publishes === 0) return null;
  return (
    <p class="muted">
      Since it started the broker refused {counts.connections} login{counts.connections === 1 ? '' : 's'} and {counts.publishes} message{counts.publishes === 1 ? '' : 's'}; the competent person sees who and why on this screen.
    </p>
  );
}

function SensorForm({ sensor, onDone }: { sensor: SensorView | null; onDone: () => void }) {
  const [f, setF] = useState({
    key: sensor?.key ?? '',
    name: sensor?.name ?? '',
    heightM: sensor ? String(sensor.heightM) : '10',
    location: sensor?.location ?? '',
    unit: (sensor?.unit ?? 'm/s') as SpeedUnit,
    mode: (sensor?.mode ?? 'samples') as 'samples' | 'summaries',
    silenceS: sensor ? String(sensor.silenceTimeoutMs / 1000) : '30',
  });
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [error, setError] = useState<string | null>(null);
  const set = (k: keyof typeof f) => (e: Event) => setF({ ...f, [k]: (e.currentTarget as HTMLInputElement).value });
  // The site's terrain category, for the z_min warning (design §2.2 v2): the settings are loaded
  // once after sign-in; load them here if this screen came first.
  const siteSettings = useStore(site);
  useEffect(() => {
    if (!siteSettings) void loadSite();
  }, []);
  const terrain = siteSettings && (terrainCategories as readonly string[]).includes(siteSettings.terrainCategory) ? (siteSettings.terrainCategory as TerrainCategory) : null;
  const typedHeight = typedNumber(f.heightM);
  const mastTooLow =
    terrain !== null && typedHeight !== undefined && Number.isFinite(typedHeight) && typedHeight > 0 && typedHeight <= profileMaximumHeightM && isBelowMinimumHeight(typedHeight, terrain);

  const save = async (e: Event) => {
    e.preventDefault();
    setError(null);
    const height = typedNumber(f.heightM);
    const silence = typedNumber(f.silenceS);
    const body: Record<string, unknown> = {
      name: f.name.trim(),
      heightM: height ?? f.heightM,
      location: f.location.trim(),
      unit: f.unit,
      mode: f.mode,
      silenceTimeoutMs: silence === undefined || Number.isNaN(silence) ? f.silenceS : Math.round(silence * 1000),
    };
    try {
      if (sensor) await api(`/api/sensors/${encodeURIComponent(sensor.key)}`, { method: 'PATCH', body });
      else await api('/api/sensors', { body: { key: f.key.trim(), ...body } });
      void refreshSnapshot();
      onDone();
    } catch (err) {
      if (err instanceof ApiError) setIssues(issuesByPath(err.issues));
      setError(errorText(err));
    }
  };

  const retire = async () => {
    if (!sensor || !confirm(`Retire sensor ${sensor.name}? Its readings stay in the log; its topic is refused from now on.`)) return;
    try {
      await api(`/api/sensors/${encodeURIComponent(sensor.key)}`, { method: 'DELETE' });
      void refreshSnapshot();
      onDone();
    } catch (err) {
      setError(errorText(err));
    }
  };

  const err = (k: string) => (issues.get(k) ? plainMessage(issues.get(k)!) : undefined);
  return (
    <form class="panel stack" onSubmit={save}>
      <h2>{sensor ? `Edit ${sensor.name}` : 'Register a sensor'}</h2>
      <div class="grid2">
        <Field id="sn-key" label="Key" error={err('key')} help="The sensor's part of the MQTT topic: 1–64 characters of a–z, 0–9 and -. Cannot be changed later.">
          <input id="sn-key" value={f.key} disabled={!!sensor} autocapitalize="none" spellcheck={false} onInput={set('key')} />
        </Field>
        <Field id="sn-name" label="Name" error={err('name')} help="As the crew know it: “North mast”.">
          <input id="sn-name" value={f.name} onInput={set('name')} />
        </Field>
        <Field id="sn-h" label="Mounting height" unit="m" error={err('heightM')} help="Height of the cups or sonic head above the ground: gusts are moved from here to each structure’s height.">
          <input id="sn-h" inputMode="decimal" value={f.heightM} onInput={set('heightM')} />
        </Field>
        <Field id="sn-loc" label="Where it stands" error={err('location')}>
          <input id="sn-loc" value={f.location} onInput={set('location')} />
        </Field>
        <Field id="sn-unit" label="Speed unit of its payloads" error={err('unit')}>
          <select id="sn-unit" value={f.unit} onChange={set('unit')}>
            {speedUnits.map((u) => (
              <option value={u}>{speedUnitLabels[u]}</option>
            ))}
          </select>
        </Field>
        <Field id="sn-mode" label="What it sends" error={err('mode')} help="Raw samples: the server computes the 3-s gust and the 10-min mean. Summaries: the sensor sends its mean as speed and its gust.">
          <select id="sn-mode" value={f.mode} onChange={set('mode')}>
            <option value="samples">raw speed samples</option>
            <option value="summaries">ready summaries (mean and gust)</option>
          </select>
        </Field>
        <Field id="sn-silent" label="Silent after" unit="s" error={err('silenceTimeoutMs')} help="No reading for this long raises a sensor alert and its structures may show “no data” (2–3600 s; default 30 s).">
          <input id="sn-silent" inputMode="decimal" value={f.silenceS} onInput={set('silenceS')} />
        </Field>
      </div>
      {mastTooLow && terrain ? (
        <p class="note-box" role="note">
          The mast is below z_min for terrain category {terrain} ({terrainParameters[terrain].minimumHeightM} m): the gust at the structure is taken from the unclamped profile; mount the anemometer higher if you can.
        </p>
      ) : null}
      {error ? (
        <p class="error-box" role="alert">
          {error}
        </p>
      ) : null}
      <div class="row">
        <button type="submit" class="primary">
          {sensor ? 'Save sensor' : 'Register sensor'}
        </button>
        <button type="button" onClick={onDone}>
          Cancel
        </button>
        {sensor ? (
          <button type="button" class="danger" onClick={() => void retire()}>
            Retire
          </button>
        ) : null}
      </div>
    </form>
  );
}

/** What the gateway needs to be told once: its password, its topics and a command to try. */
interface Credentials {
  gateway: GatewayView;
  password: string;
}

function Gateways({ sensors }: { sensors: SensorView[] }) {
  const tz = useTimeZone();
  const [list, setList] = useState<GatewayView[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [shown, setShown] = useState<Credentials | null>(null);
  const [form, setForm] = useState({ name: '', username: '', sensorKeys: [] as string[] });
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [broker, setBroker] = useState<{ host: string; port: number | null; url: string | null }>({ host: location.hostname, port: null, url: null });
  const [reload, setReload] = useState(0);

  useEffect(() => {
    api<{ gateways: GatewayView[] }>('/api/gateways')
      .then((a) => setList(a.gateways))
      .catch((err) => setError(errorText(err)));
  }, [reload]);
  useEffect(() => {
    // The broker's port is in the public health report (embedded broker) — needed for the example.
    fetch('/api/health')
      .then((r) => r.json() as Promise<{ broker?: { kind?: string; port?: number; url?: string } }>)
      .then((h) => setBroker({ host: location.hostname, port: h.broker?.kind === 'embedded' ? (h.broker.port ?? null) : null, url: h.broker?.url ?? null }))
      .catch(() => undefined);
  }, []);

  const create = async (e: Event) => {
    e.preventDefault();
    setError(null);
    setIssues(new Map());
    try {
      const a = await api<Credentials>('/api/gateways', { body: { name: form.name.trim(), username: form.username.trim(), sensorKeys: form.sensorKeys } });
      setShown(a);
      setForm({ name: '', username: '', sensorKeys: [] });
      setReload(reload + 1);
    } catch (err) {
      if (err instanceof ApiError) setIssues(issuesByPath(err.issues));
      setError(errorText(err));
    }
  };
  const newPassword = async (g: GatewayView) => {
    if (!confirm(`Make a new password for ${g.name}? The old one stops working at once.`)) return;
    try {
      const a = await api<Credentials>(`/api/gateways/${g.id}`, { method: 'PATCH', body: { newPassword: true } });
      setShown(a);
    } catch (err) {
      setError(errorText(err));
    }
  };
  const revoke = async (g: GatewayView) => {
    if (!confirm(`Revoke ${g.name}? Its next message is refused; this cannot be undone.`)) return;
    try {
      await api(`/api/gateways/${g.id}`, { method: 'DELETE' });
      setReload(reload + 1);
    } catch (err) {
      setError(errorText(err));
    }
  };

  return (
    <section class="panel" aria-labelledby="gw-h">
      <h2 id="gw-h">Gateways (MQTT credentials)</h2>
      <p class="help">A gateway is a username and password that may publish readings for the sensors it is given, and nothing else.</p>
      {shown ? <ShownCredentials c={shown} broker={broker} sensors={sensors} onClose={() => setShown(null)} /> : null}
      {error ? <p class="error-box">{error}</p> : null}
      <ul class="plain-list">
        {(list ?? []).map((g) => (
          <li class={`gw-item${g.revokedAtMs !== null ? ' revoked' : ''}`} key={g.id}>
            <p>
              <strong>{g.name}</strong> — user <code>{g.username}</code> · sensors {g.sensorKeys.length > 0 ? g.sensorKeys.join(', ') : 'none'} · made {dateTime(g.createdAtMs, tz)}
              {g.revokedAtMs !== null ? <strong class="bad-text"> · revoked {dateTime(g.revokedAtMs, tz)}</strong> : null}
            </p>
            {g.revokedAtMs !== null ? null : (
              <span class="row">
                <button type="button" onClick={() => void newPassword(g)}>
                  New password
                </button>
                <button type="button" class="danger" onClick={() => void revoke(g)}>
                  Revoke
                </button>
              </span>
            )}
          </li>
        ))}
      </ul>
      <form class="stack" onSubmit={create}>
        <h3>Make a gateway</h3>
        <div class="grid2">
          <Field id="gw-name" label="Name" error={issues.get('name')}>
            <input id="gw-name" value={form.name} onInput={(e) => setForm({ ...form, name: e.currentTarget.value })} />
          </Field>
          <Field id="gw-user" label="MQTT username" error={issues.get('username')} help="3–64 characters: letters, digits, . _ -">
            <input id="gw-user" autocapitalize="none" spellcheck={false} value={form.username} onInput={(e) => setForm({ ...form, username: e.currentTarget.value })} />
          </Field>
        </div>
        <fieldset class="sensor-pick">
          <legend>Sensors it may publish for</legend>
          {issues.get('sensorKeys') ? <p class="field-error">{issues.get('sensorKeys')}</p> : null}
          {sensors.map((s) => (
            <label class="check" key={s.key}>
              <input
                type="checkbox"
                checked={form.sensorKeys.includes(s.key)}
                onChange={(e) => setForm({ ...form, sensorKeys: e.currentTarget.checked ? [...form.sensorKeys, s.key] : form.sensorKeys.filter((k) => k !== s.key) })}
              />
              {s.name} ({s.key})
            </label>
          ))}
        </fieldset>
        <button type="submit" class="primary">
          Make gateway
        </button>
      </form>
    </section>
  );
}

function ShownCredentials({ c, broker, sensors, onClose }: { c: Credentials; broker: { host: string; port: number | null; url: string | null }; sensors: SensorView[]; onClose: () => void }) {
  const key = c.gateway.sensorKeys[0] ?? 'SENSOR-KEY';
  const topic = sensors.find((s) => s.key === key)?.topic ?? `wind/${key}/reading`;
  const port = broker.port ?? 1883;
  const command = `mosquitto_pub -h ${broker.host} -p ${port} -u ${c.gateway.username} -P '${c.password}' -q 1 -t ${topic} -m '{"ts":'$(date +%s%3N)',"speed":7.5,"dir":240}'`;
  const [copied, setCopied] = useState('');
  const copy = (text: string, what: string) => {
    navigator.clipboard?.writeText(text).then(
      () => setCopied(what),
      () => setCopied(''),
    );
  };
  return (
    <div class="secret-box" role="alert">
      <h3>Password for {c.gateway.name}: shown once</h3>
      <p>Store it in the gateway now. It cannot be shown again; if it is lost, make a new one.</p>
      <p class="secret">
        <code data-testid="gateway-password">{c.password}</code>{' '}
        <button type="button" onClick={() => copy(c.password, 'password')}>
          Copy password
        </button>
      </p>
      <p>
        Username <code>{c.gateway.username}</code> · broker {broker.url ?? `${broker.host}:${port}`} · topics{' '}
        {c.gateway.sensorKeys.map((k) => (
          <code>{sensors.find((s) => s.key === k)?.topic ?? `wind/${k}/reading`} </code>
        ))}
      </p>
      <p>Try it (Mosquitto clients):</p>
      <pre class="command">{command}</pre>
      <div class="row">
        <button type="button" onClick={() => copy(command, 'command')}>
          Copy command
        </button>
        <button type="button" class="primary" onClick={onClose}>
          I have stored it
        </button>
      </div>
      {copied ? <p class="muted small">Copied the {copied}.</p> : null}
    </div>
  );
}
