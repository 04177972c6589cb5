/**
 * The e-mail of one alert event: the action first (what to do, in the competent person's words),
 * then what happened, then the acknowledge link; plain text and the same in HTML.
 */
import type { OpenAlert } from '../watch/watch.ts';
import type { NotifyEventName } from './events.ts';
import type { EmailPayload } from './channels/email.ts';

const eventWords: Record<NotifyEventName, string> = {
  'alert.raised': 'New alert',
  'alert.resignalled': 'Still not acknowledged',
  'alert.escalated': 'Escalated to you: nobody acknowledged',
  'alert.overdue': 'Action overdue',
  'alert.acknowledged': 'Acknowledged',
  'alert.cleared': 'Condition ended',
};

const kindWords: Record<string, string> = {
  level: 'wind level',
  'no-data': 'no wind data',
  'sensor-silent': 'sensor silent',
  'sensor-implausible': 'sensor readings implausible',
  'sensor-clock': 'sensor clock wrong',
};

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export function alertEmail(input: { to: string; event: NotifyEventName; atMs: number; siteName: string; alert: OpenAlert; ackUrl: string | null; timeZone: string }): EmailPayload {
  const { alert } = input;
  const action = alert.actionText.trim() !== '' ? alert.actionText.trim() : alert.kind === 'level' ? 'Follow the wind management plan for this level.' : 'Check the sensor and the structures it governs: treat their wind as unknown until it reports again.';
  const what = alert.kind === 'level' && alert.level !== null ? `Level ${alert.level} (${alert.label})` : `${kindWords[alert.kind] ?? alert.kind}: ${alert.label}`;
  const gust = alert.gustMps !== null && Number.isFinite(alert.gustMps) ? `, gust ${alert.gustMps.toFixed(1)} m/s` : '';
  let at: string;
  try {
    at = new Date(input.atMs).toLocaleString('en-GB', { timeZone: input.timeZone, dateStyle: 'medium', timeStyle: 'medium' });
  } catch {
    at = new Date(input.atMs).toISOString();
  }
  const subject = `${eventWords[input.event]}: ${alert.subject} — ${what}`.slice(0, 200);
  const lines = [
    `ACTION: ${action}`,
    '',
    `${eventWords[input.event]}: ${alert.subject} — ${what}${gust}.`,
    `Site: ${input.siteName}. Time: ${at} (${input.timeZone}). Alert ${alert.id}.`,
  ];
  if (input.ackUrl) lines.push('', `Acknowledge (link valid for 2 hours, once): ${input.ackUrl}`);
  const html = [
    '<!doctype html><html><body style="font-family:sans-serif">',
    `<p style="font-size:1.25em"><strong>ACTION: ${escapeHtml(action)}</strong></p>`,
    `<p>${escapeHtml(eventWords[input.event])}: <strong>${escapeHtml(alert.subject)}</strong> — ${escapeHtml(what)}${escapeHtml(gust)}.</p>`,
    `<p>Site: ${escapeHtml(input.siteName)}. Time: ${escapeHtml(at)} (${escapeHtml(input.timeZone)}). Alert ${alert.id}.</p>`,
    input.ackUrl ? `<p><a href="${escapeHtml(input.ackUrl)}">Acknowledge</a> (valid for 2 hours, once)</p>` : '',
    '</body></html>',
  ].join('\n');
  return { to: input.to, subject, text: lines.join('\n'), html };
}

export function testEmail(to: string, siteName: string, who: string): EmailPayload {
  const text = `ACTION: none — this is a test message.\n\nAlert e-mails for ${who} at ${siteName} reach this address.`;
  return { to, subject: `Test message from the wind watch at ${siteName}`, text, html: `<!doctype html><html><body><p><strong>ACTION: none — this is a test message.</strong></p><p>Alert e-mails for ${escapeHtml(who)} at ${escapeHtml(siteName)} reach this address.</p></body></html>` };
}
