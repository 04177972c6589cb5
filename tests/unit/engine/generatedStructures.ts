/**
 * Seeded structures for the property tests: a small PRNG (mulberry32, public domain) so that
 * every run checks the same few hundred structures and a failure can be replayed by its index.
 */
import { seededRandom, type Random } from '../../../server/demo/random.ts';
import type { ExpandedStructure } from '../../../server/engine/index.ts';

export { seededRandom, type Random };

export function between(random: Random, min: number, max: number): number {
  return min + (max - min) * random();
}

export function integerBetween(random: Random, min: number, max: number): number {
  return Math.floor(between(random, min, max + 1));
}

export interface GenerateOptions {
  uplift: boolean;
  /** Same coefficient on both sides and every mass mirrored about the middle of the base. */
  symmetric?: boolean;
}

/** A plausible temporary structure: 1–4 loaded faces (cf > 0), 1–5 masses on the base. */
export function generatedStructure(random: Random, { uplift, symmetric = false }: GenerateOptions): ExpandedStructure {
  const baseDepthM = between(random, 0.5, 6);
  const faces = Array.from({ length: integerBetween(random, 1, 4) }, () => {
    const cfFront = between(random, 0.3, 2);
    return {
      areaM2: between(random, 0.5, 40),
      centroidHeightM: between(random, 0.3, 8),
      cfFront,
      cfBack: symmetric ? cfFront : between(random, 0.3, 2),
    };
  });
  const masses = Array.from({ length: integerBetween(random, 1, 5) }, () => ({
    massKg: between(random, 10, 3000),
    xM: between(random, 0, baseDepthM),
  }));
  const mirrored = symmetric ? masses.map((mass) => ({ ...mass, xM: baseDepthM - mass.xM })) : [];
  return {
    baseDepthM,
    frictionCoefficient: between(random, 0.2, 0.8),
    faces,
    ...(uplift ? { uplift: { planAreaM2: between(random, 1, 60), liftCoefficient: between(random, 0.1, 1.2) } } : {}),
    masses: [...masses, ...mirrored],
    safetyFactors: { overturning: between(random, 1, 2.5), sliding: between(random, 1, 2.5), uplift: between(random, 1, 2.5) },
  };
}
