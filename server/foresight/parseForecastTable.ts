/**
 * Reading a pasted or uploaded forecast table (design §2.8) into rows in SI units.
 *
 * Accepted shape:
 * - Separator: tab, semicolon or comma, taken from the header row (tab first, then semicolon).
 *   With tab or semicolon a decimal comma is accepted ("12,5"), as spreadsheets in many locales
 *   write it; with comma only a decimal point is.
 * - Header row first, naming time, mean, gust and direction in any order (see forecastColumns.ts);
 *   a time column and at least one of mean and gust are required. The date may have a column of
 *   its own ("date,time,mean,gust,dir"): then the time column holds the time of day. Fields may
 *   be double-quoted.
 * - Speed unit: in the header ("gust (km/h)", "gust_kn"), in the cells ("8 mph", "14 km/h",
 *   "12 kn", "6 m/s"), or from `options.unit` for bare numbers. One unit per column: a cell whose
 *   unit differs from the header's, the chosen one's or the column's other cells' is refused, not
 *   converted (a column that changes unit halfway is a table pasted together wrongly). With no
 *   unit anywhere the column is refused rather than guessed. Beaufort forces ("Bft 6", header
 *   "mean (Bft)") are accepted in the mean column, each read as the top of its band (see
 *   forecastSpeedUnit.ts).
 * - Time: see forecastDateTime.ts. ISO 8601 with an offset is exact; a time without an offset is
 *   wall-clock time in the zone named on the time column or in `options.timeZone` (IANA),
 *   resolved with Intl. A wall-clock time skipped by a clock change is refused; one repeated by a
 *   clock change is the earlier instant unless that would not be after the previous row, then the
 *   later one. A year-last date (03/12/2026) is read in the order chosen (`options.dateOrder`),
 *   named in the header ("date (dd/mm/yyyy)"), or detected from a date that fits one order only;
 *   a table where both orders fit is refused with the reason, never guessed. The order used is
 *   said in `notes`.
 * - Direction: degrees from north, 0..360 (360 is north), or a 16-point compass point; empty,
 *   "VRB" or "variable" means no direction.
 * - An empty cell, "-", "NA", "N/A" or "null" is a missing value (null), never 0.
 * - Speeds must lie in 0..120 m/s after conversion (the plausible range of design §3), and a gust
 *   may not be below the mean of its row.
 * Blank lines are skipped; 1..1000 data rows. Every bad line is reported, up to 50 problems and
 * then how many more, each message starting with where it is in plain words:
 * 'Line 4, column 3 (gust): "8 mhp" is not a speed — use m/s, km/h, mph or kn' (lines counted from
 * 1 at the first line of the text, columns from 1 at the left).
 *
 * Why this file is long (about 560 lines): it is one reader whose phases (header and its settings,
 * splitting the lines, the date order of the whole table, the cells, the order of the rows) share
 * the header's settings and one problem list, marked "----" below. The parts that stand alone are
 * in their own files: columns (forecastColumns.ts), dates and times (forecastDateTime.ts), speed
 * units (forecastSpeedUnit.ts), zones (zonedTimeResolver.ts), fields (formats/delimitedText.ts).
 */
import { compassPointDeg } from './compassPointDeg.ts';
import { readDelimited, type DelimitedProblem } from '../formats/delimitedText.ts';
import { forecastColumns, type ColumnRef, type SpeedColumn } from './forecastColumns.ts';
import {
  bothReadings,
  calendarDate,
  dateOrderWords,
  isDateOrder,
  orderEvidence,
  readClock,
  readDate,
  readDateTime,
  type ClockText,
  type DateOrder,
  type DateText,
} from './forecastDateTime.ts';
import {
  beaufortTopMps,
  forecastSpeedMps,
  isForecastSpeedUnit,
  speedCell,
  unitWords,
  type ForecastCellUnit,
  type ForecastSpeedUnit,
} from './forecastSpeedUnit.ts';
import { maxPlausibleSpeedMps } from '../engine/limits.ts';
import { beaufortRangeMps } from '../engine/units.ts';
import { zonedTimeResolver } from './zonedTimeResolver.ts';

export const maxForecastRows = 1000;
/** More problems than this are summarised: a wrong table produces the same problem on every line. */
export const maxForecastProblems = 50;
/** Longest piece of a cell quoted back in a message. */
const maxQuotedChars = 40;

export interface ForecastRow {
  /** Line of the table this row came from, counted from 1 at the first line of the text. */
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
  /** Line number counted from 1 at the first line of the text, or null for the table as a whole. */
  readonly line: number | null;
  /** Column header as written, or null when the problem is not in one column. */
  readonly column: string | null;
  /** Column number counted from 1 at the left, or null. */
  readonly columnNumber: number | null;
  /** The offending text, or null. */
  readonly value: string | null;
  readonly reason: string;
  /** The whole problem in one sentence for a person, starting with where it is. */
  readonly message: string;
}

export type ForecastTable =
  | {
      readonly ok: true;
      readonly rows: readonly ForecastRow[];
      /** Headers of columns that were not used. */
      readonly ignoredColumns: readonly string[];
      /** How the table was read, in sentences: units per column, the date order and why, the zone. */
      readonly notes: readonly string[];
      /** The order year-last dates were read in, or null when the table has none that needed one. */
      readonly dateOrder: DateOrder | null;
    }
  | { readonly ok: false; readonly problems: readonly ForecastTableProblem[] };

export interface ForecastTableOptions {
  /** Unit of speeds written as bare numbers in columns whose header names none. */
  readonly unit?: ForecastSpeedUnit;
  /** IANA zone of times written without an offset, e.g. 'Europe/London'. */
  readonly timeZone?: string;
  /** Order of dates written with the year last (03/12/2026). */
  readonly dateOrder?: DateOrder;
}

/** A table line's problem with its quotes, in words ("field" becomes "header" on the header line). */
const quoteProblemWords: Readonly<Record<DelimitedProblem, string>> = {
  'unclosed-quote': 'a quoted field is not closed — add the closing "',
  'text-after-quote': 'a quoted field has text after its closing quote — put the whole field in quotes',
};

/** One line's fields, split with the one delimited-text reader (formats/delimitedText.ts); a line here holds no line break. */
function lineFields(line: string, separator: string): { ok: true; fields: string[] } | { ok: false; problem: DelimitedProblem } {
  const read = readDelimited(line, separator);
  if (!read.ok) return read;
  return { ok: true, fields: read.records[0]?.fields ?? [''] };
}

const quoted = (text: string): string => `"${text.length > maxQuotedChars ? `${text.slice(0, maxQuotedChars - 1)}…` : text}"`;
const capitalised = (text: string): string => text.charAt(0).toUpperCase() + text.slice(1);

/**
 * One problem. `reason` reads on from the quoted value when there is one ("is not a speed — ...")
 * and stands alone otherwise ("no speed unit — ...").
 */
function problem(line: number | null, column: ColumnRef | null, value: string | null, reason: string): ForecastTableProblem {
  const where =
    line !== null && column !== null
      ? `Line ${line}, column ${column.index + 1} (${column.header})`
      : line !== null
        ? `Line ${line}`
        : column !== null
          ? `Column ${column.index + 1} (${column.header})`
          : null;
  const what = value === null ? reason : `${quoted(value)} ${reason}`;
  return {
    line,
    column: column?.header ?? null,
    columnNumber: column === null ? null : column.index + 1,
    value,
    reason,
    message: where === null ? capitalised(what) : `${where}: ${what}`,
  };
}

const noDirectionMarks = new Set(['', '-', '–', '—', 'na', 'n/a', 'null', 'vrb', 'variable']);

/** A plain decimal number, optionally signed: no exponent, no digit grouping; null otherwise. */
function parseDecimal(text: string, decimalComma: boolean): number | null {
  const normal = decimalComma ? text.replace(',', '.') : text;
  return /^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(normal) ? Number(normal) : null;
}

/** Where a unit came from, for the notes. */
type UnitSource = 'header' | 'chosen' | 'cells';

interface SpeedColumnPlan {
  readonly column: SpeedColumn;
  readonly role: 'mean' | 'gust';
  /** Unit of the header or the chosen unit: bare numbers are in it, and cells must agree with it. */
  readonly declared: { unit: ForecastCellUnit; source: 'header' | 'chosen' } | null;
  /** The first cell that names a unit. */
  readonly firstCellUnit: { unit: ForecastCellUnit; line: number } | null;
}

/**
 * The rows of a forecast table, or every problem that stops it being read. Never throws for bad
 * table content; throws a RangeError for a bad `options.unit`, `options.timeZone` or
 * `options.dateOrder`.
 *
 * @example
 * parseForecastTable('date;time;gust;dir\n13/06/2026;14:00;54 km/h;WSW', { timeZone: 'Europe/London' })
 * // → { ok: true, rows: [{ line: 2, timeMs: Date.UTC(2026, 5, 13, 13), meanMps: null, gustMps: 15, dirFromDeg: 247.5 }],
 * //     dateOrder: 'day-first', notes: ['Dates read day first (day/month/year): line 2 has 13/06/2026, and there is no month 13.', ...], ... }
 */
export function parseForecastTable(text: string, options: ForecastTableOptions = {}): ForecastTable {
  if (options.unit !== undefined && !isForecastSpeedUnit(options.unit)) {
    throw new RangeError(`parseForecastTable: options.unit must be one of m/s, km/h, kn, mph, got '${String(options.unit)}'`);
  }
  if (options.dateOrder !== undefined && !isDateOrder(options.dateOrder)) {
    throw new RangeError(`parseForecastTable: options.dateOrder must be 'day-first' or 'month-first', got '${String(options.dateOrder)}'`);
  }
  // Built once per table; throws a RangeError naming an unknown zone.
  const optionResolver = options.timeZone === undefined ? null : zonedTimeResolver(options.timeZone);

  const fail = (problems: ForecastTableProblem[]): ForecastTable => ({ ok: false, problems });
  if (typeof text !== 'string') return fail([problem(null, null, null, 'the table must be text')]);

  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
  const headerIndex = lines.findIndex((line) => line.trim().length > 0);
  if (headerIndex < 0) return fail([problem(null, null, null, 'the table is empty — paste a header row and at least one row')]);
  const headerLine = lines[headerIndex]!;
  const headerLineNumber = headerIndex + 1;
  const separator = headerLine.includes('\t') ? '\t' : headerLine.includes(';') ? ';' : ',';
  const decimalComma = separator !== ',';

  const headerRead = lineFields(headerLine, separator);
  if (!headerRead.ok) return fail([problem(headerLineNumber, null, null, quoteProblemWords[headerRead.problem].replace('field', 'header'))]);
  const headers = headerRead.fields;
  // A date or a bare number where the first header should be: the header row is missing.
  // ("10 min mean" is a header, so a leading digit alone is not enough.)
  if (/^\s*(\d{4}-\d{2}-\d{2}|\d{1,2}[./-]\d{1,2}[./-]\d{2,4}|[+-]?\d+([.,]\d+)?\s*$)/.test(headers[0] ?? '')) {
    return fail([problem(headerLineNumber, null, null, 'holds data, but the first line must be a header row naming the columns (time, mean, gust, direction)')]);
  }
  const recognised = forecastColumns(headers);
  if (!recognised.ok) {
    return fail(recognised.problems.map(({ column, reason }) => problem(headerLineNumber, column, null, reason)));
  }
  const columns = recognised.columns;

  // ---- Header-level settings: zone and date order are settled before any row is read. ----
  const headerProblems: ForecastTableProblem[] = [];
  let resolver = optionResolver;
  let zoneName = options.timeZone ?? null;
  if (columns.timeZone !== null) {
    if (options.timeZone !== undefined) {
      // Compare canonical names: 'utc' and 'UTC' are one zone.
      const canonical = (zone: string) => new Intl.DateTimeFormat('en-US', { timeZone: zone }).resolvedOptions().timeZone;
      if (canonical(options.timeZone) !== canonical(columns.timeZone)) {
        headerProblems.push(
          problem(headerLineNumber, columns.time, null, `the header says ${columns.timeZone} but the chosen time zone is ${options.timeZone} — make them agree`),
        );
      }
    }
    resolver = zonedTimeResolver(columns.timeZone);
    zoneName = columns.timeZone;
  }
  if (columns.dateOrder !== null && options.dateOrder !== undefined && columns.dateOrder !== options.dateOrder) {
    headerProblems.push(
      problem(
        headerLineNumber,
        columns.date ?? columns.time,
        null,
        `the header says dates are ${dateOrderWords(columns.dateOrder)} but the chosen order is ${dateOrderWords(options.dateOrder)} — make them agree`,
      ),
    );
  }
  const declaredOf = (column: SpeedColumn | null): SpeedColumnPlan['declared'] => {
    if (column === null) return null;
    if (column.unit !== null && options.unit !== undefined && column.unit !== options.unit) {
      headerProblems.push(
        problem(headerLineNumber, column, null, `the header says ${unitWords(column.unit)} but the chosen unit is ${options.unit} — make them agree`),
      );
    }
    if (column.unit !== null) return { unit: column.unit, source: 'header' };
    return options.unit === undefined ? null : { unit: options.unit, source: 'chosen' };
  };
  const meanDeclared = declaredOf(columns.mean);
  const gustDeclared = declaredOf(columns.gust);
  if (headerProblems.length > 0) return fail(headerProblems);

  // ---- Split every data line. ----
  const problems: ForecastTableProblem[] = [];
  const dataLines: { lineNumber: number; fields: string[] }[] = [];
  let lineCount = 0;
  for (let index = headerIndex + 1; index < lines.length; index++) {
    const line = lines[index]!;
    if (line.trim().length === 0) continue;
    lineCount++;
    if (lineCount > maxForecastRows) continue;
    const lineNumber = index + 1;
    const read = lineFields(line, separator);
    const fields = read.ok ? read.fields : [];
    if (!read.ok) {
      problems.push(problem(lineNumber, null, null, quoteProblemWords[read.problem]));
    } else if (fields.length !== headers.length) {
      const hint =
        separator === ',' && fields.length > headers.length && /\d,\d/.test(line)
          ? ' — a decimal comma splits a number in a comma-separated table: use a decimal point, or separate the columns with semicolons'
          : ' — every row needs one field per column';
      problems.push(problem(lineNumber, null, null, `has ${fields.length} fields but the header has ${headers.length}${hint}`));
    } else {
      dataLines.push({ lineNumber, fields });
    }
  }
  if (lineCount === 0) return fail([problem(null, null, null, 'the table has a header but no rows — paste the rows under it')]);
  if (lineCount > maxForecastRows) {
    return fail([problem(null, null, null, `the table has ${lineCount} rows; at most ${maxForecastRows} are accepted — split it`)]);
  }

  // ---- Dates: read every date first, so the order is settled for the whole table. ----
  const dateColumn = columns.date ?? columns.time;
  const dateTexts = new Map<number, DateText>();
  const clockTexts = new Map<number, ClockText>();
  for (const { lineNumber, fields } of dataLines) {
    if (columns.date !== null) {
      const date = readDate(fields[columns.date.index]!);
      if (date.ok) dateTexts.set(lineNumber, date.value);
    } else {
      const both = readDateTime(fields[columns.time.index]!);
      if (both.ok) {
        dateTexts.set(lineNumber, both.value.date);
        clockTexts.set(lineNumber, both.value.clock);
      }
    }
  }
  const statedOrder = options.dateOrder ?? columns.dateOrder;
  const statedBy = options.dateOrder !== undefined ? 'as chosen' : 'as the header says';
  let dateOrder: DateOrder | null = statedOrder;
  let orderNote: string | null = null;
  /** False when year-last dates cannot be read at all (no order); their rows are not reported one by one. */
  let orderSettled = true;
  if (statedOrder !== null) {
    // Said only when some date needed it: year-first dates and 03/03/2026 read the same either way.
    const needed = [...dateTexts.values()].some((d) => orderEvidence(d) !== 'either');
    if (needed) orderNote = `Dates read ${dateOrderWords(statedOrder)}, ${statedBy}.`;
  } else {
    let dayFirst: { line: number; date: DateText } | null = null;
    let monthFirst: { line: number; date: DateText } | null = null;
    let ambiguous: { line: number; date: DateText } | null = null;
    for (const [line, date] of dateTexts) {
      const evidence = orderEvidence(date);
      if (evidence === 'day-first') dayFirst ??= { line, date };
      else if (evidence === 'month-first') monthFirst ??= { line, date };
      else if (evidence === 'ambiguous') ambiguous ??= { line, date };
    }
    const written = (line: number) => dataLines.find((d) => d.lineNumber === line)!.fields[dateColumn.index]!.trim();
    if (dayFirst !== null && monthFirst !== null) {
      orderSettled = false;
      problems.push(
        problem(
          monthFirst.line,
          dateColumn,
          written(monthFirst.line),
          `fits only month first, but line ${dayFirst.line} (${quoted(written(dayFirst.line))}) fits only day first — the dates do not follow one order; correct them, or write them as 2026-12-03`,
        ),
      );
    } else if (dayFirst !== null || monthFirst !== null) {
      const evidence = (dayFirst ?? monthFirst)!;
      dateOrder = dayFirst !== null ? 'day-first' : 'month-first';
      const noMonth = evidence.date.kind === 'pair' ? (dayFirst !== null ? evidence.date.first : evidence.date.second) : 0;
      orderNote = `Dates read ${dateOrderWords(dateOrder)}: line ${evidence.line} has ${written(evidence.line)}, and there is no month ${noMonth}.`;
    } else if (ambiguous !== null) {
      orderSettled = false;
      const date = ambiguous.date as DateText & { kind: 'pair' };
      problems.push(
        problem(
          ambiguous.line,
          dateColumn,
          written(ambiguous.line),
          `could be ${bothReadings(date)}, and no date in the table settles it — choose the date order, name it in the header ("date (dd/mm/yyyy)"), or write dates as ${date.year}-MM-DD`,
        ),
      );
    }
  }

  // ---- Speed columns: the unit each is in. ----
  const planOf = (column: SpeedColumn | null, role: 'mean' | 'gust', declared: SpeedColumnPlan['declared']): SpeedColumnPlan | null => {
    if (column === null) return null;
    let firstCellUnit: SpeedColumnPlan['firstCellUnit'] = null;
    for (const { lineNumber, fields } of dataLines) {
      const cell = speedCell(fields[column.index]!, decimalComma);
      if (cell.kind === 'number' && cell.unit !== null) {
        firstCellUnit = { unit: cell.unit, line: lineNumber };
        break;
      }
    }
    if (declared === null && firstCellUnit === null) {
      problems.push(
        problem(headerLineNumber, column, null, 'no speed unit — write it in the header ("gust (km/h)") or in the cells ("8 mph"), or choose one (m/s, km/h, mph or kn)'),
      );
      return null;
    }
    return { column, role, declared, firstCellUnit };
  };
  const meanPlan = planOf(columns.mean, 'mean', meanDeclared);
  const gustPlan = planOf(columns.gust, 'gust', gustDeclared);
  let zoneUsed = false;

  const speedMps = (lineNumber: number, fields: readonly string[], plan: SpeedColumnPlan | null, lineProblems: ForecastTableProblem[]): number | null => {
    if (plan === null) return null;
    const { column } = plan;
    const raw = fields[column.index]!.trim();
    const cell = speedCell(raw, decimalComma);
    const fault = (reason: string) => {
      lineProblems.push(problem(lineNumber, column, raw, reason));
      return null;
    };
    if (cell.kind === 'missing') return null;
    if (cell.kind === 'bad') return fault(cell.reason);
    let unit: ForecastCellUnit;
    if (cell.unit === null) {
      if (plan.declared === null) {
        const { unit: other, line } = plan.firstCellUnit!;
        const example = other === 'Bft' ? `Bft ${raw}` : `${raw} ${other}`;
        return fault(`has no unit, but line ${line} of this column is in ${unitWords(other)} — write the unit in every cell ("${example}"), or in the header`);
      }
      unit = plan.declared.unit;
    } else {
      unit = cell.unit;
      if (plan.declared !== null && unit !== plan.declared.unit) {
        const said = plan.declared.source === 'header' ? 'the header says' : 'the chosen unit is';
        return fault(`is in ${unitWords(unit)} but ${said} ${unitWords(plan.declared.unit)} — one unit per column; mixed units are refused, not converted`);
      }
      if (plan.declared === null && unit !== plan.firstCellUnit!.unit) {
        return fault(
          `is in ${unitWords(unit)} but line ${plan.firstCellUnit!.line} of this column is in ${unitWords(plan.firstCellUnit!.unit)} — one unit per column; mixed units are refused, not converted, so convert these cells first`,
        );
      }
    }
    if (cell.value < 0) return fault('is negative — a wind speed cannot be');
    if (unit === 'Bft') {
      if (plan.role === 'gust') return fault('is a Beaufort force, which describes the mean wind, not gusts — give the gust as a speed (m/s, km/h, mph or kn)');
      if (!Number.isInteger(cell.value) || cell.value > 12) return fault('is not a Beaufort force — forces are whole numbers from 0 to 12');
      if (cell.value === 12) return fault('is Beaufort 12, which has no upper limit (32.7 m/s and above), so no speed can stand for it — give the mean wind as a speed');
      return beaufortTopMps(cell.value);
    }
    const mps = forecastSpeedMps(cell.value, unit);
    if (mps > maxPlausibleSpeedMps) {
      return fault(`is ${mps.toFixed(1)} m/s, above the plausible ${maxPlausibleSpeedMps} m/s — check the unit`);
    }
    return mps;
  };

  // ---- The rows. ----
  const rows: ForecastRow[] = [];
  const lineOfTime = new Map<number, number>();
  let previousTimeMs: number | null = null;

  for (const { lineNumber, fields } of dataLines) {
    const lineProblems: ForecastTableProblem[] = [];

    // Date and time of the row.
    let timeMs: number | null = null;
    const timeRaw = fields[columns.time.index]!.trim();
    let date: DateText | null = null;
    let clock: ClockText | null = null;
    if (columns.date !== null) {
      const dateRaw = fields[columns.date.index]!.trim();
      const readD = readDate(dateRaw);
      if (dateRaw.length === 0) lineProblems.push(problem(lineNumber, columns.date, null, 'has no date — every row needs one'));
      else if (!readD.ok) {
        const hasTime = readDateTime(dateRaw).ok;
        lineProblems.push(
          problem(lineNumber, columns.date, dateRaw, hasTime ? `holds a time as well — with a separate time column, column ${columns.date.index + 1} holds only the date` : readD.reason),
        );
      } else date = readD.value;
      const readC = readClock(timeRaw, true);
      if (timeRaw.length === 0) lineProblems.push(problem(lineNumber, columns.time, null, 'has no time — every row needs one'));
      else if (!readC.ok) {
        const hasDate = readDateTime(timeRaw).ok;
        lineProblems.push(
          problem(lineNumber, columns.time, timeRaw, hasDate ? `holds a date as well — with a separate date column, column ${columns.time.index + 1} holds only the time of day (14:00)` : readC.reason),
        );
      } else clock = readC.value;
    } else if (timeRaw.length === 0) {
      lineProblems.push(problem(lineNumber, columns.time, null, 'has no time — every row needs one'));
    } else {
      const both = readDateTime(timeRaw);
      if (!both.ok) lineProblems.push(problem(lineNumber, columns.time, timeRaw, both.reason));
      else ({ date, clock } = both.value);
    }
    if (date !== null && clock !== null) {
      const cal = calendarDate(date, dateOrder);
      if (!cal.ok) {
        // Without a settled order the table-wide problem above says it once.
        if (orderSettled || orderEvidence(date) === 'either') {
          lineProblems.push(problem(lineNumber, dateColumn, fields[dateColumn.index]!.trim(), cal.reason));
        }
      } else {
        const { year, month, day } = cal.value;
        const wall = { year, month, day, hour: clock.hour, minute: clock.minute, second: clock.second, millisecond: clock.millisecond };
        if (clock.offsetMinutes !== null) {
          timeMs = Date.UTC(year, month - 1, day, clock.hour, clock.minute, clock.second, clock.millisecond) - clock.offsetMinutes * 60_000;
        } else if (resolver === null) {
          lineProblems.push(
            problem(lineNumber, columns.time, timeRaw, 'is a local time without a time zone — add an offset (Z, +01:00), name the zone in the header ("time (Europe/London)"), or choose one'),
          );
        } else {
          zoneUsed = true;
          const instants = resolver(wall);
          if (instants.length === 0) {
            lineProblems.push(problem(lineNumber, columns.time, timeRaw, `does not exist in ${zoneName} — the clocks go forward then`));
          } else {
            const earlier = instants[0]!;
            timeMs = previousTimeMs !== null && earlier <= previousTimeMs && instants.length > 1 ? instants[1]! : earlier;
          }
        }
      }
    }
    if (timeMs !== null) {
      const earlierLine = lineOfTime.get(timeMs);
      if (earlierLine !== undefined) {
        lineProblems.push(problem(lineNumber, columns.time, timeRaw, `is the same time as line ${earlierLine} — keep one of them`));
      }
    }

    const meanMps = speedMps(lineNumber, fields, meanPlan, lineProblems);
    const gustMps = speedMps(lineNumber, fields, gustPlan, lineProblems);
    if (meanMps !== null && gustMps !== null && gustMps < meanMps) {
      lineProblems.push(problem(lineNumber, columns.gust!, fields[columns.gust!.index]!.trim(), 'is below the mean wind of its row — are the columns swapped?'));
    }

    let dirFromDeg: number | null = null;
    if (columns.direction !== null) {
      const raw = fields[columns.direction.index]!.trim();
      if (!noDirectionMarks.has(raw.toLowerCase())) {
        const degrees = parseDecimal(raw.replace(/\s*°$/, ''), decimalComma);
        const compass = compassPointDeg(raw);
        if (degrees !== null && degrees >= 0 && degrees <= 360) dirFromDeg = degrees === 360 ? 0 : degrees;
        else if (compass !== null) dirFromDeg = compass;
        else {
          lineProblems.push(problem(lineNumber, columns.direction, raw, 'is not a direction — use degrees 0..360 or a compass point (N, NNE, ... NNW)'));
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
    const sorted = [...problems].sort((a, b) => (a.line ?? 0) - (b.line ?? 0));
    if (sorted.length <= maxForecastProblems) return fail(sorted);
    const shown = sorted.slice(0, maxForecastProblems);
    const more = sorted.length - maxForecastProblems;
    return fail([...shown, problem(null, null, null, `${more} more problem${more === 1 ? '' : 's'} not shown`)]);
  }

  // ---- How the table was read, in words. ----
  const notes: string[] = [];
  if (columns.date !== null) {
    notes.push(`Date from column ${columns.date.index + 1} (${columns.date.header}), time of day from column ${columns.time.index + 1} (${columns.time.header}).`);
  }
  if (orderNote !== null) notes.push(orderNote);
  if (zoneUsed && zoneName !== null) {
    notes.push(`Times without an offset are ${zoneName} time${columns.timeZone !== null ? ', as the header says' : ''}.`);
  }
  for (const plan of [meanPlan, gustPlan]) {
    if (plan === null) continue;
    const unit = plan.declared?.unit ?? plan.firstCellUnit!.unit;
    const source: UnitSource = plan.declared?.source ?? 'cells';
    const from = source === 'header' ? 'from the header' : source === 'chosen' ? 'as chosen' : 'from the cells';
    const name = `${capitalised(plan.role === 'mean' ? 'mean wind' : 'gust')} (column ${plan.column.index + 1}, ${plan.column.header})`;
    if (unit === 'Bft') {
      const { lowerMps } = beaufortRangeMps(6);
      notes.push(
        `${name}: Beaufort forces, ${from}; each force is read as the top of its band on the WMO Beaufort scale (force 6, ${lowerMps.toFixed(1)}–${beaufortTopMps(6).toFixed(1)} m/s, as ${beaufortTopMps(6).toFixed(1)} m/s), so a level is never predicted lower than the band allows.`,
      );
    } else {
      notes.push(`${name}: ${unit}, ${from}.`);
    }
  }
  return { ok: true, rows, ignoredColumns: columns.ignored, notes, dateOrder: orderNote === null ? null : dateOrder };
}
