/**
 * Levels: the staged alert plan of each structure (design §2.6), its level machine with gust,
 * utilization and chance triggers, and the alert book with its words (the forecast check is in
 * foresight/, design §5 v2).
 * Pure: no I/O, no clock; times come in as ms since the Unix epoch, speeds in m/s.
 */
export {
  levelDefinitionSchema,
  levelListSchema,
  levelTriggerSchema,
  gustTriggerSchema,
  utilizationTriggerSchema,
  chanceTriggerSchema,
  minChanceMinutes,
  maxChanceMinutes,
  maxLevelCount,
  maxLevelLabelLength,
  maxActionTextLength,
  maxTriggerFraction,
  maxTriggerGustMps,
  type ChanceTrigger,
  type GustTrigger,
  type LevelDefinition,
  type LevelList,
  type LevelTrigger,
  type UtilizationTrigger,
} from './levelDefinition.ts';
export { checkLevelOrder } from './levelOrder.ts';
export { cappedLimitMps, chanceThresholds, levelProblems, rawTriggerGustsMps, triggerLadderMps, type LevelProblem } from './triggerLadder.ts';
export { siteDefaultLevels } from './siteDefaultLevels.ts';
export { gustAtFractionWithoutUpliftMps } from './gustAtFractionWithoutUplift.ts';
export { justifiedLevel } from './justifiedLevel.ts';
export {
  stepLevel,
  initialLevelState,
  levelStepParams,
  defaultLevelStepParams,
  type LevelEvent,
  type LevelChance,
  type LevelInput,
  type LevelState,
  type LevelStep,
  type LevelStepParams,
} from './stepLevel.ts';
export { AlertBook, alertKinds, defaultResignalIntervalMs, type AlertEvent, type AlertKind, type NewAlert, type OpenAlert } from './alertBook.ts';
export {
  chanceRiseWords,
  clockOffsetWords,
  escalationWords,
  noDataActionText,
  noDataWords,
  sensorClockWords,
  sensorImplausibleWords,
  sensorSilentWords,
  sensorUnusableWords,
  type AlertWords,
  type SensorFacts,
} from './alertWords.ts';
