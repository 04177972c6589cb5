/**
 * What every structure record has besides its dimensions (design §4): a name, optional safety
 * factors, rated gust, friction (or the ground surface it stands on), reference height and the
 * source of any overridden coefficient; and how those become the expanded structure's settings.
 */
import { z } from 'zod';
import { defaultSafetyFactors, safetyFactorSources, criteria } from '../stability.ts';
import type { ExpandedStructure, SafetyFactors } from '../structure.ts';
import { maxLabelLength, maxNameLength } from '../limits.ts';
import { dimensionM, frictionCoefficient, gustMps, safetyFactor, sourceText } from '../recordFields.ts';
import { frictionBySurface, steelFeetOnHardFriction, type SourcedValue } from './coefficients.ts';

/** Most configurations a record may list besides the one as registered (design §2.5). */
export const maxConfigurations = 8;
/** Name of the configuration as registered when the record gives no `configurationName`. */
export const defaultRegisteredConfigurationName = 'as registered';

function configurationNameSchema() {
  return z.string().trim().min(1, 'must not be empty').max(maxNameLength, `must be at most ${maxNameLength} characters`);
}

export const recordBaseShape = {
  name: z.string().trim().min(1, 'must not be empty').max(maxLabelLength, `must be at most ${maxLabelLength} characters`),
  /** Partial safety factors; each one missing takes its default (1.5 / 2.0 / 1.5). */
  safetyFactors: z
    .strictObject({ overturning: safetyFactor().optional(), sliding: safetyFactor().optional(), uplift: safetyFactor().optional() })
    .optional(),
  /** The designer's or manufacturer's rated operational gust (usually a 3-s gust), m/s. */
  ratedGustMps: gustMps().optional(),
  /** Base-to-ground friction coefficient; when missing, the `surface` default. */
  frictionCoefficient: frictionCoefficient().optional(),
  /** Ground under the ballast, for the default friction coefficient (default grass, the lower). */
  surface: z.enum(['grass', 'hard']).optional(),
  /** Height the measured gust is transferred to, m (default: the top of the structure). */
  referenceHeightM: dimensionM().optional(),
  /** Source of any coefficient the record overrides: required when it overrides one. */
  coefficientSource: sourceText().optional(),
  /**
   * Name of the record's own configuration, the one as registered ("raised", "sides on"), at most
   * 100 characters. Default "as registered". Listed first wherever configurations are shown.
   */
  configurationName: configurationNameSchema().optional(),
  /**
   * Other configurations the crew can move the structure to (design §2.5), at most 8: each a
   * `name` and the `changes` it makes, `{<field of this kind>: <value>}`. A change replaces the
   * registered field's value (an object such as `sides` or `coefficients` is replaced whole);
   * null removes an optional field, so its default applies. The changed record is checked like
   * any record of the kind.
   */
  configurations: z
    .array(
      z.strictObject({
        /** What the crew call the configuration ("lowered", "sides off", "scrim removed"), at most 100 characters. */
        name: configurationNameSchema(),
        /** The fields of the record's kind this configuration changes, each with its new value (null: removed). */
        changes: z.record(z.string(), z.unknown()),
      }),
    )
    .max(maxConfigurations, `must list at most ${maxConfigurations} configurations`)
    .optional(),
};

const recordBaseSchema = z.object(recordBaseShape);
export type RecordBase = z.infer<typeof recordBaseSchema>;

/** A value in the expanded structure and the source it rests on, as listed in the response. */
export interface SourceNote {
  item: string;
  value: number;
  source: string;
}

/** A kind's record expanded to faces and masses (design §4: returned so an engineer can check it). */
export interface Expansion {
  structure: ExpandedStructure;
  /** Height the site's measured gust is transferred to (default: the top of the structure), m. */
  referenceHeightM: number;
  sources: SourceNote[];
  /** Assumptions of the template, in words. */
  notes: string[];
  /** Sentences the answer must carry: what was not checked or was assumed against safety's side. */
  warnings?: string[];
}

/** Friction, safety factors and rated gust of a record, with their sources. */
export function resistanceSettings(
  record: RecordBase,
  options: { steelFeet?: boolean } = {},
): {
  settings: Pick<ExpandedStructure, 'frictionCoefficient' | 'safetyFactors' | 'ratedGustMps'>;
  sources: SourceNote[];
  /** Sentences for the answer: a friction coefficient assumed rather than given. */
  warnings: string[];
} {
  const sources: SourceNote[] = [];
  const warnings: string[] = [];
  const surface = record.surface ?? 'grass';
  const friction: SourcedValue =
    record.frictionCoefficient !== undefined
      ? { value: record.frictionCoefficient, source: 'given in the record' }
      : surface === 'hard' && options.steelFeet
        ? steelFeetOnHardFriction
        : frictionBySurface[surface];
  sources.push({ item: 'friction coefficient μ', ...friction });
  if (record.frictionCoefficient === undefined && surface === 'hard') {
    warnings.push(
      `Friction μ ${friction.value} was assumed for ${options.steelFeet ? 'steel feet' : 'ballast'} on a hard surface; steel on smooth cast concrete can be as low as 0.1 (HSE RR071): give frictionCoefficient for the actual feet and surface.`,
    );
  }

  const given = record.safetyFactors ?? {};
  const safetyFactors: SafetyFactors = {
    overturning: given.overturning ?? defaultSafetyFactors.overturning,
    sliding: given.sliding ?? defaultSafetyFactors.sliding,
    uplift: given.uplift ?? defaultSafetyFactors.uplift,
  };
  for (const criterion of criteria) {
    sources.push({
      item: `safety factor γ (${criterion})`,
      value: safetyFactors[criterion],
      source: given[criterion] === undefined ? safetyFactorSources[criterion] : 'given in the record',
    });
  }
  const settings = { frictionCoefficient: friction.value, safetyFactors, ratedGustMps: record.ratedGustMps };
  if (record.ratedGustMps !== undefined) {
    sources.push({ item: 'rated gust, m/s', value: record.ratedGustMps, source: 'given in the record (designer or manufacturer)' });
  }
  return { settings, sources, warnings };
}

/** The default coefficient, or the record's override with its stated source. */
export function chosenCoefficient(
  item: string,
  fallback: SourcedValue,
  override: number | undefined,
  coefficientSource: string | undefined,
): SourceNote {
  return override === undefined ? { item, ...fallback } : givenCoefficient(item, override, coefficientSource);
}

/** A coefficient the record gives, with its stated source. */
export function givenCoefficient(item: string, value: number, coefficientSource: string | undefined): SourceNote {
  return { item, value, source: `given in the record: ${coefficientSource ?? 'no source stated'}` };
}

/**
 * Refinement for records with a `coefficients` block: an overridden coefficient needs a stated
 * source (standard and clause, handbook and figure, or the manufacturer's sheet).
 */
export function requireCoefficientSource<
  T extends { coefficients?: Record<string, number | undefined> | undefined; coefficientSource?: string | undefined },
>(record: T, ctx: z.RefinementCtx<T>): void {
  const overridden = Object.values(record.coefficients ?? {}).some((value) => value !== undefined);
  if (overridden && record.coefficientSource === undefined) {
    ctx.addIssue({
      code: 'custom',
      path: ['coefficientSource'],
      message: 'is required when coefficients are overridden: name the standard and clause, handbook and figure, or manufacturer',
    });
  }
}
