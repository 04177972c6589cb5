/**
 * Registering a fence through the form from empty, in a real browser (Chromium) against the real
 * server, at phone size (390 × 844) and desktop size (1366 × 900): the new form holds no number
 * nobody typed and a save from it stores nothing; the calculator names each field it waits for by
 * its label and takes the person to the first; the fence starts from a common panel size and a
 * panel count, the run and the feet following; the answer stays in view while typing (a strip on a
 * phone, the side panel with its drawing on a desktop) and is the public calculator's answer for the
 * body the form sends; a reference height below the banner's centroid is refused in plain words.
 *
 * Screenshots (viewport) go to tests/artifacts/screenshots/register-form-*.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Api, describeViolations, desktop, ensureWebBuilt, seriousAxeViolations, launchBrowser, phone, requireChromium, screenshotDir, signInThroughForm, skipBrowserTests, startE2eServer, type E2eServer } from './support.ts';

const admin = { username: 'form-admin', password: 'e2e-form-admin-password' };
/** The validation library's own phrases (zod 4 defaults), which must never reach the page. */
const libraryWords = /Invalid (input|option|discriminator|string|number|key|element)|expected \w+, received|Too (small|big)|Unrecognized/;

async function view(page: Page, name: string): Promise<void> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `register-form-${name}.png`) });
}

/** Where an element is on the screen now, and whether it is within the visible area above the tabs (60 px). */
async function onScreen(page: Page, selector: string): Promise<{ top: number; bottom: number; visible: boolean }> {
  const box = await page.locator(selector).first().boundingBox();
  const height = page.viewportSize()!.height;
  if (!box) return { top: -1, bottom: -1, visible: false };
  return { top: box.y, bottom: box.y + box.height, visible: box.y >= 56 && box.y + Math.min(box.height, 40) <= height - 60 };
}

const activeId = (page: Page) => page.evaluate('document.activeElement ? document.activeElement.id : ""') as Promise<string>;

describe.skipIf(skipBrowserTests)('registering a fence through the form, in a real browser', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let api: Api;

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    e2e = await startE2eServer(admin);
    browser = await launchBrowser();
    api = new Api(e2e.baseUrl);
    await api.signIn(admin.username, admin.password);
  }, 90_000);

  afterAll(async () => {
    await browser?.close();
    await e2e?.stop();
  });

  for (const [size, viewport] of [
    ['phone', phone],
    ['desktop', desktop],
  ] as const) {
    it(`${size}: from an empty form to a registered fence, the answer in view and every field it waits for named`, async () => {
      const context = await browser.newContext({ viewport });
      context.setDefaultTimeout(10_000);
      const page = await context.newPage();
      const pageErrors: string[] = [];
      page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
      page.on('console', (m) => {
        if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
      });
      await signInThroughForm(page, e2e.baseUrl, admin.username, admin.password);
      const before = (await api.call<{ structures: unknown[] }>('GET', '/api/structures')).structures.length;

      // 1. A new form starts empty: examples only as placeholders, no number nobody typed.
      await page.goto(`${e2e.baseUrl}/#/register/new`);
      await page.locator('#sf-name').waitFor();
      await page.getByRole('radio', { name: /Banner, fence/ }).click();
      const numberInputs = page.locator('.form-main input[inputmode=decimal], .form-main input[inputmode=numeric]');
      const values = await numberInputs.evaluateAll((els) => els.map((e) => (e as unknown as { value: string }).value));
      expect(values.length).toBeGreaterThan(10);
      expect(values.filter((v) => v !== '')).toEqual([]);
      expect(await page.locator('#sf-panelWidthM').getAttribute('placeholder')).toBe('e.g. 3.5');
      expect(await page.locator('#sf-orient').inputValue()).toBe('');

      // 2. The calculator names what it waits for, by label, and takes the person to the first.
      await page.fill('#sf-name', `Gate fence ${size}`);
      const attention = page.getByTestId('calc-attention');
      await expect.poll(() => attention.textContent()).toContain('Panel width');
      const attentionText = (await attention.textContent())!;
      for (const label of ['Panels', 'Banner height', 'Clearance under it', 'Ballast per foot', 'Foot depth', 'Self-weight', 'Front faces towards']) expect(attentionText).toContain(label);
      expect(attentionText).not.toMatch(libraryWords);
      expect(attentionText).not.toMatch(/\b(heightM|clearanceM|ballastPerFootKg|footDepthM|panelWidthM|orientationDeg)\b/);
      if (size === 'phone') {
        const strip = page.getByTestId('calc-strip');
        expect((await onScreen(page, '[data-testid=calc-strip]')).visible).toBe(true);
        await expect(strip.textContent()).resolves.toMatch(/No limit yet: \d+ fields need attention/);
        await view(page, `${size}-1-empty`);
        await page.getByTestId('strip-go').click();
      } else {
        await view(page, `${size}-1-empty`);
        await page.getByTestId('calc-go-first').click();
      }
      expect(await activeId(page)).toBe('sf-panelWidthM');
      expect((await onScreen(page, '#sf-panelWidthM')).visible).toBe(true);

      const violations = await seriousAxeViolations(page);
      expect(violations, describeViolations(violations)).toEqual([]);

      // 3. A save now stores nothing and names the fields, each a link.
      await page.getByRole('button', { name: 'Register structure' }).click();
      const refused = page.locator('.error-box', { hasText: 'Not saved' });
      await refused.waitFor();
      await expect(refused.textContent()).resolves.toContain('Front faces towards');
      expect(await refused.textContent()).not.toMatch(libraryWords);
      expect((await api.call<{ structures: unknown[] }>('GET', '/api/structures')).structures.length).toBe(before);

      // 4. The panels first: a common size, a count; the run and the feet follow.
      await page.locator('button[data-preset=mesh-fence]').click();
      expect(await page.locator('#sf-panelWidthM').inputValue()).toBe('3.5');
      expect(await page.locator('#sf-heightM').inputValue()).toBe('2');
      await page.fill('#sf-panels', '3');
      await expect.poll(() => page.getByTestId('fence-run').textContent()).toBe('The run: 3 panels × 3.5 m = 10.5 m long, on 4 feet (one at every joint and one at each end).');
      await page.fill('#sf-clearanceM', '0.05');
      await page.fill('#sf-ballastPerFootKg', '30');
      await page.fill('#sf-footDepthM', '0.7');
      await page.fill('#sf-selfWeightKg', '60');

      // 5. A reference height below the banner's centroid (0.05 + 2 / 2 = 1.05 m) is refused, named and reachable.
      await page.fill('#sf-referenceHeightM', '0.5');
      await expect.poll(() => attention.textContent(), { timeout: 8_000 }).toContain('must be at least 1.05 m');
      const refText = (await attention.textContent())!;
      expect(refText).toContain('Reference height');
      expect(refText).not.toMatch(libraryWords);
      expect(await page.locator('#sf-referenceHeightM').getAttribute('aria-invalid')).toBe('true');
      await page.locator('#sf-referenceHeightM').scrollIntoViewIfNeeded();
      await view(page, `${size}-2-reference-height`);
      await page.evaluate('window.scrollTo(0, 0)');
      await attention.getByRole('button', { name: 'Reference height', exact: true }).click();
      expect(await activeId(page)).toBe('sf-referenceHeightM');
      expect((await onScreen(page, '#sf-referenceHeightM')).visible).toBe(true);
      await page.fill('#sf-referenceHeightM', '');

      // Text where a whole number belongs: said beside the field and named by the calculator.
      await page.fill('#sf-panels', 'three');
      await expect.poll(() => attention.textContent()).toMatch(/Panels: must be a number/);
      await page.fill('#sf-panels', '3');

      // 6. The answer, while typing further down the form: the public calculator's, for the body the form sends.
      const sent = page.waitForRequest((r) => r.url().endsWith('/api/assess') && r.method() === 'POST' && (r.postDataJSON() as { frontAzimuthDeg?: number }).frontAzimuthDeg === 200);
      await page.locator('#sf-orient').scrollIntoViewIfNeeded();
      await page.fill('#sf-orient', '200');
      const body = (await sent).postDataJSON() as Record<string, unknown>;
      const expected = await api.call<{ limitGustMps: number; governingText: string }>('POST', '/api/assess', body);
      const limitText = `${expected.limitGustMps.toFixed(1)}\u00a0m/s`;
      await expect.poll(() => page.getByTestId('limit-gust').textContent(), { timeout: 8_000 }).toBe(limitText);
      if (size === 'phone') {
        // The strip carries the limit and what governs beside the field being typed in.
        await expect.poll(() => page.getByTestId('strip-limit').textContent()).toBe(limitText);
        await expect(page.getByTestId('strip-governs').textContent()).resolves.toBe(`Governs: ${expected.governingText}`);
        expect((await onScreen(page, '#sf-orient')).visible).toBe(true);
        expect((await onScreen(page, '[data-testid=calc-strip]')).visible).toBe(true);
        await view(page, `${size}-3-typing-with-answer`);
      } else {
        await expect(page.getByTestId('calc-strip').isVisible()).resolves.toBe(false);
        // The side panel stays beside the field, with the limit and the side view in view, no scrolling.
        expect((await onScreen(page, '[data-testid=limit-gust]')).visible).toBe(true);
        const sideView = await onScreen(page, 'aside.form-side svg[data-testid=side-view]');
        expect(sideView.top).toBeGreaterThan(56);
        expect(sideView.top).toBeLessThan(viewport.height - 60 - 150);
        await view(page, `${size}-3-typing-with-answer`);
        // The plan is one tab away, in the same place.
        await page.getByRole('tab', { name: 'Plan' }).click();
        const plan = await onScreen(page, 'aside.form-side svg[data-testid=plan-view]');
        expect(plan.top).toBeGreaterThan(56);
        expect(plan.bottom).toBeLessThan(viewport.height - 60);
        await view(page, `${size}-4-plan-tab`);
        await page.getByRole('tab', { name: 'Numbers' }).click();
        await expect(page.locator('#sf-check').isVisible()).resolves.toBe(true);
        await page.getByRole('tab', { name: 'Side view' }).click();
      }
      await expect(page.getByTestId('governing-text').textContent()).resolves.toContain(expected.governingText);
      expect(await page.locator('main').textContent()).not.toMatch(libraryWords);

      // 7. Registered: the record holds what was typed, nothing more (no length or feet nobody gave).
      await page.getByRole('button', { name: 'Register structure' }).click();
      await page.waitForURL(/#\/register\/\d+\?saved=1/);
      const id = Number(/register\/(\d+)/.exec(page.url())![1]);
      const stored = await api.call<{ structure: { orientationDeg: number; record: Record<string, unknown> } }>('GET', `/api/structures/${id}`);
      expect(stored.structure.orientationDeg).toBe(200);
      expect(stored.structure.record).toEqual({
        kind: 'banner',
        name: `Gate fence ${size}`,
        panelWidthM: 3.5,
        panels: 3,
        heightM: 2,
        clearanceM: 0.05,
        ballastPerFootKg: 30,
        footDepthM: 0.7,
        selfWeightKg: 60,
        surface: 'grass',
      });
      await page.locator('.ok-box', { hasText: 'Saved' }).waitFor();
      await view(page, `${size}-5-saved`);
      expect(pageErrors).toEqual([]);
      await context.close();
    }, 90_000);
  }
});
