/**
 * The chance that the gust reaches a level within a time, and the expected peak gust in that time,
 * from the 10-minute mean U, the standard deviation σ and the up-crossing rate ν of the 3-second
 * mean speed (design.md 2.7):
 *
 *   N = ν T exp(−(x − U)² / (2σ²))   expected up-crossings of x in T (S. O. Rice, "Mathematical
 *                                     analysis of random noise", Bell System Technical Journal
 *                                     23-24, 1944-45)
 *   P = 1 − e^(−N)                    up-crossings taken as independent (a Poisson count); P = 1
 *                                     when x ≤ U (the level is at or below the mean wind)
 *   peak = U + g σ                    g Davenport's peak factor (peakFactor.ts; Davenport, Proc.
 *                                     ICE 28, 1964)
 *
 * From memory (standard results, see ../shared/references.md). The fluctuation is taken as a
 * stationary Gaussian process: the figures are estimates for the next T if the wind keeps its
 * present mean and gustiness. Where up-crossings come in clusters (moderate levels, long T,
 * slow swings of the mean) the Poisson count over-states the chance: the estimate errs high, which
 * is the safe side; a rising mean wind is not in it (see meanTrend.ts for that).
 */
import { maxPlausibleSpeedMps } from '../engine/limits.ts';
import { assertAbove, assertInRange } from '../engine/rangeCheck.ts';
import { peakFactor } from './peakFactor.ts';

/** The speeds and rate the chance is figured from, all for the same height. */
export interface GustProcess {
  /** 10-minute mean U, m/s (0–1000). */
  meanMps: number;
  /** Standard deviation σ of the 3-s mean speed about U, m/s (> 0, ≤ 1000). */
  sigmaMps: number;
  /** Up-crossing rate ν of the mean (zero up-crossings of the fluctuation per second), Hz (> 0, ≤ 100). */
  upcrossingRateHz: number;
}

export interface ChanceInput extends GustProcess {
  /** The level x the gust is to reach, m/s (≥ 0, finite). */
  thresholdMps: number;
  /** The time T ahead, s (> 0, ≤ 86 400). */
  durationS: number;
}

export interface Chance {
  /** P, 0–1. */
  probability: number;
  /** N, the expected number of up-crossings of x in T (given for any x, also x ≤ U). */
  expectedUpcrossings: number;
  /** U + g σ, m/s. */
  expectedPeakGustMps: number;
  /** g, for the inputs behind the figure. */
  peakFactor: number;
}

/** Longest time ahead accepted: a day (a stationary wind for longer is no estimate at all). */
export const maxDurationS = 86_400;
/** Highest up-crossing rate accepted, Hz: far above any 3-s mean speed's (sanity bound). */
export const maxUpcrossingRateHz = 100;
/** Highest measured speed accepted, m/s: the plausibility bound of design.md 3 (engine/limits.ts). */
export const maxSpeedMps = maxPlausibleSpeedMps;
/**
 * Highest U or σ accepted here, m/s: a sanity bound above the sensors' 120 m/s, because a height
 * factor may raise a measured figure (structureGustProcess.ts); anything beyond is an error.
 */
export const maxModelSpeedMps = 1000;

function checkProcess(caller: string, { meanMps, sigmaMps, upcrossingRateHz }: GustProcess): void {
  assertInRange(caller, 'meanMps', meanMps, 0, maxModelSpeedMps, 'm/s');
  assertAbove(caller, 'sigmaMps', sigmaMps, 0, maxModelSpeedMps, 'm/s');
  assertAbove(caller, 'upcrossingRateHz', upcrossingRateHz, 0, maxUpcrossingRateHz, 'Hz');
}

/**
 * The expected peak gust over `durationS`: U + g(νT) σ.
 *
 * @example expectedPeakGustMps({ meanMps: 10, sigmaMps: 2, upcrossingRateHz: 0.2 }, 600) // ≈ 16.56
 */
export function expectedPeakGustMps(wind: GustProcess, durationS: number): number {
  checkProcess('expectedPeakGustMps', wind);
  assertAbove('expectedPeakGustMps', 'durationS', durationS, 0, maxDurationS, 's');
  return wind.meanMps + peakFactor(wind.upcrossingRateHz * durationS) * wind.sigmaMps;
}

/**
 * The chance that the gust reaches `thresholdMps` within `durationS`, with the expected number of
 * up-crossings and the expected peak gust in that time.
 *
 * @example chanceOfReaching({ meanMps: 10, sigmaMps: 2, upcrossingRateHz: 0.2, thresholdMps: 16, durationS: 600 })
 *   // { probability ≈ 0.736, expectedUpcrossings ≈ 1.333, expectedPeakGustMps ≈ 16.56, peakFactor ≈ 3.281 }
 */
export function chanceOfReaching(input: ChanceInput): Chance {
  const caller = 'chanceOfReaching';
  checkProcess(caller, input);
  assertInRange(caller, 'thresholdMps', input.thresholdMps, 0, Number.MAX_VALUE, 'm/s');
  assertAbove(caller, 'durationS', input.durationS, 0, maxDurationS, 's');
  const { meanMps, sigmaMps, upcrossingRateHz, thresholdMps, durationS } = input;
  const meanUpcrossings = upcrossingRateHz * durationS;
  const standardised = (thresholdMps - meanMps) / sigmaMps;
  const expectedUpcrossings = meanUpcrossings * Math.exp(-(standardised * standardised) / 2);
  // −expm1(−N) keeps the digits of a small chance that 1 − exp(−N) would lose.
  const probability = thresholdMps <= meanMps ? 1 : -Math.expm1(-expectedUpcrossings);
  const g = peakFactor(meanUpcrossings);
  return { probability, expectedUpcrossings, expectedPeakGustMps: meanMps + g * sigmaMps, peakFactor: g };
}
