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
import { configurationIssues } from './configuration.ts';
import { issuePaths, unknownFieldMessages, type PathIssue } from './issueWords.ts';
import { expandStructure, kindDefinitions } from './kinds/index.ts';
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

/** The schemas of `kindDefinitions` (kinds/index.ts), in its order, as the union's option types. */
type SchemasOf<Definitions extends readonly unknown[]> = { -readonly [I in keyof Definitions]: Definitions[I] extends { schema: infer Schema } ? Schema : never };
type KindSchemas = SchemasOf<typeof kindDefinitions>;

/** Every kind's record schema as one union on `kind`, from the kind list (kinds/index.ts `kindDefinitions`). */
export const structureRecordSchema = z.discriminatedUnion('kind', kindDefinitions.map((definition) => definition.schema) as unknown as KindSchemas);

export type StructureRecord = z.infer<typeof structureRecordSchema>;
export type StructureKind = StructureRecord['kind'];
/** Every kind's name, in the order of the kind list (the register form's order). */
export const structureKinds: readonly StructureKind[] = kindDefinitions.map((definition) => definition.kind);

/** A problem with one field: dotted path ("masses.2.xM", "" for the record itself) and the reason. */
export type RecordIssue = PathIssue;

export type RecordValidation = { ok: true; record: StructureRecord } | { ok: false; issues: RecordIssue[] };

/**
 * Zod issues as record issues under `prefix`. An unknown key is reported at its own path, so the
 * answer names the offending field rather than the object holding it; the library's own wording
 * becomes a plain phrase (issueWords.ts).
 */
export function recordIssues(issues: ReadonlyArray<z.core.$ZodIssue>, prefix = ''): RecordIssue[] {
  return issuePaths(issues, { prefix, unknownField: unknownFieldMessages.known });
}

/**
 * A reference height below a face's centroid is refused: the gust is taken at the reference
 * height, and the wind profile grows with height, so a lower one would under-read the wind on
 * that face (EN 1991-1-4 §4.3: the mean wind grows with height over the profile). The record is
 * expanded without its reference height to find the faces (and, for the message, the default
 * that would apply instead: the structure's top). Faces of no area load nothing and are skipped.
 */
function referenceHeightIssue(record: StructureRecord): RecordIssue | null {
  const givenM = record.referenceHeightM;
  if (givenM === undefined) return null;
  const { referenceHeightM: _given, ...rest } = record;
  const expansion = expandStructure(rest as StructureRecord);
  const faces = [...expansion.structure.faces, ...(expansion.structure.elements ?? []).flatMap((element) => element.faces)].filter((face) => face.areaM2 > 0);
  if (faces.length === 0) return null;
  const highest = faces.reduce((top, face) => (face.centroidHeightM > top.centroidHeightM ? face : top));
  // Rounding of the message only: the comparison is exact.
  if (givenM >= highest.centroidHeightM) return null;
  const where = highest.label ? `the centroid of “${highest.label}”` : 'the highest face centroid';
  const m = (value: number) => `${Math.round(value * 100) / 100} m`;
  return {
    path: 'referenceHeightM',
    message:
      `must be at least ${m(highest.centroidHeightM)}, the height of ${where}: the gust is taken at the reference height, and one below a face's centroid under-reads the wind on that face. ` +
      `Give ${m(highest.centroidHeightM)} or more, or leave it out for the top of the structure (${m(expansion.referenceHeightM)}).`,
  };
}

/**
 * Checks any input as a structure record. Returns the parsed record (strings trimmed) or every
 * problem found. A reference height below a face's centroid is refused (referenceHeightIssue).
 * A record's configurations are checked once the record itself is valid: each changed record
 * must be a valid record of the kind (issues at `configurations.<i>.changes.<field>`).
 *
 * @example validateStructureRecord({ kind: 'banner', name: 'Gate', widthM: -3, ... })
 *   // → { ok: false, issues: [{ path: 'widthM', message: 'must be > 0 m' }, ...] }
 */
export function validateStructureRecord(input: unknown): RecordValidation {
  const own = validateRecordItself(input);
  if (!own.ok) return own;
  // Each configuration's changed record is checked like a record (configuration.ts).
  const issues = configurationIssues(own.record);
  return issues.length > 0 ? { ok: false, issues } : own;
}

/**
 * The checks of `validateStructureRecord` on the record itself: its fields, its kind's cross-field
 * checks and the reference height, but not what its configurations change (configuration.ts runs
 * this on each changed record).
 */
export function validateRecordItself(input: unknown): RecordValidation {
  // reportInput: the plain wording names the value given ("must be one of tent, …, not “yurt”").
  const parsed = structureRecordSchema.safeParse(input, { reportInput: true });
  if (!parsed.success) return { ok: false, issues: recordIssues(parsed.error.issues) };
  const height = referenceHeightIssue(parsed.data);
  return height ? { ok: false, issues: [height] } : { ok: true, record: parsed.data };
}
