/**
 * The e-mail channel: SMTP with nodemailer (SMTP_URL: smtp:// upgrades with STARTTLS when the
 * server offers it, smtps:// is TLS from the start; user name and password in the URL). The
 * message (text and HTML, the action first, the acknowledge link) was made when it was queued.
 */
import nodemailer from 'nodemailer';
import { errorWords, type AttemptResult, type Channel, type OutgoingDelivery } from './channel.ts';

export interface EmailPayload {
  to: string;
  subject: string;
  text: string;
  html: string;
}

type Transport = ReturnType<typeof nodemailer.createTransport>;

export class EmailChannel implements Channel {
  readonly name = 'email';
  private readonly transport: Transport;

  constructor(
    smtpUrl: string,
    private readonly from: string,
    readonly timeoutMs = 30_000,
  ) {
    this.transport = nodemailer.createTransport(smtpUrl, {});
    // Each phase bounded too, so a silent server fails the attempt instead of holding it.
    const o = (this.transport as unknown as { options: Record<string, unknown> }).options;
    o.connectionTimeout ??= Math.min(10_000, timeoutMs);
    o.greetingTimeout ??= Math.min(10_000, timeoutMs);
    o.socketTimeout ??= timeoutMs;
  }

  async send(delivery: OutgoingDelivery, signal: AbortSignal): Promise<AttemptResult> {
    const m = delivery.payload as EmailPayload;
    const sending = this.transport.sendMail({
      from: this.from,
      to: m.to,
      subject: m.subject,
      text: m.text,
      html: m.html,
      // The same Message-ID on every retry: a receiving server (or person) can tell a repeat.
      messageId: `<${delivery.deliveryId}@holdfast.alerts>`,
    });
    const aborted = new Promise<never>((_, reject) => {
      if (signal.aborted) reject(new Error('aborted'));
      signal.addEventListener('abort', () => reject(new Error('aborted')), { once: true });
    });
    try {
      const info = (await Promise.race([sending, aborted])) as { response?: string; rejected?: unknown[] };
      if (Array.isArray(info.rejected) && info.rejected.length > 0) return { ok: false, result: `refused the recipient: ${String(info.response ?? '')}`.slice(0, 300), permanent: true };
      return { ok: true, result: String(info.response ?? 'accepted').slice(0, 300) };
    } catch (err) {
      sending.catch(() => undefined);
      if (signal.aborted) return { ok: false, result: `timed out after ${Math.round(this.timeoutMs / 1000)} s` };
      const code = (err as { responseCode?: number }).responseCode;
      // 5xx on the recipient: retrying will not change the answer.
      return { ok: false, result: errorWords(err), permanent: code !== undefined && code >= 550 && code < 560 };
    }
  }

  close(): void {
    this.transport.close();
  }
}
