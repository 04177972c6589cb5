/**
 * Where the figures' labels go so that none covers another: text widths measured with the page's
 * own font (a canvas 2D context, the same glyphs the SVG draws), labels along one line spread
 * apart, and labels around points put at the first free place near their point.
 *
 * All sizes are in the SVG's user units: a text of font-size 15 in the viewBox is as wide, in
 * user units, as the canvas measures a 15 px text in pixels (the SVG scales both the same way).
 */

/** A box by its top-left corner. */
export interface Box {
  x: number;
  y: number;
  width: number;
  height: number;
}

let measure: CanvasRenderingContext2D | null | undefined;
let family = '';

/** Width of `text` at `fontSize`, in the same units (measured; estimated without a canvas). */
export function textWidth(text: string, fontSize: number, bold = false): number {
  if (measure === undefined) {
    try {
      measure = typeof document === 'undefined' ? null : document.createElement('canvas').getContext('2d');
      family = typeof document === 'undefined' ? '' : getComputedStyle(document.body).fontFamily;
    } catch {
      // No canvas (an old browser, a test without a DOM): fall back to the estimate below.
      measure = null;
    }
  }
  if (measure) {
    measure.font = `${bold ? 700 : 400} ${fontSize}px ${family || 'sans-serif'}`;
    // A few per cent over: canvas and SVG may hint glyphs a little differently.
    return measure.measureText(text).width * 1.04 + 1;
  }
  return text.length * fontSize * (bold ? 0.62 : 0.57);
}

export function overlaps(a: Box, b: Box, gap = 0): boolean {
  return a.x < b.x + b.width + gap && b.x < a.x + a.width + gap && a.y < b.y + b.height + gap && b.y < a.y + a.height + gap;
}

function inside(box: Box, bounds: Box): boolean {
  return box.x >= bounds.x && box.y >= bounds.y && box.x + box.width <= bounds.x + bounds.width && box.y + box.height <= bounds.y + bounds.height;
}

function overlapArea(a: Box, b: Box): number {
  const w = Math.min(a.x + a.width, b.x + b.width) - Math.max(a.x, b.x);
  const h = Math.min(a.y + a.height, b.y + b.height) - Math.max(a.y, b.y);
  return w > 0 && h > 0 ? w * h : 0;
}

/**
 * Centres for items of the given sizes along one line, each as near its wanted centre as the
 * others allow, in order, at least `gap` apart, within [min, max] when they fit (`fits` false
 * when they do not: the caller then uses another row).
 */
export function spreadAlong(items: Array<{ centre: number; size: number }>, min: number, max: number, gap: number): { centres: number[]; fits: boolean } {
  const order = items.map((_, i) => i).sort((a, b) => items[a]!.centre - items[b]!.centre);
  const centres = items.map((item) => item.centre);
  let end = -Infinity;
  for (const i of order) {
    const half = items[i]!.size / 2;
    const lowest = Math.max(min + half, end === -Infinity ? -Infinity : end + gap + half);
    centres[i] = Math.max(centres[i]!, lowest);
    end = centres[i]! + half;
  }
  let start = Infinity;
  for (const i of [...order].reverse()) {
    const half = items[i]!.size / 2;
    const highest = Math.min(max - half, start === Infinity ? Infinity : start - gap - half);
    centres[i] = Math.min(centres[i]!, highest);
    start = centres[i]! - half;
  }
  const total = items.reduce((sum, item) => sum + item.size, 0) + gap * Math.max(0, items.length - 1);
  return { centres, fits: total <= max - min + 1e-9 };
}

/** A label to put near a point. */
export interface PointLabel {
  x: number;
  y: number;
  width: number;
  height: number;
  /** Distance from the point to the label's nearest side at the first try. */
  offset: number;
}

/** Where a label went: its box, and whether it is far enough from its point to need a leader line. */
export interface PlacedLabel extends Box {
  leader: boolean;
}

/**
 * Puts each label (in the order given: most important first) at the best of rings of places
 * around its point (right, left, above, below, the diagonals, then further out) within `bounds`.
 * Covering a hard obstacle (a text, a mass, the wind arrow) or a label already placed costs most;
 * covering a soft one (a line a label may sit on, with its background) costs a little; each ring
 * further out costs as much as a small soft overlap, so a label stays by its point when it can.
 * Placed labels become hard obstacles for the next.
 */
export function placeLabels(labels: PointLabel[], obstacles: Box[], bounds: Box, gap = 2, soft: Box[] = []): PlacedLabel[] {
  const taken = [...obstacles];
  const placed: PlacedLabel[] = [];
  const grown = (other: Box): Box => ({ x: other.x - gap, y: other.y - gap, width: other.width + 2 * gap, height: other.height + 2 * gap });
  for (const label of labels) {
    const { x, y, width: w, height: h } = label;
    let best: Box | null = null;
    let bestCost = Infinity;
    let bestRing = 0;
    for (let ring = 0; ring < 6; ring++) {
      const d = label.offset + ring * (h + gap);
      const tries: Box[] = [
        { x: x + d, y: y - h / 2, width: w, height: h },
        { x: x - d - w, y: y - h / 2, width: w, height: h },
        { x: x - w / 2, y: y - d - h, width: w, height: h },
        { x: x - w / 2, y: y + d, width: w, height: h },
        // Diagonals a full offset out both ways: a point's own square obstacle keeps its corners.
        { x: x + d, y: y - d - h, width: w, height: h },
        { x: x - d - w, y: y - d - h, width: w, height: h },
        { x: x + d, y: y + d, width: w, height: h },
        { x: x - d - w, y: y + d, width: w, height: h },
      ];
      for (const box of tries) {
        if (!inside(box, bounds)) continue;
        let cost = ring * 12;
        for (const other of taken) if (overlaps(box, other, gap)) cost += 1000 + overlapArea(box, grown(other));
        for (const other of soft) if (overlaps(box, other, 0)) cost += 0.02 * overlapArea(box, other);
        if (cost < bestCost) {
          best = box;
          bestCost = cost;
          bestRing = ring;
        }
      }
    }
    // Nothing inside the bounds at all (a label wider than the figure): keep it right of its point, clamped.
    const box = best ?? { x: Math.min(Math.max(bounds.x, x + label.offset), bounds.x + bounds.width - w), y: Math.min(Math.max(bounds.y, y - h / 2), bounds.y + bounds.height - h), width: w, height: h };
    taken.push(box);
    placed.push({ ...box, leader: bestRing > 0 || best === null });
  }
  return placed;
}

/** The point of `box` nearest to (x, y): where a leader line from the point meets the label. */
export function nearestPoint(box: Box, x: number, y: number): { x: number; y: number } {
  return { x: Math.min(Math.max(x, box.x), box.x + box.width), y: Math.min(Math.max(y, box.y), box.y + box.height) };
}

/**
 * Like `spreadAlong`, but items that do not fit in one row go to more rows (alternating in order
 * along the line, so neighbours part), up to `maxRows`; past that they are kept within the bounds
 * even if they touch. Returns each item's centre and row.
 */
export function spreadInRows(items: Array<{ centre: number; size: number }>, min: number, max: number, gap: number, maxRows: number): { centres: number[]; rows: number[]; rowCount: number } {
  const order = items.map((_, i) => i).sort((a, b) => items[a]!.centre - items[b]!.centre);
  for (let rowCount = 1; rowCount <= Math.max(1, maxRows); rowCount++) {
    const rows = items.map(() => 0);
    order.forEach((item, rank) => (rows[item] = rank % rowCount));
    const centres = items.map((item) => item.centre);
    let fits = true;
    for (let row = 0; row < rowCount; row++) {
      const members = order.filter((i) => rows[i] === row);
      const spread = spreadAlong(
        members.map((i) => items[i]!),
        min,
        max,
        gap,
      );
      members.forEach((i, k) => (centres[i] = spread.centres[k]!));
      fits &&= spread.fits;
    }
    if (fits || rowCount === Math.max(1, maxRows)) {
      const clamped = centres.map((c, i) => Math.min(Math.max(c, min + items[i]!.size / 2), max - items[i]!.size / 2));
      return { centres: clamped, rows, rowCount };
    }
  }
  return { centres: items.map((item) => item.centre), rows: items.map(() => 0), rowCount: 1 };
}
