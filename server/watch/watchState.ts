/**
 * What the live watch shows of the site (design §2.2–2.7): each structure's and sensor's state as
 * the snapshot, the stream and the routes carry it, and the state of the parts around the watch.
 * The web app takes these types as they are (web/src/types.ts), so one definition serves both.
 */
import type { LevelDefinition } from '../levels/levelDefinition.ts';
import type { StructureForesight } from './structureForesight.ts';

/** The part of a structure's state that changes with the wind: the once-a-second `structures` event. */
export type StructureUpdate = Pick<
  StructureState,
  | 'id'
  | 'level'
  | 'levelLabel'
  | 'levelSinceMs'
  | 'noData'
  | 'gustMps'
  | 'governingSensorKey'
  | 'windFromDeg'
  | 'utilization'
  | 'calculatedUtilization'
  | 'margin'
  | 'unbounded'
  | 'evaluatedAtMs'
> &
  /** With directional assessment only: what governs and the limits move with the wind direction. */
  Partial<Pick<StructureState, 'governing' | 'governingDirectionDeg' | 'governingElement' | 'governingText' | 'limitGustMps' | 'triggerGustsMps'>>;

export interface StructureState {
  id: number;
  name: string;
  kind: string;
  level: number;
  levelLabel: string | null;
  levelSinceMs: number;
  noData: boolean;
  gustMps: number | null;
  governingSensorKey: string | null;
  windFromDeg: number | null;
  /** Effective utilization: max(governing U, (gust / rated gust)²) (design §2.3); null when unknown or unbounded. */
  utilization: number | null;
  /** The calculated governing utilization (without the rating); null when unknown or unbounded. */
  calculatedUtilization: number | null;
  /** The criterion of the governing case. */
  governing: string | null;
  /** θ of the governing case relative to the front, degrees; null when unknown. */
  governingDirectionDeg: number | null;
  /** The part that governs: null for the whole body, else the element's name. */
  governingElement: string | null;
  /** What governs, in words ("wind from the W onto the west end: sliding"). */
  governingText: string | null;
  /** 1 − effective utilization; null when unknown. */
  margin: number | null;
  unbounded: boolean;
  /** The effective limit over the directions now assessed (the sector, with directional assessment), m/s. */
  limitGustMps: number;
  /** The effective limit over every direction, m/s. */
  allDirectionsLimitGustMps: number;
  calculatedLimitGustMps: number;
  ratedGustMps: number | null;
  airDensityKgM3: number;
  referenceHeightM: number;
  triggerGustsMps: number[];
  levels: Array<{ level: number; label: string; actionText: string; triggerGustMps: number; trigger: LevelDefinition['trigger'] }>;
  /** What the engine could not check for this record (e.g. a strip record's ends). */
  warnings: string[];
  evaluatedAtMs: number | null;
  error: string | null;
  mobile: boolean;
  /** The sensors whose wind governs it; null = every sensor on the site. */
  sensorKeys: string[] | null;
  /**
   * Mobile structures: the highest travel speed with the face raised in the current gust, heading
   * straight into the wind (the worst case; design.md 2.2), m/s; null when not mobile or unknown.
   */
  highestTravelSpeedMps: number | null;
  /** Estimates of what comes (design §2.7): the chance of the next level and the limit, the expected peak, the time to the next level; null before the first figures. */
  foresight: StructureForesight | null;
  /** The live configuration's name (design §2.5). */
  configuration: string;
  /** When and by whom it was switched to; null: as registered, never switched since the register was loaded. */
  configurationSinceMs: number | null;
  configurationBy: string | null;
  /** Every configuration with its limits at the current air density, the one as registered first. */
  configurations: Array<{ name: string; current: boolean; limitGustMps: number; calculatedLimitGustMps: number; triggerGustsMps: number[] }>;
}

export interface SensorState {
  key: string;
  name: string;
  heightM: number;
  /** The sensor's own silence timeout, ms: a screen whose stream dropped can judge staleness itself. */
  silenceTimeoutMs: number;
  currentGustMps: number | null;
  peakGust10minMps: number | null;
  mean10minMps: number | null;
  meanDirDeg: number | null;
  beaufort: number | null;
  lastReadingTsMs: number | null;
  lastReceivedAtMs: number | null;
  /** When the newest reading of any kind arrived (late ones too); null before the first. */
  lastArrivalAtMs: number | null;
  /** The sensor's clock offset from the server's, ms (positive: behind), over the last 30–60 s of arrivals; null when nothing arrived. */
  clockOffsetMs: number | null;
  silent: boolean;
  implausible: string[];
  temperatureC: number | null;
  pressurePa: number | null;
  rhPct: number | null;
}

/** The state of the parts around the watch that a crew must know about (shown on every screen). */
export interface SystemStatus {
  storageOk: boolean;
  storageError: string | null;
  /** Rows held in memory until the database accepts writes again. */
  storageBacklogRows: number;
  brokerOk: boolean;
  brokerState: string;
}
