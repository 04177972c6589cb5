/**
 * The installable app in Chromium (issue 16; http://127.0.0.1 is a secure context, so the service
 * worker runs as it would over https):
 * - the manifest is valid and Chromium finds the app installable (DevTools protocol
 *   Page.getAppManifest and Page.getInstallabilityErrors: Chromium's own checks);
 * - the service worker registers at the root scope and controls the page;
 * - a real alert's push message (raised over MQTT, sent by the server to a push endpoint of ours,
 *   decrypted there with the subscription's keys) delivered to the page's service worker
 *   (ServiceWorker.deliverPushMessage) shows a notification with the action first and the
 *   buttons Acknowledge and "Done: lowered";
 * - with the server stopped, the app still opens from the phone and shows the last snapshot kept
 *   there as OLD DATA with its age — never as current.
 */
import http from 'node:http';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { chromium, type BrowserContext, type CDPSession, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '../../server/log.ts';
import { startTestServer, waitFor } from '../helpers/testServer.ts';
import { browserKeys, decryptAes128gcm } from '../helpers/webPushCrypto.ts';
import { Api, chromiumPath, desktop, ensureWebBuilt, phone, requireChromium, screenshot, signInThroughForm, skipBrowserTests, type E2eServer } from './support.ts';

// The page's globals, for the functions run inside it (the tests' tsconfig has no DOM library).
declare const navigator: any, caches: any, Image: any, Notification: any;

const admin = { username: 'site-admin', password: 'e2e-admin-password' };
const crew = { username: 'rigger', displayName: 'Jo Marsh (rigger)', password: 'e2e-crew-password' };

const screenRecord = {
  kind: 'screen', name: 'Harbour stage LED wall', configurationName: 'raised', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2, towerMassKg: 400, screenMassKg: 600,
  outriggerDepthM: 3, ballastPerTowerKg: 1500, frictionCoefficient: 0.7, towerWidthM: 0, headerTrussDepthM: 0, configurations: [{ name: 'lowered', changes: { bottomHeightM: 1.2 } }],
};
// The ladder of tests/integration/configurations-live.test.ts: 13 m/s at the mast is level 2, whose action lowers the screen.
const levels = [
  { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: 'Crew to the screen; clear the area behind it.' },
  { label: 'Lower the screen', trigger: { kind: 'utilization', fraction: 0.7 }, actionText: 'Lower the LED wall to its bottom stop.', moveToConfiguration: 'lowered' },
  { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 0.9 }, actionText: 'Stop the show; clear 1.5 × height around the wall.' },
];

let server: E2eServer | null = null;
/** A browser profile on disk: an app cannot be installed from an off-the-record one (Chromium's "in-incognito"). */
let profileDir = '';
let context: BrowserContext;
let page: Page;
let cdp: CDPSession;
let gateway: MqttClient;
let pushService: http.Server;
let pushBase = '';
const pushed: Buffer[] = [];
const keys = browserKeys(randomBytes(16));
let origin = '';
const registrations: Array<{ registrationId: string; scopeURL: string; isDeleted: boolean }> = [];

describe.skipIf(skipBrowserTests)('the installable app', () => {
  beforeAll(async () => {
    requireChromium();
    ensureWebBuilt();
    pushService = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', () => {
        pushed.push(Buffer.concat(chunks));
        res.writeHead(201).end();
      });
    });
    await new Promise<void>((resolve) => pushService.listen(0, '127.0.0.1', resolve));
    pushBase = `http://127.0.0.1:${(pushService.address() as { port: number }).port}`;
    server = await startTestServer({ ADMIN_USERNAME: admin.username, ADMIN_PASSWORD: admin.password, VAPID_SUBJECT: 'mailto:site-office@harbour-festival.example' }, { staticRoot: path.resolve('web/dist') }, createLogger('warn'));
    origin = server.baseUrl;
    const api = new Api(origin);
    await api.signIn(admin.username, admin.password);
    await api.call('POST', '/api/sensors', { key: 'harbour-mast', name: 'Harbour mast', heightM: 10 });
    const gw = await api.call<{ password: string }>('POST', '/api/gateways', { name: 'Harbour gateway', username: 'harbour-gw', sensorKeys: ['harbour-mast'] });
    await api.call('POST', '/api/structures', { record: screenRecord, orientationDeg: 250, levels });
    await api.call('POST', '/api/people', { username: crew.username, displayName: crew.displayName, role: 'crew', password: crew.password });
    gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${server.server.mqttPort}`, { username: 'harbour-gw', password: gw.password, reconnectPeriod: 0 });
    profileDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-profile-'));
    context = await chromium.launchPersistentContext(profileDir, {
      executablePath: chromiumPath,
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      viewport: phone,
      deviceScaleFactor: 2,
      isMobile: true,
      hasTouch: true,
    });
    await context.grantPermissions(['notifications'], { origin });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('pageerror', (e) => console.warn('page error:', e.message));
    cdp = await context.newCDPSession(page);
    cdp.on('ServiceWorker.workerRegistrationUpdated', (e: { registrations: typeof registrations }) => registrations.push(...e.registrations));
    await cdp.send('ServiceWorker.enable');
  }, 120_000);

  afterAll(async () => {
    await gateway?.endAsync(true).catch(() => undefined);
    await context?.close();
    if (profileDir) fs.rmSync(profileDir, { recursive: true, force: true });
    await server?.stop();
    await new Promise<void>((resolve) => (pushService ? pushService.close(() => resolve()) : resolve()));
  });

  it('has a valid manifest, a worker at the root scope controlling the page, and Chromium finds it installable', async () => {
    await signInThroughForm(page, origin, crew.username, crew.password);
    await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 20_000 });
    const scope = await page.evaluate(async () => (await navigator.serviceWorker.ready).scope);
    expect(scope).toBe(`${origin}/`);
    const manifest = (await cdp.send('Page.getAppManifest')) as { url: string; errors: Array<{ message: string }>; data?: string };
    expect(manifest.url).toBe(`${origin}/manifest.webmanifest`);
    expect(manifest.errors).toEqual([]);
    const data = JSON.parse(manifest.data ?? '{}') as { name: string; icons: Array<{ src: string; sizes: string; type: string }> };
    expect(data.name).toBe('Holdfast');
    // Every icon the manifest names is served, and each PNG is as large as it says.
    for (const icon of data.icons) {
      const size = await page.evaluate(async (src) => {
        const img = new Image();
        img.src = src;
        await img.decode();
        return `${img.naturalWidth}x${img.naturalHeight}`;
      }, icon.src);
      if (icon.type === 'image/png') expect(size).toBe(icon.sizes);
    }
    // Chromium's own installability checks (manifest, icons, a worker with a fetch handler, secure context).
    const installability = (await cdp.send('Page.getInstallabilityErrors')) as { installabilityErrors: Array<{ errorId: string }> };
    expect(installability.installabilityErrors).toEqual([]);
  }, 60_000);

  it('shows a real alert\'s push with the action first and the buttons Acknowledge and "Done: lowered"', async () => {
    const api = new Api(origin);
    await api.signIn(crew.username, crew.password);
    // The server sends to a push endpoint of ours; what the browser's push service would hand the worker is the decrypted message.
    await api.call('POST', '/api/me/push-subscriptions', { subscription: { endpoint: `${pushBase}/push/jo`, keys: { p256dh: keys.p256dh, auth: keys.auth } }, label: 'Jo\'s phone' });
    for (let i = 0; i < 4; i++) await gateway.publishAsync('wind/harbour-mast/reading', JSON.stringify({ ts: Date.now() - (4 - i) * 500, speed: 13 / 1.5, gust: 13, dir: 250 }), { qos: 1 });
    const text = await waitFor(() => pushed.map((b) => decryptAes128gcm(b, keys.uaPrivate, keys.authSecret).plaintext.toString('utf8')).find((t) => JSON.parse(t).event === 'alert.raised'), 15_000, 'the alert push');
    const registration = await waitFor(() => registrations.find((r) => r.scopeURL === `${origin}/` && !r.isDeleted), 10_000, 'the worker registration');
    // Delivered again every 2 s until shown: the protocol drops a message sent while the worker is still starting.
    let lastSentMs = 0;
    const shown = await waitFor(async () => {
      if (Date.now() - lastSentMs > 2_000) {
        lastSentMs = Date.now();
        await cdp.send('ServiceWorker.deliverPushMessage', { origin, registrationId: registration.registrationId, data: text });
      }
      const list = await page.evaluate(async () => (await (await navigator.serviceWorker.ready).getNotifications()).map((n: { title: string; body: string; tag: string; actions?: Array<{ title: string }> }) => ({ title: n.title, body: n.body, tag: n.tag, actions: (n.actions ?? []).map((a) => a.title) }))) as Array<{ title: string; body: string; tag: string; actions: string[] }>;
      return list.find((n) => n.tag.startsWith('alert-'));
    }, 20_000, 'the notification');
    expect(shown.title).toContain('Harbour stage LED wall');
    expect(shown.title).toContain('Level 2');
    expect(shown.body.startsWith('ACTION: Lower the LED wall to its bottom stop.')).toBe(true);
    expect(shown.body).toMatch(/gust 13\.0 m\/s/);
    expect(shown.actions).toEqual(['Acknowledge', 'Done: lowered']);
  }, 60_000);

  it('with the server down, opens from the phone and shows the kept snapshot as OLD DATA with its age', async () => {
    await page.reload();
    await page.waitForSelector('nav.tabs');
    await waitFor(() => page.evaluate(async () => Boolean(await (await caches.open('holdfast-data-v1')).match('/api/live'))), 15_000, 'the kept snapshot');
    await server!.stop();
    server = null;
    await page.reload();
    const banner = page.locator('.kept-banner');
    await banner.waitFor({ timeout: 20_000 });
    const words = (await banner.innerText()).replace(/\s+/g, ' ');
    expect(words).toMatch(/^OLD DATA — \S+.* old\./);
    expect(words).toContain('Nothing here is current');
    expect(await page.locator('.pill').innerText()).toMatch(/OLD copy/);
    // The kept board still names the structure, under the banner.
    expect(await page.locator('main').innerText()).toContain('Harbour stage LED wall');
    await screenshot(page, 'installable-app-old-data-phone');
    await page.setViewportSize(desktop);
    await screenshot(page, 'installable-app-old-data-desktop');
  }, 60_000);
});
