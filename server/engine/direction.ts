/**
 * Azimuths, and relative wind on a moving structure (design §2.2). A structure's assessment in
 * every direction is in directions.ts and stability.ts: the wind speed is never reduced by the
 * cosine of an angle (design §2.2 v2).
 *
 * Conventions (meteorological): directions are degrees clockwise from north; a wind direction is
 * where the wind blows FROM. A structure's `orientationDeg` is the azimuth its front faces toward
 * (the outward normal of the front face). Wind from 0° onto a structure oriented 0° hits the front.
 */
import { maxPlausibleSpeedMps } from './limits.ts';
import { assertInRange } from './rangeCheck.ts';

const degreesPerRadian = 180 / Math.PI;

/** `angleDeg` folded into [0, 360). */
export function normalizedAzimuthDeg(angleDeg: number): number {
  const folded = angleDeg % 360;
  const positive = folded < 0 ? folded + 360 : folded;
  // −1e-15 + 360 rounds to 360 in floating point: that is north, 0.
  return positive >= 360 ? 0 : positive;
}

/** The smaller angle between two azimuths, 0..180°. */
export function angleBetweenDeg(aDeg: number, bDeg: number): number {
  const difference = Math.abs(normalizedAzimuthDeg(aDeg) - normalizedAzimuthDeg(bDeg));
  return difference > 180 ? 360 - difference : difference;
}

export interface RelativeWindInput {
  /** Wind speed over the ground, m/s. */
  windMps: number;
  /** Where the wind blows from, degrees. */
  windFromDeg: number;
  /** The structure's speed over the ground, m/s. */
  travelSpeedMps: number;
  /** Where the structure travels toward, degrees. */
  headingDeg: number;
}

export interface RelativeWind {
  /** Speed of the air relative to the structure, m/s. */
  speedMps: number;
  /** Where the relative wind comes from, degrees [0, 360) (0 when the air is still relative to it). */
  fromDeg: number;
}

/** East and north components, m/s, of a velocity of `speedMps` moving TOWARD `towardDeg`. */
function velocityComponents(speedMps: number, towardDeg: number): { eastMps: number; northMps: number } {
  const radians = towardDeg / degreesPerRadian;
  return { eastMps: speedMps * Math.sin(radians), northMps: speedMps * Math.cos(radians) };
}

/**
 * The wind a moving structure feels: the vector difference of the wind's velocity and its own
 * (design §2.2). Driving into a 10 m/s wind at 5 m/s gives 15 m/s from ahead.
 */
export function relativeWindMps({ windMps, windFromDeg, travelSpeedMps, headingDeg }: RelativeWindInput): RelativeWind {
  assertInRange('relativeWindMps', 'windMps', windMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertInRange('relativeWindMps', 'travelSpeedMps', travelSpeedMps, 0, maxPlausibleSpeedMps, 'm/s');
  assertInRange('relativeWindMps', 'windFromDeg', windFromDeg, -360, 360, '°');
  assertInRange('relativeWindMps', 'headingDeg', headingDeg, -360, 360, '°');
  // The air moves toward windFromDeg + 180.
  const wind = velocityComponents(windMps, windFromDeg + 180);
  const own = velocityComponents(travelSpeedMps, headingDeg);
  const eastMps = wind.eastMps - own.eastMps;
  const northMps = wind.northMps - own.northMps;
  const speedMps = Math.hypot(eastMps, northMps);
  // It comes from the opposite of where it moves.
  const fromDeg = speedMps === 0 ? 0 : normalizedAzimuthDeg(Math.atan2(-eastMps, -northMps) * degreesPerRadian);
  return { speedMps, fromDeg };
}

export interface TravelSpeedInput {
  /** The structure's limit gust (relative wind), m/s. */
  limitGustMps: number;
  /** Gust over the ground, m/s. */
  gustMps: number;
  /** Where the wind blows from, degrees; null when unknown (then the worst heading is assumed). */
  windFromDeg: number | null;
  /** Where the structure will travel, degrees; null for "any heading" (the worst, into the wind). */
  headingDeg: number | null;
}

export interface TravelSpeed {
  /** False when the wind alone already exceeds the limit: the face must not be raised at all. */
  possible: boolean;
  /** Highest ground speed along the heading with the relative wind ≤ the limit, m/s (0 when not possible). */
  speedMps: number;
}

/**
 * The highest travel speed in this wind with the face raised (design §2.2). With the headwind
 * cosine c = cos(windFrom − heading), |relative|² = v² + 2 v s c + s² ≤ L² gives
 * s ≤ −v c + √(L² − v² (1 − c²)); the worst heading (straight into the wind, c = 1) gives L − v.
 * When v > L the structure fails even at a standstill, so travel does not help: not possible.
 */
export function highestTravelSpeedMps({ limitGustMps, gustMps, windFromDeg, headingDeg }: TravelSpeedInput): TravelSpeed {
  assertInRange('highestTravelSpeedMps', 'limitGustMps', limitGustMps, 0, Infinity, 'm/s');
  assertInRange('highestTravelSpeedMps', 'gustMps', gustMps, 0, maxPlausibleSpeedMps, 'm/s');
  if (gustMps > limitGustMps) return { possible: false, speedMps: 0 };
  const headwindCosine =
    windFromDeg === null || headingDeg === null ? 1 : Math.cos(angleBetweenDeg(windFromDeg, headingDeg) / degreesPerRadian);
  const crossSquared = gustMps * gustMps * (1 - headwindCosine * headwindCosine);
  const speedMps = -gustMps * headwindCosine + Math.sqrt(Math.max(0, limitGustMps * limitGustMps - crossSquared));
  return { possible: true, speedMps: Math.max(0, speedMps) };
}
