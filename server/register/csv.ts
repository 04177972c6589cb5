/**
 * CSV as RFC 4180 defines it: comma-separated fields, CRLF line ends, fields with a comma, quote
 * or line break enclosed in double quotes, a quote inside doubled. Read side also takes LF line
 * ends and a UTF-8 byte-order mark (spreadsheets write both).
 */
import { delimitedProblemWords, readDelimited } from '../formats/delimitedText.ts';

function field(value: unknown): string {
  if (value === null || value === undefined) return '';
  const text = typeof value === 'string' ? value : typeof value === 'number' || typeof value === 'boolean' ? String(value) : JSON.stringify(value);
  // A leading = + - @ makes spreadsheets run a formula: prefix a quote mark (OWASP CSV injection).
  const safe = /^[=+\-@\t\r]/.test(text) && !/^-?[0-9.]+(e-?[0-9]+)?$/i.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** The text as written before `field` guarded it against formula injection. */
export function unguard(text: string): string {
  return /^'[=+\-@\t\r]/.test(text) ? text.slice(1) : text;
}

export function csvLine(values: readonly unknown[]): string {
  return values.map(field).join(',') + '\r\n';
}

export function toCsv(header: readonly string[], rows: ReadonlyArray<readonly unknown[]>): string {
  return csvLine(header) + rows.map(csvLine).join('');
}

export class CsvError extends Error {
  constructor(
    message: string,
    readonly line: number,
  ) {
    super(`line ${line}: ${message}`);
  }
}

/**
 * Parses CSV text into rows of fields (strings), with the one delimited-text reader
 * (formats/delimitedText.ts); blank lines are skipped. Throws a CsvError naming the line.
 */
export function parseCsv(text: string): string[][] {
  const read = readDelimited(text, ',');
  if (!read.ok) throw new CsvError(delimitedProblemWords[read.problem], read.line);
  return read.records.map((record) => record.fields).filter((r) => !(r.length === 1 && r[0] === ''));
}
