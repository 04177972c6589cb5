/**
 * Forms 1 and 2 of the reading payload (ingest/payload.ts): a JSON reading object
 * `{"ts", "speed", "gust"?, "dir"?, "tempC"?, "pressureHpa"?, "rh"?}`, and a JSON array of them
 * (a gateway flushing its buffer), each element judged on its own. Any other field rejects the
 * reading (`unknown-field`): a misspelt `gust` must not turn a mean into a sample.
 */
import { isoInstantMs } from '../../formats/isoDateTime.ts';
import { bad, batchResult, isBad, type Bad, type ParseOptions, type ParseResult, type Reading, type RejectedReading } from './parseResult.ts';
import {
  describeJsonType,
  directionDeg,
  inRange,
  isFiniteNumber,
  isPlainObject,
  maxPressurePa,
  maxTempC,
  minPressurePa,
  minTempC,
  notANumber,
  show,
  clip,
  speedFrom,
  timeWindowProblem,
} from './valueChecks.ts';

const objectFields = new Set(['ts', 'speed', 'gust', 'dir', 'tempC', 'pressureHpa', 'rh']);

export function objectBatch(elements: unknown[], options: ParseOptions): ParseResult {
  const readings: Reading[] = [];
  const rejected: RejectedReading[] = [];
  elements.forEach((element, index) => {
    const result = isPlainObject(element)
      ? objectReading(element, options)
      : bad('wrong-shape', `element is ${describeJsonType(element)}; expected a reading object`);
    if (isBad(result)) rejected.push({ index, reason: result.reason, detail: result.detail });
    else readings.push(result);
  });
  return batchResult(readings, rejected, true);
}

export function objectReading(obj: Record<string, unknown>, options: ParseOptions): Reading | Bad {
  for (const key of Object.keys(obj)) {
    if (!objectFields.has(key)) {
      return bad('unknown-field', `field ${clip(JSON.stringify(key), 60)} is not part of a reading (fields: ts, speed, gust, dir, tempC, pressureHpa, rh)`);
    }
  }
  if (obj.ts === undefined || obj.ts === null) return bad('missing-timestamp', 'field "ts" is missing');
  const tsMs = objectTimestampMs(obj.ts);
  if (isBad(tsMs)) return tsMs;
  const when = timeWindowProblem(tsMs, '"ts"', options.receivedAtMs);
  if (when) return when;

  if (obj.speed === undefined || obj.speed === null) return bad('missing-speed', 'field "speed" is missing');
  if (!isFiniteNumber(obj.speed)) return notANumber('"speed"', obj.speed);
  const speedMps = speedFrom(obj.speed, '"speed"', options.unit);
  if (isBad(speedMps)) return speedMps;

  const gust = optionalNumber(obj.gust, '"gust"');
  if (isBad(gust)) return gust;
  const gustMps = gust === null ? null : speedFrom(gust, '"gust"', options.unit);
  if (isBad(gustMps)) return gustMps;

  const dir = optionalNumber(obj.dir, '"dir"');
  if (isBad(dir)) return dir;
  const dirDeg = dir === null ? null : directionDeg(dir, '"dir"', `${dir}`);
  if (isBad(dirDeg)) return dirDeg;

  const temp = optionalNumber(obj.tempC, '"tempC"');
  if (isBad(temp)) return temp;
  const tempC = temp === null ? null : inRange(temp, minTempC, maxTempC, '"tempC"', '°C');
  if (isBad(tempC)) return tempC;

  const pressureHpa = optionalNumber(obj.pressureHpa, '"pressureHpa"');
  if (isBad(pressureHpa)) return pressureHpa;
  const pressure = pressureHpa === null ? null : inRange(pressureHpa, minPressurePa / 100, maxPressurePa / 100, '"pressureHpa"', 'hPa');
  if (isBad(pressure)) return pressure;

  const rh = optionalNumber(obj.rh, '"rh"');
  if (isBad(rh)) return rh;
  const rhPct = rh === null ? null : inRange(rh, 0, 100, '"rh"', '%');
  if (isBad(rhPct)) return rhPct;

  return { tsMs, speedMps, gustMps, dirDeg, tempC, pressurePa: pressure === null ? null : pressure * 100, rhPct };
}

function optionalNumber(value: unknown, field: string): number | null | Bad {
  if (value === undefined || value === null) return null;
  if (!isFiniteNumber(value)) return notANumber(field, value);
  return value;
}

/** ts as epoch ms (a JSON number, fractions of a ms dropped) or an ISO 8601 string. */
function objectTimestampMs(value: unknown): number | Bad {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) return bad('bad-timestamp', `"ts" ${show(value)} is not a finite number of epoch ms`);
    return Math.floor(value);
  }
  if (typeof value === 'string') return isoTimestampMs(value);
  return bad('bad-timestamp', `"ts" ${show(value)} must be an ISO 8601 date-time string or epoch milliseconds`);
}

/**
 * An ISO 8601 / RFC 3339 date-time with an explicit zone, in epoch ms (sub-ms digits dropped), read
 * by formats/isoDateTime.ts. Date.parse is not used: it accepts many non-ISO forms and reads a
 * zone-less time as local.
 */
function isoTimestampMs(text: string): number | Bad {
  const read = isoInstantMs(text);
  if (read.ok) return read.value;
  if (read.problem === 'form') {
    return bad('bad-timestamp', `"ts" ${show(text)} is not an ISO 8601 date-time with a zone, e.g. 2024-06-01T14:03:07Z or 2024-06-01T16:03:07+02:00`);
  }
  return bad('bad-timestamp', `"ts" ${show(text)} is not a valid date-time`);
}
