/**
 * The level a gust reaches on a ladder of trigger gusts, and the check that a ladder is usable.
 *
 * A ladder is the ascending list of trigger gusts (m/s) of levels 1..n for one structure; level 0
 * (calm) has no trigger. A gust *reaches* a level when it is at or above its trigger (design §2.6:
 * "escalate when the gust reaches a trigger"), so a gust equal to a trigger counts.
 */
import { checkLevelOrder } from './levelOrder.ts';

/**
 * Throws a RangeError unless `triggerGustsMps` is a usable ladder: 1..8 finite gusts, each strictly
 * above the one before and above 0 m/s. `caller` names the function in the message.
 */
export function assertTriggerGustsMps(caller: string, triggerGustsMps: readonly number[]): void {
  if (!Array.isArray(triggerGustsMps) || triggerGustsMps.length < 1 || triggerGustsMps.length > 8) {
    throw new RangeError(
      `${caller}: triggerGustsMps must be an array of 1 to 8 gusts in m/s, got ${String(triggerGustsMps)}`,
    );
  }
  for (let index = 0; index < triggerGustsMps.length; index++) {
    const gustMps = triggerGustsMps[index]!;
    if (!Number.isFinite(gustMps)) {
      throw new RangeError(`${caller}: triggerGustsMps[${index}] must be a finite gust in m/s, got ${gustMps}`);
    }
  }
  const offending = checkLevelOrder(triggerGustsMps);
  if (offending.length > 0) {
    const index = offending[0]!;
    throw new RangeError(
      `${caller}: triggerGustsMps must rise strictly from level to level and start above 0 m/s; ` +
        `triggerGustsMps[${index}] = ${triggerGustsMps[index]} is not above the levels below it ` +
        `(got [${triggerGustsMps.join(', ')}])`,
    );
  }
}

/**
 * The highest level (0..n) whose trigger gust `gustMps` reaches (≥). The ladder is assumed valid
 * (see `assertTriggerGustsMps`); 0 means below every trigger.
 *
 * @example justifiedLevel(17.89, [15.49, 17.89, 20]) // → 2
 */
export function justifiedLevel(gustMps: number, triggerGustsMps: readonly number[]): number {
  let level = 0;
  while (level < triggerGustsMps.length && gustMps >= triggerGustsMps[level]!) level++;
  return level;
}
