/**
 * The plan view, the side view and the words for what governs, in a real browser (Chromium)
 * against the real server: a custom structure with a base width and two faces, registered through
 * the API, shows on its register form and on its structure page the governing case the public
 * calculator (POST /api/assess) gives for the same record, its faces and masses in plan with no
 * two labels on top of each other, north (its orientation is known), and the table of every
 * direction; a strip record (no base width) says in the plan and in its warnings that its ends
 * were not checked; the board card carries the governing words.
 *
 * Screenshots at 390 × 844 and 1280 × 800, light and dark, go to /tmp/shots/ (looked at by hand;
 * the assertions here are the checks).
 */
import fs from 'node:fs';
import path from 'node:path';
import mqtt from 'mqtt';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Api, ensureWebBuilt, launchBrowser, phone, requireChromium, signInThroughForm, skipBrowserTests, startE2eServer, type E2eServer } from './support.ts';

const shotDir = '/tmp/shots';
const wide = { width: 1280, height: 800 };
const admin = { username: 'plan-admin', password: 'e2e-plan-admin-password' };

/**
 * An invented wing wall beside a stage: a 6 m panel looking out of the front and a 2 m return
 * looking out of the y = baseWidthM end, on a 2 m × 6 m base with a block at each corner and the
 * frame in the middle. Coefficients are demo values (EN 1991-1-4 7.4.3 signboard c_f = 1.80).
 */
const wingWall = {
  kind: 'custom',
  name: 'Wing wall east',
  baseDepthM: 2,
  baseWidthM: 6,
  faces: [
    { label: 'wall panel', areaM2: 12, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8, facingDeg: 0 },
    { label: 'return panel', areaM2: 4, centroidHeightM: 1.5, cfFront: 1.8, cfBack: 1.8, facingDeg: 90 },
  ],
  masses: [
    { label: 'frame', massKg: 300, xM: 1, yM: 3 },
    { label: 'block front left', massKg: 400, xM: 0.1, yM: 0.1 },
    { label: 'block front right', massKg: 400, xM: 0.1, yM: 5.9 },
    { label: 'block back left', massKg: 450, xM: 1.9, yM: 0.1 },
    { label: 'block back right', massKg: 450, xM: 1.9, yM: 5.9 },
  ],
  surface: 'grass',
  coefficientSource: 'demo values for an invented wall: EN 1991-1-4 7.4.3 signboard c_f = 1.80',
};
const wingOrientationDeg = 250;

/** A first-round record: no base width, so a strip. */
const stripBanner = {
  kind: 'custom',
  name: 'Gate banner (strip)',
  baseDepthM: 1.2,
  faces: [{ label: 'banner', areaM2: 8, centroidHeightM: 1.4, cfFront: 1.8, cfBack: 1.8 }],
  masses: [
    { label: 'feet and frame', massKg: 150, xM: 0.6 },
    { label: 'front ballast', massKg: 200, xM: 0 },
    { label: 'back ballast', massKg: 200, xM: 1.2 },
  ],
  surface: 'grass',
  coefficientSource: 'demo values for an invented banner: EN 1991-1-4 7.4.3 signboard c_f = 1.80',
};

interface AssessAnswer {
  governingText: string;
  limitGustMps: number | null;
  directions: unknown[];
  warnings: string[];
}

/**
 * Run in the page (as a string: the test's own type check has no DOM): pairs of text boxes inside
 * the svg `sel` that overlap by more than half a pixel each way, and texts that stick out of it.
 */
const textProblemsScript = (sel: string): string => `(() => {
  const svg = document.querySelector(${JSON.stringify(sel)});
  if (!svg) return { overlapping: [${JSON.stringify(`${sel} not found`)}], outside: [] };
  const frame = svg.getBoundingClientRect();
  const boxes = [...svg.querySelectorAll('text')].map((t) => ({ text: t.textContent || '', r: t.getBoundingClientRect() })).filter((b) => b.text.trim() !== '' && b.r.width > 0);
  const overlapping = [];
  for (let i = 0; i < boxes.length; i++) {
    for (let j = i + 1; j < boxes.length; j++) {
      const a = boxes[i].r, b = boxes[j].r;
      const w = Math.min(a.right, b.right) - Math.max(a.left, b.left);
      const h = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
      if (w > 0.5 && h > 0.5) overlapping.push('"' + boxes[i].text + '" x "' + boxes[j].text + '"');
    }
  }
  const outside = boxes.filter((b) => b.r.left < frame.left - 0.5 || b.r.right > frame.right + 0.5 || b.r.top < frame.top - 0.5 || b.r.bottom > frame.bottom + 0.5).map((b) => b.text);
  return { overlapping, outside };
})()`;

async function textProblems(page: Page, selector: string): Promise<{ overlapping: string[]; outside: string[] }> {
  return (await page.evaluate(textProblemsScript(selector))) as { overlapping: string[]; outside: string[] };
}

const clean = { overlapping: [], outside: [] };

async function shot(page: Page, name: string, selector?: string): Promise<void> {
  fs.mkdirSync(shotDir, { recursive: true });
  const file = path.join(shotDir, `${name}.png`);
  // The sticky header and tab bar would otherwise sit over the middle of a tall capture.
  await page.evaluate(`document.querySelectorAll('.top, .tabs, .alert-strip, .form-side').forEach((e) => { e.style.position = 'static'; e.style.maxHeight = 'none'; })`);
  if (selector) await page.locator(selector).first().screenshot({ path: file });
  else await page.screenshot({ path: file, fullPage: true });
  await page.evaluate(`document.querySelectorAll('.top, .tabs, .alert-strip, .form-side').forEach((e) => { e.style.position = ''; e.style.maxHeight = ''; })`);
}

describe.skipIf(skipBrowserTests)('plan view and governing words in a real browser', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let api: Api;
  let wingId = 0;
  let stripId = 0;
  let wingAnswer: AssessAnswer;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    e2e = await startE2eServer(admin);
    browser = await launchBrowser();
    api = new Api(e2e.baseUrl);
    await api.signIn(admin.username, admin.password);
    const wing = await api.call<{ structure: { id: number } }>('POST', '/api/structures', { record: wingWall, orientationDeg: wingOrientationDeg, location: 'East of the stage' });
    wingId = wing.structure.id;
    const strip = await api.call<{ structure: { id: number } }>('POST', '/api/structures', { record: stripBanner, orientationDeg: 0, location: 'Main gate' });
    stripId = strip.structure.id;
    const site = await api.call<{ airDensityKgM3: number }>('GET', '/api/site');
    wingAnswer = await api.call<AssessAnswer>('POST', '/api/assess', { structure: wingWall, gustMps: 20, airDensityKgM3: site.airDensityKgM3, frontAzimuthDeg: wingOrientationDeg });
    context = await browser.newContext({ viewport: phone });
    context.setDefaultTimeout(10_000);
    page = await context.newPage();
    page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
    });
    await signInThroughForm(page, e2e.baseUrl, admin.username, admin.password);
  }, 90_000);

  afterAll(async () => {
    await browser?.close();
    await e2e?.stop();
  });

  it('the register form says what governs in the calculator’s words for the record it sends, and draws it without overlapping or cut-off labels', async () => {
    // The form's answer must be the public calculator's answer for the body the form sends.
    const sent = page.waitForRequest((r) => r.url().endsWith('/api/assess') && r.method() === 'POST');
    await page.goto(`${e2e.baseUrl}/#/register/${wingId}`);
    const body = (await sent).postDataJSON() as Record<string, unknown>;
    expect(body.frontAzimuthDeg).toBe(wingOrientationDeg);
    const expected = await api.call<AssessAnswer>('POST', '/api/assess', body);
    await expect.poll(() => page.getByTestId('governing-text').textContent(), { timeout: 8_000 }).toContain(expected.governingText);
    const plan = page.locator('svg[data-testid=plan-view]');
    await plan.waitFor();
    await page.locator('svg[data-testid=side-view]').waitFor();
    await shot(page, 'form-figures-phone', 'aside.form-side .figures');
    expect(await textProblems(page, 'svg[data-testid=plan-view]')).toEqual(clean);
    expect(await textProblems(page, 'svg[data-testid=side-view]')).toEqual(clean);
    // Every direction the calculator assessed, one row each, the governing one marked.
    const table = page.getByTestId('directions');
    await table.locator('summary').click();
    await expect(table.locator('tbody tr').count()).resolves.toBe(expected.directions.length);
    await expect(table.locator('tbody tr.gov-row').count()).resolves.toBe(1);
    await expect(page.getByRole('note').filter({ hasText: 'Decision support only' }).count()).resolves.toBeGreaterThan(0);
    await shot(page, 'form-results-phone', 'aside.form-side');
    await shot(page, 'form-directions-phone', 'aside.form-side .results');
    await page.setViewportSize(wide);
    expect(await textProblems(page, 'svg[data-testid=plan-view]')).toEqual(clean);
    await shot(page, 'form-desktop');
    await shot(page, 'form-figures-desktop', 'aside.form-side .figures');
    await page.setViewportSize(phone);
  });

  it('a strip record says in its warnings and in its plan that the width is not given and the ends were not checked', async () => {
    await page.goto(`${e2e.baseUrl}/#/register/${stripId}`);
    await page.getByTestId('assess-warnings').waitFor();
    await expect(page.getByTestId('assess-warnings').textContent()).resolves.toContain('not checked');
    const plan = page.locator('svg[data-testid=plan-view]');
    await plan.waitFor();
    await expect(plan.locator('text', { hasText: 'width not given: ends not checked' }).count()).resolves.toBe(1);
    expect(await textProblems(page, 'svg[data-testid=plan-view]')).toEqual(clean);
    await shot(page, 'form-strip-figures-phone', 'aside.form-side .figures');
  });

  it('the structure page leads with the live governing words and the limit, and draws the calculator’s case for the stored record', async () => {
    const live = await api.call<{ structure: { live: { governingText: string | null; warnings: string[] } } }>('GET', `/api/structures/${wingId}`);
    expect(live.structure.live.governingText).not.toBeNull();
    await page.goto(`${e2e.baseUrl}/#/structure/${wingId}`);
    await expect.poll(() => page.getByTestId('live-governs').textContent()).toContain(live.structure.live.governingText!);
    await expect.poll(() => page.getByTestId('calc-governs').textContent(), { timeout: 8_000 }).toBe(wingAnswer.governingText);
    // The stored record in full: both faces, every mass at its corner, north (the orientation is known).
    expect(wingAnswer.governingText).toMatch(/^wind from the [NESW]{1,3} /);
    const plan = page.locator('svg[data-testid=plan-view]');
    await plan.waitFor();
    await expect(plan.locator('g.pv-face').count()).resolves.toBe(2);
    await expect(plan.locator('g.pv-north').count()).resolves.toBe(1);
    await expect(plan.locator('circle.pv-mass').count()).resolves.toBe(5);
    const texts = await plan.locator('text').allTextContents();
    await shot(page, 'structure-figures-phone', '.how-calculated .figures');
    for (const kg of ['300\u00a0kg', '400\u00a0kg', '450\u00a0kg']) expect(texts.filter((t) => t === kg).length).toBe(kg.startsWith('300') ? 1 : 2);
    expect(texts.some((t) => t.startsWith('wind from the '))).toBe(true);
    expect(await textProblems(page, 'svg[data-testid=plan-view]')).toEqual(clean);
    expect(await textProblems(page, 'svg[data-testid=side-view]')).toEqual(clean);
    await shot(page, 'structure-phone');
    await page.evaluate('window.scrollTo(0, 0)');
    await page.screenshot({ path: path.join(shotDir, 'structure-top-phone.png') });
    await page.setViewportSize(wide);
    await shot(page, 'structure-desktop');
    await page.setViewportSize(phone);
    await page.goto(`${e2e.baseUrl}/#/structure/${stripId}`);
    await page.getByTestId('assess-warnings').first().waitFor();
    await expect(page.getByTestId('assess-warnings').first().textContent()).resolves.toContain('not checked');
    await page.evaluate('window.scrollTo(0, 0)');
    await page.screenshot({ path: path.join(shotDir, 'structure-strip-top-phone.png') });
  });

  it('with wind on site the card and the page name what governs at the current gust, in the dark theme too', async () => {
    await api.call('POST', '/api/sensors', { key: 'east-mast', name: 'East mast', heightM: 4 });
    const gateway = await api.call<{ password: string }>('POST', '/api/gateways', { name: 'East gateway', username: 'east-gw', sensorKeys: ['east-mast'] });
    const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${e2e.server.mqttPort}`, { username: 'east-gw', password: gateway.password, clientId: 'e2e-plan-gateway', reconnectPeriod: 0 });
    try {
      await client.publishAsync('wind/east-mast/reading', JSON.stringify({ ts: Date.now(), speed: 6, gust: 11, dir: 200 }), { qos: 1 });
      await page.emulateMedia({ colorScheme: 'dark' });
      await page.goto(`${e2e.baseUrl}/#/`);
      const card = page.locator('a.structure-card', { hasText: wingWall.name });
      await expect.poll(() => card.getByTestId('card-governs').textContent(), { timeout: 10_000 }).toMatch(/^Governs: wind from the /);
      await shot(page, 'board-dark-phone');
      await page.goto(`${e2e.baseUrl}/#/structure/${wingId}`);
      await expect.poll(() => page.locator('.how-calculated').textContent(), { timeout: 10_000 }).toContain('at the current gust here');
      await page.locator('svg[data-testid=plan-view]').waitFor();
      expect(await textProblems(page, 'svg[data-testid=plan-view]')).toEqual(clean);
      await shot(page, 'structure-dark-phone');
      await page.evaluate('window.scrollTo(0, 0)');
      await page.screenshot({ path: path.join(shotDir, 'structure-top-dark-phone.png') });
      await shot(page, 'structure-figures-dark-phone', '.how-calculated .figures');
      await page.setViewportSize(wide);
      await shot(page, 'structure-dark-desktop');
      await page.goto(`${e2e.baseUrl}/#/register/${wingId}`);
      // The form's side panel shows one drawing at a time: open the plan.
      await page.getByRole('tab', { name: 'Plan' }).click();
      await page.locator('svg[data-testid=plan-view]').waitFor();
      await shot(page, 'form-dark-desktop');
      await page.setViewportSize(phone);
      await page.emulateMedia({ colorScheme: 'light' });
    } finally {
      await client.endAsync();
    }
    expect(pageErrors).toEqual([]);
  }, 60_000);
});
