import { describe, expect, it } from 'vitest';
import { validateStructureRecord } from '../../../server/engine/index.ts';

const customRecord = {
  kind: 'custom',
  name: 'Bar canopy',
  baseDepthM: 2,
  frictionCoefficient: 0.4,
  faces: [{ areaM2: 6, centroidHeightM: 1.8, cfFront: 1.2, cfBack: 1.2 }],
  masses: [{ label: 'ballast', massKg: 400, xM: 1 }],
};

const tentRecord = {
  kind: 'tent', name: 'Bar tent', lengthM: 6, widthM: 3, eaveHeightM: 2.2, ridgeHeightM: 3,
  wallsClosed: false, legs: 4, ballastPerLegKg: 100, selfWeightKg: 120,
};

function issuesOf(input: unknown) {
  const result = validateStructureRecord(input);
  if (result.ok) throw new Error('expected the record to be rejected');
  return result.issues;
}

function pathsOf(input: unknown): string[] {
  return issuesOf(input).map((issue) => issue.path);
}

describe('validateStructureRecord', () => {
  it('accepts the custom record of design §4 and returns it parsed', () => {
    const result = validateStructureRecord(customRecord);
    expect(result).toEqual({ ok: true, record: customRecord });
  });

  it('accepts partial safety factors and no friction (defaults apply)', () => {
    const { frictionCoefficient: _friction, ...withoutFriction } = customRecord;
    expect(validateStructureRecord({ ...withoutFriction, safetyFactors: { sliding: 2.5 } }).ok).toBe(true);
  });

  it('names every offending field of a record at once: negative, non-finite, outside the base, missing', () => {
    const issues = issuesOf({
      ...customRecord,
      baseDepthM: 2,
      faces: [{ areaM2: -1, centroidHeightM: 1, cfFront: 1.2, cfBack: 9 }],
      masses: [{ massKg: 100, xM: 2.5 }, { massKg: -5, xM: 0 }],
      safetyFactors: { overturning: 0.8 },
    });
    expect(issues.map((issue) => issue.path)).toEqual(
      expect.arrayContaining(['faces.0.areaM2', 'faces.0.cfBack', 'masses.1.massKg', 'safetyFactors.overturning', 'masses.0.xM']),
    );
    expect(issues.find((issue) => issue.path === 'masses.0.xM')?.message).toMatch(/within the base/);
  });

  it('rejects an empty face list, a zero base depth and zero total mass', () => {
    expect(pathsOf({ ...customRecord, faces: [] })).toEqual(['faces']);
    expect(pathsOf({ ...customRecord, baseDepthM: 0 })).toEqual(['baseDepthM']);
    expect(pathsOf({ ...customRecord, masses: [{ massKg: 0, xM: 0 }] })).toEqual(['masses']);
  });

  it('rejects a ridge below the eave and an odd number of legs; accepts a span wider than the length (every direction is assessed now)', () => {
    expect(pathsOf({ ...tentRecord, ridgeHeightM: 2 })).toEqual(['ridgeHeightM']);
    expect(validateStructureRecord({ ...tentRecord, widthM: tentRecord.lengthM + 1 }).ok).toBe(true);
    expect(pathsOf({ ...tentRecord, legs: 5 })).toEqual(['legs']);
  });

  it('rejects a solidity outside 0..1', () => {
    const banner = {
      kind: 'banner', name: 'Scrim', widthM: 5, heightM: 2, clearanceM: 0, feet: 3, ballastPerFootKg: 20, footDepthM: 0.6, selfWeightKg: 30,
    };
    expect(validateStructureRecord({ ...banner, solidity: 0.5 }).ok).toBe(true);
    expect(pathsOf({ ...banner, solidity: 1.2 })).toEqual(['solidity']);
    expect(pathsOf({ ...banner, solidity: 0 })).toEqual(['solidity']);
  });

  it('rejects a shell base shallower than its radius', () => {
    expect(pathsOf({ kind: 'shell', name: 'Shell', radiusM: 4, baseDepthM: 3, selfWeightKg: 500 })).toEqual(['baseDepthM']);
  });

  it('requires a source when a coefficient is overridden', () => {
    const issues = issuesOf({ ...tentRecord, coefficients: { liftCoefficient: 0.6 } });
    expect(issues).toEqual([{ path: 'coefficientSource', message: expect.stringMatching(/required when coefficients are overridden/) }]);
    expect(validateStructureRecord({ ...tentRecord, coefficients: { liftCoefficient: 0.6 }, coefficientSource: 'maker’s sheet TX-6' }).ok).toBe(true);
  });

  it('rejects a misspelt field by name, so a rating is never dropped silently', () => {
    expect(issuesOf({ ...customRecord, ratedGustMs: 15 })).toEqual([{ path: 'ratedGustMs', message: expect.stringMatching(/not a known field/) }]);
  });

  it('rejects an unknown kind and input that is not an object', () => {
    expect(pathsOf({ ...customRecord, kind: 'stage' })).toEqual(['kind']);
    expect(pathsOf('tent')).toEqual(['']);
  });

  it('rejects a string where a number belongs, naming the field', () => {
    // Plain words, not the validation library's ("Invalid input: expected number, received string").
    expect(issuesOf({ ...tentRecord, lengthM: '6' })).toEqual([{ path: 'lengthM', message: 'must be a number, not text (“6”)' }]);
  });
});
