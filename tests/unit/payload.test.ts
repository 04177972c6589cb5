import { describe, expect, it } from 'vitest';
import {
  maxPayloadBytes,
  parseReadingPayload,
  rejectReasons,
  type ParseResult,
  type Reading,
  type RejectReason,
} from '../../server/ingest/payload.ts';
import type { SpeedUnit } from '../../server/engine/units.ts';
import { acceptReading, createSensorWindState, windSnapshot, type WindReading } from '../../server/wind/index.ts';
import { seededRandom } from './wind/windReadings.ts';

/** Receipt time of every message: 2024-06-01 12:00:00 UTC (an invented event day). */
const nowMs = Date.UTC(2024, 5, 1, 12, 0, 0);
const nowS = nowMs / 1000;

function parse(payload: string | Uint8Array, unit: SpeedUnit = 'm/s', receivedAtMs = nowMs): ParseResult {
  const bytes = typeof payload === 'string' ? new TextEncoder().encode(payload) : payload;
  return parseReadingPayload(bytes, { receivedAtMs, unit });
}

function readingsOf(result: ParseResult): readonly Reading[] {
  if (!result.ok) throw new Error(`expected readings, got ${result.reason}: ${result.detail}`);
  return result.readings;
}

function only(result: ParseResult): Reading {
  const readings = readingsOf(result);
  expect(readings).toHaveLength(1);
  return readings[0]!;
}

const sample = (fields: Partial<Reading>): Reading => ({
  tsMs: nowMs,
  speedMps: 0,
  gustMps: null,
  dirDeg: null,
  tempC: null,
  pressurePa: null,
  rhPct: null,
  ...fields,
});

describe('form 1: a JSON reading object (design.md §3)', () => {
  it('takes every field of the contract: speed with gust is a summary; pressure hPa → Pa; dir 360 is north (0)', () => {
    const reading = only(parse('{"ts":"2024-06-01T11:59:58Z","speed":8.4,"gust":13.1,"dir":360,"tempC":17.5,"pressureHpa":1013.25,"rh":62}'));
    expect(reading).toEqual(sample({ tsMs: nowMs - 2000, speedMps: 8.4, gustMps: 13.1, dirDeg: 0, tempC: 17.5, pressurePa: 101_325, rhPct: 62 }));
  });

  it('a speed without gust is an instantaneous sample; optional fields may be null or absent', () => {
    expect(only(parse(`{"ts":${nowMs - 250},"speed":6,"gust":null,"dir":null}`))).toEqual(sample({ tsMs: nowMs - 250, speedMps: 6 }));
  });

  it('reads ISO 8601 with an offset and fractions of a second (ISO 8601 / RFC 3339 §5.6): sub-ms digits are dropped', () => {
    expect(only(parse('{"ts":"2024-06-01T13:59:58.5+02:00","speed":1}')).tsMs).toBe(Date.UTC(2024, 5, 1, 11, 59, 58, 500));
    expect(only(parse('{"ts":"2024-06-01T11:59:58.123456Z","speed":1}')).tsMs).toBe(Date.UTC(2024, 5, 1, 11, 59, 58, 123));
    expect(only(parse('{"ts":"2024-06-01t07:29:00-04:30","speed":1}')).tsMs).toBe(Date.UTC(2024, 5, 1, 11, 59, 0));
  });

  it('reads epoch milliseconds', () => {
    expect(only(parse(`{"ts":${nowMs - 60_000},"speed":1}`)).tsMs).toBe(nowMs - 60_000);
  });

  it('accepts a timestamp exactly 5 minutes ahead of receipt (design.md §3) and exactly 7 days behind', () => {
    expect(only(parse(`{"ts":${nowMs + 300_000},"speed":1}`)).tsMs).toBe(nowMs + 300_000);
    expect(only(parse(`{"ts":${nowMs - 7 * 86_400_000},"speed":1}`)).tsMs).toBe(nowMs - 7 * 86_400_000);
  });
});

describe('speed units at the edge (references.md §9: exact definitions; design.md §3: 0–120 m/s)', () => {
  it('1 knot = 1852/3600 m/s (BIPM SI brochure, table 8): 10 kn = 5.1444… m/s', () => {
    expect(only(parse(`{"ts":${nowMs},"speed":10,"gust":20}`, 'kn'))).toMatchObject({ speedMps: 18_520 / 3600, gustMps: 37_040 / 3600 });
  });

  it('1 mph = 0.44704 m/s (international yard and pound, 1959): 10 mph = 4.4704 m/s', () => {
    expect(only(parse(`{"ts":${nowMs},"speed":10}`, 'mph')).speedMps).toBeCloseTo(4.4704, 12);
  });

  it('1 km/h = 1/3.6 m/s: 36 km/h = 10 m/s', () => {
    expect(only(parse(`{"ts":${nowMs},"speed":36}`, 'km/h')).speedMps).toBeCloseTo(10, 12);
  });

  it('the 120 m/s limit applies after conversion: 432 km/h (= 120 m/s) passes, 432.01 km/h does not', () => {
    expect(only(parse('432', 'km/h')).speedMps).toBeCloseTo(120, 12);
    expect(parse('432.01', 'km/h')).toMatchObject({ ok: false, reason: 'out-of-range' });
  });

  it('233 kn (119.9 m/s) passes, 234 kn (120.4 m/s) does not; 268 mph (119.8 m/s) passes, 269 mph (120.3 m/s) does not', () => {
    expect(parse('233', 'kn').ok).toBe(true);
    expect(parse('234', 'kn')).toMatchObject({ ok: false, reason: 'out-of-range' });
    expect(parse('268', 'mph').ok).toBe(true);
    expect(parse('269', 'mph')).toMatchObject({ ok: false, reason: 'out-of-range' });
  });

  it('the rejection names the field, the converted value and the value as sent', () => {
    const result = parse(`{"ts":${nowMs},"speed":250}`, 'kn');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.detail).toBe('"speed" 128.611 m/s (250 kn) is outside 0–120 m/s');
  });
});

describe('form 2: a JSON array of reading objects (a gateway flushing its buffer, design.md §3)', () => {
  it('keeps good elements in time order, reports bad ones one by one with their index, and marks the batch', () => {
    const result = parse(`[{"ts":${nowMs - 1000},"speed":5},{"ts":${nowMs - 3000},"speed":4},{"ts":"soon","speed":3},{"ts":${nowMs - 2000},"speed":-2},7]`);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.batch).toBe(true);
    expect(result.readings.map((r) => [r.tsMs, r.speedMps])).toEqual([
      [nowMs - 3000, 4],
      [nowMs - 1000, 5],
    ]);
    expect(result.rejected.map((r) => [r.index, r.reason])).toEqual([
      [2, 'bad-timestamp'],
      [3, 'out-of-range'],
      [4, 'wrong-shape'],
    ]);
  });

  it('when every element is bad the payload is rejected with the first reason, and every element is listed', () => {
    const result = parse('[{"speed":5},{"ts":"x","speed":1}]');
    expect(result).toMatchObject({ ok: false, reason: 'missing-timestamp' });
    expect(result.rejected.map((r) => r.reason)).toEqual(['missing-timestamp', 'bad-timestamp']);
  });

  it('the 256 KiB limit is reached before 10 000 reading objects: 8 000 with epoch-ms times fit', () => {
    const elements = Array.from({ length: 8000 }, (_, i) => `{"ts":${nowMs - i},"speed":1}`);
    expect(readingsOf(parse(`[${elements.join(',')}]`))).toHaveLength(8000);
  });
});

describe('form 3: SenML (RFC 8428) with our record names', () => {
  it('a single datapoint shaped like RFC 8428 §5.1.1, without a time, is a sample taken now (§4.5.3)', () => {
    expect(only(parse('[{"n":"urn:dev:ow:10e2073a01080063:speed","u":"m/s","v":7.1}]'))).toEqual(sample({ speedMps: 7.1 }));
  });

  it('multiple datapoints shaped like RFC 8428 §5.1.2: base name + name; speed and gust at one time form one summary', () => {
    const result = parse('[{"bn":"urn:dev:ow:10e2073a01080063:","n":"speed","u":"m/s","v":7.1},{"n":"gust","u":"m/s","v":11.3},{"n":"dir","u":"deg","v":245}]');
    expect(only(result)).toEqual(sample({ speedMps: 7.1, gustMps: 11.3, dirDeg: 245 }));
    expect(result.ok && result.batch).toBe(false);
  });

  it('multiple measurements shaped like RFC 8428 §5.1.3: base time, base unit, version 5, relative record times', () => {
    const pack = [
      { bn: 'urn:dev:ow:10e2073a0108006:', bt: nowS - 10, bu: 'm/s', bver: 5, n: 'speed', v: 6.1 },
      { n: 'speed', t: -5, v: 6.4 },
      { n: 'speed', t: -4, v: 7.2 },
      { n: 'speed', t: -3, v: 6.9 },
      { n: 'temp', u: 'Cel', v: 18.2 },
    ];
    const result = parse(JSON.stringify(pack));
    expect(result.ok && result.batch).toBe(true);
    expect(readingsOf(result).map((r) => [r.tsMs - nowMs, r.speedMps, r.tempC])).toEqual([
      [-15_000, 6.4, null],
      [-14_000, 7.2, null],
      [-13_000, 6.9, null],
      [-10_000, 6.1, 18.2],
    ]);
  });

  it('a resolved time below 2^28 s is relative to receipt (RFC 8428 §4.5.3): t = −10 is 10 s ago', () => {
    expect(only(parse('[{"n":"speed","u":"m/s","v":4,"t":-10}]')).tsMs).toBe(nowMs - 10_000);
  });

  it('converts the registry units (RFC 8428 §12.1): rad → degrees, K → °C; Pa and %RH as they are', () => {
    const pack = [
      { bn: 'mast-3/', n: 'speed', u: 'm/s', v: 5 },
      { n: 'dir', u: 'rad', v: Math.PI / 2 },
      { n: 'temp', u: 'K', v: 293.15 },
      { n: 'pressure', u: 'Pa', v: 99_870 },
      { n: 'rh', u: '%RH', v: 71.5 },
    ];
    const reading = only(parse(JSON.stringify(pack)));
    expect(reading.dirDeg).toBeCloseTo(90, 12);
    expect(reading.tempC).toBeCloseTo(20, 12);
    expect(reading).toMatchObject({ speedMps: 5, pressurePa: 99_870, rhPct: 71.5 });
  });

  it('a full turn of 2π rad is north (0°)', () => {
    expect(only(parse(JSON.stringify([{ n: 'speed', u: 'm/s', v: 5 }, { n: 'dir', u: 'rad', v: 2 * Math.PI }]))).dirDeg).toBe(0);
  });

  it('adds the base value to the value (RFC 8428 §4.1)', () => {
    expect(only(parse('[{"bn":"mast:","bv":5,"n":"speed","u":"m/s","v":1.5}]')).speedMps).toBe(6.5);
  });

  it('a speed without a unit is in the sensor\'s registered unit, like the JSON forms', () => {
    expect(only(parse('[{"n":"speed","v":10}]', 'kn')).speedMps).toBeCloseTo(18_520 / 3600, 12);
  });

  it('ignores records of other quantities (battery, signal) and records that only carry base fields', () => {
    const reading = only(parse('[{"bn":"gw7:mast-2:","bt":' + (nowS - 1) + '},{"n":"battery","u":"V","v":3.61},{"n":"speed","u":"m/s","v":4.4}]'));
    expect(reading).toEqual(sample({ tsMs: nowMs - 1000, speedMps: 4.4 }));
  });

  it('matches our names only as the whole name or after the last : / or . ("windspeed" is not ours)', () => {
    expect(parse('[{"n":"windspeed","u":"m/s","v":4}]')).toMatchObject({ ok: false, reason: 'missing-speed' });
    expect(only(parse('[{"n":"site.mast-1.speed","u":"m/s","v":4}]')).speedMps).toBe(4);
  });

  it('takes 10 000 records at 10 000 times in one pack, and no more', () => {
    const records = (count: number): string =>
      JSON.stringify([{ bn: 'speed', bu: 'm/s', v: 1, t: 0 }, ...Array.from({ length: count - 1 }, (_, i) => ({ v: 1, t: -(i + 1) }))]);
    const result = parse(records(10_000));
    expect(readingsOf(result)).toHaveLength(10_000);
    expect(result.ok && result.batch).toBe(true);
    expect(parse(records(10_001))).toMatchObject({ ok: false, reason: 'batch-too-large' });
  });

  it('rejects a time without speed on its own and keeps the other times', () => {
    const result = parse(JSON.stringify([
      { bn: 'm:', bt: nowS, bu: 'm/s', n: 'speed', v: 5 },
      { n: 'gust', t: -1, v: 9 },
    ]));
    expect(readingsOf(result)).toEqual([sample({ speedMps: 5 })]);
    expect(result.rejected).toMatchObject([{ index: 1, reason: 'missing-speed' }]);
  });
});

describe('form 4: a bare number (design.md §3)', () => {
  it('is a speed sample in the registered unit at the time of receipt', () => {
    const result = parse(' 7.5\n', 'km/h');
    expect(only(result)).toEqual(sample({ speedMps: 7.5 / 3.6 }));
    expect(result.ok && result.batch).toBe(false);
  });
});

describe('limits before parsing', () => {
  it('a payload of exactly 256 KiB is read; one byte more is rejected unread', () => {
    const reading = `{"ts":${nowMs},"speed":3}`;
    const exact = reading + ' '.repeat(maxPayloadBytes - reading.length);
    expect(only(parse(exact)).speedMps).toBe(3);
    expect(parse(exact + ' ')).toMatchObject({ ok: false, reason: 'too-large' });
  });
});

/** One payload per reject reason (and more for some), checked against the exported closed list. */
const rejectCases: [RejectReason, string, string | Uint8Array][] = [
  ['too-large', '256 KiB + 1 byte', 'x'.repeat(maxPayloadBytes + 1)],
  ['empty', 'zero bytes', ''],
  ['empty', 'only whitespace', ' \r\n\t'],
  ['bad-utf8', 'a lone 0xFF byte (RFC 3629: never valid)', new Uint8Array([0x7b, 0xff, 0x7d])],
  ['bad-utf8', 'an overlong encoding C0 80 (RFC 3629 §3)', new Uint8Array([0x22, 0xc0, 0x80, 0x22])],
  ['not-json', 'truncated object', '{"ts":1,'],
  ['not-json', 'NaN is not JSON (RFC 8259 §6)', 'NaN'],
  ['not-json', 'single quotes', "{'speed':1}"],
  ['too-deep', 'nine levels of arrays', '[[[[[[[[[1]]]]]]]]]'],
  ['wrong-shape', 'a JSON string', '"7"'],
  ['wrong-shape', 'true', 'true'],
  ['wrong-shape', 'null', 'null'],
  ['wrong-shape', 'an empty array', '[]'],
  ['wrong-shape', 'an array of arrays', '[[1]]'],
  ['batch-too-large', '10 001 elements', `[${Array(10_001).fill('0').join(',')}]`],
  ['unknown-field', 'a misspelt gust', `{"ts":${nowMs},"speed":5,"gusts":9}`],
  ['missing-timestamp', 'no ts', '{"speed":5}'],
  ['bad-timestamp', 'ISO without a zone (would be local time)', '{"ts":"2024-06-01T12:00:00","speed":5}'],
  ['bad-timestamp', '30 February', '{"ts":"2024-02-30T12:00:00Z","speed":5}'],
  ['bad-timestamp', 'hour 24', '{"ts":"2024-06-01T24:00:00Z","speed":5}'],
  ['bad-timestamp', 'free text', '{"ts":"yesterday noon","speed":5}'],
  ['bad-timestamp', 'epoch ms as a string', `{"ts":"${nowMs}","speed":5}`],
  ['bad-timestamp', 'a boolean', '{"ts":true,"speed":5}'],
  ['future-timestamp', '5 min + 1 ms ahead of receipt (design.md §3)', `{"ts":${nowMs + 300_001},"speed":5}`],
  ['future-timestamp', 'SenML 301 s ahead', '[{"n":"speed","u":"m/s","v":5,"t":301}]'],
  ['too-old', '7 days + 1 ms behind receipt', `{"ts":${nowMs - 7 * 86_400_000 - 1},"speed":5}`],
  ['too-old', 'epoch seconds sent as ms', `{"ts":${nowS},"speed":5}`],
  ['missing-speed', 'no speed', `{"ts":${nowMs}}`],
  ['missing-speed', 'speed null', `{"ts":${nowMs},"speed":null}`],
  ['missing-speed', 'SenML with only a gust', '[{"n":"gust","u":"m/s","v":9}]'],
  ['not-a-number', 'speed as a string', `{"ts":${nowMs},"speed":"5"}`],
  ['not-a-number', 'gust as a string', `{"ts":${nowMs},"speed":5,"gust":"9"}`],
  ['not-a-number', 'a number beyond double range (1e999 → Infinity)', '1e999'],
  ['not-a-number', 'SenML speed without "v"', '[{"n":"speed","vs":"fast"}]'],
  ['out-of-range', 'negative speed', `{"ts":${nowMs},"speed":-0.1}`],
  ['out-of-range', 'speed above 120 m/s', `{"ts":${nowMs},"speed":120.001}`],
  ['out-of-range', 'gust above 120 m/s', `{"ts":${nowMs},"speed":5,"gust":130}`],
  ['out-of-range', 'temperature 61 °C', `{"ts":${nowMs},"speed":5,"tempC":61}`],
  ['out-of-range', 'humidity 100.5 %', `{"ts":${nowMs},"speed":5,"rh":100.5}`],
  ['out-of-range', 'pressure 450 hPa', `{"ts":${nowMs},"speed":5,"pressureHpa":450}`],
  ['out-of-range', 'SenML pressure in hPa numbers but Pa unit', '[{"n":"speed","u":"m/s","v":5},{"n":"pressure","u":"Pa","v":1013}]'],
  ['bad-direction', 'dir 361', `{"ts":${nowMs},"speed":5,"dir":361}`],
  ['bad-direction', 'dir −1', `{"ts":${nowMs},"speed":5,"dir":-1}`],
  ['bad-direction', 'SenML 7 rad', '[{"n":"speed","u":"m/s","v":5},{"n":"dir","u":"rad","v":7}]'],
  ['bad-senml', 'v as a string (RFC 8428 §4.2: v is a number)', '[{"n":"speed","v":"5"}]'],
  ['bad-senml', 'an unknown must-understand label (RFC 8428 §4.4)', '[{"n":"speed","v":5,"calib_":2}]'],
  ['bad-senml', 'a name with a space (RFC 8428 §4.5.1)', '[{"n":"mast 1:speed","v":5}]'],
  ['bad-senml', 'a version above 10', '[{"bver":11,"n":"speed","v":5}]'],
  ['bad-senml', 'a record that is not an object', '[{"n":"speed","u":"m/s","v":5},3]'],
  ['bad-senml-unit', 'speed in km/h (not in our table)', '[{"n":"speed","u":"km/h","v":5}]'],
  ['bad-senml-unit', 'temperature in Fahrenheit', '[{"n":"speed","u":"m/s","v":5},{"n":"temp","u":"Far","v":60}]'],
  ['duplicate-field', 'two speeds at one time', '[{"n":"speed","u":"m/s","v":5},{"n":"speed","u":"m/s","v":6}]'],
];

describe('rejections: a closed list of reasons, each with a detail for people (design.md §3)', () => {
  it.each(rejectCases)('%s: %s', (reason, _what, payload) => {
    const result = parse(payload);
    expect(result).toMatchObject({ ok: false, reason });
    expect(result.ok === false && result.detail.length > 0).toBe(true);
  });

  it('every exported reason is produced by some payload above, and no other reason exists', () => {
    expect(new Set(rejectCases.map(([reason]) => reason))).toEqual(new Set(rejectReasons));
  });

  it('the detail names the field and the value', () => {
    const result = parse(`{"ts":${nowMs},"speed":5,"dir":361}`);
    expect(result.ok === false && result.detail).toBe('"dir" 361 is outside 0–360°');
  });

  it('wrong options are a programming error: RangeError naming them', () => {
    expect(() => parseReadingPayload(new Uint8Array(), { receivedAtMs: Number.NaN, unit: 'm/s' })).toThrow(/receivedAtMs.*NaN/);
    expect(() => parseReadingPayload(new Uint8Array(), { receivedAtMs: nowMs, unit: 'furlong' as SpeedUnit })).toThrow(/unit.*furlong/);
  });
});

/** Every reading that comes out must be storable: finite, in range, in SI units. */
function expectPlausible(result: ParseResult): void {
  if (!result.ok) {
    expect(rejectReasons).toContain(result.reason);
    expect(typeof result.detail).toBe('string');
    expect(result.detail.length).toBeGreaterThan(0);
    return;
  }
  expect(result.readings.length).toBeGreaterThan(0);
  for (const r of result.readings) {
    expect(Number.isInteger(r.tsMs)).toBe(true);
    expect(r.tsMs).toBeLessThanOrEqual(nowMs + 300_000);
    expect(r.tsMs).toBeGreaterThanOrEqual(nowMs - 7 * 86_400_000);
    expect(r.speedMps >= 0 && r.speedMps <= 120).toBe(true);
    if (r.gustMps !== null) expect(r.gustMps >= 0 && r.gustMps <= 120).toBe(true);
    if (r.dirDeg !== null) expect(r.dirDeg >= 0 && r.dirDeg < 360).toBe(true);
    if (r.tempC !== null) expect(r.tempC >= -60 && r.tempC <= 60).toBe(true);
    if (r.pressurePa !== null) expect(r.pressurePa >= 50_000 && r.pressurePa <= 110_000).toBe(true);
    if (r.rhPct !== null) expect(r.rhPct >= 0 && r.rhPct <= 100).toBe(true);
  }
  for (const bad of result.rejected) expect(rejectReasons).toContain(bad.reason);
}

describe('never throws, never lets garbage through (design.md §6: 0 crashes, 0 stored garbage)', () => {
  it('on 3 000 seeded random byte strings', () => {
    const random = seededRandom(1);
    for (let n = 0; n < 3000; n++) {
      const bytes = new Uint8Array(Math.floor(random() * 200));
      for (let i = 0; i < bytes.length; i++) bytes[i] = Math.floor(random() * 256);
      expectPlausible(parse(bytes));
    }
  });

  it('on 3 000 seeded random JSON values built from our field names and awkward values', () => {
    const random = seededRandom(2);
    const keys = ['ts', 'speed', 'gust', 'dir', 'tempC', 'pressureHpa', 'rh', 'bn', 'bt', 'bu', 'bv', 'bver', 'n', 'u', 'v', 't', 'vs', 'vb', 's', 'x_', '__proto__', 'constructor'];
    const names = ['speed', 'gust', 'dir', 'temp', 'pressure', 'rh', 'm:speed', 'a/b.gust', '', ' ', 'battery'];
    const units = ['m/s', 'deg', 'rad', 'Cel', 'K', 'Pa', '%RH', 'km/h', '', 'V'];
    const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!;
    const numbers = (): number => pick([0, -0, 1, -1, 360, 361, 120, 121, 1e308, -1e308, 2 ** 28, nowMs, nowS, nowMs + 300_001, 0.1 + random() * 50, -random() * 1e6, 1e-320]);
    const value = (depth: number): unknown => {
      const kind = Math.floor(random() * (depth > 3 ? 5 : 7));
      switch (kind) {
        case 0: return numbers();
        case 1: return pick(['2024-06-01T11:59:59Z', '2024-13-01T00:00:00Z', '', 'speed', pick(names), pick(units)]);
        case 2: return pick([true, false]);
        case 3: return null;
        case 4: return random() < 0.5 ? pick(names) : numbers();
        case 5: return Array.from({ length: Math.floor(random() * 5) }, () => value(depth + 1));
        default: {
          const obj: Record<string, unknown> = {};
          const count = Math.floor(random() * 6);
          for (let i = 0; i < count; i++) obj[pick(keys)] = value(depth + 1);
          return obj;
        }
      }
    };
    for (let n = 0; n < 3000; n++) {
      const json = JSON.stringify(value(0)) ?? 'null';
      expectPlausible(parse(json, pick(['m/s', 'km/h', 'kn', 'mph'] as const)));
    }
  });

  it('on 3 000 seeded mutations (flipped bits, cut ends) of valid payloads of every form', () => {
    const random = seededRandom(3);
    const valid = [
      `{"ts":"2024-06-01T11:59:58Z","speed":8.4,"gust":13.1,"dir":245,"tempC":17.5,"pressureHpa":1013.25,"rh":62}`,
      `[{"ts":${nowMs - 1000},"speed":5},{"ts":${nowMs},"speed":6,"dir":10}]`,
      `[{"bn":"urn:dev:ow:10e2073a0108006:","bt":${nowS - 10},"bu":"m/s","bver":5,"n":"speed","v":6.1},{"n":"gust","v":9.4},{"n":"dir","u":"rad","v":1.2},{"n":"speed","t":-5,"v":6.4}]`,
      '7.5',
    ].map((text) => new TextEncoder().encode(text));
    for (let n = 0; n < 3000; n++) {
      const original = valid[n % valid.length]!;
      const cut = random() < 0.3 ? Math.floor(random() * original.length) : original.length;
      const bytes = original.slice(0, cut);
      const flips = Math.floor(random() * 4);
      for (let f = 0; f < flips && bytes.length > 0; f++) bytes[Math.floor(random() * bytes.length)]! ^= 1 << Math.floor(random() * 8);
      expectPlausible(parse(bytes));
    }
  });
});

describe('parsed readings feed the wind state directly', () => {
  it('a payload reading is a wind reading (same fields, same units): a summary gives its gust', () => {
    const reading: WindReading = only(parse(`{"ts":${nowMs},"speed":12,"gust":20}`, 'kn'));
    const state = createSensorWindState({ sensorKey: 'mast-a' });
    expect(acceptReading(state, reading, nowMs)).toBeCloseTo((20 * 1852) / 3600, 12);
    expect(windSnapshot(state, nowMs).mean10minMps).toBeCloseTo((12 * 1852) / 3600, 12);
  });
});
