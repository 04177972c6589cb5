/**
 * Foresight (design.md 2.7): from a sensor's last 10 minutes of 3-s mean speeds (or its summary),
 * the chance that the gust reaches a level within a time and the expected peak gust (Rice 1944-45;
 * Davenport 1964), and from the last hour of 10-minute means the trend and the time until the
 * expected peak reaches the next trigger (Theil–Sen). Pure: no Node, no database, no clock; time
 * comes in as epoch-ms arguments; out-of-range input throws a RangeError naming the argument, its
 * value and the allowed range. Every figure is an estimate; none replaces the measured gust.
 *
 * Typical use for one structure and level:
 *   const stats = windowStatistics(series, nowMs);            // or summaryStatistics({ meanMps, gustMps })
 *   if (stats.status === 'known') {
 *     const atStructure = structureGustProcess(stats, heightFactor);   // engine gustHeightFactor
 *     chanceOfReaching({ ...atStructure, thresholdMps: triggerGustMps, durationS: 1800 });
 *   }
 *   timeToLevel({ trend: meanTrend(means, nowMs), meanMps, gustFactor, triggerGustMps, heightFactor });
 */
export { peakFactor, peakFactorMinimumUpcrossings, eulerGamma } from './peakFactor.ts';
export {
  chanceOfReaching,
  expectedPeakGustMps,
  maxDurationS,
  maxUpcrossingRateHz,
  maxSpeedMps,
  maxModelSpeedMps,
  type GustProcess,
  type ChanceInput,
  type Chance,
} from './chance.ts';
export {
  windowStatistics,
  statisticsWindowMs,
  defaultMaxGapMs,
  minimumSamples,
  minimumObservedS,
  minimumUpcrossings,
  minimumSigmaMps,
  type SpeedSeries,
  type WindStatistics,
  type KnownWindStatistics,
  type UnknownWindStatistics,
  type UnknownReason,
  type StatisticsSource,
  type WindowStatisticsOptions,
} from './windowStatistics.ts';
export { summaryStatistics, defaultUpcrossingRateHz, defaultGustPeriodS, type SummaryInput } from './summaryStatistics.ts';
export { structureGustProcess } from './structureGustProcess.ts';
export { theilSenLine, maxTheilSenPoints, type TheilSenLine } from './theilSen.ts';
export {
  meanTrend,
  trendWindowMs,
  minimumTrendPoints,
  minimumTrendSpanS,
  flatSlopeMpsPerS,
  separatedPairMs,
  minimumSeparatedPairs,
  minimumRisingFraction,
  type MeanSeries,
  type MeanTrend,
  type TrendStatus,
} from './meanTrend.ts';
export { timeToLevel, type TimeToLevelInput, type TimeToLevel } from './timeToLevel.ts';
// Forecasts (design §2.7 and §2.8): a pasted or polled forecast table read and turned into each
// structure's predicted level hour by hour, in each configuration.
export {
  parseForecastTable,
  maxForecastRows,
  maxForecastProblems,
  type ForecastRow,
  type ForecastTable,
  type ForecastTableOptions,
  type ForecastTableProblem,
} from './parseForecastTable.ts';
export { parseForecastFeed, isJsonBody, type ForecastFeedFormat, type ForecastFeedRead } from './parseForecastFeed.ts';
export { forecastSpeedUnits, beaufortTopMps, speedCell, type ForecastSpeedUnit, type ForecastCellUnit } from './forecastSpeedUnit.ts';
export { dateOrders, type DateOrder } from './forecastDateTime.ts';
export {
  predictLevels,
  predictPlannedLevels,
  inlandGustFactor,
  type ChanceThreshold,
  type ForecastConfiguration,
  type ForecastPlannedStructure,
  type PlannedPrediction,
  type ForecastInputRow,
  type ForecastPrediction,
  type ForecastStructure,
  type PredictedLevel,
} from './predictLevels.ts';
