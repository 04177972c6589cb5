/**
 * The calculation engine's public API: pure functions in SI units, no I/O, no clock (design §2).
 *
 * - air: ISA (ISO 2533), moist air (WMO CIMO), the site's density modes.
 * - wind profile: EN 1991-1-4 terrain, roughness, turbulence, peak velocity pressure, gust height
 *   factor; log-law, power-law and cross-terrain transfers.
 * - direction: windward side and normal component, relative wind, travel speed of mobile structures.
 * - stability: overturning, sliding, uplift; limit gust, trigger gusts, required ballast.
 * - records and kinds: the schema of every structure record, validation, expansion to faces and masses.
 * - assess: the calculator's report (POST /api/assess).
 * - units: speed units and Beaufort.
 */
export * from './units.ts';
export { standardGravityMps2 } from './gravity.ts';
export { dynamicPressurePa, speedForDynamicPressureMps } from './dynamicPressure.ts';
export {
  airDensity,
  airDensityKgM3,
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
  type TerrainCategory,
  type TerrainParameters,
} from './windProfile.ts';
export {
  angleBetweenDeg,
  highestTravelSpeedMps,
  horizontalShare,
  normalizedAzimuthDeg,
  relativeWindMps,
  windOnStructure,
  type RelativeWind,
  type TravelSpeed,
  type WindCase,
} from './direction.ts';
export {
  calculatedLimitGust,
  criteria,
  criterionPressuresPa,
  defaultSafetyFactors,
  effectiveLimitGustMps,
  gustForUtilizationMps,
  requiredBallastKg,
  safetyFactorSources,
  sideLimitGustsMps,
  sideStability,
  sides,
  stabilityAtGust,
  stabilityAtPressure,
  stabilityCoefficients,
  type Criterion,
  type LimitGust,
  type Side,
  type SideStability,
  type StabilityAtPressure,
  type StabilityCoefficients,
} from './stability.ts';
export {
  expandedStructureSchema,
  faceSchema,
  massSchema,
  safetyFactorsSchema,
  upliftSchema,
  type ExpandedStructure,
  type Face,
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
export { assessStructure, type AssessmentOptions, type AssessmentReport, type SideReport } from './assess.ts';
