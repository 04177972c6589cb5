/**
 * Zod field builders shared by the structure schemas: each carries its unit and a plausible
 * range in its messages, so a 400 names the field and says what would be accepted. The upper
 * bounds only catch typos and unit errors (mm for m, g for kg); they are not design limits.
 */
import { z } from 'zod';
import { maxDimensionM, maxLabelLength, maxMassKg, maxPlausibleSpeedMps } from './limits.ts';

// maxDimensionM: longest edge or highest point accepted, m (EN 1991-1-4's profile ends at z_max = 200 m; engine/limits.ts).

/** A length, height or depth > 0 m. */
export const dimensionM = () =>
  z.number().gt(0, 'must be > 0 m').lte(maxDimensionM, `must be ≤ ${maxDimensionM} m`);

/** A height or offset ≥ 0 m (clearance under a banner, a face's centroid). */
export const heightM = () =>
  z.number().gte(0, 'must be ≥ 0 m').lte(maxDimensionM, `must be ≤ ${maxDimensionM} m`);

/** An area ≥ 0 m². */
export const areaM2 = () =>
  z.number().gte(0, 'must be ≥ 0 m²').lte(maxDimensionM * maxDimensionM, `must be ≤ ${maxDimensionM * maxDimensionM} m²`);

/** A mass ≥ 0 kg (at most 1 000 t). */
export const massKg = () => z.number().gte(0, 'must be ≥ 0 kg').lte(maxMassKg, `must be ≤ ${String(maxMassKg).replace(/\B(?=(\d{3})+$)/g, ' ')} kg`);

/** A force or lift coefficient, 0..4 (the highest code value, EN Table 7.9 zone A, is 3.4). */
export const coefficient = () => z.number().gte(0, 'must be ≥ 0').lte(4, 'must be ≤ 4');

/** A partial safety factor, 1..5: a factor below 1 would credit more resistance than there is. */
export const safetyFactor = () => z.number().gte(1, 'must be ≥ 1').lte(5, 'must be ≤ 5');

/** Base-to-ground friction coefficient μ, (0, 1] (EN 12812 ranges top out at 1.0). */
export const frictionCoefficient = () => z.number().gt(0, 'must be > 0').lte(1, 'must be ≤ 1');

/** A gust speed, (0, 120] m/s (120 m/s is the plausibility bound of design §3). */
export const gustMps = () => z.number().gt(0, 'must be > 0 m/s').lte(maxPlausibleSpeedMps, `must be ≤ ${maxPlausibleSpeedMps} m/s`);

/** A count of legs, feet or towers. */
export const count = (min: number) =>
  z.number().int('must be a whole number').gte(min, `must be ≥ ${min}`).lte(1000, 'must be ≤ 1000');

/** A label people read: a face or mass name. */
export const label = () => z.string().trim().min(1, 'must not be empty').max(maxLabelLength, `must be at most ${maxLabelLength} characters`);

/** A source citation for an overridden value. */
export const sourceText = () =>
  z.string().trim().min(3, 'must name the source (standard and clause, handbook and figure, or manufacturer)').max(500, 'must be at most 500 characters');
