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
  /** Give the structure a base width (a rectangle); false: a strip (first-round record). */
  rectangle?: boolean;
  /** Add one or two elements on bases of their own. */
  elements?: boolean;
}

const facings = [0, 90, 180, 270, 10, 45, 200] as const;

function faces(random: Random, count: number, anyFacing: boolean) {
  return Array.from({ length: count }, () => ({
    areaM2: between(random, 0.5, 40),
    centroidHeightM: between(random, 0.3, 8),
    cfFront: between(random, 0.3, 2),
    cfBack: between(random, 0, 2),
    ...(anyFacing ? { facingDeg: facings[integerBetween(random, 0, facings.length - 1)]! } : {}),
  }));
}

/** A plausible temporary structure: 1–4 loaded faces, 1–5 masses on the base, optional uplift and elements. */
export function generatedStructure(random: Random, { uplift, rectangle = true, elements = false }: GenerateOptions): ExpandedStructure {
  const baseDepthM = between(random, 0.5, 6);
  const baseWidthM = between(random, 0.5, 12);
  const masses = Array.from({ length: integerBetween(random, 1, 5) }, () => ({
    massKg: between(random, 10, 3000),
    xM: between(random, 0, baseDepthM),
    ...(rectangle ? { yM: between(random, 0, baseWidthM) } : {}),
  }));
  const safetyFactors = { overturning: between(random, 1, 2.5), sliding: between(random, 1, 2.5), uplift: between(random, 1, 2.5) };
  const frictionCoefficient = between(random, 0.2, 0.8);
  const structure: ExpandedStructure = {
    baseDepthM,
    ...(rectangle ? { baseWidthM } : {}),
    frictionCoefficient,
    faces: faces(random, integerBetween(random, 1, 4), rectangle),
    ...(uplift
      ? {
          uplift: {
            planAreaM2: between(random, 1, 60),
            liftCoefficient: between(random, 0.1, 1.2),
            // A first-round (strip) record had its uplift at the middle of the base.
            ...(rectangle ? { xM: between(random, 0, baseDepthM), yM: between(random, 0, baseWidthM) } : {}),
          },
        }
      : {}),
    masses,
    safetyFactors,
  };
  if (elements && rectangle) {
    structure.elements = Array.from({ length: integerBetween(random, 1, 2) }, (_, index) => {
      const depthM = between(random, 0.3, 2);
      const widthM = between(random, 0.3, 2);
      return {
        name: `element ${index + 1}`,
        baseDepthM: depthM,
        baseWidthM: widthM,
        frictionCoefficient,
        faces: faces(random, 1, true),
        masses: [{ massKg: between(random, 10, 500), xM: depthM / 2, yM: widthM / 2 }],
        safetyFactors,
      };
    });
  }
  return structure;
}
