/**
 * Who wants which alerts: every alert, level alerts from level n up, or the alerts of chosen
 * structures. Missing data is unknown, never calm: an alert that has no level (no data, a sensor
 * silent or implausible) passes a level filter, and one about a sensor (which may govern the
 * chosen structures) passes a structure filter.
 */
import { z } from 'zod';
import type { OpenAlert } from '../watch/watch.ts';

export const notifyFilterSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({ kind: z.literal('all') }),
    z.strictObject({ kind: z.literal('levels'), atLeast: z.number({ error: 'must be a level number (1 is the first level above calm)' }).int({ error: 'must be a whole number' }).min(1, { error: 'must be 1 or more' }).max(20, { error: 'must be 20 or less' }) }),
    z.strictObject({
      kind: z.literal('structures'),
      structureIds: z.array(z.number({ error: 'must be a structure id' }).int({ error: 'must be a whole number' }).positive({ error: 'must be a structure id above 0' }), { error: 'must be a list of structure ids' }).min(1, { error: 'must name at least one structure' }).max(1000, { error: 'names more than 1000 structures' }),
    }),
  ],
  { error: 'must be {"kind":"all"}, {"kind":"levels","atLeast":n} or {"kind":"structures","structureIds":[…]}' },
);
export type NotifyFilter = z.infer<typeof notifyFilterSchema>;

export const allAlerts: NotifyFilter = { kind: 'all' };

export function filterPasses(filter: NotifyFilter, alert: Pick<OpenAlert, 'kind' | 'level' | 'structureId'>): boolean {
  if (filter.kind === 'all') return true;
  if (filter.kind === 'levels') return alert.kind !== 'level' || alert.level === null || alert.level >= filter.atLeast;
  return alert.structureId === null || filter.structureIds.includes(alert.structureId);
}

/** A stored filter read back; anything unreadable counts as every alert (conservative). */
export function storedFilter(value: unknown): NotifyFilter {
  const parsed = notifyFilterSchema.safeParse(value);
  return parsed.success ? parsed.data : allAlerts;
}
