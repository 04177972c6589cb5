/**
 * A level's plan action that moves the structure to a configuration (design §2.5), on the board's
 * alert card: what it asks ("To do: lower the screen"), that it is overdue ("Not done: lower the
 * screen — overdue since 14:07", big, inverted and striped so it stands out in rain at night
 * without relying on colour), or who did it; and for crew and above the big "Done: lowered" button
 * beside Acknowledge.
 *
 * "Done" switches the live assessment to the other configuration at once, so a tap by mistake
 * would show a margin the structure does not have: the button asks once more ("Yes: it is
 * lowered now") before anything is sent. POST /api/structures/:id/configuration
 * {configuration, alertId}; the answer's structure and alert go on the board at once (the stream
 * follows).
 */
import { useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { actionPhrase, doneText, overdueText, type AlertAction } from '../configurationState.ts';
import { live, refreshSnapshot } from '../live.ts';
import type { ConfigurationSwitchAnswer } from '../types.ts';
import { hourMinute } from '../units.ts';

/** The action's state in words. Crew and above are asked to act; a viewer reads the same state calmly. */
export function PlanActionStatus({ action, actionText, timeZone, canAct }: { action: AlertAction; actionText: string | null | undefined; timeZone: string; canAct: boolean }) {
  if (action.state === 'done') {
    return (
      <p class="action-done" data-testid="action-done">
        ✓&nbsp;{doneText(action, timeZone)}
      </p>
    );
  }
  if (action.ended) {
    return (
      <p class="action-ended" data-testid="action-ended">
        Not marked done: {actionPhrase(actionText, action.moveTo)} (its level has ended; the structure stays as it is until someone switches it)
      </p>
    );
  }
  if (action.state === 'overdue') {
    return (
      <p class={canAct ? 'action-overdue' : 'action-overdue-calm'} role={canAct ? 'alert' : undefined} data-testid="action-overdue">
        <span class="action-overdue-mark" aria-hidden="true">
          ⚠
        </span>
        <span>{overdueText(action, actionText, timeZone)}</span>
      </p>
    );
  }
  return (
    <p class="action-todo" data-testid="action-todo">
      To do: {actionPhrase(actionText, action.moveTo)}
      {action.dueAtMs !== null ? ` — by ${hourMinute(action.dueAtMs, timeZone)}` : ''}
      {canAct ? ', then press Done' : ' (the crew mark it done)'}
    </p>
  );
}

function applyAnswer(answer: ConfigurationSwitchAnswer): void {
  live.update((st) => {
    if (!st.snapshot) return st;
    const { structure, alert } = answer;
    return {
      ...st,
      snapshot: {
        ...st.snapshot,
        structures: structure ? st.snapshot.structures.map((x) => (x.id === structure.id ? structure : x)) : st.snapshot.structures,
        alerts: alert ? st.snapshot.alerts.map((x) => (x.id === alert.id ? alert : x)) : st.snapshot.alerts,
      },
    };
  });
}

/** Why the server refused, in words the crew can act on. */
function refusalText(err: unknown, moveTo: string): string {
  if (err instanceof ApiError) {
    if (err.status === 409) return `Not recorded: this action was already marked done, or its alert has ended (${err.message}). The card is read again.`;
    if (err.status === 403) return 'Not recorded: your role cannot mark plan actions done. Ask the crew or the competent person.';
    if (err.status === 404 || err.status === 405) return `Not recorded: this server cannot record “Done” yet. Tell the competent person the structure is now “${moveTo}”.`;
  }
  return `Not recorded: ${errorText(err)}`;
}

/** "Done: lowered", asked once more before it is sent. */
export function PlanActionDone({ structureId, action }: { structureId: number; action: AlertAction }) {
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const send = async () => {
    setBusy(true);
    setMessage(null);
    try {
      const answer = await api<ConfigurationSwitchAnswer>(`/api/structures/${structureId}/configuration`, { body: { configuration: action.moveTo, alertId: action.alertId } });
      applyAnswer(answer);
      if (!answer.structure || !answer.alert) void refreshSnapshot();
      setConfirming(false);
    } catch (err) {
      setMessage(refusalText(err, action.moveTo));
      void refreshSnapshot();
    } finally {
      setBusy(false);
    }
  };
  return (
    <div class="action-area" data-testid="action-area">
      {confirming ? (
        <div class="action-confirm" role="group" aria-label={`Confirm: the structure is now ${action.moveTo}`}>
          <p class="action-confirm-q">Is it “{action.moveTo}” now? The margins switch to that configuration at once.</p>
          <div class="action-buttons">
            <button type="button" class="done-btn" disabled={busy} onClick={() => void send()}>
              {busy ? 'Sending…' : `Yes, done: ${action.moveTo}`}
            </button>
            <button type="button" class="link-btn" disabled={busy} onClick={() => setConfirming(false)}>
              Not yet
            </button>
          </div>
        </div>
      ) : (
        <button type="button" class="done-btn" onClick={() => setConfirming(true)}>
          Done: {action.moveTo}
        </button>
      )}
      {message ? (
        <p class="error-box" role="alert">
          {message}
        </p>
      ) : null}
    </div>
  );
}
