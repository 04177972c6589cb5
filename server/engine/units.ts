/**
 * Speed units: the one place where wind speeds change unit. Everything inside the server is m/s;
 * payloads and screens convert at the edge with these functions.
 *
 * Exact definitions: 1 knot = 1852 m per hour (international nautical mile, BIPM SI brochure
 * table 8); 1 mph = 0.44704 m/s (international yard and pound agreement, 1959);
 * 1 km/h = 1/3.6 m/s.
 */
export const speedUnits = ['m/s', 'km/h', 'kn', 'mph'] as const;
export type SpeedUnit = (typeof speedUnits)[number];

/** Metres per second in one of each unit. */
const mpsPerUnit: Readonly<Record<SpeedUnit, number>> = {
  'm/s': 1,
  'km/h': 1 / 3.6,
  kn: 1852 / 3600,
  mph: 0.44704,
};

/** Labels people read on screens and in help text. */
export const speedUnitLabels: Readonly<Record<SpeedUnit, string>> = {
  'm/s': 'm/s',
  'km/h': 'km/h',
  kn: 'knots',
  mph: 'mph',
};

export function isSpeedUnit(value: unknown): value is SpeedUnit {
  return typeof value === 'string' && (speedUnits as readonly string[]).includes(value);
}

/** A speed given in `unit` expressed in m/s. */
export function speedToMps(speed: number, unit: SpeedUnit): number {
  return speed * mpsPerUnit[unit];
}

/** A speed in m/s expressed in `unit`. */
export function mpsToSpeed(speedMps: number, unit: SpeedUnit): number {
  return speedMps / mpsPerUnit[unit];
}

export const kmhToMps = (speedKmh: number): number => speedToMps(speedKmh, 'km/h');
export const knotsToMps = (speedKn: number): number => speedToMps(speedKn, 'kn');
export const mphToMps = (speedMph: number): number => speedToMps(speedMph, 'mph');
export const mpsToKmh = (speedMps: number): number => mpsToSpeed(speedMps, 'km/h');
export const mpsToKnots = (speedMps: number): number => mpsToSpeed(speedMps, 'kn');
export const mpsToMph = (speedMps: number): number => mpsToSpeed(speedMps, 'mph');

/**
 * Lower bounds of Beaufort forces 1..12 in m/s, 10-minute mean at 10 m (WMO, Manual on Codes /
 * WMO-No. 306 code table 1100 as reproduced in WMO-No. 8). Force 0 is everything below 0.3 m/s.
 */
const beaufortLowerBoundsMps = [0.3, 1.6, 3.4, 5.5, 8.0, 10.8, 13.9, 17.2, 20.8, 24.5, 28.5, 32.7] as const;

/**
 * Beaufort force (0..12) of a mean wind speed. The speed is first rounded half-up to 0.1 m/s,
 * as the published bounds are given to 0.1 m/s, then the highest force whose lower bound is met.
 */
export function beaufortForce(speedMps: number): number {
  if (!Number.isFinite(speedMps) || speedMps < 0) {
    throw new RangeError(`beaufortForce: speedMps must be a finite number ≥ 0, got ${speedMps}`);
  }
  const roundedDeciMps = Math.floor(speedMps * 10 + 0.5 + 1e-9);
  let force = 0;
  for (let i = 0; i < beaufortLowerBoundsMps.length; i++) {
    if (roundedDeciMps >= Math.round(beaufortLowerBoundsMps[i]! * 10)) force = i + 1;
  }
  return force;
}

/** The m/s range of a Beaufort force: [lower, upper) with upper = Infinity for force 12. */
export function beaufortRangeMps(force: number): { lowerMps: number; upperMps: number } {
  if (!Number.isInteger(force) || force < 0 || force > 12) {
    throw new RangeError(`beaufortRangeMps: force must be an integer 0..12, got ${force}`);
  }
  const lowerMps = force === 0 ? 0 : beaufortLowerBoundsMps[force - 1]!;
  const upperMps = force === 12 ? Infinity : beaufortLowerBoundsMps[force]!;
  return { lowerMps, upperMps };
}
