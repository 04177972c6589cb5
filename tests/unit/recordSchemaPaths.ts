/**
 * Every field of every structure kind, read from the engine's own zod schemas (so a field added
 * to a schema shows up here without anyone listing it): dotted paths such as `lengthM`,
 * `coefficients.cf`, `sides.front`, and for arrays of objects the element's fields under the
 * array's name (`faces.areaM2`, `masses.yM`). Used by the register-form and README coverage tests.
 */
import type { z } from 'zod';
import { structureKinds, type StructureKind } from '../../server/engine/record.ts';
import { kindDefinitions } from '../../server/engine/kinds/index.ts';
import { recordBaseShape } from '../../server/engine/kinds/recordBase.ts';

export { structureKinds, type StructureKind };

/** Each kind's record schema, from the engine's kind list (server/engine/kinds/index.ts `kindDefinitions`). */
export const kindSchemas: Readonly<Record<StructureKind, z.ZodType>> = Object.fromEntries(kindDefinitions.map((definition) => [definition.kind, definition.schema])) as unknown as Record<StructureKind, z.ZodType>;

export interface SchemaLeaf {
  /** Dotted path: "widthM", "coefficients.cf", "faces.facingDeg". */
  path: string;
  /** The record may leave it out (it or an object holding it is optional). */
  optional: boolean;
  /** The zod schema of the field itself, wrappers removed. */
  schema: z.ZodType;
  /** For a field of an array's elements: the array's path ("faces" for "faces.areaM2"). */
  arrayPath?: string;
}

interface Def {
  type: string;
  innerType?: z.ZodType;
  in?: z.ZodType;
}

const defOf = (schema: z.ZodType): Def => (schema as unknown as { def: Def }).def;

/** The schema inside optional / default / nullable / pipe wrappers, and whether one made it optional. */
export function unwrapped(schema: z.ZodType): { inner: z.ZodType; optional: boolean } {
  let inner = schema;
  let optional = false;
  for (;;) {
    const def = defOf(inner);
    if (def.type === 'optional' || def.type === 'default' || def.type === 'nullable' || def.type === 'readonly') {
      optional = true;
      inner = def.innerType!;
    } else if (def.type === 'pipe') {
      inner = def.in!;
    } else return { inner, optional };
  }
}

function walk(schema: z.ZodType, prefix: string, parentOptional: boolean, out: SchemaLeaf[], arrayPath?: string): void {
  const { inner, optional: own } = unwrapped(schema);
  const optional = parentOptional || own;
  const type = defOf(inner).type;
  if (type === 'object') {
    const shape = (inner as unknown as { shape: Record<string, z.ZodType> }).shape;
    for (const [key, child] of Object.entries(shape)) walk(child, prefix === '' ? key : `${prefix}.${key}`, optional, out, arrayPath);
    return;
  }
  if (type === 'array') {
    const element = (inner as unknown as { element: z.ZodType }).element;
    if (defOf(unwrapped(element).inner).type === 'object') {
      walk(element, prefix, optional, out, prefix);
      return;
    }
  }
  out.push({ path: prefix, optional, schema: inner, ...(arrayPath === undefined ? {} : { arrayPath }) });
}

/** Every leaf field of a schema, nested objects dotted, in the schema's order. */
export function schemaLeaves(schema: z.ZodType): SchemaLeaf[] {
  const out: SchemaLeaf[] = [];
  walk(schema, '', false, out);
  return out;
}

/** Every field of a kind's record. */
export function kindLeaves(kind: StructureKind): SchemaLeaf[] {
  return schemaLeaves(kindSchemas[kind]);
}

/** The fields every record has (recordBase.ts: name, safety factors, rated gust, friction, ...). */
export function commonLeafPaths(): Set<string> {
  const out: SchemaLeaf[] = [];
  for (const [key, child] of Object.entries(recordBaseShape)) walk(child as z.ZodType, key, false, out);
  return new Set(out.map((leaf) => leaf.path));
}

/** The values of a z.enum or z.literal, or null for other schemas. */
export function choicesOf(schema: z.ZodType): string[] | null {
  const def = defOf(schema) as Def & { entries?: Record<string, string>; values?: unknown[] };
  if (def.type === 'enum' && def.entries) return Object.values(def.entries);
  if (def.type === 'literal' && def.values) return def.values.map(String);
  return null;
}

/** The ### subsections of a markdown section: heading line → body (heading included). */
function subsections(section: string): Array<{ heading: string; body: string }> {
  const parts = section.split(/^(?=### )/m).filter((part) => part.startsWith('### '));
  return parts.map((part) => ({ heading: part.slice(0, part.indexOf('\n') === -1 ? undefined : part.indexOf('\n')), body: part }));
}

/** The "## <title>" section of a markdown text, up to the next "## " heading, or null. */
export function markdownSection(markdown: string, title: string): string | null {
  const lines = markdown.split('\n');
  const start = lines.findIndex((line) => line.trim() === `## ${title}`);
  if (start === -1) return null;
  const end = lines.findIndex((line, index) => index > start && /^## /.test(line));
  return lines.slice(start, end === -1 ? undefined : end).join('\n');
}

/** Heading of the subsection that documents the fields every record has. */
export const commonFieldsHeading = '### Fields every kind has';

/**
 * What the README's "## Structure kinds" section fails to document, each problem prefixed with the
 * kind ("tent: ...") or "common:" for the fields every record has: every field of every kind in
 * backticks (`coefficients.cf`, `sides.front`; an array's fields as `faces.areaM2` or
 * `faces[].areaM2`) in that kind's ### subsection (its heading names the kind in backticks:
 * "### Tent (`tent`)"), the fields every record has in "### Fields every kind has". Empty: nothing.
 */
export function kindDocsProblems(markdown: string): string[] {
  const section = markdownSection(markdown, 'Structure kinds');
  if (section === null) return ['section: no "## Structure kinds" section'];
  const parts = subsections(section);
  const mentioned = (body: string, leaf: SchemaLeaf) => {
    const forms = [leaf.path];
    if (leaf.arrayPath !== undefined) forms.push(`${leaf.arrayPath}[]${leaf.path.slice(leaf.arrayPath.length)}`);
    return forms.some((form) => body.includes(`\`${form}\``));
  };
  const problems: string[] = [];
  const commonPaths = commonLeafPaths();
  const common = parts.find((part) => part.heading.trim() === commonFieldsHeading);
  if (!common) problems.push(`common: no "${commonFieldsHeading}" subsection`);
  else {
    for (const leaf of kindLeaves('tent').filter((leaf) => commonPaths.has(leaf.path))) {
      if (!mentioned(common.body, leaf)) problems.push(`common: \`${leaf.path}\` is not in "${commonFieldsHeading}"`);
    }
  }
  for (const kind of structureKinds) {
    const own = parts.find((part) => part.heading.includes(`(\`${kind}\`)`));
    if (!own) {
      problems.push(`${kind}: no ### subsection whose heading names (\`${kind}\`)`);
      continue;
    }
    for (const leaf of kindLeaves(kind).filter((leaf) => !commonPaths.has(leaf.path))) {
      if (!mentioned(own.body, leaf)) problems.push(`${kind}: \`${leaf.path}\` is not in ${own.heading.trim()}`);
    }
  }
  return problems;
}
