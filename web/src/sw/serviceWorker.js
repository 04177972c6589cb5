// @ts-check
/// <reference lib="webworker" />
/**
 * The service worker (served as /sw.js, scope "/"; built by the `appShell` plugin in
 * vite.config.ts, which puts the build's file list in place of `self.__HOLDFAST_BUILD__`).
 *
 * 1. A flaky site network: the app shell (index.html, the built scripts and styles, the icons) is
 *    kept at install, so the app opens with no network. The answers the app needs to show the
 *    site — GET /api/live (the last live snapshot), /api/session and /api/site — are fetched from
 *    the network first and a copy is kept with the time it was stored; when the network fails (or
 *    a proxy answers 502/503/504) the copy is served marked `X-Holdfast-From-Cache: 1` with
 *    `X-Holdfast-Stored-At`, and the app shows it as OLD with its age (web/src/offline.ts), never
 *    as current. The live stream (/api/stream) and every change (POST…) always go to the network.
 * 2. Push (design §4b): shows the alert's notification with its buttons; a button posts its
 *    signed, single-use token to the server without opening the app (server/http/routes/pushRoutes.ts)
 *    and the notification then says what happened — done, refused (used or expired) or not sent.
 */

const worker = /** @type {ServiceWorkerGlobalScope} */ (/** @type {unknown} */ (self));

/** @type {{ id: string; files: string[] }} */
const build = /** @type {any} */ (self).__HOLDFAST_BUILD__ ?? { id: 'dev', files: [] };

const shellCache = `holdfast-shell-${build.id}`;
const dataCache = 'holdfast-data-v1';
const shellFiles = ['/', '/manifest.webmanifest', '/favicon.svg', '/icons/icon-192.png', '/icons/icon-512.png', '/icons/badge-96.png', ...build.files];
/** GET answers kept for offline use (path → exact match, no query). */
const keptAnswers = new Set(['/api/live', '/api/session', '/api/site']);
/** How long a navigation waits for the network before the kept shell is shown. */
const navigationWaitMs = 4000;

worker.addEventListener('install', (event) => {
  event.waitUntil(
    (async () => {
      const cache = await caches.open(shellCache);
      // One by one: a file that fails does not leave the rest unkept.
      await Promise.all(shellFiles.map((url) => cache.add(new Request(url, { cache: 'reload' })).catch(() => undefined)));
      await worker.skipWaiting();
    })(),
  );
});

worker.addEventListener('activate', (event) => {
  event.waitUntil(
    (async () => {
      for (const name of await caches.keys()) if (name.startsWith('holdfast-shell-') && name !== shellCache) await caches.delete(name);
      await worker.clients.claim();
    })(),
  );
});

/** @param {Response} res */
function retryable(res) {
  return res.status === 502 || res.status === 503 || res.status === 504;
}

/**
 * The network's answer, a copy kept with the time; or, when the network fails, the copy marked old.
 * @param {Request} request
 * @param {string} key
 */
async function networkThenKept(request, key) {
  const cache = await caches.open(dataCache);
  try {
    const res = await fetch(request);
    if (res.ok) {
      const headers = new Headers(res.headers);
      headers.set('X-Holdfast-Stored-At', String(Date.now()));
      const body = await res.clone().arrayBuffer();
      await cache.put(key, new Response(body, { status: res.status, statusText: res.statusText, headers }));
      return res;
    }
    if (!retryable(res)) return res;
    const kept = await keptCopy(cache, key);
    return kept ?? res;
  } catch (err) {
    const kept = await keptCopy(cache, key);
    if (kept) return kept;
    throw err;
  }
}

/**
 * @param {Cache} cache
 * @param {string} key
 */
async function keptCopy(cache, key) {
  const kept = await cache.match(key);
  if (!kept) return null;
  const headers = new Headers(kept.headers);
  headers.set('X-Holdfast-From-Cache', '1');
  headers.set('Cache-Control', 'no-store');
  return new Response(await kept.arrayBuffer(), { status: 200, statusText: 'OK (kept copy)', headers });
}

/** @param {Request} request */
async function shellNavigation(request) {
  const cache = await caches.open(shellCache);
  const fromNetwork = fetch(request).then(async (res) => {
    if (res.ok) await cache.put('/', res.clone());
    return res;
  });
  const timeout = new Promise((resolve) => setTimeout(() => resolve(null), navigationWaitMs));
  try {
    const first = await Promise.race([fromNetwork, timeout]);
    if (first) return /** @type {Response} */ (first);
  } catch {
    // no network: the kept shell below
  }
  const kept = await cache.match('/');
  if (kept) {
    fromNetwork.catch(() => undefined);
    return kept;
  }
  return fromNetwork;
}

/** @param {Request} request */
async function keptAsset(request) {
  const cache = await caches.open(shellCache);
  const kept = await cache.match(request);
  if (kept) return kept;
  const res = await fetch(request);
  // Built files carry a content hash in their names: once kept, always right.
  if (res.ok) await cache.put(request, res.clone());
  return res;
}

worker.addEventListener('fetch', (event) => {
  const request = event.request;
  if (request.method !== 'GET') return;
  const url = new URL(request.url);
  if (url.origin !== worker.location.origin) return;
  if (request.mode === 'navigate' && (url.pathname === '/' || url.pathname === '/index.html')) {
    event.respondWith(shellNavigation(request));
    return;
  }
  if (keptAnswers.has(url.pathname) && url.search === '') {
    event.respondWith(networkThenKept(request, url.pathname));
    return;
  }
  if (url.pathname.startsWith('/assets/') || url.pathname.startsWith('/icons/') || url.pathname === '/manifest.webmanifest' || url.pathname === '/favicon.svg') {
    event.respondWith(keptAsset(request));
  }
  // Everything else (the live stream, logs, exports, the acknowledge pages) goes to the network as usual.
});

worker.addEventListener('message', (event) => {
  const data = /** @type {{ type?: string } | null} */ (event.data);
  // Signed out on this device: what was kept of the site goes with the session.
  if (data && data.type === 'forget-site-data') event.waitUntil(caches.delete(dataCache));
});

// ---------- push ----------

/**
 * @typedef {{ action: 'ack' | 'done'; title: string; token: string }} Button
 * @typedef {{ v: number; type: string; event: string; atMs: number; title: string; body: string; tag: string; url: string;
 *   requireInteraction: boolean; silent: boolean; buttons: Button[]; actionUrl: string; buttonsExpireAtMs: number | null;
 *   alert: { id: number; level: number | null; structure: { id: number; name: string } | null; moveToConfiguration: string | null } | null }} PushMessage
 */

/**
 * @param {PushMessage} m
 * @param {{ body?: string; buttons?: Button[]; silent?: boolean; requireInteraction?: boolean }} [change]
 */
function show(m, change = {}) {
  const buttons = change.buttons ?? m.buttons;
  const message = { ...m, buttons, body: change.body ?? m.body };
  /** @type {NotificationOptions & { actions?: Array<{ action: string; title: string }>; renotify?: boolean; timestamp?: number; vibrate?: number[] }} */
  const options = {
    body: message.body,
    tag: m.tag,
    data: message,
    icon: '/icons/icon-192.png',
    badge: '/icons/badge-96.png',
    timestamp: m.atMs,
    requireInteraction: change.requireInteraction ?? m.requireInteraction,
    silent: change.silent ?? m.silent,
    renotify: !(change.silent ?? m.silent),
    actions: buttons.map((b) => ({ action: b.action, title: b.title })),
  };
  if (!options.silent) options.vibrate = [300, 150, 300, 150, 600];
  return worker.registration.showNotification(m.title, options);
}

worker.addEventListener('push', (event) => {
  event.waitUntil(
    (async () => {
      /** @type {PushMessage | null} */
      let m = null;
      try {
        m = event.data ? /** @type {PushMessage} */ (event.data.json()) : null;
      } catch {
        m = null;
      }
      // A push must show something (and an alert is never swallowed): unreadable, say so.
      if (!m || typeof m.title !== 'string') {
        await worker.registration.showNotification('Holdfast: new message', { body: 'Open the app to see it.', tag: 'unreadable', icon: '/icons/icon-192.png' });
        return;
      }
      await show(m);
      // An open app refreshes at once.
      for (const client of await worker.clients.matchAll({ type: 'window' })) client.postMessage({ type: 'push', event: m.event, alertId: m.alert ? m.alert.id : null });
    })(),
  );
});

/**
 * A button pressed: its token posted without a cookie (the token is the authentication), the
 * notification replaced by the outcome.
 * @param {PushMessage} m
 * @param {Button} button
 */
async function press(m, button) {
  let res;
  try {
    res = await fetch(m.actionUrl, { method: 'POST', credentials: 'omit', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ t: button.token }) });
  } catch {
    // Not sent: the buttons stay, to try again.
    await show(m, { body: `NOT SENT — the server cannot be reached. Try again, or open the app.\n${m.body}`, silent: true });
    return;
  }
  /** @type {{ message?: string; error?: string }} */
  let answer = {};
  try {
    answer = await res.json();
  } catch {
    answer = {};
  }
  if (res.ok) {
    const rest = m.buttons.filter((b) => b.action !== button.action && !(button.action === 'done' && b.action === 'ack'));
    await show(m, { body: `${answer.message ?? 'Done.'}\n${m.body}`, buttons: rest, silent: true, requireInteraction: rest.length > 0 });
  } else {
    const why = answer.error ?? `the server answered ${res.status}`;
    const rest = res.status >= 500 ? m.buttons : m.buttons.filter((b) => b.action !== button.action);
    await show(m, { body: `NOT DONE — ${why}.\n${m.body}`, buttons: rest, silent: true, requireInteraction: true });
  }
  for (const client of await worker.clients.matchAll({ type: 'window' })) client.postMessage({ type: 'push-action', action: button.action, ok: res.ok, alertId: m.alert ? m.alert.id : null });
}

/** @param {string} url */
async function openApp(url) {
  const target = new URL(url || '/', worker.location.origin).href;
  for (const client of await worker.clients.matchAll({ type: 'window', includeUncontrolled: true })) {
    if (new URL(client.url).origin === worker.location.origin) {
      await client.focus();
      if ('navigate' in client) await /** @type {WindowClient} */ (client).navigate(target).catch(() => undefined);
      return;
    }
  }
  await worker.clients.openWindow(target);
}

worker.addEventListener('notificationclick', (event) => {
  const m = /** @type {PushMessage | undefined} */ (event.notification.data);
  const button = m && m.buttons ? m.buttons.find((b) => b.action === event.action) : undefined;
  if (m && button) {
    event.notification.close();
    event.waitUntil(press(m, button));
    return;
  }
  event.notification.close();
  event.waitUntil(openApp(m ? m.url : '/'));
});
