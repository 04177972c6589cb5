/**
 * Level definitions: the staged plan a competent person writes for a structure (design §2.6).
 *
 * Level 0 is calm (below every trigger) and is not written down; levels 1..n are, in order.
 * A trigger is either a fraction of the structure's load capacity (a governing utilization) or
 * an absolute gust in m/s. The state machine compares gusts only, so the caller turns every
 * trigger into its equivalent gust for the structure's current assessment; that is also the only
 * moment utilization and gust triggers can be compared, so their mutual order is checked there
 * (see `checkLevelOrder`). Triggers of the same kind are comparable without a structure, and
 * this schema checks their order.
 *
 * A third kind, the chance trigger (design §2.7 v2), rises on an estimate instead of a measurement:
 * when the chance that the gust at the structure reaches a fraction of its capacity within T
 * minutes exceeds p (foresight/chance.ts: Rice's up-crossing rate with Davenport's wind model). It
 * has no gust of its own to order by; its threshold gust (the gust at that fraction) must lie above
 * the trigger of the level below it, checked with the structure (`levelProblems`). The measured
 * gust reaching the threshold counts as certain, and the ladder gives a chance level a gust at
 * which it rises in any case (structureModel.ts `triggerLadderMps`), so a level on a chance can
 * never rise later than the measured gust would have raised it.
 *
 * Limits are our own: up to 8 levels (a crew cannot follow more stages), labels ≤ 60 characters
 * (they must fit a phone screen), action text ≤ 2000 characters. Fractions go up to 1 (100 % of
 * the effective capacity): a level above it would rise only after the structure has passed its
 * limit (design §2.6 v2); gusts up to 120 m/s match the plausible sensor range (design §3).
 */
import { z } from 'zod';
import { maxLevelLabelLength, maxNameLength, maxPlausibleSpeedMps, maxTextLength } from '../engine/limits.ts';

export const maxLevelCount = 8;
export { maxLevelLabelLength };
export const maxActionTextLength = maxTextLength;
/** Upper bound of a utilization trigger (fraction of load capacity, dimensionless). */
export const maxTriggerFraction = 1;
/** Upper bound of a gust trigger in m/s: the plausible range of a reading (design §3). */
export const maxTriggerGustMps = maxPlausibleSpeedMps;

export const utilizationTriggerSchema = z.strictObject({
  kind: z.literal('utilization'),
  /** Governing utilization at which the level starts: 0.6 means 60 % of load capacity. */
  fraction: z.number().gt(0).lte(maxTriggerFraction, 'must be at most 1 (100 % of capacity): a level above it would rise only after the structure has passed its limit'),
});

export const gustTriggerSchema = z.strictObject({
  kind: z.literal('gust'),
  /** Gust at the structure, m/s (for example the manufacturer's operational gust). */
  gustMps: z.number().gt(0).lte(maxTriggerGustMps),
});

/** Bounds of a chance trigger's horizon, minutes: the chance calculator's range (POST /api/chance). */
export const minChanceMinutes = 1;
export const maxChanceMinutes = 180;

export const chanceTriggerSchema = z.strictObject({
  kind: z.literal('chance'),
  /** The fraction of load capacity whose chance is watched: 1 is the structure's limit. */
  fraction: z.number().gt(0).lte(maxTriggerFraction, 'must be at most 1 (100 % of capacity, the limit)'),
  /** The horizon T of the chance, whole minutes. */
  withinMinutes: z.number().int('must be whole minutes').gte(minChanceMinutes).lte(maxChanceMinutes),
  /** The chance p above which the level rises: 0.2 means 20 %. */
  probability: z.number().gt(0, 'must be above 0 % (a level at 0 % would always be raised)').lt(1, 'must be below 100 %'),
});

export const levelTriggerSchema = z.discriminatedUnion('kind', [utilizationTriggerSchema, gustTriggerSchema, chanceTriggerSchema]);

export const levelDefinitionSchema = z.strictObject({
  label: z.string().trim().min(1, 'label must not be empty').max(maxLevelLabelLength),
  trigger: levelTriggerSchema,
  actionText: z.string().trim().max(maxActionTextLength),
  /**
   * The configuration the action moves the structure to (design §2.5: "lower the screen" →
   * "lowered"); the crew mark it done on their phone and the live assessment switches to it.
   * Checked against the record's configurations when the structure is saved.
   */
  moveToConfiguration: z
    .string()
    .trim()
    .min(1, 'must name a configuration of the structure')
    // As long as a configuration's name may be (kinds/recordBase.ts), so every configuration can be named.
    .max(maxNameLength, `must be at most ${maxNameLength} characters, as a configuration's name`)
    .optional(),
});

export const levelListSchema = z
  .array(levelDefinitionSchema)
  .min(1)
  .max(maxLevelCount)
  .superRefine((levels, ctx) => {
    // Same-kind triggers must rise with the level; mixed kinds are checked by the caller once
    // the structure's equivalent gusts are known. A chance trigger has no order of its own here
    // (its threshold is checked against the level below it with the structure).
    let lastFraction = 0;
    let lastGustMps = 0;
    const seenLabels = new Map<string, number>();
    levels.forEach((level, index) => {
      const { trigger } = level;
      if (trigger.kind === 'utilization') {
        if (trigger.fraction <= lastFraction) {
          ctx.addIssue({
            code: 'custom',
            path: [index, 'trigger', 'fraction'],
            message: `level ${index + 1}: fraction ${trigger.fraction} must be above the fraction of a lower level (${lastFraction})`,
          });
        }
        lastFraction = Math.max(lastFraction, trigger.fraction);
      } else if (trigger.kind === 'gust') {
        if (trigger.gustMps <= lastGustMps) {
          ctx.addIssue({
            code: 'custom',
            path: [index, 'trigger', 'gustMps'],
            message: `level ${index + 1}: gust ${trigger.gustMps} m/s must be above the gust of a lower level (${lastGustMps} m/s)`,
          });
        }
        lastGustMps = Math.max(lastGustMps, trigger.gustMps);
      }
      // Two stages with one name would leave a crew unsure which action applies.
      const key = level.label.toLowerCase();
      const firstIndex = seenLabels.get(key);
      if (firstIndex === undefined) {
        seenLabels.set(key, index);
      } else {
        ctx.addIssue({
          code: 'custom',
          path: [index, 'label'],
          message: `level ${index + 1}: label "${level.label}" is already used by level ${firstIndex + 1}`,
        });
      }
    });
  });

export type UtilizationTrigger = z.infer<typeof utilizationTriggerSchema>;
export type GustTrigger = z.infer<typeof gustTriggerSchema>;
export type ChanceTrigger = z.infer<typeof chanceTriggerSchema>;
export type LevelTrigger = z.infer<typeof levelTriggerSchema>;
export type LevelDefinition = z.infer<typeof levelDefinitionSchema>;
export type LevelList = z.infer<typeof levelListSchema>;
