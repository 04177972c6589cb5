/**
 * Push notifications on this device, for the settings screens (server: GET /api/push/key,
 * /api/me/push-subscriptions; README "Alert notifications"). The browser's PushManager makes the
 * subscription with the server's VAPID key; the server stores it under the signed-in person with
 * a label. Everything here throws ApiError (web/src/api.ts) or PushUnavailable with a sentence
 * the screen can show as it is.
 *
 * - `pushState()`: can this device get pushes, is it subscribed, and the person's devices;
 * - `subscribePush(label)`: asks the permission (call it from a tap), subscribes, stores it;
 * - `unsubscribePush()`: this device stops getting pushes (browser and server);
 * - `removePushDevice(id)`, `renamePushDevice(id, label)`: any of the person's devices;
 * - `testPush(id?)`: a test message to a device (this one by default).
 */
import { api, ApiError } from './api.ts';
import { serviceWorkerPossible } from './offline.ts';

/** One of the person's subscribed devices, as the server lists it. */
export interface PushDevice {
  id: number;
  label: string;
  endpoint: string;
  /** The push service's host (e.g. the phone maker's), for the screen. */
  service: string;
  userAgent: string | null;
  createdAtMs: number;
  updatedAtMs: number;
  lastDeliveredAtMs: number | null;
}

export type PushSupport =
  /** Push works here. */
  | 'available'
  /** This browser has no Push API or service workers (e.g. iOS Safari before the app is added to the home screen). */
  | 'unsupported'
  /** Not https (nor localhost): browsers allow service workers only in a secure context. */
  | 'insecure'
  /** The server has push off (its key file could not be read). */
  | 'server-off'
  /** The person refused notifications for this site in the browser: only the browser's site settings can undo it. */
  | 'denied';

export interface PushState {
  support: PushSupport;
  /** A sentence for the screen when support is not 'available'. */
  reason: string | null;
  /** This device's own subscription on the server, when it has one. */
  thisDevice: PushDevice | null;
  /** Every device of the signed-in person. */
  devices: PushDevice[];
}

export class PushUnavailable extends Error {
  constructor(
    readonly support: Exclude<PushSupport, 'available'>,
    message: string,
  ) {
    super(message);
  }
}

const reasons: Record<Exclude<PushSupport, 'available'>, string> = {
  unsupported: 'This browser cannot receive push notifications. On an iPhone or iPad, add the app to the home screen first (Share → Add to Home Screen), then open it from there.',
  insecure: 'Push notifications need the app opened over https:// (or on this computer as localhost). Ask whoever runs the server to set up HTTPS (README "Alert notifications").',
  'server-off': 'The server cannot send push notifications (its key file could not be read): tell whoever runs it.',
  denied: 'Notifications are blocked for this site in this browser. Allow them in the browser\'s site settings, then try again.',
};

interface ServerList {
  subscriptions: PushDevice[];
  enabled: boolean;
  publicKey: string | null;
}

function browserSupport(): Exclude<PushSupport, 'server-off' | 'denied'> {
  if (typeof window === 'undefined' || !('Notification' in window) || !('PushManager' in window) || !('serviceWorker' in navigator)) return window.isSecureContext === false ? 'insecure' : 'unsupported';
  return serviceWorkerPossible() ? 'available' : 'insecure';
}

async function registration(): Promise<ServiceWorkerRegistration> {
  const existing = await navigator.serviceWorker.getRegistration('/');
  if (existing) return existing;
  await navigator.serviceWorker.register('/sw.js', { scope: '/' });
  return navigator.serviceWorker.ready;
}

async function currentSubscription(): Promise<PushSubscription | null> {
  if (browserSupport() !== 'available') return null;
  const reg = await navigator.serviceWorker.getRegistration('/');
  return reg ? reg.pushManager.getSubscription() : null;
}

/** The VAPID key as PushManager takes it (bytes from base64url). */
function keyBytes(base64url: string): Uint8Array {
  const text = atob(base64url.replace(/-/g, '+').replace(/_/g, '/') + '='.repeat((4 - (base64url.length % 4)) % 4));
  const out = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) out[i] = text.charCodeAt(i);
  return out;
}

function sameKey(a: ArrayBuffer | null, b: Uint8Array): boolean {
  if (!a || a.byteLength !== b.length) return false;
  const view = new Uint8Array(a);
  return view.every((x, i) => x === b[i]);
}

export async function pushState(): Promise<PushState> {
  const list = await api<ServerList>('/api/me/push-subscriptions');
  const devices = list.subscriptions;
  let support: PushSupport = browserSupport();
  if (support === 'available' && !list.enabled) support = 'server-off';
  if (support === 'available' && Notification.permission === 'denied') support = 'denied';
  const sub = support === 'available' || support === 'denied' ? await currentSubscription() : null;
  const thisDevice = sub ? (devices.find((d) => d.endpoint === sub.endpoint) ?? null) : null;
  return { support, reason: support === 'available' ? null : reasons[support], thisDevice, devices };
}

/** Subscribes this device (call from a tap: the browser asks the person for permission). */
export async function subscribePush(label: string): Promise<PushDevice> {
  const support = browserSupport();
  if (support !== 'available') throw new PushUnavailable(support, reasons[support]);
  const key = await api<{ publicKey: string | null; enabled: boolean }>('/api/push/key');
  if (!key.enabled || !key.publicKey) throw new PushUnavailable('server-off', reasons['server-off']);
  const permission = await Notification.requestPermission();
  if (permission !== 'granted') throw new PushUnavailable('denied', reasons.denied);
  const reg = await registration();
  const serverKey = keyBytes(key.publicKey);
  let sub = await reg.pushManager.getSubscription();
  // Made with another server key (the server's key file was replaced): subscribe anew.
  if (sub && !sameKey(sub.options.applicationServerKey, serverKey)) {
    await sub.unsubscribe().catch(() => false);
    sub = null;
  }
  sub ??= await reg.pushManager.subscribe({ userVisibleOnly: true, applicationServerKey: serverKey as BufferSource });
  const saved = await api<{ subscription: PushDevice }>('/api/me/push-subscriptions', { body: { subscription: sub.toJSON(), label } });
  return saved.subscription;
}

/** This device stops getting pushes: removed on the server, then in the browser. */
export async function unsubscribePush(): Promise<void> {
  const sub = await currentSubscription();
  if (!sub) return;
  const list = await api<ServerList>('/api/me/push-subscriptions');
  const mine = list.subscriptions.find((d) => d.endpoint === sub.endpoint);
  if (mine) await removePushDevice(mine.id);
  await sub.unsubscribe().catch(() => false);
}

export async function removePushDevice(id: number): Promise<void> {
  try {
    await api(`/api/me/push-subscriptions/${id}`, { method: 'DELETE' });
  } catch (err) {
    // Already gone (the push service said so, or another tab removed it): that is what was asked.
    if (!(err instanceof ApiError && err.status === 404)) throw err;
  }
}

export async function renamePushDevice(id: number, label: string): Promise<PushDevice> {
  return (await api<{ subscription: PushDevice }>(`/api/me/push-subscriptions/${id}`, { method: 'PATCH', body: { label } })).subscription;
}

/** A test message to one of the person's devices (this device when no id is given). */
export async function testPush(id?: number): Promise<{ deliveryId: string }> {
  let target = id;
  if (target === undefined) {
    const state = await pushState();
    if (!state.thisDevice) throw state.support === 'available' ? new Error('This device is not subscribed to push notifications yet: subscribe it first.') : new PushUnavailable(state.support, state.reason ?? reasons[state.support]);
    target = state.thisDevice.id;
  }
  return api<{ deliveryId: string }>(`/api/me/push-subscriptions/${target}/test`, { method: 'POST' });
}
