/**
 * Dynamic (velocity) pressure q = ½ ρ v² and its inverse. Every wind load in the engine is a
 * coefficient times an area times q (EN 1991-1-4 expression 5.3 with c_s c_d = 1).
 */

/** q in Pa of air of density `airDensityKgM3` moving at `speedMps`. */
export function dynamicPressurePa(speedMps: number, airDensityKgM3: number): number {
  return 0.5 * airDensityKgM3 * speedMps * speedMps;
}

/** The speed in m/s at which air of density `airDensityKgM3` has dynamic pressure `qPa` (Infinity stays Infinity). */
export function speedForDynamicPressureMps(qPa: number, airDensityKgM3: number): number {
  return Math.sqrt((2 * qPa) / airDensityKgM3);
}
