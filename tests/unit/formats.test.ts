/**
 * The one ISO 8601 reader and the one delimited-text reader (server/formats/), checked against the
 * examples of their standards, and the shared issue mapper (engine/issueWords.ts).
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { issuePaths, unknownFieldMessages } from '../../server/engine/issueWords.ts';
import { isoDate, isoInstantMs, readDelimited } from '../../server/formats/index.ts';
import { parseCsv } from '../../server/register/csv.ts';

describe('isoInstantMs', () => {
  // RFC 3339 section 5.8 (from memory of the RFC's examples and the instants they state).
  it.each([
    ['1985-04-12T23:20:50.52Z', Date.UTC(1985, 3, 12, 23, 20, 50, 520)],
    // "This represents 39 minutes and 57 seconds after the 16th hour of December 19th, 1996 with an
    // offset of -08:00 from UTC … equivalent to 1996-12-20T00:39:57Z in UTC."
    ['1996-12-19T16:39:57-08:00', Date.UTC(1996, 11, 20, 0, 39, 57)],
    // Netherlands time, +00:20 from UTC.
    ['1937-01-01T12:00:27.87+00:20', Date.UTC(1937, 0, 1, 11, 40, 27, 870)],
  ])('reads RFC 3339 §5.8 %s', (text, ms) => {
    expect(isoInstantMs(text)).toEqual({ ok: true, value: ms });
  });

  it('reads lower-case t and z (RFC 3339 §5.6 NOTE), a decimal comma (ISO 8601) and minutes without seconds', () => {
    expect(isoInstantMs('2024-06-01t07:29:00-04:30')).toEqual({ ok: true, value: Date.UTC(2024, 5, 1, 11, 59) });
    expect(isoInstantMs('2024-06-01T11:59:58,25z')).toEqual({ ok: true, value: Date.UTC(2024, 5, 1, 11, 59, 58, 250) });
    expect(isoInstantMs('2024-06-01T11:59Z')).toEqual({ ok: true, value: Date.UTC(2024, 5, 1, 11, 59) });
    // Digits below the millisecond are dropped, not rounded.
    expect(isoInstantMs('2024-06-01T11:59:58.123999Z')).toEqual({ ok: true, value: Date.UTC(2024, 5, 1, 11, 59, 58, 123) });
  });

  it.each([
    ['no zone (it would be some server’s local time)', '2024-06-01T12:00:00'],
    ['words Date.parse reads ("June 13" → 13 June 2001)', 'June 13'],
    ['a space instead of T', '2024-06-01 12:00:00Z'],
    ['an offset without its colon', '2024-06-01T12:00:00+0200'],
    ['a date alone, unless asked for', '2024-06-01'],
    ['epoch ms as text', '1717243200000'],
  ])('refuses %s as not of the form', (_what, text) => {
    expect(isoInstantMs(text)).toEqual({ ok: false, problem: 'form' });
  });

  it.each([
    ['30 February (Date.parse rolls it into March)', '2026-02-30T00:00Z'],
    ['29 February of a year that is not a leap year', '2025-02-29T12:00Z'],
    ['hour 24', '2024-06-01T24:00:00Z'],
    // RFC 3339 allows second 60 (its §5.8 example 1990-12-31T23:59:60Z); epoch ms has no leap
    // seconds, so it is refused rather than silently moved (our own choice).
    ['a leap second', '1990-12-31T23:59:60Z'],
    ['an offset beyond ±23:59', '2024-06-01T12:00:00+24:00'],
    ['month 13', '2024-13-01T12:00Z'],
  ])('refuses %s as out of range', (_what, text) => {
    expect(isoInstantMs(text)).toEqual({ ok: false, problem: 'range' });
  });

  it('reads a date alone as UTC midnight when asked, and still checks it', () => {
    expect(isoInstantMs('2024-02-29', { dateAlone: true })).toEqual({ ok: true, value: Date.UTC(2024, 1, 29) });
    expect(isoInstantMs('2026-06-13T09:00:00+01:00', { dateAlone: true })).toEqual({ ok: true, value: Date.UTC(2026, 5, 13, 8) });
    expect(isoInstantMs('2023-02-29', { dateAlone: true })).toEqual({ ok: false, problem: 'range' });
  });

  it('looks at no more than 40 characters', () => {
    expect(isoInstantMs(`2024-06-01T12:00:00.${'1'.repeat(30)}Z`)).toEqual({ ok: false, problem: 'form' });
  });
});

describe('isoDate', () => {
  it('reads YYYY-MM-DD and checks the day against the Gregorian calendar (2000 was a leap year, 1900 was not)', () => {
    expect(isoDate('2000-02-29')).toEqual({ ok: true, value: { year: 2000, month: 2, day: 29 } });
    expect(isoDate('1900-02-29')).toEqual({ ok: false, problem: 'range' });
    expect(isoDate('13/06/2026')).toEqual({ ok: false, problem: 'form' });
  });
});

describe('readDelimited', () => {
  const fields = (text: string, separator = ',') => {
    const read = readDelimited(text, separator);
    if (!read.ok) throw new Error(`${read.problem} on line ${read.line}`);
    return read.records.map((r) => r.fields);
  };

  // RFC 4180 section 2, items 1, 2, 5, 6 and 7.
  it.each([
    ['2.1: records on separate lines, each ended by CRLF', 'aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n', [['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]],
    ['2.2: the last record without a line break', 'aaa,bbb,ccc\r\nzzz,yyy,xxx', [['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]],
    ['2.5: fields enclosed in double quotes', '"aaa","bbb","ccc"\r\nzzz,yyy,xxx\r\n', [['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]],
    ['2.6: a line break and a comma inside quotes', '"aaa","b\r\nbb","c,cc"\r\nzzz,yyy,xxx\r\n', [['aaa', 'b\r\nbb', 'c,cc'], ['zzz', 'yyy', 'xxx']]],
    ['2.7: a quote inside quotes written twice', '"aaa","b""bb","ccc"\r\n', [['aaa', 'b"bb', 'ccc']]],
  ])('reads RFC 4180 %s', (_what, text, rows) => {
    expect(fields(text)).toEqual(rows);
  });

  it('numbers each record by the line it starts on, counting line breaks inside quotes', () => {
    const read = readDelimited('a\n"b\nc"\nd\n');
    expect(read.ok && read.records.map((r) => r.line)).toEqual([1, 2, 4]);
  });

  it('reads semicolons and tabs, LF and lone CR line ends, a byte-order mark, and spaces before an opening quote', () => {
    expect(fields('\uFEFFtime;"gust, m/s"\n2026-06-12 14:00; "12,5"', ';')).toEqual([['time', 'gust, m/s'], ['2026-06-12 14:00', '12,5']]);
    expect(fields('a\tb\rc\t"d\te"', '\t')).toEqual([['a', 'b'], ['c', 'd\te']]);
    expect(fields('5" screen,ok')).toEqual([['5" screen', 'ok']]);
    expect(fields('')).toEqual([]);
    expect(fields('a,,\r\n')).toEqual([['a', '', '']]);
  });

  it('refuses a quoted field never closed (at the line it opens) and text after a closing quote', () => {
    expect(readDelimited('a,b\n"open,\nstill open')).toEqual({ ok: false, problem: 'unclosed-quote', line: 2 });
    expect(readDelimited('a\n"a"b,c')).toEqual({ ok: false, problem: 'text-after-quote', line: 2 });
  });

  it('the register file’s parseCsv skips blank lines and names the line of a broken quote', () => {
    expect(parseCsv('a,b\r\n\r\nc,d\r\n')).toEqual([['a', 'b'], ['c', 'd']]);
    expect(() => parseCsv('a\r\n"b')).toThrow('line 2: a quoted field is not closed');
    expect(() => parseCsv('"a"b')).toThrow('line 1: text after a closing quote');
  });
});

describe('issuePaths, the one zod-issue mapper', () => {
  it('names every problem at its dotted path, an unknown key at its own, in the wording asked for', () => {
    const result = z.strictObject({ masses: z.array(z.strictObject({ massKg: z.number().gte(0, 'must be ≥ 0 kg') })) }).safeParse({ masses: [{ massKg: -1, mass: 2 }] });
    expect(issuePaths(result.error!.issues, { prefix: 'record' })).toEqual([
      { path: 'record.masses.0.massKg', message: 'must be ≥ 0 kg' },
      { path: 'record.masses.0.mass', message: 'is not a field here (check the spelling)' },
    ]);
    expect(issuePaths(result.error!.issues, { unknownField: unknownFieldMessages.known })[1]).toEqual({ path: 'masses.0.mass', message: 'is not a known field (check the spelling)' });
  });
});
