/**
 * POST /api/assess (design §4, contract), exercised in-process with `app.request`: the route as
 * the server mounts it, no mocks.
 */
import { describe, expect, it } from 'vitest';
import { Hono } from 'hono';
import { assessRoute } from '../../server/http/assess.ts';
import { expandStructure, stabilityCoefficients, validateStructureRecord } from '../../server/engine/index.ts';

const app = new Hono().route('/api/assess', assessRoute);

async function post(body: unknown, raw = false): Promise<{ status: number; json: Record<string, any> }> {
  const response = await app.request('/api/assess', {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: raw ? (body as string) : JSON.stringify(body),
  });
  return { status: response.status, json: (await response.json()) as Record<string, any> };
}

const records = {
  tent: {
    kind: 'tent', name: 'Catering marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 3.6,
    wallsClosed: true, legs: 8, ballastPerLegKg: 150, selfWeightKg: 900, surface: 'hard',
  },
  banner: {
    kind: 'banner', name: 'Mesh fence', widthM: 10, heightM: 2, clearanceM: 0.1, solidity: 0.7,
    feet: 6, ballastPerFootKg: 25, footDepthM: 0.8, selfWeightKg: 60,
  },
  screen: {
    kind: 'screen', name: 'Main stage LED', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2,
    towerMassKg: 400, screenMassKg: 600, outriggerDepthM: 5, ballastPerTowerKg: 1500, surface: 'hard',
  },
  shell: { kind: 'shell', name: 'Band shell', radiusM: 4, selfWeightKg: 1200, frontBallastKg: 1000, backBallastKg: 600 },
  custom: {
    kind: 'custom', name: 'Bar canopy', baseDepthM: 2, frictionCoefficient: 0.4,
    faces: [{ areaM2: 6, centroidHeightM: 1.8, cfFront: 1.2, cfBack: 1.2 }],
    uplift: { planAreaM2: 6, liftCoefficient: 0.5 },
    masses: [{ label: 'ballast', massKg: 400, xM: 1 }],
    safetyFactors: { overturning: 1.5, sliding: 2, uplift: 1.5 },
    ratedGustMps: 10,
  },
};

const contractFields = [
  'qPa', 'horizontalForceN', 'upliftN', 'overturningMomentNm', 'restoringMomentNm', 'utilization',
  'governing', 'calculatedLimitGustMps', 'limitGustMps',
];

describe('POST /api/assess', () => {
  it.each(Object.entries(records))('answers 200 with the contract fields and the expanded structure for a %s record', async (_kind, structure) => {
    const { status, json } = await post({ structure, gustMps: 12 });
    expect(status).toBe(200);
    for (const field of contractFields) expect(json).toHaveProperty(field);
    expect(Object.keys(json.utilization).sort()).toEqual(['governing', 'overturning', 'sliding', 'uplift']);
    expect(['overturning', 'sliding', 'uplift']).toContain(json.governing);
    expect(json.expanded.faces.length).toBeGreaterThan(0);
    expect(json.expanded.masses.length).toBeGreaterThan(0);
    expect(json.sources.length).toBeGreaterThan(0);
  });

  it('defaults the density to ISA sea level: 20 m/s gives q 245 Pa, and the screen case F 10 584 N (references §9)', async () => {
    // Towers and header truss set to nothing, so the screen alone is loaded as in references §9.
    const { json } = await post({ structure: { ...records.screen, towerWidthM: 0, headerTrussDepthM: 0 }, gustMps: 20 });
    expect(json.airDensityKgM3).toBe(1.225);
    expect(json.qPa).toBeCloseTo(245, 10);
    // The body (the tower element, 0.75 of the load by the EN 7.4.3 eccentricity, governs the answer's top figures).
    const record = validateStructureRecord({ ...records.screen, towerWidthM: 0, headerTrussDepthM: 0 });
    if (!record.ok) throw new Error('screen record invalid');
    const body = stabilityCoefficients(expandStructure(record.record).structure).body.directions.find((d) => d.directionDeg === 0)!;
    expect(body.forcePerPaM2 * json.qPa).toBeCloseTo(10_584, 8);
    expect((body.windMomentPerPaM3.back - 0) * json.qPa).toBeCloseTo(52_920, 7);
    expect(json.governingElement).toMatch(/tower/);
  });

  it('uses a given density: q at 20 m/s and 1.25 kg/m³ is 250 Pa', async () => {
    const { json } = await post({ structure: records.screen, gustMps: 20, airDensityKgM3: 1.25 });
    expect(json.qPa).toBeCloseTo(250, 10);
  });

  it('reports the effective limit as the lower of the calculated limit and the rated gust', async () => {
    const { json } = await post({ structure: records.custom, gustMps: 10 });
    expect(json.calculatedLimitGustMps).toBeGreaterThan(10);
    expect(json.limitGustMps).toBe(10);
    expect(json.limitGovernedBy).toBe('rated');
  });

  it('stores nothing: the same request answers the same twice', async () => {
    const first = await post({ structure: records.tent, gustMps: 9 });
    const second = await post({ structure: records.tent, gustMps: 9 });
    expect(second.json).toEqual(first.json);
  });

  it('carries an unbounded utilization as null with its flag (JSON has no Infinity)', async () => {
    // 1 m² of wall and its only 100 kg standing on the front edge: wind onto the back tips it about
    // that edge with no restoring moment at all.
    const structure = {
      kind: 'custom', name: 'Light gazebo', baseDepthM: 3, frictionCoefficient: 0.3,
      faces: [{ areaM2: 1, centroidHeightM: 1, cfFront: 1, cfBack: 1 }],
      uplift: { planAreaM2: 40, liftCoefficient: 1 },
      masses: [{ massKg: 100, xM: 0 }],
    };
    const { status, json } = await post({ structure, gustMps: 15 });
    expect(status).toBe(200);
    expect(json.utilization.overturning).toBeNull();
    expect(json.unbounded.overturning).toBe(true);
    expect(json.utilization.governing).toBeNull();
    expect(json.margin).toBeNull();
    expect(json.utilization.uplift).toBeGreaterThan(1);
  });
});

describe('POST /api/assess rejects invalid input with 400 naming every offending field', () => {
  it('invalid JSON', async () => {
    const { status, json } = await post('{"structure": ', true);
    expect(status).toBe(400);
    expect(json).toEqual({ error: 'invalid input', issues: [{ path: '', message: 'body is not valid JSON' }] });
  });

  it('a negative gust, an implausible density and structure problems, all in one answer', async () => {
    const structure = { ...records.custom, baseDepthM: 2, faces: [], masses: [{ massKg: 100, xM: 3 }] };
    const { status, json } = await post({ structure, gustMps: -3, airDensityKgM3: 12.5 });
    expect(status).toBe(400);
    expect(json.error).toBe('invalid input');
    expect(json.issues.map((issue: { path: string }) => issue.path).sort()).toEqual(
      ['airDensityKgM3', 'gustMps', 'structure.faces', 'structure.masses.0.xM'].sort(),
    );
  });

  it('an absurd gust above 120 m/s and a density below 0.5 kg/m³', async () => {
    const { json } = await post({ structure: records.tent, gustMps: 400, airDensityKgM3: 0.2 });
    expect(json.issues.map((issue: { path: string }) => issue.path)).toEqual(['gustMps', 'airDensityKgM3']);
  });

  it('a non-finite gust (1e999 parses to Infinity) and a gust given as a string', async () => {
    const infinite = await post('{"structure": {"kind": "custom"}, "gustMps": 1e999}', true);
    expect(infinite.status).toBe(400);
    expect(infinite.json.issues[0]).toMatchObject({ path: 'gustMps' });
    const text = await post({ structure: records.tent, gustMps: '12' });
    expect(text.json.issues).toEqual([{ path: 'gustMps', message: expect.stringMatching(/^must be a number, not text/) }]);
  });

  it('a missing structure, a missing gust and an unknown field', async () => {
    const { status, json } = await post({ gust: 12 });
    expect(status).toBe(400);
    expect(json.issues).toEqual(
      expect.arrayContaining([
        { path: 'structure', message: 'is required: a structure record' },
        { path: 'gustMps', message: 'is required (a number)' },
        { path: 'gust', message: expect.stringMatching(/not a known field/) },
      ]),
    );
    expect(json.issues).toHaveLength(3);
  });

  it('an unknown kind and a body that is not an object', async () => {
    const unknownKind = await post({ structure: { ...records.tent, kind: 'stage' }, gustMps: 10 });
    expect(unknownKind.json.issues).toEqual([{ path: 'structure.kind', message: expect.any(String) }]);
    const array = await post([records.tent]);
    expect(array.status).toBe(400);
    expect(array.json.issues[0].path).toBe('');
  });

  it('kind-specific problems with their paths: ridge below eave, solidity above 1, override without source', async () => {
    const tent = await post({ structure: { ...records.tent, ridgeHeightM: 2, coefficients: { wallCf: 1.2 } }, gustMps: 10 });
    expect(tent.json.issues.map((issue: { path: string }) => issue.path).sort()).toEqual(
      ['structure.coefficientSource', 'structure.ridgeHeightM'].sort(),
    );
    const banner = await post({ structure: { ...records.banner, solidity: 1.5 }, gustMps: 10 });
    expect(banner.json.issues).toEqual([{ path: 'structure.solidity', message: 'must be ≤ 1' }]);
  });
});
