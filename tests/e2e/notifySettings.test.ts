/**
 * The notification screens in Chromium (issue 16, design §4b), against real peers: a real SMTP
 * server (the `smtp-server` package on 127.0.0.1) and a real HTTP receiver (node:http on
 * 127.0.0.1) that checks each webhook's signature itself with node:crypto (RFC 2104 HMAC with
 * FIPS 180-4 SHA-256 over "<timestamp>.<body>", as the README's webhook contract tells a receiver
 * to); a webhook to a port nobody listens on for the failure.
 *
 * - My alerts (a crew member, phone): says plainly that nothing reaches a locked phone yet, and
 *   never shows push as on before the phone subscribed (off, with the button to switch it on;
 *   "not available yet" on a server without push); the e-mail address and a
 *   level filter are saved (read back through the API and after a reload); the test e-mail
 *   reaches the SMTP inbox. Alerts out is not offered to crew.
 * - Alerts out (the competent person): a webhook added to the receiver shows its secret once
 *   (copied by the button, gone after "I have stored it" and a reload), its test message reaches
 *   the receiver with a valid signature and the screen and the delivery panel say "Delivered";
 *   a webhook to a closed port shows as not delivered with the refused connection as the reason,
 *   on the panel and on the board's line; an escalation chain is built, reordered and saved.
 * Screenshots at phone (390 × 844) and desktop (1366 × 900) size, the failing webhook in the dark
 * theme; axe-core finds no serious or critical violation (WCAG contrast included) on either screen.
 */
import { createHmac, timingSafeEqual } from 'node:crypto';
import http from 'node:http';
import net from 'node:net';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '../../server/log.ts';
import { startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';
import { Api, desktop, describeViolations, ensureWebBuilt, launchBrowser, phone, requireChromium, screenshot, seriousAxeViolations, signInThroughForm, skipBrowserTests } from './support.ts';

const admin = { username: 'site-admin', password: 'e2e-admin-password' };
const crew = { username: 'rigger-ana', password: 'rigger-ana-password-1', displayName: 'Ana (rigger)' };

interface Received {
  headers: http.IncomingHttpHeaders;
  raw: string;
}
const received: Received[] = [];
const inbox: Array<{ to: string[]; raw: string }> = [];

/** A port that refuses connections: listened on, then closed. */
async function refusedPort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((resolve) => s.listen(0, '127.0.0.1', resolve));
  const port = (s.address() as { port: number }).port;
  await new Promise((resolve) => s.close(resolve));
  return port;
}

/** The receiver's own check of the contract's signature (README "Webhook contract"). */
function signatureValid(r: Received, secret: string): boolean {
  const ts = String(r.headers['x-signature-timestamp'] ?? '');
  const sig = String(r.headers['x-signature'] ?? '');
  const expected = `sha256=${createHmac('sha256', secret).update(`${ts}.${r.raw}`).digest('hex')}`;
  return sig.length === expected.length && timingSafeEqual(Buffer.from(sig), Buffer.from(expected));
}

describe.skipIf(skipBrowserTests)('notification screens', () => {
  let ts: TestServer;
  let browser: Browser;
  let receiver: http.Server;
  let receiverUrl = '';
  let deadUrl = '';
  let smtp: SMTPServer;

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    receiver = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', () => {
        received.push({ headers: req.headers, raw: Buffer.concat(chunks).toString('utf8') });
        res.writeHead(200, { 'content-type': 'text/plain' }).end('ok');
      });
    });
    await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', resolve));
    receiverUrl = `http://127.0.0.1:${(receiver.address() as { port: number }).port}/radio-desk`;
    deadUrl = `http://127.0.0.1:${await refusedPort()}/nobody-home`;
    smtp = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      onData(stream, session, callback) {
        const chunks: Buffer[] = [];
        stream.on('data', (c: Buffer) => chunks.push(c));
        stream.on('end', () => {
          inbox.push({ to: session.envelope.rcptTo.map((r) => r.address), raw: Buffer.concat(chunks).toString('utf8') });
          callback();
        });
      },
    });
    await new Promise<void>((resolve) => smtp.listen(0, '127.0.0.1', resolve));
    const smtpPort = (smtp.server.address() as { port: number }).port;
    ts = await startTestServer(
      { ADMIN_USERNAME: admin.username, ADMIN_PASSWORD: admin.password, SMTP_URL: `smtp://127.0.0.1:${smtpPort}`, SMTP_FROM: 'Wind watch <wind@brackenfold.example>' },
      { staticRoot: path.resolve('web/dist') },
      createLogger('warn'),
    );
    const api = new Api(ts.baseUrl);
    await api.signIn(admin.username, admin.password);
    await api.call('POST', '/api/people', { username: crew.username, displayName: crew.displayName, role: 'crew', password: crew.password });
    browser = await launchBrowser();
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    await ts?.stop();
    await new Promise<void>((resolve) => (receiver ? receiver.close(() => resolve()) : resolve()));
    await new Promise<void>((resolve) => (smtp ? smtp.close(() => resolve()) : resolve()));
  });

  async function open(viewport: { width: number; height: number }, who: { username: string; password: string }, colorScheme: 'light' | 'dark' = 'light'): Promise<Page> {
    const context = await browser.newContext({ viewport, colorScheme });
    const page = await context.newPage();
    page.setDefaultTimeout(15_000);
    page.on('dialog', (d) => void d.accept());
    await signInThroughForm(page, ts.baseUrl, who.username, who.password);
    return page;
  }

  it('a crew member sets an e-mail address and a level filter; they are saved, and the test e-mail reaches the inbox (phone)', async () => {
    const page = await open(phone, crew);
    await page.goto(`${ts.baseUrl}/#/more`);
    await page.getByRole('link', { name: /My alerts/ }).click();
    await expect(page.getByRole('link', { name: /Alerts out/ }).count()).resolves.toBe(0);
    await page.getByRole('heading', { name: 'My alerts' }).waitFor();
    // Nothing set yet: said first, plainly; push is not offered as on when the server has none.
    await page.getByTestId('locked-nothing').waitFor();
    // Push is never shown as on before this phone has subscribed: off here, or not available on a
    // server that has no push (GET /api/push/key 404, or `enabled: false`).
    const key = await fetch(`${ts.baseUrl}/api/push/key`);
    const serverHasPush = key.ok && ((await key.json()) as { enabled?: boolean }).enabled === true;
    const pushState = page.getByTestId('push-state');
    await pushState.getByText(/not available yet|Off:/).waitFor();
    expect(await pushState.textContent()).toContain(serverHasPush ? 'Off: this phone gets no push messages.' : 'Push is not available yet on this server');
    await expect(page.getByRole('button', { name: serverHasPush ? 'Switch push on for this phone' : /Switch push/ }).count()).resolves.toBe(serverHasPush ? 1 : 0);
    await expect(page.locator('.board-only').textContent()).resolves.toContain('The board itself alerts only while it is open');
    await expect(page.getByRole('button', { name: 'Send me a test e-mail' }).isDisabled()).resolves.toBe(true);

    await page.fill('#my-email', 'ana@brackenfold.example');
    await page.getByLabel('From a level up').check();
    await page.selectOption('#my-filter-level', '3');
    await expect(page.getByTestId('my-filter-means').textContent()).resolves.toBe('Gets alerts at level 3 (Stop and clear) or higher, and every no-data and sensor alert.');
    await page.click('#my-save');
    await page.getByText('✓ Saved.').waitFor();

    // Saved on the server, as this person…
    const api = new Api(ts.baseUrl);
    await api.signIn(crew.username, crew.password);
    const mine = await api.call<{ email: string | null; filter: unknown; emailAvailable: boolean }>('GET', '/api/me/notifications');
    expect(mine).toEqual({ email: 'ana@brackenfold.example', filter: { kind: 'levels', atLeast: 3 }, emailAvailable: true });
    // …and shown again after a reload, with what now reaches the locked phone.
    await page.reload();
    await page.getByTestId('locked-lines').waitFor();
    await expect(page.inputValue('#my-email')).resolves.toBe('ana@brackenfold.example');
    await expect(page.inputValue('#my-filter-level')).resolves.toBe('3');
    await expect(page.getByTestId('locked-lines').textContent()).resolves.toContain('E-mail to ana@brackenfold.example: alerts at level 3 (Stop and clear) or higher');
    await expect(page.getByTestId('locked-nothing').count()).resolves.toBe(0);

    await page.getByRole('button', { name: 'Send me a test e-mail' }).click();
    await expect(page.getByTestId('my-email-result').textContent()).resolves.toContain('Handed to the server');
    const mail = await waitFor(() => inbox.find((m) => m.to.includes('ana@brackenfold.example')), 15_000, 'the test e-mail in the SMTP inbox');
    expect(mail.raw).toContain('Test message from the wind watch');
    expect(describeViolations(await seriousAxeViolations(page))).toBe('');
    await screenshot(page, 'my-alerts-phone');
    await page.setViewportSize(desktop);
    await screenshot(page, 'my-alerts-desktop');
    await page.context().close();
  }, 60_000);

  it('the competent person adds a webhook, sees its secret once, and its test message is delivered to the receiver (desktop)', async () => {
    const page = await open(desktop, admin);
    await page.goto(`${ts.baseUrl}/#/more`);
    await page.getByRole('link', { name: /Alerts out/ }).click();
    await page.getByRole('heading', { name: 'Alerts out' }).waitFor();
    await page.context().grantPermissions(['clipboard-read', 'clipboard-write'], { origin: ts.baseUrl });

    await page.fill('#hook-name', 'Radio desk');
    await page.fill('#hook-url', receiverUrl);
    await page.click('#hook-add');
    const secret = ((await page.getByTestId('webhook-secret').textContent()) ?? '').trim();
    expect(secret).toMatch(/^whsec_[A-Za-z0-9_-]{20,}$/);
    await page.getByRole('button', { name: 'Copy secret' }).click();
    await page.getByText('✓ Copied.').waitFor();
    await expect(page.evaluate('navigator.clipboard.readText()')).resolves.toBe(secret);
    await screenshot(page, 'alerts-out-secret-desktop');
    await page.getByRole('button', { name: 'I have stored it' }).click();
    await expect(page.getByTestId('webhook-secret-box').count()).resolves.toBe(0);

    const hook = page.getByTestId('hook-1');
    await hook.getByRole('button', { name: 'Send a test message' }).click();
    await hook.getByTestId('hook-1-result').getByText('Delivered at').waitFor();
    await expect(hook.getByTestId('hook-1-result').textContent()).resolves.toContain('HTTP 200');
    const got = await waitFor(() => received.find((r) => JSON.parse(r.raw).event === 'test'), 5_000, 'the test message at the receiver');
    expect(signatureValid(got, secret)).toBe(true);
    expect(JSON.parse(got.raw).alert).toEqual({ id: 0, kind: 'test', label: 'Test message' });

    // The delivery panel (refreshed every few seconds) lists it as delivered, to that webhook.
    const row = page.getByTestId('delivery').filter({ hasText: 'webhook “Radio desk”' }).first();
    await row.getByText('Delivered at').waitFor();
    await expect(row.getAttribute('data-status')).resolves.toBe('delivered');
    await expect(row.textContent()).resolves.toContain('test message');

    // Shown once: after a reload the secret is nowhere on the screen.
    await page.reload();
    await page.getByTestId('hook-1').waitFor();
    await expect(page.locator('body').textContent()).resolves.not.toContain(secret);
    await page.context().close();
  }, 60_000);

  it('a webhook to a closed port shows as not delivered with the refused connection, on the panel and on the board (phone, at night: dark theme)', async () => {
    const page = await open(phone, admin, 'dark');
    await page.goto(`${ts.baseUrl}/#/alerts-out`);
    await page.fill('#hook-name', 'Old SMS gateway');
    await page.fill('#hook-url', deadUrl);
    await page.click('#hook-add');
    await page.getByTestId('webhook-secret').waitFor();
    await page.getByRole('button', { name: 'I have stored it' }).click();
    const hook = page.getByTestId('hook-2');
    await hook.getByRole('button', { name: 'Send a test message' }).click();
    const result = hook.getByTestId('hook-2-result');
    await result.getByText('Not delivered yet').waitFor();
    await expect(result.textContent()).resolves.toContain('ECONNREFUSED');

    await page.getByRole('button', { name: 'Not getting through' }).click();
    const row = page.getByTestId('delivery').filter({ hasText: 'webhook “Old SMS gateway”' }).first();
    await row.getByText('Not delivered yet').waitFor();
    await expect(row.textContent()).resolves.toContain('ECONNREFUSED');
    await expect(page.getByTestId('delivery').filter({ hasText: 'Radio desk' }).count()).resolves.toBe(0);
    expect(describeViolations(await seriousAxeViolations(page))).toBe('');
    await screenshot(page, 'alerts-out-failing-phone-dark');

    // The board's status area tells the competent person, in one line, with the reason.
    await page.goto(`${ts.baseUrl}/#/`);
    const line = page.getByTestId('notify-trouble');
    await line.waitFor();
    await expect(line.textContent()).resolves.toContain('Alert messages not getting out');
    await expect(line.textContent()).resolves.toContain('ECONNREFUSED');
    await screenshot(page, 'board-notify-trouble-phone-dark');
    await page.context().close();
  }, 60_000);

  it('the competent person builds an escalation chain, reorders it and saves it (phone, then desktop)', async () => {
    const page = await open(phone, admin);
    await page.goto(`${ts.baseUrl}/#/alerts-out`);
    const level3 = page.getByTestId('esc-level-3');
    await level3.getByRole('button', { name: /Add a step/ }).click();
    await level3.getByRole('button', { name: /Add a step/ }).click();
    await page.selectOption('#esc-3-0-to', 'role:crew');
    await page.fill('#esc-3-1-min', '15');
    // The competent person first, then the crew.
    await page.getByRole('button', { name: 'Move step 2 of level 3 (Stop and clear) up' }).click();
    await expect(level3.textContent()).resolves.toContain('15 min after the alert');
    await expect(level3.textContent()).resolves.toContain('20 min after the alert');
    await page.click('#esc-save');
    await page.getByText('✓ Saved.').waitFor();
    const api = new Api(ts.baseUrl);
    await api.signIn(admin.username, admin.password);
    const chains = await api.call<{ chains: Array<{ level: number; steps: unknown[] }> }>('GET', '/api/notify/escalation');
    expect(chains.chains.map((c) => ({ level: c.level, steps: c.steps }))).toEqual([
      {
        level: 3,
        steps: [
          { afterMinutes: 15, role: 'competent-person' },
          { afterMinutes: 5, role: 'crew' },
        ],
      },
    ]);
    // A step without minutes is refused by the server, which names the field.
    await page.fill('#esc-3-0-min', '');
    await page.click('#esc-save');
    await page.getByText(/Not saved/).waitFor();
    await level3.locator('.field-error').first().waitFor();
    await page.fill('#esc-3-0-min', '15');
    await screenshot(page, 'alerts-out-escalation-phone');
    await page.setViewportSize(desktop);
    await screenshot(page, 'alerts-out-desktop');
    await page.context().close();
  }, 60_000);
});
