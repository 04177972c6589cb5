/**
 * The forecast check in a real browser (Chromium) against the real server, on a phone (390 × 844)
 * and a desktop (1366 × 900): a pasted table with the date and the time in separate columns,
 * speeds with their unit in each cell ("18 mph") and day-first dates; an error that names its line
 * and column; a refused table where both date orders fit; the worst level of each hour first,
 * and every structure's level when a row is tapped.
 *
 * Expected levels are worked out here from the structures' trigger gusts (absolute gusts, at 10 m,
 * where the forecast speeds are: the height factor is 1) and the exact definition of the mile:
 * 1 mile = 1609.344 m (international yard and pound agreement, 1959), so 1 mph = 0.44704 m/s.
 * Winter dates in Europe/London are GMT (UTC+0; EU Directive 2000/84/EC).
 *
 * Screenshots go to tests/artifacts/screenshots/forecast-*.png (looked at by hand; the assertions
 * here are the checks).
 */
import path from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  Api,
  describeViolations,
  desktop,
  ensureWebBuilt,
  launchBrowser,
  phone,
  requireChromium,
  screenshot,
  screenshotDir,
  seriousAxeViolations,
  signInThroughForm,
  skipBrowserTests,
  startE2eServer,
  type E2eServer,
} from './support.ts';

const admin = { username: 'forecast-admin', password: 'e2e-forecast-admin-password' };
/** 1 mph in m/s (1959 international mile of 1609.344 m, per hour). */
const mphMps = 1609.344 / 3600;

/** Invented structures with gust triggers (m/s at 10 m), weakest first. */
const structures = [
  { name: 'Gate arch', triggers: [6, 9, 12] },
  { name: 'Stage screen', triggers: [8, 11, 14] },
  { name: 'Bar marquee', triggers: [10, 13, 16] },
] as const;
const labels = ['Watch', 'Prepare', 'Stop and clear'] as const;

/** The level a gust reaches on a ladder: the highest trigger at or below it (a gust equal to a trigger reaches it). */
const levelOf = (gustMps: number, triggers: readonly number[]): number => triggers.filter((t) => gustMps >= t).length;

/** The table as pasted: separate date and time, units in the cells, dates day first. */
const goodRows = [
  ['03/12/2026', '14:00', '10 mph', '18 mph', 'SW'],
  ['03/12/2026', '15:00', '14 mph', '25 mph', 'WSW'],
  ['03/12/2026', '16:00', '18 mph', '30 mph', 'W'],
  ['04/12/2026', '09:00', '', '', ''],
];
const table = (rows: string[][]) => ['date,time,mean,gust,dir', ...rows.map((r) => r.join(','))].join('\n');
const goodTable = table(goodRows);
/** The same with a misspelt unit on line 4 (the header is line 1), column 4. */
const typoTable = table(goodRows.map((r, i) => (i === 2 ? [r[0]!, r[1]!, r[2]!, '30 mhp', r[4]!] : r)));

const shot = async (page: Page, name: string, fullPage = true) => {
  if (fullPage) await screenshot(page, name);
  else await page.screenshot({ path: path.join(screenshotDir, `${name}.png`) });
};

describe.skipIf(skipBrowserTests)('the forecast check in a real browser', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let api: Api;
  const contexts: BrowserContext[] = [];
  const pageErrors: string[] = [];

  async function signedInPage(viewport: { width: number; height: number }): Promise<Page> {
    const context = await browser.newContext({ viewport });
    context.setDefaultTimeout(10_000);
    contexts.push(context);
    const page = await context.newPage();
    page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
    });
    await signInThroughForm(page, e2e.baseUrl, admin.username, admin.password);
    await page.goto(`${e2e.baseUrl}/#/plan`);
    await page.locator('#fc-text').waitFor();
    return page;
  }

  async function check(page: Page, text: string, dateOrder: '' | 'day-first' | 'month-first'): Promise<void> {
    await page.fill('#fc-text', text);
    await page.selectOption('#fc-order', dateOrder);
    await page.getByRole('button', { name: 'Check the forecast' }).click();
  }

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    e2e = await startE2eServer(admin);
    browser = await launchBrowser();
    api = new Api(e2e.baseUrl);
    await api.signIn(admin.username, admin.password);
    await api.call('PATCH', '/api/site', { timeZone: 'Europe/London' });
    for (const s of structures) {
      await api.call('POST', '/api/structures', {
        record: {
          kind: 'custom',
          name: s.name,
          baseDepthM: 2,
          referenceHeightM: 10,
          faces: [{ areaM2: 4, centroidHeightM: 2, cfFront: 1.8, cfBack: 1.8 }],
          masses: [{ massKg: 4000, xM: 1 }],
          coefficientSource: 'demo values for an invented structure',
        },
        levels: s.triggers.map((gustMps, i) => ({ label: labels[i], trigger: { kind: 'gust', gustMps }, actionText: `${labels[i]}: act on the plan for the ${s.name.toLowerCase()}.` })),
      });
    }
  }, 60_000);

  afterAll(async () => {
    for (const c of contexts) await c.close();
    await browser?.close();
    await e2e?.stop();
  });

  it('answers plain sentences, not library wording, for bad request fields', async () => {
    const refusal = async (body: unknown): Promise<Array<{ path: string; message: string }>> => {
      try {
        await api.call('POST', '/api/forecast', body);
      } catch (err) {
        const text = String((err as Error).message);
        return (JSON.parse(text.slice(text.indexOf('{'))) as { issues: Array<{ path: string; message: string }> }).issues;
      }
      throw new Error('expected a refusal');
    };
    expect(await refusal({ text: goodTable, heightM: 'tall' })).toEqual([{ path: 'heightM', message: 'the height of the forecast speeds must be a number of metres' }]);
    expect(await refusal({ text: goodTable, unit: 'furlongs' })).toEqual([{ path: 'unit', message: 'the speed unit must be one of m/s, km/h, kn or mph' }]);
    expect(await refusal({ text: goodTable, dateOrder: 'year-first' })).toEqual([{ path: 'dateOrder', message: 'the date order must be day-first or month-first' }]);
  });

  it('on a phone: an error names its line and column, an ambiguous date order is refused, then the worst level of each hour comes first and a tap shows every structure', async () => {
    const page = await signedInPage(phone);

    // A misspelt unit, with no date order chosen: both problems, each starting with where it is.
    await check(page, typoTable, '');
    const problems = page.locator('.fc-problems');
    await problems.waitFor();
    const problemText = (await problems.textContent()) ?? '';
    expect(problemText).toContain('Line 4, column 4 (gust): "30 mhp" is not a speed — use m/s, km/h, mph or kn');
    expect(problemText).toContain('Line 2, column 1 (date): "03/12/2026" could be 3 December 2026 (day first) or 12 March 2026 (month first)');
    expect(problemText).not.toMatch(/text\.line|Invalid|expected|received/);
    expect(await page.locator('.fc-hours').count()).toBe(0);
    await expect(problems.isVisible()).resolves.toBe(true);
    await shot(page, 'forecast-error-phone', false);

    // Corrected, and the order chosen: day first.
    await check(page, goodTable, 'day-first');
    await page.locator('.fc-hours').waitFor();
    const notes = (await page.locator('.fc-notes').textContent()) ?? '';
    expect(notes).toContain('Date from column 1 (date), time of day from column 2 (time).');
    expect(notes).toContain('Dates read day first (day/month/year), as chosen.');
    expect(notes).toContain('Gust (column 4, gust): mph, from the cells.');

    // One line per row, in order; each names the worst level, its structure and the gust.
    const hours = page.locator('.fc-hour');
    await expect(hours.count()).resolves.toBe(goodRows.length);
    for (const [i, row] of goodRows.entries()) {
      const summary = ((await hours.nth(i).locator('summary').textContent()) ?? '').replace(/\u00a0/g, ' ');
      expect(summary, `row ${i + 1}`).toContain(row[1]!);
      if (row[3] === '') {
        expect(summary).toContain('Unknown — no wind given');
        expect(await hours.nth(i).getAttribute('class')).toContain('tone-nodata');
        continue;
      }
      const gustMps = Number.parseFloat(row[3]!) * mphMps;
      const ranked = structures
        .map((s) => ({ s, level: levelOf(gustMps, s.triggers), closeness: gustMps / s.triggers[2] }))
        .sort((a, b) => b.level - a.level || b.closeness - a.closeness);
      const worst = ranked[0]!;
      expect(summary).toContain(`Level ${worst.level} · ${labels[worst.level - 1]}`);
      expect(summary).toContain(worst.s.name);
      expect(summary).toContain(`Gust ${gustMps.toFixed(1)} m/s forecast`);
    }
    // 30 mph = 13.41 m/s: the gate arch (Stop and clear at 12 m/s) is the worst of the day.
    await expect(page.locator('.fc-overall').textContent()).resolves.toContain('Highest predicted: Level 3 · Stop and clear — Gate arch');

    // The hour view comes before the full grid, which stays folded on a phone.
    const hoursTop = (await page.locator('.fc-hours').boundingBox())!.y;
    const gridTop = (await page.locator('.fc-grid-more').boundingBox())!.y;
    expect(hoursTop).toBeLessThan(gridTop);
    await expect(page.locator('.fc-grid-more').evaluate((d) => (d as unknown as { open: boolean }).open)).resolves.toBe(false);
    await expect(page.locator('table.forecast-grid').isVisible()).resolves.toBe(false);
    // Nothing runs off the side of the screen.
    await expect(page.evaluate('document.documentElement.scrollWidth')).resolves.toBeLessThanOrEqual(phone.width);
    await shot(page, 'forecast-hours-phone', false);

    // Tap 16:00: every structure, worst first, with its gust here and what comes next.
    await hours.nth(2).locator('summary').click();
    const detail = hours.nth(2).locator('.fc-structure');
    await detail.first().waitFor();
    const gust16 = 30 * mphMps;
    const items = (await detail.allTextContents()).map((t) => t.replace(/\u00a0/g, ' '));
    expect(items).toHaveLength(3);
    expect(items[0]).toContain('Gate arch');
    expect(items[0]).toContain('Level 3 · Stop and clear');
    expect(items[0]).toContain(`gust ${gust16.toFixed(1)} m/s at 10.0 m`);
    expect(items[0]).toContain('at its top level (from 12.0 m/s)');
    expect(items[1]).toContain('Stage screen');
    expect(items[1]).toContain(`Level ${levelOf(gust16, structures[1].triggers)} · Prepare`);
    expect(items[1]).toContain('Stop and clear from 14.0 m/s');
    expect(items[2]).toContain('Bar marquee');
    expect(items[2]).toContain(`Level ${levelOf(gust16, structures[2].triggers)} · Prepare`);
    await expect(page.evaluate('document.documentElement.scrollWidth')).resolves.toBeLessThanOrEqual(phone.width);
    await hours.nth(2).scrollIntoViewIfNeeded();
    await shot(page, 'forecast-detail-phone', false);
    await shot(page, 'forecast-full-phone');

    const violations = await seriousAxeViolations(page);
    expect(describeViolations(violations)).toBe('');
    // The same at night (dark theme follows the phone's setting).
    await page.emulateMedia({ colorScheme: 'dark' });
    await hours.nth(2).scrollIntoViewIfNeeded();
    await shot(page, 'forecast-detail-dark-phone', false);
    expect(describeViolations(await seriousAxeViolations(page))).toBe('');
  }, 60_000);

  it('on a desktop: the order detected from 13/12/2026 is said, the grid is open beside the hour view, and a mixed-unit column is refused with its line and column', async () => {
    const page = await signedInPage(desktop);
    const detected = table([...goodRows.slice(0, 3), ['13/12/2026', '1000', '6 mph', '9 mph', 'S']]);
    await check(page, detected, '');
    await page.locator('.fc-hours').waitFor();
    await expect(page.locator('.fc-notes').textContent()).resolves.toContain('Dates read day first (day/month/year): line 5 has 13/12/2026, and there is no month 13.');
    await expect(page.locator('.fc-day h4').allTextContents()).resolves.toEqual(['Thu, 3 Dec 2026', 'Sun, 13 Dec 2026']);
    await expect(page.locator('table.forecast-grid').isVisible()).resolves.toBe(true);
    await expect(page.locator('table.forecast-grid thead').textContent()).resolves.toContain('Bar marquee');
    // 9 mph = 4.02 m/s: below every first trigger; the nearest is the gate arch (4.02/12 of its top).
    const last = ((await page.locator('.fc-hour').nth(3).locator('summary').textContent()) ?? '').replace(/\u00a0/g, ' ');
    expect(last).toContain('10:00');
    expect(last).toContain('Below all levels');
    expect(last).toContain('Nearest its first level: Gate arch');
    await page.locator('.fc-hour').nth(1).locator('summary').click();
    await page.locator('.fc-hour').nth(1).locator('.fc-structure').first().waitFor();
    await shot(page, 'forecast-hours-desktop');

    await check(page, table([goodRows[0]!, ['03/12/2026', '15:00', '22 km/h', '40 km/h', 'W']]), 'day-first');
    const problems = page.locator('.fc-problems');
    await problems.waitFor();
    const text = (await problems.textContent()) ?? '';
    expect(text).toContain('Line 3, column 3 (mean): "22 km/h" is in km/h but line 2 of this column is in mph — one unit per column; mixed units are refused, not converted');
    expect(text).toContain('Line 3, column 4 (gust): "40 km/h" is in km/h but line 2 of this column is in mph');
    await shot(page, 'forecast-error-desktop', false);
    expect(pageErrors.join('\n')).toBe('');
  }, 60_000);
});
