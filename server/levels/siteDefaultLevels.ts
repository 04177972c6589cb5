/**
 * The levels a new site starts with (design §2.6); the competent person edits them per site and
 * may override them per structure.
 *
 * Triggers: 60 % and 80 % of the structure's maximum wind load capacity follow published event
 * guidance (Cardiff Council, Bute Park event organisers' guide, 2020: actions at 60 % and 80 % of
 * maximum wind load capacity). Clearing at 100 % of capacity and the content of the actions
 * (watch and check ballast, take down banners and lower screens, clear an exclusion zone at least
 * the structure's height deep downwind) are common practice. The labels and wording are our own.
 * Because load goes with the square of the gust, 60 % and 80 % of load are about 77 % and 89 % of
 * the limit gust when no uplift is involved. The action texts name no numbers, so they stay true
 * when a site moves a trigger.
 */
import type { LevelDefinition } from './levelDefinition.ts';

export const siteDefaultLevels: readonly Readonly<LevelDefinition>[] = Object.freeze([
  Object.freeze({
    label: 'Watch',
    trigger: Object.freeze({ kind: 'utilization', fraction: 0.6 } as const),
    actionText:
      'The wind is rising towards what this structure can take. Keep an eye on the wind readings. ' +
      'Walk round the structure: check that ballast, pegs, ties and guy lines are in place and ' +
      'tight, and report anything loose or moved to the competent person.',
  }),
  Object.freeze({
    label: 'Prepare',
    trigger: Object.freeze({ kind: 'utilization', fraction: 0.8 } as const),
    actionText:
      'The wind is getting close to what this structure can take. Reduce what the wind can catch, as ' +
      "the structure's wind plan says: take down banners and scrims, lower screens, close or " +
      'remove tent side walls. Brief the stewards on how to clear the area and where the ' +
      'exclusion zone is, so they are ready to act.',
  }),
  Object.freeze({
    label: 'Stop and clear',
    trigger: Object.freeze({ kind: 'utilization', fraction: 1.0 } as const),
    actionText:
      'The wind has reached the limit of this structure. Stop any show under or in front of it. ' +
      'Clear everyone out of the structure and out of an exclusion zone downwind that is at ' +
      "least as deep as the structure is tall, as the structure's wind plan says. Keep people " +
      'out until the competent person says it is safe.',
  }),
]);
