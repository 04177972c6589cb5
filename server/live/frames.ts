/**
 * Frames: the once-a-second, columnar form of the live stream's moving figures (each sensor's
 * wind, each structure's gust and margin), sized to what a phone on a festival's mobile network
 * can take (issue 13 item 8).
 *
 * A frame is `{"atMs", "columns": [...], "ago": [...], "rows": [[...], ...]}`: one row per
 * sensor or structure whose shown figures changed, its cells in the order of `columns`; a column
 * named in `ago` holds `atMs − value` (a time stamp as milliseconds before the frame), which is a
 * few characters instead of thirteen. Rows are serialized once, for every client.
 *
 * A frame has a budget of characters. Rows that do not fit wait for the next frame, the most
 * urgent first and none for ever: a row that has waited `overdueAfterMs` goes before every row
 * that has not, oldest first. Level changes and alerts never go through frames: they are their
 * own events, sent at once and never dropped. Common practice (not a published rule): spend a
 * slow link's bytes on what is closest to acting on, and bound how stale anything else can be.
 */

/**
 * One candidate row: its cells, how urgent it is (higher first), and since when it has waited.
 * The cells may be given as a function, called only for a row that goes into the frame: a site
 * of 1,000 structures can have every one waiting while a frame takes about 70.
 */
export interface FrameRow {
  cells: readonly unknown[] | (() => readonly unknown[]);
  urgency: number;
  waitingSinceMs: number;
}

export interface FrameSelection<K> {
  /** The frame's JSON text, or null when no row was chosen. */
  data: string | null;
  /** The keys whose rows are in the frame. */
  sent: K[];
  /** Characters of the rows that are in the frame. */
  rowChars: number;
}

/** Rounds to `step` (0.01, 1 …) without binary tails such as 12.340000000000002 in the JSON. */
export function roundTo(value: number | null, decimals: number): number | null {
  if (value === null || !Number.isFinite(value)) return value === null ? null : value;
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
}

/**
 * Takes rows in order (overdue first by waiting time, then by urgency, then by waiting time)
 * while they fit `budgetChars`, and writes the frame. The first row that does not fit ends the
 * frame: no less urgent row goes past it. At least one row is always taken when there is any, so
 * a budget smaller than one row cannot stall the stream.
 */
export function selectFrame<K>(
  atMs: number,
  columns: readonly string[],
  agoColumns: readonly string[],
  candidates: ReadonlyMap<K, FrameRow>,
  budgetChars: number,
  overdueAfterMs: number,
): FrameSelection<K> {
  if (candidates.size === 0) return { data: null, sent: [], rowChars: 0 };
  const order = [...candidates.entries()].sort(([, a], [, b]) => {
    const aOver = atMs - a.waitingSinceMs >= overdueAfterMs;
    const bOver = atMs - b.waitingSinceMs >= overdueAfterMs;
    if (aOver !== bOver) return aOver ? -1 : 1;
    if (aOver) return a.waitingSinceMs - b.waitingSinceMs;
    if (a.urgency !== b.urgency) return b.urgency - a.urgency;
    return a.waitingSinceMs - b.waitingSinceMs;
  });
  const rows: string[] = [];
  const sent: K[] = [];
  let rowChars = 0;
  for (const [key, row] of order) {
    const text = JSON.stringify(typeof row.cells === 'function' ? row.cells() : row.cells);
    if (rows.length > 0 && rowChars + text.length + 1 > budgetChars) break;
    rows.push(text);
    sent.push(key);
    rowChars += text.length + 1;
  }
  const data = `{"atMs":${atMs},"columns":${JSON.stringify(columns)},"ago":${JSON.stringify(agoColumns)},"rows":[${rows.join(',')}]}`;
  return { data, sent, rowChars };
}

/** A frame as sent (the JSON of `selectFrame`). */
export interface Frame {
  atMs: number;
  columns: string[];
  ago: string[];
  rows: unknown[][];
}

/** The frame's rows as objects keyed by column, with `ago` columns turned back into time stamps. */
export function frameRecords(frame: Frame): Array<Record<string, unknown>> {
  const ago = new Set(frame.ago.map((c) => frame.columns.indexOf(c)));
  return frame.rows.map((row) => {
    const record: Record<string, unknown> = {};
    row.forEach((cell, i) => {
      const column = frame.columns[i];
      if (column !== undefined) record[column] = ago.has(i) && typeof cell === 'number' ? frame.atMs - cell : cell;
    });
    return record;
  });
}
