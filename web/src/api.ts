/**
 * Calls to the server. Every call carries the session cookie (same origin); every state-changing
 * call carries the CSRF token the session answer gave. A 401 anywhere means the session is gone:
 * the app is told once and shows the sign-in screen.
 */
import type { FieldIssue } from './types.ts';

let csrfToken = '';
let onSignedOut: (() => void) | null = null;

export function setCsrfToken(token: string): void {
  csrfToken = token;
}

export function whenSignedOut(handler: () => void): void {
  onSignedOut = handler;
}

/** A call made without api() (web/src/offline.ts) was answered 401: the session is gone. */
export function signedOutNow(): void {
  onSignedOut?.();
}

/** An answer other than 2xx: status, the server's message and its field issues (400). */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly issues: FieldIssue[] = [],
  ) {
    super(message);
  }
}

interface CallOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  /** A body sent as is (e.g. CSV text) with this content type. */
  raw?: { text: string; contentType: string };
  signal?: AbortSignal;
  /** Do not treat 401 as "signed out" (the sign-in call itself). */
  quiet401?: boolean;
}

export async function api<T>(path: string, options: CallOptions = {}): Promise<T> {
  const method = options.method ?? (options.body === undefined && options.raw === undefined ? 'GET' : 'POST');
  const headers: Record<string, string> = { Accept: 'application/json' };
  let body: string | undefined;
  if (options.raw) {
    headers['Content-Type'] = options.raw.contentType;
    body = options.raw.text;
  } else if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(options.body);
  }
  if (method !== 'GET' && csrfToken) headers['X-CSRF-Token'] = csrfToken;
  let res: Response;
  try {
    res = await fetch(path, { method, headers, body, credentials: 'same-origin', signal: options.signal });
  } catch (err) {
    if (err instanceof DOMException && err.name === 'AbortError') throw err;
    throw new ApiError(0, 'The server cannot be reached (no network or the server is down).');
  }
  const text = await res.text();
  let data: unknown = null;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = null;
    }
  }
  if (!res.ok) {
    const d = (data ?? {}) as { error?: string; issues?: FieldIssue[] };
    if (res.status === 401 && !options.quiet401) onSignedOut?.();
    throw new ApiError(res.status, d.error ?? `${res.status} ${res.statusText}`, d.issues ?? []);
  }
  return data as T;
}

/** A readable sentence for any failure, with the field issues listed. */
export function errorText(err: unknown): string {
  if (err instanceof ApiError) {
    const parts = err.issues.map((i) => (i.path ? `${i.path}: ${i.message}` : i.message));
    return parts.length > 0 ? `${err.message}: ${parts.join('; ')}` : err.message;
  }
  return err instanceof Error ? err.message : String(err);
}

/** Field issues keyed by path with a prefix removed ("record.widthM" → "widthM"). */
export function issuesByPath(issues: readonly FieldIssue[], prefix = ''): Map<string, string> {
  const out = new Map<string, string>();
  for (const issue of issues) {
    const path = prefix && issue.path.startsWith(prefix) ? issue.path.slice(prefix.length) : issue.path;
    out.set(path, out.has(path) ? `${out.get(path)}; ${issue.message}` : issue.message);
  }
  return out;
}
