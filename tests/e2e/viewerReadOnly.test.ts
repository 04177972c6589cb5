/**
 * What a viewer (and crew, and a site link) cannot change is plainly read-only: every screen they
 * can open shows "Read only" and whom to ask, with no enabled input and no action button for what
 * the role may not do (Site settings, Structures, a structure, Sensors); People and Site links
 * refuse the role. Checked in Chromium at phone (390 × 844) and desktop (1366 × 900) size, with
 * axe-core on the read-only settings.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Api, describeViolations, desktop, ensureWebBuilt, launchBrowser, phone, requireChromium, screenshot, seriousAxeViolations, signInThroughForm, skipBrowserTests, startE2eServer, type E2eServer } from './support.ts';

const admin = { username: 'site-admin', password: 'e2e-admin-password' };
const viewer = { username: 'steward', displayName: 'Gate steward', password: 'e2e-viewer-password' };
const crew = { username: 'rigger', displayName: 'Jo Marsh (rigger)', password: 'e2e-crew-password' };

/** Enabled form controls and buttons inside the screen (the header and tab bar are links). */
async function controls(page: Page): Promise<{ inputs: string[]; buttons: string[] }> {
  return page.evaluate(`(() => {
    const main = document.querySelector('main');
    const inputs = [...main.querySelectorAll('input, select, textarea')].filter((e) => !e.disabled && !e.closest('fieldset:disabled')).map((e) => e.id || e.name || e.tagName);
    const buttons = [...main.querySelectorAll('button')].filter((b) => !b.disabled).map((b) => b.textContent.trim());
    return { inputs, buttons };
  })()`) as Promise<{ inputs: string[]; buttons: string[] }>;
}

describe.skipIf(skipBrowserTests)('read-only screens for a viewer', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let structureId = 0;

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    e2e = await startE2eServer(admin);
    browser = await launchBrowser();
    const api = new Api(e2e.baseUrl);
    await api.signIn(admin.username, admin.password);
    await api.call('POST', '/api/people', { username: viewer.username, displayName: viewer.displayName, role: 'viewer', password: viewer.password });
    await api.call('POST', '/api/people', { username: crew.username, displayName: crew.displayName, role: 'crew', password: crew.password });
    await api.call('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10 });
    const record = { kind: 'custom', name: 'Gate arch', baseDepthM: 1.5, frictionCoefficient: 0.3, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ label: 'ballast', massKg: 1000, xM: 0.75 }] };
    structureId = (await api.call<{ structure: { id: number } }>('POST', '/api/structures', { record })).structure.id;
    await api.call('PATCH', '/api/site', { name: 'Brackenfold Common', timeZone: 'Europe/London', directionalEnabled: true });
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    await e2e?.stop();
  });

  for (const [size, viewport] of [
    ['phone', phone],
    ['desktop', desktop],
  ] as const) {
    it(`shows the site settings to a viewer as text, with no inputs and no buttons (${size})`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      page.setDefaultTimeout(10_000);
      await signInThroughForm(page, e2e.baseUrl, viewer.username, viewer.password);
      await page.goto(`${e2e.baseUrl}/#/site`);
      await page.getByRole('heading', { name: 'Site settings' }).waitFor();
      await page.getByText('Read only.').waitFor();
      await expect(page.locator('.readonly-note').textContent()).resolves.toContain('ask the site’s competent person');
      // The values as text: the site's time zone, the direction sector, the default actions.
      await expect(page.locator('dl.readonly-list').textContent()).resolves.toContain('Europe/London');
      await expect(page.locator('dl.readonly-list').textContent()).resolves.toContain('±45°');
      await expect(page.locator('table.levels-readonly tbody tr').count()).resolves.toBe(3);
      await expect(page.locator('table.levels-readonly').textContent()).resolves.toContain('Stop and clear');
      const found = await controls(page);
      expect(found.inputs).toEqual([]);
      expect(found.buttons).toEqual([]);
      await expect(page.getByRole('button', { name: /Move up|Remove level|Add a level|Save/ }).count()).resolves.toBe(0);
      if (size === 'phone') expect(describeViolations(await seriousAxeViolations(page))).toBe('');
      await screenshot(page, `viewer-site-settings-${size}`);
      await context.close();
    });
  }

  it('shows Structures, a structure and Sensors to a viewer as read-only, and refuses People and Site links', async () => {
    for (const [size, viewport] of [
      ['phone', phone],
      ['desktop', desktop],
    ] as const) {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      page.setDefaultTimeout(10_000);
      await signInThroughForm(page, e2e.baseUrl, viewer.username, viewer.password);

      await page.goto(`${e2e.baseUrl}/#/register`);
      await page.locator('.register-item', { hasText: 'Gate arch' }).waitFor();
      await page.getByText('Read only.').waitFor();
      await expect(page.getByRole('link', { name: 'Register a structure' }).count()).resolves.toBe(0);
      await expect(page.getByRole('link', { name: 'Site settings (read only)' }).count()).resolves.toBe(1);
      // The item opens the structure's page, not the form.
      await expect(page.locator('.register-item', { hasText: 'Gate arch' }).getAttribute('href')).resolves.toBe(`#/structure/${structureId}`);
      let found = await controls(page);
      expect(found.inputs).toEqual([]);
      expect(found.buttons).toEqual([]);
      await screenshot(page, `viewer-register-${size}`);

      await page.goto(`${e2e.baseUrl}/#/structure/${structureId}`);
      await page.getByRole('heading', { name: 'Levels and actions' }).waitFor();
      await expect(page.getByRole('link', { name: 'Edit structure and levels' }).count()).resolves.toBe(0);
      found = await controls(page);
      expect(found.inputs).toEqual([]);
      // Only the chart's time window: it changes the view, nothing on the server.
      expect(found.buttons.sort()).toEqual(['1 h', '12 h', '24 h', '3 h']);
      await screenshot(page, `viewer-structure-${size}`);

      await page.goto(`${e2e.baseUrl}/#/sensors`);
      await page.locator('.sensor-card', { hasText: 'North mast' }).waitFor();
      await page.getByText('Read only.').waitFor();
      await expect(page.getByRole('button', { name: /Register a sensor|Edit North mast|Make gateway/ }).count()).resolves.toBe(0);
      await expect(page.getByRole('heading', { name: 'Refused at the broker' }).count()).resolves.toBe(0);
      found = await controls(page);
      expect(found.inputs).toEqual([]);
      expect(found.buttons).toEqual([]);
      await screenshot(page, `viewer-sensors-${size}`);

      await page.goto(`${e2e.baseUrl}/#/more`);
      await page.getByRole('link', { name: 'Site settings and default levels (read only)' }).waitFor();
      await expect(page.getByRole('link', { name: /People and roles|Site links|checklist/ }).count()).resolves.toBe(0);
      await expect(page.getByTestId('checklist-summary').count()).resolves.toBe(0);

      for (const [route, need] of [
        ['/people', 'administrator'],
        ['/links', 'competent person'],
        ['/setup', 'competent person'],
      ]) {
        await page.goto(`${e2e.baseUrl}/#${route}`);
        await page.getByText(`This screen needs the ${need} role.`).waitFor();
      }
      await context.close();
    }
  });

  it('shows the site settings read-only to crew too', async () => {
    const context = await browser.newContext({ viewport: phone });
    const page = await context.newPage();
    page.setDefaultTimeout(10_000);
    await signInThroughForm(page, e2e.baseUrl, crew.username, crew.password);
    await page.goto(`${e2e.baseUrl}/#/site`);
    await page.getByText('Read only.').waitFor();
    await expect(page.locator('.readonly-note').textContent()).resolves.toContain('As crew you can read');
    const found = await controls(page);
    expect(found.inputs).toEqual([]);
    expect(found.buttons).toEqual([]);
    await context.close();
  });

  it('still gives the competent person (here the administrator) the form to edit', async () => {
    const context = await browser.newContext({ viewport: phone });
    const page = await context.newPage();
    page.setDefaultTimeout(10_000);
    await signInThroughForm(page, e2e.baseUrl, admin.username, admin.password);
    await page.goto(`${e2e.baseUrl}/#/site`);
    await page.locator('#st-name').waitFor();
    await expect(page.locator('#st-name').isEnabled()).resolves.toBe(true);
    await expect(page.getByRole('button', { name: 'Save site settings' }).count()).resolves.toBe(1);
    await expect(page.getByText('Read only.').count()).resolves.toBe(0);
    await context.close();
  });
});
