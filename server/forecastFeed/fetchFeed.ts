/**
 * One request for the forecast feed: GET with a timeout over the whole exchange (headers and
 * body), a cap on the body's size (checked on the declared length and while reading), and the
 * body decoded as UTF-8. Never throws: every way it can go wrong is an answer in words.
 */

export type FeedFetch =
  | { ok: true; httpStatus: number; contentType: string | null; body: string; bytes: number }
  | { ok: false; httpStatus: number | null; error: string; bytes: number | null };

export interface FeedFetchOptions {
  timeoutMs: number;
  maxBytes: number;
  /** Aborts the request from outside (the server closing). */
  signal?: AbortSignal;
}

const sizeWords = (bytes: number): string => (bytes >= 1_048_576 ? `${Math.round((bytes / 1_048_576) * 10) / 10} MB` : `${Math.round(bytes / 1024)} kB`);
const secondsWords = (ms: number): string => (ms >= 1000 ? `${Math.round((ms / 1000) * 10) / 10} s` : `${ms} ms`);

/** An error in words, with its cause ("fetch failed: connect ECONNREFUSED 127.0.0.1:9"), never a stack. */
export function fetchErrorWords(err: unknown): string {
  if (err instanceof Error) {
    const cause = (err as { cause?: unknown }).cause;
    const causeText = cause instanceof Error ? cause.message : '';
    return (causeText && !err.message.includes(causeText) ? `${err.message}: ${causeText}` : err.message).slice(0, 300);
  }
  return String(err).slice(0, 300);
}

export async function fetchFeed(url: string, options: FeedFetchOptions): Promise<FeedFetch> {
  const controller = new AbortController();
  let timedOut = false;
  const timer = setTimeout(() => {
    timedOut = true;
    controller.abort();
  }, options.timeoutMs);
  timer.unref();
  const onOuterAbort = () => controller.abort();
  options.signal?.addEventListener('abort', onOuterAbort, { once: true });
  const abortedWords = () => (timedOut ? `timed out after ${secondsWords(options.timeoutMs)}` : 'stopped: the server is closing');
  let httpStatus: number | null = null;
  try {
    const res = await fetch(url, {
      signal: controller.signal,
      redirect: 'follow',
      headers: { accept: 'text/csv, application/json;q=0.9, text/plain;q=0.8, */*;q=0.1', 'user-agent': 'holdfast-forecast-feed' },
    });
    httpStatus = res.status;
    if (!res.ok) {
      await res.body?.cancel().catch(() => undefined);
      return { ok: false, httpStatus, error: `the feed answered HTTP ${res.status}${res.statusText ? ` (${res.statusText})` : ''}`, bytes: null };
    }
    const declared = Number(res.headers.get('content-length'));
    if (Number.isFinite(declared) && declared > options.maxBytes) {
      await res.body?.cancel().catch(() => undefined);
      return { ok: false, httpStatus, error: `the feed is ${sizeWords(declared)}, more than the ${sizeWords(options.maxBytes)} accepted`, bytes: declared };
    }
    const chunks: Uint8Array[] = [];
    let bytes = 0;
    if (res.body) {
      const reader = res.body.getReader();
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        bytes += value.byteLength;
        if (bytes > options.maxBytes) {
          await reader.cancel().catch(() => undefined);
          return { ok: false, httpStatus, error: `the feed is more than the ${sizeWords(options.maxBytes)} accepted`, bytes };
        }
        chunks.push(value);
      }
    }
    let body: string;
    try {
      body = new TextDecoder('utf-8', { fatal: true }).decode(Buffer.concat(chunks));
    } catch {
      return { ok: false, httpStatus, error: 'the feed is not UTF-8 text', bytes };
    }
    return { ok: true, httpStatus, contentType: res.headers.get('content-type'), body, bytes };
  } catch (err) {
    if (controller.signal.aborted) return { ok: false, httpStatus, error: abortedWords(), bytes: null };
    return { ok: false, httpStatus, error: fetchErrorWords(err), bytes: null };
  } finally {
    clearTimeout(timer);
    options.signal?.removeEventListener('abort', onOuterAbort);
  }
}
