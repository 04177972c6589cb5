/**
 * Levels: the staged alert plan of each structure (design §2.4) and the forecast check (§2.5).
 * Pure: no I/O, no clock; times come in as ms since the Unix epoch, speeds in m/s.
 */
export {
  levelDefinitionSchema,
  levelListSchema,
  levelTriggerSchema,
  gustTriggerSchema,
  utilizationTriggerSchema,
  maxLevelCount,
  maxLevelLabelLength,
  maxActionTextLength,
  maxTriggerFraction,
  maxTriggerGustMps,
  type GustTrigger,
  type LevelDefinition,
  type LevelList,
  type LevelTrigger,
  type UtilizationTrigger,
} from './levelDefinition.ts';
export { checkLevelOrder } from './levelOrder.ts';
export { siteDefaultLevels } from './siteDefaultLevels.ts';
export { gustAtFractionWithoutUpliftMps } from './gustAtFractionWithoutUplift.ts';
export { justifiedLevel } from './justifiedLevel.ts';
export {
  stepLevel,
  initialLevelState,
  levelStepParams,
  defaultLevelStepParams,
  type LevelEvent,
  type LevelInput,
  type LevelState,
  type LevelStep,
  type LevelStepParams,
} from './stepLevel.ts';
export {
  alertKinds,
  escalationAlert,
  noDataAlert,
  noDataActionText,
  sensorAlert,
  type Acknowledgement,
  type Alert,
  type AlertKind,
} from './alert.ts';
export {
  acknowledge,
  AcknowledgementError,
  maxAcknowledgerNameLength,
  maxAcknowledgementNoteLength,
  type AcknowledgementErrorCode,
} from './acknowledge.ts';
export { resignalDue, recordSignal, defaultResignalIntervalMs } from './resignalDue.ts';
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
  type ForecastConfiguration,
  type ForecastPlannedStructure,
  type PlannedPrediction,
  type ForecastInputRow,
  type ForecastPrediction,
  type ForecastStructure,
  type PredictedLevel,
} from './predictLevels.ts';
