/**
 * What reading a payload gives, whatever its form: readings in SI units, or the reason it was
 * rejected (every reason the contract knows, `rejectReasons`), and for a batch the readings
 * rejected one by one. The forms (payloads/*.ts) build their results here, so every form sorts,
 * reports and fails the same way. The payload contract itself is described in ingest/payload.ts.
 */
import type { SpeedUnit } from '../../engine/units.ts';
import type { WindReading } from '../../wind/index.ts';

/** Every reason a payload or one of its readings is rejected. */
export const rejectReasons = [
  /** Payload larger than maxPayloadBytes. */
  'too-large',
  /** Nothing but whitespace. */
  'empty',
  /** Not valid UTF-8. */
  'bad-utf8',
  /** Not valid JSON. */
  'not-json',
  /** JSON nested deeper than maxNestingDepth. */
  'too-deep',
  /** Valid JSON of a form we do not take (a string, null, an object inside a batch...). */
  'wrong-shape',
  /** An array of more than maxBatchElements elements or records. */
  'batch-too-large',
  /** A JSON reading object with a field that is not part of the contract. */
  'unknown-field',
  /** A JSON reading object without `ts`. */
  'missing-timestamp',
  /** A timestamp that is neither a valid ISO 8601 date-time with zone nor epoch ms. */
  'bad-timestamp',
  /** A timestamp more than maxFutureMs ahead of receipt. */
  'future-timestamp',
  /** A timestamp more than maxAgeMs behind receipt. */
  'too-old',
  /** No speed in a reading. */
  'missing-speed',
  /** A value that is not a finite JSON number. */
  'not-a-number',
  /** A number outside its plausible range. */
  'out-of-range',
  /** A direction outside 0–360°. */
  'bad-direction',
  /** A SenML pack that breaks RFC 8428 (field types, names, must-understand labels, version). */
  'bad-senml',
  /** A SenML record of ours in a unit we do not take for its quantity. */
  'bad-senml-unit',
  /** Two SenML records of the same quantity at the same time. */
  'duplicate-field',
] as const;
export type RejectReason = (typeof rejectReasons)[number];

/** One reading in SI units; null where the payload said nothing: what the wind state takes. */
export type Reading = WindReading;

/** A reading of a batch that was rejected on its own; index is the array element or record. */
export interface RejectedReading {
  readonly index: number;
  readonly reason: RejectReason;
  readonly detail: string;
}

export type ParseResult =
  | {
      readonly ok: true;
      /** In time order. */
      readonly readings: readonly Reading[];
      /** The payload carried several readings (a JSON array, or a SenML pack with several times). */
      readonly batch: boolean;
      /** Readings of a batch rejected one by one (empty otherwise). */
      readonly rejected: readonly RejectedReading[];
    }
  | {
      readonly ok: false;
      readonly reason: RejectReason;
      /** For people: names the field and the value. */
      readonly detail: string;
      /** When every reading of a batch was rejected: each of them (else empty). */
      readonly rejected: readonly RejectedReading[];
    };

export interface ParseOptions {
  /** When the message arrived (epoch ms): the time of a bare number, "now" for SenML. */
  receivedAtMs: number;
  /** The unit the sensor was registered with, for speeds given without one. */
  unit: SpeedUnit;
}

/** A reason to reject a payload or one reading, as the forms pass it on until the result is built. */
export type Bad = { readonly bad: true; readonly reason: RejectReason; readonly detail: string };
export const bad = (reason: RejectReason, detail: string): Bad => ({ bad: true, reason, detail });
export const isBad = (value: unknown): value is Bad => typeof value === 'object' && value !== null && (value as Bad).bad === true;

export const noRejections: readonly RejectedReading[] = Object.freeze([]);

// ---------------------------------------------------------------------------------------------
// Results

export function failure(why: Bad, rejected: readonly RejectedReading[] = noRejections): ParseResult {
  return { ok: false, reason: why.reason, detail: why.detail, rejected };
}

export function single(result: Reading | Bad): ParseResult {
  if (isBad(result)) return failure(result);
  return { ok: true, readings: [result], batch: false, rejected: noRejections };
}

export function batchResult(readings: Reading[], rejected: RejectedReading[], batch: boolean): ParseResult {
  if (readings.length === 0) {
    const first = rejected[0];
    if (first === undefined) return failure(bad('missing-speed', 'payload holds no reading'));
    const more = rejected.length > 1 ? `all ${rejected.length} readings rejected; first ` : '';
    return { ok: false, reason: first.reason, detail: `${more}at index ${first.index}: ${first.detail}`, rejected };
  }
  // Stable sort: equal times keep their payload order.
  readings.sort((a, b) => a.tsMs - b.tsMs);
  return { ok: true, readings, batch, rejected: rejected.length === 0 ? noRejections : rejected };
}
