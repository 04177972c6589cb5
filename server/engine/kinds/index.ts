/**
 * Kinds: templates that expand plain dimensions into faces and masses (design §2.3), the list of
 * every kind (`kindDefinitions`: each kind's file declares its schema, expansion, words and
 * configuration rule once, kindDefinition.ts) and the expansion of any record.
 */
import type { StructureKind, StructureRecord } from '../record.ts';
import { bannerKind } from './banner.ts';
import { customKind } from './custom.ts';
import type { KindDefinition, KindSchema } from './kindDefinition.ts';
import { screenKind } from './screen.ts';
import { shellKind } from './shell.ts';
import { tentKind } from './tent.ts';
import type { Expansion } from './recordBase.ts';

/**
 * Every structure kind, in the order the register form offers them. A new kind is its own file
 * (kinds/<kind>.ts ending in `defineKind`) and one entry here; the record union, `structureKinds`,
 * the expansion and the configuration checks follow from this list.
 */
export const kindDefinitions = [tentKind, bannerKind, screenKind, shellKind, customKind] as const;

export { defineKind, type KindDefinition, type KindSchema } from './kindDefinition.ts';

export type { Expansion, SourceNote } from './recordBase.ts';
export { defaultCoefficients, frictionBySurface, type SourcedValue, type Surface } from './coefficients.ts';
export {
  boardForceCoefficient,
  freeStandingWallCpNet,
  freeStandingWallMeanCpNet,
  solidBoardCoefficient,
  solidityFactor,
  wallZones,
  type WallZone,
} from './boardCoefficient.ts';

/** A kind's definition as the engine uses it, whatever the kind: its functions take any record of it. */
type AnyKindDefinition = Omit<KindDefinition<StructureKind, KindSchema<StructureKind>>, 'expand' | 'configured'> & {
  expand(record: StructureRecord): Expansion;
  configured?(registered: StructureRecord, changed: Record<string, unknown>, changedFields: readonly string[]): void;
};

const definitionByKind = new Map<string, AnyKindDefinition>(kindDefinitions.map((definition) => [definition.kind, definition as unknown as AnyKindDefinition]));

/** The definition of a kind; a RangeError for a name that is not a kind (records are validated first). */
export function kindDefinition(kind: StructureKind): AnyKindDefinition {
  const definition = definitionByKind.get(kind);
  if (!definition) throw new RangeError(`kindDefinition: kind must be one of ${kindDefinitions.map((d) => d.kind).join(', ')}, got ${String(kind)}`);
  return definition;
}

/** Any valid record as the expanded structure, the sources of its values and its reference height. */
export function expandStructure(record: StructureRecord): Expansion {
  return kindDefinition(record.kind).expand(record);
}
