/**
 * Facts of the trade, through the calculator (POST /api/assess) and the engine, on examples of our
 * own (issue 11, "facts of the trade": common practice, sources named where there is one).
 */
import { describe, expect, it } from 'vitest';
import { Hono } from 'hono';
import { assessRoute } from '../../server/http/assess.ts';
import { isaAirDensityKgM3, relativeWindMps } from '../../server/engine/index.ts';

const app = new Hono().route('/api/assess', assessRoute);

async function assess(body: unknown): Promise<Record<string, any>> {
  const response = await app.request('/api/assess', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  expect(response.status).toBe(200);
  return (await response.json()) as Record<string, any>;
}

describe('a solid hemisphere (common practice; Munson, Fundamentals of Fluid Mechanics, fig. 9.20)', () => {
  // Our own example: a solid half-sphere stone of radius 0.5 m on a 1.2 m × 1.2 m plinth, its flat face
  // looking to the front. Projected disc π · 0.5² = 0.785398 m², centre 0.6 m up; 300 kg at the middle.
  // At 10 m/s in 1.225 kg/m³, q = 61.25 Pa: flat face to the wind F = 1.17 · 61.25 · 0.785398 = 56.2837 N;
  // curved face to the wind F = 0.42 · 61.25 · 0.785398 = 20.2044 N.
  const stone = {
    kind: 'custom',
    name: 'Half-sphere stone',
    baseDepthM: 1.2,
    baseWidthM: 1.2,
    frictionCoefficient: 0.4,
    faces: [{ label: 'half sphere', areaM2: Math.PI * 0.25, centroidHeightM: 0.6, cfFront: 1.17, cfBack: 0.42 }],
    masses: [{ massKg: 300, xM: 0.6 }],
    coefficientSource: 'Munson, Fundamentals of Fluid Mechanics, fig. 9.20: solid hemisphere',
  };

  it('takes about 1.17 with its flat side to the wind and about 0.42 with its curved side: 56.28 N and 20.20 N at 10 m/s', async () => {
    const answer = await assess({ structure: stone, gustMps: 10 });
    const byDirection = new Map(answer.directions.map((d: any) => [d.directionDeg, d]));
    expect((byDirection.get(0) as any).horizontalForceN).toBeCloseTo(56.2837, 3);
    expect((byDirection.get(180) as any).horizontalForceN).toBeCloseTo(20.2044, 3);
    expect(answer.horizontalForceN).toBeCloseTo(56.2837, 3);
  });
});

describe('air', () => {
  it('at sea level and 15 °C is about 1.23 kg/m³ (common practice; ISA 1.225, ISO 2533)', () => {
    expect(isaAirDensityKgM3(0)).toBeCloseTo(1.23, 2);
  });
});

describe('a moving structure (common practice: the relative wind is the vector difference)', () => {
  it('moving into a 10 m/s wind at 4 m/s it sees 14 m/s, moving with it 6 m/s, and in still air its own 4 m/s', () => {
    expect(relativeWindMps({ windMps: 10, windFromDeg: 0, travelSpeedMps: 4, headingDeg: 0 }).speedMps).toBeCloseTo(14, 12);
    expect(relativeWindMps({ windMps: 10, windFromDeg: 0, travelSpeedMps: 4, headingDeg: 180 }).speedMps).toBeCloseTo(6, 12);
    expect(relativeWindMps({ windMps: 0, windFromDeg: 0, travelSpeedMps: 4, headingDeg: 90 }).speedMps).toBeCloseTo(4, 12);
  });

  it('the calculator answers the highest travel speed in a wind: limit − wind, heading into it', async () => {
    const answer = await assess({ structure: { ...{ kind: 'custom', name: 'Trailer screen', baseDepthM: 2, baseWidthM: 4, frictionCoefficient: 0.4, faces: [{ areaM2: 8, centroidHeightM: 3, cfFront: 1.8, cfBack: 1.8 }], masses: [{ massKg: 3000, xM: 1 }] } }, gustMps: 5, travel: {} });
    expect(answer.travel.possible).toBe(true);
    expect(answer.travel.speedMps).toBeCloseTo(answer.limitGustMps - 5, 9);
  });
});
