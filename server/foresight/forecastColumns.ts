/**
 * Recognising the columns of a forecast table from its header row: which column holds the time
 * (or the date and the time of day in two columns), the mean wind, the gust and the direction, in
 * any order, under common names, with an optional annotation either in brackets ("gust (km/h)",
 * "gust [kn]", "date (dd/mm/yyyy)", "time (UTC)") or as a last word ("gust_kn", "time utc").
 * Columns with other names (temperature, rain...) are ignored and listed so the user can see it.
 */
import type { DateOrder } from './forecastDateTime.ts';
import { forecastUnitOf, type ForecastCellUnit } from './forecastSpeedUnit.ts';

type Role = 'time' | 'date' | 'mean' | 'gust' | 'direction';

/** Column names (lower case; spaces, '_', '-', '.', '/', ',' as one space) → what they hold. */
const namesByRole: Readonly<Record<Role, readonly string[]>> = {
  time: [
    'time', 'timestamp', 'datetime', 'date time', 'date and time', 'valid time', 'valid at', 'forecast time', 'ts',
    'hour', 'time of day', 'local time', 'valid hour',
  ],
  date: ['date', 'valid date', 'forecast date', 'calendar date'],
  mean: [
    'mean', 'mean wind', 'mean speed', 'mean wind speed', 'wind mean', 'wind', 'wind speed', 'speed', 'ws', 'wspd',
    'average', 'average wind', 'average wind speed', 'avg', 'avg wind', 'sustained', 'sustained wind', '10 min mean',
  ],
  gust: [
    'gust', 'gusts', 'gust speed', 'wind gust', 'wind gusts', 'peak gust', 'max gust', 'maximum gust', 'peak wind',
    'peak', 'wind gust speed', 'gust 3s', '3s gust', 'wgust',
  ],
  direction: [
    'direction', 'dir', 'wind direction', 'wind dir', 'wd', 'wdir', 'from', 'direction from', 'wind from', 'bearing',
  ],
};

const roleOfName: ReadonlyMap<string, Role> = new Map(
  (Object.entries(namesByRole) as [Role, readonly string[]][]).flatMap(([role, names]) =>
    names.map((name) => [name, role] as const),
  ),
);

/** Annotations a direction column may carry: it is always degrees from north or compass points. */
const directionAnnotations = new Set(['deg', 'degree', 'degrees', '°', 'from', 'deg from', 'degrees from', 'compass']);
/** Annotations on a time column that mean UTC. */
const utcAnnotations = new Set(['utc', 'z', 'gmt']);

/** A column: where it is (0-based) and its header as written. */
export interface ColumnRef {
  readonly index: number;
  readonly header: string;
}

export interface SpeedColumn extends ColumnRef {
  /** Unit named in the header, or null when the header names none. */
  readonly unit: ForecastCellUnit | null;
}

export interface ForecastColumns {
  /** The date and time, or with `date` set the time of day only. */
  readonly time: ColumnRef;
  /** A separate date column, or null when the time column holds the date too. */
  readonly date: ColumnRef | null;
  readonly mean: SpeedColumn | null;
  readonly gust: SpeedColumn | null;
  readonly direction: ColumnRef | null;
  /** Time zone named on the time or date column ("time (UTC)", "time (Europe/Paris)"), or null. */
  readonly timeZone: string | null;
  /** Date order named on the date or time column ("date (dd/mm/yyyy)"), or null. */
  readonly dateOrder: DateOrder | null;
  /** Headers of columns that are not used. */
  readonly ignored: readonly string[];
}

export interface ColumnProblem {
  readonly column: ColumnRef | null;
  readonly reason: string;
}

/**
 * A date pattern written as an annotation: "dd/mm/yyyy", "DD.MM.YYYY", "mm/dd/yy hh:mm",
 * "yyyy-mm-dd" → the order it states (null for year first, which needs none), or undefined when
 * the text is not a date pattern.
 */
function datePatternOrder(text: string): DateOrder | null | undefined {
  const m = /^(d{1,2}|m{1,2}|y{2,4})([./-])(d{1,2}|m{1,2})\2(d{1,2}|m{1,2}|y{2,4})(\s+h{1,2}[:.]?m{2}([:.]s{2})?)?$/i.exec(text.trim());
  if (!m) return undefined;
  const parts = [m[1]!, m[3]!, m[4]!].map((p) => p[0]!.toLowerCase()).join('');
  if (parts === 'dmy') return 'day-first';
  if (parts === 'mdy') return 'month-first';
  if (parts === 'ymd') return null;
  return undefined;
}

const normalName = (text: string): string =>
  text
    .toLowerCase()
    .replace(/[\s_\-./,]+/g, ' ')
    .trim();

/** Splits a header into a role and its annotation (unit or zone), or null if the name is unknown. */
function headerRole(header: string): { role: Role; annotation: string | null } | null {
  const trimmed = header.trim();
  const bracketed = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(trimmed);
  if (bracketed) {
    const role = roleOfName.get(normalName(bracketed[1]!));
    return role === undefined ? null : { role, annotation: bracketed[2]! };
  }
  const whole = roleOfName.get(normalName(trimmed));
  if (whole !== undefined) return { role: whole, annotation: null };
  // "gust_kn", "time utc": the last word may be the annotation.
  const words = trimmed.split(/[\s_,]+/);
  if (words.length < 2) return null;
  const role = roleOfName.get(normalName(words.slice(0, -1).join(' ')));
  return role === undefined ? null : { role, annotation: words.at(-1)! };
}

function isKnownTimeZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    return true;
  } catch {
    // Intl throws a RangeError for an unknown zone; that is the answer, not a failure.
    return false;
  }
}

/**
 * The columns a header row names, or every problem with it: a column named twice, an unknown
 * unit, zone or date pattern, Beaufort on a gust column, no time column, or neither a mean nor a
 * gust column.
 */
export function forecastColumns(
  headers: readonly string[],
): { ok: true; columns: ForecastColumns } | { ok: false; problems: ColumnProblem[] } {
  const problems: ColumnProblem[] = [];
  const found: Partial<Record<Role, { index: number; header: string; annotation: string | null }>> = {};
  const ignored: string[] = [];
  const ref = (column: { index: number; header: string }): ColumnRef => ({ index: column.index, header: column.header });

  headers.forEach((rawHeader, index) => {
    const header = rawHeader.trim();
    const recognised = header.length === 0 ? null : headerRole(header);
    if (recognised === null) {
      if (header.length > 0) ignored.push(header);
      return;
    }
    const earlier = found[recognised.role];
    if (earlier !== undefined) {
      problems.push({
        column: { index, header },
        reason: `holds the ${recognised.role} like column ${earlier.index + 1} ("${earlier.header}") — keep one of them`,
      });
      return;
    }
    found[recognised.role] = { index, header, annotation: recognised.annotation };
  });

  const speedColumn = (role: 'mean' | 'gust'): SpeedColumn | null => {
    const column = found[role];
    if (column === undefined) return null;
    if (column.annotation === null) return { ...ref(column), unit: null };
    const unit = forecastUnitOf(column.annotation);
    if (unit === null) {
      problems.push({ column: ref(column), reason: `the unit "${column.annotation}" is not known — use m/s, km/h, mph or kn` });
    } else if (unit === 'Bft' && role === 'gust') {
      problems.push({ column: ref(column), reason: 'Beaufort forces describe the mean wind, not gusts — give the gusts as a speed (m/s, km/h, mph or kn)' });
    }
    return { ...ref(column), unit };
  };
  const mean = speedColumn('mean');
  const gust = speedColumn('gust');

  const direction = found.direction;
  if (direction?.annotation != null && !directionAnnotations.has(direction.annotation.toLowerCase().replace(/\s+/g, ' '))) {
    problems.push({
      column: ref(direction),
      reason: `direction must be in degrees from north or compass points, not "${direction.annotation}"`,
    });
  }

  // Annotations on the time and date columns: a zone, a date pattern, or both ("dd/mm/yyyy, UTC").
  const stated: { timeZone: string | null; dateOrder: DateOrder | null } = { timeZone: null, dateOrder: null };
  const readTimeAnnotation = (column: { index: number; header: string; annotation: string | null } | undefined) => {
    if (column?.annotation == null) return;
    for (const part of column.annotation.split(/\s*[,;]\s*/)) {
      const text = part.trim();
      const lower = text.toLowerCase();
      const order = datePatternOrder(text);
      if (text.length === 0 || lower === 'local' || lower === 'hh:mm' || lower === 'hh:mm:ss') continue;
      if (order !== undefined) {
        if (order !== null && stated.dateOrder !== null && stated.dateOrder !== order) {
          problems.push({ column: ref(column), reason: `"${text}" contradicts the date pattern of the other date column — name one order` });
        } else if (order !== null) stated.dateOrder = order;
      } else if (utcAnnotations.has(lower)) {
        stated.timeZone = 'UTC';
      } else if (isKnownTimeZone(text)) {
        stated.timeZone = text;
      } else {
        problems.push({
          column: ref(column),
          reason: `"${text}" is neither a time zone nor a date pattern — use UTC or an IANA name such as Europe/London, or a pattern such as dd/mm/yyyy`,
        });
      }
    }
  };
  const time = found.time;
  const date = found.date;
  readTimeAnnotation(date);
  readTimeAnnotation(time);

  if (time === undefined) {
    problems.push({
      column: date === undefined ? null : ref(date),
      reason:
        date === undefined
          ? 'no time column — name one "time", "timestamp" or "datetime"'
          : 'a date column needs a time column beside it — add one named "time" holding the time of day (14:00)',
    });
  }
  if (mean === null && gust === null) {
    problems.push({ column: null, reason: 'no wind column — name a "gust" column, a "mean" column or both' });
  }

  if (problems.length > 0 || time === undefined) return { ok: false, problems };
  return {
    ok: true,
    columns: {
      time: ref(time),
      date: date === undefined ? null : ref(date),
      mean,
      gust,
      direction: direction === undefined ? null : ref(direction),
      timeZone: stated.timeZone,
      dateOrder: stated.dateOrder,
      ignored,
    },
  };
}
