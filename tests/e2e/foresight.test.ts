/**
 * Foresight on the board and the structure page, end to end in Chromium against the real server
 * and its embedded MQTT broker (issue 17; design §2.7), on a phone (390 × 844) and at a desk
 * (1280 × 800).
 *
 * A gateway sends one raw sample a second of an invented wind whose statistics are known in
 * closed form, the server's clock moved by the test (startServer's `now`), so eleven minutes take
 * seconds and no assertion depends on a duration:
 *
 *   v(k) = 10 + 3 sin(2π (k + ½) / 60) m/s at second k.
 *
 * The server takes the 3-s running mean (WMO-No. 8 §5.8.2) of one-second buckets: the mean of
 * samples k−2, k−1, k, which is again a sine of the same period with amplitude
 * A' = 3 (1 + 2 cos(2π/60)) / 3, centred a second earlier. Over the last 600 seconds (ten whole
 * periods) its mean is U = 10 m/s, its sample standard deviation σ = A' √(600 / (2·599)) and it
 * rises through its mean once a period, between two samples (the ½ s phase): 10 up-crossings in
 * 599 s observed, ν = 10/599 per second. From those the test works out the chances with Rice's
 * formula (N = ν T exp(−(x − U)²/(2σ²)), P = 1 − e^−N; S. O. Rice, Bell System Technical Journal
 * 23-24, 1944-45) and the expected peak with Davenport's peak factor (g = √(2 ln νT) +
 * 0.5772/√(2 ln νT); A. G. Davenport, Proc. ICE 28, 1964) — the formulas from memory, as in
 * design §2.7 — and checks the card and the page say those figures.
 *
 * What must hold:
 * - before 100 samples over 5 minutes the card says "no estimate yet" and why, never a chance;
 * - then the card carries one line tagged "Estimate" under the measured figures, smaller than
 *   they are, with the next level's chance within 30 minutes as a whole percent, the limit's
 *   ("< 1 %"), the expected peak; tapping it shows the inputs (U, σ, ν counted, the height
 *   factor, the sensor, Rice, Davenport, Theil–Sen and why there is no time yet);
 * - a viewer sees the same, in the unit chosen on that device (km/h) and at night (dark theme);
 * - the structure page's "What may come" has the same figures and inputs.
 */
import fs from 'node:fs';
import path from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import type { Browser, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '../../server/log.ts';
import { startTestServer } from '../helpers/testServer.ts';
import { Api, describeViolations, ensureWebBuilt, launchBrowser, phone, requireChromium, screenshot, screenshotDir, seriousAxeViolations, signInThroughForm, skipBrowserTests, type E2eServer } from './support.ts';

const admin = { username: 'site-admin', password: 'e2e-admin-password' };
const cpUser = { username: 'cp', displayName: 'Dana Whitlock', password: 'e2e-cp-password' };
const viewer = { username: 'steward', displayName: 'Gate steward', password: 'e2e-viewer-password' };
const desktop = { width: 1280, height: 800 };
const tentName = 'Hospitality marquee';
/** Level triggers as gusts at the structure, m/s: Watch at U + 3σ (about), then two more. */
const triggers = [16.3, 20, 23];

/** The invented wind: U, amplitude and period of the samples, and their phase (half a second). */
const meanMps = 10;
const amplitudeMps = 3;
const periodS = 60;
const sampleAt = (k: number) => meanMps + amplitudeMps * Math.sin((2 * Math.PI * (k + 0.5)) / periodS);
/** The statistics of its 3-s means over the last 600 s (worked out in the header). */
const amplitude3s = (amplitudeMps * (1 + 2 * Math.cos((2 * Math.PI) / periodS))) / 3;
const sigmaMps = amplitude3s * Math.sqrt(600 / (2 * 599));
const upcrossingRateHz = 10 / 599;

/** Rice: the chance that a gust at mean U, spread σ, rate ν reaches x within T seconds. */
const rice = (x: number, T: number, U: number, sigma: number, nu: number) => (x <= U ? 1 : 1 - Math.exp(-nu * T * Math.exp(-((x - U) ** 2) / (2 * sigma ** 2))));
/** Davenport: the expected peak in T seconds (νT taken as at least 4, as the server states). */
const davenportPeak = (T: number, U: number, sigma: number, nu: number) => {
  const r = Math.sqrt(2 * Math.log(Math.max(4, nu * T)));
  return U + (r + 0.5772 / r) * sigma;
};
/** A chance as the issue asks it shown: "< 1 %" below 0.5 %, "> 99 %" from 99.5 %, whole percent between. */
const shown = (p: number) => (p < 0.005 ? '< 1 %' : p >= 0.995 ? '> 99 %' : `${Math.round(p * 100)} %`);
/** Text as read, no-break spaces as plain ones. */
const plain = (t: string | null) => (t ?? '').replace(/\u00a0/g, ' ').replace(/\s+/g, ' ').trim();

/** The screen as a person holds it: the element scrolled to the middle (the sticky bars stay where they are). */
async function viewShot(page: Page, element: Locator, name: string): Promise<void> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  await element.evaluate((el) => el.scrollIntoView({ block: 'center' }));
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`) });
}

interface LiveForesight {
  estimate: true;
  unknown?: string;
  meanMps: number;
  sigmaMps: number;
  upcrossingRateHz: number;
  upcrossingRateSource: string;
  heightFactor: number;
  nextLevel: number | null;
  nextTriggerGustMps: number | null;
  nextChance30: number | null;
  limitGustMps: number;
  limitChance30: number;
  trend: string;
}
interface LiveAnswer {
  structures: Array<{ id: number; name: string; level: number; limitGustMps: number; triggerGustsMps: number[]; foresight: LiveForesight | null }>;
}

describe.skipIf(skipBrowserTests)('foresight: the estimates on the board and the structure page', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let cp: Api;
  let gateway: MqttClient;
  /** The server's clock, moved by the test. */
  let clockMs = 0;
  /** The second the first sample is stamped at. */
  let s0 = 0;
  let sent = 0;
  let tentId = 0;
  const pageErrors: string[] = [];

  /** Samples k = sent … upTo − 1, a second apart, in arrays of 20 stamped at the server's clock. */
  const sendUpTo = async (upTo: number) => {
    while (sent < upTo) {
      const last = Math.min(upTo, sent + 20) - 1;
      const batch = [];
      for (let k = sent; k <= last; k++) batch.push({ ts: (s0 + k) * 1000, speed: sampleAt(k), dir: 250 });
      // The clock at the end of the last sample's second: its 3-s mean (stamped s·1000 + 999) is in the window.
      clockMs = (s0 + last) * 1000 + 999;
      await gateway.publishAsync('wind/mast-a/reading', JSON.stringify(batch), { qos: 1 });
      await e2e.server.tickNow();
      sent = last + 1;
    }
  };
  const liveNow = () => cp.call<LiveAnswer>('GET', '/api/live');
  const tentNow = async () => (await liveNow()).structures.find((s) => s.id === tentId)!;
  const cardItem = (page: Page) => page.locator('li.card-with-foresight', { has: page.locator('.sc-name', { hasText: tentName }) });
  const line = (page: Page) => cardItem(page).getByTestId('foresight-line');
  const watchErrors = (page: Page) => {
    page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
    });
  };

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    // The clock starts 12 minutes in the past and the samples bring it to about now.
    s0 = Math.floor(Date.now() / 1000) - 720;
    clockMs = s0 * 1000;
    e2e = await startTestServer({ ADMIN_USERNAME: admin.username, ADMIN_PASSWORD: admin.password }, { staticRoot: path.resolve('web/dist'), now: () => clockMs }, createLogger('warn'));
    browser = await launchBrowser();
    const adminApi = new Api(e2e.baseUrl);
    await adminApi.signIn(admin.username, admin.password);
    await adminApi.call('POST', '/api/people', { username: cpUser.username, displayName: cpUser.displayName, role: 'competent-person', password: cpUser.password });
    await adminApi.call('POST', '/api/people', { username: viewer.username, displayName: viewer.displayName, role: 'viewer', password: viewer.password });
    cp = new Api(e2e.baseUrl);
    await cp.signIn(cpUser.username, cpUser.password);
    await cp.call('POST', '/api/sensors', { key: 'mast-a', name: 'Mast A', heightM: 10, mode: 'samples', silenceTimeoutMs: 3_600_000 });
    const made = await cp.call<{ password: string }>('POST', '/api/gateways', { name: 'Field gateway', username: 'field-gw', sensorKeys: ['mast-a'] });
    // An invented frame taken at the mast's own height (reference height 10 m): height factor 1.
    const body = {
      record: { kind: 'custom', name: tentName, baseDepthM: 1.5, referenceHeightM: 10, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 3000, xM: 0.75 }] },
      sensorKeys: ['mast-a'],
      levels: ['Watch', 'Prepare', 'Stop and clear'].map((label, i) => ({ label, trigger: { kind: 'gust', gustMps: triggers[i] }, actionText: `${label}: as the wind plan says.` })),
    };
    tentId = (await cp.call<{ structure: { id: number } }>('POST', '/api/structures', body)).structure.id;
    gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${e2e.server.mqttPort}`, { username: 'field-gw', password: made.password, clientId: 'e2e-foresight-gateway', reconnectPeriod: 0 });
  }, 120_000);

  afterAll(async () => {
    await gateway?.endAsync();
    await browser?.close();
    await e2e?.stop();
  });

  it('before enough samples the card says there is no estimate yet and why, never a chance', async () => {
    // 60 samples: fewer than the 100 (over 300 s) the server needs.
    await sendUpTo(60);
    expect((await tentNow()).foresight).toEqual({ estimate: true, unknown: 'mast-a: too-few-samples' });
    const context = await browser.newContext({ viewport: phone });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    watchErrors(page);
    await signInThroughForm(page, e2e.baseUrl, cpUser.username, cpUser.password);
    await line(page).waitFor();
    await expect.poll(async () => plain(await line(page).textContent())).toBe('Estimate no estimate yet (not enough readings at Mast A yet: it needs at least 100 over 5 min)');
    expect(plain(await line(page).textContent())).not.toMatch(/\d\s?%/);
    await viewShot(page, cardItem(page), 'foresight-none-yet-phone');
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('with ten minutes of a known wind the card shows one line, tagged as an estimate, with the chances, and the inputs on tap', async () => {
    await sendUpTo(660);
    const tent = await tentNow();
    const f = tent.foresight!;
    // The server's statistics are the ones worked out in closed form above.
    expect(f.unknown).toBeUndefined();
    expect(f.meanMps).toBeCloseTo(meanMps, 6);
    expect(f.sigmaMps).toBeCloseTo(sigmaMps, 6);
    expect(f.upcrossingRateHz).toBeCloseTo(upcrossingRateHz, 9);
    expect(f.upcrossingRateSource).toBe('counted');
    expect(f.heightFactor).toBeCloseTo(1, 9);
    expect(tent.level).toBe(0);
    expect(f.nextTriggerGustMps).toBeCloseTo(triggers[0]!, 6);
    // The figures at the structure (U and σ times the height factor), from the published formulas.
    const U = meanMps * f.heightFactor;
    const sigma = sigmaMps * f.heightFactor;
    const watch30 = rice(triggers[0]!, 1800, U, sigma, upcrossingRateHz);
    const watch10 = rice(triggers[0]!, 600, U, sigma, upcrossingRateHz);
    const limit30 = rice(tent.limitGustMps, 1800, U, sigma, upcrossingRateHz);
    const peak10 = davenportPeak(600, U, sigma, upcrossingRateHz);
    // Worked out: about 30 % and 11 % for Watch; the limit (above 23 m/s) far below 1 %; peak 15.1 m/s.
    expect(shown(watch30)).toBe('30 %');
    expect(shown(watch10)).toBe('11 %');
    expect(shown(limit30)).toBe('< 1 %');
    expect(peak10.toFixed(1)).toBe('15.1');
    expect(f.nextChance30).toBeCloseTo(watch30, 6);
    expect(f.limitChance30).toBeCloseTo(limit30, 6);
    expect(f.trend).toBe('too-few-points');

    const context = await browser.newContext({ viewport: phone });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    watchErrors(page);
    await signInThroughForm(page, e2e.baseUrl, cpUser.username, cpUser.password);
    const expectedLine = `Estimate Watch: ${shown(watch30)} within 30 min · limit: ${shown(limit30)} within 30 min · expected peak in 10 min ${peak10.toFixed(1)} m/s inputs`;
    await expect.poll(async () => plain(await line(page).locator('summary').textContent())).toBe(expectedLine);
    await expect.poll(async () => plain(await line(page).locator('.fs-tag').textContent())).toBe('Estimate');

    // Secondary to the measured figures: below the whole card, in smaller type than the gust.
    const card = cardItem(page).locator('a.structure-card');
    const cardBox = (await card.boundingBox())!;
    const lineBox = (await line(page).boundingBox())!;
    expect(lineBox.y).toBeGreaterThanOrEqual(cardBox.y + cardBox.height - 3);
    /** Computed style in the page (the test itself has no DOM types). */
    const css = (l: Locator, prop: 'fontSize' | 'lineHeight') => l.evaluate((el, p) => parseFloat((globalThis as any).getComputedStyle(el)[p]), prop);
    const size = (l: Locator) => css(l, 'fontSize');
    expect(await size(line(page).locator('.fs-line'))).toBeLessThan(await size(card.locator('.sc-figures dd').nth(1)));
    // Not crowded: the line stays within three lines of text on the phone.
    const lineHeight = await css(line(page).locator('summary'), 'lineHeight');
    expect((await line(page).locator('summary').boundingBox())!.height).toBeLessThanOrEqual(3 * lineHeight + 20);

    // The inputs: hidden until tapped.
    const inputs = line(page).getByTestId('foresight-inputs');
    expect(await inputs.isVisible()).toBe(false);
    await viewShot(page, cardItem(page), 'foresight-card-phone');
    await line(page).locator('summary').click();
    await inputs.waitFor();
    const said = plain(await inputs.textContent());
    for (const part of [
      'Mast A (mast-a), last 10 min: mean U 10.0 m/s, spread σ 2.1 m/s',
      'σ of its 3-s mean speeds',
      `${upcrossingRateHz.toFixed(3)} per second`,
      'counted from the readings',
      '×1.00 to this structure: here U 10.0 m/s, σ 2.1 m/s',
      `Watch at 16.3 m/s: ${shown(watch10)} within 10 min · ${shown(watch30)} within 30 min`,
      '(Rice)',
      'N = ν·T·exp(−(x − U)²/(2σ²))',
      'Davenport peak factor',
      `${peak10.toFixed(1)} m/s = U + g·σ`,
      'Theil–Sen',
      'not enough history yet (needs 30 min)',
    ]) {
      expect(said).toContain(part);
    }
    expect(plain(await line(page).locator('.fs-note').textContent())).toContain('It is not a measurement');
    const violations = await seriousAxeViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await viewShot(page, line(page), 'foresight-card-open-phone');
    await screenshot(page, 'foresight-board-phone');

    await page.setViewportSize(desktop);
    await line(page).locator('summary').click();
    await expect.poll(async () => inputs.isVisible()).toBe(false);
    await viewShot(page, cardItem(page), 'foresight-board-desktop');
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('a viewer sees the same estimate, read-only, in the unit chosen on that device and at night', async () => {
    const context = await browser.newContext({ viewport: phone, colorScheme: 'dark' });
    context.setDefaultTimeout(15_000);
    await context.addInitScript(() => (globalThis as any).localStorage.setItem('holdfast.prefs', JSON.stringify({ unit: 'km/h', theme: 'dark' })));
    const page = await context.newPage();
    watchErrors(page);
    await signInThroughForm(page, e2e.baseUrl, viewer.username, viewer.password);
    const U = meanMps;
    const peakKmh = Math.round(davenportPeak(600, U, sigmaMps, upcrossingRateHz) * 3.6);
    // 15.1 m/s = 54 km/h (1 km/h = 1/3.6 m/s).
    await expect.poll(async () => plain(await line(page).locator('summary').textContent())).toContain(`expected peak in 10 min ${peakKmh} km/h`);
    expect(plain(await line(page).locator('summary').textContent())).toMatch(/^Estimate Watch: 30 % within 30 min/);
    // Nothing to press but the line itself.
    expect(await cardItem(page).locator('button').count()).toBe(0);
    await line(page).locator('summary').click();
    await line(page).getByTestId('foresight-inputs').waitFor();
    expect(plain(await line(page).getByTestId('foresight-inputs').textContent())).toContain('Watch at 59 km/h');
    await viewShot(page, line(page), 'foresight-card-open-phone-dark');
    const violations = await seriousAxeViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('the structure page: “What may come” with the same figures and their inputs', async () => {
    const U = meanMps;
    const watch30 = rice(triggers[0]!, 1800, U, sigmaMps, upcrossingRateHz);
    const watch10 = rice(triggers[0]!, 600, U, sigmaMps, upcrossingRateHz);
    const context = await browser.newContext({ viewport: phone });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    watchErrors(page);
    await signInThroughForm(page, e2e.baseUrl, cpUser.username, cpUser.password);
    await page.goto(`${e2e.baseUrl}/#/structure/${tentId}`);
    const section = page.getByTestId('foresight-section');
    await section.locator('table').waitFor();
    expect(plain(await section.locator('h2').textContent())).toBe('What may come Estimate');
    const watchRow = section.locator('tbody tr', { hasText: 'Watch' });
    expect(plain(await watchRow.textContent())).toBe(`Watch 16.3 m/s${shown(watch10)}${shown(watch30)}`);
    // The inputs one tap away.
    expect(await section.getByTestId('foresight-inputs').isVisible()).toBe(false);
    await viewShot(page, section, 'foresight-structure-phone');
    await section.locator('summary', { hasText: 'Inputs behind the figures' }).click();
    await section.getByTestId('foresight-inputs').waitFor();
    const text = plain(await section.textContent());
    expect(text).toContain(`Expected peak gust here in the next 10 min: ${davenportPeak(600, U, sigmaMps, upcrossingRateHz).toFixed(1)} m/s`);
    expect(text).toContain('Time to Watch: not enough history yet (needs 30 min)');
    expect(text).toContain('mean U 10.0 m/s, spread σ 2.1 m/s');
    expect(text).toContain('Theil–Sen');
    await viewShot(page, section.getByTestId('foresight-inputs'), 'foresight-structure-open-phone');
    // The forecast's 12 hours for this structure: with no feed set, the page says so (never calm).
    const feed = page.locator('section.feed-panel');
    await feed.waitFor();
    expect(plain(await feed.textContent())).toContain('No forecast feed is set');
    const violations = await seriousAxeViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await page.setViewportSize(desktop);
    await viewShot(page, section, 'foresight-structure-desktop');
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
