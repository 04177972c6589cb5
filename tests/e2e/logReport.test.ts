/**
 * The log and the day report in Chromium against the real demo server (`npm run demo`'s own
 * code: its register, its simulated past windy day, its crew's acknowledgements), the morning
 * after, at phone (390 × 844) and desktop (1366 × 900) size, on screen and in print emulation.
 *
 * Scenario: before the browser opens, the competent person registers a new anemometer and a new
 * banner today and retires the bandstand shell today. Yesterday's report must list the five demo
 * structures (the shell too: it stood all day) and the three demo sensors, and neither of
 * today's additions; its charts carry our own legend (names, units, level lines), each series in
 * its own colour and dash, redrawn in the print palette; it ends with a sign-off box; the CSV
 * from the page is RFC 4180 with site time beside UTC; the crew's notes speak of the structure
 * that raised the alert.
 *
 * Screenshots go to tests/artifacts/screenshots (log-report-*; the print ones also in grayscale,
 * rendered by Chromium), and the A4 PDF to tests/artifacts/log-report.pdf.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { configFromEnv } from '../../server/config.ts';
import { runDemo } from '../../server/demo/demo.ts';
import { demoSensors, demoStructures } from '../../server/demo/demoSite.ts';
import { createLogger } from '../../server/log.ts';
import type { RunningServer } from '../../server/runtime.ts';
import { parseRfc4180 } from '../helpers/rfc4180.ts';
import { Api, desktop, ensureWebBuilt, launchBrowser, phone, requireChromium, screenshot, screenshotDir, signInThroughForm, skipBrowserTests } from './support.ts';

const timeZone = 'Europe/London';
const cpLogin = { username: 'cp', password: 'demo-competent-person' };
const newSensorName = 'Gate anemometer (new today)';
const newStructureName = 'Kiosk banner (new today)';
const retiredName = 'Bandstand shell';
const demoNames = demoStructures.map((s) => (s.record as { name: string }).name).sort();

/** The site's calendar date at an instant, by Intl.DateTimeFormat. */
function siteDate(atMs: number): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(atMs));
}

function dayBefore(day: string): string {
  const d = new Date(`${day}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() - 1);
  return d.toISOString().slice(0, 10);
}

/** The site's wall clock at an instant, "YYYY-MM-DD HH:MM:SS", by Intl.DateTimeFormat alone. */
function intlSiteTime(atMs: number): string {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' }).formatToParts(new Date(atMs));
  const get = (type: Intl.DateTimeFormatPartTypes): string => parts.find((p) => p.type === type)!.value;
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}:${get('second')}`;
}

/** Screenshots of the report's parts one by one (a full page of a day's log is too tall to judge by eye). */
async function partShots(page: Page, name: string): Promise<void> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  const parts: Array<[string, string]> = [
    ['summary', 'section:has(#sum-h)'],
    ['wind', 'section:has(#wind-log-h) figure.chart-fig >> nth=0'],
    ['util', 'section:has(#util-h) figure.chart-fig'],
    ['signoff', 'section.sign-off'],
  ];
  for (const [part, selector] of parts) await page.locator(selector).screenshot({ path: path.join(screenshotDir, `${name}-${part}.png`) });
}

/** A grayscale screenshot of the page as it is, rendered by Chromium itself (a CSS grayscale filter), for judging black-and-white print by eye. */
async function grayscaleScreenshot(page: Page, name: string): Promise<void> {
  await page.evaluate(`document.documentElement.style.filter = 'grayscale(1)'`);
  await screenshot(page, name);
  await page.evaluate(`document.documentElement.style.filter = ''`);
}

/**
 * Run in the page (a string: the test's type check has no DOM): per chart, its legend's series
 * samples (dash, colour, label) and level lines, and whether uPlot's own legend is anywhere.
 */
const legendsScript = `(() => [...document.querySelectorAll('figure.chart-fig')].map((fig) => ({
  title: fig.querySelector('figcaption')?.textContent ?? '',
  series: [...fig.querySelectorAll('.chart-legend li.legend-series')].map((li) => ({
    label: li.textContent.trim(),
    dash: li.querySelector('svg')?.getAttribute('data-dash'),
    colour: li.querySelector('svg')?.getAttribute('data-colour'),
  })),
  levels: [...fig.querySelectorAll('.chart-legend li.legend-level')].map((li) => li.textContent.trim()),
  text: fig.textContent,
  libraryLegend: fig.querySelectorAll('.u-legend').length,
  canvases: fig.querySelectorAll('canvas').length,
})))()`;

/** Pixels of the first chart's canvas within 8 of an rgb colour on each channel. */
const pixelsNearScript = (hex: string): string => `(() => {
  const c = document.querySelector('figure.chart-fig canvas');
  if (!c) return -1;
  const want = [1, 3, 5].map((i) => parseInt(${JSON.stringify(hex)}.slice(i, i + 2), 16));
  const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
  let n = 0;
  for (let i = 0; i < d.length; i += 4) if (d[i + 3] > 200 && Math.abs(d[i] - want[0]) <= 8 && Math.abs(d[i + 1] - want[1]) <= 8 && Math.abs(d[i + 2] - want[2]) <= 8) n++;
  return n;
})()`;

describe.skipIf(skipBrowserTests)('the log and the day report, the morning after the demo’s windy day', () => {
  let server: RunningServer;
  let baseUrl = '';
  let dataDir = '';
  let browser: Browser;
  let cp: Api;
  let yesterday = '';
  const pageErrors: string[] = [];

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-e2e-log-'));
    const config = configFromEnv({ DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', MQTT_PORT: '0', MQTT_HOST: '127.0.0.1', DEMO: '1' });
    server = await runDemo(config, createLogger('error'));
    baseUrl = `http://127.0.0.1:${server.httpPort}`;
    yesterday = dayBefore(siteDate(Date.now()));
    cp = new Api(baseUrl);
    await cp.signIn(cpLogin.username, cpLogin.password);
    // Today's changes to the register.
    await cp.call('POST', '/api/sensors', { key: 'gate-anemometer', name: newSensorName, heightM: 3 });
    await cp.call('POST', '/api/structures', {
      record: {
        kind: 'custom',
        name: newStructureName,
        baseDepthM: 1,
        baseWidthM: 3,
        faces: [{ areaM2: 3, centroidHeightM: 1.2, cfFront: 1.8, cfBack: 1.8 }],
        masses: [{ massKg: 400, xM: 0.5, yM: 1.5 }],
        coefficientSource: 'test values for an invented banner: EN 1991-1-4 7.4.3 signboard c_f = 1.80',
      },
    });
    const { structures } = await cp.call<{ structures: Array<{ id: number; name: string }> }>('GET', '/api/structures');
    const shell = structures.find((s) => s.name === retiredName)!;
    await cp.call('DELETE', `/api/structures/${shell.id}`);
    browser = await launchBrowser();
  }, 120_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
  }, 60_000);

  async function openYesterday(viewport: { width: number; height: number }, colorScheme: 'light' | 'dark' = 'light'): Promise<{ context: BrowserContext; page: Page }> {
    const context = await browser.newContext({ viewport, colorScheme, acceptDownloads: true });
    const page = await context.newPage();
    page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
    });
    await signInThroughForm(page, baseUrl, cpLogin.username, cpLogin.password);
    await page.goto(`${baseUrl}/#/log`);
    await page.locator('#log-day').waitFor();
    const yesterdayLoaded = page.waitForResponse((r) => r.url().includes(`/api/log/wind?day=${yesterday}`));
    await page.fill('#log-day', yesterday);
    await yesterdayLoaded;
    await page.locator('table caption', { hasText: 'Structures on the register' }).waitFor();
    // Every chart drawn: the wind of each sensor and the utilization chart, and yesterday's, not
    // the last 24 hours' the page opened with (those include the sensor registered today).
    await expect.poll(() => page.locator('figure.chart-fig canvas').count(), { timeout: 10_000 }).toBeGreaterThanOrEqual(demoSensors.length + 1);
    await expect.poll(() => page.locator('figure.chart-fig figcaption', { hasText: newSensorName }).count(), { timeout: 10_000 }).toBe(0);
    return { context, page };
  }

  it('lists what stood yesterday and nothing registered today; the shell retired this morning is there, marked', async () => {
    const { context, page } = await openYesterday(phone);
    const structureTable = page.locator('table', { has: page.locator('caption', { hasText: 'Structures on the register' }) });
    const names = await structureTable.locator('tbody th[scope=row]').evaluateAll((ths) => ths.map((th) => th.childNodes[0]?.textContent?.trim() ?? ''));
    expect(names.sort()).toEqual(demoNames);
    await expect(structureTable.locator('tbody tr', { hasText: retiredName }).textContent()).resolves.toContain('retired later (');
    // Every structure that stood all day had readings all day: nothing reads "unknown".
    await expect(structureTable.locator('tbody').textContent()).resolves.not.toContain('unknown');
    const sensorTable = page.locator('table', { has: page.locator('caption', { hasText: 'Sensors on the register' }) });
    const sensorNames = await sensorTable.locator('tbody th[scope=row]').evaluateAll((ths) => ths.map((th) => th.childNodes[0]?.textContent?.trim() ?? ''));
    expect(sensorNames.sort()).toEqual(demoSensors.map((s) => s.name).sort());
    const body = (await page.locator('main').textContent()) ?? '';
    expect(body).not.toContain(newSensorName);
    expect(body).not.toContain(newStructureName);
    await screenshot(page, 'log-report-phone');
    await partShots(page, 'log-report-phone');
    await context.close();
  }, 60_000);

  it('draws its own legends: names with units, the level lines by name, a distinct colour and dash per series, no library legend', async () => {
    for (const [viewport, label] of [
      [phone, 'phone'],
      [desktop, 'desktop'],
    ] as const) {
      const { context, page } = await openYesterday(viewport);
      const charts = (await page.evaluate(legendsScript)) as Array<{ title: string; series: Array<{ label: string; dash: string; colour: string }>; levels: string[]; text: string; libraryLegend: number; canvases: number }>;
      expect(charts.length).toBe(demoSensors.length + 1);
      for (const chart of charts) {
        expect(chart.libraryLegend, chart.title).toBe(0);
        // What a charting library prints without a pointer: "time: --", "gust: —".
        expect(chart.text, chart.title).not.toMatch(/time:\s*-|:\s*—|--/);
        expect(chart.series.length, chart.title).toBeGreaterThan(0);
        const pairs = chart.series.map((s) => `${s.colour}|${s.dash}`);
        expect(new Set(pairs).size, `${chart.title}: ${pairs.join(' ')}`).toBe(pairs.length);
        const firstDashes = chart.series.slice(0, 8).map((s) => s.dash);
        expect(new Set(firstDashes).size, `${chart.title}: dashes ${firstDashes.join(' ')}`).toBe(firstDashes.length);
      }
      const wind = charts.filter((c) => c.series.some((s) => s.label.startsWith('Highest gust')));
      expect(wind.length).toBe(demoSensors.length);
      for (const w of wind) expect(w.series.map((s) => s.label)).toEqual(['Highest gust per 2 min, m/s', 'Mean wind per 2 min, m/s', 'Direction the wind blows from, ° (dots, right axis)']);
      const util = charts.find((c) => c.title.startsWith('Highest utilization'))!;
      expect(util.series.map((s) => s.label).sort()).toEqual(demoNames.map((n) => `${n}, % of capacity`));
      // The demo's structures follow the site's default levels (60 %, 80 %, 100 % of capacity);
      // the Sponsor arch prepares on the chance of 80 % within 30 min, or at 80 % measured.
      expect(util.levels).toEqual([
        'Level 1 · Watch: from 60 % of capacity (levels as set now)',
        'Level 2 · Prepare: from 80 % of capacity, or sooner on its estimated chance at Sponsor arch (levels as set now)',
        'Limit: 100 % of capacity',
      ]);
      await partShots(page, `log-report-${label}`);
      await context.close();
    }
  }, 90_000);

  it('gives the structure page’s chart the same legend: gust and utilization with units, each level line by name and gust', async () => {
    const context = await browser.newContext({ viewport: phone });
    const page = await context.newPage();
    await signInThroughForm(page, baseUrl, cpLogin.username, cpLogin.password);
    const { structures } = await cp.call<{ structures: Array<{ id: number; name: string }> }>('GET', '/api/structures');
    const marquee = structures.find((s) => s.name === 'Food hall marquee')!;
    await page.goto(`${baseUrl}/#/structure/${marquee.id}`);
    const fig = page.locator('figure.chart-fig');
    await fig.locator('canvas').first().waitFor();
    const charts = (await page.evaluate(legendsScript)) as Array<{ series: Array<{ label: string; dash: string; colour: string }>; levels: string[]; libraryLegend: number }>;
    expect(charts).toHaveLength(1);
    expect(charts[0]!.libraryLegend).toBe(0);
    expect(charts[0]!.series.map((s) => s.dash)).toEqual(['solid', '6,4']);
    // One line per level of the structure, named, with its trigger gust in m/s.
    expect(charts[0]!.levels.length).toBe(3);
    for (const line of charts[0]!.levels) expect(line).toMatch(/^\d · .+: from \d+\.\d m\/s$/);
    await fig.screenshot({ path: path.join(screenshotDir, 'log-report-structure-chart-phone.png') });
    await context.close();
  }, 60_000);

  it('prints in black and white: print palette on the canvas, no pointer read-out, and a sign-off box at the end (phone and desktop, light and dark)', async () => {
    for (const [viewport, scheme, label] of [
      [phone, 'light', 'phone'],
      [desktop, 'light', 'desktop'],
      [desktop, 'dark', 'desktop-dark'],
    ] as const) {
      const { context, page } = await openYesterday(viewport, scheme);
      // On screen, the gust is drawn in the screen colour (light #0a4a85, dark #7cc0ff), not the print one.
      expect(await page.evaluate(pixelsNearScript('#0b2f66'))).toBe(0);
      await page.emulateMedia({ media: 'print', colorScheme: scheme });
      await page.evaluate('new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)))');
      expect(await page.evaluate(`getComputedStyle(document.documentElement).getPropertyValue('--series-gust').trim()`)).toBe('#0b2f66');
      expect(await page.evaluate(`getComputedStyle(document.body).backgroundColor`)).toBe('rgb(255, 255, 255)');
      // The canvas was drawn again with the print palette.
      expect(await page.evaluate(pixelsNearScript('#0b2f66'))).toBeGreaterThan(50);
      expect(await page.locator('.chart-readout').first().isVisible()).toBe(false);
      expect(await page.locator('.log-controls').isVisible()).toBe(false);
      const signOff = page.locator('section.sign-off');
      await expect(signOff.isVisible()).resolves.toBe(true);
      const text = (await signOff.textContent()) ?? '';
      for (const field of ['Competent person (name)', 'Date', 'Signature', 'Remarks']) expect(text).toContain(field);
      expect(await page.evaluate(`getComputedStyle(document.querySelector('section.sign-off')).breakInside`)).toBe('avoid');
      // The sign-off is the last part of the report.
      const lastSection = await page.evaluate(`[...document.querySelectorAll('main section.report-section')].pop()?.className ?? ''`);
      expect(lastSection).toContain('sign-off');
      const box = await page.locator('.sign-box').boundingBox();
      expect(box!.height).toBeGreaterThan(60);
      await screenshot(page, `log-report-print-${label}`);
      await grayscaleScreenshot(page, `log-report-print-${label}-gray`);
      await partShots(page, `log-report-print-${label}`);
      await page.evaluate(`document.documentElement.style.filter = 'grayscale(1)'`);
      await partShots(page, `log-report-print-${label}-gray`);
      await page.evaluate(`document.documentElement.style.filter = ''`);
      if (label === 'desktop') {
        const pdf = await page.pdf({ format: 'A4', printBackground: true, path: path.resolve('tests/artifacts/log-report.pdf') });
        const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
        expect(pages).toBeGreaterThanOrEqual(2);
        console.log(`day report PDF: ${pages} A4 pages, ${Math.round(pdf.length / 1024)} kB`);
      }
      await context.close();
    }
  }, 120_000);

  it('shows each acknowledgement note beside the structure it is about (the demo crew’s notes)', async () => {
    const { alerts } = await cp.call<{ alerts: Array<{ kind: string; structureId: number | null; acknowledgeNote: string | null }> }>('GET', `/api/log/alerts?day=${yesterday}`);
    const summary = await cp.call<{ structures: Array<{ id: number; kind: string; name: string }> }>('GET', `/api/log/summary?day=${yesterday}`);
    const kinds = new Map(summary.structures.map((s) => [s.id, s.kind]));
    // The words that name each kind's structure in a note, and must not appear in another's.
    const words: Record<string, RegExp> = { tent: /marquee|food hall/i, banner: /scrim|fence/i, screen: /screen/i, shell: /shell|bandstand/i, custom: /arch/i };
    const levelAlerts = alerts.filter((a) => a.kind === 'level' && a.structureId !== null);
    expect(levelAlerts.length).toBeGreaterThan(5);
    for (const a of levelAlerts) {
      const kind = kinds.get(a.structureId!)!;
      expect(a.acknowledgeNote, `${kind}: ${a.acknowledgeNote}`).toMatch(words[kind]!);
      for (const [other, re] of Object.entries(words)) if (other !== kind) expect(a.acknowledgeNote, `${kind} note mentions a ${other}: ${a.acknowledgeNote}`).not.toMatch(re);
    }
    const { context, page } = await openYesterday(phone);
    const screenEntry = page.locator('.timeline li', { hasText: 'Stage-left LED screen' }).filter({ hasText: 'acknowledged by' }).first();
    await screenEntry.scrollIntoViewIfNeeded();
    await expect(screenEntry.locator('.t-ack').textContent()).resolves.toMatch(/screen/i);
    await page.screenshot({ path: path.join(screenshotDir, 'log-report-timeline-phone.png') });
    await context.close();
  }, 60_000);

  it('downloads CSV from the page with site time beside UTC, units in the column names and figures to 0.1', async () => {
    const { context, page } = await openYesterday(desktop);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Structures per minute' }).click()]);
    expect(download.suggestedFilename()).toBe(`structure-minutes-${yesterday}.csv`);
    const [header, ...rows] = parseRfc4180(fs.readFileSync((await download.path())!, 'utf8'));
    expect(header).toEqual(['structure', 'minute_local', 'minute_utc', 'max_gust_mps', 'max_utilization_pct', 'min_margin_pct', 'max_level']);
    // Yesterday, minute by minute, for the five demo structures (the shell up to midnight too).
    expect(new Set(rows.map((r) => r[0])).size).toBe(demoNames.length);
    for (const r of rows) {
      expect(r.length).toBe(header!.length);
      expect(r[1]).toBe(intlSiteTime(Date.parse(r[2]!)));
      expect(r[1]!.startsWith(yesterday)).toBe(true);
      for (const k of [3, 4, 5]) expect(r[k]).toMatch(/^-?\d+\.\d$/);
      expect(Number(r[4]) + Number(r[5])).toBeCloseTo(100, 6);
    }
    await context.close();
    expect(pageErrors).toEqual([]);
  }, 60_000);
});
