/**
 * The tests' CSV checker (tests/helpers/rfc4180.ts) against the examples of RFC 4180 section 2
 * (items 1, 5, 6 and 7), and the forms the RFC does not allow, so a CSV that breaks the format
 * fails the export tests instead of passing them.
 */
import { describe, expect, it } from 'vitest';
import { parseRfc4180 } from '../helpers/rfc4180.ts';

describe('the RFC 4180 checker', () => {
  it.each([
    ['2.1: records on separate lines, each ended by CRLF', 'aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n', [['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]],
    ['2.5: fields enclosed in double quotes', '"aaa","bbb","ccc"\r\nzzz,yyy,xxx\r\n', [['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]],
    ['2.6: a line break and a comma inside quotes', '"aaa","b\r\nbb","c,cc"\r\n', [['aaa', 'b\r\nbb', 'c,cc']]],
    ['2.7: a quote inside quotes written twice', '"aaa","b""bb","ccc"\r\n', [['aaa', 'b"bb', 'ccc']]],
    ['empty fields', 'a,,\r\n', [['a', '', '']]],
  ])('reads %s', (_what, text, rows) => {
    expect(parseRfc4180(text)).toEqual(rows);
  });

  it.each([
    ['LF line ends', 'a,b\nc,d\n'],
    ['a quote inside an unquoted field', 'a"b,c\r\n'],
    ['text after a closing quote', '"a"b,c\r\n'],
    ['a quoted field never closed', '"abc\r\n'],
    ['a last record without CRLF', 'a,b\r\nc,d'],
  ])('refuses %s', (_what, text) => {
    expect(() => parseRfc4180(text)).toThrow(/not RFC 4180/);
  });
});
