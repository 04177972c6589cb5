/**
 * Getting a new site ready: six steps (site settings, sensors and a gateway, structures, levels
 * and actions, people, a test publish), each ticked by the server from the register and the log
 * as they are (GET /api/setup/checklist, asked again every few seconds while the screen is open),
 * each with a link to the screen where it is done. The administrator lands here after the first
 * start; it can be hidden on a device, and opened again from More.
 */
import { useEffect, useState } from 'preact/hooks';
import { api, errorText } from '../api.ts';
import { href } from '../router.ts';
import { may, session, type SessionState } from '../session.ts';
import { useTimeZone } from '../site.ts';
import { createStore, useStore } from '../store.ts';
import type { ChecklistStepId, SetupChecklist } from '../types.ts';
import { dateTime } from '../units.ts';

/** While the checklist screen is open it asks again this often, so a step ticks as it happens. */
const pollMs = 3_000;
const hiddenKey = 'holdfast.checklist.hiddenForSite';

function loadHidden(): string | null {
  try {
    return localStorage.getItem(hiddenKey);
  } catch {
    return null;
  }
}

/** The site (by its creation time) whose checklist is hidden on this device, if any. */
export const checklistHidden = createStore<string | null>(loadHidden());

export function setChecklistHidden(siteCreatedAtMs: number | null): void {
  const value = siteCreatedAtMs === null ? null : String(siteCreatedAtMs);
  checklistHidden.set(value);
  try {
    if (value === null) localStorage.removeItem(hiddenKey);
    else localStorage.setItem(hiddenKey, value);
  } catch {
    // Storage refused: hidden for this visit only.
  }
}

interface StepText {
  title: string;
  what: string;
  link: (s: SessionState) => { path: string; label: string } | null;
}

const stepText: Record<ChecklistStepId, StepText> = {
  site: {
    title: 'Site settings: time zone, terrain, air density',
    what: 'Set the time zone the log and every screen use, the terrain category upwind of the site (it shapes how a gust changes with height) and how air density is found. Save once, even if the values shown are right.',
    link: () => ({ path: '/site', label: 'Open site settings' }),
  },
  sensors: {
    title: 'Sensors and a gateway',
    what: 'Register each anemometer with its key and mounting height, then make a gateway: the MQTT username and password that may publish for it. The password is shown once.',
    link: () => ({ path: '/sensors', label: 'Open sensors' }),
  },
  structures: {
    title: 'Structures',
    what: 'Register each marquee, fence run, screen or shell with its dimensions and ballast; the calculator shows its limit gust as you type.',
    link: () => ({ path: '/register', label: 'Open structures' }),
  },
  levels: {
    title: 'Levels and actions',
    what: 'Write what your crew does at each level: which walls close, which screen comes down, who clears which area. The wording Holdfast ships with is generic: change the site’s default levels, or give a structure levels of its own.',
    link: () => ({ path: '/site?section=levels', label: 'Open the default levels' }),
  },
  people: {
    title: 'People',
    what: 'Add the crew who acknowledge alerts and the competent person, each with a role. A steward who only watches can have a site link instead of an account.',
    link: (s) => (may(s, 'admin') ? { path: '/people', label: 'Open people and roles' } : { path: '/links', label: 'Open site links (an administrator adds people)' }),
  },
  publish: {
    title: 'A test publish',
    what: 'Send one reading from the gateway (the Sensors screen shows an example command with the new password) and check it arrives: the sensor shows its gust and “reporting”.',
    link: () => ({ path: '/sensors', label: 'Open sensors' }),
  },
};

/** The checklist from the server, asked again every `everyMs` (0: once). */
function useChecklist(everyMs: number, enabled: boolean): { list: SetupChecklist | null; error: string | null } {
  const [list, setList] = useState<SetupChecklist | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    if (!enabled) return;
    let stop = false;
    const load = () =>
      api<SetupChecklist>('/api/setup/checklist')
        .then((a) => {
          if (stop) return;
          setList(a);
          setError(null);
        })
        .catch((err) => {
          if (!stop) setError(errorText(err));
        });
    void load();
    const timer = everyMs > 0 ? setInterval(() => void load(), everyMs) : null;
    return () => {
      stop = true;
      if (timer) clearInterval(timer);
    };
  }, [everyMs, enabled]);
  return { list, error };
}

export function SetupChecklistScreen() {
  const s = useStore(session);
  const tz = useTimeZone();
  const hidden = useStore(checklistHidden);
  const { list, error } = useChecklist(pollMs, true);
  const total = list?.steps.length ?? 6;
  const isHidden = list !== null && hidden === String(list.siteCreatedAtMs);

  return (
    <main id="main" class="setup-checklist">
      <p class="crumbs">
        <a href={href('/more')}>← More</a>
      </p>
      <h1>Getting the site ready</h1>
      <p class="lead">
        Six steps before the event. Each ticks itself when Holdfast sees it done
        {list ? (
          <>
            : <strong data-testid="checklist-count">{list.doneCount} of {total} done</strong>.
          </>
        ) : (
          '.'
        )}
      </p>
      {error ? <p class="error-box">{error}</p> : null}
      {list === null && !error ? <p class="muted">Loading…</p> : null}
      {list && list.doneCount === total ? <p class="ok-box">All {total} steps are done: the site is ready to watch. You can hide this checklist.</p> : null}
      {list ? (
        <ol class="checklist">
          {list.steps.map((step, i) => {
            const text = stepText[step.id];
            const link = text.link(s);
            return (
              <li key={step.id} class={step.done ? 'step-done' : 'step-todo'} data-step={step.id} data-done={step.done ? 'yes' : 'no'}>
                <span class="step-mark" aria-hidden="true">
                  {step.done ? '✓' : i + 1}
                </span>
                <div class="step-body">
                  <h2 class="step-h">
                    {text.title}
                    <span class="step-state">{step.done ? ' — done' : ' — to do'}</span>
                  </h2>
                  <p class="step-now">
                    {step.atMs !== null ? `${step.detail.replace(/\.$/, '')}, timed ${dateTime(step.atMs, tz)}.` : step.detail}
                  </p>
                  {!step.done ? <p class="help">{text.what}</p> : null}
                  {link ? (
                    <a class={step.done ? 'button' : 'button primary'} href={href(link.path)}>
                      {link.label}
                    </a>
                  ) : null}
                </div>
              </li>
            );
          })}
        </ol>
      ) : null}
      {list ? (
        <div class="row">
          {isHidden ? (
            <>
              <p class="muted">Hidden from More on this device.</p>
              <button type="button" onClick={() => setChecklistHidden(null)}>
                Show it on More again
              </button>
            </>
          ) : (
            <button type="button" onClick={() => setChecklistHidden(list.siteCreatedAtMs)}>
              Hide this checklist on this device
            </button>
          )}
        </div>
      ) : null}
    </main>
  );
}

/**
 * One line for the top of a screen: how many steps are done and the way to the checklist, for a
 * competent person or administrator, until every step is done or it is hidden on this device.
 * Shown on More; a board may show it too.
 */
export function SetupChecklistSummary() {
  const s = useStore(session);
  const hidden = useStore(checklistHidden);
  const allowed = may(s, 'competent-person');
  const { list } = useChecklist(0, allowed);
  if (!allowed || !list || hidden === String(list.siteCreatedAtMs) || list.doneCount === list.steps.length) return null;
  const next = list.steps.find((x) => !x.done);
  return (
    <section class="checklist-summary" aria-label="Getting the site ready" data-testid="checklist-summary">
      <p>
        <strong>Getting the site ready: {list.doneCount} of {list.steps.length} done.</strong>
        {next ? <span> Next: {stepText[next.id].title.toLowerCase()}.</span> : null}
      </p>
      <div class="row">
        <a class="button primary" href={href('/setup')}>
          Open the checklist
        </a>
        <button type="button" onClick={() => setChecklistHidden(list.siteCreatedAtMs)}>
          Hide
        </button>
      </div>
    </section>
  );
}
