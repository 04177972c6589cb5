/**
 * The one reader of delimited text: CSV (RFC 4180), and the semicolon- and tab-separated tables
 * spreadsheets write. Used by the register file import (register/csv.ts) and the forecast table
 * (foresight/parseForecastTable.ts). Pure.
 *
 * RFC 4180 section 2: records end at a line break (CRLF; LF and a lone CR are read too, as
 * spreadsheets write them); a field in double quotes may hold the separator, line breaks and a
 * quote written twice (""). A leading UTF-8 byte-order mark is dropped.
 *
 * Beyond the RFC, as people write tables by hand (our own choices):
 * - spaces or tabs before an opening quote are dropped (`a; "12,5"`);
 * - a quote inside an unquoted field is an ordinary character (`5" screen`).
 * Refused, with the line: a quoted field never closed, and text after a closing quote (`"a"b`),
 * which would otherwise be silently glued onto the field.
 */

export type DelimitedProblem = 'unclosed-quote' | 'text-after-quote';

export interface DelimitedRecord {
  /** Line of the text the record starts on, from 1. */
  readonly line: number;
  readonly fields: string[];
}

export type DelimitedRead =
  | { readonly ok: true; readonly records: DelimitedRecord[] }
  | { readonly ok: false; readonly problem: DelimitedProblem; /** Line of the offending quote, from 1. */ readonly line: number };

/** What each problem means, for people. */
export const delimitedProblemWords: Readonly<Record<DelimitedProblem, string>> = {
  'unclosed-quote': 'a quoted field is not closed',
  'text-after-quote': 'text after a closing quote',
};

const isBlank = (text: string): boolean => /^[ \t]*$/.test(text);

/**
 * Every record of `text` split at `separator` (one character), fields unquoted. Empty lines are
 * records with one empty field; callers skip them as they need.
 *
 * @example readDelimited('a,"b,c"\r\n"d ""e"""', ',') // → ok, records [{line 1, ['a', 'b,c']}, {line 2, ['d "e"']}]
 */
export function readDelimited(text: string, separator = ','): DelimitedRead {
  if (separator.length !== 1 || separator === '"' || separator === '\r' || separator === '\n') {
    throw new RangeError(`readDelimited: separator must be one character other than a quote or a line break, got ${JSON.stringify(separator)}`);
  }
  const input = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const records: DelimitedRecord[] = [];
  let fields: string[] = [];
  let field = '';
  let recordLine = 1;
  let line = 1;
  let i = 0;
  while (i < input.length) {
    const ch = input[i]!;
    if (ch === '"' && isBlank(field)) {
      // A quoted field: up to the closing quote, "" standing for one quote.
      const openedAt = line;
      field = '';
      i++;
      for (;;) {
        if (i >= input.length) return { ok: false, problem: 'unclosed-quote', line: openedAt };
        const q = input[i]!;
        if (q === '"') {
          if (input[i + 1] === '"') {
            field += '"';
            i += 2;
            continue;
          }
          i++;
          break;
        }
        if (q === '\n' || (q === '\r' && input[i + 1] !== '\n')) line++;
        field += q;
        i++;
      }
      const next = input[i];
      if (next !== undefined && next !== separator && next !== '\r' && next !== '\n') return { ok: false, problem: 'text-after-quote', line };
      // The field ends here; the separator or line break is handled below.
      if (next === undefined) break;
      continue;
    }
    if (ch === separator) {
      fields.push(field);
      field = '';
      i++;
      continue;
    }
    if (ch === '\r' || ch === '\n') {
      fields.push(field);
      records.push({ line: recordLine, fields });
      fields = [];
      field = '';
      i += ch === '\r' && input[i + 1] === '\n' ? 2 : 1;
      line++;
      recordLine = line;
      continue;
    }
    field += ch;
    i++;
  }
  // The last record, unless the text ended with its line break (or is empty).
  if (input.length > 0 && !input.endsWith('\n') && !input.endsWith('\r')) {
    fields.push(field);
    records.push({ line: recordLine, fields });
  }
  return { ok: true, records };
}
