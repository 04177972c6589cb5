/**
 * Starts the real server in-process for a test: a fresh data folder, ephemeral HTTP and MQTT
 * ports on 127.0.0.1, an administrator from configuration, and helpers to sign in and call the
 * API as a browser would (session cookie + CSRF header).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { configFromEnv } from '../../server/config.ts';
import { createLogger, type Logger } from '../../server/log.ts';
import { startServer, type RunningServer, type StartOptions } from '../../server/runtime.ts';

export const adminUsername = 'test-admin';
export const adminPassword = 'test-admin-password';

export interface TestServer {
  server: RunningServer;
  baseUrl: string;
  dataDir: string;
  stop(): Promise<void>;
}

/** `env` overrides the defaults below (an empty value unsets one: ADMIN_USERNAME: '' starts with nobody). */
export async function startTestServer(env: Record<string, string> = {}, options: StartOptions = {}, log: Logger = createLogger(process.env.TEST_LOG_LEVEL ?? 'silent')): Promise<TestServer> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-test-'));
  const config = configFromEnv({
    DATA_DIR: dataDir,
    PORT: '0',
    HOST: '127.0.0.1',
    MQTT_PORT: '0',
    MQTT_HOST: '127.0.0.1',
    ADMIN_USERNAME: adminUsername,
    ADMIN_PASSWORD: adminPassword,
    ...env,
  });
  const server = await startServer(config, log, { staticRoot: null, ...options });
  return {
    server,
    baseUrl: `http://127.0.0.1:${server.httpPort}`,
    dataDir,
    stop: async () => {
      await server.close();
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** A signed-in browser-like client: keeps the cookie, sends the CSRF token on changes. */
export class ApiClient {
  private cookie = '';
  csrfToken = '';

  constructor(readonly baseUrl: string) {}

  /** The session cookie (`name=value`) for clients that make their own requests. */
  get cookieHeader(): string {
    return this.cookie;
  }

  async signIn(username: string, password: string): Promise<Response> {
    const res = await fetch(`${this.baseUrl}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username, password }) });
    const setCookie = res.headers.get('set-cookie');
    if (setCookie) this.cookie = setCookie.split(';')[0]!;
    if (res.ok) this.csrfToken = ((await res.clone().json()) as { csrfToken: string }).csrfToken;
    return res;
  }

  async request(method: string, pathname: string, body?: unknown, headers: Record<string, string> = {}): Promise<Response> {
    const h: Record<string, string> = { ...headers };
    if (this.cookie) h.cookie = this.cookie;
    if (method !== 'GET' && this.csrfToken && !('x-csrf-token' in headers)) h['x-csrf-token'] = this.csrfToken;
    let payload: string | undefined;
    if (body !== undefined) {
      payload = typeof body === 'string' ? body : JSON.stringify(body);
      if (!h['content-type']) h['content-type'] = 'application/json';
    }
    return fetch(`${this.baseUrl}${pathname}`, { method, headers: h, ...(payload !== undefined ? { body: payload } : {}) });
  }

  async json<T = any>(method: string, pathname: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await this.request(method, pathname, body);
    const text = await res.text();
    return { status: res.status, body: (text ? JSON.parse(text) : null) as T };
  }
}

/** Waits until `check` returns a truthy value, polling every 20 ms; throws after `timeoutMs`. */
export async function waitFor<T>(check: () => T | Promise<T>, timeoutMs = 5_000, what = 'condition'): Promise<NonNullable<T>> {
  const start = Date.now();
  for (;;) {
    const value = await check();
    if (value) return value as NonNullable<T>;
    if (Date.now() - start > timeoutMs) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}
