/**
 * A fresh server with nobody in it: the app opens on "First start", takes the one-time setup code
 * the server printed in its log, creates the first administrator and signs them in.
 */
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { describeViolations, ensureWebBuilt, launchBrowser, phone, screenshot, seriousAxeViolations, startE2eServer, type E2eServer, requireChromium, skipBrowserTests } from './support.ts';

const skip = skipBrowserTests;

describe.skipIf(skip)('first start in a real browser', () => {
  let e2e: E2eServer;
  let browser: Browser;
  const logLines: string[] = [];

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    const log = pino({ level: 'warn' }, { write: (line: string) => void logLines.push(line) });
    e2e = await startE2eServer(null, log);
    browser = await launchBrowser();
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    await e2e?.stop();
  });

  it('creates the first administrator with the setup code from the log and signs them in', async () => {
    const setupLine = logLines.map((l) => JSON.parse(l) as { setupCode?: string }).find((l) => l.setupCode);
    expect(setupLine?.setupCode, `no setup code in the server log:\n${logLines.join('')}`).toBeTruthy();
    const page = await browser.newPage({ viewport: phone });
    page.setDefaultTimeout(10_000);
    await page.goto(`${e2e.baseUrl}/`);
    await page.getByRole('heading', { name: 'First start' }).waitFor();
    await screenshot(page, 'first-start-phone');
    expect(describeViolations(await seriousAxeViolations(page))).toBe('');

    // A wrong code is refused with the server's reason, and nothing is created.
    await page.fill('#fs-code', 'not-the-code');
    await page.fill('#fs-user', 'office');
    await page.fill('#fs-name', 'Site office');
    await page.fill('#fs-pass', 'first-admin-password');
    await page.getByRole('button', { name: 'Create administrator and sign in' }).click();
    await page.getByText('wrong setup code').waitFor();

    await page.fill('#fs-code', setupLine!.setupCode!);
    await page.getByRole('button', { name: 'Create administrator and sign in' }).click();
    await page.waitForSelector('nav.tabs');
    await expect(page.locator('header.top .who').textContent()).resolves.toContain('Site office');
    await expect(page.locator('header.top .role').textContent()).resolves.toBe('administrator');
    await page.close();
  });
});
