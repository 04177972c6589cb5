/**
 * The frame around every screen: a slim header (site, connection, who is signed in), the screen,
 * and a bottom bar reachable with one thumb. Signed out: the sign-in or first-start screen.
 */
import { useEffect, useRef } from 'preact/hooks';
import { keepScreenOn, signalAlert } from './alarm.ts';
import { boardSummary, summaryText } from './boardSummary.ts';
import { live, onAlert, refreshSnapshot, startLive, stopLive, type Connection } from './live.ts';
import { onWorkerMessage } from './offline.ts';
import { href, navigate, useRoute } from './router.ts';
import { loadSite, site } from './site.ts';
import { may, roleNames, session } from './session.ts';
import { useStore } from './store.ts';
import { useNow } from './components/clock.ts';
import { duration } from './units.ts';
import { Board } from './screens/board.tsx';
import { StructurePage } from './screens/structure.tsx';
import { RegisterList } from './screens/registerList.tsx';
import { StructureForm } from './screens/structureForm.tsx';
import { SiteSettings } from './screens/siteSettings.tsx';
import { Sensors } from './screens/sensors.tsx';
import { LogScreen } from './screens/log.tsx';
import { Plan } from './screens/plan.tsx';
import { More } from './screens/more.tsx';
import { People } from './screens/people.tsx';
import { SiteLinks } from './screens/siteLinks.tsx';
import { FirstStart, SignIn } from './screens/signIn.tsx';
import { SetupChecklistScreen } from './screens/setupChecklist.tsx';
import { MyAlerts } from './screens/myAlerts.tsx';
import { AlertsOut } from './screens/alertsOut.tsx';

const tabs: Array<{ path: string; label: string; match: string[] }> = [
  { path: '/', label: 'Board', match: ['', 'structure'] },
  { path: '/register', label: 'Structures', match: ['register', 'site'] },
  { path: '/sensors', label: 'Sensors', match: ['sensors'] },
  { path: '/log', label: 'Log', match: ['log'] },
  { path: '/plan', label: 'Plan', match: ['plan'] },
  { path: '/more', label: 'More', match: ['more', 'people', 'links', 'setup', 'my-alerts', 'alerts-out'] },
];

const connectionText: Record<Connection, string> = {
  connecting: 'connecting…',
  open: 'live',
  reconnecting: 'reconnecting…',
  offline: 'offline',
};

function ConnectionPill() {
  const state = useStore(live);
  const now = useNow();
  const age = state.lastDataAtMs === null ? null : now - state.lastDataAtMs;
  const ok = state.connection === 'open';
  return (
    <span class={`pill ${ok ? 'pill-ok' : 'pill-bad'}`} role="status" aria-live="polite">
      <span class="pill-dot" aria-hidden="true" />
      {connectionText[state.connection]}
      {!ok && state.keptAtMs !== null ? <span class="pill-age"> · OLD copy, {duration(Math.max(0, now - state.keptAtMs))} old</span> : !ok && age !== null ? <span class="pill-age"> · data {duration(age)} old</span> : null}
    </span>
  );
}

/**
 * On every screen, the board included: the server cannot store (disk full, read-only folder) or
 * has lost its MQTT broker. Loud on purpose: the first means the log is at risk, the second that
 * no new wind arrives.
 */
function SystemTrouble() {
  const system = useStore(live).snapshot?.system;
  if (!system || (system.storageOk && system.brokerOk)) return null;
  return (
    <div class="system-trouble" role="alert">
      {!system.storageOk ? (
        <p>
          <strong>The server cannot store data</strong> ({system.storageError ?? 'database error'}). Alerts go on from memory; {system.storageBacklogRows} rows wait to be
          stored. Tell the site office: free the disk now.
        </p>
      ) : null}
      {!system.brokerOk ? (
        <p>
          <strong>No connection to the sensors' MQTT broker</strong> ({system.brokerState}). New wind readings cannot arrive: watch the wind by hand.
        </p>
      ) : null}
    </div>
  );
}

/**
 * On every screen but the board: open alerts are one tap away. Crew and above are asked to act;
 * a viewer (or a site link) is told the state in one calm line, since there is nothing for them
 * to acknowledge.
 */
function AlertStrip() {
  const snap = useStore(live).snapshot;
  const canAck = may(useStore(session), 'crew');
  const open = snap?.alerts.filter((a) => a.acknowledgedAtMs === null) ?? [];
  if (snap && !canAck) {
    const parts = boardSummary(snap.structures, snap.sensors, snap.atMs);
    if (!parts.some((p) => p.level > 0 || p.noData)) return null;
    return (
      <div class="state-strip" role="status">
        <a href={href('/')}>
          <span class="strip-what">On site now: {summaryText(parts)}.</span>
          <span class="strip-go">
            <span class="strip-go-text">Open the board </span>›
          </span>
        </a>
      </div>
    );
  }
  if (open.length === 0) return null;
  const first = open[0]!;
  // One line on a phone: what is open (cut with an ellipsis if need be) and where to go.
  return (
    <div class="alert-strip" role="alert">
      <a href={href('/')}>
        <span class="strip-what">
          ⚠ {open.length === 1 ? `Alert: ${first.subject} — ${first.label}` : `${open.length} alerts to acknowledge (latest: ${first.subject} — ${first.label})`}.
        </span>
        <span class="strip-go">
          <span class="strip-go-text">Open the board </span>›
        </span>
      </a>
    </div>
  );
}

function Screen() {
  const { parts } = useRoute();
  const s = useStore(session);
  const [first, second] = parts;
  switch (first ?? '') {
    case '':
    case 'board':
      return <Board />;
    case 'structure':
      return <StructurePage id={Number(second)} />;
    case 'register':
      // Keyed by the path part so a new form never starts from the last structure's draft.
      if (second === 'new') return <StructureForm key="new" id={null} />;
      if (second && /^[0-9]+$/.test(second)) return <StructureForm key={second} id={Number(second)} />;
      return <RegisterList />;
    case 'site':
      return <SiteSettings />;
    case 'sensors':
      return <Sensors />;
    case 'log':
      return <LogScreen />;
    case 'plan':
      return <Plan />;
    case 'more':
      return <More />;
    case 'people':
      return may(s, 'admin') ? <People /> : <Refused need="administrator" />;
    case 'links':
      return may(s, 'competent-person') ? <SiteLinks /> : <Refused need="competent person" />;
    case 'setup':
      return may(s, 'competent-person') ? <SetupChecklistScreen /> : <Refused need="competent person" />;
    case 'my-alerts':
      return <MyAlerts />;
    case 'alerts-out':
      return may(s, 'competent-person') ? <AlertsOut /> : <Refused need="competent person" />;
    default:
      return (
        <main id="main">
          <h1>Not found</h1>
          <p>
            There is no screen here. <a href={href('/')}>Go to the live board</a>.
          </p>
        </main>
      );
  }
}

function Refused({ need }: { need: string }) {
  return (
    <main id="main">
      <h1>Not for this role</h1>
      <p>This screen needs the {need} role. Ask an administrator if you need it.</p>
    </main>
  );
}

export function App() {
  const s = useStore(session);
  const { parts } = useRoute();
  const siteInfo = useStore(site);
  const signedIn = s.status === 'ready' && s.signedIn;
  // The first administrator, just created on the first-start screen, lands on the checklist.
  const fromFirstStart = useRef(false);
  if (s.status === 'ready' && !s.signedIn && s.setupPending) fromFirstStart.current = true;
  useEffect(() => {
    if (signedIn && fromFirstStart.current) {
      fromFirstStart.current = false;
      navigate('/setup');
    }
  }, [signedIn]);

  useEffect(() => {
    if (!signedIn) return;
    startLive();
    void loadSite();
    // Sound and vibration for every alert raised or signalled again while it is unacknowledged,
    // whichever screen is open.
    const off = onAlert((a) => {
      if (a.acknowledgedAtMs === null) signalAlert();
    });
    // A push shown or a notification's button pressed on this phone: the board catches up at once.
    const offWorker = onWorkerMessage(() => void refreshSnapshot());
    return () => {
      off();
      offWorker();
      stopLive();
    };
  }, [signedIn]);

  // The screen stays on while the live board (or a structure) is open.
  const onBoard = signedIn && (parts.length === 0 || parts[0] === 'board' || parts[0] === 'structure');
  useEffect(() => {
    keepScreenOn(onBoard);
    return () => keepScreenOn(false);
  }, [onBoard]);

  if (s.status === 'loading') {
    return (
      <main class="narrow" id="main">
        <p class="lead">Loading…</p>
      </main>
    );
  }
  if (s.status === 'error') {
    return (
      <main class="narrow" id="main">
        <h1>The server cannot be reached</h1>
        <p class="error-box">{s.message}</p>
        <button class="primary" onClick={() => location.reload()}>
          Try again
        </button>
      </main>
    );
  }
  if (!s.signedIn) return s.setupPending ? <FirstStart /> : <SignIn />;

  const current = parts[0] ?? '';
  return (
    <div class="shell">
      <a class="skip" href="#main">
        Skip to content
      </a>
      <header class="top">
        <div class="top-site">
          <span class="brand">Holdfast</span>
          <span class="site-name">{siteInfo?.name ?? live.get().snapshot?.site.name ?? ''}</span>
        </div>
        <ConnectionPill />
        <a class="who" href={href('/more')} title="Preferences and sign out">
          <span class="who-name">{s.person ? s.person.displayName : s.name}</span>
          <span class="role">{roleNames[s.role]}</span>
        </a>
      </header>
      <SystemTrouble />
      {!onBoard ? <AlertStrip /> : null}
      <Screen />
      <nav class="tabs" aria-label="Screens">
        {tabs.map((t) => {
          const active = t.match.includes(current);
          return (
            <a href={href(t.path)} class={active ? 'tab active' : 'tab'} aria-current={active ? 'page' : undefined}>
              {t.label}
            </a>
          );
        })}
      </nav>
    </div>
  );
}
