/**
 * Force coefficient of a flat board: a banner, a mesh scrim, a screen, a hoarding (design §2.3).
 *
 * Rule (conservative, on the GROSS area b·h, solidity applied once, in the coefficient):
 *   c_f = c_f,solid · k(φ),  k(φ) = 1 − (1 − φ)^1.5
 * - c_f,solid: EN 1991-1-4 §7.4.3 signboard 1.80 when raised (z_g > h/4) or narrow (b/h ≤ 1);
 *   otherwise the board stands on the ground as a boundary wall (§7.4.1): the Table 7.9
 *   c_p,net (φ = 1, no return corners) averaged over zones A–D along its length, not below 1.80.
 * - k(φ): the reduction ASCE 7-16 ch. 29 allows for signs with openings. Applied at every
 *   solidity, it stays at or above the other published rules, which is why it was chosen:
 *   · φ < 0.7 (ASCE open signs, C_f 1.6–2.0 on the solid area φ·b·h): 1.80·k(φ) ≥ 2.0·φ,
 *     since k(φ)/φ falls from 1.5 at φ → 0 to 1.14 at φ = 0.8;
 *   · φ < 0.8 (EN §7.11 plane lattice, c_f,0 on the solid area, at most about 2.0 — from memory):
 *     the same bound;
 *   · 0.8 ≤ φ ≤ 1 on the ground: above EN Table 7.9 interpolated to φ (1.2 at φ = 0.8).
 * The total force of a rigid board is the integral of c_p,net, so the zone mean is the right
 * measure for the stability of the whole run. The end zones load the panels at a free end more
 * than the average: `freeStandingWallStretchCpNet` gives the Table 7.9 mean over any stretch of
 * the run (the banner kind's end-panel element, design §2.4 v2).
 */
import { assertAbove, assertInRange } from '../rangeCheck.ts';
import { defaultCoefficients, type SourcedValue } from './coefficients.ts';

export const wallZones = ['A', 'B', 'C', 'D'] as const;
export type WallZone = (typeof wallZones)[number];

/** Zone bounds from each free end, in multiples of the wall height h (EN 1991-1-4 Fig. 7.19). */
const zoneEndsInHeights: Readonly<Record<WallZone, number>> = { A: 0.3, B: 2, C: 4, D: Infinity };

/** EN 1991-1-4 Table 7.9, φ = 1 without return corners: c_p,net of zones A–D by l/h. */
const solidWallRows: ReadonlyArray<{ lengthToHeight: number; cpNet: Readonly<Record<WallZone, number>> }> = [
  { lengthToHeight: 3, cpNet: { A: 2.3, B: 1.4, C: 1.2, D: 1.2 } },
  { lengthToHeight: 5, cpNet: { A: 2.9, B: 1.8, C: 1.4, D: 1.2 } },
  { lengthToHeight: 10, cpNet: { A: 3.4, B: 2.1, C: 1.7, D: 1.2 } },
];
/** EN 1991-1-4 Table 7.9, φ = 0.8: 1.2 in every zone. */
const porousWallCpNet = 1.2;

/** Table 7.9 c_p,net of a solid wall (φ = 1) in one zone, linear in l/h between the rows (clamped). */
function solidWallCpNet(zone: WallZone, lengthToHeight: number): number {
  const first = solidWallRows[0]!;
  const last = solidWallRows[solidWallRows.length - 1]!;
  if (lengthToHeight <= first.lengthToHeight) return first.cpNet[zone];
  if (lengthToHeight >= last.lengthToHeight) return last.cpNet[zone];
  let index = 1;
  while (solidWallRows[index]!.lengthToHeight < lengthToHeight) index++;
  const lower = solidWallRows[index - 1]!;
  const upper = solidWallRows[index]!;
  const t = (lengthToHeight - lower.lengthToHeight) / (upper.lengthToHeight - lower.lengthToHeight);
  return lower.cpNet[zone] + t * (upper.cpNet[zone] - lower.cpNet[zone]);
}

/**
 * EN 1991-1-4 Table 7.9 c_p,net of a free-standing wall without return corners, zone `zone`, at
 * length/height `lengthToHeight`, solidity 0.8 ≤ φ ≤ 1 (linear in l/h and in φ). Below 0.8 the
 * wall is a plane lattice (§7.11) and this throws.
 */
export function freeStandingWallCpNet(zone: WallZone, lengthToHeight: number, solidity = 1): number {
  assertInRange('freeStandingWallCpNet', 'lengthToHeight', lengthToHeight, 0, 1000);
  assertInRange('freeStandingWallCpNet', 'solidity', solidity, 0.8, 1);
  const solidCpNet = solidWallCpNet(zone, lengthToHeight);
  return porousWallCpNet + ((solidity - 0.8) / 0.2) * (solidCpNet - porousWallCpNet);
}

/**
 * Mean c_p,net of a solid free-standing wall (φ = 1) over its whole length, zones counted from
 * both free ends (the nearer end decides): (2/l)∫₀^{l/2} c_p,net(s) ds, in multiples of h.
 */
export function freeStandingWallMeanCpNet(lengthToHeight: number): number {
  assertAbove('freeStandingWallMeanCpNet', 'lengthToHeight', lengthToHeight, 0, 1000);
  const halfLength = lengthToHeight / 2;
  let zoneStart = 0;
  let integral = 0;
  for (const zone of wallZones) {
    const zoneEnd = Math.min(zoneEndsInHeights[zone], halfLength);
    if (zoneEnd > zoneStart) integral += (zoneEnd - zoneStart) * solidWallCpNet(zone, lengthToHeight);
    zoneStart = Math.max(zoneStart, zoneEnd);
  }
  return integral / halfLength;
}

/** The Table 7.9 zone at a distance from the nearer free end, in multiples of the wall height h. */
export function wallZoneAt(distanceInHeights: number): WallZone {
  assertInRange('wallZoneAt', 'distanceInHeights', distanceInHeights, 0, Infinity);
  return wallZones.find((zone) => distanceInHeights < zoneEndsInHeights[zone]) ?? 'D';
}

/** A stretch of a free-standing wall, from `fromM` to `toM` measured along it from one free end. */
export interface WallStretch {
  /** Length of the whole wall l, m. */
  lengthM: number;
  /** Height of the wall h, m. */
  heightM: number;
  fromM: number;
  toM: number;
  /** Solidity φ, 0.8..1 (default 1). */
  solidity?: number;
}

/**
 * Mean EN 1991-1-4 Table 7.9 c_p,net (no return corners) over a stretch of a free-standing wall:
 * (1/(to − from)) ∫ c_p,net(s) ds, the zone at each point counted from the NEARER free end
 * (A 0–0.3h, B 0.3h–2h, C 2h–4h, D beyond), every zone's value taken at the wall's own l/h and
 * solidity (linear in l/h and in φ between 0.8 and 1, references §1). Exact: c_p,net is piecewise
 * constant, so the integral is a sum over the zone boundaries inside the stretch.
 */
export function freeStandingWallStretchCpNet({ lengthM, heightM, fromM, toM, solidity = 1 }: WallStretch): number {
  const caller = 'freeStandingWallStretchCpNet';
  assertAbove(caller, 'lengthM', lengthM, 0, 1000, 'm');
  assertAbove(caller, 'heightM', heightM, 0, 1000, 'm');
  assertInRange(caller, 'fromM', fromM, 0, lengthM, 'm (within the wall)');
  assertInRange(caller, 'toM', toM, fromM, lengthM, 'm (from fromM to the wall\'s length)');
  assertInRange(caller, 'solidity', solidity, 0.8, 1);
  if (toM === fromM) throw new RangeError(`${caller}: toM must be > fromM (${fromM} m), got ${toM}`);
  const lengthToHeight = lengthM / heightM;
  const boundariesM = [fromM, toM, lengthM / 2];
  for (const zone of wallZones) {
    const endM = zoneEndsInHeights[zone] * heightM;
    if (Number.isFinite(endM)) boundariesM.push(endM, lengthM - endM);
  }
  const points = [...new Set(boundariesM.filter((pointM) => pointM >= fromM && pointM <= toM))].sort((a, b) => a - b);
  let integral = 0;
  for (let index = 1; index < points.length; index++) {
    const startM = points[index - 1]!;
    const endM = points[index]!;
    const middleM = (startM + endM) / 2;
    const zone = wallZoneAt(Math.min(middleM, lengthM - middleM) / heightM);
    integral += (endM - startM) * freeStandingWallCpNet(zone, lengthToHeight, solidity);
  }
  return integral / (toM - fromM);
}

/** k(φ) = 1 − (1 − φ)^1.5: ASCE 7-16 ch. 29 reduction of C_f for openings (ε = φ = solid/gross). */
export function solidityFactor(solidity: number): number {
  assertInRange('solidityFactor', 'solidity', solidity, 0, 1);
  return 1 - (1 - solidity) ** 1.5;
}

export interface Board {
  widthM: number;
  heightM: number;
  /** Gap between the ground and the bottom edge, z_g, m. */
  clearanceM: number;
  /** Solid area / gross area, 0..1 (1 for a solid board, about 0.3–0.7 for mesh). */
  solidity: number;
}

const solidityFactorSource =
  'ASCE 7-16 ch. 29 reduction for openings 1 − (1 − φ)^1.5, applied at every solidity: conservative against the ' +
  'ASCE open-sign C_f, EN Table 7.9 at φ 0.8 and EN §7.11 plane lattices (c_f,0 about 2.0 on the solid area, from memory)';

/** Force coefficient c_f,solid of the board as if it had no openings (see the module comment). */
export function solidBoardCoefficient({ widthM, heightM, clearanceM }: Omit<Board, 'solidity'>): SourcedValue {
  const lengthToHeight = widthM / heightM;
  if (clearanceM > heightM / 4 || lengthToHeight <= 1) return defaultCoefficients.signboard;
  const wallMean = freeStandingWallMeanCpNet(lengthToHeight);
  return {
    value: Math.max(defaultCoefficients.signboard.value, wallMean),
    source:
      `EN 1991-1-4 §7.4.3 → §7.4.1 (on the ground, z_g ≤ h/4 and b/h > 1): Table 7.9 c_p,net (φ = 1, no return ` +
      `corners) averaged over zones A–D along the length at l/h = ${lengthToHeight.toFixed(2)} gives ${wallMean.toFixed(3)}; ` +
      `not taken below the signboard value 1.80`,
  };
}

/** Force coefficient of the board on its GROSS area b·h, solidity included (see the module comment). */
export function boardForceCoefficient(board: Board): SourcedValue {
  const solid = solidBoardCoefficient(board);
  if (board.solidity === 1) return solid;
  const factor = solidityFactor(board.solidity);
  return {
    value: solid.value * factor,
    source: `${solid.source}; × ${factor.toFixed(4)} for solidity ${board.solidity} (${solidityFactorSource}); on the gross area`,
  };
}
