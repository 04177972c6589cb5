/**
 * My alerts (every signed-in person; not site links): how alerts reach me when my phone is in a
 * pocket — push on this phone, e-mail — which alerts (every alert, from a level up, or chosen
 * structures), and a test message per channel with its result. It says first, plainly, what
 * reaches a locked phone, and that the board only sounds while it is open.
 *
 * API: GET/PATCH /api/me/notifications, POST /api/me/notifications/test; push through
 * pushChoice.ts over push.ts (GET /api/push/key decides whether this server has push at all).
 */
import { useEffect, useMemo, useState } from 'preact/hooks';
import { ApiError, api, errorText, issuesByPath } from '../api.ts';
import { described } from '../components/field.tsx';
import { NotifyFilterEditor } from '../components/notifyFilterEditor.tsx';
import { TestSend } from '../components/testSend.tsx';
import { live } from '../live.ts';
import { filterDraft, filterFromDraft, filterWords, lockedPhoneWords, type FilterDraft, type MyNotifications, type PushChoiceState } from '../notifyWords.ts';
import { pushStatus, removeDevice, switchPushOff, switchPushOn, testPush, type PushStatus } from '../pushChoice.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { site } from '../site.ts';
import { useStore } from '../store.ts';

/** The site's level labels (level n is the n-th), one more unnamed level per level a structure has beyond them. */
export function useLevelLabels(): string[] {
  const s = useStore(site);
  const snap = useStore(live).snapshot;
  const labels = (s?.defaultLevels ?? []).map((l) => l.label);
  const most = Math.max(labels.length, ...(snap?.structures ?? []).map((x) => x.levels.length));
  return Array.from({ length: most }, (_, i) => labels[i] ?? '');
}

/** The registered structures as the live board knows them, by name. */
export function useStructureList(): Array<{ id: number; name: string }> {
  const snap = useStore(live).snapshot;
  return useMemo(() => (snap?.structures ?? []).map((x) => ({ id: x.id, name: x.name })).sort((a, b) => a.name.localeCompare(b.name)), [snap?.structures]);
}

export function MyAlerts() {
  const s = useStore(session);
  const levelLabels = useLevelLabels();
  const structures = useStructureList();
  const [saved, setSaved] = useState<MyNotifications | null>(null);
  const [email, setEmail] = useState('');
  const [draft, setDraft] = useState<FilterDraft>(filterDraft({ kind: 'all' }));
  const [loadError, setLoadError] = useState<string | null>(null);
  const [saveMsg, setSaveMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [push, setPush] = useState<PushStatus>({ state: 'checking' });

  useEffect(() => {
    api<MyNotifications>('/api/me/notifications')
      .then((a) => {
        setSaved(a);
        setEmail(a.email ?? '');
        setDraft(filterDraft(a.filter));
      })
      .catch((err) => setLoadError(errorText(err)));
    void pushStatus().then(setPush);
  }, []);

  if (s.status !== 'ready' || !s.signedIn) return null;
  if (s.kind !== 'person') {
    return (
      <main id="main">
        <h1>My alerts</h1>
        <p class="note-box">Alerts by push and e-mail belong to a person: sign in with your own account to set them up. A site link shows the board only while it is open.</p>
      </main>
    );
  }

  const names = new Map(structures.map((x) => [x.id, x.name]));
  const built = filterFromDraft(draft);
  const savedFilterText = saved ? filterWords(saved.filter, levelLabels, names) : '';
  const dirty = saved !== null && (email.trim() !== (saved.email ?? '') || !('filter' in built) || JSON.stringify(built.filter) !== JSON.stringify(saved.filter));
  const locked = saved ? lockedPhoneWords({ push: push.state, otherPushDevices: push.otherDevices?.length ?? 0, email: saved.email, emailAvailable: saved.emailAvailable, filterText: savedFilterText }) : null;

  const save = async (e: Event) => {
    e.preventDefault();
    setSaveMsg(null);
    setIssues(new Map());
    if (!('filter' in built)) {
      setSaveMsg({ ok: false, text: `Not saved: ${built.error}.` });
      return;
    }
    try {
      const a = await api<MyNotifications>('/api/me/notifications', { method: 'PATCH', body: { email: email.trim() === '' ? null : email.trim(), filter: built.filter } });
      setSaved(a);
      setEmail(a.email ?? '');
      setDraft(filterDraft(a.filter));
      setSaveMsg({ ok: true, text: 'Saved.' });
    } catch (err) {
      if (err instanceof ApiError) setIssues(issuesByPath(err.issues));
      setSaveMsg({ ok: false, text: `Not saved: ${errorText(err)}` });
    }
  };

  const emailIssue = issues.get('email');
  return (
    <main id="main" class="notify-screen">
      <p class="crumbs">
        <a href={href('/more')}>‹ More</a>
      </p>
      <h1>My alerts</h1>
      {loadError ? <p class="error-box">Your alert settings cannot be read: {loadError}</p> : null}

      <section class="panel locked-panel" aria-labelledby="locked-h">
        <h2 id="locked-h">When your phone is locked</h2>
        {locked === null ? (
          <p>Loading…</p>
        ) : (
          <>
            {locked.nothing ? (
              <p class="error-box" data-testid="locked-nothing">
                <strong>Nothing reaches you when your phone is locked or this page is closed.</strong> Set up push or e-mail below.
              </p>
            ) : null}
            {locked.lines.length > 0 ? (
              <ul class="plain-list locked-list" data-testid="locked-lines">
                {locked.lines.map((l) => (
                  <li class={l.reaches ? 'reaches' : 'reaches-not'}>
                    <span aria-hidden="true">{l.reaches ? '✓ ' : '✖ '}</span>
                    {l.text}
                  </li>
                ))}
              </ul>
            ) : null}
          </>
        )}
        <p class="board-only">
          <strong>The board itself alerts only while it is open:</strong> its sound and vibration work only with the board on screen and the phone awake. In a pocket, only push and e-mail reach you.
        </p>
      </section>

      <section class="panel" aria-labelledby="push-h">
        <h2 id="push-h">Push on this phone</h2>
        <PushPanel push={push} setPush={setPush} canSeeDeliveries={may(s, 'competent-person')} />
      </section>

      <form onSubmit={(e) => void save(e)} noValidate>
        <section class="panel" aria-labelledby="mail-h">
          <h2 id="mail-h">E-mail</h2>
          {saved && !saved.emailAvailable ? (
            <p class="note-box" data-testid="email-unavailable">
              This server cannot send e-mail yet (SMTP_URL is not set): you can save your address, but nothing goes out by e-mail until the site office sets it up.
            </p>
          ) : null}
          <div class={`field${emailIssue ? ' has-error' : ''}`}>
            <label for="my-email">Your e-mail address</label>
            <input
              id="my-email"
              type="email"
              inputMode="email"
              autoComplete="email"
              value={email}
              placeholder="name@site.example"
              aria-invalid={emailIssue ? true : undefined}
              aria-describedby={described('my-email', true, Boolean(emailIssue))}
              onInput={(e) => setEmail(e.currentTarget.value)}
            />
            {emailIssue ? (
              <p class="field-error" id="my-email-err" role="alert">
                {emailIssue}
              </p>
            ) : null}
            <p class="help" id="my-email-help">
              Leave it empty to get no e-mail. The message starts with the action, then the structure, level and gust, then an acknowledge link.
            </p>
          </div>
        </section>

        <section class="panel" aria-labelledby="filter-h">
          <h2 id="filter-h">Which alerts reach me</h2>
          <NotifyFilterEditor idBase="my-filter" draft={draft} onChange={setDraft} levelLabels={levelLabels} structures={structures} legend="Send me" />
          <p class="help">The same choice applies to push and e-mail. An escalation step set by the competent person reaches you whatever you choose here.</p>
        </section>

        <div class="sticky-save">
          <button type="submit" class="primary" id="my-save" disabled={saved === null}>
            Save my alerts
          </button>
          <span role="status" aria-live="polite">
            {saveMsg ? <span class={saveMsg.ok ? 'ok-text' : 'bad-text'}>{saveMsg.ok ? '✓ ' : '✖ '}{saveMsg.text}</span> : dirty ? <span class="muted">Changes not saved yet.</span> : null}
          </span>
        </div>
      </form>

      <section class="panel" aria-labelledby="mail-test-h">
        <h2 id="mail-test-h">Test e-mail</h2>
        <TestSend
          idBase="my-email"
          label="Send me a test e-mail"
          canSeeDeliveries={may(s, 'competent-person')}
          disabledReason={saved === null ? 'Loading…' : !saved.email ? 'Save your e-mail address first.' : !saved.emailAvailable ? 'E-mail is not set up on this server.' : dirty ? 'Save your changes first.' : null}
          lookFor={`Look in the inbox of ${saved?.email ?? 'your address'} in a minute (and the spam folder). If nothing arrives, check the address and ask the competent person to look at Alerts out.`}
          send={async () => (await api<{ deliveryId: string }>('/api/me/notifications/test', { method: 'POST', body: {} })).deliveryId}
        />
      </section>
    </main>
  );
}

const pushWords: Record<PushChoiceState, string> = {
  checking: 'Checking whether this phone can take push messages…',
  'no-server': 'Push is not available yet on this server. Use e-mail for now.',
  'no-browser': 'This browser cannot take push messages.',
  blocked: 'Notifications are blocked for this site on this phone.',
  off: 'Off: this phone gets no push messages.',
  on: 'On: this phone gets push messages, even when it is locked.',
  error: 'Cannot tell whether push is on',
};

function PushPanel({ push, setPush, canSeeDeliveries }: { push: PushStatus; setPush: (p: PushStatus) => void; canSeeDeliveries: boolean }) {
  const [busy, setBusy] = useState(false);
  const [msg, setMsg] = useState<string | null>(null);
  const run = async (what: string, action: () => Promise<unknown>) => {
    setBusy(true);
    setMsg(null);
    try {
      await action();
    } catch (err) {
      setMsg(`${what}: ${errorText(err)}`);
    }
    setPush(await pushStatus());
    setBusy(false);
  };
  const usable = push.state === 'on' || push.state === 'off';
  const others = push.otherDevices ?? [];
  return (
    <>
      <p class={`push-state push-${push.state}`} data-testid="push-state">
        <strong>
          {push.state === 'on' ? '✓ ' : push.state === 'off' ? '○ ' : push.state === 'checking' ? '' : '— '}
          {pushWords[push.state]}
          {push.state === 'error' && push.message ? `: ${push.message}` : ''}
        </strong>
        {push.state !== 'error' && push.message ? <span class="push-reason"> {push.message}</span> : null}
      </p>
      {usable ? (
        <div class="row">
          <button
            type="button"
            class={push.state === 'on' ? '' : 'primary'}
            disabled={busy}
            onClick={() => void (push.state === 'on' ? run('Push was not switched off', switchPushOff) : run('Push was not switched on', switchPushOn))}
          >
            {push.state === 'on' ? 'Switch push off on this phone' : 'Switch push on for this phone'}
          </button>
        </div>
      ) : null}
      {push.state === 'off' ? <p class="help">The phone asks whether this site may show notifications: answer Allow.</p> : null}
      {msg ? <p class="error-box">{msg}</p> : null}
      {push.state === 'on' && push.thisDevice ? (
        <TestSend idBase="my-push" label="Send me a test push" canSeeDeliveries={canSeeDeliveries} lookFor="It should show on this phone within seconds, locked or not." send={() => testPush(push.thisDevice!.id)} />
      ) : null}
      {others.length > 0 ? (
        <>
          <h3 class="small-h">Your other devices with push</h3>
          <ul class="plain-list push-devices">
            {others.map((d) => (
              <li key={d.id}>
                <strong>{d.label}</strong> <span class="muted small">({d.service || 'push service'})</span>{' '}
                <button type="button" class="danger" disabled={busy} onClick={() => void (confirm(`Stop push to ${d.label}?`) && run(`Push to ${d.label} was not stopped`, () => removeDevice(d.id)))}>
                  Stop push there
                </button>
              </li>
            ))}
          </ul>
        </>
      ) : null}
      <p class="help">Push goes through the phone maker’s push service on the internet: on a site network without internet it cannot arrive, and e-mail to a local mail server is the way.</p>
    </>
  );
}
