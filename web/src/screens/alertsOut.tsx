/**
 * Alerts out (competent person; from More): where the alerts go beyond the open board.
 * - Webhooks (SMS gateways, radio dispatch, chat): list, add with an address and a filter (the
 *   secret shown once, with a copy button), a test message with its result, switch off, new
 *   secret, remove. The one from ALERT_WEBHOOK_URL is listed, read-only.
 * - Escalation per level: after N minutes not acknowledged → a person or everyone with a role,
 *   then the next step; saved with PUT /api/notify/escalation; the steps taken lately.
 * - Deliveries: the newest first, each attempt's result, failures standing out (mark and words,
 *   not colour alone), filtered by status; refreshed every few seconds while the screen is open.
 */
import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import { ApiError, api, errorText, issuesByPath } from '../api.ts';
import { NotifyFilterEditor } from '../components/notifyFilterEditor.tsx';
import { TestSend } from '../components/testSend.tsx';
import {
  deliveryState,
  deliveryStatuses,
  escalationBody,
  eventWords,
  filterDraft,
  filterFromDraft,
  filterWords,
  levelName,
  moveStep,
  removeStep,
  roleGroupNames,
  stepDueMinutes,
  stepTargetWords,
  targetWords,
  type Delivery,
  type DeliveryStatus,
  type EscalationAnswer,
  type EscalationStep,
  type FilterDraft,
  type NotifyHealth,
  type TargetNames,
  type WebhookView,
} from '../notifyWords.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { useTimeZone } from '../site.ts';
import { useStore } from '../store.ts';
import type { Role } from '../types.ts';
import { dateTime, clockTime } from '../units.ts';
import { useLevelLabels, useStructureList } from './myAlerts.tsx';

const roleOrder: Role[] = ['crew', 'competent-person', 'admin', 'viewer'];

export function AlertsOut() {
  const s = useStore(session);
  const levelLabels = useLevelLabels();
  const structures = useStructureList();
  const [webhooks, setWebhooks] = useState<WebhookView[] | null>(null);
  const [people, setPeople] = useState<Map<number, string> | null>(null);
  const [reloadHooks, setReloadHooks] = useState(0);
  const [hookError, setHookError] = useState<string | null>(null);

  useEffect(() => {
    api<{ webhooks: WebhookView[] }>('/api/notify/webhooks')
      .then((a) => setWebhooks(a.webhooks))
      .catch((err) => setHookError(errorText(err)));
  }, [reloadHooks]);
  useEffect(() => {
    // Names of people for escalation steps and deliveries (id, name, role: GET /api/notify/people).
    api<{ people: Array<{ id: number; displayName: string }> }>('/api/notify/people')
      .then((a) => setPeople(new Map(a.people.map((p) => [p.id, p.displayName]))))
      .catch(() => setPeople(new Map()));
  }, []);

  if (s.status !== 'ready' || !s.signedIn) return null;
  const names: TargetNames = {
    webhooks: new Map((webhooks ?? []).map((w) => [String(w.id), w.name])),
    people: people ?? new Map(),
    meId: s.person?.id ?? null,
  };
  return (
    <main id="main" class="notify-screen">
      <p class="crumbs">
        <a href={href('/more')}>‹ More</a>
      </p>
      <h1>Alerts out</h1>
      <p class="lead-small">
        Where alerts go beyond the open board: webhooks to SMS gateways, radio dispatch or chat, e-mail to people (each sets theirs in <a href={href('/my-alerts')}>My alerts</a>), escalation when nobody
        acknowledges, and the result of every message.
      </p>
      <Webhooks list={webhooks} error={hookError} reload={() => setReloadHooks((n) => n + 1)} levelLabels={levelLabels} structures={structures} />
      <Escalation levelLabels={levelLabels} people={people ?? new Map()} canListPeople={may(s, 'admin')} />
      <Deliveries names={names} />
    </main>
  );
}

// ---------- webhooks ----------

function Webhooks(props: { list: WebhookView[] | null; error: string | null; reload: () => void; levelLabels: string[]; structures: Array<{ id: number; name: string }> }) {
  const { list, levelLabels, structures } = props;
  const [form, setForm] = useState<{ name: string; url: string; draft: FilterDraft }>({ name: '', url: '', draft: filterDraft({ kind: 'all' }) });
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [error, setError] = useState<string | null>(null);
  const [secret, setSecret] = useState<{ name: string; secret: string } | null>(null);
  const names = new Map(structures.map((x) => [x.id, x.name]));

  const add = async (e: Event) => {
    e.preventDefault();
    setError(null);
    setIssues(new Map());
    const built = filterFromDraft(form.draft);
    if (!('filter' in built)) {
      setError(`Not added: ${built.error}.`);
      return;
    }
    try {
      const a = await api<{ webhook: WebhookView; secret: string }>('/api/notify/webhooks', { body: { name: form.name.trim(), url: form.url.trim(), filter: built.filter } });
      setSecret({ name: a.webhook.name, secret: a.secret });
      setForm({ name: '', url: '', draft: filterDraft({ kind: 'all' }) });
      props.reload();
    } catch (err) {
      if (err instanceof ApiError) setIssues(issuesByPath(err.issues));
      setError(`Not added: ${errorText(err)}`);
    }
  };

  return (
    <section class="panel" aria-labelledby="hooks-h">
      <h2 id="hooks-h">Webhooks</h2>
      <p class="help">
        Every alert event (raised, signalled again, escalated, acknowledged, cleared, action overdue) that passes a webhook’s filter is POSTed to it as JSON, signed with its own secret
        (X-Signature: sha256= HMAC-SHA256 of “timestamp.body”), and retried when it does not answer 2xx.
      </p>
      {props.error ? <p class="error-box">The webhooks cannot be read: {props.error}</p> : null}
      {secret ? <ShownSecret name={secret.name} secret={secret.secret} onClose={() => setSecret(null)} /> : null}
      {list === null && !props.error ? <p>Loading…</p> : null}
      {list !== null && list.length === 0 ? <p class="muted">No webhooks yet.</p> : null}
      <ul class="plain-list hook-list">
        {(list ?? []).map((w) => (
          <li key={String(w.id)}>
            <WebhookItem w={w} filterText={filterWords(w.filter, levelLabels, names)} reload={props.reload} onSecret={(x) => setSecret({ name: w.name, secret: x })} levelLabels={levelLabels} structures={structures} />
          </li>
        ))}
      </ul>

      <form class="add-hook" onSubmit={(e) => void add(e)} noValidate>
        <h3>Add a webhook</h3>
        <div class={`field${issues.get('name') ? ' has-error' : ''}`}>
          <label for="hook-name">Name</label>
          <input id="hook-name" value={form.name} placeholder="SMS gateway in the site office" onInput={(e) => setForm({ ...form, name: e.currentTarget.value })} />
          {issues.get('name') ? <p class="field-error">{issues.get('name')}</p> : null}
        </div>
        <div class={`field${issues.get('url') ? ' has-error' : ''}`}>
          <label for="hook-url">Address (URL)</label>
          <input id="hook-url" type="url" inputMode="url" autoComplete="off" spellcheck={false} value={form.url} placeholder="https://gateway.site.example/alerts" onInput={(e) => setForm({ ...form, url: e.currentTarget.value })} />
          {issues.get('url') ? <p class="field-error">{issues.get('url')}</p> : null}
          <p class="help">http:// or https://. A gateway on the site network works without internet.</p>
        </div>
        <NotifyFilterEditor idBase="hook-filter" draft={form.draft} onChange={(draft) => setForm({ ...form, draft })} levelLabels={levelLabels} structures={structures} legend="Send it" />
        <div class="row">
          <button type="submit" class="primary" id="hook-add">
            Add webhook
          </button>
        </div>
        {error ? <p class="error-box">{error}</p> : null}
      </form>
    </section>
  );
}

function ShownSecret({ name, secret, onClose }: { name: string; secret: string; onClose: () => void }) {
  const [copied, setCopied] = useState<boolean | null>(null);
  const box = useRef<HTMLDivElement>(null);
  // Added from the form at the bottom: bring the secret into view, or a phone never shows it.
  useEffect(() => box.current?.scrollIntoView({ block: 'center' }), [secret]);
  return (
    <div class="secret-box" role="alert" data-testid="webhook-secret-box" ref={box}>
      <h3>Secret for {name}: shown once</h3>
      <p>Put it in the receiver now: it checks each message’s signature with it. It cannot be shown again; if it is lost, make a new one.</p>
      <p class="secret">
        <code data-testid="webhook-secret">{secret}</code>
      </p>
      <div class="row">
        <button
          type="button"
          onClick={() =>
            void (navigator.clipboard?.writeText(secret) ?? Promise.reject(new Error('no clipboard'))).then(
              () => setCopied(true),
              () => setCopied(false),
            )
          }
        >
          Copy secret
        </button>
        <button type="button" class="primary" onClick={onClose}>
          I have stored it
        </button>
      </div>
      {copied === true ? <p class="ok-text">✓ Copied.</p> : copied === false ? <p class="bad-text">✖ This browser did not allow copying: select the secret and copy it by hand.</p> : null}
    </div>
  );
}

function WebhookItem(props: { w: WebhookView; filterText: string; reload: () => void; onSecret: (secret: string) => void; levelLabels: string[]; structures: Array<{ id: number; name: string }> }) {
  const { w } = props;
  const [msg, setMsg] = useState<string | null>(null);
  const [editing, setEditing] = useState<FilterDraft | null>(null);
  const fromEnv = w.source === 'environment';
  const patch = async (body: Record<string, unknown>): Promise<{ secret?: string } | null> => {
    setMsg(null);
    try {
      const a = await api<{ secret?: string }>(`/api/notify/webhooks/${w.id}`, { method: 'PATCH', body });
      props.reload();
      return a;
    } catch (err) {
      setMsg(errorText(err));
      return null;
    }
  };
  const remove = async () => {
    if (!confirm(`Remove the webhook ${w.name}? Messages still waiting for it are given up.`)) return;
    try {
      await api(`/api/notify/webhooks/${w.id}`, { method: 'DELETE' });
      props.reload();
    } catch (err) {
      setMsg(errorText(err));
    }
  };
  const saveFilter = async () => {
    if (!editing) return;
    const built = filterFromDraft(editing);
    if (!('filter' in built)) {
      setMsg(built.error);
      return;
    }
    if (await patch({ filter: built.filter })) setEditing(null);
  };
  return (
    <article class={`hook${w.enabled ? '' : ' hook-off'}`} data-testid={`hook-${w.id}`}>
      <h3 class="hook-name">
        {w.name} {w.enabled ? null : <span class="tag-off">switched off</span>}
      </h3>
      <p class="hook-url">
        <code>{w.url}</code>
      </p>
      <p class="small">
        Gets {props.filterText}.{fromEnv ? ' Set in the server’s configuration (ALERT_WEBHOOK_URL, ALERT_WEBHOOK_SECRET): change it there.' : ''}
      </p>
      {w.enabled ? (
        <TestSend
          idBase={`hook-${w.id}`}
          label="Send a test message"
          canSeeDeliveries
          lookFor="See Deliveries below."
          send={async () => (await api<{ deliveryId: string }>(`/api/notify/webhooks/${w.id}/test`, { method: 'POST', body: {} })).deliveryId}
        />
      ) : null}
      {!fromEnv ? (
        <div class="row hook-actions">
          <button type="button" onClick={() => setEditing(editing ? null : filterDraft(w.filter))} aria-expanded={editing !== null}>
            Change filter
          </button>
          <button type="button" onClick={() => void patch({ enabled: !w.enabled })}>
            {w.enabled ? 'Switch off' : 'Switch on'}
          </button>
          <button
            type="button"
            onClick={async () => {
              if (!confirm(`Make a new secret for ${w.name}? The old one stops working at once.`)) return;
              const a = await patch({ renewSecret: true });
              if (a?.secret) props.onSecret(a.secret);
            }}
          >
            New secret
          </button>
          <button type="button" class="danger" onClick={() => void remove()}>
            Remove
          </button>
        </div>
      ) : null}
      {editing ? (
        <div class="hook-edit">
          <NotifyFilterEditor idBase={`hook-${w.id}-filter`} draft={editing} onChange={setEditing} levelLabels={props.levelLabels} structures={props.structures} legend="Send it" />
          <div class="row">
            <button type="button" class="primary" onClick={() => void saveFilter()}>
              Save filter
            </button>
            <button type="button" onClick={() => setEditing(null)}>
              Cancel
            </button>
          </div>
        </div>
      ) : null}
      {msg ? <p class="error-box">{msg}</p> : null}
    </article>
  );
}

// ---------- escalation ----------

interface StepDraft {
  afterMinutes: string;
  /** "role:crew" or "person:3". */
  target: string;
}

const draftOf = (s: EscalationStep): StepDraft => ({ afterMinutes: String(s.afterMinutes), target: s.role !== undefined ? `role:${s.role}` : `person:${s.personId}` });
function stepOf(d: StepDraft): EscalationStep {
  const minutes = d.afterMinutes.trim() === '' ? Number.NaN : Number(d.afterMinutes);
  const [kind, rest = ''] = d.target.split(':');
  // NaN goes out as null: the server names the field and says it must be minutes.
  return kind === 'role' ? { afterMinutes: minutes, role: rest as Role } : { afterMinutes: minutes, personId: Number(rest) };
}

function Escalation({ levelLabels, people, canListPeople }: { levelLabels: string[]; people: ReadonlyMap<number, string>; canListPeople: boolean }) {
  const tz = useTimeZone();
  const [chains, setChains] = useState<Map<number, StepDraft[]> | null>(null);
  const [savedJson, setSavedJson] = useState('');
  const [recent, setRecent] = useState<EscalationAnswer['recent']>([]);
  const [error, setError] = useState<string | null>(null);
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [reload, setReload] = useState(0);

  useEffect(() => {
    api<EscalationAnswer>('/api/notify/escalation')
      .then((a) => {
        const m = new Map(a.chains.map((c) => [c.level, c.steps.map(draftOf)]));
        setChains(m);
        setSavedJson(JSON.stringify(escalationBody(new Map([...m].map(([l, st]) => [l, st.map(stepOf)])))));
        setRecent(a.recent);
      })
      .catch((err) => setError(errorText(err)));
  }, [reload]);

  const levels = useMemo(() => {
    const n = Math.max(levelLabels.length, ...[...(chains?.keys() ?? [])]);
    return Array.from({ length: n }, (_, i) => i + 1);
  }, [levelLabels.length, chains]);

  if (error) return <section class="panel"><h2>Escalation</h2><p class="error-box">The escalation chains cannot be read: {error}</p></section>;
  if (!chains) return <section class="panel"><h2>Escalation</h2><p>Loading…</p></section>;

  const body = escalationBody(new Map([...chains].map(([l, st]) => [l, st.map(stepOf)])));
  const dirty = JSON.stringify(body) !== savedJson;
  const setSteps = (level: number, steps: StepDraft[]) => {
    const next = new Map(chains);
    next.set(level, steps);
    setChains(next);
    setMsg(null);
    setIssues(new Map());
  };
  // Issues come back by the body's chain index: find the level each one is about.
  const issueAt = (level: number, i: number, field: string): string | undefined => {
    const ci = body.chains.findIndex((c) => c.level === level);
    return ci < 0 ? undefined : (issues.get(`chains.${ci}.steps.${i}.${field}`) ?? (field === 'personId' ? issues.get(`chains.${ci}.steps.${i}`) : undefined));
  };
  const save = async () => {
    setMsg(null);
    setIssues(new Map());
    try {
      await api('/api/notify/escalation', { method: 'PUT', body });
      setMsg({ ok: true, text: 'Saved.' });
      setReload((n) => n + 1);
    } catch (err) {
      if (err instanceof ApiError) setIssues(issuesByPath(err.issues));
      setMsg({ ok: false, text: `Not saved: ${errorText(err)}` });
    }
  };

  // The people a step may name: those the administrator's list gives, and any already named.
  const personOptions = new Map(people);
  for (const steps of chains.values()) for (const st of steps) if (st.target.startsWith('person:')) {
    const id = Number(st.target.slice(7));
    if (!personOptions.has(id)) personOptions.set(id, `person ${id}`);
  }

  return (
    <section class="panel" aria-labelledby="esc-h">
      <h2 id="esc-h">Escalation when nobody acknowledges</h2>
      <p class="help">
        An alert of a level not acknowledged within a step’s minutes goes to that step’s person or role by e-mail and push (whatever their own choice in My alerts) and to the webhooks, then after the
        next step’s minutes more to the next. Each step taken is in the log. A step reaches only people who have set up e-mail or push. A role means the people holding exactly that role (an
        administrator is not counted as a competent person here).
      </p>
      {!canListPeople ? <p class="help">Only an administrator can list people by name: here a step names a role.</p> : null}
      {levels.map((level) => {
        const steps = chains.get(level) ?? [];
        const due = stepDueMinutes(steps.map((st) => ({ afterMinutes: Number(st.afterMinutes) || 0 })));
        return (
          <fieldset class="esc-level" data-testid={`esc-level-${level}`}>
            <legend>{levelName(level, levelLabels).replace(/^l/, 'L')}</legend>
            {steps.length === 0 ? <p class="muted">No escalation: the alert stays with whoever gets it.</p> : null}
            <ol class="esc-steps">
              {steps.map((st, i) => {
                const minutesIssue = issueAt(level, i, 'afterMinutes');
                const targetIssue = issueAt(level, i, 'personId') ?? issueAt(level, i, 'role');
                const idBase = `esc-${level}-${i}`;
                return (
                  <li class="esc-step">
                    <p class="esc-step-head">
                      <strong>Step {i + 1}</strong> <span class="muted">· {due[i] ? `${due[i]} min after the alert` : 'time not set'}</span>
                    </p>
                    <div class="esc-step-fields">
                      <div class={`field${minutesIssue ? ' has-error' : ''}`}>
                        <label for={`${idBase}-min`}>Not acknowledged after (minutes{i > 0 ? ' more' : ''})</label>
                        <input id={`${idBase}-min`} type="number" inputMode="numeric" min={1} max={1440} step={1} value={st.afterMinutes} onInput={(e) => setSteps(level, steps.map((x, j) => (j === i ? { ...x, afterMinutes: e.currentTarget.value } : x)))} />
                        {minutesIssue ? <p class="field-error">{minutesIssue}</p> : null}
                      </div>
                      <div class={`field${targetIssue ? ' has-error' : ''}`}>
                        <label for={`${idBase}-to`}>Send it to</label>
                        <select id={`${idBase}-to`} value={st.target} onChange={(e) => setSteps(level, steps.map((x, j) => (j === i ? { ...x, target: e.currentTarget.value } : x)))}>
                          <optgroup label="Everyone with a role">
                            {roleOrder.map((r) => (
                              <option value={`role:${r}`}>{roleGroupNames[r]}</option>
                            ))}
                          </optgroup>
                          {personOptions.size > 0 ? (
                            <optgroup label="A person">
                              {[...personOptions].map(([id, name]) => (
                                <option value={`person:${id}`}>{name}</option>
                              ))}
                            </optgroup>
                          ) : null}
                        </select>
                        {targetIssue ? <p class="field-error">{targetIssue}</p> : null}
                      </div>
                    </div>
                    <div class="row esc-step-actions">
                      <button type="button" disabled={i === 0} onClick={() => setSteps(level, moveStep(steps, i, -1))} aria-label={`Move step ${i + 1} of ${levelName(level, levelLabels)} up`}>
                        ↑ Up
                      </button>
                      <button type="button" disabled={i === steps.length - 1} onClick={() => setSteps(level, moveStep(steps, i, 1))} aria-label={`Move step ${i + 1} of ${levelName(level, levelLabels)} down`}>
                        ↓ Down
                      </button>
                      <button type="button" class="danger" onClick={() => setSteps(level, removeStep(steps, i))} aria-label={`Remove step ${i + 1} of ${levelName(level, levelLabels)}`}>
                        Remove
                      </button>
                    </div>
                  </li>
                );
              })}
            </ol>
            <button type="button" onClick={() => setSteps(level, [...steps, { afterMinutes: steps.length === 0 ? '5' : '10', target: 'role:competent-person' }])} disabled={steps.length >= 10}>
              + Add a step to {levelName(level, levelLabels)}
            </button>
          </fieldset>
        );
      })}
      <div class="sticky-save">
        <button type="button" class="primary" id="esc-save" onClick={() => void save()} disabled={!dirty}>
          Save escalation
        </button>
        <span role="status" aria-live="polite">
          {msg ? <span class={msg.ok ? 'ok-text' : 'bad-text'}>{msg.ok ? '✓ ' : '✖ '}{msg.text}</span> : dirty ? <span class="muted">Changes not saved yet.</span> : null}
        </span>
      </div>
      {recent.length > 0 ? (
        <details class="esc-recent">
          <summary>Steps taken lately ({recent.length})</summary>
          <ul class="plain-list">
            {recent.map((r) => (
              <li>
                {dateTime(r.atMs, tz)} · alert {r.alertId}, step {r.step} → {r.target.startsWith('role:') ? roleGroupNames[r.target.slice(5) as Role] ?? r.target : stepTargetWords({ personId: Number(r.target.slice(7)) }, people)}: {r.reached}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </section>
  );
}

// ---------- deliveries ----------

const refreshEveryMs = 5_000;

function Deliveries({ names }: { names: TargetNames }) {
  const tz = useTimeZone();
  const [status, setStatus] = useState<DeliveryStatus | 'problems' | null>(null);
  const [answer, setAnswer] = useState<(NotifyHealth & { deliveries: Delivery[] }) | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [tick, setTick] = useState(0);

  useEffect(() => {
    let stopped = false;
    // "Not getting through" is worked out here: given up, or waiting after a failed attempt.
    const q = status && status !== 'problems' ? `&status=${status}` : '';
    api<NotifyHealth & { deliveries: Delivery[] }>(`/api/notify/deliveries?limit=${status === 'problems' ? 500 : 100}${q}`)
      .then((a) => {
        if (stopped) return;
        setAnswer(a);
        setError(null);
      })
      .catch((err) => !stopped && setError(errorText(err)));
    const t = window.setTimeout(() => setTick((n) => n + 1), refreshEveryMs);
    return () => {
      stopped = true;
      clearTimeout(t);
    };
  }, [status, tick]);

  const time = (ms: number) => clockTime(ms, tz);
  const nowMs = Date.now();
  const rows = (answer?.deliveries ?? []).map((d) => ({ d, st: deliveryState(d, nowMs, time) })).filter((r) => status !== 'problems' || r.st.tone === 'bad');
  return (
    <section class="panel" aria-labelledby="deliv-h">
      <h2 id="deliv-h">Deliveries</h2>
      {answer ? (
        <p class={answer.failed > 0 ? 'deliv-counts has-failed' : 'deliv-counts'} data-testid="delivery-counts">
          {answer.failed > 0 ? <strong class="bad-text">✖ {answer.failed} failed (given up)</strong> : <span>✓ none given up</span>} · {answer.pending} waiting · e-mail {answer.email ? 'set up' : 'not set up (SMTP_URL)'} ·{' '}
          {answer.webhooks ?? 0} webhook{answer.webhooks === 1 ? '' : 's'} on
          {answer.lastError ? (
            <span class="small">
              {' '}
              · last error {dateTime(answer.lastError.atMs, tz)}: {answer.lastError.target === '*' ? '' : `${targetWords(answer.lastError.channel, answer.lastError.target, names)}: `}
              {answer.lastError.result}
            </span>
          ) : null}
        </p>
      ) : null}
      <div class="seg wrap" role="group" aria-label="Show deliveries">
        {([null, 'problems', ...deliveryStatuses] as Array<DeliveryStatus | 'problems' | null>).map((st) => (
          <button type="button" class={status === st ? 'on' : ''} aria-pressed={status === st} onClick={() => setStatus(st)}>
            {st === null ? 'All' : st === 'problems' ? 'Not getting through' : st === 'pending' ? 'Waiting' : st === 'delivered' ? 'Delivered' : 'Given up'}
          </button>
        ))}
      </div>
      {error ? <p class="error-box">The deliveries cannot be read: {error}</p> : null}
      {answer && rows.length === 0 ? <p class="muted">{status ? 'None here.' : 'No deliveries yet.'}</p> : null}
      <ul class="plain-list delivery-list" data-testid="delivery-list">
        {rows.map(({ d, st }) => {
          return (
            <li key={d.id} class={`delivery dtone-${st.tone}`} data-testid="delivery" data-status={d.status}>
              <p class="delivery-state">
                <span aria-hidden="true">{st.mark} </span>
                <strong>{st.words}</strong>
              </p>
              <p class="delivery-what">
                {eventWords(d.event)}
                {d.alertId !== null ? ` · alert ${d.alertId}` : ''} · {targetWords(d.channel, d.target, names)} · queued {dateTime(d.createdAtMs, tz)}
              </p>
              {d.attemptLog.length > 0 ? (
                <details class="delivery-attempts" open={st.tone === 'bad'}>
                  <summary>
                    {d.attemptLog.length} attempt{d.attemptLog.length === 1 ? '' : 's'}
                  </summary>
                  <ol class="attempt-list">
                    {d.attemptLog.map((a) => (
                      <li class={a.ok ? 'attempt-ok' : 'attempt-bad'}>
                        {time(a.atMs)}: {a.ok ? '✓' : '✖'} {a.result} <span class="muted">({a.durationMs} ms)</span>
                      </li>
                    ))}
                  </ol>
                </details>
              ) : null}
            </li>
          );
        })}
      </ul>
    </section>
  );
}
