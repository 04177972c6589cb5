/**
 * Wind signal processing per sensor: 3-s gust, 10-minute mean and peak, unit-vector mean
 * direction, staleness and plausibility. Pure: no Node, no clock, no I/O; time comes in as
 * epoch-ms arguments. Definitions: WMO-No. 8 §5.8.2 and WMO-No. 306 §15.5.5 (gust = highest 3-s
 * running mean), WMO-No. 8 (10-minute mean).
 */
export {
  SensorWindState,
  createSensorWindState,
  gustWindowMs,
  meanWindowMs,
  sampleSpanCapMs,
  defaultSilenceTimeoutMs,
  defaultAirDataMaxAgeMs,
  defaultClockAheadToleranceMs,
  type SensorWindOptions,
  type WindReading,
  type WindMode,
} from './sensorWindState.ts';
export { acceptReading, type IgnoredReason } from './acceptReading.ts';
export { noteTenMinuteMean, tenMinuteGustFactor, gustFactorFloorMeanMps, gustFactorRange, type MeanHistory } from './meanHistory.ts';
export { windSnapshot, peakGustMps, type WindSnapshot } from './windSnapshot.ts';
export { sensorSilent } from './sensorSilent.ts';
export { noteArrival, clockOffsetMs, clockOffsetAlertMs, clockOffsetClearMs } from './clockOffset.ts';
export {
  stuckSensors,
  defaultStuckAfterMs,
  defaultNeighbourMedianMps,
  type StuckSensor,
  type StuckSensorOptions,
} from './stuckSensors.ts';
export {
  implausibleReasons,
  isImplausibleSpeedStep,
  summaryImplausibility,
  speedStepLimitMps,
  speedStepPeriodMs,
  gustBelowMeanSlackMps,
  gustFactorLimit,
  gustFactorMinMeanMps,
  implausibleHoldMs,
  type ImplausibleReason,
} from './implausibility.ts';
export { unitVectorMeanDeg, unitVectorMeanDegFromSums, compassDeg } from './unitVectorMeanDeg.ts';
export { threeSecondMeans, type ThreeSecondMeans } from './threeSecondMeans.ts';
