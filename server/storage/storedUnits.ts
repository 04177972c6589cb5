/**
 * The units the database stores, turned into the domain's in one place. Outside storage/ every
 * speed is m/s, every temperature °C, every pressure Pa, every direction degrees from north the
 * wind blows from, every utilization a fraction of capacity (Infinity when no resistance is
 * left) and every time epoch ms. The schema (db/schema.ts) keeps the two high-volume tables small:
 *
 * - speeds as integer centimetres per second (`…_cmps`);
 * - temperatures as integer tenths of a degree Celsius (`temp_deci_c`);
 * - pressure and relative humidity as whole pascals and whole per cent;
 * - a reading's direction as whole degrees, a minute's as the sums Σ sin θ, Σ cos θ and the count;
 * - a minute's utilization in ten-thousandths (`max_utilization_e4`), with "no resistance left"
 *   (an infinite utilization) as the sentinel `utilizationE4Unbounded`.
 */
import { unitVectorMeanDegFromSums } from '../wind/index.ts';

/** Stored utilization is in ten-thousandths; "no resistance left" is stored as this sentinel. */
export const utilizationE4Unbounded = 2_000_000_000;

/** m/s → stored cm/s (rounded to the centimetre per second). */
export const toCmps = (speedMps: number): number => Math.round(speedMps * 100);
/** Stored cm/s → m/s. */
export const fromCmps = (cmps: number): number => cmps / 100;
export const fromCmpsOrNull = (cmps: number | null): number | null => (cmps === null ? null : cmps / 100);

/** °C → stored tenths of a degree. */
export const toDeciC = (tempC: number): number => Math.round(tempC * 10);
/** Stored tenths of a degree → °C. */
export const fromDeciCOrNull = (deciC: number | null): number | null => (deciC === null ? null : deciC / 10);

/** Direction in degrees → the stored whole degree in [0, 360). */
export const toWholeDeg = (dirDeg: number): number => Math.round(dirDeg) % 360;

/** Utilization (fraction of capacity, Infinity when no resistance is left) → stored ten-thousandths. */
export function toUtilizationE4(utilization: number): number {
  return Number.isFinite(utilization) ? Math.min(utilizationE4Unbounded, Math.round(utilization * 10_000)) : utilizationE4Unbounded;
}

/** Stored ten-thousandths → utilization; the sentinel (no resistance left) → Infinity. */
export function fromUtilizationE4(e4: number): number {
  return e4 >= utilizationE4Unbounded ? Infinity : e4 / 10_000;
}

/**
 * A minute's (or a bucket's) mean direction from its stored sums, degrees [0, 360), or null when
 * no reading had a direction or the directions cancel out: the unit-vector mean (wind/).
 */
export function meanDirectionDeg(sinSum: number, cosSum: number, count: number): number | null {
  return count > 0 ? unitVectorMeanDegFromSums(sinSum, cosSum, count) : null;
}

/** A finite number, or null (a stored REAL column has no Infinity: an unbounded utilization is stored as null). */
export function finiteOrNull(value: number | null): number | null {
  return value !== null && Number.isFinite(value) ? value : null;
}
