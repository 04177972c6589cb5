/**
 * The calculator's compatible extensions that the register form and the planner use: each level's
 * wind speed, the extra ballast for a design gust, and the highest travel speed of a mobile
 * structure. Checked against independent calculations, not against the code's own numbers.
 */
import { Hono } from 'hono';
import { describe, expect, it } from 'vitest';
import { assessRoute } from '../../server/http/assess.ts';

const app = new Hono().route('/api/assess', assessRoute);

async function post(body: unknown): Promise<{ status: number; json: Record<string, any> }> {
  const response = await app.request('/api/assess', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: response.status, json: (await response.json()) as Record<string, any> };
}

/** A trailer-mounted screen with no roof (so no uplift); invented numbers. */
const trailerScreen = {
  kind: 'custom',
  name: 'Trailer screen',
  baseDepthM: 2.4,
  frictionCoefficient: 0.5,
  faces: [{ areaM2: 12, centroidHeightM: 4, cfFront: 1.8, cfBack: 1.8 }],
  masses: [
    { label: 'trailer', massKg: 2600, xM: 1.2 },
    { label: 'screen', massKg: 700, xM: 1.2 },
  ],
  coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80',
};

const siteLevels = [
  { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Watch.' },
  { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Lower the screen to half height.' },
  { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Lower the screen fully.' },
];

describe('the calculator, asked for a plan', () => {
  it('gives each level its wind speed: 60 % and 80 % of load capacity are √0.6 and √0.8 of the limit without uplift (Cardiff Council Bute Park event guide, 2020; load ∝ v²)', async () => {
    const { status, json } = await post({ structure: trailerScreen, gustMps: 10, levels: siteLevels });
    expect(status).toBe(200);
    const limit = json.limitGustMps as number;
    expect(json.levels.map((l: any) => l.triggerGustMps)).toEqual([expect.closeTo(limit * Math.sqrt(0.6), 9), expect.closeTo(limit * Math.sqrt(0.8), 9), expect.closeTo(limit, 9)]);
    expect(json.levelOrderProblems).toEqual([]);
  });

  it('gives the extra ballast that brings the governing utilization to exactly 1 at the design gust', async () => {
    const designGustMps = 26;
    const { json } = await post({ structure: trailerScreen, gustMps: designGustMps, designGustMps, ballastXM: 1.2 });
    const extraKg = json.requiredBallast.massKg as number;
    expect(json.utilization.governing).toBeGreaterThan(1);
    expect(extraKg).toBeGreaterThan(0);
    const ballasted = { ...trailerScreen, masses: [...trailerScreen.masses, { label: 'extra', massKg: extraKg, xM: 1.2 }] };
    const check = await post({ structure: ballasted, gustMps: designGustMps });
    expect(check.json.utilization.governing).toBeCloseTo(1, 9);
  });

  it('answers 0 kg when the structure already holds at the design gust', async () => {
    const { json } = await post({ structure: trailerScreen, gustMps: 8, designGustMps: 8 });
    expect(json.requiredBallast).toMatchObject({ massKg: 0, possible: true });
  });

  it('refuses a ballast position outside the base with 400 naming ballastXM', async () => {
    const { status, json } = await post({ structure: trailerScreen, gustMps: 8, designGustMps: 20, ballastXM: 3 });
    expect(status).toBe(400);
    expect(json.issues.map((i: any) => i.path)).toEqual(['ballastXM']);
  });

  it('gives the highest travel speed as a vector difference: limit − wind into the wind, √(L² − v²) across it', async () => {
    const windMps = 9;
    const into = await post({ structure: trailerScreen, gustMps: windMps, travel: { windFromDeg: 0, headingDeg: 0 } });
    const limit = into.json.limitGustMps as number;
    expect(into.json.travel).toMatchObject({ possible: true, speedMps: expect.closeTo(limit - windMps, 9) });
    const across = await post({ structure: trailerScreen, gustMps: windMps, travel: { windFromDeg: 90, headingDeg: 0 } });
    expect(across.json.travel.speedMps).toBeCloseTo(Math.sqrt(limit * limit - windMps * windMps), 9);
    const worst = await post({ structure: trailerScreen, gustMps: windMps, travel: {} });
    expect(worst.json.travel.speedMps).toBeCloseTo(limit - windMps, 9);
  });

  it('says travel is not possible when the wind alone is over the limit', async () => {
    const { json } = await post({ structure: trailerScreen, gustMps: 60, travel: {} });
    expect(json.travel).toEqual({ windFromDeg: null, headingDeg: null, possible: false, speedMps: 0 });
  });
});
