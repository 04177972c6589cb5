/**
 * What a push notification carries (the JSON the service worker, web/public/sw.js, reads after the
 * browser has decrypted it): the structure, level, gust and the action, ready-made title and body
 * (the action first, as in the e-mail), and the buttons — Acknowledge, and "Done: <configuration>"
 * when the level's action moves the structure and it is not done yet — each with its own signed,
 * single-use token for POST /api/push/action. Kept well under the 4 kB a push service must
 * accept (RFC 8030 §7.2; the aes128gcm record adds 86 bytes, RFC 8291 §4).
 */
import type { OpenAlert } from '../watch/watch.ts';
import type { NotifyEventName } from './events.ts';
import type { PushAction } from './pushTokens.ts';

export interface PushButton {
  action: PushAction;
  title: string;
  token: string;
}

export interface PushMessage {
  v: 1;
  type: 'alert' | 'test';
  event: NotifyEventName | 'test';
  atMs: number;
  site: { name: string };
  title: string;
  body: string;
  /** One notification per alert on the phone: a later message of the alert replaces the earlier. */
  tag: string;
  /** The screen to open on a tap (hash route of the web app). */
  url: string;
  /** Stays on the screen until dealt with (an alert that asks for something). */
  requireInteraction: boolean;
  /** No sound or vibration (an update that asks for nothing, e.g. acknowledged by someone). */
  silent: boolean;
  alert: {
    id: number;
    kind: string;
    level: number | null;
    label: string;
    structure: { id: number; name: string } | null;
    sensorKey: string | null;
    gustMps: number | null;
    action: string;
    moveToConfiguration: string | null;
    actionDone: boolean;
    acknowledgedBy: string | null;
  } | null;
  buttons: PushButton[];
  /** Where the service worker posts a button's token. */
  actionUrl: string;
  /** When the buttons stop working (null: none). */
  buttonsExpireAtMs: number | null;
}

export const pushActionPath = '/api/push/action';

const eventWords: Record<NotifyEventName, string> = {
  'alert.raised': 'Alert',
  'alert.resignalled': 'Still not acknowledged',
  'alert.escalated': 'Escalated to you',
  'alert.overdue': 'Action overdue',
  'alert.acknowledged': 'Acknowledged',
  'alert.cleared': 'Ended',
};

const kindWords: Record<string, string> = {
  level: 'wind level',
  'no-data': 'no wind data',
  'sensor-silent': 'sensor silent',
  'sensor-implausible': 'sensor readings implausible',
  'sensor-clock': 'sensor clock wrong',
};

function cut(text: string, max: number): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

/** The action in the competent person's words, or what to do when there are none (never "nothing"). */
export function actionWords(alert: Pick<OpenAlert, 'actionText' | 'kind'>): string {
  const text = alert.actionText.trim();
  if (text !== '') return text;
  return alert.kind === 'level' ? 'Follow the wind management plan for this level.' : 'Check the sensor and the structures it governs: treat their wind as unknown until it reports again.';
}

/** Which buttons an alert's notification offers now: Acknowledge while unacknowledged, Done while its move is not done. */
export function buttonsFor(alert: OpenAlert, event: NotifyEventName): Array<{ action: PushAction; title: string }> {
  const out: Array<{ action: PushAction; title: string }> = [];
  if (alert.acknowledgedAtMs === null && event !== 'alert.cleared') out.push({ action: 'ack', title: 'Acknowledge' });
  if (alert.moveToConfiguration !== null && alert.actionDoneAtMs === null && alert.structureId !== null) out.push({ action: 'done', title: cut(`Done: ${alert.moveToConfiguration}`, 40) });
  return out;
}

export function alertPushMessage(input: {
  event: NotifyEventName;
  atMs: number;
  siteName: string;
  alert: OpenAlert;
  buttons: PushButton[];
  buttonsExpireAtMs: number | null;
}): PushMessage {
  const { alert, event } = input;
  const action = actionWords(alert);
  const what = alert.kind === 'level' && alert.level !== null ? `Level ${alert.level} (${alert.label})` : `${kindWords[alert.kind] ?? alert.kind}: ${alert.label}`;
  const gust = alert.gustMps !== null && Number.isFinite(alert.gustMps) ? `, gust ${alert.gustMps.toFixed(1)} m/s` : '';
  const title = cut(`${eventWords[event]}: ${alert.subject} — ${what}`, 120);
  const lines: string[] = [];
  if (event === 'alert.acknowledged') lines.push(`Acknowledged by ${alert.acknowledgedBy ?? 'someone'}.`);
  lines.push(`ACTION: ${cut(action, 400)}`);
  lines.push(`${cut(`${what}${gust}`, 160)}. ${cut(input.siteName, 60)}.`);
  if (alert.moveToConfiguration !== null && alert.actionDoneAtMs !== null) lines.push(`Done (${alert.moveToConfiguration}) by ${alert.actionDoneBy ?? 'someone'}.`);
  return {
    v: 1,
    type: 'alert',
    event,
    atMs: input.atMs,
    site: { name: cut(input.siteName, 80) },
    title,
    body: lines.join('\n'),
    tag: `alert-${alert.id}`,
    url: alert.structureId !== null ? `/#/structure/${alert.structureId}` : '/#/',
    requireInteraction: event !== 'alert.acknowledged' && event !== 'alert.cleared',
    silent: event === 'alert.acknowledged' || event === 'alert.cleared',
    alert: {
      id: alert.id,
      kind: alert.kind,
      level: alert.level,
      label: cut(alert.label, 80),
      structure: alert.structureId !== null ? { id: alert.structureId, name: cut(alert.subject, 120) } : null,
      sensorKey: alert.sensorKey,
      gustMps: alert.gustMps !== null && Number.isFinite(alert.gustMps) ? Math.round(alert.gustMps * 100) / 100 : null,
      action: cut(action, 400),
      moveToConfiguration: alert.moveToConfiguration,
      actionDone: alert.actionDoneAtMs !== null,
      acknowledgedBy: alert.acknowledgedBy,
    },
    buttons: input.buttons,
    actionUrl: pushActionPath,
    buttonsExpireAtMs: input.buttons.length > 0 ? input.buttonsExpireAtMs : null,
  };
}

export function testPushMessage(siteName: string, who: string, label: string, atMs: number): PushMessage {
  return {
    v: 1,
    type: 'test',
    event: 'test',
    atMs,
    site: { name: cut(siteName, 80) },
    title: `Test message from the wind watch at ${cut(siteName, 60)}`,
    body: cut(`ACTION: none — this is a test. Alerts for ${who} reach this device (${label}).`, 300),
    tag: 'test',
    url: '/#/',
    requireInteraction: false,
    silent: false,
    alert: null,
    buttons: [],
    actionUrl: pushActionPath,
    buttonsExpireAtMs: null,
  };
}
