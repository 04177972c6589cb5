/**
 * Davenport's peak factor: the expected largest value of a stationary Gaussian process over a
 * time T lies g standard deviations above its mean, with
 *
 *   g = √(2 ln νT) + γ / √(2 ln νT),   γ = 0.5772 (Euler's constant),
 *
 * ν the process's up-crossing rate of its mean (A. G. Davenport, "Note on the distribution of the
 * largest value of a random function with application to gust loading", Proc. ICE 28, 1964; the
 * up-crossing count from S. O. Rice, "Mathematical analysis of random noise", Bell System
 * Technical Journal 23-24, 1944-45). From memory: standard results, listed in
 * ../shared/references.md as not retrieved.
 *
 * The formula is asymptotic (many up-crossings in T). It has no meaning for ln νT ≤ 0 (fewer than
 * one expected up-crossing), turns back up below νT ≈ 1.33 (g → ∞ as νT → 1), and for a few
 * up-crossings reads low: a simulated broadband Gaussian process reaches 1.85 σ on average at
 * νT = e, where the formula gives 1.82 (tests/unit/foresight.test.ts). Our rule (no source): νT is
 * taken as at least 4, so g is never below g(4) = √(2 ln 4) + 0.5772/√(2 ln 4) ≈ 2.012. That keeps
 * g non-decreasing in T and, for shorter times, above the simulated average largest value
 * (1.94 σ at νT = 3.5, less below): conservative.
 */
import { assertInRange } from '../engine/rangeCheck.ts';

/** Euler's constant γ = 0.5772… to four places, as in the formula quoted above. */
export const eulerGamma = 0.5772;

/** The smallest νT the peak factor is evaluated at (see the rule above). */
export const peakFactorMinimumUpcrossings = 4;

/**
 * The peak factor g for `expectedMeanUpcrossings` = νT, the expected number of up-crossings of
 * the mean in the time considered (≥ 0; below 4 it is taken as 4).
 *
 * @example peakFactor(120) // ≈ 3.281 (ν = 0.2 Hz over 10 minutes)
 */
export function peakFactor(expectedMeanUpcrossings: number): number {
  assertInRange('peakFactor', 'expectedMeanUpcrossings', expectedMeanUpcrossings, 0, Number.MAX_VALUE);
  const root = Math.sqrt(2 * Math.log(Math.max(expectedMeanUpcrossings, peakFactorMinimumUpcrossings)));
  return root + eulerGamma / root;
}
