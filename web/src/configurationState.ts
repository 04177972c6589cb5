/**
 * What the board and the structure page say about a structure's configurations and the plan's
 * actions (design §2.5): which configuration it is in now, the limit in each ("Raised · limit
 * 14.2 m/s · lowered 23.8 m/s"), and whether a level's action that moves it ("Lower the screen" →
 * "lowered") is still to do, done, or overdue.
 *
 * The server sends these fields as it gains them (web/src/types.ts, issue 14), so every one is
 * read here and checked: a field that is missing or malformed is unknown. A configuration that is
 * not known is never taken for the one as registered, and a limit that is not known is never
 * shown as a number.
 */
import type { AlertActionFields, LiveConfiguration, OpenAlert, StructureConfigurationFields, StructureState } from './types.ts';
import { hourMinute, speed, type SpeedUnit } from './units.ts';

/** Most configurations a record may list besides the one as registered (engine kinds/recordBase.ts maxConfigurations; checked equal by a unit test). */
export const maxConfigurations = 8;

const isFiniteNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const timeOrNull = (v: unknown): number | null => (isFiniteNumber(v) ? v : null);
const nameKey = (name: string): string => name.trim().toLowerCase();

/** A structure's configurations as far as the live state tells them. */
export interface ConfigurationsNow {
  /** The configuration it is in now; null: unknown (not sent, or naming none of the list). */
  current: string | null;
  /** Every configuration the server listed, the one as registered first; [] when it listed none. */
  list: LiveConfiguration[];
  /** When it was switched to the current one (null: never switched, or unknown). */
  sinceMs: number | null;
  /** Who switched it. */
  by: string | null;
}

function liveConfiguration(raw: unknown): LiveConfiguration | null {
  if (raw === null || typeof raw !== 'object') return null;
  const c = raw as Record<string, unknown>;
  if (typeof c.name !== 'string' || c.name.trim() === '') return null;
  return {
    name: c.name,
    current: c.current === true,
    // A limit that is not a number is unknown here (null), never a figure.
    limitGustMps: isFiniteNumber(c.limitGustMps) ? c.limitGustMps : null,
    calculatedLimitGustMps: isFiniteNumber(c.calculatedLimitGustMps) ? c.calculatedLimitGustMps : null,
    triggerGustsMps: Array.isArray(c.triggerGustsMps) ? c.triggerGustsMps.map((g) => (isFiniteNumber(g) ? g : null)) : [],
  };
}

/**
 * The configurations a structure's live state names, or null when it names none besides the one
 * as registered (nothing to show). When the list names several but not which one holds now (or
 * the name matches none), `current` is null: unknown.
 */
export function configurationsNow(s: StructureState): ConfigurationsNow | null {
  const fields = s as StructureState & StructureConfigurationFields;
  const list = Array.isArray(fields.configurations) ? fields.configurations.map(liveConfiguration).filter((c) => c !== null) : [];
  const named = typeof fields.configuration === 'string' && fields.configuration.trim() !== '' ? fields.configuration : null;
  const sinceMs = timeOrNull(fields.configurationSinceMs);
  const by = typeof fields.configurationBy === 'string' ? fields.configurationBy : null;
  if (list.length === 0) {
    // No list: worth a line only when the structure was switched (its limits elsewhere unknown).
    return named === null || sinceMs === null ? null : { current: named, list, sinceMs, by };
  }
  if (list.length === 1 && (named === null || nameKey(named) === nameKey(list[0]!.name))) return null;
  const marked = list.filter((c) => c.current);
  let current: string | null = null;
  if (named !== null) {
    const match = list.find((c) => nameKey(c.name) === nameKey(named));
    // The name and the list's mark must agree; otherwise which one holds is unknown.
    if (match && (marked.length === 0 || (marked.length === 1 && marked[0] === match))) current = match.name;
  } else if (marked.length === 1) current = marked[0]!.name;
  return { current, list, sinceMs, by };
}

/** One configuration on the card's line. */
export interface ConfigurationLinePart {
  name: string;
  /** "limit 14.2 m/s" for the current one, "23.8 m/s" for the others; "limit unknown" / "unknown". */
  limitText: string;
  current: boolean;
}

/** The card's configuration line: the current one first (marked), then the others in the record's order. */
export interface ConfigurationLine {
  parts: ConfigurationLinePart[];
  /** False when the current configuration is unknown: the line then starts "Configuration unknown". */
  currentKnown: boolean;
  /** The line as one text ("Raised · limit 14.2 m/s · lowered 23.8 m/s"). */
  text: string;
}

/**
 * The configuration line of a structure's card, or null when it has no configurations to tell.
 *
 * @example configurationLine(raisedScreen, 'm/s')?.text // → 'Raised · limit 14.2 m/s · lowered 23.8 m/s'
 */
export function configurationLine(s: StructureState, unit: SpeedUnit): ConfigurationLine | null {
  const now = configurationsNow(s);
  if (!now) return null;
  const key = now.current === null ? null : nameKey(now.current);
  const current = key === null ? undefined : now.list.find((c) => nameKey(c.name) === key);
  const limitOf = (c: LiveConfiguration | undefined): string => (c === undefined || c.limitGustMps === null ? 'unknown' : speed(c.limitGustMps, unit));
  const parts: ConfigurationLinePart[] = [];
  // The live state's own limit is the current configuration's (contract): used when the list lacks it.
  const currentLimit = current ? limitOf(current) : now.list.length === 0 ? speed(s.limitGustMps, unit) : 'unknown';
  if (now.current !== null) parts.push({ name: current?.name ?? now.current, limitText: `limit ${currentLimit}`, current: true });
  for (const c of now.list) if (c !== current) parts.push({ name: c.name, limitText: limitOf(c), current: false });
  const texts = parts.map((p) => `${p.name}${p.current ? ' · ' : ' '}${p.limitText}`);
  return { parts, currentKnown: now.current !== null, text: [...(now.current === null ? ['Configuration unknown'] : []), ...texts].join(' · ') };
}

/** A level alert's plan action: move the structure to a configuration. */
export interface AlertAction {
  alertId: number;
  /** The configuration the action moves the structure to. */
  moveTo: string;
  /** to-do: not done, not yet due; overdue: not done past its time; done: marked done. */
  state: 'to-do' | 'overdue' | 'done';
  /** The alert's level has ended (cleared): a to-do is no longer asked for. */
  ended: boolean;
  dueAtMs: number | null;
  /** When it became overdue (its due time, else when it was signalled as overdue). */
  overdueSinceMs: number | null;
  doneAtMs: number | null;
  doneBy: string | null;
}

/**
 * The plan action of a level alert at `nowMs` (server time), or null when its level moves the
 * structure nowhere (or the server does not say). An action whose done time is not given is not
 * done: the crew are asked, and the server refuses a second "done" (409).
 */
export function alertAction(a: OpenAlert, nowMs: number): AlertAction | null {
  const f = a as OpenAlert & AlertActionFields;
  if (a.kind !== 'level' || typeof f.moveToConfiguration !== 'string' || f.moveToConfiguration.trim() === '') return null;
  const doneAtMs = timeOrNull(f.actionDoneAtMs);
  const dueAtMs = timeOrNull(f.actionDueAtMs);
  const overdueAtMs = timeOrNull(f.overdueAtMs);
  const overdue = doneAtMs === null && (overdueAtMs !== null || (dueAtMs !== null && nowMs >= dueAtMs));
  return {
    alertId: a.id,
    moveTo: f.moveToConfiguration,
    state: doneAtMs !== null ? 'done' : overdue ? 'overdue' : 'to-do',
    ended: a.clearedAtMs !== null,
    dueAtMs,
    overdueSinceMs: overdue ? (dueAtMs ?? overdueAtMs) : null,
    doneAtMs,
    doneBy: doneAtMs !== null && typeof f.actionDoneBy === 'string' ? f.actionDoneBy : null,
  };
}

/**
 * The action in a few words for "Not done: …": the first sentence of the level's action text
 * when it is a short command ("Lower the screen. Clear the area." → "lower the screen"), else
 * "move it to “lowered”" (a long first sentence is usually the why, not the what: the site's
 * default Prepare text starts "The wind is getting close to what this structure can take").
 * The first letter is lowered only when the second is lower case too (so "LED screen down" stays).
 */
export function actionPhrase(actionText: string | null | undefined, moveTo: string): string {
  const first = (actionText ?? '').trim().split(/(?<=[.!?;])\s|\n/)[0]!.trim().replace(/[.!?;:]+$/, '');
  if (first === '' || first.length > maxPhraseLength) return `move it to “${moveTo}”`;
  return /^[A-Z][a-z]/.test(first) ? first[0]!.toLowerCase() + first.slice(1) : first;
}

/** Longest first sentence taken as the action's own words (characters; a phone line at the overdue size). */
const maxPhraseLength = 40;

/** "Not done: lower the screen — overdue since 14:07" (site time). */
export function overdueText(action: AlertAction, actionText: string | null | undefined, timeZone: string): string {
  const since = action.overdueSinceMs === null ? '' : ` since ${hourMinute(action.overdueSinceMs, timeZone)}`;
  return `Not done: ${actionPhrase(actionText, action.moveTo)} — overdue${since}`;
}

/** "Done: lowered by Jo Marsh at 14:09" (site time). */
export function doneText(action: AlertAction, timeZone: string): string {
  return `Done: ${action.moveTo}${action.doneBy ? ` by ${action.doneBy}` : ''}${action.doneAtMs !== null ? ` at ${hourMinute(action.doneAtMs, timeZone)}` : ''}`;
}
