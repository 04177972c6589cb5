/**
 * Alerts on the live board after a windy spell, in a real browser against the real server: the
 * gateway publishes rising gusts over MQTT until one structure has raised Watch, Prepare and Stop
 * and four more have raised Watch; then the gust eases and the structure drops back to Prepare,
 * so Stop's condition ends while it still waits for acknowledgement.
 *
 * What a crew member on a phone must see: one card per structure, led by the level the structure
 * is at NOW (Prepare, with its action), the ended Stop and the Watch folded into it one line each;
 * at most three cards that may wait before a "Show N more" expander, so the wind and the
 * structures stay within about two screens; one tap on "Acknowledge all 3 for this structure"
 * acknowledges every one of them on the server (GET /api/live), after which the card still leads
 * with Prepare, now marked acknowledged, and Stop (ended and acknowledged) is gone.
 */
import mqtt, { type MqttClient } from 'mqtt';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { siteDefaultLevels } from '../../server/levels/siteDefaultLevels.ts';
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
const viewer = { username: 'steward', displayName: 'Gate steward', password: 'e2e-viewer-password' };
const banner = 'Car park banner';
const others = ['Bar tent', 'Food tent', 'Info point', 'Stage screen'];
const ackNote = 'Banner rolled up, path coned off (e2e)';

interface LiveAlert {
  id: number;
  structureId: number | null;
  label: string;
  level: number | null;
  clearedAtMs: number | null;
  acknowledgedAtMs: number | null;
  acknowledgedBy: string | null;
  acknowledgeNote: string | null;
}
interface LiveAnswer {
  alerts: LiveAlert[];
  structures: Array<{ id: number; name: string; level: number; noData: boolean }>;
}

/**
 * A plain frame (6 m² at 3.5 m on a tonne of ballast) with the site's default labels and action
 * texts (full length, as a real site has them), triggered directly by gusts at the structure.
 */
/** A board on a 1.5 m base; `massKg` 1000 gives a limit of about 14 m/s, 10 000 about 45 m/s (limit ∝ √mass). */
function structureBody(name: string, gusts: [number, number, number], massKg = 1000) {
  return {
    record: { kind: 'custom', name, baseDepthM: 1.5, faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg, xM: 0.75 }] },
    sensorKeys: ['mast-a'],
    levels: siteDefaultLevels.map((l, i) => ({ label: l.label, trigger: { kind: 'gust', gustMps: gusts[i] }, actionText: l.actionText })),
  };
}

describe.skipIf(skip)('alerts grouped by structure on the live board', () => {
  let e2e: E2eServer;
  let browser: Browser;
  let cp: Api;
  let gateway: MqttClient;
  let bannerId = 0;
  let page: Page;
  const pageErrors: string[] = [];
  let lastTs = 0;

  const publish = async (gust: number) => {
    lastTs = Math.max(Date.now(), lastTs + 1);
    await gateway.publishAsync('wind/mast-a/reading', JSON.stringify({ ts: lastTs, speed: Math.round((gust / 1.6) * 10) / 10, gust, dir: 250 }), { qos: 1 });
  };
  const liveNow = () => cp.call<LiveAnswer>('GET', '/api/live');
  const bannerLevel = async () => (await liveNow()).structures.find((s) => s.id === bannerId)?.level;
  /** Waits (in beforeAll, where expect.poll is not available) until the banner is at `level`. */
  const bannerReaches = async (level: number, timeoutMs: number) => {
    const deadline = Date.now() + timeoutMs;
    let seen: number | undefined;
    while ((seen = await bannerLevel()) !== level) {
      if (Date.now() > deadline) throw new Error(`${banner} is at level ${seen}, not ${level}, after ${timeoutMs} ms`);
      await new Promise((r) => setTimeout(r, 100));
    }
  };

  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    e2e = await startE2eServer(admin);
    browser = await launchBrowser();
    const adminApi = new Api(e2e.baseUrl);
    await adminApi.signIn(admin.username, admin.password);
    await adminApi.call('POST', '/api/people', { username: 'cp', displayName: 'Dana Whitlock', role: 'competent-person', password: 'e2e-cp-password' });
    await adminApi.call('POST', '/api/people', { username: crew.username, displayName: crew.displayName, role: 'crew', password: crew.password });
    await adminApi.call('POST', '/api/people', { username: viewer.username, displayName: viewer.displayName, role: 'viewer', password: viewer.password });
    cp = new Api(e2e.baseUrl);
    await cp.signIn('cp', 'e2e-cp-password');
    // A short hold so the level can come down within the test; a long silence timeout so the
    // sensor is not declared silent between the steps.
    await cp.call('PATCH', '/api/site', { holdTimeMs: 1_000 });
    await cp.call('POST', '/api/sensors', { key: 'mast-a', name: 'Mast A', heightM: 10, mode: 'summaries', silenceTimeoutMs: 600_000 });
    const made = await cp.call<{ password: string }>('POST', '/api/gateways', { name: 'Field gateway', username: 'field-gw', sensorKeys: ['mast-a'] });
    bannerId = (await cp.call<{ structure: { id: number } }>('POST', '/api/structures', structureBody(banner, [8, 11, 14]))).structure.id;
    for (const name of others) await cp.call('POST', '/api/structures', structureBody(name, [12, 30, 40], 10_000));
    gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${e2e.server.mqttPort}`, { username: 'field-gw', password: made.password, clientId: 'e2e-groups-gateway', reconnectPeriod: 0 });

    // The spell: Watch, then Prepare (and Watch on the four others), then Stop for the banner.
    for (const [gust, level] of [
      [9, 1],
      [12.5, 2],
      [16, 3],
    ] as const) {
      await publish(gust);
      await bannerReaches(level, 5_000);
    }
    // Easing: below Stop's lowered threshold (14 m/s less the 10 % dead band) for the 1-s hold,
    // above Prepare's: the banner drops to Prepare and the Stop alert's condition ends.
    await publish(12);
    await new Promise((r) => setTimeout(r, 1_200));
    await publish(12);
    await bannerReaches(2, 8_000);
    const live = await liveNow();
    const ofBanner = live.alerts.filter((a) => a.structureId === bannerId);
    expect(ofBanner.map((a) => `${a.label}:${a.clearedAtMs === null ? 'in force' : 'ended'}`).sort()).toEqual(['Prepare:in force', 'Stop and clear:ended', 'Watch:in force']);
    expect(live.alerts.filter((a) => a.structureId !== bannerId && a.acknowledgedAtMs === null)).toHaveLength(others.length);

    const context = await browser.newContext({ viewport: phone });
    context.setDefaultTimeout(10_000);
    page = await context.newPage();
    page.on('pageerror', (err) => pageErrors.push(`page error: ${err.message}`));
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(`console: ${m.text()}`);
    });
    await signInThroughForm(page, e2e.baseUrl, crew.username, crew.password);
  }, 90_000);

  afterAll(async () => {
    await gateway?.endAsync();
    await browser?.close();
    await e2e?.stop();
  });

  const bannerCard = (p: Page) => p.locator('li.alert-group article.alert-card', { has: p.locator('.alert-subject', { hasText: banner }) });

  it('shows one card per structure, led by the level it is at now, the other alerts folded into it', async () => {
    const groups = page.locator('li.alert-group');
    await expect.poll(() => groups.count()).toBe(3);
    await page.locator('#alerts-h', { hasText: '7 to acknowledge, on 5 cards' }).waitFor();
    // The banner first (a level 2 in force beats a level 1), one card for all three of its alerts.
    const first = groups.first();
    await expect(first.locator('article.alert-card').count()).resolves.toBe(1);
    const card = first.locator('article.alert-card');
    await expect(card.locator('.alert-subject').textContent()).resolves.toBe(banner);
    // Led by the level in force now (Prepare), not by the higher alert whose condition has ended.
    await expect(card.locator('header .alert-label').innerText()).resolves.toBe('Level 2 · Prepare');
    await expect(card.locator('.current-level .alert-action').textContent()).resolves.toBe(siteDefaultLevels[1]!.actionText);
    await expect(card.locator('.current-level .alert-meta').innerText()).resolves.toMatch(/^Reached \d\d:\d\d at 12\.5\sm\/s · in force · Not yet acknowledged$/);
    // Stop (ended) and Watch folded, one line each, said in words; their actions not spelled out.
    await expect(card.locator('li.folded-line').allInnerTexts()).resolves.toEqual([
      expect.stringMatching(/^Level 3 · Stop and clear raised \d\d:\d\d, ended \d\d:\d\d · Not yet acknowledged$/),
      expect.stringMatching(/^Level 1 · Watch raised \d\d:\d\d, still in force · Not yet acknowledged$/),
    ]);
    await expect(first.textContent()).resolves.not.toContain(siteDefaultLevels[0]!.actionText);
    await expect(first.textContent()).resolves.not.toContain(siteDefaultLevels[2]!.actionText);
    await card.getByRole('button', { name: 'Acknowledge all 3 for this structure' }).waitFor();
    // The other cards each lead with their one Watch, nothing folded.
    for (const i of [1, 2]) {
      await expect(groups.nth(i).locator('header .alert-label').innerText()).resolves.toBe('Level 1 · Watch');
      await expect(groups.nth(i).locator('li.folded-line').count()).resolves.toBe(0);
      await expect(groups.nth(i).locator('.current-level .alert-meta').innerText()).resolves.toContain('in force');
      await groups.nth(i).getByRole('button', { name: 'Acknowledge', exact: true }).waitFor();
    }
  });

  it('keeps the wind within two phone screens and the first structure just after, the rest of the cards behind an expander', async () => {
    await screenshot(page, 'board-groups-phone');
    // Three full cards with the default action texts: the wind starts within two screens, the
    // first structure's name is in view by the end of the third (about two screens down).
    const top = (selector: string) => page.locator(selector).first().evaluate((el) => el.getBoundingClientRect().top + (globalThis as unknown as { scrollY: number }).scrollY);
    const windTop = await top('.wind-panel');
    const firstStructure = await top('a.structure-card .sc-name');
    console.log(`wind panel at ${Math.round(windTop)} px, first structure at ${Math.round(firstStructure)} px (screen ${phone.height} px)`);
    expect(windTop).toBeLessThan(2 * phone.height);
    expect(firstStructure).toBeLessThan(2.5 * phone.height);

    const more = page.getByRole('button', { name: 'Show 2 more structures with alerts (2 to acknowledge)' });
    await expect(more.getAttribute('aria-expanded')).resolves.toBe('false');
    await more.click();
    await expect.poll(() => page.locator('li.alert-group').count()).toBe(5);
    const subjects = await page.locator('li.alert-group .alert-subject').allTextContents();
    expect(subjects[0]).toBe(banner);
    expect(subjects.slice(1).sort()).toEqual(others);
    expect(await seriousAxeViolations(page).then(describeViolations)).toBe('');
    await page.getByRole('button', { name: 'Show fewer alerts' }).click();
    await expect.poll(() => page.locator('li.alert-group').count()).toBe(3);
  });

  it('offers a viewer no button to acknowledge, and states whether the crew have', async () => {
    const context = await browser.newContext({ viewport: phone });
    const viewerPage = await context.newPage();
    await signInThroughForm(viewerPage, e2e.baseUrl, viewer.username, viewer.password);
    const card = bannerCard(viewerPage);
    await card.locator('.current-level', { hasText: 'not yet acknowledged by the crew' }).waitFor();
    await expect(viewerPage.getByRole('button', { name: /acknowledge/i }).count()).resolves.toBe(0);
    await expect(viewerPage.locator('main.board').innerText()).resolves.not.toMatch(/to acknowledge/i);
    await context.close();
  });

  it('acknowledges all three alerts of the structure on the server with one note, and still leads the card with the level in force', async () => {
    const card = bannerCard(page);
    await card.getByRole('button', { name: 'Add a note' }).click();
    await card.getByLabel('Note (optional): what you did or saw').fill(ackNote);
    await card.getByRole('button', { name: 'Acknowledge all 3 for this structure' }).click();

    // On the server: nothing of the banner's is left unacknowledged; each carries the name and note.
    await expect
      .poll(async () => (await liveNow()).alerts.filter((a) => a.structureId === bannerId && a.acknowledgedAtMs === null).length, { timeout: 5_000 })
      .toBe(0);
    const log = await cp.call<{ alerts: LiveAlert[] }>('GET', `/api/log/alerts?from=${Date.now() - 3_600_000}&to=${Date.now() + 60_000}`);
    const stored = log.alerts.filter((a) => a.structureId === bannerId);
    expect(stored.map((a) => a.label).sort()).toEqual(['Prepare', 'Stop and clear', 'Watch']);
    for (const a of stored) {
      expect(a.acknowledgedBy).toBe(crew.displayName);
      expect(a.acknowledgeNote).toBe(ackNote);
    }
    // The other structures' alerts are untouched.
    await expect((await liveNow()).alerts.filter((a) => a.structureId !== bannerId && a.acknowledgedAtMs === null)).toHaveLength(others.length);

    // On the board: the banner's card goes after those still to acknowledge (behind the expander
    // on a phone), still led by Prepare, now acknowledged; Stop (ended, acknowledged) gone.
    await page.locator('#alerts-h', { hasText: '4 to acknowledge, on 4 cards' }).waitFor();
    await page.getByRole('button', { name: 'Show 2 more structures with alerts (1 to acknowledge)' }).click();
    const group = page.locator('li.alert-group').last();
    await expect(group.locator('.alert-subject').textContent()).resolves.toBe(banner);
    await expect(group.locator('header .alert-label').innerText()).resolves.toBe('Level 2 · Prepare');
    await expect(group.locator('.current-level .alert-action').textContent()).resolves.toBe(siteDefaultLevels[1]!.actionText);
    await expect(group.locator('.current-level .ack-done').innerText()).resolves.toMatch(new RegExp(`^✓\\sAcknowledged by ${crew.displayName.replace(/[()]/g, '\\$&')} at \\d\\d:\\d\\d:\\d\\d: “${ackNote.replace(/[()]/g, '\\$&')}”$`));
    await expect(group.locator('li.folded-line').allInnerTexts()).resolves.toEqual([expect.stringMatching(/^Level 1 · Watch raised \d\d:\d\d, still in force · ✓\sAcknowledged by /)]);
    await expect(group.textContent()).resolves.not.toContain('Stop and clear');
    await expect(group.getByRole('button', { name: /^Acknowledge/ }).count()).resolves.toBe(0);
    expect(await seriousAxeViolations(page).then(describeViolations)).toBe('');
    await screenshot(page, 'board-groups-acknowledged-phone');

    await page.setViewportSize(desktop);
    await page.reload();
    await page.locator('li.alert-group').first().waitFor();
    await screenshot(page, 'board-groups-desktop');
    expect(pageErrors).toEqual([]);
  }, 30_000);
});
