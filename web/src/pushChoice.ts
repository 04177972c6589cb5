/**
 * The "push on this phone" choice of My alerts, over the push module (web/src/push.ts). Push is
 * offered only when the server has it (GET /api/push/key: 404 means this server has no push at
 * all, `enabled: false` that it cannot send), and the browser can take push messages. On means
 * this browser holds a subscription AND the server has it (push.ts `thisDevice`): either alone
 * sends nothing, so the choice is never shown as on when it is not.
 */
import type { PushChoiceState } from './notifyWords.ts';
import { pushState, removePushDevice, subscribePush, testPush as testPushTo, unsubscribePush, type PushDevice } from './push.ts';

export interface PushStatus {
  state: PushChoiceState;
  /** The reason in a sentence, for every state but on, off and checking. */
  message?: string;
  /** This phone's subscription on the server, when `on`. */
  thisDevice?: PushDevice | null;
  /** The person's other devices with push on. */
  otherDevices?: PushDevice[];
}

export async function pushStatus(): Promise<PushStatus> {
  try {
    const res = await fetch('/api/push/key', { headers: { Accept: 'application/json' }, credentials: 'same-origin' });
    if (res.status === 404) return { state: 'no-server' };
    if (!res.ok) return { state: 'error', message: `the server answered ${res.status} for its push key` };
    const key = (await res.json()) as { enabled?: boolean; problem?: string | null };
    if (key.enabled !== true) return { state: 'no-server', ...(key.problem ? { message: key.problem } : {}) };
  } catch {
    return { state: 'error', message: 'the server cannot be reached' };
  }
  try {
    const s = await pushState();
    const others = s.devices.filter((d) => d.id !== s.thisDevice?.id);
    const reason = s.reason ?? undefined;
    if (s.support === 'server-off') return { state: 'no-server', message: reason, otherDevices: others };
    if (s.support === 'unsupported' || s.support === 'insecure') return { state: 'no-browser', message: reason, otherDevices: others };
    if (s.support === 'denied') return { state: 'blocked', message: reason, otherDevices: others };
    return { state: s.thisDevice ? 'on' : 'off', thisDevice: s.thisDevice, otherDevices: others };
  } catch (err) {
    return { state: 'error', message: err instanceof Error ? err.message : String(err) };
  }
}

/** A name for this device in the person's list ("Android phone", "iPhone", "Windows computer"). */
export function thisDeviceLabel(userAgent: string): string {
  if (/iPhone/.test(userAgent)) return 'iPhone';
  if (/iPad/.test(userAgent)) return 'iPad';
  if (/Android/.test(userAgent)) return /Mobile/.test(userAgent) ? 'Android phone' : 'Android tablet';
  if (/Windows/.test(userAgent)) return 'Windows computer';
  if (/Macintosh/.test(userAgent)) return 'Mac';
  if (/Linux|CrOS/.test(userAgent)) return 'Linux computer';
  return 'This device';
}

export const switchPushOn = (): Promise<unknown> => subscribePush(thisDeviceLabel(navigator.userAgent));
export const switchPushOff = (): Promise<void> => unsubscribePush();
export const removeDevice = (id: number): Promise<void> => removePushDevice(id);

/** A test push to one of the person's devices; its delivery id. */
export async function testPush(id: number): Promise<string | null> {
  return (await testPushTo(id)).deliveryId;
}
