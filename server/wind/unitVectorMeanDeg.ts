/**
 * Mean wind direction as the unit-vector mean (WMO-No. 8 Part I ch. 5; design.md §2.2): each
 * direction is a unit vector, the vectors are averaged, the mean direction is the angle of the
 * result. An arithmetic mean of degrees fails across north (350° and 10° would give 180°); the
 * vector mean gives 0°.
 *
 * Directions are degrees clockwise from north that the wind blows FROM; sin goes with east,
 * cos with north, so atan2(Σ sin, Σ cos) is again a compass bearing.
 */

/**
 * Below this resultant length (as a fraction of the total weight) the directions cancel out and
 * there is no meaningful mean direction (e.g. equal time from 90° and 270°).
 */
export const minResultantFraction = 1e-9;

const radPerDeg = Math.PI / 180;

/**
 * Mean direction from the weighted sums Σ w·sin θ, Σ w·cos θ and Σ w, in degrees [0, 360), or
 * null when there is nothing to average or the directions cancel out.
 *
 * @example
 * unitVectorMeanDegFromSums(sin(350°) + sin(10°), cos(350°) + cos(10°), 2) // → 0
 */
export function unitVectorMeanDegFromSums(sinSum: number, cosSum: number, weightSum: number): number | null {
  if (!(weightSum > 0)) return null;
  const resultant = Math.hypot(sinSum, cosSum);
  if (!(resultant > minResultantFraction * weightSum)) return null;
  const deg = Math.atan2(sinSum, cosSum) / radPerDeg;
  return compassDeg(deg);
}

/**
 * Unit-vector mean of directions in degrees, optionally weighted (e.g. by the time each sample
 * stands for); null when empty or when the directions cancel out.
 *
 * @example
 * unitVectorMeanDeg([350, 10]) // → 0, not 180
 */
export function unitVectorMeanDeg(directionsDeg: readonly number[], weights?: readonly number[]): number | null {
  if (weights !== undefined && weights.length !== directionsDeg.length) {
    throw new RangeError(`unitVectorMeanDeg: weights must have one entry per direction (${directionsDeg.length}), got ${weights.length}`);
  }
  let sinSum = 0;
  let cosSum = 0;
  let weightSum = 0;
  for (let i = 0; i < directionsDeg.length; i++) {
    const deg = directionsDeg[i]!;
    const w = weights === undefined ? 1 : weights[i]!;
    if (!Number.isFinite(deg)) throw new RangeError(`unitVectorMeanDeg: directionsDeg[${i}] must be finite, got ${deg}`);
    if (!Number.isFinite(w) || w < 0) throw new RangeError(`unitVectorMeanDeg: weights[${i}] must be finite and ≥ 0, got ${w}`);
    sinSum += w * Math.sin(deg * radPerDeg);
    cosSum += w * Math.cos(deg * radPerDeg);
    weightSum += w;
  }
  return unitVectorMeanDegFromSums(sinSum, cosSum, weightSum);
}

/**
 * An angle in degrees brought into [0, 360). Values within 1e-9° below 360 become 0, so that
 * rounding in atan2 (e.g. −3e-14° for 350° and 10°) reads as north, not 359.99999…
 */
export function compassDeg(deg: number): number {
  let d = deg % 360;
  if (d < 0) d += 360;
  if (d >= 360 - 1e-9 || d < 1e-9) return 0;
  return d;
}
