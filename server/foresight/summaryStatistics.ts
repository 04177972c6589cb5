/**
 * U, σ and ν for a sensor that sends ready summaries (a 10-minute mean and the gust over the same
 * time) instead of samples: the gust is taken as the expected peak of the period, gust = U + g σ
 * with Davenport's peak factor g (peakFactor.ts; Davenport, Proc. ICE 28, 1964), so
 *
 *   σ = (gust − U) / g(ν T₀),   T₀ the period the gust was taken over (600 s),
 *
 * and ν is a stated default: 0.1 Hz, the low end of the 0.1–0.3 Hz that ../shared/references.md
 * gives for 10-minute peak factors of 3–4 — from memory, not retrieved. The low end is the safe
 * one: with σ found from the same gust, a lower ν gives the larger chance of any level above that
 * gust and the higher expected peak over a longer time (g(νT)/g(νT₀) falls as ν rises; shown in
 * tests/unit/foresight.test.ts).
 */
import { assertAbove, assertInRange } from '../engine/rangeCheck.ts';
import { maxSpeedMps, maxUpcrossingRateHz } from './chance.ts';
import { peakFactor } from './peakFactor.ts';
import { minimumSigmaMps, type WindStatistics } from './windowStatistics.ts';

/** ν for a summary-only sensor, Hz: from memory (see above). */
export const defaultUpcrossingRateHz = 0.1;
/** The period a summary's gust is the peak of, s: the 10-minute mean's (WMO-No. 8). */
export const defaultGustPeriodS = 600;

export interface SummaryInput {
  /** The summary's 10-minute mean U, m/s (0–120). */
  meanMps: number;
  /** The summary's gust (highest 3-s mean of the period), m/s (0–120). */
  gustMps: number;
  /** The period the gust is the peak of, s (default 600; > 0, ≤ 86 400). */
  gustPeriodS?: number;
  /** ν, Hz (default 0.1). */
  upcrossingRateHz?: number;
}

/**
 * σ from the gust factor, ν the default; unknown ('gust-not-above-mean') when the gust is not
 * above the mean, since no σ follows from it (never taken as a steady wind), and
 * ('no-fluctuation') when σ comes out below 0.05 m/s.
 *
 * @example summaryStatistics({ meanMps: 10, gustMps: 15 }) // σ ≈ 1.632 m/s, ν 0.1 Hz
 */
export function summaryStatistics(input: SummaryInput): WindStatistics {
  const caller = 'summaryStatistics';
  const gustPeriodS = input.gustPeriodS ?? defaultGustPeriodS;
  const upcrossingRateHz = input.upcrossingRateHz ?? defaultUpcrossingRateHz;
  assertInRange(caller, 'meanMps', input.meanMps, 0, maxSpeedMps, 'm/s');
  assertInRange(caller, 'gustMps', input.gustMps, 0, maxSpeedMps, 'm/s');
  assertAbove(caller, 'gustPeriodS', gustPeriodS, 0, 86_400, 's');
  assertAbove(caller, 'upcrossingRateHz', upcrossingRateHz, 0, maxUpcrossingRateHz, 'Hz');
  if (!(input.gustMps > input.meanMps)) {
    return { status: 'unknown', source: 'summary', reason: 'gust-not-above-mean', sampleCount: null, observedS: null };
  }
  const sigmaMps = (input.gustMps - input.meanMps) / peakFactor(upcrossingRateHz * gustPeriodS);
  // The same floor as for samples (windowStatistics.ts): a gust a hair above the mean is no measure of gustiness.
  if (sigmaMps < minimumSigmaMps) return { status: 'unknown', source: 'summary', reason: 'no-fluctuation', sampleCount: null, observedS: null };
  return {
    status: 'known',
    source: 'summary',
    meanMps: input.meanMps,
    sigmaMps,
    upcrossingRateHz,
    upcrossingRateSource: input.upcrossingRateHz === undefined ? 'default' : 'given',
    peakMps: input.gustMps,
    sampleCount: null,
    observedS: null,
    upcrossings: null,
  };
}
