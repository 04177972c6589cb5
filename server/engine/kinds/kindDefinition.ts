/**
 * What the engine needs of one structure kind, declared once in the kind's own file
 * (kinds/<kind>.ts ends with `export const <kind>Kind = defineKind({...})`): its record schema,
 * how a record expands to faces and masses, how messages name a record of it, and what a
 * configuration's changes must carry along (design §2.5). `kinds/index.ts` lists the definitions;
 * the record union (record.ts), the expansion and the configuration checks iterate over that list,
 * so no other engine file names a kind.
 */
import type { z } from 'zod';
import type { Expansion } from './recordBase.ts';

/** A kind's record schema: a zod object whose `kind` is the kind's literal name. */
export type KindSchema<Name extends string> = z.ZodObject<{ kind: z.ZodLiteral<Name> } & z.core.$ZodLooseShape>;

export interface KindDefinition<Name extends string, Schema extends KindSchema<Name>> {
  /** The record's `kind`, as stored and as the API takes it: lower case, one word. */
  kind: Name;
  /** The record's schema: `kind: z.literal(<kind>)`, `...recordBaseShape` and the kind's own fields (strict). */
  schema: Schema;
  /** The record with its article, as messages name it: "a tent" (“… is not a field of a tent record”). */
  recordWords: string;
  /** The record expanded to the structure the engine assesses (faces, masses, base, elements, sources). */
  expand(record: z.infer<Schema>): Expansion;
  /**
   * Optional: what a configuration carries along besides its changes (engine/configuration.ts).
   * Called with the registered record, the changed record being built (edit it in place) and the
   * fields changed; for fields the record derives from others that must not move with them (a
   * screen lowered on its towers keeps the towers' height).
   */
  configured?(registered: z.infer<Schema>, changed: Record<string, unknown>, changedFields: readonly string[]): void;
}

/** A kind's definition, checked: `expand` and `configured` take the schema's own record. */
export function defineKind<const Name extends string, Schema extends KindSchema<Name>>(definition: KindDefinition<Name, Schema>): KindDefinition<Name, Schema> {
  return definition;
}
