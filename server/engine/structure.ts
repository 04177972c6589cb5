/**
 * The expanded structure (design §2.3 v2): wind-loaded faces and resisting masses on a rectangular
 * base, the outline of its bearing points. Every kind expands to this; the custom record is this
 * plus a name. Schemas here, types inferred from them (never written twice).
 *
 * Frame: the structure's front faces its site azimuth. In plan, x runs from the front edge (x = 0)
 * to the back edge (x = baseDepthM); y runs from the end whose outward normal is front − 90°
 * (y = 0) to the end whose outward normal is front + 90° (y = baseWidthM).
 */
import { z } from 'zod';
import { areaM2, coefficient, dimensionM, frictionCoefficient, gustMps, heightM, label, massKg, safetyFactor } from './recordFields.ts';

/** An angle relative to the structure's front, degrees, [0, 360). */
const relativeAngleDeg = () => z.number().gte(0, 'must be ≥ 0°').lt(360, 'must be < 360°');

/** A wind-loaded face: F = cf · q · A · ψ(δ), normal to the face, at the centroid height. */
export const faceSchema = z.strictObject({
  label: label().optional(),
  /** Area of the face (its projection on its own plane), m². */
  areaM2: areaM2(),
  /** Height of the area's centroid above the ground, m: the lever arm of its force. */
  centroidHeightM: heightM(),
  /** Force coefficient with the wind onto the face's front side. */
  cfFront: coefficient(),
  /** Force coefficient with the wind onto the face's back side. */
  cfBack: coefficient(),
  /**
   * Which way the face's front side looks, relative to the structure's front, degrees: 0 the same
   * way as the front (default), 90 toward the y = baseWidthM end, 180 the back, 270 the y = 0 end.
   */
  facingDeg: relativeAngleDeg().optional(),
});

/** Roof or canopy uplift: F_up = c_lift · q · A_plan, at the plan point (xM, yM) (default the centre). */
export const upliftSchema = z.strictObject({
  label: label().optional(),
  planAreaM2: areaM2(),
  /** Net upward force coefficient, ≥ 0: downforce is never credited. */
  liftCoefficient: coefficient(),
  /** Where the resultant acts, m from the front edge (default the middle of the base). */
  xM: heightM().optional(),
  /** Where the resultant acts, m from the y = 0 end (default the middle of the base). */
  yM: heightM().optional(),
});

/**
 * Uplift that holds only for some wind directions (a tent roof whose net lift depends on which
 * wall is windward and open): it applies when the relative wind direction θ is within
 * `halfWidthDeg` of `centreDeg`. Where several apply, each is assessed and the worst governs;
 * where none applies, the record's plain `uplift` (if any) does.
 */
export const directionalUpliftSchema = upliftSchema.extend({
  centreDeg: relativeAngleDeg(),
  halfWidthDeg: z.number().gt(0).lte(180),
});

/** A resisting mass at plan point (xM, yM): x from the front edge, y from the y = 0 end (default the middle). */
export const massSchema = z.strictObject({
  label: label().optional(),
  massKg: massKg(),
  xM: heightM(),
  yM: heightM().optional(),
});

export const safetyFactorsSchema = z.strictObject({
  overturning: safetyFactor(),
  sliding: safetyFactor(),
  uplift: safetyFactor(),
});

const bodyShape = {
  /** Depth of the base from the front edge to the back edge, m. */
  baseDepthM: dimensionM(),
  /** Width of the base from the y = 0 end to the y = baseWidthM end, m. Absent: a strip (first-round record). */
  baseWidthM: dimensionM().optional(),
  /** Base-to-ground friction coefficient μ. */
  frictionCoefficient: frictionCoefficient(),
  faces: z.array(faceSchema).max(200, 'must list at most 200 faces'),
  uplift: upliftSchema.optional(),
  upliftCases: z.array(directionalUpliftSchema).max(24).optional(),
  masses: z.array(massSchema).min(1, 'must list at least one mass').max(200, 'must list at most 200 masses'),
  safetyFactors: safetyFactorsSchema,
};

/**
 * A part that can fail on its own before the body does (design §2.4): a fence's end panel on its
 * own feet, one screen tower with its outrigger ballast, a tent's portal frame. It is assessed
 * like a structure on its own base and masses, in the body's frame.
 */
export const elementSchema = z.strictObject({
  name: label(),
  ...bodyShape,
  /**
   * The checks that apply to this part on its own (default all three). A tent's portal frame is
   * checked for tipping and uplift (its windward legs lifting), not for sliding: the eave rails
   * and purlins tie it to the other frames, so the tent slides as a whole (the body's check).
   */
  checks: z.array(z.enum(['overturning', 'sliding', 'uplift'])).min(1).optional(),
});

export const expandedStructureSchema = z.strictObject({
  ...bodyShape,
  /** The designer's or manufacturer's rated operational gust, m/s. */
  ratedGustMps: gustMps().optional(),
  elements: z.array(elementSchema).max(20).optional(),
});

export type Face = z.infer<typeof faceSchema>;
export type Uplift = z.infer<typeof upliftSchema>;
export type DirectionalUplift = z.infer<typeof directionalUpliftSchema>;
export type Mass = z.infer<typeof massSchema>;
export type SafetyFactors = z.infer<typeof safetyFactorsSchema>;
export type Element = z.infer<typeof elementSchema>;
export type ExpandedStructure = z.infer<typeof expandedStructureSchema>;
/** What the stability functions assess: the body or one element (same shape, elements aside). */
export type StabilityBody = Omit<ExpandedStructure, 'elements' | 'ratedGustMps'>;
