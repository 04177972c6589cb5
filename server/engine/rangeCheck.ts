/**
 * Argument checks shared by the engine's public functions. A silent NaN in a load calculation is
 * dangerous, so out-of-range input throws a RangeError that names the function, the argument,
 * its value and the allowed range.
 */

/** Throws unless `value` is a finite number in [min, max] (bounds inclusive). */
export function assertInRange(caller: string, name: string, value: number, min: number, max: number, unit = ''): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max) {
    const suffix = unit ? ` ${unit}` : '';
    throw new RangeError(`${caller}: ${name} must be a finite number in [${min}, ${max}]${suffix}, got ${String(value)}`);
  }
}

/** Throws unless `value` is a finite number above `min` (exclusive) and at most `max`. */
export function assertAbove(caller: string, name: string, value: number, min: number, max = Infinity, unit = ''): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= min || value > max) {
    const suffix = unit ? ` ${unit}` : '';
    const upper = max === Infinity ? '' : ` and ≤ ${max}`;
    throw new RangeError(`${caller}: ${name} must be a finite number > ${min}${upper}${suffix}, got ${String(value)}`);
  }
}
