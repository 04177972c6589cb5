/**
 * The webhook contract (design §4b, issue 16; README "Alert webhooks"): the JSON body and its
 * signature. `X-Signature: sha256=<hex HMAC-SHA256 of "<timestamp>.<body>">` with
 * `X-Signature-Timestamp: <epoch seconds>`; the receiver recomputes it and refuses a timestamp
 * outside its replay window (five minutes is common practice).
 */
import { createHmac } from 'node:crypto';
import type { OpenAlert } from '../watch/watch.ts';
import type { NotifyEventName } from './events.ts';

export interface WebhookAlert {
  id: number;
  kind: string;
  level?: number;
  label?: string;
  action?: string;
  gustMps?: number;
  structure?: { id: number; name: string };
  sensorKey?: string;
  acknowledgedBy?: string;
  note?: string;
}

export interface WebhookBody {
  id: string;
  event: NotifyEventName | 'test';
  atMs: number;
  site: { name: string };
  alert: WebhookAlert;
}

/** The alert's part of the body: only the fields it has (the contract's "?" fields are left out when unknown). */
export function webhookAlert(alert: OpenAlert): WebhookAlert {
  const out: WebhookAlert = { id: alert.id, kind: alert.kind };
  if (alert.level !== null) out.level = alert.level;
  if (alert.label !== '') out.label = alert.label;
  if (alert.actionText !== '') out.action = alert.actionText;
  if (alert.gustMps !== null && Number.isFinite(alert.gustMps)) out.gustMps = Math.round(alert.gustMps * 100) / 100;
  if (alert.structureId !== null) out.structure = { id: alert.structureId, name: alert.subject };
  if (alert.sensorKey !== null) out.sensorKey = alert.sensorKey;
  if (alert.acknowledgedBy !== null) out.acknowledgedBy = alert.acknowledgedBy;
  if (alert.acknowledgeNote !== null && alert.acknowledgeNote !== '') out.note = alert.acknowledgeNote;
  return out;
}

export function webhookBodyText(body: WebhookBody): string {
  return JSON.stringify({ id: body.id, event: body.event, atMs: body.atMs, site: { name: body.site.name }, alert: body.alert });
}

/** The signature headers of one attempt (the timestamp is the attempt's, the body the delivery's). */
export function webhookSignature(secret: string, body: string, nowMs: number): { timestamp: string; signature: string } {
  const timestamp = String(Math.floor(nowMs / 1000));
  const hex = createHmac('sha256', secret).update(`${timestamp}.${body}`).digest('hex');
  return { timestamp, signature: `sha256=${hex}` };
}
