/**
 * CSV as RFC 4180 defines it: comma-separated fields, CRLF line ends, fields with a comma, quote
 * or line break enclosed in double quotes, a quote inside doubled. Read side also takes LF line
 * ends and a UTF-8 byte-order mark (spreadsheets write both).
 */

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

/** Parses CSV text into rows of fields (strings). */
export function parseCsv(text: string): string[][] {
  const input = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const rows: string[][] = [];
  let row: string[] = [];
  let value = '';
  let quoted = false;
  let line = 1;
  let i = 0;
  let fieldStarted = false;
  while (i < input.length) {
    const ch = input[i]!;
    if (quoted) {
      if (ch === '"') {
        if (input[i + 1] === '"') {
          value += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        if (i < input.length && input[i] !== ',' && input[i] !== '\r' && input[i] !== '\n') throw new CsvError('text after a closing quote', line);
        continue;
      }
      if (ch === '\n') line++;
      value += ch;
      i++;
      continue;
    }
    if (ch === '"' && !fieldStarted) {
      quoted = true;
      fieldStarted = true;
      i++;
      continue;
    }
    if (ch === ',') {
      row.push(value);
      value = '';
      fieldStarted = false;
      i++;
      continue;
    }
    if (ch === '\r' || ch === '\n') {
      row.push(value);
      rows.push(row);
      row = [];
      value = '';
      fieldStarted = false;
      i += ch === '\r' && input[i + 1] === '\n' ? 2 : 1;
      line++;
      continue;
    }
    value += ch;
    fieldStarted = true;
    i++;
  }
  if (quoted) throw new CsvError('a quoted field is not closed', line);
  if (fieldStarted || row.length > 0) {
    row.push(value);
    rows.push(row);
  }
  return rows.filter((r) => !(r.length === 1 && r[0] === ''));
}
