/**
 * Form 4 of the reading payload (ingest/payload.ts): a bare JSON number, a speed sample in the
 * sensor's registered unit at the time of receipt.
 */
import { isBad, type Bad, type ParseOptions, type Reading } from './parseResult.ts';
import { speedFrom } from './valueChecks.ts';

export function bareNumberReading(value: number, options: ParseOptions): Reading | Bad {
  const speedMps = speedFrom(value, 'speed (bare number)', options.unit);
  if (isBad(speedMps)) return speedMps;
  return { tsMs: options.receivedAtMs, speedMps, gustMps: null, dirDeg: null, tempC: null, pressurePa: null, rhPct: null };
}
