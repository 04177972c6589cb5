/**
 * Order check of a level list once its triggers are expressed as gusts (m/s) for one structure.
 *
 * Invariant the state machine relies on: trigger gusts rise strictly with the level, and level 1
 * lies above calm (0 m/s). A utilization trigger and a gust trigger can only be compared after
 * the engine has turned the fraction into a gust for the structure, so this check runs there.
 */

/**
 * Indices (0-based positions in `triggerGustsMps`, so index i is level i + 1) whose gust is not
 * strictly above every lower level's gust (and above 0 m/s). NaN is always offending.
 * An empty result means the order is valid.
 *
 * @example checkLevelOrder([15.5, 14, 20]) // → [1]: level 2 (14 m/s) is not above level 1
 */
export function checkLevelOrder(triggerGustsMps: readonly number[]): number[] {
  const offending: number[] = [];
  let previousMps = 0; // highest valid trigger so far; calm is 0 m/s
  for (let index = 0; index < triggerGustsMps.length; index++) {
    const gustMps = triggerGustsMps[index]!;
    // Written as !(a > b) so that NaN counts as out of order.
    if (!(gustMps > previousMps)) offending.push(index);
    // Compare with the highest lower trigger, so [10, 5, 8] flags both 5 and 8.
    if (gustMps > previousMps) previousMps = gustMps;
  }
  return offending;
}
