/**
 * Parsing and validation of the MQTT reading payload (design.md §3, contract). Pure apart from
 * TextDecoder: bytes in, readings in SI units or a reason out. It never throws on any payload;
 * it throws a RangeError only when the caller's own options are wrong (a programming error).
 *
 * ## Reading payloads (README)
 *
 * A sensor publishes to `<prefix>/<sensorKey>/reading`. The payload is one of:
 *
 * 1. A JSON object
 *    `{"ts": <ISO 8601 string or epoch ms>, "speed": <number>, "gust"?: <number>,
 *      "dir"?: <0–360>, "tempC"?: <number>, "pressureHpa"?: <number>, "rh"?: <percent>}`.
 *    `speed` is an instantaneous sample, or the mean when `gust` is also given. Speeds are in the
 *    unit the sensor was registered with (m/s, km/h, kn or mph). `dir` is the direction the wind
 *    blows FROM in degrees clockwise from north (360 is read as 0). Optional fields may be
 *    omitted or null. Any other field rejects the reading (`unknown-field`): a misspelt `gust`
 *    must not turn a mean into a sample. ISO 8601 times need a date, a time and a zone
 *    (`Z` or `±hh:mm`), e.g. `2024-06-01T14:03:07.250+02:00`.
 * 2. A JSON array of such objects (a gateway flushing its buffer after an outage), at most
 *    10 000 elements (for reading objects the 256 KiB limit comes first: about 8 000 with
 *    epoch-ms times; a SenML pack can carry 10 000 records). Each element is judged on its own: good ones are kept, bad ones are
 *    reported one by one with their index and reason.
 * 3. A SenML pack (RFC 8428, JSON): an array whose first record has `bn` or `n`. Our record
 *    names: the resolved name (base name + name, RFC 8428 §4.5.1) ends in one of
 *
 *    | name       | quantity                                 | units accepted (RFC 8428 §12.1)   |
 *    | ---------- | ---------------------------------------- | --------------------------------- |
 *    | `speed`    | wind speed: a sample, or the mean if a `gust` has the same time | `m/s`; none = the sensor's registered unit |
 *    | `gust`     | 3-s gust of a summary                    | `m/s`; none = the registered unit |
 *    | `dir`      | direction the wind blows from            | `deg` (also design.md), `rad`; none = `deg` |
 *    | `temp`     | air temperature                          | `Cel`, `K`; none = `Cel`          |
 *    | `pressure` | air pressure                             | `Pa`; none = `Pa`                 |
 *    | `rh`       | relative humidity                        | `%RH`; none = `%RH`               |
 *
 *    "Ends in" means the whole name, or the part after the last `:`, `/` or `.`:
 *    `urn:dev:mac:0024befffe804ff1:speed`, `mast-3/gust` and `dir` all match; `windspeed` and
 *    `max-speed` do not. Records with other names (battery, signal...) are ignored. Base fields
 *    `bn`, `bt`, `bu`, `bv` apply as RFC 8428 §4.1 says; times are seconds, `bt + t`, and a
 *    resolved time below 2^28 is relative to the time of receipt (RFC 8428 §4.5.3; no time at
 *    all means "now"). Records whose resolved times are equal (to the millisecond) form one
 *    reading; each reading needs exactly one `speed`. A label ending in `_` that we do not know
 *    rejects the pack (must-understand, RFC 8428 §4.4).
 * 4. A bare JSON number: a speed sample, in the registered unit, at the time of receipt.
 *
 * Limits: payload at most 256 KiB (checked before decoding), valid UTF-8, JSON nesting at most
 * 8 deep (our forms need 2). Plausible values, after unit conversion: 0 ≤ speed ≤ 120 m/s and
 * 0 ≤ gust ≤ 120 m/s (design.md §3); direction 0–360°; temperature −60…+60 °C; pressure
 * 500–1100 hPa (sea-level highs and sites up to about 5 km, generous); humidity 0–100 %.
 * Timestamps at most 5 minutes ahead of receipt (design.md §3) and at most 7 days behind it:
 * a gateway's buffer flushed after a long outage during a build week still counts, older stamps
 * are clocks reset to 1970 or epoch seconds sent as milliseconds (engineering judgement).
 *
 * ## Where each part lives (design §5 v2: payload formats, one file each)
 *
 * This file checks the bytes (size, UTF-8, JSON nesting), parses the JSON and hands it to its form,
 * recognised by shape: forms 1 and 2 in payloads/readingObject.ts, form 3 in payloads/senml.ts,
 * form 4 in payloads/bareNumber.ts. What a payload gives (readings, reasons, the result types) is
 * payloads/parseResult.ts; the value checks and limits every form shares are payloads/valueChecks.ts.
 */
import { isSpeedUnit } from '../engine/units.ts';
import { bareNumberReading } from './payloads/bareNumber.ts';
import { bad, failure, single, type ParseOptions, type ParseResult } from './payloads/parseResult.ts';
import { objectBatch, objectReading } from './payloads/readingObject.ts';
import { isSenmlPack, senmlReadings } from './payloads/senml.ts';
import { clip, describeJsonType, isPlainObject } from './payloads/valueChecks.ts';

export {
  rejectReasons,
  type ParseOptions,
  type ParseResult,
  type Reading,
  type RejectReason,
  type RejectedReading,
} from './payloads/parseResult.ts';
export { maxAgeMs, maxFutureMs, maxPressurePa, maxSpeedMps, maxTempC, minPressurePa, minTempC } from './payloads/valueChecks.ts';

export const maxPayloadBytes = 262_144;
export const maxNestingDepth = 8;
export const maxBatchElements = 10_000;

const decoder = new TextDecoder('utf-8', { fatal: true });

/**
 * Readings from one MQTT payload, or why it was rejected.
 *
 * @example
 * const parsed = parseReadingPayload(message, { receivedAtMs: Date.now(), unit: 'kn' });
 * if (parsed.ok) for (const r of parsed.readings) store(r);
 * else countRejection(parsed.reason, parsed.detail);
 */
export function parseReadingPayload(payload: Uint8Array, options: ParseOptions): ParseResult {
  if (!Number.isFinite(options.receivedAtMs)) {
    throw new RangeError(`parseReadingPayload: receivedAtMs must be finite epoch ms, got ${options.receivedAtMs}`);
  }
  if (!isSpeedUnit(options.unit)) {
    throw new RangeError(`parseReadingPayload: unit must be one of m/s, km/h, kn, mph, got ${JSON.stringify(options.unit)}`);
  }
  if (!(payload instanceof Uint8Array)) return failure(bad('wrong-shape', 'payload is not a byte array'));
  if (payload.byteLength > maxPayloadBytes) {
    return failure(bad('too-large', `payload is ${payload.byteLength} bytes; at most ${maxPayloadBytes} are accepted`));
  }
  let text: string;
  try {
    text = decoder.decode(payload);
  } catch {
    // The only failure of a fatal decoder on a byte array is invalid UTF-8.
    return failure(bad('bad-utf8', 'payload is not valid UTF-8'));
  }
  if (text.trim() === '') return failure(bad('empty', 'payload is empty'));
  if (nestingDepthBeyond(text, maxNestingDepth)) return failure(bad('too-deep', `JSON is nested more than ${maxNestingDepth} levels deep`));
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    return failure(bad('not-json', `payload is not JSON (${clip(message, 120)}): ${clip(JSON.stringify(text), 60)}`));
  }

  if (typeof json === 'number') return single(bareNumberReading(json, options));
  if (Array.isArray(json)) {
    if (json.length === 0) return failure(bad('wrong-shape', 'payload is an empty array'));
    if (json.length > maxBatchElements) {
      return failure(bad('batch-too-large', `array has ${json.length} elements; at most ${maxBatchElements} are accepted`));
    }
    if (isSenmlPack(json)) return senmlReadings(json, options);
    return objectBatch(json, options);
  }
  if (isPlainObject(json)) return single(objectReading(json, options));
  return failure(bad('wrong-shape', `payload is ${describeJsonType(json)}; expected a reading object, an array, a SenML pack or a number`));
}

// ---------------------------------------------------------------------------------------------
// The bytes before the JSON

/** True as soon as the JSON text opens more than `limit` arrays/objects at once. */
function nestingDepthBeyond(text: string, limit: number): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) {
      inString = true;
    } else if (c === 0x5b || c === 0x7b) {
      if (++depth > limit) return true;
    } else if (c === 0x5d || c === 0x7d) {
      depth--;
    }
  }
  return false;
}
