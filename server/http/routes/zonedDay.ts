/**
 * A calendar day in a time zone as a window of epoch milliseconds: from local midnight to the
 * next local midnight (23 or 25 hours on the days clocks change).
 */
import { isoDate } from '../../formats/isoDateTime.ts';

const formatters = new Map<string, Intl.DateTimeFormat>();

/** One formatter per zone: building an Intl.DateTimeFormat costs far more than using one. */
function formatterOf(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** Offset of `timeZone` from UTC at `atMs`, ms (positive east of Greenwich). */
export function zoneOffsetMs(atMs: number, timeZone: string): number {
  const parts = formatterOf(timeZone).formatToParts(new Date(atMs));
  const get = (type: string): number => Number(parts.find((p) => p.type === type)?.value);
  const asUtc = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second'));
  return asUtc - (atMs - (atMs % 1000));
}

/** Epoch ms of local midnight starting the given date in `timeZone`. */
export function zonedMidnightMs(year: number, month: number, day: number, timeZone: string): number {
  const guess = Date.UTC(year, month - 1, day);
  let t = guess - zoneOffsetMs(guess, timeZone);
  t = guess - zoneOffsetMs(t, timeZone);
  return t;
}

export function zonedDayWindow(day: string, timeZone: string): { fromMs: number; toMs: number } | null {
  const date = isoDate(day);
  if (!date.ok) return null;
  const { year: y, month: mo, day: d } = date.value;
  const next = new Date(Date.UTC(y, mo - 1, d + 1));
  return { fromMs: zonedMidnightMs(y, mo, d, timeZone), toMs: zonedMidnightMs(next.getUTCFullYear(), next.getUTCMonth() + 1, next.getUTCDate(), timeZone) };
}

const slotMs = 15 * 60_000;
const pad = (n: number, width = 2): string => String(n).padStart(width, '0');

/**
 * Local wall-clock times in one zone for many instants (a CSV export of a day's readings): the
 * zone's offset is looked up once per quarter hour and reused while it holds at both ends of the
 * quarter (no zone changes its offset twice within 15 minutes), so a row costs arithmetic only.
 */
export class LocalTimes {
  private slot = Number.NaN;
  /** The slot's offset, or null when it changes inside the slot (then looked up per instant). */
  private slotOffsetMs: number | null = 0;

  constructor(readonly timeZone: string) {}

  offsetMs(atMs: number): number {
    const slot = Math.floor(atMs / slotMs);
    if (slot !== this.slot) {
      this.slot = slot;
      const first = zoneOffsetMs(slot * slotMs, this.timeZone);
      const last = zoneOffsetMs(slot * slotMs + slotMs - 1_000, this.timeZone);
      this.slotOffsetMs = first === last ? first : null;
    }
    return this.slotOffsetMs ?? zoneOffsetMs(atMs, this.timeZone);
  }

  /** "YYYY-MM-DD HH:MM:SS" on the zone's clock (the form spreadsheets read as a date and time). */
  dateTime(atMs: number): string {
    const d = new Date(atMs + this.offsetMs(atMs));
    return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())}`;
  }

  /** "YYYY-MM-DD": the zone's calendar date at `atMs`. */
  date(atMs: number): string {
    return this.dateTime(atMs).slice(0, 10);
  }
}
