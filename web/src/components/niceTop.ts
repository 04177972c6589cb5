/**
 * The round top of a chart scale that starts at 0 (the board's trend line): the smallest of
 * 1, 1.5, 2, 2.5, 3, 4, 5, 6, 8 × 10^k at or above `max`, so the half-way grid line is a round
 * number too; at most half as much again as `max`.
 */
export function niceTop(max: number): number {
  if (!Number.isFinite(max) || max <= 0) return 1;
  const exp = Math.floor(Math.log10(max));
  for (const base of [1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) {
    const top = base * 10 ** exp;
    if (top >= max - 1e-9) return top;
  }
  return 10 ** (exp + 1);
}
