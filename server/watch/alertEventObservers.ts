/**
 * The seam for alert channels (design §5 v2): the alert book's domain events (levels/alertBook.ts
 * `AlertEvent`) handed to whoever observes them, only after their commit (or, while the database
 * cannot write, after their rows are held for the retry: storage/writeQueue.ts), never before, in
 * the order they happened. The watch owns one list (`Watch.observeAlertEvents`); its after-commit
 * step (live/liveMessages.ts `publishMessages`, `Watch.acknowledged`) calls `deliver`. The
 * notifier (notify/notifier.ts) is the observer today; a new channel plugs in there or here.
 */
import type { AlertEvent } from '../levels/alertBook.ts';

/**
 * Called in the committing turn, with the alerts as they stand after the commit: queue and
 * return (copy what must not change; the objects are the book's own).
 */
export type AlertEventObserver = (events: readonly AlertEvent[]) => void;

export class AlertEventObservers {
  private readonly observers = new Set<AlertEventObserver>();

  constructor(private readonly onError: (err: unknown) => void = () => undefined) {}

  observe(observer: AlertEventObserver): () => void {
    this.observers.add(observer);
    return () => this.observers.delete(observer);
  }

  /** Hands committed events to every observer; one that throws does not stop the others or the stream. */
  deliver(events: readonly AlertEvent[]): void {
    if (events.length === 0) return;
    for (const observer of this.observers) {
      try {
        observer(events);
      } catch (err) {
        this.onError(err);
      }
    }
  }
}
