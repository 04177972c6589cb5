/**
 * The Site links screen shows which address the links carry: the configured PUBLIC_URL, or —
 * when it is unset — the address this browser used, with a warning that phones on another
 * network may not reach it. Chromium at phone (390 × 844) and desktop (1366 × 900) size.
 */
import path from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '../../server/log.ts';
import { startTestServer, type TestServer } from '../helpers/testServer.ts';
import { desktop, describeViolations, ensureWebBuilt, launchBrowser, phone, requireChromium, screenshot, seriousAxeViolations, signInThroughForm, skipBrowserTests } from './support.ts';

const admin = { username: 'site-admin', password: 'e2e-admin-password' };
const publicUrl = 'https://wind.brackenfold.example';

describe.skipIf(skipBrowserTests)('site link address', () => {
  let withPublic: TestServer;
  let without: TestServer;
  let browser: Browser;

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    const env = { ADMIN_USERNAME: admin.username, ADMIN_PASSWORD: admin.password };
    const options = { staticRoot: path.resolve('web/dist') };
    withPublic = await startTestServer({ ...env, PUBLIC_URL: `${publicUrl}/` }, options, createLogger('warn'));
    without = await startTestServer(env, options, createLogger('warn'));
    browser = await launchBrowser();
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    await withPublic?.stop();
    await without?.stop();
  });

  for (const [size, viewport] of [
    ['phone', phone],
    ['desktop', desktop],
  ] as const) {
    it(`makes a link with PUBLIC_URL when it is set (${size})`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      page.setDefaultTimeout(10_000);
      await signInThroughForm(page, withPublic.baseUrl, admin.username, admin.password);
      await page.goto(`${withPublic.baseUrl}/#/links`);
      await expect(page.getByTestId('link-address').textContent()).resolves.toContain(`Links use the site’s public address ${publicUrl} (PUBLIC_URL)`);
      await page.fill('#sl-label', `Gate stewards ${size}`);
      await page.getByRole('button', { name: 'Make link' }).click();
      const url = (await page.getByTestId('site-link-url').textContent()) ?? '';
      expect(url).toMatch(/^https:\/\/wind\.brackenfold\.example\/link\/[A-Za-z0-9_-]+$/);
      await expect(page.getByTestId('made-link-warning').count()).resolves.toBe(0);
      await screenshot(page, `site-link-public-url-${size}`);
      await context.close();
    });

    it(`falls back to this browser's address and warns when PUBLIC_URL is unset (${size})`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      page.setDefaultTimeout(10_000);
      await signInThroughForm(page, without.baseUrl, admin.username, admin.password);
      await page.goto(`${without.baseUrl}/#/links`);
      const warning = page.getByTestId('link-address');
      await expect(warning.textContent()).resolves.toContain('Phones on another network may not reach these links.');
      await expect(warning.textContent()).resolves.toContain(`PUBLIC_URL is not set, so links use ${without.baseUrl}`);
      await page.fill('#sl-label', `Car park stewards ${size}`);
      await page.getByRole('button', { name: 'Make link' }).click();
      const url = (await page.getByTestId('site-link-url').textContent()) ?? '';
      expect(url.startsWith(`${without.baseUrl}/link/`)).toBe(true);
      await expect(page.getByTestId('made-link-warning').textContent()).resolves.toContain('phones on another network may not open it');
      if (size === 'phone') expect(describeViolations(await seriousAxeViolations(page))).toBe('');
      await screenshot(page, `site-link-no-public-url-${size}`);
      await context.close();
    });
  }
});
