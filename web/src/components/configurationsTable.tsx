/**
 * The structure page's configurations (design §2.5): every configuration's limit gust and the gust
 * at which each level is reached in it, the current one marked; and for the competent person a
 * control to switch the live configuration by hand (back to "raised" when the wind has dropped
 * and the level has cleared), with a note for the log. POST /api/structures/:id/configuration
 * {configuration, note} (without an alert: the competent person's role).
 */
import { useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { configurationsNow } from '../configurationState.ts';
import { live, refreshSnapshot } from '../live.ts';
import type { ConfigurationSwitchAnswer, StructureState } from '../types.ts';
import { dateTime, speed, type SpeedUnit } from '../units.ts';
import { maxTextLength } from '../../../server/engine/limits.ts';
import { LevelShape, levelTone } from './levelBadge.tsx';

export function ConfigurationsSection({ s, unit, timeZone, canSwitch }: { s: StructureState; unit: SpeedUnit; timeZone: string; canSwitch: boolean }) {
  const now = configurationsNow(s);
  if (!now) return null;
  const key = now.current?.trim().toLowerCase() ?? null;
  const n = s.levels.length;
  return (
    <section aria-labelledby="cfgs-h" class="configurations-live">
      <h2 id="cfgs-h">Configurations</h2>
      <p data-testid="cfg-current">
        {now.current === null ? (
          <strong class="bad-text">Which configuration it is in now is unknown: treat the lowest limit below as the one that holds.</strong>
        ) : (
          <>
            Now: <strong>{now.current}</strong>
            {now.sinceMs !== null ? ` since ${dateTime(now.sinceMs, timeZone)}${now.by ? `, switched by ${now.by}` : ''}` : ' (as registered, never switched)'}. The board’s margin and levels are this configuration’s.
          </>
        )}
      </p>
      {now.list.length > 0 ? (
        <div class="cfg-scroll">
          <table class="data cfg-levels-table" data-testid="cfg-table">
            <caption>Limit gust and the gust at which each level is reached, per configuration</caption>
            <thead>
              <tr>
                <th scope="col">Configuration</th>
                <th scope="col">Limit gust</th>
                {s.levels.map((l) => (
                  <th scope="col" key={l.level}>
                    <span class="lvl-cell">
                      <LevelShape tone={levelTone(l.level, n)} size={18} />
                      <span>
                        {l.level} · {l.label}
                      </span>
                    </span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {now.list.map((c, i) => {
                const isNow = key !== null && c.name.trim().toLowerCase() === key;
                return (
                  <tr key={c.name} class={isNow ? 'is-current' : ''}>
                    <th scope="row">
                      {isNow ? <span class="cfg-now">now</span> : null} {c.name}
                      {i === 0 ? <span class="muted small"> (as registered)</span> : null}
                    </th>
                    <td data-label="Limit gust">
                      <strong>{c.limitGustMps === null ? 'unknown' : speed(c.limitGustMps, unit)}</strong>
                    </td>
                    {s.levels.map((l, j) => (
                      <td key={l.level} data-label={`${l.level} · ${l.label}`}>
                        {speed(c.triggerGustsMps[j] ?? null, unit)}
                      </td>
                    ))}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : (
        <p class="unknown-box">The limits in its other configurations are not known here.</p>
      )}
      {canSwitch && now.list.length > 1 ? <SwitchConfiguration s={s} names={now.list.map((c) => c.name)} current={now.current} /> : null}
    </section>
  );
}

function SwitchConfiguration({ s, names, current }: { s: StructureState; names: string[]; current: string | null }) {
  const others = names.filter((name) => current === null || name.trim().toLowerCase() !== current.trim().toLowerCase());
  const [choice, setChoice] = useState(others[0] ?? '');
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const target = others.includes(choice) ? choice : (others[0] ?? '');
  const send = async () => {
    setBusy(true);
    setMessage(null);
    try {
      const answer = await api<ConfigurationSwitchAnswer>(`/api/structures/${s.id}/configuration`, { body: { configuration: target, ...(note.trim() ? { note: note.trim() } : {}) } });
      live.update((st) =>
        st.snapshot && answer.structure ? { ...st, snapshot: { ...st.snapshot, structures: st.snapshot.structures.map((x) => (x.id === answer.structure.id ? answer.structure : x)) } } : st,
      );
      if (!answer.structure) void refreshSnapshot();
      setNote('');
      setMessage({ ok: true, text: `Switched to “${target}”. The board’s margin and levels are now this configuration’s.` });
    } catch (err) {
      const words = err instanceof ApiError && err.status === 403 ? 'only a competent person can switch the configuration by hand' : errorText(err);
      setMessage({ ok: false, text: `Not switched: ${words}` });
      void refreshSnapshot();
    } finally {
      setBusy(false);
    }
  };
  return (
    <fieldset class="cfg-switch">
      <legend>Switch configuration</legend>
      <p class="help">For a change made on site without a plan action, or back again when the wind has dropped and the level has cleared. The live assessment switches at once; the log records who, when and your note.</p>
      <div class="field">
        <label for="cfg-switch-to">Switch to</label>
        <select id="cfg-switch-to" value={target} onChange={(e) => setChoice(e.currentTarget.value)}>
          {others.map((name) => (
            <option value={name}>{name}</option>
          ))}
        </select>
      </div>
      <div class="field">
        <label for="cfg-switch-note">Note for the log (recommended): what was done and why</label>
        <textarea id="cfg-switch-note" rows={2} maxLength={maxTextLength} value={note} onInput={(e) => setNote(e.currentTarget.value)} />
      </div>
      <button type="button" class="primary" disabled={busy || target === ''} onClick={() => void send()}>
        {busy ? 'Switching…' : `Switch to “${target}”`}
      </button>
      {message ? (
        <p class={message.ok ? 'ok-box' : 'error-box'} role={message.ok ? 'status' : 'alert'}>
          {message.text}
        </p>
      ) : null}
    </fieldset>
  );
}
