/**
 * On the board, for the competent person only: one line when alert messages are not getting out
 * (`/api/health`'s notify counts: failed, waiting, the last error), with the way to Alerts out.
 * Nothing at all while messages go out, so the board stays uncluttered; failures already seen can
 * be put away ("Seen") until another one fails.
 */
import { useEffect, useState } from 'preact/hooks';
import { notifyTroubleLine, targetWords, type NotifyHealth } from '../notifyWords.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { useStore } from '../store.ts';

const seenKey = 'holdfast.notify.seenFailed';
const pollMs = 30_000;

function seenFailed(): number {
  try {
    return Number(localStorage.getItem(seenKey) ?? '0') || 0;
  } catch {
    return 0;
  }
}

export function NotifyHealthLine() {
  const competent = may(useStore(session), 'competent-person');
  const [health, setHealth] = useState<NotifyHealth | null>(null);
  const [seen, setSeen] = useState(seenFailed);
  useEffect(() => {
    if (!competent) return;
    let stopped = false;
    const load = () =>
      fetch('/api/health', { headers: { Accept: 'application/json' } })
        // 503 (storage or broker down) still carries the report.
        .then((r) => r.json() as Promise<{ notify?: NotifyHealth }>)
        .then((h) => !stopped && setHealth(h.notify ?? null))
        .catch(() => undefined);
    void load();
    const t = window.setInterval(() => void load(), pollMs);
    return () => {
      stopped = true;
      clearInterval(t);
    };
  }, [competent]);
  if (!competent) return null;
  const line = notifyTroubleLine(health, seen, Date.now(), (channel, target) => targetWords(channel, target));
  if (!line || !health) return null;
  return (
    <p class="notify-trouble" role="status" data-testid="notify-trouble">
      <span aria-hidden="true">⚠ </span>
      <a href={href('/alerts-out')}>{line.text} ›</a>
      {line.newFailed ? (
        <button
          type="button"
          class="notify-seen"
          onClick={() => {
            try {
              localStorage.setItem(seenKey, String(health.failed));
            } catch {
              // Private mode: seen for this page only.
            }
            setSeen(health.failed);
          }}
        >
          Seen
        </button>
      ) : null}
    </p>
  );
}
