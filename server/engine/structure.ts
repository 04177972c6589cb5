/**
 * The expanded structure (design §2.3): wind-loaded faces and resisting masses on a base of depth
 * `baseDepthM` measured in the wind direction. Every kind expands to this; the custom record is
 * this plus a name. Schemas here, types inferred from them (never written twice).
 */
import { z } from 'zod';
import { areaM2, coefficient, dimensionM, frictionCoefficient, gustMps, heightM, label, massKg, safetyFactor } from './recordFields.ts';

/** A wind-loaded face: F = cf · q · A, acting at the centroid height. */
export const faceSchema = z.strictObject({
  label: label().optional(),
  /** Projected area normal to the wind (what you see looking along the wind), m². */
  areaM2: areaM2(),
  /** Height of the area's centroid above the ground, m: the lever arm of its force. */
  centroidHeightM: heightM(),
  /** Force coefficient with the wind onto the front side. */
  cfFront: coefficient(),
  /** Force coefficient with the wind onto the back side. */
  cfBack: coefficient(),
});

/** Roof or canopy uplift: F_up = c_lift · q · A_plan, acting at the middle of the base. */
export const upliftSchema = z.strictObject({
  planAreaM2: areaM2(),
  /** Net upward force coefficient, ≥ 0: downforce is never credited. */
  liftCoefficient: coefficient(),
});

/** A resisting mass at `xM` across the base, measured from the front edge (0 ≤ x ≤ baseDepthM). */
export const massSchema = z.strictObject({
  label: label().optional(),
  massKg: massKg(),
  xM: heightM(),
});

export const safetyFactorsSchema = z.strictObject({
  overturning: safetyFactor(),
  sliding: safetyFactor(),
  uplift: safetyFactor(),
});

export const expandedStructureSchema = z.strictObject({
  /** Depth of the base in the wind direction (between the tipping edges), m. */
  baseDepthM: dimensionM(),
  /** Base-to-ground friction coefficient μ. */
  frictionCoefficient: frictionCoefficient(),
  faces: z.array(faceSchema).min(1, 'must list at least one face').max(200, 'must list at most 200 faces'),
  uplift: upliftSchema.optional(),
  masses: z.array(massSchema).min(1, 'must list at least one mass').max(200, 'must list at most 200 masses'),
  safetyFactors: safetyFactorsSchema,
  /** The designer's or manufacturer's rated operational gust, m/s. */
  ratedGustMps: gustMps().optional(),
});

export type Face = z.infer<typeof faceSchema>;
export type Uplift = z.infer<typeof upliftSchema>;
export type Mass = z.infer<typeof massSchema>;
export type SafetyFactors = z.infer<typeof safetyFactorsSchema>;
export type ExpandedStructure = z.infer<typeof expandedStructureSchema>;
