/**
 * The escalation chain of a level (design §4b): an alert of that level not acknowledged within
 * the first step's minutes goes to that step's person or role, then, after the next step's
 * minutes more, to the next, and so on. Pure: which steps are due at a time.
 */
import { z } from 'zod';
import { roles } from '../auth/roles.ts';

export const escalationStepSchema = z
  .strictObject({
    afterMinutes: z.number({ error: 'must be minutes (a number)' }).int({ error: 'must be whole minutes' }).min(1, { error: 'must be at least 1 minute' }).max(1440, { error: 'must be at most 1440 minutes (a day)' }),
    personId: z.number({ error: 'must be a person id' }).int({ error: 'must be a whole number' }).positive({ error: 'must be a person id above 0' }).optional(),
    role: z.enum(roles, { error: `must be one of ${roles.join(', ')}` }).optional(),
  })
  .superRefine((s, ctx) => {
    if ((s.personId === undefined) === (s.role === undefined)) ctx.addIssue({ code: 'custom', path: ['personId'], message: 'name either a person (personId) or a role, not both and not neither' });
  });
export type EscalationStep = z.infer<typeof escalationStepSchema>;

export const escalationChainSchema = z.strictObject({
  level: z.number({ error: 'must be a level number' }).int({ error: 'must be a whole number' }).min(1, { error: 'must be 1 or more' }).max(20, { error: 'must be 20 or less' }),
  steps: z.array(escalationStepSchema, { error: 'must be a list of steps' }).max(10, { error: 'has more than 10 steps' }),
});

export const escalationChainsSchema = z
  .strictObject({ chains: z.array(escalationChainSchema, { error: 'must be a list of chains, one per level' }).max(20, { error: 'has more than 20 chains' }) })
  .superRefine((body, ctx) => {
    const seen = new Set<number>();
    body.chains.forEach((c, i) => {
      if (seen.has(c.level)) ctx.addIssue({ code: 'custom', path: ['chains', i, 'level'], message: `level ${c.level} has a chain already` });
      seen.add(c.level);
    });
  });

/** When each step falls due: the alert's time plus the minutes of every step up to it. */
export function stepDueTimesMs(raisedAtMs: number, steps: readonly EscalationStep[]): number[] {
  let atMs = raisedAtMs;
  return steps.map((s) => (atMs += s.afterMinutes * 60_000));
}

/** The indexes of the steps due at `nowMs` that have not been taken. */
export function dueSteps(raisedAtMs: number, steps: readonly EscalationStep[], taken: ReadonlySet<number>, nowMs: number): number[] {
  return stepDueTimesMs(raisedAtMs, steps).flatMap((due, i) => (due <= nowMs && !taken.has(i) ? [i] : []));
}
