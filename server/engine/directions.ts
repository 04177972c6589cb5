/**
 * Directions in a structure's own frame (design §2.3 v2) and the normal force on a face.
 *
 * θ is the relative wind direction: the wind-from azimuth minus the structure's front azimuth,
 * degrees clockwise. θ = 0 blows onto the front (the air travels toward +x), 90 onto the
 * y = baseWidthM end (toward −y), 180 onto the back, 270 onto the y = 0 end. The air's travel
 * direction in plan is t(θ) = (cos θ, −sin θ).
 *
 * A face whose front side looks toward φ (relative to the structure's front) has the outward
 * front normal n = (−cos φ, sin φ): φ = 0 looks out of the front edge (−x), 90 out of the
 * y = baseWidthM end (+y).
 */
import { assertInRange } from './rangeCheck.ts';

const radiansPerDegree = Math.PI / 180;

/** An angle folded into (−180°, 180°]. */
export function wrappedDeg(angleDeg: number): number {
  let folded = angleDeg % 360;
  if (folded <= -180) folded += 360;
  if (folded > 180) folded -= 360;
  return folded;
}

/** An angle folded into [0°, 360°). */
export function azimuthDeg(angleDeg: number): number {
  const folded = angleDeg % 360;
  const positive = folded < 0 ? folded + 360 : folded;
  return positive >= 360 ? 0 : positive;
}

/**
 * ψ(δ) = min(1, 2·cos δ): share of a flat face's normal force at δ degrees from its normal (0..90).
 * Full force within 60° of the normal, falling to 0 edge-on (design §2.3; a flat plate keeps about
 * its full normal-force coefficient down to about 30° from edge-on: Hoerner, Fluid-Dynamic Drag,
 * ch. 3, from memory; EN 1991-1-4 7.4.3 covers oblique wind on signboards by eccentricity, not by
 * a reduction). The shape between 60° and 90° is from memory, so it is kept above the plate
 * curves recalled, never below.
 */
export function obliqueShare(deltaDeg: number): number {
  assertInRange('obliqueShare', 'deltaDeg', deltaDeg, 0, 90, '°');
  if (deltaDeg <= 60) return 1;
  // cos 90° is 6e-17 in floating point: edge-on is exactly nothing.
  return deltaDeg >= 90 ? 0 : 2 * Math.cos(deltaDeg * radiansPerDegree);
}

/** Which side of a face the wind is on, the angle from its normal, and ψ. */
export interface FaceIncidence {
  /** 'front' when |Δ| < 90°, 'back' when |Δ| > 90°, 'edge' at exactly 90°. */
  side: 'front' | 'back' | 'edge';
  /** δ, degrees from the normal of the windward side (0..90). */
  deltaDeg: number;
  share: number;
}

/** Incidence of relative wind θ on a face looking toward φ: Δ = θ − φ wrapped to (−180°, 180°]. */
export function faceIncidence(directionDeg: number, faceFacingDeg: number): FaceIncidence {
  const delta = Math.abs(wrappedDeg(directionDeg - faceFacingDeg));
  if (delta === 90) return { side: 'edge', deltaDeg: 90, share: 0 };
  const deltaDeg = delta < 90 ? delta : 180 - delta;
  return { side: delta < 90 ? 'front' : 'back', deltaDeg, share: obliqueShare(deltaDeg) };
}

/** Outward normal of a face's front side in plan, (x, y). */
export function faceNormal(faceFacingDeg: number): { x: number; y: number } {
  const radians = faceFacingDeg * radiansPerDegree;
  return { x: -Math.cos(radians), y: Math.sin(radians) };
}

/** The air's travel direction in plan for relative wind θ, (x, y). */
export function travelDirection(directionDeg: number): { x: number; y: number } {
  const radians = directionDeg * radiansPerDegree;
  return { x: Math.cos(radians), y: -Math.sin(radians) };
}

/** The grid assessed for every structure: every 15° (design §2.3: at least that). */
export const directionStepDeg = 15;

/**
 * The directions to assess: every 15° and the exact normal of every face, both sides (design
 * §2.3), the directions 60° off each normal where ψ has its corner and 90° off where the face is
 * edge-on (a review found faces at angles that are not multiples of 15° under-loaded by up to
 * 10 % without them), sorted, without repeats (to 1e-9°).
 */
export function assessedDirectionsDeg(faceFacingsDeg: Iterable<number>): number[] {
  const found = new Map<string, number>();
  const add = (deg: number) => {
    const value = azimuthDeg(deg);
    const rounded = Math.round(value * 1e9) / 1e9;
    found.set(String(rounded === 360 ? 0 : rounded), rounded === 360 ? 0 : rounded);
  };
  for (let deg = 0; deg < 360; deg += directionStepDeg) add(deg);
  for (const facing of faceFacingsDeg) {
    // The face's normals, the corners of ψ (60° off each normal) where a face's share starts to
    // fall, and edge-on (90° off) where its force changes side: between such points every face
    // force is constant or a cosine of θ.
    for (const offset of [0, 60, 90, 120, 180, 240, 270, 300]) add(facing + offset);
  }
  return [...found.values()].sort((a, b) => a - b);
}

/** A sector of relative directions: within `halfWidthDeg` of `centreDeg` (bounds included). */
export interface DirectionSector {
  centreDeg: number;
  halfWidthDeg: number;
}

export function inSector(directionDeg: number, sector: DirectionSector): boolean {
  return Math.abs(wrappedDeg(directionDeg - sector.centreDeg)) <= sector.halfWidthDeg + 1e-9;
}
