/**
 * server/http/jsonList.ts: a list answered a chunk at a time is the same JSON text as the one
 * string `c.json` writes. The reference is the platform's JSON.stringify (ECMA-262, JSON.stringify:
 * an array element with no JSON form is written as null), over lists that cross the chunk size.
 */
import { Hono } from 'hono';
import { describe, expect, it } from 'vitest';
import { jsonList, jsonObject, jsonPieces } from '../../server/http/jsonList.ts';

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

describe("an object's JSON in pieces, its long list an item at a time (the live stream's snapshot)", () => {
  it('joins to JSON.stringify of the object, with properties before and after the list and ones with no JSON form', () => {
    const structures = Array.from({ length: 3000 }, (_, i) => ({ id: i, name: `Stand ${i} · “west” Ölbühne`, margin: i % 7 === 0 ? null : i / 3000, gone: undefined, at: new Date(1_700_000_000_000 + i) }));
    const value = { atMs: 1_764_000_000_000, site: { name: 'Riverside field' }, skipped: undefined, structures, fn: () => 1, alerts: [{ id: 1 }], system: null };
    const pieces = [...jsonPieces(value, 'structures')];
    expect(pieces.length).toBeGreaterThan(3);
    // No piece is much longer than the chunk size plus one item: the list never goes as one string.
    expect(Math.max(...pieces.map((p) => p.length))).toBeLessThan(64 * 1024 + 200);
    expect(pieces.join('')).toBe(JSON.stringify(value));
    expect(pieces.join('')).not.toContain('\n');
  });

  it('joins to JSON.stringify when the list is empty, missing or not a list', () => {
    for (const value of [{ structures: [], alerts: [] }, { alerts: [1] }, { structures: 'none', n: 2 }, {}]) {
      expect([...jsonPieces(value, 'structures')].join('')).toBe(JSON.stringify(value));
    }
  });
});

describe('an object answered a piece at a time (GET /api/live)', () => {
  it('is the same body and content type as one c.json', async () => {
    const value = { atMs: 1, site: { name: 'Riverside field' }, sensors: [{ key: 'north-mast' }], structures: Array.from({ length: 1500 }, (_, i) => ({ id: i, name: `Bühne ${i}`, margin: i / 1500 })), alerts: [] };
    const app = new Hono();
    app.get('/pieces', (c) => jsonObject(c, value, 'structures'));
    app.get('/whole', (c) => c.json(value));
    const pieces = await app.request('/pieces');
    const whole = await app.request('/whole');
    expect(await pieces.text()).toBe(await whole.text());
    expect(pieces.headers.get('content-type')).toBe(whole.headers.get('content-type'));
  });
});

