/**
 * What the browser tests share: the built web app (built here when missing or older than its
 * sources), Chromium (Debian's, at /usr/bin/chromium), a server started in-process on ephemeral
 * ports with a fresh data folder, an API client that signs in like a browser, and axe-core run
 * inside the page.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { createLogger, type Logger } from '../../server/log.ts';
import { startTestServer, type TestServer } from '../helpers/testServer.ts';

export const chromiumPath = '/usr/bin/chromium';
export const screenshotDir = path.resolve('tests/artifacts/screenshots');
export const phone = { width: 390, height: 844 };
export const desktop = { width: 1366, height: 900 };

const distIndex = path.resolve('web/dist/index.html');

function newestMtimeMs(entry: string): number {
  const stat = fs.statSync(entry);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return Math.max(stat.mtimeMs, ...fs.readdirSync(entry).map((name) => newestMtimeMs(path.join(entry, name))));
}

function webIsStale(): boolean {
  const sources = ['web/src', 'web/index.html', 'web/public', 'vite.config.ts'].map((p) => path.resolve(p)).filter((p) => fs.existsSync(p));
  const newest = Math.max(...sources.map(newestMtimeMs));
  return !fs.existsSync(distIndex) || fs.statSync(distIndex).mtimeMs < newest;
}

const sleepMs = (ms: number): void => void Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);

/**
 * Builds web/dist when it is missing or older than web/src, web/index.html or vite.config.ts.
 * Test files run in parallel processes: a lock file lets one build while the others wait, so no
 * server ever serves a half-emptied dist folder.
 */
export function ensureWebBuilt(): void {
  if (!webIsStale()) return;
  const lock = path.resolve('web/.build.lock');
  const deadline = Date.now() + 120_000;
  for (;;) {
    try {
      fs.writeFileSync(lock, String(process.pid), { flag: 'wx' });
      break;
    } catch {
      // Another test process is building: wait for it, then check again.
      if (Date.now() > deadline) throw new Error(`web build lock ${lock} held for 2 minutes: remove it if no build is running`);
      sleepMs(200);
      if (!fs.existsSync(lock) && !webIsStale()) return;
    }
  }
  try {
    if (webIsStale()) execFileSync(process.execPath, [path.resolve('node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'], { stdio: 'inherit' });
  } finally {
    fs.rmSync(lock, { force: true });
  }
}

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export type E2eServer = TestServer;

/** A fresh server serving the built web app; without `admin` nobody exists yet and the server logs a one-time setup code. */
export function startE2eServer(admin: { username: string; password: string } | null, log: Logger = createLogger('warn')): Promise<E2eServer> {
  return startTestServer({ ADMIN_USERNAME: admin?.username ?? '', ADMIN_PASSWORD: admin?.password ?? '' }, { staticRoot: path.resolve('web/dist') }, log);
}

/** Signs in like a browser (session cookie, CSRF header on changes) for set-up and cross-checks. */
export class Api {
  private cookie = '';
  private csrf = '';
  constructor(private readonly baseUrl: string) {}

  async signIn(username: string, password: string): Promise<void> {
    const res = await fetch(`${this.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username, password }) });
    if (!res.ok) throw new Error(`sign-in as ${username} failed: ${res.status} ${await res.text()}`);
    this.cookie = (res.headers.get('set-cookie') ?? '').split(';')[0]!;
    this.csrf = ((await res.json()) as { csrfToken: string }).csrfToken;
  }

  async call<T>(method: string, pathname: string, body?: unknown): Promise<T> {
    const headers: Record<string, string> = { cookie: this.cookie };
    if (method !== 'GET') headers['x-csrf-token'] = this.csrf;
    if (body !== undefined) headers['content-type'] = 'application/json';
    const res = await fetch(`${this.baseUrl}${pathname}`, { method, headers, ...(body === undefined ? {} : { body: JSON.stringify(body) }) });
    const text = await res.text();
    if (!res.ok) throw new Error(`${method} ${pathname}: ${res.status} ${text}`);
    return JSON.parse(text) as T;
  }
}

export async function signInThroughForm(page: Page, baseUrl: string, username: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/`);
  await page.fill('#si-user', username);
  await page.fill('#si-pass', password);
  await page.click('button[type=submit]');
  await page.waitForSelector('nav.tabs');
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: Array<{ target: string[]; failureSummary?: string }>;
}

let axeSource: string | null = null;

/**
 * axe-core's violations of impact serious or critical on the page as it is now. axe is evaluated
 * through the DevTools protocol rather than added as a <script>: the app's CSP (script-src 'self')
 * rightly refuses inline scripts, and the tests keep that CSP on.
 */
export async function seriousAxeViolations(page: Page): Promise<AxeViolation[]> {
  const loaded = await page.evaluate('typeof window.axe === "object"');
  if (!loaded) await page.evaluate((axeSource ??= fs.readFileSync(path.resolve('node_modules/axe-core/axe.min.js'), 'utf8')));
  const violations = (await page.evaluate('window.axe.run(document, { resultTypes: ["violations"] }).then((r) => r.violations)')) as AxeViolation[];
  return violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

export function describeViolations(violations: AxeViolation[]): string {
  return violations.map((v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.slice(0, 3).map((n) => n.target.join(' ')).join(' | ')}`).join('\n');
}

export async function screenshot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

/** Whether Chromium is installed where the tests look for it. */
export const haveChromium = fs.existsSync(chromiumPath);
/** Skip the browser tests on a machine without Chromium — never in CI, where they are required. */
export const skipBrowserTests = !haveChromium && !process.env.CI;
if (skipBrowserTests) console.warn(`browser tests skipped: Chromium is not at ${chromiumPath} (apt-get install chromium); they are required when CI is set`);

/** Throws (in CI) when the browser is missing, with what to install. */
export function requireChromium(): void {
  if (!haveChromium) throw new Error(`Chromium is missing at ${chromiumPath}: install it (apt-get install chromium). CI requires the browser tests.`);
}
