/**
 * Speed units a forecast table may use, how they are spelled in headers and inside cells ("8 mph",
 * "14 km/h", "12kt", "Bft 6"), and what a cell's value is in m/s.
 *
 * The speed units and their factors are the site's one table in server/engine/units.ts (exact
 * definitions: 1 mile = 1609.344 m, international yard and pound agreement 1959, so 1 mph =
 * 0.44704 m/s; 1 nautical mile = 1852 m, SI Brochure table 8, so 1 kn = 1852/3600 m/s; 1 km/h =
 * 1/3.6 m/s).
 *
 * Beaufort forces are accepted for the mean wind only: the Beaufort scale is a scale of the
 * 10-minute mean wind at 10 m (WMO, Manual on Codes WMO-No. 306, code table 1100, as reproduced
 * in WMO-No. 8; the band limits are the ones in server/engine/units.ts). A force is a band, not a
 * speed, so a force is read as the top of its band (force 6, 10.8–13.8 m/s, is read as 13.8 m/s):
 * the predicted level is then never lower than for any mean wind inside the band. Force 12 has no
 * upper limit (32.7 m/s and above), so no speed can stand for it and it is refused.
 */
import { beaufortRangeMps, isSpeedUnit, speedToMps, speedUnits, type SpeedUnit } from '../engine/units.ts';

export const forecastSpeedUnits = speedUnits;
export type ForecastSpeedUnit = SpeedUnit;
/** A unit a cell or header may carry: a speed unit, or Beaufort forces (mean wind only). */
export type ForecastCellUnit = ForecastSpeedUnit | 'Bft';

/** Spellings (lower case, inner spaces collapsed) → unit. */
const spellings: ReadonlyMap<string, ForecastCellUnit> = new Map([
  ['m/s', 'm/s'], ['mps', 'm/s'], ['ms', 'm/s'], ['ms-1', 'm/s'], ['m s-1', 'm/s'], ['m/sec', 'm/s'], ['ms⁻¹', 'm/s'], ['m s⁻¹', 'm/s'],
  ['km/h', 'km/h'], ['kmh', 'km/h'], ['kph', 'km/h'], ['kmph', 'km/h'], ['km/hr', 'km/h'], ['km h-1', 'km/h'], ['km h⁻¹', 'km/h'],
  ['kn', 'kn'], ['kt', 'kn'], ['kts', 'kn'], ['knot', 'kn'], ['knots', 'kn'],
  ['mph', 'mph'], ['mi/h', 'mph'],
  ['bft', 'Bft'], ['bf', 'Bft'], ['beaufort', 'Bft'], ['force', 'Bft'],
]);

/** The unit a header or cell spells ("km/h", "kt", "m s-1", "Bft", ...), or null if it is not one. */
export function forecastUnitOf(spelling: string): ForecastCellUnit | null {
  return spellings.get(spelling.trim().toLowerCase().replace(/\s+/g, ' ')) ?? null;
}

/** The speed unit a header spells, or null if it is not a speed unit (Beaufort is not a speed unit). */
export function forecastSpeedUnitOf(spelling: string): ForecastSpeedUnit | null {
  const unit = forecastUnitOf(spelling);
  return unit === null || unit === 'Bft' ? null : unit;
}

/** Whether `value` is one of the unit names accepted as a separate argument. */
export const isForecastSpeedUnit = isSpeedUnit;

/** A speed given in `unit`, in m/s. */
export const forecastSpeedMps = speedToMps;

/** How a unit is written back to people in messages. */
export const unitWords = (unit: ForecastCellUnit): string => (unit === 'Bft' ? 'Beaufort' : unit);

/**
 * The top of a Beaufort force's band as published (to 0.1 m/s), m/s: force 6 → 13.8. Throws a
 * RangeError for a force that is not an integer 0..11 (force 12 has no top).
 */
export function beaufortTopMps(force: number): number {
  if (!Number.isInteger(force) || force < 0 || force > 11) {
    throw new RangeError(`beaufortTopMps: force must be an integer 0..11 (force 12 has no upper limit), got ${force}`);
  }
  // The bands are published to 0.1 m/s and each ends 0.1 m/s below where the next begins.
  return (Math.round(beaufortRangeMps(force).upperMps * 10) - 1) / 10;
}

export type SpeedCell =
  | { readonly kind: 'missing' }
  | { readonly kind: 'number'; readonly value: number; readonly unit: ForecastCellUnit | null }
  | { readonly kind: 'bad'; readonly reason: string };

const missingMarks = new Set(['', '-', '–', '—', 'na', 'n/a', 'null']);
const unitList = 'm/s, km/h, mph or kn';

/**
 * What a speed cell says: missing, a number with or without a unit, or why it is not a speed.
 * `decimalComma` accepts "12,5" (tab- and semicolon-separated tables). The value is not yet
 * checked for range or converted.
 *
 * @example speedCell('8 mph', false) // → { kind: 'number', value: 8, unit: 'mph' }
 * @example speedCell('Bft 6', false) // → { kind: 'number', value: 6, unit: 'Bft' }
 */
export function speedCell(text: string, decimalComma: boolean): SpeedCell {
  const raw = text.trim();
  if (missingMarks.has(raw.toLowerCase())) return { kind: 'missing' };
  const number = decimalComma ? String.raw`[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)` : String.raw`[+-]?(?:\d+(?:\.\d*)?|\.\d+)`;
  // "8", "8 mph", "8mph", "12,5 km/h"; or a Beaufort force written first: "Bft 6", "Force 6", "F6".
  const after = new RegExp(`^(${number})\\s*([^\\d\\s+-].*)?$`).exec(raw);
  const before = /^(bft|bf|beaufort|force|f)\.?\s*(\d+(?:[.,]\d*)?)$/i.exec(raw);
  let value: number;
  let unit: ForecastCellUnit | null = null;
  if (!decimalComma && /^[+-]?\d+,\d+(\s|$)/.test(raw)) {
    return { kind: 'bad', reason: 'is not a speed — use a decimal point (12.5) in a comma-separated table' };
  }
  if (after) {
    value = Number(after[1]!.replace(',', '.'));
    if (after[2] !== undefined) {
      unit = forecastUnitOf(after[2]);
      if (unit === null) return { kind: 'bad', reason: `is not a speed — use ${unitList}` };
    }
  } else if (before) {
    value = Number(before[2]!.replace(',', '.'));
    unit = 'Bft';
  } else {
    return { kind: 'bad', reason: `is not a speed — write a number, with or without its unit (12, 12.5, "8 mph"); units: ${unitList}` };
  }
  if (!Number.isFinite(value)) return { kind: 'bad', reason: `is not a speed — use ${unitList}` };
  return { kind: 'number', value, unit };
}
