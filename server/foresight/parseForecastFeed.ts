/**
 * Reading the body of a polled forecast feed (design §2.7, issue 17) into the forecast table's
 * rows, through the one parser of pasted tables (parseForecastTable.ts): a CSV body is that table
 * as it is; a JSON body is written out as such a table first (a header of the objects' keys, one
 * line per object) and read by the same parser, so units, times, directions, missing values and
 * the plausible range are judged in one place, with one date parser (forecastDateTime.ts).
 *
 * JSON accepted:
 * - an array of objects, or an object `{"rows": [...], "unit"?: "m/s" | "km/h" | "kn" | "mph"}`
 *   (`unit`: the unit of bare numbers, as the feed settings' unit; both given must agree). Other
 *   keys of the object are ignored and named in the notes.
 * - each object's keys are the table's column headers, so every name and unit annotation the
 *   table accepts works: `{"time": "2026-06-14T12:00Z", "mean (km/h)": 30, "gust (km/h)": 52,
 *   "dir": "WSW"}`. Values: numbers, text (units in the text as in cells: "14 km/h"), or null (a
 *   missing value, never 0). The time may also be a number: milliseconds since the Unix epoch,
 *   written out as ISO 8601 UTC (a number below 10^11 is refused: it would be seconds).
 * Problems are named by where they are in the JSON: `rows[2].gust: "fast" is not a speed — …`.
 */
import { forecastColumns } from './forecastColumns.ts';
import { isForecastSpeedUnit, type ForecastSpeedUnit } from './forecastSpeedUnit.ts';
import { parseForecastTable, type ForecastRow, type ForecastTableOptions, type ForecastTableProblem } from './parseForecastTable.ts';

export type ForecastFeedFormat = 'csv' | 'json';

export type ForecastFeedRead =
  | {
      readonly ok: true;
      readonly format: ForecastFeedFormat;
      readonly rows: readonly ForecastRow[];
      /** How it was read, in sentences (the table's notes, and for JSON the keys that were ignored). */
      readonly notes: readonly string[];
    }
  | {
      readonly ok: false;
      readonly format: ForecastFeedFormat | null;
      /** What is wrong in one line for a person: the first problems and how many more. */
      readonly error: string;
      /** Every problem found, each a sentence starting with where it is. */
      readonly problems: readonly string[];
    };

/** Epoch milliseconds below this are refused: 10^11 ms is 1973, so such a number is seconds. */
const minEpochMs = 1e11;
/** Problems quoted in `error`; the rest are counted. */
const problemsInError = 3;

function failed(format: ForecastFeedFormat | null, problems: readonly string[]): ForecastFeedRead {
  const shown = problems.slice(0, problemsInError).join('; ');
  const more = problems.length > problemsInError ? ` (and ${problems.length - problemsInError} more)` : '';
  return { ok: false, format, error: `${shown}${more}`, problems };
}

/** Whether a body is JSON: by its content type, or by its first character ('[' or '{', which no table header starts with). */
export function isJsonBody(body: string, contentType: string | null): boolean {
  if (contentType !== null && /\bjson\b/i.test(contentType)) return true;
  return /^\uFEFF?\s*[[{]/.test(body);
}

/**
 * The rows of a feed's body. `options` as for parseForecastTable (`unit` from the feed settings,
 * `timeZone` the site's). Never throws for bad content; throws a RangeError for bad options.
 *
 * @example
 * parseForecastFeed('[{"time":"2026-06-14T12:00Z","gust (m/s)":9}]', 'application/json')
 * // → { ok: true, format: 'json', rows: [{ line: 2, timeMs: Date.UTC(2026, 5, 14, 12), meanMps: null, gustMps: 9, dirFromDeg: null }], notes: [...] }
 */
export function parseForecastFeed(body: string, contentType: string | null, options: ForecastTableOptions = {}): ForecastFeedRead {
  if (!isJsonBody(body, contentType)) {
    const table = parseForecastTable(body, options);
    if (!table.ok) return failed('csv', table.problems.map((p) => p.message));
    return { ok: true, format: 'csv', rows: table.rows, notes: [...table.notes, ...ignoredNote(table.ignoredColumns, 'columns')] };
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(body.replace(/^\uFEFF/, ''));
  } catch (err) {
    return failed('json', [`The feed is not valid JSON: ${err instanceof Error ? err.message : String(err)}`]);
  }
  const written = jsonAsTable(parsed, options.unit);
  if (!written.ok) return failed('json', written.problems);
  const table = parseForecastTable(written.text, { ...options, ...(written.unit ? { unit: written.unit } : {}) });
  if (!table.ok) return failed('json', table.problems.map(jsonProblemText));
  return {
    ok: true,
    format: 'json',
    rows: table.rows,
    notes: [...(written.unit && options.unit === undefined ? [`Bare numbers read in ${written.unit}, as the file's "unit" says.`] : []), ...table.notes, ...ignoredNote(table.ignoredColumns, 'keys'), ...ignoredNote(written.ignoredKeys, 'top-level keys')],
  };
}

function ignoredNote(names: readonly string[], what: string): string[] {
  return names.length === 0 ? [] : [`Not used (${what}): ${names.join(', ')}.`];
}

/** A table problem named by its place in the JSON: line 1 is the keys, line n ≥ 2 is rows[n − 2]. */
function jsonProblemText(p: ForecastTableProblem): string {
  const row = p.line === null || p.line < 2 ? null : `rows[${p.line - 2}]`;
  const where = row !== null && p.column !== null ? `${row}.${p.column}` : row ?? (p.column !== null ? `The key "${p.column}"` : p.line === 1 ? 'The keys' : null);
  const what = p.value === null ? p.reason : `"${p.value.length > 40 ? `${p.value.slice(0, 39)}…` : p.value}" ${p.reason}`;
  return where === null ? p.message : `${where}: ${what}`;
}

/** A key as a header: no separator, quote-free of line breaks (a header with ";" or a tab would change the separator). */
const headerText = (key: string): string => key.replace(/[\t;\r\n]/g, ' ');
/** A field of a comma-separated line, quoted when it holds a comma or a quote (RFC 4180). */
const field = (text: string): string => (/[",]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text);

/** A JSON number as table text: plain decimal, no exponent (the table reads no exponents). */
function numberText(value: number): string {
  const plain = String(value);
  return /e/i.test(plain) ? value.toFixed(Math.abs(value) < 1 ? 12 : 0).replace(/\.?0+$/, '') || '0' : plain;
}

function jsonAsTable(
  parsed: unknown,
  settingsUnit: ForecastSpeedUnit | undefined,
): { ok: true; text: string; unit: ForecastSpeedUnit | null; ignoredKeys: string[] } | { ok: false; problems: string[] } {
  let rows: unknown;
  let unit: ForecastSpeedUnit | null = null;
  const ignoredKeys: string[] = [];
  if (Array.isArray(parsed)) rows = parsed;
  else if (parsed !== null && typeof parsed === 'object') {
    const top = parsed as Record<string, unknown>;
    if (!('rows' in top)) return { ok: false, problems: ['The JSON must be an array of rows or an object with "rows": [ … ]'] };
    rows = top.rows;
    if (top.unit !== undefined && top.unit !== null) {
      if (typeof top.unit !== 'string' || !isForecastSpeedUnit(top.unit)) {
        return { ok: false, problems: [`unit: ${JSON.stringify(top.unit).slice(0, 40)} is not a speed unit — use m/s, km/h, kn or mph`] };
      }
      if (settingsUnit !== undefined && top.unit !== settingsUnit) {
        return { ok: false, problems: [`unit: the file says ${top.unit} but the feed settings say ${settingsUnit} — make them agree`] };
      }
      unit = top.unit;
    }
    for (const key of Object.keys(top)) if (key !== 'rows' && key !== 'unit') ignoredKeys.push(key);
  } else {
    return { ok: false, problems: ['The JSON must be an array of rows or an object with "rows": [ … ]'] };
  }
  if (!Array.isArray(rows)) return { ok: false, problems: ['rows: must be an array of objects'] };
  if (rows.length === 0) return { ok: false, problems: ['rows: the feed has no rows'] };

  const problems: string[] = [];
  const keys: string[] = [];
  const seen = new Set<string>();
  rows.forEach((row, i) => {
    if (row === null || typeof row !== 'object' || Array.isArray(row)) {
      problems.push(`rows[${i}]: must be an object such as {"time": "2026-06-14T12:00Z", "gust (m/s)": 9}`);
      return;
    }
    for (const key of Object.keys(row)) {
      if (!seen.has(key)) {
        seen.add(key);
        keys.push(key);
      }
    }
  });
  if (problems.length > 0) return { ok: false, problems };
  if (keys.length === 0) return { ok: false, problems: ['rows: the objects have no keys — name the time, mean, gust and direction'] };

  // The time column, to write an epoch number as an instant; the table's parser judges the rest.
  const recognised = forecastColumns(keys.map(headerText));
  const timeIndex = recognised.ok && recognised.columns.date === null ? recognised.columns.time.index : -1;
  const lines = [keys.map((k) => field(headerText(k))).join(',')];
  (rows as Array<Record<string, unknown>>).forEach((row, i) => {
    const cells = keys.map((key, k) => {
      const value = row[key];
      if (value === undefined || value === null) return '';
      if (typeof value === 'number') {
        if (!Number.isFinite(value)) {
          problems.push(`rows[${i}].${key}: must be a finite number`);
          return '';
        }
        if (k === timeIndex) {
          if (value < minEpochMs || value > 8.64e15) {
            problems.push(`rows[${i}].${key}: ${value} is not a time — give milliseconds since 1970 or ISO 8601 text ("2026-06-14T12:00Z"); a number this small would be seconds`);
            return '';
          }
          return new Date(value).toISOString();
        }
        return numberText(value);
      }
      if (typeof value === 'string') return field(value.replace(/[\r\n\t]+/g, ' '));
      problems.push(`rows[${i}].${key}: must be a number, text or null, not ${Array.isArray(value) ? 'a list' : typeof value}`);
      return '';
    });
    lines.push(cells.join(','));
  });
  if (problems.length > 0) return { ok: false, problems };
  return { ok: true, text: lines.join('\n'), unit, ignoredKeys };
}
