/**
 * Reading a pasted or uploaded forecast table (design §2.5) into rows in SI units.
 *
 * Accepted shape:
 * - Separator: tab, semicolon or comma, taken from the header row (tab first, then semicolon).
 *   With tab or semicolon a decimal comma is accepted ("12,5"), as spreadsheets in many locales
 *   write it; with comma only a decimal point is.
 * - Header row first, naming time, mean, gust and direction in any order (see forecastColumns.ts);
 *   a time column and at least one of mean and gust are required. Fields may be double-quoted.
 * - Speed unit from the header ("gust (km/h)", "gust_kn") or from `options.unit`; with neither
 *   the table is refused rather than guessed, and a header unit that contradicts `options.unit` is
 *   refused too.
 * - Time: ISO 8601 with an offset ("2026-06-12T14:00Z", "+02:00", "+0200", "+02") is exact;
 *   a time without an offset ("2026-06-12 14:00", "2026-06-12T14:00:00") is wall-clock time in
 *   the zone named on the time column or in `options.timeZone` (IANA), resolved with Intl.
 *   A wall-clock time skipped by a clock change is refused; one repeated by a clock change is the
 *   earlier instant unless that would not be after the previous row, then the later one.
 * - Direction: degrees from north, 0..360 (360 is north), or a 16-point compass point; empty,
 *   "VRB" or "variable" means no direction.
 * - An empty cell, "-", "NA", "N/A" or "null" is a missing value (null), never 0.
 * - Speeds must lie in 0..120 m/s after conversion (the plausible range of design §3), and a gust
 *   may not be below the mean of its row.
 * Blank lines are skipped; 1..1000 data rows. Every bad line is reported (line number counted
 * from 1 at the header, column header, value, why), up to 50 problems, and then how many more.
 */
import { compassPointDeg } from './compassPointDeg.ts';
import { delimitedFields } from './delimitedFields.ts';
import { forecastColumns, type SpeedColumn } from './forecastColumns.ts';
import { forecastSpeedMps, isForecastSpeedUnit, type ForecastSpeedUnit } from './forecastSpeedUnit.ts';
import { zonedTimeResolver, type WallClockTime } from './zonedTimeResolver.ts';

export const maxForecastRows = 1000;
/** More problems than this are summarised: a wrong table produces the same problem on every line. */
export const maxForecastProblems = 50;
/** Plausible range of a wind speed, m/s (design §3). */
const maxPlausibleSpeedMps = 120;

export interface ForecastRow {
  /** Line of the table this row came from, counted from 1 at the header. */
  readonly line: number;
  /** Forecast valid time, ms since the Unix epoch. */
  readonly timeMs: number;
  /** Mean wind, m/s, or null when not given. */
  readonly meanMps: number | null;
  /** Gust, m/s, or null when not given. */
  readonly gustMps: number | null;
  /** Direction the wind blows from, degrees clockwise from north in [0, 360), or null. */
  readonly dirFromDeg: number | null;
}

export interface ForecastTableProblem {
  /** Line number counted from 1 at the header, or null for the table as a whole. */
  readonly line: number | null;
  /** Column header as written, or null when the problem is not in one column. */
  readonly column: string | null;
  /** The offending text, or null. */
  readonly value: string | null;
  readonly reason: string;
  /** The whole problem in one sentence for a person. */
  readonly message: string;
}

export type ForecastTable =
  | {
      readonly ok: true;
      readonly rows: readonly ForecastRow[];
      /** Headers of columns that were not used. */
      readonly ignoredColumns: readonly string[];
    }
  | { readonly ok: false; readonly problems: readonly ForecastTableProblem[] };

export interface ForecastTableOptions {
  /** Unit of speed columns whose header names none. */
  readonly unit?: ForecastSpeedUnit;
  /** IANA zone of times written without an offset, e.g. 'Europe/London'. */
  readonly timeZone?: string;
}

function problem(line: number | null, column: string | null, value: string | null, reason: string): ForecastTableProblem {
  const where = [line === null ? null : `line ${line}`, column === null ? null : `column "${column}"`]
    .filter((part) => part !== null)
    .join(', ');
  const what = value === null ? reason : `"${value}": ${reason}`;
  return { line, column, value, reason, message: where.length > 0 ? `${where}: ${what}` : what };
}

const missingMarks = new Set(['', '-', '–', 'na', 'n/a', 'null']);
const noDirectionMarks = new Set(['', '-', '–', 'na', 'n/a', 'null', 'vrb', 'variable']);

/**
 * ISO 8601 extended date and time, 'T' or a space between, optional seconds and fraction, optional
 * offset: 2026-06-12T14:00Z, 2026-06-12 14:00, 2026-06-12T14:00:30.5+02:00.
 */
const dateTimePattern =
  /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,3}))?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;

const daysInMonth = (year: number, month: number): number => new Date(Date.UTC(year, month, 0)).getUTCDate();

type TimeParse =
  | { ok: true; instantMs: number }
  | { ok: true; wall: WallClockTime }
  | { ok: false; reason: string };

function parseDateTime(text: string): TimeParse {
  const match = dateTimePattern.exec(text);
  if (!match) {
    return { ok: false, reason: 'not a date and time; write 2026-06-12T14:00Z (ISO 8601) or 2026-06-12 14:00 (local)' };
  }
  const [year, month, day, hour, minute] = match.slice(1, 6).map(Number) as [number, number, number, number, number];
  const second = match[6] === undefined ? 0 : Number(match[6]);
  const millisecond = match[7] === undefined ? 0 : Number(match[7].padEnd(3, '0'));
  if (month < 1 || month > 12) return { ok: false, reason: `month ${month} is not in 1..12` };
  if (day < 1 || day > daysInMonth(year, month)) return { ok: false, reason: `day ${day} does not exist in ${year}-${match[2]}` };
  if (hour > 23 || minute > 59 || second > 59) return { ok: false, reason: 'time of day must lie in 00:00:00..23:59:59' };
  const wall: WallClockTime = { year, month, day, hour, minute, second, millisecond };
  const offsetText = match[8];
  if (offsetText === undefined) return { ok: true, wall };
  let offsetMinutes = 0;
  if (offsetText.toUpperCase() !== 'Z') {
    const digits = offsetText.slice(1).replace(':', '');
    const offsetHours = Number(digits.slice(0, 2));
    const extraMinutes = digits.length > 2 ? Number(digits.slice(2)) : 0;
    if (offsetHours > 23 || extraMinutes > 59) return { ok: false, reason: `offset ${offsetText} is not a valid UTC offset` };
    offsetMinutes = (offsetText[0] === '-' ? -1 : 1) * (offsetHours * 60 + extraMinutes);
  }
  const wallAsUtcMs = Date.UTC(year, month - 1, day, hour, minute, second, millisecond);
  return { ok: true, instantMs: wallAsUtcMs - offsetMinutes * 60_000 };
}

/** A plain decimal number, optionally signed: no exponent, no digit grouping; null otherwise. */
function parseDecimal(text: string, decimalComma: boolean): number | null {
  const normal = decimalComma ? text.replace(',', '.') : text;
  return /^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(normal) ? Number(normal) : null;
}

/**
 * The rows of a forecast table, or every problem that stops it being read. Never throws for bad
 * table content; throws a RangeError for a bad `options.unit` or `options.timeZone`.
 *
 * @example
 * parseForecastTable('time;gust (km/h);dir\n2026-06-12 14:00;54;WSW', { timeZone: 'Europe/London' })
 * // → { ok: true, rows: [{ line: 2, timeMs: Date.UTC(2026, 5, 12, 13), meanMps: null, gustMps: 15, dirFromDeg: 247.5 }], ignoredColumns: [] }
 */
export function parseForecastTable(text: string, options: ForecastTableOptions = {}): ForecastTable {
  if (options.unit !== undefined && !isForecastSpeedUnit(options.unit)) {
    throw new RangeError(`parseForecastTable: options.unit must be one of m/s, km/h, kn, mph, got '${String(options.unit)}'`);
  }
  // Built once per table; throws a RangeError naming an unknown zone.
  const optionResolver = options.timeZone === undefined ? null : zonedTimeResolver(options.timeZone);

  const fail = (problems: ForecastTableProblem[]): ForecastTable => ({ ok: false, problems });
  if (typeof text !== 'string') return fail([problem(null, null, null, 'the table must be text')]);

  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
  const headerIndex = lines.findIndex((line) => line.trim().length > 0);
  if (headerIndex < 0) return fail([problem(null, null, null, 'the table is empty: paste a header row and at least one row')]);
  const headerLine = lines[headerIndex]!;
  const headerLineNumber = headerIndex + 1;
  const separator = headerLine.includes('\t') ? '\t' : headerLine.includes(';') ? ';' : ',';
  const decimalComma = separator !== ',';

  const headers = delimitedFields(headerLine, separator);
  if (headers === null) return fail([problem(headerLineNumber, null, headerLine, 'a quoted header is not closed')]);
  // A date or a bare number where the first header should be: the header row is missing.
  // ("10 min mean" is a header, so a leading digit alone is not enough.)
  if (/^\s*(\d{4}-\d{2}-\d{2}|[+-]?\d+([.,]\d+)?\s*$)/.test(headers[0] ?? '')) {
    return fail([problem(headerLineNumber, null, headerLine, 'the first line must be a header row naming the columns (time, mean, gust, direction), not data')]);
  }
  const recognised = forecastColumns(headers);
  if (!recognised.ok) {
    return fail(recognised.problems.map(({ column, reason }) => problem(headerLineNumber, column, null, reason)));
  }
  const columns = recognised.columns;

  // Header-level problems: units and zones are settled before any row is read.
  const headerProblems: ForecastTableProblem[] = [];
  const unitOf = (column: SpeedColumn | null): ForecastSpeedUnit | null => {
    if (column === null) return null;
    if (column.unit !== null && options.unit !== undefined && column.unit !== options.unit) {
      headerProblems.push(
        problem(headerLineNumber, column.header, null, `the header says ${column.unit} but the chosen unit is ${options.unit}; make them agree`),
      );
    }
    const unit = column.unit ?? options.unit ?? null;
    if (unit === null) {
      headerProblems.push(
        problem(headerLineNumber, column.header, null, 'no speed unit: write it in the header, e.g. "gust (km/h)", or choose one (m/s, km/h, kn, mph)'),
      );
    }
    return unit;
  };
  const meanUnit = unitOf(columns.mean);
  const gustUnit = unitOf(columns.gust);
  let resolver = optionResolver;
  let zoneName = options.timeZone ?? null;
  if (columns.timeZone !== null) {
    if (options.timeZone !== undefined && zoneName !== columns.timeZone) {
      // Compare canonical names: 'utc' and 'UTC' are one zone.
      const canonical = (zone: string) => new Intl.DateTimeFormat('en-US', { timeZone: zone }).resolvedOptions().timeZone;
      if (canonical(options.timeZone) !== canonical(columns.timeZone)) {
        headerProblems.push(
          problem(headerLineNumber, columns.time.header, null, `the header says ${columns.timeZone} but the chosen time zone is ${options.timeZone}; make them agree`),
        );
      }
    }
    resolver = zonedTimeResolver(columns.timeZone);
    zoneName = columns.timeZone;
  }
  if (headerProblems.length > 0) return fail(headerProblems);

  const dataLines: { lineNumber: number; line: string }[] = [];
  for (let index = headerIndex + 1; index < lines.length; index++) {
    const line = lines[index]!;
    if (line.trim().length > 0) dataLines.push({ lineNumber: index + 1, line });
  }
  if (dataLines.length === 0) return fail([problem(null, null, null, 'the table has a header but no rows')]);
  if (dataLines.length > maxForecastRows) {
    return fail([problem(null, null, null, `the table has ${dataLines.length} rows; at most ${maxForecastRows} are accepted`)]);
  }

  const rows: ForecastRow[] = [];
  const problems: ForecastTableProblem[] = [];
  const lineOfTime = new Map<number, number>();
  let previousTimeMs: number | null = null;

  const speedMps = (
    lineNumber: number,
    fields: readonly string[],
    column: SpeedColumn | null,
    unit: ForecastSpeedUnit | null,
    lineProblems: ForecastTableProblem[],
  ): number | null => {
    if (column === null || unit === null) return null;
    const raw = (fields[column.index] ?? '').trim();
    if (missingMarks.has(raw.toLowerCase())) return null;
    const value = parseDecimal(raw, decimalComma);
    if (value === null) {
      lineProblems.push(problem(lineNumber, column.header, raw, `not a number${decimalComma ? '' : ' (use a decimal point)'}`));
      return null;
    }
    if (value < 0) {
      lineProblems.push(problem(lineNumber, column.header, raw, 'a wind speed cannot be negative'));
      return null;
    }
    const mps = forecastSpeedMps(value, unit);
    if (mps > maxPlausibleSpeedMps) {
      lineProblems.push(
        problem(lineNumber, column.header, raw, `${value} ${unit} is ${mps.toFixed(1)} m/s, above the plausible ${maxPlausibleSpeedMps} m/s; check the unit`),
      );
      return null;
    }
    return mps;
  };

  for (const { lineNumber, line } of dataLines) {
    const fields = delimitedFields(line, separator);
    if (fields === null) {
      problems.push(problem(lineNumber, null, line, 'a quoted field is not closed'));
      continue;
    }
    if (fields.length !== headers.length) {
      problems.push(problem(lineNumber, null, line, `has ${fields.length} fields but the header has ${headers.length}`));
      continue;
    }
    const lineProblems: ForecastTableProblem[] = [];

    const timeText = fields[columns.time.index]!.trim();
    let timeMs: number | null = null;
    const parsedTime = parseDateTime(timeText);
    if (!parsedTime.ok) {
      lineProblems.push(problem(lineNumber, columns.time.header, timeText, parsedTime.reason));
    } else if ('instantMs' in parsedTime) {
      timeMs = parsedTime.instantMs;
    } else if (resolver === null) {
      lineProblems.push(
        problem(lineNumber, columns.time.header, timeText, 'local time without a time zone: add an offset (Z, +01:00), name the zone in the header, e.g. "time (Europe/London)", or choose one'),
      );
    } else {
      const instants = resolver(parsedTime.wall);
      if (instants.length === 0) {
        lineProblems.push(problem(lineNumber, columns.time.header, timeText, `this time does not exist in ${zoneName} (the clocks go forward then)`));
      } else {
        const earlier = instants[0]!;
        timeMs = previousTimeMs !== null && earlier <= previousTimeMs && instants.length > 1 ? instants[1]! : earlier;
      }
    }
    if (timeMs !== null) {
      const earlierLine = lineOfTime.get(timeMs);
      if (earlierLine !== undefined) {
        lineProblems.push(problem(lineNumber, columns.time.header, timeText, `the same time as line ${earlierLine}`));
      }
    }

    const meanMps = speedMps(lineNumber, fields, columns.mean, meanUnit, lineProblems);
    const gustMps = speedMps(lineNumber, fields, columns.gust, gustUnit, lineProblems);
    if (meanMps !== null && gustMps !== null && gustMps < meanMps) {
      lineProblems.push(
        problem(lineNumber, columns.gust!.header, fields[columns.gust!.index]!.trim(), 'the gust is below the mean wind; are the columns swapped?'),
      );
    }

    let dirFromDeg: number | null = null;
    if (columns.direction !== null) {
      const raw = fields[columns.direction.index]!.trim();
      if (!noDirectionMarks.has(raw.toLowerCase())) {
        const degrees = parseDecimal(raw.replace(/°$/, ''), decimalComma);
        const compass = compassPointDeg(raw);
        if (degrees !== null && degrees >= 0 && degrees <= 360) dirFromDeg = degrees === 360 ? 0 : degrees;
        else if (compass !== null) dirFromDeg = compass;
        else {
          lineProblems.push(
            problem(lineNumber, columns.direction.header, raw, 'not a direction: use degrees 0..360 or a compass point (N, NNE, ... NNW)'),
          );
        }
      }
    }

    if (lineProblems.length > 0 || timeMs === null) {
      problems.push(...lineProblems);
      continue;
    }
    lineOfTime.set(timeMs, lineNumber);
    previousTimeMs = timeMs;
    rows.push({ line: lineNumber, timeMs, meanMps, gustMps, dirFromDeg });
  }

  if (problems.length > 0) {
    if (problems.length <= maxForecastProblems) return fail(problems);
    const shown = problems.slice(0, maxForecastProblems);
    const more = problems.length - maxForecastProblems;
    return fail([...shown, problem(null, null, null, `${more} more problem${more === 1 ? '' : 's'} not shown`)]);
  }
  return { ok: true, rows, ignoredColumns: columns.ignored };
}
