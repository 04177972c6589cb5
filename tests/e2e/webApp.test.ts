/**
 * The web app in a real browser (Chromium) against the real server started in-process: sign in,
 * register a sensor and a gateway, register a structure through the form and see its limit,
 * publish wind over MQTT as the gateway and watch the structure go from "no data" to its top
 * level on the live board, acknowledge the alert as crew, find it in the log, export the CSV.
 * Along the way: what a viewer may not do is not offered, a dropped connection is shown, axe-core
 * finds no serious or critical problem on the main screens, and screenshots of them are written
 * at phone and desktop size to tests/artifacts/screenshots/.
 *
 * The steps run in order and share one server: each `it` is one stage of the same day on site.
 */
import fs from 'node:fs';
import jsQRModule from 'jsqr';
import mqtt, { type MqttClient } from 'mqtt';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  Api,
  describeViolations,
  desktop,
  ensureWebBuilt,
  launchBrowser,
  phone,
  screenshot,
  seriousAxeViolations,
  signInThroughForm,
  startE2eServer,
  type E2eServer,
  requireChromium,
  skipBrowserTests,
} from './support.ts';

const skip = skipBrowserTests;

const admin = { username: 'site-admin', password: 'e2e-admin-password' };
const crew = { username: 'rigger', displayName: 'Jo Marsh (rigger)', password: 'e2e-crew-password' };
const steward = { username: 'steward', displayName: 'Gate steward', password: 'e2e-viewer-password' };
const structureName = 'Car park banner';
const sensorKey = 'mast-a';
const ackNote = 'Banner dropped and rolled, path closed (e2e)';

interface AssessAnswer {
  limitGustMps: number | null;
}
interface OpenAlertView {
  id: number;
  subject: string;
  label: string;
  level: number | null;
  acknowledgedBy: string | null;
}

describe.skipIf(skip)('web app in a real browser', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let adminApi: Api;
  let adminContext: BrowserContext;
  let page: Page;
  let gatewayPassword = '';
  let structureId = 0;
  let limitGustMps = 0;
  let gateway: MqttClient | null = null;
  /** Script errors and console errors of the admin's page (a refused CSP, an exception). */
  const pageErrors: string[] = [];

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    e2e = await startE2eServer(admin);
    browser = await launchBrowser();
    adminApi = new Api(e2e.baseUrl);
    await adminApi.signIn(admin.username, admin.password);
    await adminApi.call('POST', '/api/people', { username: crew.username, displayName: crew.displayName, role: 'crew', password: crew.password });
    await adminApi.call('POST', '/api/people', { username: steward.username, displayName: steward.displayName, role: 'viewer', password: steward.password });
    adminContext = await browser.newContext({ viewport: phone, acceptDownloads: true });
    adminContext.setDefaultTimeout(10_000);
    // Count what the alarm does (no speaker or motor in a headless browser): oscillators started
    // by the beep, and vibration patterns asked for.
    await adminContext.addInitScript(`
      window.__oscillators = 0; window.__vibrations = 0;
      const create = AudioContext.prototype.createOscillator;
      AudioContext.prototype.createOscillator = function () { window.__oscillators++; return create.call(this); };
      Object.defineProperty(navigator, 'vibrate', { value: () => { window.__vibrations++; return true; } });
    `);
    page = await adminContext.newPage();
    page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
    // A 4xx answer is logged by the browser as "Failed to load resource" — expected while a form
    // holds invalid input; anything else logged as an error is a defect.
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
    });
  }, 60_000);

  afterAll(async () => {
    await gateway?.endAsync();
    await browser?.close();
    await e2e?.stop();
  });

  it('signs in through the form and shows the wind as unknown while nothing is registered', async () => {
    await page.goto(`${e2e.baseUrl}/`);
    await page.waitForSelector('#si-user');
    await screenshot(page, 'sign-in-phone');
    expect(await seriousAxeViolations(page).then(describeViolations)).toBe('');
    await signInThroughForm(page, e2e.baseUrl, admin.username, admin.password);
    await page.getByText('No sensors registered: the wind on site is unknown.').waitFor();
    await expect(page.locator('header.top .role').textContent()).resolves.toBe('administrator');
  });

  it('registers a sensor and a gateway; the gateway password is shown once with its topic', async () => {
    await page.goto(`${e2e.baseUrl}/#/sensors`);
    await page.getByRole('button', { name: 'Register a sensor' }).click();
    await page.fill('#sn-key', sensorKey);
    await page.fill('#sn-name', 'Mast A');
    await page.fill('#sn-h', '10');
    // This gateway publishes only when a step tells it to, and the later steps (acknowledge, log,
    // site link, units, axe-core) run for longer than the default 30 s on a slow machine: a
    // 15-min silence timeout keeps Mast A reporting through the day these steps stand for.
    await page.fill('#sn-silent', '900');
    await page.getByRole('button', { name: 'Register sensor' }).click();
    await page.getByRole('heading', { name: 'Mast A' }).waitFor();
    await page.getByText('no reading yet').first().waitFor();

    await page.fill('#gw-name', 'Field gateway');
    await page.fill('#gw-user', 'field-gw');
    await page.getByLabel('Mast A (mast-a)').check();
    await page.getByRole('button', { name: 'Make gateway' }).click();
    const secret = page.getByTestId('gateway-password');
    await secret.waitFor();
    gatewayPassword = (await secret.textContent()) ?? '';
    expect(gatewayPassword.length).toBeGreaterThanOrEqual(16);
    await expect(page.locator('pre.command').textContent()).resolves.toContain(`-p ${e2e.server.mqttPort} -u field-gw`);
    await expect(page.locator('pre.command').textContent()).resolves.toContain('wind/mast-a/reading');
    await screenshot(page, 'sensors-gateway-phone');
    await page.getByRole('button', { name: 'I have stored it' }).click();
    await expect(page.getByTestId('gateway-password').count()).resolves.toBe(0);
  });

  it('registers a banner through the form and shows the limit the calculator gives for it', async () => {
    await page.goto(`${e2e.baseUrl}/#/register/new`);
    await page.getByRole('radio', { name: 'Banner, fence scrim or hoarding' }).click();
    await page.fill('#sf-name', structureName);
    // Panels are the natural way in: panel width and count, the run's length and feet follow.
    const dims: Record<string, string> = { panelWidthM: '2', panels: '3', heightM: '2', clearanceM: '0.2', ballastPerFootKg: '60', footDepthM: '0.8', selfWeightKg: '80' };
    for (const [field, value] of Object.entries(dims)) await page.fill(`#sf-${field}`, value);
    // A new form starts empty: the bearing the front faces is asked for, never assumed.
    await page.fill('#sf-orient', '0');

    // The same record through the public calculator: the form must show that limit.
    const record = { kind: 'banner', name: structureName, panelWidthM: 2, panels: 3, heightM: 2, clearanceM: 0.2, ballastPerFootKg: 60, footDepthM: 0.8, selfWeightKg: 80, surface: 'grass' };
    // The form calculates at the design density the save checks the levels at (issue 15).
    const site = await adminApi.call<{ designAirDensityKgM3: number }>('GET', '/api/site');
    const expected = await adminApi.call<AssessAnswer>('POST', '/api/assess', { structure: record, gustMps: 20, airDensityKgM3: site.designAirDensityKgM3 });
    expect(expected.limitGustMps).not.toBeNull();
    limitGustMps = expected.limitGustMps!;
    // Number and unit joined by a no-break space: they never split across two lines.
    const shown = `${limitGustMps.toFixed(1)}\u00a0m/s`;
    await expect.poll(() => page.getByTestId('limit-gust').textContent(), { timeout: 5_000 }).toBe(shown);

    // A field error from the server appears next to its field, and goes when it is fixed.
    await page.fill('#sf-panels', '2.5');
    await page.locator('#sf-panels').blur();
    await page.locator('.field.has-error', { has: page.locator('#sf-panels') }).getByText(/whole number/).waitFor();
    await page.fill('#sf-panels', '3');
    await expect.poll(() => page.locator('.field.has-error', { has: page.locator('#sf-panels') }).count()).toBe(0);

    await page.locator('svg[aria-label^="Side view"]').waitFor();
    await screenshot(page, 'register-form-phone');
    await page.getByRole('button', { name: 'Register structure' }).click();
    await page.waitForURL(/#\/register\/\d+\?saved=1$/);
    structureId = Number(/register\/(\d+)/.exec(page.url())![1]);
    await page.getByText('Saved. It is on the live board now.').waitFor();
    await expect(page.locator('#sf-name').inputValue()).resolves.toBe(structureName);
    const saved = await adminApi.call<{ structure: { live: { limitGustMps: number } } }>('GET', `/api/structures/${structureId}`);
    expect(saved.structure.live.limitGustMps).toBeCloseTo(limitGustMps, 6);
  });

  it('shows the new structure as "no data" before any reading, then escalates it to its top level on a strong gust', async () => {
    await page.goto(`${e2e.baseUrl}/#/`);
    const card = page.locator('a.structure-card', { hasText: structureName });
    await card.getByText('No data — wind unknown').waitFor();
    await expect(card.locator('.sc-margin').textContent()).resolves.toBe('unknown');
    await expect(card.locator('.sc-foot').textContent()).resolves.toContain('No live reading reaches it (Mast A: no good reading)');

    gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${e2e.server.mqttPort}`, { username: 'field-gw', password: gatewayPassword, clientId: 'e2e-gateway', reconnectPeriod: 0 });
    const publish = (speed: number, gust: number) =>
      gateway!.publishAsync(`wind/${sensorKey}/reading`, JSON.stringify({ ts: Date.now(), speed, gust, dir: 250 }), { qos: 1 });

    // Light wind: the structure has data and sits below every level.
    await publish(2, 3);
    await card.getByText('Below all levels').waitFor({ timeout: 10_000 });
    await expect(page.locator('.wind-now .big-figure .fig-value').textContent()).resolves.toBe('3.0');

    // The alarm is switched on with a tap (browsers allow sound only after one).
    await page.getByRole('button', { name: 'Alarm sound off' }).click();
    await page.getByRole('button', { name: 'Alarm sound on' }).waitFor();
    const before = (await page.evaluate('[window.__oscillators, window.__vibrations]')) as [number, number];

    // A gust 30 % above the limit: straight to the top level, with its alert on top.
    const gustMps = Math.round(limitGustMps * 1.3 * 10) / 10;
    await publish(Math.round((gustMps / 1.8) * 10) / 10, gustMps);
    await card.getByText('Level 3 · Stop and clear').waitFor({ timeout: 10_000 });
    await expect(card.locator('dd').nth(1).textContent()).resolves.toBe(`${gustMps.toFixed(1)} m/s`);
    const alert = page.locator('article.alert-card', { hasText: structureName }).filter({ hasText: 'Stop and clear' });
    await alert.waitFor();
    await expect(alert.textContent()).resolves.toContain('Clear everyone out of the structure');
    // The card is the first on the board: worst first.
    await expect(page.locator('a.structure-card').first().textContent()).resolves.toContain(structureName);
    // The alert sounded (three tones) and vibrated.
    const after = (await page.evaluate('[window.__oscillators, window.__vibrations]')) as [number, number];
    expect(after[0] - before[0]).toBeGreaterThanOrEqual(3);
    expect(after[1] - before[1]).toBeGreaterThanOrEqual(1);
    await screenshot(page, 'board-alert-phone');
    // On any other screen the unacknowledged alert is one tap from the board.
    await page.goto(`${e2e.baseUrl}/#/log`);
    await page.locator('.alert-strip', { hasText: `Alert: ${structureName} — Stop and clear` }).waitFor();
    await page.locator('.alert-strip a').click();
    await page.waitForURL(/#\/$/);
  }, 30_000);

  it('offers a viewer no Acknowledge button, and lets crew acknowledge with a note', async () => {
    const viewerContext = await browser.newContext({ viewport: phone });
    const viewerPage = await viewerContext.newPage();
    await signInThroughForm(viewerPage, e2e.baseUrl, steward.username, steward.password);
    const viewerAlert = viewerPage.locator('article.alert-card', { hasText: 'Stop and clear' });
    await viewerAlert.waitFor();
    await expect(viewerAlert.getByRole('button', { name: 'Acknowledge' }).count()).resolves.toBe(0);
    await viewerAlert.getByText('not yet acknowledged by the crew').waitFor();
    await viewerContext.close();

    const crewContext = await browser.newContext({ viewport: phone });
    const crewPage = await crewContext.newPage();
    await signInThroughForm(crewPage, e2e.baseUrl, crew.username, crew.password);
    const alert = crewPage.locator('article.alert-card', { hasText: structureName }).filter({ hasText: 'Stop and clear' });
    await alert.getByRole('button', { name: 'Add a note' }).click();
    await alert.getByLabel('Note (optional): what you did or saw').fill(ackNote);
    await alert.getByRole('button', { name: 'Acknowledge', exact: true }).click();
    // Acknowledged and still in force: the card stays, still led by the level and its action,
    // with who acknowledged and the note (design §2.6: acknowledged alerts never hide the level).
    const done = alert.locator('.current-level .ack-done', { hasText: `Acknowledged by ${crew.displayName}` });
    await done.waitFor();
    await expect(done.textContent()).resolves.toContain(ackNote);
    await expect(alert.locator('header .alert-label').innerText()).resolves.toBe('Level 3 · Stop and clear');
    await expect(alert.textContent()).resolves.toContain('Clear everyone out of the structure');
    await expect(alert.getByRole('button', { name: /^Acknowledge/ }).count()).resolves.toBe(0);
    await crewContext.close();

    // The acknowledgement is stored with the person's name and note, and reaches the other phone live.
    const live = await adminApi.call<{ alerts: OpenAlertView[] }>('GET', '/api/live');
    const stored = live.alerts.find((a) => a.subject === structureName && a.label === 'Stop and clear');
    expect(stored?.acknowledgedBy).toBe(crew.displayName);
    await page.locator('article.alert-card', { hasText: structureName }).locator('.current-level .ack-done', { hasText: `Acknowledged by ${crew.displayName}` }).waitFor();
  }, 30_000);

  it('finds the alert and its acknowledgement in the log, and exports them as CSV', async () => {
    await page.goto(`${e2e.baseUrl}/#/log`);
    await page.getByRole('button', { name: 'Last hours' }).click();
    const entry = page.locator('.timeline li', { hasText: `Alert — ${structureName}: level 3 · Stop and clear` });
    await entry.waitFor();
    await expect(entry.textContent()).resolves.toContain(`acknowledged by ${crew.displayName}`);
    await expect(entry.textContent()).resolves.toContain(ackNote);
    await page.locator('.timeline li', { hasText: `${structureName}: level raised 0 → 3` }).waitFor();

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Alerts and acknowledgements' }).click()]);
    const file = await download.path();
    const csv = fs.readFileSync(file, 'utf8');
    const header = csv.split('\n')[0]!;
    expect(header).toContain('acknowledged_by');
    const row = csv.split('\n').find((line) => line.includes(structureName) && line.includes('Stop and clear'));
    expect(row, `no alert row for ${structureName} in:\n${csv}`).toBeDefined();
    expect(row).toContain(crew.displayName);
    expect(row).toContain(ackNote);
    await screenshot(page, 'log-phone');
  });

  it('shows a rejected payload on the Sensors screen by its reason, and stores nothing from it', async () => {
    const storedBefore = e2e.server.queue.stats.committedReadings;
    await gateway!.publishAsync(`wind/${sensorKey}/reading`, '{"ts": 1, "speed": 5, "colour": "blue"}', { qos: 1 });
    await page.goto(`${e2e.baseUrl}/#/sensors`);
    const card = page.locator('article.sensor-card', { hasText: 'Mast A' });
    const row = card.locator('table tr', { hasText: 'unknown-field' });
    // Each try reloads the page: on a loaded machine one reload can take seconds.
    await expect.poll(async () => {
      await page.reload();
      return row.count();
    }, { timeout: 20_000 }).toBe(1);
    await expect(row.locator('td').nth(1).textContent()).resolves.toBe('1');
    expect(e2e.server.queue.stats.committedReadings).toBe(storedBefore);
  });

  it('hands a steward a site link that opens the board read-only', async () => {
    await page.goto(`${e2e.baseUrl}/#/links`);
    await page.fill('#sl-label', 'Gate stewards');
    await page.fill('#sl-hours', '12');
    await page.getByRole('button', { name: 'Make link' }).click();
    const url = (await page.getByTestId('site-link-url').textContent()) ?? '';
    expect(url).toMatch(/\/link\/[A-Za-z0-9_-]+$/);
    // The scan code, drawn as the browser renders it, read back by jsQR (an independent decoder
    // from the npm registry): it must carry exactly the link.
    const side = 400;
    const pixels = await page.getByTestId('scan-code').evaluate(async (svg, px) => {
      // Runs in the page: DOM names through globalThis (the test project is typed without DOM).
      const w = globalThis as any;
      const img = new w.Image();
      img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(new w.XMLSerializer().serializeToString(svg))}`;
      await img.decode();
      const canvas = w.document.createElement('canvas');
      canvas.width = px;
      canvas.height = px;
      const ctx = canvas.getContext('2d');
      ctx.drawImage(img, 0, 0, px, px);
      return Array.from(ctx.getImageData(0, 0, px, px).data as ArrayLike<number>);
    }, side);
    const jsQR = (jsQRModule as unknown as { default: typeof jsQRModule.default }).default;
    expect(jsQR(Uint8ClampedArray.from(pixels), side, side)?.data).toBe(url);
    await screenshot(page, 'site-link-made');
    await page.getByRole('button', { name: 'Done' }).click();
    await page.locator('li', { hasText: 'Gate stewards' }).getByRole('button', { name: 'Withdraw' }).waitFor();

    const stewardContext = await browser.newContext({ viewport: phone });
    const stewardPage = await stewardContext.newPage();
    await stewardPage.goto(url);
    await stewardPage.locator('a.structure-card', { hasText: structureName }).waitFor();
    await expect(stewardPage.locator('header.top .role').textContent()).resolves.toBe('viewer');
    await expect(stewardPage.getByRole('button', { name: 'Acknowledge' }).count()).resolves.toBe(0);
    await stewardPage.goto(`${e2e.baseUrl}/#/register`);
    await stewardPage.locator('.register-item').first().waitFor();
    await expect(stewardPage.getByRole('link', { name: 'Register a structure' }).count()).resolves.toBe(0);
    await stewardContext.close();
  });

  it('says so when the live connection drops, and recovers', async () => {
    await page.goto(`${e2e.baseUrl}/#/`);
    await page.locator('.pill-ok').waitFor();
    await adminContext.setOffline(true);
    // Offline in the browser: EventSource errors out; the board must not keep looking live.
    await page.getByText('Treat the wind as unknown until this goes away.').waitFor();
    await page.locator('.pill-bad', { hasText: 'offline' }).waitFor();
    await expect(page.locator('main.board').getAttribute('class')).resolves.toContain('is-stale');
    await screenshot(page, 'board-offline-phone');
    await adminContext.setOffline(false);
    await page.locator('.pill-ok').waitFor({ timeout: 15_000 });
    await expect(page.getByText('Treat the wind as unknown until this goes away.').count()).resolves.toBe(0);
  }, 40_000);

  it('shows speeds in the unit chosen on this device, with the choice kept across a reload', async () => {
    await page.goto(`${e2e.baseUrl}/#/more`);
    await page.getByLabel('km/h').check();
    await page.goto(`${e2e.baseUrl}/#/`);
    const limit = page.locator('a.structure-card', { hasText: structureName }).locator('dd').nth(2);
    await expect.poll(() => limit.textContent()).toBe(`${(limitGustMps * 3.6).toFixed(0)} km/h`);
    await page.reload();
    await expect.poll(() => limit.textContent()).toBe(`${(limitGustMps * 3.6).toFixed(0)} km/h`);
    await page.goto(`${e2e.baseUrl}/#/more`);
    await page.getByLabel('m/s').check();
    await page.goto(`${e2e.baseUrl}/#/`);
    await expect.poll(() => limit.textContent()).toBe(`${limitGustMps.toFixed(1)} m/s`);
  });

  it('has no serious or critical axe-core violations on the main screens, and writes their screenshots', async () => {
    const screens: Array<[string, string, string]> = [
      ['board', '/', 'a.structure-card'],
      ['structure', `/structure/${structureId}`, '.chart canvas'],
      ['register-list', '/register', '.register-item'],
      ['register-form', `/register/${structureId}`, '[data-testid=limit-gust]'],
      ['site-settings', '/site', '#st-name'],
      ['sensors', '/sensors', '.sensor-card'],
      ['log', '/log', '.timeline li'],
      ['plan', '/plan', '#fc-text'],
      ['more', '/more', '#pref-h'],
      ['people', '/people', '.person-card'],
      ['site-links', '/links', '#sl-label'],
    ];
    const problems: string[] = [];
    for (const [viewportName, viewport] of [
      ['phone', phone],
      ['desktop', desktop],
    ] as const) {
      await page.setViewportSize(viewport);
      for (const [name, route, ready] of screens) {
        await page.goto(`${e2e.baseUrl}/#${route}`);
        await page.locator(ready).first().waitFor();
        if (viewportName === 'phone') {
          const found = await seriousAxeViolations(page);
          if (found.length > 0) problems.push(`${name}:\n${describeViolations(found)}`);
        }
        await screenshot(page, `${name}-${viewportName}`);
      }
    }
    // The forecast grid and the dark theme, once each.
    await page.goto(`${e2e.baseUrl}/#/plan`);
    await page.getByRole('button', { name: 'Use the example' }).click();
    await page.getByRole('button', { name: 'Check the forecast' }).click();
    await page.locator('table.forecast-grid').waitFor();
    await expect(page.locator('table.forecast-grid thead').textContent()).resolves.toContain(structureName);
    await screenshot(page, 'plan-forecast-desktop');
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.setViewportSize(phone);
    await page.goto(`${e2e.baseUrl}/#/`);
    await page.locator('a.structure-card').first().waitFor();
    const dark = await seriousAxeViolations(page);
    if (dark.length > 0) problems.push(`board (dark):\n${describeViolations(dark)}`);
    await screenshot(page, 'board-dark-phone');
    expect(problems.join('\n\n')).toBe('');
    expect(pageErrors).toEqual([]);
  }, 90_000);
});
