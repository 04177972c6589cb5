/**
 * The Theil–Sen line: slope the median of the slopes of all pairs of points, intercept the median
 * of y − slope·x (H. Theil 1950; P. K. Sen, "Estimates of the regression coefficient based on
 * Kendall's tau", JASA 63, 1968 — standard, see ../shared/references.md; the title and the 29 %
 * breakdown point from memory). A point far off the line moves only the slopes of its own pairs,
 * so up to about 29 % of wild points leave it standing, where least squares follows every one.
 */
import { assertInRange } from '../engine/rangeCheck.ts';

export interface TheilSenLine {
  /** Median pairwise slope, y units per x unit. */
  slope: number;
  /** Median of y − slope·x: the line's y at x = 0. */
  intercept: number;
  /** Pairs with distinct x the slope is the median of. */
  pairCount: number;
}

/** The median of `values` (sorted in place; the mean of the two middle values for an even count). */
function medianInPlace(values: Float64Array): number {
  values.sort();
  const middle = values.length >> 1;
  return values.length % 2 === 1 ? values[middle]! : (values[middle - 1]! + values[middle]!) / 2;
}

/** Most points accepted: the pairs grow as n²/2 (1,000 points are 499,500 pairs). */
export const maxTheilSenPoints = 1000;

/**
 * The Theil–Sen line through (x[i], y[i]). Pairs with equal x are left out; at least one pair
 * with distinct x is needed.
 *
 * @example theilSenLine([0, 1, 2, 3, 4], [1, 3, 2, 5, 4]) // { slope: 0.875, intercept: 1, pairCount: 10 }
 */
export function theilSenLine(x: ArrayLike<number>, y: ArrayLike<number>): TheilSenLine {
  const caller = 'theilSenLine';
  if (x.length !== y.length) throw new RangeError(`${caller}: x and y must have the same length, got ${x.length} and ${y.length}`);
  assertInRange(caller, 'x.length', x.length, 2, maxTheilSenPoints);
  for (let i = 0; i < x.length; i++) {
    assertInRange(caller, `x[${i}]`, x[i]!, -Number.MAX_VALUE, Number.MAX_VALUE);
    assertInRange(caller, `y[${i}]`, y[i]!, -Number.MAX_VALUE, Number.MAX_VALUE);
  }
  const slopes = new Float64Array((x.length * (x.length - 1)) / 2);
  let pairCount = 0;
  for (let i = 0; i < x.length; i++) {
    for (let j = i + 1; j < x.length; j++) {
      const dx = x[j]! - x[i]!;
      if (dx !== 0) slopes[pairCount++] = (y[j]! - y[i]!) / dx;
    }
  }
  if (pairCount === 0) throw new RangeError(`${caller}: x needs at least two distinct values, got ${x.length} equal ones`);
  const slope = medianInPlace(slopes.subarray(0, pairCount));
  const offsets = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) offsets[i] = y[i]! - slope * x[i]!;
  return { slope, intercept: medianInPlace(offsets), pairCount };
}
