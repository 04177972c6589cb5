/**
 * Wind direction relative to a structure, and relative wind on a moving one (design §2.2).
 *
 * Conventions (meteorological): directions are degrees clockwise from north; a wind direction is
 * where the wind blows FROM. A structure's `orientationDeg` is the azimuth its front faces toward
 * (the outward normal of the front face). Wind from 0° onto a structure oriented 0° hits the front.
 */
import { assertInRange } from './rangeCheck.ts';
import type { Side } from './stability.ts';

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

export interface WindOnStructureInput {
  /** Gust at the structure, m/s. */
  gustMps: number;
  /** Where the wind blows from, degrees; null when the sensor gives no direction. */
  windFromDeg: number | null;
  /** Azimuth the structure's front faces toward, degrees. */
  orientationDeg: number;
  /** Whether the site enables directional assessment. */
  directional: boolean;
}

export interface WindCase {
  /** The side the wind blows onto. */
  side: Side;
  /** The gust itself, m/s: roof uplift does not drop when the wind turns, so it keeps this. */
  gustMps: number;
  /** Component of the gust normal to the faces, m/s: what loads the faces. */
  normalGustMps: number;
}

/**
 * The cases to assess for one gust. Directional with a direction: one case, the windward side
 * (front when the wind is within 90° of the orientation) with the normal component v·|cos Δ|.
 * Otherwise (not directional, or no direction): both sides at full speed; the worse governs.
 */
export function windOnStructure({ gustMps, windFromDeg, orientationDeg, directional }: WindOnStructureInput): WindCase[] {
  assertInRange('windOnStructure', 'gustMps', gustMps, 0, 120, 'm/s');
  assertInRange('windOnStructure', 'orientationDeg', orientationDeg, -360, 360, '°');
  if (!directional || windFromDeg === null) {
    return [
      { side: 'front', gustMps, normalGustMps: gustMps },
      { side: 'back', gustMps, normalGustMps: gustMps },
    ];
  }
  assertInRange('windOnStructure', 'windFromDeg', windFromDeg, -360, 360, '°');
  const offsetDeg = angleBetweenDeg(windFromDeg, orientationDeg);
  const side: Side = offsetDeg < 90 ? 'front' : 'back';
  return [{ side, gustMps, normalGustMps: gustMps * Math.abs(Math.cos(offsetDeg / degreesPerRadian)) }];
}

/**
 * Share of the full-gust dynamic pressure that loads the faces in a wind case: (v_n / v)², the
 * `horizontalShare` argument of the stability functions (1 when the gust is 0).
 */
export function horizontalShare(windCase: WindCase): number {
  if (windCase.gustMps === 0) return 1;
  const ratio = windCase.normalGustMps / windCase.gustMps;
  return ratio * ratio;
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
  assertInRange('relativeWindMps', 'windMps', windMps, 0, 120, 'm/s');
  assertInRange('relativeWindMps', 'travelSpeedMps', travelSpeedMps, 0, 120, 'm/s');
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
  assertInRange('highestTravelSpeedMps', 'gustMps', gustMps, 0, 120, 'm/s');
  if (gustMps > limitGustMps) return { possible: false, speedMps: 0 };
  const headwindCosine =
    windFromDeg === null || headingDeg === null ? 1 : Math.cos(angleBetweenDeg(windFromDeg, headingDeg) / degreesPerRadian);
  const crossSquared = gustMps * gustMps * (1 - headwindCosine * headwindCosine);
  const speedMps = -gustMps * headwindCosine + Math.sqrt(Math.max(0, limitGustMps * limitGustMps - crossSquared));
  return { possible: true, speedMps: Math.max(0, speedMps) };
}
