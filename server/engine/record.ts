/**
 * Structure records (design §4): the schema of every kind as one discriminated union on `kind`,
 * the inferred types, and validation that returns every problem with its field path and reason.
 *
 * Field checks (types, finiteness, ranges) and each kind's cross-field checks (ridge above eave,
 * masses within the base, total mass above zero, a source for overridden coefficients) are all in
 * the schemas. Zod reports every field problem at once; the cross-field checks run once every
 * field has the right type (a string where a number belongs stops them, ranges do not).
 * Unknown fields are rejected: a misspelt `ratedGustMps` must not silently drop the rating.
 */
import { z } from 'zod';
import { bannerRecordSchema } from './kinds/banner.ts';
import { customRecordSchema } from './kinds/custom.ts';
import { screenRecordSchema } from './kinds/screen.ts';
import { shellRecordSchema } from './kinds/shell.ts';
import { tentRecordSchema } from './kinds/tent.ts';

export { bannerRecordSchema, customRecordSchema, screenRecordSchema, shellRecordSchema, tentRecordSchema };
export type { BannerRecord } from './kinds/banner.ts';
export type { CustomRecord } from './kinds/custom.ts';
export type { ScreenRecord } from './kinds/screen.ts';
export type { ShellRecord } from './kinds/shell.ts';
export type { TentRecord } from './kinds/tent.ts';

export const structureRecordSchema = z.discriminatedUnion('kind', [
  tentRecordSchema,
  bannerRecordSchema,
  screenRecordSchema,
  shellRecordSchema,
  customRecordSchema,
]);

export type StructureRecord = z.infer<typeof structureRecordSchema>;
export type StructureKind = StructureRecord['kind'];
export const structureKinds: readonly StructureKind[] = ['tent', 'banner', 'screen', 'shell', 'custom'];

/** A problem with one field: dotted path ("masses.2.xM", "" for the record itself) and the reason. */
export interface RecordIssue {
  path: string;
  message: string;
}

export type RecordValidation = { ok: true; record: StructureRecord } | { ok: false; issues: RecordIssue[] };

function dottedPath(prefix: string, path: ReadonlyArray<PropertyKey>): string {
  return [prefix, ...path.map(String)].filter((part) => part !== '').join('.');
}

/**
 * Zod issues as record issues under `prefix`. An unknown key is reported at its own path, so the
 * answer names the offending field rather than the object holding it.
 */
export function recordIssues(issues: ReadonlyArray<z.core.$ZodIssue>, prefix = ''): RecordIssue[] {
  return issues.flatMap((issue) =>
    issue.code === 'unrecognized_keys'
      ? issue.keys.map((key) => ({ path: dottedPath(prefix, [...issue.path, key]), message: 'is not a known field (check the spelling)' }))
      : [{ path: dottedPath(prefix, issue.path), message: issue.message }],
  );
}

/**
 * Checks any input as a structure record. Returns the parsed record (strings trimmed) or every
 * problem found.
 *
 * @example validateStructureRecord({ kind: 'banner', name: 'Gate', widthM: -3, ... })
 *   // → { ok: false, issues: [{ path: 'widthM', message: 'must be > 0 m' }, ...] }
 */
export function validateStructureRecord(input: unknown): RecordValidation {
  const parsed = structureRecordSchema.safeParse(input);
  if (parsed.success) return { ok: true, record: parsed.data };
  return { ok: false, issues: recordIssues(parsed.error.issues) };
}
