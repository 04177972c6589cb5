/**
 * Test readings for the wind state: an invented afternoon at an invented showground, times in
 * epoch ms from a fixed start so that every check is reproducible.
 */
import { acceptReading, type SensorWindState, type WindReading } from '../../../server/wind/index.ts';

/** 2024-06-01 12:00:00 UTC, the start of every series (a whole second). */
export const t0Ms = Date.UTC(2024, 5, 1, 12, 0, 0);

export function rawSample(tsMs: number, speedMps: number, dirDeg: number | null = null): WindReading {
  return { tsMs, speedMps, gustMps: null, dirDeg, tempC: null, pressurePa: null, rhPct: null };
}

export function summary(tsMs: number, meanMps: number, gustMps: number, dirDeg: number | null = null): WindReading {
  return { tsMs, speedMps: meanMps, gustMps, dirDeg, tempC: null, pressurePa: null, rhPct: null };
}

/** Feeds readings received the moment they were taken; returns what acceptReading returned. */
export function feed(state: SensorWindState, readings: readonly WindReading[]): (number | string)[] {
  return readings.map((reading) => acceptReading(state, reading, reading.tsMs));
}

/** Regular samples every intervalMs from startMs, speeds from speedAt(i). */
export function regularSamples(startMs: number, intervalMs: number, count: number, speedAt: (i: number) => number, dirAt?: (i: number) => number | null): WindReading[] {
  return Array.from({ length: count }, (_, i) => rawSample(startMs + i * intervalMs, speedAt(i), dirAt ? dirAt(i) : null));
}

/** Deterministic pseudo-random numbers in [0, 1) (mulberry32), so failures reproduce. */
export { seededRandom } from '../../../server/demo/random.ts';

/** Smallest angle between two compass directions, degrees. */
export function angleBetweenDeg(aDeg: number, bDeg: number): number {
  const d = Math.abs(aDeg - bDeg) % 360;
  return d > 180 ? 360 - d : d;
}
