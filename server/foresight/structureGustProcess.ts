/**
 * A sensor's U, σ and ν carried to a structure's height by the same transfer as the gust
 * (design.md 2.2 and 2.7): the measured gust is multiplied by the height factor f of engine
 * `gustHeightFactor` (√ of the ratio of EN 1991-1-4 peak velocity pressures, expression 4.8, with
 * its z_min rules), so the whole 3-s mean speed is scaled by f: U and σ by f, ν unchanged (a rate
 * in time). The expected peak at the structure is then f times the sensor's, and the chance of the
 * structure's gust reaching x is the chance of the sensor's reaching x / f — the figures agree
 * with the gust the board shows at the structure.
 *
 * The factor is the caller's: the watch already has it per sensor and structure (watch/watch.ts
 * splits it into a sensor part and a structure part), so this module takes a number rather than
 * computing it again. For one pair, `gustHeightFactor({ fromHeightM, toHeightM, terrainCategory,
 * allowReduction })` from server/engine gives it.
 */
import { assertAbove } from '../engine/rangeCheck.ts';
import type { GustProcess } from './chance.ts';

/**
 * U and σ times `heightFactor` (> 0, ≤ 20), ν as it is.
 *
 * @example structureGustProcess({ meanMps: 10, sigmaMps: 2, upcrossingRateHz: 0.2 }, 1.1) // { meanMps: 11, sigmaMps: 2.2, upcrossingRateHz: 0.2 }
 */
export function structureGustProcess(wind: GustProcess, heightFactor: number): GustProcess {
  assertAbove('structureGustProcess', 'heightFactor', heightFactor, 0, 20);
  return { meanMps: wind.meanMps * heightFactor, sigmaMps: wind.sigmaMps * heightFactor, upcrossingRateHz: wind.upcrossingRateHz };
}
