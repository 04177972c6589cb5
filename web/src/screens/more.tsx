/**
 * Preferences for this device (speed unit, theme, alarm), who is signed in, sign-out, and the
 * ways to people, site links and site settings for the roles that have them; the first-start
 * checklist's progress on top until it is done or hidden (competent person, administrator).
 */
import { api, errorText } from '../api.ts';
import { armSound, beep, soundArmed } from '../alarm.ts';
import { prefs, setPref, type Theme } from '../prefs.ts';
import { href } from '../router.ts';
import { may, roleNames, session, signOut } from '../session.ts';
import { useStore } from '../store.ts';
import { speedUnitLabels, speedUnits } from '../units.ts';
import { useState } from 'preact/hooks';
import { SetupChecklistSummary } from './setupChecklist.tsx';

export function More() {
  const p = useStore(prefs);
  const s = useStore(session);
  const armed = useStore(soundArmed);
  const [msg, setMsg] = useState<string | null>(null);
  if (s.status !== 'ready' || !s.signedIn) return null;

  const everywhere = async () => {
    if (!confirm('Sign out on every device where you are signed in?')) return;
    try {
      await api('/api/session/everywhere', { method: 'POST' });
      location.reload();
    } catch (err) {
      setMsg(errorText(err));
    }
  };

  return (
    <main id="main">
      <h1>More</h1>
      <SetupChecklistSummary />
      <section class="panel" aria-labelledby="who-h">
        <h2 id="who-h">Signed in</h2>
        <p>
          <strong>{s.person ? s.person.displayName : s.name}</strong>
          {s.person ? <span class="muted"> (username {s.person.username})</span> : null} — {roleNames[s.role]}
          {s.kind === 'link' ? ' (site link: read-only board and log)' : ''}
        </p>
        <div class="row">
          <button type="button" onClick={() => void signOut()}>
            Sign out
          </button>
          {s.kind === 'person' ? (
            <button type="button" onClick={() => void everywhere()}>
              Sign out everywhere
            </button>
          ) : null}
        </div>
        {msg ? <p class="error-box">{msg}</p> : null}
      </section>

      {s.kind === 'person' ? (
        <section class="panel" aria-labelledby="alerts-h">
          <h2 id="alerts-h">Alerts when the board is closed</h2>
          <ul class="plain-list link-list">
            <li>
              <a href={href('/my-alerts')}>My alerts: push on this phone, e-mail, which alerts</a>
            </li>
            {may(s, 'competent-person') ? (
              <li>
                <a href={href('/alerts-out')}>Alerts out: webhooks, escalation, deliveries</a>
              </li>
            ) : null}
          </ul>
        </section>
      ) : null}

      <section class="panel" aria-labelledby="pref-h">
        <h2 id="pref-h">This device</h2>
        <fieldset class="inline-radios">
          <legend>Speed unit</legend>
          {speedUnits.map((u) => (
            <label class="check">
              <input type="radio" name="unit" checked={p.unit === u} onChange={() => setPref('unit', u)} />
              {speedUnitLabels[u]}
            </label>
          ))}
        </fieldset>
        <p class="help">Beaufort force is shown beside mean winds whatever the unit.</p>
        <fieldset class="inline-radios">
          <legend>Theme</legend>
          {(
            [
              ['system', 'follow the phone'],
              ['light', 'light (bright sun)'],
              ['dark', 'dark (night)'],
            ] as Array<[Theme, string]>
          ).map(([t, label]) => (
            <label class="check">
              <input type="radio" name="theme" checked={p.theme === t} onChange={() => setPref('theme', t)} />
              {label}
            </label>
          ))}
        </fieldset>
        <fieldset class="inline-radios">
          <legend>Alarm on a new alert</legend>
          <label class="check">
            <input
              type="checkbox"
              checked={p.alarmSound}
              onChange={(e) => {
                setPref('alarmSound', e.currentTarget.checked);
                if (e.currentTarget.checked) void armSound();
              }}
            />
            Sound {p.alarmSound && !armed ? '(tap “Test alarm” to allow it)' : ''}
          </label>
          <label class="check">
            <input type="checkbox" checked={p.vibrate} onChange={(e) => setPref('vibrate', e.currentTarget.checked)} />
            Vibrate (where the phone allows it)
          </label>
        </fieldset>
        <button
          type="button"
          onClick={async () => {
            await armSound();
            beep();
            if (p.vibrate) navigator.vibrate?.(300);
          }}
        >
          Test alarm
        </button>
      </section>

      <section class="panel" aria-labelledby="adm-h">
        <h2 id="adm-h">{may(s, 'competent-person') ? 'Site administration' : 'The site'}</h2>
        <ul class="plain-list link-list">
          <li>
            <a href={href('/site')}>{may(s, 'competent-person') ? 'Site settings and default levels' : 'Site settings and default levels (read only)'}</a>
          </li>
          {may(s, 'competent-person') ? (
            <li>
              <a href={href('/setup')}>Getting the site ready: the first-start checklist</a>
            </li>
          ) : null}
          {may(s, 'competent-person') ? (
            <li>
              <a href={href('/links')}>Site links for stewards</a>
            </li>
          ) : null}
          {may(s, 'admin') ? (
            <li>
              <a href={href('/people')}>People and roles</a>
            </li>
          ) : null}
        </ul>
      </section>
      <p class="muted small">Holdfast helps run a wind management plan; it does not replace it. The calculation is a simplified rigid-body check: it does not check members, connections, pegs or ground anchors.</p>
    </main>
  );
}
