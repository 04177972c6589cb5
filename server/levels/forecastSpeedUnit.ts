/**
 * Speed units a forecast table may use, and how they are spelled in headers.
 *
 * The factors are the exact definitions (1 knot = 1852 m per hour, BIPM SI brochure table 8;
 * 1 mph = 0.44704 m/s, international yard and pound agreement 1959; 1 km/h = 1/3.6 m/s). They
 * repeat the site's speed-unit table in server/engine/units.ts on purpose: this folder may not
 * depend on the engine while both are being written; the unit names are the same, so the two can
 * be merged into one table later.
 */
export const forecastSpeedUnits = ['m/s', 'km/h', 'kn', 'mph'] as const;
export type ForecastSpeedUnit = (typeof forecastSpeedUnits)[number];

const mpsPerUnit: Readonly<Record<ForecastSpeedUnit, number>> = {
  'm/s': 1,
  'km/h': 1 / 3.6,
  kn: 1852 / 3600,
  mph: 0.44704,
};

/** Header spellings (lower case, inner spaces collapsed) → unit. */
const spellings: ReadonlyMap<string, ForecastSpeedUnit> = new Map([
  ['m/s', 'm/s'], ['mps', 'm/s'], ['ms', 'm/s'], ['ms-1', 'm/s'], ['m s-1', 'm/s'], ['m/sec', 'm/s'],
  ['km/h', 'km/h'], ['kmh', 'km/h'], ['kph', 'km/h'], ['kmph', 'km/h'], ['km/hr', 'km/h'], ['km h-1', 'km/h'],
  ['kn', 'kn'], ['kt', 'kn'], ['kts', 'kn'], ['knot', 'kn'], ['knots', 'kn'],
  ['mph', 'mph'], ['mi/h', 'mph'],
]);

/** The unit a header spells ("km/h", "kt", "m s-1", ...), or null if it is not a speed unit. */
export function forecastSpeedUnitOf(spelling: string): ForecastSpeedUnit | null {
  return spellings.get(spelling.trim().toLowerCase().replace(/\s+/g, ' ')) ?? null;
}

/** Whether `value` is one of the unit names accepted as a separate argument. */
export function isForecastSpeedUnit(value: unknown): value is ForecastSpeedUnit {
  return typeof value === 'string' && (forecastSpeedUnits as readonly string[]).includes(value);
}

/** A speed given in `unit`, in m/s. */
export function forecastSpeedMps(speed: number, unit: ForecastSpeedUnit): number {
  return speed * mpsPerUnit[unit];
}
