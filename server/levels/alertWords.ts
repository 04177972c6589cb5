/**
 * What every alert says (design §2.6): its label, the line a crew reads first, and the action. One
 * wording for the live watch, the log, e-mail, push and webhooks (they all carry these texts). The
 * level alerts carry the competent person's own action text; the texts below are ours.
 */
import type { LevelDefinition } from './levelDefinition.ts';

export interface AlertWords {
  label: string;
  actionText: string;
}

export const noDataActionText =
  'No live wind reading reaches this structure. Its level is held, not lowered: treat the wind as ' +
  'unknown, not calm. Check the anemometers and the gateway, watch the wind by hand (a handheld ' +
  'anemometer) and follow the wind plan until readings return.';

/** A structure that lost its last live governing sensor. */
export const noDataWords: AlertWords = Object.freeze({ label: 'No wind data', actionText: noDataActionText });

/** "40 s behind" / "12 s ahead of" (a clock offset in words); unknown when null. */
export function clockOffsetWords(offsetMs: number | null): string {
  if (offsetMs === null) return 'at an unknown offset from';
  const s = Math.round(Math.abs(offsetMs) / 1000);
  return offsetMs >= 0 ? `${s} s behind` : `${s} s ahead of`;
}

export interface SensorFacts {
  name: string;
  /** The sensor's silence timeout, ms. */
  silenceTimeoutMs: number;
  /** How old a reading may be and still be used live, ms. */
  liveMaxAgeMs: number;
  /** How far ahead of the server's clock a reading may be stamped and still be used, ms. */
  aheadToleranceMs: number;
}

const sensorTail = 'Structures that take their wind from it have one reading fewer; if it was their only one they show "no data".';

/** Nothing arrived for longer than the timeout. */
export function sensorSilentWords(s: SensorFacts): AlertWords {
  return { label: 'Sensor silent', actionText: `No reading from ${s.name} for more than ${Math.round(s.silenceTimeoutMs / 1000)} s. Check its power, mounting and gateway. ${sensorTail}` };
}

/** Readings arrive but none usable live: stamped too far behind or ahead (a gateway's clock). */
export function sensorUnusableWords(s: SensorFacts, offsetMs: number | null): AlertWords {
  return {
    label: 'Sensor readings unusable',
    actionText: `Readings from ${s.name} arrive, but none usable for more than ${Math.round(s.silenceTimeoutMs / 1000)} s: they are stamped ${clockOffsetWords(offsetMs)} the server's clock (a reading more than ${Math.round(s.liveMaxAgeMs / 1000)} s old, or more than ${Math.round(s.aheadToleranceMs / 1000)} s ahead, is stored but not used live). Set the gateway's clock (NTP). ${sensorTail}`,
  };
}

/** Readings stamped off the server's clock but still used. `offset`: clockOffsetWords. */
export function sensorClockWords(s: SensorFacts, offset: string): AlertWords {
  return {
    label: 'Sensor clock off',
    actionText: `${s.name}'s readings are stamped ${offset} the server's clock (measured from their arrival). They are still used and placed on the timeline by their own time; a reading more than ${Math.round(s.liveMaxAgeMs / 1000)} s behind or ${Math.round(s.aheadToleranceMs / 1000)} s ahead cannot be used live. Set the gateway's clock (NTP).`,
  };
}

/** Values that cannot be right; `why` says which. */
export function sensorImplausibleWords(s: SensorFacts, why: string): AlertWords {
  return { label: 'Sensor readings implausible', actionText: `${s.name} is sending values that cannot be right (${why}); they are not used. Check it for damage, icing, a loose mounting or a wrong unit setting.` };
}

/**
 * The action of an escalation from `fromLevel` to `toLevel`. A gust that passes several levels at
 * once raises one alert, of the highest; the actions of the levels it passed are still to do (a
 * screen that was to be lowered at Prepare must still be lowered at Stop), so they follow its own
 * text, and when the highest level's action moves no structure, the configuration of the highest
 * level passed that does is the one its "Done" asks for. `moveTarget` gives the structure's own
 * name of a configuration a level names, or null when it has none of that name.
 */
export function escalationWords(
  levels: readonly LevelDefinition[],
  fromLevel: number,
  toLevel: number,
  moveTarget: (name: string | undefined) => string | null,
  /** True when the level rose on its chance trigger (the estimate), not on a measured gust. */
  onEstimate = false,
): { label: string; actionText: string; moveTo: string | null } {
  const def = levels[toLevel - 1]!;
  const passed = levels.slice(Math.max(0, fromLevel), toLevel - 1).filter((l) => l.actionText.trim().length > 0 || l.moveToConfiguration !== undefined);
  let moveTo = moveTarget(def.moveToConfiguration);
  for (let i = toLevel - 2; moveTo === null && i >= Math.max(0, fromLevel); i--) moveTo = moveTarget(levels[i]!.moveToConfiguration);
  if (passed.length === 0) return { label: def.label, actionText: def.actionText, moveTo };
  const also = passed.map((l) => `${l.label}: ${l.actionText.trim() || `move it to "${l.moveToConfiguration}"`}`).join(' ');
  // The level's own action stays the first line (what e-mail, push and webhooks lead with).
  return { label: def.label, actionText: `${def.actionText.trim()}${def.actionText.trim() ? '\n' : ''}${onEstimate ? 'The estimate raised it past' : 'The gust passed'} ${passed.map((l) => l.label).join(' and ')} at once; do their actions too. ${also}`, moveTo };
}

/** A chance in an alert's words: whole percent (to 0.1 under 10 %, so a chance just over a small trigger never reads as the trigger), "< 1" and "> 99" at the ends (never 0 or 100). */
const percentWords = (p: number): string => (p < 0.005 ? '< 1' : p >= 0.995 ? '> 99' : p < 0.1 ? String(Math.round(p * 1000) / 10) : String(Math.round(p * 100)));

const chanceRiseLead = 'Raised on the estimate, not a measured gust:';

/** The sentence of `chanceRiseWords` in an alert's action text, or null (for a card that shows the plan's action apart). */
export function chanceRiseOf(actionText: string): string | null {
  const at = actionText.lastIndexOf(chanceRiseLead);
  return at < 0 ? null : actionText.slice(at).trim();
}

/**
 * Said after the action when a level rose on its chance trigger rather than on a measured gust
 * (levelDefinition.ts): the crew must know the level stands on an estimate.
 */
export function chanceRiseWords(c: { chance: number; thresholdGustMps: number; withinMinutes: number; probability: number }): string {
  return `\n\n${chanceRiseLead} a ${percentWords(c.chance)} % chance of a gust of ${c.thresholdGustMps.toFixed(1)} m/s within ${c.withinMinutes} min (the level rises over ${percentWords(c.probability)} %).`;
}
