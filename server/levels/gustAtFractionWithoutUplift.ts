/**
 * The gust at which a structure without uplift reaches a given fraction of its load capacity.
 *
 * Without uplift every load (force, overturning moment) goes with q = ½ρv² while the resistance
 * is fixed, so utilization goes with v² and U = fraction at v = v_limit · √fraction (design §2.3,
 * §2.6). Since v2 factors uplift with the wind and takes self-weight alone as resistance, this
 * holds with uplift too.
 */
import { maxTriggerFraction } from './levelDefinition.ts';

/**
 * Gust in m/s at which the governing utilization equals `fraction`, for a structure whose limit
 * gust (utilization 1) is `limitGustMps` and which has no uplift.
 *
 * @example gustAtFractionWithoutUpliftMps(20, 0.6) // → 15.49 m/s
 */
export function gustAtFractionWithoutUpliftMps(limitGustMps: number, fraction: number): number {
  if (!(Number.isFinite(limitGustMps) && limitGustMps > 0)) {
    throw new RangeError(
      `gustAtFractionWithoutUpliftMps: limitGustMps must be a finite number > 0 m/s, got ${limitGustMps}`,
    );
  }
  if (!(fraction > 0 && fraction <= maxTriggerFraction)) {
    throw new RangeError(
      `gustAtFractionWithoutUpliftMps: fraction must be in (0, ${maxTriggerFraction}], got ${fraction}`,
    );
  }
  return limitGustMps * Math.sqrt(fraction);
}
