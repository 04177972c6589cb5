/**
 * Recognising the columns of a forecast table from its header row: which column holds the time,
 * the mean wind, the gust and the direction, in any order, under common names, with an optional
 * unit either in brackets ("gust (km/h)", "gust [kn]") or as a last word ("gust_kn", "gust kmh").
 * Columns with other names (temperature, rain...) are ignored and listed so the user can see it.
 */
import { forecastSpeedUnitOf, type ForecastSpeedUnit } from './forecastSpeedUnit.ts';

type Role = 'time' | 'mean' | 'gust' | 'direction';

/** Column names (lower case; spaces, '_', '-', '.', '/', ',' as one space) → what they hold. */
const namesByRole: Readonly<Record<Role, readonly string[]>> = {
  time: ['time', 'timestamp', 'datetime', 'date time', 'date and time', 'valid time', 'valid at', 'forecast time', 'ts'],
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

export interface SpeedColumn {
  readonly index: number;
  readonly header: string;
  /** Unit named in the header, or null when the header names none. */
  readonly unit: ForecastSpeedUnit | null;
}

export interface ForecastColumns {
  readonly time: { readonly index: number; readonly header: string };
  readonly mean: SpeedColumn | null;
  readonly gust: SpeedColumn | null;
  readonly direction: { readonly index: number; readonly header: string } | null;
  /** Time zone named on the time column ("time (UTC)", "time (Europe/Paris)"), or null. */
  readonly timeZone: string | null;
  /** Headers of columns that are not used. */
  readonly ignored: readonly string[];
}

export interface ColumnProblem {
  readonly column: string | null;
  readonly reason: string;
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
 * unit or zone, no time column, or neither a mean nor a gust column.
 */
export function forecastColumns(
  headers: readonly string[],
): { ok: true; columns: ForecastColumns } | { ok: false; problems: ColumnProblem[] } {
  const problems: ColumnProblem[] = [];
  const found: Partial<Record<Role, { index: number; header: string; annotation: string | null }>> = {};
  const ignored: string[] = [];

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
        column: header,
        reason: `holds the ${recognised.role} like column "${earlier.header}"; keep one of them`,
      });
      return;
    }
    found[recognised.role] = { index, header, annotation: recognised.annotation };
  });

  const speedColumn = (role: 'mean' | 'gust'): SpeedColumn | null => {
    const column = found[role];
    if (column === undefined) return null;
    if (column.annotation === null) return { index: column.index, header: column.header, unit: null };
    const unit = forecastSpeedUnitOf(column.annotation);
    if (unit === null) {
      problems.push({
        column: column.header,
        reason: `unit "${column.annotation}" is not known; use m/s, km/h, kn or mph`,
      });
    }
    return { index: column.index, header: column.header, unit };
  };
  const mean = speedColumn('mean');
  const gust = speedColumn('gust');

  const direction = found.direction;
  if (direction?.annotation != null && !directionAnnotations.has(direction.annotation.toLowerCase().replace(/\s+/g, ' '))) {
    problems.push({
      column: direction.header,
      reason: `direction must be in degrees from north or compass points, not "${direction.annotation}"`,
    });
  }

  const time = found.time;
  let timeZone: string | null = null;
  if (time === undefined) {
    problems.push({
      column: null,
      reason: `no time column: name one "time", "timestamp" or "datetime"`,
    });
  } else if (time.annotation !== null) {
    const annotation = time.annotation.trim();
    if (utcAnnotations.has(annotation.toLowerCase())) timeZone = 'UTC';
    else if (annotation.toLowerCase() !== 'local' && isKnownTimeZone(annotation)) timeZone = annotation;
    else if (annotation.toLowerCase() !== 'local') {
      problems.push({
        column: time.header,
        reason: `"${annotation}" is not a time zone; use UTC or an IANA name such as Europe/London`,
      });
    }
  }
  if (mean === null && gust === null) {
    problems.push({
      column: null,
      reason: 'no wind column: name a "gust" column, a "mean" column or both',
    });
  }

  if (problems.length > 0 || time === undefined) return { ok: false, problems };
  return {
    ok: true,
    columns: {
      time: { index: time.index, header: time.header },
      mean,
      gust,
      direction: direction === undefined ? null : { index: direction.index, header: direction.header },
      timeZone,
      ignored,
    },
  };
}
