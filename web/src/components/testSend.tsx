/**
 * "Send a test message" with its result on the spot: the server queues the message and answers
 * its delivery id; the competent person's screens then follow that delivery in
 * GET /api/notify/deliveries until it is delivered or an attempt fails, and show the result with
 * the reason. Without that role the result is "handed over", with where to look for it.
 */
import { useEffect, useRef, useState } from 'preact/hooks';
import { api, errorText } from '../api.ts';
import { deliveryState, type Delivery } from '../notifyWords.ts';
import { useTimeZone } from '../site.ts';
import { clockTime } from '../units.ts';

type Phase = { kind: 'idle' } | { kind: 'sending' } | { kind: 'error'; message: string } | { kind: 'queued'; deliveryId: string | null; atMs: number; delivery: Delivery | null; gaveUpWatching: boolean };

/** How long the screen follows a test delivery (it is retried for hours; the first attempts tell). */
const watchForMs = 60_000;

export function TestSend(props: { idBase: string; label: string; send: () => Promise<string | null>; canSeeDeliveries: boolean; lookFor: string; disabledReason?: string | null }) {
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const tz = useTimeZone();
  const timer = useRef<number | null>(null);
  useEffect(() => () => void (timer.current !== null && clearTimeout(timer.current)), []);

  const follow = (deliveryId: string, startedAtMs: number) => {
    const poll = async () => {
      timer.current = null;
      let found: Delivery | null = null;
      try {
        const answer = await api<{ deliveries: Delivery[] }>('/api/notify/deliveries?limit=200');
        found = answer.deliveries.find((d) => d.deliveryId === deliveryId) ?? null;
      } catch {
        // Keep trying: a dropped request on a site network says nothing about the message.
      }
      const settled = found !== null && (found.status !== 'pending' || found.attemptLog.length > 0);
      const late = Date.now() - startedAtMs > watchForMs;
      setPhase((p) => (p.kind === 'queued' && p.deliveryId === deliveryId ? { ...p, delivery: found ?? p.delivery, gaveUpWatching: late && !settled } : p));
      // A failed attempt is shown at once, and followed on: the retry 5 s later may get through.
      if (!(found?.status === 'delivered' || found?.status === 'failed') && !late) timer.current = window.setTimeout(() => void poll(), 1000);
    };
    void poll();
  };

  const send = async () => {
    if (timer.current !== null) clearTimeout(timer.current);
    setPhase({ kind: 'sending' });
    try {
      const deliveryId = await props.send();
      const atMs = Date.now();
      setPhase({ kind: 'queued', deliveryId, atMs, delivery: null, gaveUpWatching: false });
      if (deliveryId && props.canSeeDeliveries) follow(deliveryId, atMs);
    } catch (err) {
      setPhase({ kind: 'error', message: errorText(err) });
    }
  };

  return (
    <div class="test-send">
      <button type="button" id={`${props.idBase}-test`} onClick={() => void send()} disabled={phase.kind === 'sending' || Boolean(props.disabledReason)}>
        {props.label}
      </button>
      {props.disabledReason ? <p class="help">{props.disabledReason}</p> : null}
      <div role="status" aria-live="polite" data-testid={`${props.idBase}-result`}>
        {phase.kind === 'sending' ? <p class="test-result dtone-wait">… Sending</p> : null}
        {phase.kind === 'error' ? <p class="error-box">Not sent: {phase.message}</p> : null}
        {phase.kind === 'queued' ? <QueuedResult phase={phase} tz={tz} canSee={props.canSeeDeliveries} lookFor={props.lookFor} /> : null}
      </div>
    </div>
  );
}

function QueuedResult({ phase, tz, canSee, lookFor }: { phase: Extract<Phase, { kind: 'queued' }>; tz: string; canSee: boolean; lookFor: string }) {
  const time = (ms: number) => clockTime(ms, tz);
  if (!canSee || phase.deliveryId === null) {
    return (
      <p class="test-result dtone-wait">
        … Handed to the server at {time(phase.atMs)} to send. {lookFor}
      </p>
    );
  }
  if (phase.delivery === null) return <p class="test-result dtone-wait">… Queued at {time(phase.atMs)}; sending…</p>;
  const st = deliveryState(phase.delivery, Date.now(), time);
  return (
    <div class={`test-result dtone-${st.tone}`}>
      <p>
        <strong>
          <span aria-hidden="true">{st.mark} </span>
          {st.words}
        </strong>
      </p>
      {phase.delivery.attemptLog.length > 0 ? (
        <ol class="attempt-list">
          {phase.delivery.attemptLog.map((a) => (
            <li class={a.ok ? 'attempt-ok' : 'attempt-bad'}>
              {time(a.atMs)}: {a.ok ? '✓' : '✖'} {a.result} <span class="muted">({a.durationMs} ms)</span>
            </li>
          ))}
        </ol>
      ) : null}
      {phase.gaveUpWatching ? <p class="help">Stopped following it here; the Alerts out screen lists every attempt.</p> : null}
    </div>
  );
}
