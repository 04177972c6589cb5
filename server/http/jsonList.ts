/**
 * A long list answered as `{"<key>":[…]}` a few items at a time instead of as one string: each
 * item is turned into JSON when the socket takes the next chunk, so only a chunk's items and
 * text are alive at once. GET /api/structures with 1,000 structures (3 MB of JSON) took the
 * server's resident memory from 133 to 160 MB for a moment as one `c.json` (measured under
 * `npm run bench`); the peak of a process is what a small site computer has to have.
 *
 * The body is the same JSON text `c.json({ [key]: items.map(toJson) })` writes. Items are
 * turned into JSON as the chunks go, so a live value in them is read at that moment (a few
 * milliseconds apart across the list), not all at one instant.
 */
import type { Context } from 'hono';

/** Characters of JSON per chunk (our choice: a few socket writes' worth). */
const chunkChars = 64 * 1024;

export function jsonList<T>(c: Context, key: string, items: readonly T[], toJson: (item: T) => unknown): Response {
  return jsonResponse(c, jsonPieces({ [key]: items }, key, toJson as (item: unknown) => unknown));
}

/**
 * An object answered as JSON a piece at a time (`jsonPieces`), its long list at `listKey` an item
 * per step: GET /api/live, which every screen on site fetches again when the register changes.
 */
export function jsonObject(c: Context, value: Record<string, unknown>, listKey: string): Response {
  return jsonResponse(c, jsonPieces(value, listKey));
}

function jsonResponse(c: Context, pieces: Iterator<string>): Response {
  const encoder = new TextEncoder();
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      const next = pieces.next();
      if (next.done) controller.close();
      else controller.enqueue(encoder.encode(next.value));
    },
  });
  return c.body(body, 200, { 'content-type': 'application/json' });
}

/**
 * The JSON text of an object in pieces of about `chunkChars`, with the array at `listKey` written
 * an item at a time and every other property as JSON.stringify writes it: joined, the pieces are
 * `JSON.stringify(value)` (with `toJson`, of the value with the list's items mapped). For the
 * live stream's `snapshot` event and GET /api/live, whose 1,000 structures made one string of
 * about 3 MB and its encoded copy per screen (an instrumented `npm run bench` run saw the server
 * go from 133 to 148 MB resident as one screen connected; without instrumentation the difference
 * was within the runs' spread). The value is built first, so its figures are of one instant
 * however long the pieces take to go.
 */
export function* jsonPieces(value: Record<string, unknown>, listKey: string, toJson: (item: unknown) => unknown = (item) => item): Generator<string, void, undefined> {
  let piece = '{';
  let first = true;
  for (const [key, v] of Object.entries(value)) {
    if (key !== listKey || !Array.isArray(v)) {
      const json = JSON.stringify(v);
      // As JSON.stringify leaves out a property with no JSON form (undefined, a function).
      if (json === undefined) continue;
      piece += `${first ? '' : ','}${JSON.stringify(key)}:${json}`;
      first = false;
      continue;
    }
    piece += `${first ? '' : ','}${JSON.stringify(key)}:[`;
    first = false;
    for (let i = 0; i < v.length; i++) {
      if (i > 0) piece += ',';
      // As JSON.stringify writes an array element that has no JSON form.
      piece += JSON.stringify(toJson(v[i])) ?? 'null';
      if (piece.length >= chunkChars) {
        yield piece;
        piece = '';
      }
    }
    piece += ']';
  }
  yield `${piece}}`;
}
