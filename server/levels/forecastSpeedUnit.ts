/**
 * Speed units a forecast table may use, and how they are spelled in headers. The units and their
 * factors are the site's one table in server/engine/units.ts (exact definitions, sources there).
 */
import { isSpeedUnit, speedToMps, speedUnits, type SpeedUnit } from '../engine/units.ts';

export const forecastSpeedUnits = speedUnits;
export type ForecastSpeedUnit = SpeedUnit;

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
export const isForecastSpeedUnit = isSpeedUnit;

/** A speed given in `unit`, in m/s. */
export const forecastSpeedMps = speedToMps;
