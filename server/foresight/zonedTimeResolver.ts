/**
 * Wall-clock time in an IANA time zone → instants, with the zone rules of the runtime's Intl
 * (ECMA-402). A forecast pasted from a spreadsheet often gives local times ("2026-06-12 14:00")
 * and the site's zone says what they mean.
 *
 * A wall-clock time maps to one instant, to none (skipped when the clocks go forward) or to two
 * (repeated when they go back); the resolver returns all of them, earliest first, and leaves the
 * choice to the caller.
 */

export interface WallClockTime {
  readonly year: number;
  /** 1..12 */
  readonly month: number;
  readonly day: number;
  readonly hour: number;
  readonly minute: number;
  readonly second: number;
  readonly millisecond: number;
}

const dayMs = 86_400_000;

/**
 * A function giving the instants (ms since the Unix epoch, ascending) at which clocks in
 * `timeZone` show a given wall-clock time. Throws a RangeError naming the zone when Intl does not
 * know it.
 *
 * @example zonedTimeResolver('Europe/London')({ year: 2026, month: 6, day: 12, hour: 14, minute: 0, second: 0, millisecond: 0 })
 * // → [Date.UTC(2026, 5, 12, 13)] (British Summer Time, UTC+1)
 */
export function zonedTimeResolver(timeZone: string): (wall: WallClockTime) => number[] {
  let format: Intl.DateTimeFormat;
  try {
    format = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: 'numeric',
      day: 'numeric',
      hour: 'numeric',
      minute: 'numeric',
      second: 'numeric',
    });
  } catch (cause) {
    throw new RangeError(`zonedTimeResolver: timeZone must be an IANA time zone name such as 'Europe/London', got '${timeZone}'`, {
      cause,
    });
  }

  /** The wall clock in the zone at a whole-second instant, expressed as if it were UTC, ms. */
  const wallAsUtcMs = (instantMs: number): number => {
    const parts: Record<string, number> = {};
    for (const part of format.formatToParts(instantMs)) {
      if (part.type !== 'literal') parts[part.type] = Number(part.value);
    }
    return Date.UTC(parts.year!, parts.month! - 1, parts.day!, parts.hour!, parts.minute!, parts.second!);
  };
  /** Zone offset (wall clock − UTC) at an instant, ms. */
  const offsetMs = (instantMs: number): number => {
    const wholeSecondMs = Math.floor(instantMs / 1000) * 1000;
    return wallAsUtcMs(wholeSecondMs) - wholeSecondMs;
  };

  return (wall) => {
    const wallSecondsMs = Date.UTC(wall.year, wall.month - 1, wall.day, wall.hour, wall.minute, wall.second);
    // Offsets in force a day either side cover any transition near this time (zones change their
    // offset at most a few times a year).
    const offsets = new Set([offsetMs(wallSecondsMs - dayMs), offsetMs(wallSecondsMs), offsetMs(wallSecondsMs + dayMs)]);
    const instants: number[] = [];
    for (const offset of offsets) {
      const candidateMs = wallSecondsMs - offset;
      if (wallAsUtcMs(candidateMs) === wallSecondsMs && !instants.includes(candidateMs)) instants.push(candidateMs);
    }
    return instants.sort((a, b) => a - b).map((instantMs) => instantMs + wall.millisecond);
  };
}
