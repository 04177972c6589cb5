/**
 * The calculation engine's public API: pure functions in SI units, no I/O, no clock (design §2).
 *
 * - air: ISA (ISO 2533), moist air (WMO CIMO), the site's density modes.
 * - wind profile: EN 1991-1-4 terrain, roughness, turbulence, peak velocity pressure, gust height
 *   factor; log-law, power-law and cross-terrain transfers.
 * - directions: the structure's frame, face incidence and ψ, the directions assessed.
 * - direction: azimuths, relative wind and travel speed of mobile structures.
 * - stability: every direction, every edge, elements; overturning, sliding, uplift; limit gust,
 *   effective capacity with the rating, required ballast.
 * - records and kinds: the schema of every structure record, validation, expansion to faces and masses.
 * - configurations: a record's named sets of changes (a screen lowered), each a whole record assessed alike.
 * - assess: the calculator's report (POST /api/assess).
 * - units: speed units and Beaufort.
 */
export * from './units.ts';
export * from './limits.ts';
export { standardGravityMps2 } from './gravity.ts';
export { dynamicPressurePa, speedForDynamicPressureMps } from './dynamicPressure.ts';
export {
  airDensity,
  recommendedAirDensityKgM3,
  siteAirDensity,
  siteDesignDensityKgM3,
  airDensityKgM3,
  airDensityModes,
  assertAirDensity,
  dryAirGasConstantJPerKgK,
  isaAirDensityKgM3,
  isaLapseRateKPerM,
  isaPressurePa,
  isaSeaLevelDensityKgM3,
  isaSeaLevelPressurePa,
  isaSeaLevelTemperatureK,
  isaTemperatureK,
  moistAirDensityKgM3,
  plausibleAirDensityKgM3,
  saturationVapourPressurePa,
  waterVapourGasConstantJPerKgK,
  type AirDensity,
  type AirDensityMode,
  type MoistAirInput,
} from './air.ts';
export {
  crossTerrainMeanWindMps,
  exposureFactor,
  gustHeightFactor,
  heightFactorBetween,
  profileRoots,
  type ProfileRoots,
  isBelowMinimumHeight,
  logLawSpeedMps,
  meanWindMps,
  peakVelocityPressurePa,
  powerLawSpeedMps,
  profileMaximumHeightM,
  roughnessFactor,
  terrainCategories,
  terrainFactor,
  terrainParameters,
  turbulenceIntensity,
  unclampedExposureFactor,
  unclampedProfileFloorRoughnessLengths,
  type TerrainCategory,
  type TerrainParameters,
} from './windProfile.ts';
export { angleBetweenDeg, highestTravelSpeedMps, normalizedAzimuthDeg, relativeWindMps, type RelativeWind, type TravelSpeed } from './direction.ts';
export {
  assessedDirectionsDeg,
  azimuthDeg,
  directionStepDeg,
  faceIncidence,
  faceNormal,
  inSector,
  obliqueShare,
  travelDirection,
  wrappedDeg,
  type DirectionSector,
  type FaceIncidence,
} from './directions.ts';
export {
  bodyCoefficients,
  criteria,
  defaultSafetyFactors,
  edges,
  edgeWords,
  safetyFactorSources,
  stabilityCoefficients,
  type BodyCoefficients,
  type Criterion,
  type DirectionCoefficients,
  type Edge,
  type StabilityCoefficients,
  type Utilizations,
} from './stability.ts';
export {
  calculatedLimitGustMps,
  compactGoverningCase,
  compactStability,
  directionUtilizations,
  effectiveLimitGustMps,
  effectiveLimitMps,
  effectiveUtilization,
  governingCase,
  governingPerPa,
  gustAtFractionMps,
  gustAtPerPaMps,
  gustForUtilizationMps,
  parts,
  utilizationAtPa,
  withRating,
  type AssessedDirections,
  type CompactStability,
  type GoverningCase,
  type Stability,
} from './utilization.ts';
export { caseAtGust, liveStructure, structureLimits, utilizationAtGust, type CaseAtGust, type LiveStructure, type StructureLimits } from './liveAssessment.ts';
export { requiredBallast, type RequiredBallast } from './requiredBallast.ts';
export { compassPointName, criterionWords, governingWords, sideName, windWords } from './caseWords.ts';
export {
  directionalUpliftSchema,
  elementSchema,
  expandedStructureSchema,
  faceSchema,
  massSchema,
  safetyFactorsSchema,
  upliftSchema,
  type DirectionalUplift,
  type Element,
  type ExpandedStructure,
  type Face,
  type StabilityBody,
  type Mass,
  type SafetyFactors,
  type Uplift,
} from './structure.ts';
export {
  recordIssues,
  structureKinds,
  structureRecordSchema,
  validateStructureRecord,
  type BannerRecord,
  type CustomRecord,
  type RecordIssue,
  type RecordValidation,
  type ScreenRecord,
  type ShellRecord,
  type StructureKind,
  type StructureRecord,
  type TentRecord,
} from './record.ts';
export {
  boardForceCoefficient,
  defaultCoefficients,
  expandStructure,
  freeStandingWallCpNet,
  freeStandingWallMeanCpNet,
  frictionBySurface,
  solidityFactor,
  type Expansion,
  type SourceNote,
  type SourcedValue,
} from './kinds/index.ts';
export {
  applyConfiguration,
  assessConfigurations,
  configurationIssues,
  defaultRegisteredConfigurationName,
  findConfiguration,
  maxConfigurations,
  recordConfigurations,
  registeredConfigurationName,
  sameConfigurationName,
  unchangeableFields,
  type Configuration,
  type ConfigurationAssessment,
  type ConfigurationResult,
  type ConfiguredRecord,
} from './configuration.ts';
export {
  assessCoefficients,
  assessStructure,
  type AssessmentOptions,
  type AssessmentReport,
  type Bounded,
  type DirectionReport,
  type ElementReport,
  type UtilizationReport,
} from './assess.ts';
