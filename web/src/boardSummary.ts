/**
 * The site in one line, on top of the board and on every other screen: how many structures are at
 * each level, how many have no wind data, how many sensors are not reporting well — e.g.
 * "2 at Stop and clear · 1 at Prepare · 1 without wind data · 1 sensor silent".
 *
 * It states the state, for everybody: it asks nobody to act (the crew's "to acknowledge" count is
 * the alerts' own heading). Structures count by the label of the level they are at now, highest
 * first; structures whose ladders share a label and level count together.
 */
import type { SensorState, StructureState } from './types.ts';

export interface SummaryPart {
  text: string;
  /** For the shape and colour: the level (0 = below every level), its ladder's length, or no data. */
  level: number;
  levelCount: number;
  noData: boolean;
  /** A sensor problem, not a structure's level. */
  sensor: boolean;
}

/**
 * Why a sensor is not reporting well, in words, or null when it is. A reading older than the
 * sensor's own silence timeout counts as silent on the phone too, so a board whose stream has
 * dropped still turns stale on time.
 */
export function sensorTrouble(s: SensorState, nowMs: number): 'no reading yet' | 'silent' | 'implausible' | null {
  if (s.lastReceivedAtMs === null) return 'no reading yet';
  if (s.silent || nowMs - s.lastReceivedAtMs > s.silenceTimeoutMs) return 'silent';
  if (s.implausible.length > 0) return 'implausible';
  return null;
}

const plural = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;

export function boardSummary(structures: readonly StructureState[], sensors: readonly SensorState[], nowMs: number): SummaryPart[] {
  const parts: SummaryPart[] = [];
  const noData = structures.filter((s) => s.noData);
  const withData = structures.filter((s) => !s.noData);
  const byLabel = new Map<string, { label: string; level: number; levelCount: number; count: number }>();
  for (const s of withData) {
    if (s.level <= 0) continue;
    const label = s.levels.find((l) => l.level === s.level)?.label ?? s.levelLabel ?? `level ${s.level}`;
    const entry = byLabel.get(`${s.level}/${s.levels.length}/${label}`);
    if (entry) entry.count += 1;
    else byLabel.set(`${s.level}/${s.levels.length}/${label}`, { label, level: s.level, levelCount: s.levels.length, count: 1 });
  }
  // Top levels first (a level's place in its own ladder), then the higher number.
  const ranked = [...byLabel.values()].sort((a, b) => b.level / b.levelCount - a.level / a.levelCount || b.level - a.level || a.label.localeCompare(b.label));
  for (const e of ranked) parts.push({ text: `${e.count} at ${e.label}`, level: e.level, levelCount: e.levelCount, noData: false, sensor: false });
  if (noData.length > 0) parts.push({ text: `${noData.length} without wind data`, level: 0, levelCount: 0, noData: true, sensor: false });
  const calm = withData.filter((s) => s.level <= 0).length;
  if (structures.length === 0) parts.push({ text: 'no structures registered', level: 0, levelCount: 0, noData: false, sensor: false });
  else if (calm === structures.length) parts.push({ text: structures.length === 1 ? 'the structure is below its levels' : `all ${structures.length} structures below their levels`, level: 0, levelCount: 3, noData: false, sensor: false });
  else if (calm > 0) parts.push({ text: `${calm} below ${calm === 1 ? 'its' : 'their'} levels`, level: 0, levelCount: 3, noData: false, sensor: false });

  const troubles = sensors.map((s) => sensorTrouble(s, nowMs));
  const silent = troubles.filter((t) => t === 'silent').length;
  const implausible = troubles.filter((t) => t === 'implausible').length;
  const never = troubles.filter((t) => t === 'no reading yet').length;
  const sensorPart = (text: string) => parts.push({ text, level: 0, levelCount: 0, noData: true, sensor: true });
  if (sensors.length === 0) sensorPart('no sensors registered');
  if (silent > 0) sensorPart(`${plural(silent, 'sensor', 'sensors')} silent`);
  if (implausible > 0) sensorPart(`${plural(implausible, 'sensor', 'sensors')} implausible`);
  if (never > 0) sensorPart(`${plural(never, 'sensor', 'sensors')} with no reading yet`);
  return parts;
}

/** The summary as one line of text. */
export const summaryText = (parts: readonly SummaryPart[]): string => parts.map((p) => p.text).join(' · ');
