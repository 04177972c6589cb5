/**
 * The installable app's page side: registers the service worker (web/src/sw/serviceWorker.js,
 * served as /sw.js) and reads what it kept. The worker answers GET /api/live from its kept copy
 * when the network fails, marked `X-Holdfast-From-Cache: 1` with `X-Holdfast-Stored-At` (the
 * phone's clock when it was stored): such a snapshot is shown as OLD with its age, never as
 * current (web/src/live.ts, the board's banner).
 */
import type { Snapshot } from './types.ts';

/** A snapshot as the server (or the worker's kept copy) answered it. */
export interface SnapshotAnswer {
  snapshot: Snapshot;
  /** Null: fresh from the server. Otherwise the phone's clock when the kept copy was stored. */
  keptAtMs: number | null;
}

/** Reads GET /api/live, telling a kept copy from a fresh answer. Throws like api() does (status 401 included). */
export async function fetchSnapshot(): Promise<SnapshotAnswer> {
  const res = await fetch('/api/live', { headers: { Accept: 'application/json' }, credentials: 'same-origin' });
  if (!res.ok) throw Object.assign(new Error(`${res.status} ${res.statusText}`), { status: res.status });
  const snapshot = (await res.json()) as Snapshot;
  const kept = res.headers.get('X-Holdfast-From-Cache') === '1';
  const storedAt = Number(res.headers.get('X-Holdfast-Stored-At'));
  return { snapshot, keptAtMs: kept ? (Number.isFinite(storedAt) && storedAt > 0 ? storedAt : 0) : null };
}

/** Whether this page can have a service worker (a secure context: https, or http://localhost / 127.0.0.1). */
export function serviceWorkerPossible(): boolean {
  return typeof navigator !== 'undefined' && 'serviceWorker' in navigator && window.isSecureContext;
}

type WorkerMessage = { type: 'push'; event: string; alertId: number | null } | { type: 'push-action'; action: string; ok: boolean; alertId: number | null };
const workerListeners = new Set<(m: WorkerMessage) => void>();

/** Called when the worker showed a push or a notification's button was pressed (the board refreshes). */
export function onWorkerMessage(listener: (m: WorkerMessage) => void): () => void {
  workerListeners.add(listener);
  return () => workerListeners.delete(listener);
}

/**
 * Registers /sw.js at the root scope. Only the built app has it (the dev server answers 404 and
 * the app runs without); not gated on import.meta.env.PROD, which follows NODE_ENV and so is
 * false in a build made under the test runner.
 */
export function registerServiceWorker(): void {
  if (!serviceWorkerPossible()) return;
  navigator.serviceWorker.addEventListener('message', (e: MessageEvent) => {
    const m = e.data as WorkerMessage | null;
    if (m && (m.type === 'push' || m.type === 'push-action')) for (const l of workerListeners) l(m);
  });
  window.addEventListener('load', () => {
    navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch((err: unknown) => {
      // No worker (a private window, a browser setting): the app works, only not offline.
      console.warn('service worker not registered:', err);
    });
  });
}

/** Signed out: what the worker kept of the site (snapshot, session, site) is dropped on this phone. */
export async function forgetSiteData(): Promise<void> {
  try {
    navigator.serviceWorker?.controller?.postMessage({ type: 'forget-site-data' });
    if ('caches' in window) await caches.delete('holdfast-data-v1');
  } catch {
    // nothing kept, or no access: nothing to forget
  }
}
