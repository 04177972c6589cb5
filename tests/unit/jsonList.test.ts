/**
 * server/http/jsonList.ts: a list answered a chunk at a time is the same JSON text as the one
 * string `c.json` writes. The reference is the platform's JSON.stringify (ECMA-262, JSON.stringify:
 * an array element with no JSON form is written as null), over lists that cross the chunk size.
 */
import { Hono } from 'hono';
import { describe, expect, it } from 'vitest';
import { jsonList } from '../../server/http/jsonList.ts';

async function both(items: unknown[], toJson: (item: unknown) => unknown): Promise<{ streamed: string; whole: string; type: string | null; chunks: number }> {
  const app = new Hono();
  app.get('/streamed', (c) => jsonList(c, 'structures', items, toJson));
  app.get('/whole', (c) => c.json({ structures: items.map(toJson) }));
  const streamedResponse = await app.request('/streamed');
  let chunks = 0;
  let streamed = '';
  const decoder = new TextDecoder();
  for await (const part of streamedResponse.body as unknown as AsyncIterable<Uint8Array>) {
    chunks++;
    streamed += decoder.decode(part, { stream: true });
  }
  streamed += decoder.decode();
  const whole = await (await app.request('/whole')).text();
  return { streamed, whole, type: streamedResponse.headers.get('content-type'), chunks };
}

describe('a list answered a chunk at a time', () => {
  it('is the same JSON as one c.json, empty or one item', async () => {
    for (const items of [[], [{ id: 1, name: 'Sponsor arch' }]]) {
      const r = await both(items, (x) => x);
      expect(r.streamed).toBe(r.whole);
      expect(JSON.parse(r.streamed)).toEqual({ structures: items });
      expect(r.type).toMatch(/^application\/json/);
    }
  });

  it('is the same JSON over 2,000 items in several chunks, with non-ASCII text and items that have no JSON form', async () => {
    const items = Array.from({ length: 2000 }, (_, i) => ({ id: i + 1, name: `Bühne ${i} — “east” · 3×6 m`, margin: i % 3 === 0 ? null : 1 + i / 1000, record: { kind: 'banner', widthM: 6, heightM: 2.4, holes: [0.1, 0.2] } }));
    const r = await both(items, (x) => ((x as { id: number }).id % 250 === 0 ? undefined : { ...(x as object), live: { level: 2 } }));
    expect(r.chunks).toBeGreaterThan(3);
    expect(r.streamed).toBe(r.whole);
    const parsed = JSON.parse(r.streamed) as { structures: unknown[] };
    expect(parsed.structures).toHaveLength(2000);
    expect(parsed.structures[249]).toBeNull();
  });
});
