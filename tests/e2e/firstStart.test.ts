/**
 * A fresh server with nobody in it: the app opens on "First start", takes the one-time setup code
 * the server printed in its log, creates the first administrator and signs them in; they land on
 * the checklist, whose six steps tick themselves as the real things appear (made through the API
 * and a reading published with mqtt.js through the embedded broker), and which can be hidden.
 */
import mqtt from 'mqtt';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { Api, describeViolations, desktop, ensureWebBuilt, launchBrowser, phone, screenshot, seriousAxeViolations, startE2eServer, type E2eServer, requireChromium, skipBrowserTests } from './support.ts';

const skip = skipBrowserTests;

describe.skipIf(skip)('first start in a real browser', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let page: Page;
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
    page = await browser.newPage({ viewport: phone });
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
  });

  it('lands the new administrator on the checklist, every step to do', async () => {
    await page.getByRole('heading', { name: 'Getting the site ready' }).waitFor();
    expect(page.url()).toMatch(/#\/setup$/);
    await expect(page.getByTestId('checklist-count').textContent()).resolves.toBe('0 of 6 done');
    await expect(page.locator('ol.checklist > li').count()).resolves.toBe(6);
    await expect(page.locator('ol.checklist > li[data-done="no"]').count()).resolves.toBe(6);
    // Each step names its state and links to its screen.
    await expect(page.locator('li[data-step="site"]').textContent()).resolves.toContain('Not saved yet; now time zone UTC');
    await expect(page.locator('li[data-step="site"] a').getAttribute('href')).resolves.toBe('#/site');
    await expect(page.locator('li[data-step="levels"] a').getAttribute('href')).resolves.toBe('#/site?section=levels');
    await expect(page.locator('li[data-step="people"] a').getAttribute('href')).resolves.toBe('#/people');
    expect(describeViolations(await seriousAxeViolations(page))).toBe('');
    await screenshot(page, 'checklist-new-phone');
  });

  it('ticks each step as its state appears, while the checklist stays open', async () => {
    const api = new Api(e2e.baseUrl);
    await api.signIn('office', 'first-admin-password');
    const tick = (step: string) => page.locator(`li[data-step="${step}"][data-done="yes"]`).waitFor();

    await api.call('PATCH', '/api/site', { name: 'Brackenfold Common', timeZone: 'Europe/London', terrainCategory: 'III' });
    await tick('site');
    await expect(page.locator('li[data-step="site"]').textContent()).resolves.toContain('time zone Europe/London, terrain category III');

    await api.call('POST', '/api/sensors', { key: 'north-mast', name: 'North mast', heightM: 10 });
    await page.locator('li[data-step="sensors"]', { hasText: 'no gateway may publish' }).waitFor();
    await expect(page.locator('li[data-step="sensors"]').getAttribute('data-done')).resolves.toBe('no');
    const { password } = await api.call<{ password: string }>('POST', '/api/gateways', { name: 'Office gateway', username: 'office-gw', sensorKeys: ['north-mast'] });
    await tick('sensors');

    const record = { kind: 'custom', name: 'Gate arch', baseDepthM: 1.5, frictionCoefficient: 0.3, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ label: 'ballast', massKg: 1000, xM: 0.75 }] };
    const levels = [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Check the arch ballast blocks and the ratchet straps.' },
      { label: 'Clear the arch', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Stewards move the queue 6 m back from the arch.' },
    ];
    await api.call('POST', '/api/structures', { record, levels });
    await tick('structures');
    await tick('levels');
    await expect(page.locator('li[data-step="levels"]').textContent()).resolves.toContain('1 structure has levels of its own');

    await api.call('POST', '/api/people', { username: 'sam.okoro', displayName: 'Sam Okoro', role: 'crew', password: 'crew-password-12' });
    await tick('people');
    await expect(page.getByTestId('checklist-count').textContent()).resolves.toBe('5 of 6 done');
    await screenshot(page, 'checklist-five-phone');

    const gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${e2e.server.mqttPort}`, { username: 'office-gw', password, protocolVersion: 4, reconnectPeriod: 0 });
    await gateway.publishAsync('wind/north-mast/reading', JSON.stringify({ ts: Date.now(), speed: 5.2, dir: 240 }), { qos: 1 });
    await gateway.endAsync();
    await tick('publish');
    await expect(page.locator('li[data-step="publish"]').textContent()).resolves.toContain('A reading arrived from North mast');
    await page.getByText('All 6 steps are done').waitFor();
    await page.setViewportSize(desktop);
    await screenshot(page, 'checklist-done-desktop');
    await page.setViewportSize(phone);
  }, 60_000);

  it('shows its progress on More until hidden, and can be shown again', async () => {
    // With every step done More shows nothing; disabling Sam undoes the people step.
    const api = new Api(e2e.baseUrl);
    await api.signIn('office', 'first-admin-password');
    const people = await api.call<{ people: Array<{ id: number; username: string }> }>('GET', '/api/people');
    await api.call('PATCH', `/api/people/${people.people.find((p) => p.username === 'sam.okoro')!.id}`, { disabled: true });
    await page.goto(`${e2e.baseUrl}/#/more`);
    const summary = page.getByTestId('checklist-summary');
    await summary.waitFor();
    await expect(summary.textContent()).resolves.toContain('5 of 6 done');
    await expect(summary.textContent()).resolves.toContain('Next: people');
    await screenshot(page, 'more-checklist-summary-phone');
    await summary.getByRole('button', { name: 'Hide' }).click();
    await expect(page.getByTestId('checklist-summary').count()).resolves.toBe(0);
    // Kept on this device across a reload; the checklist itself is still one tap away.
    await page.reload();
    await page.getByRole('link', { name: 'Getting the site ready: the first-start checklist' }).click();
    await page.getByText('Hidden from More on this device.').waitFor();
    await page.getByRole('button', { name: 'Show it on More again' }).click();
    await page.goto(`${e2e.baseUrl}/#/more`);
    await page.getByTestId('checklist-summary').waitFor();
  });
});
