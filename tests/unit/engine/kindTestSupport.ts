/**
 * Helpers the kind tests share: a record parsed as the route parses it, its refused paths, one
 * direction of a part, and a relative comparison.
 */
import { expect } from 'vitest';
import { validateStructureRecord, type BodyCoefficients, type StructureRecord } from '../../../server/engine/index.ts';

/** Parses a record as the route would, so the examples are valid records. */
export function record(input: unknown): StructureRecord {
  const result = validateStructureRecord(input);
  if (!result.ok) throw new Error(JSON.stringify(result.issues));
  return result.record;
}

/** The field paths a record is refused at (none when it is valid). */
export function issuePaths(input: unknown): string[] {
  const result = validateStructureRecord(input);
  return result.ok ? [] : result.issues.map((issue) => issue.path);
}

/** One assessed direction of a part (its coefficients). */
export function direction(part: BodyCoefficients, directionDeg: number) {
  const found = part.directions.find((entry) => Math.abs(entry.directionDeg - directionDeg) < 1e-9);
  if (!found) throw new Error(`direction ${directionDeg} not assessed`);
  return found;
}

/** |actual − expected| ≤ tolerance · |expected|. */
export function expectRelative(actual: number, expected: number, tolerance = 1e-12): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}
