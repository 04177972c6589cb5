/**
 * The register form's calculator and the save run one level check (issue 15: "the form's
 * calculator and the save agree: same density, same rule"). The form asks POST /api/assess at the
 * design density GET /api/site gives (`designAirDensityKgM3`: the site's ISA or fixed density,
 * never less than the 1.25 kg/m³ EN 1991-1-4 §4.5(1) Note 2 recommends), and the calculator's
 * `levelOrderProblems` are the issues the save refuses, in every configuration of the record.
 * Real server, real SQLite.
 *
 * Scenario (invented): "Kestrel Holm" at sea level on ISA (1.225 kg/m³, ISO 2533) has a gate
 * fence registered with its scrim off; with the scrim on, its limit is lower. A level's gust
 * trigger is put just above the scrim-on limit at the design density, yet below it at 1.225.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let server: TestServer;
let cp: ApiClient;

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

const fence = {
  kind: 'banner', name: 'Gate fence', widthM: 20, heightM: 2, clearanceM: 0.1, solidity: 0.3, feet: 11, ballastPerFootKg: 150,
  footDepthM: 0.8, selfWeightKg: 200, configurationName: 'scrim off', configurations: [{ name: 'scrim on', changes: { solidity: 0.9 } }],
};
const levelsAt = (gustMps: number) => [
  { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.2 }, actionText: 'Watch the fence.' },
  { label: 'Lay down', trigger: { kind: 'gust', gustMps }, actionText: 'Lay the fence down.' },
];

let design: number;
let live: number;
let scrimOnLimitAtDesign: number;

beforeAll(async () => {
  server = await startTestServer();
  cp = new ApiClient(server.baseUrl);
  expect((await cp.signIn(adminUsername, adminPassword)).status).toBe(200);
  await ok(cp.json('PATCH', '/api/site', { name: 'Kestrel Holm', airDensityMode: 'isa', altitudeM: 0 }));
  const site = await ok(cp.json('GET', '/api/site'));
  design = site.designAirDensityKgM3;
  live = site.airDensityKgM3;
  const answer = await ok(cp.json('POST', '/api/assess', { structure: fence, gustMps: 10, airDensityKgM3: design }));
  scrimOnLimitAtDesign = answer.configurations[1].limitGustMps;
  // The record as registered (scrim off) stands more wind than with the scrim on.
  expect(answer.limitGustMps).toBeGreaterThan(scrimOnLimitAtDesign * 1.05);
});
afterAll(async () => {
  await server?.stop();
});

describe('the form and the save check levels alike', () => {
  it('GET /api/site gives the design density: ISA at sea level is 1.225 kg/m³ (ISO 2533), the check takes 1.25 (EN 1991-1-4 §4.5)', () => {
    expect(live).toBeCloseTo(1.225, 3);
    expect(design).toBe(1.25);
  });

  it('a trigger above a configuration\'s limit at the design density is named by the calculator and refused by the save, at the same path in the same words', async () => {
    // Limit gust goes with 1/√ρ (q = ½ρv²): at 1.225 the limit is √(1.25/1.225) = 1.0102 times higher,
    // so 0.5 % above the design-density limit is still under the limit at the density now.
    const gustMps = Math.round(scrimOnLimitAtDesign * 1.005 * 100) / 100;
    const atLive = await ok(cp.json('POST', '/api/assess', { structure: fence, gustMps: 10, airDensityKgM3: live }));
    expect(atLive.configurations[1].limitGustMps).toBeCloseTo(scrimOnLimitAtDesign * Math.sqrt(1.25 / 1.225), 6);
    expect(atLive.configurations[1].limitGustMps).toBeGreaterThan(gustMps);

    const calc = await ok(cp.json('POST', '/api/assess', { structure: fence, gustMps: 10, airDensityKgM3: design, levels: levelsAt(gustMps) }));
    expect(calc.levelOrderProblems).toHaveLength(1);
    expect(calc.levelOrderProblems[0].path).toBe('levels.1.trigger.gustMps');
    expect(calc.levelOrderProblems[0].message).toMatch(/^in configuration "scrim on": level 2 \(Lay down\): a trigger gust of .* is at or above this structure's limit/);

    const save = await cp.json('POST', '/api/structures', { record: fence, orientationDeg: 90, location: 'North gate', levels: levelsAt(gustMps) });
    expect(save.status).toBe(400);
    const issues = (save.body as { issues: Array<{ path: string; message: string }> }).issues;
    expect(issues).toEqual(calc.levelOrderProblems);
    // Nothing was stored.
    const list = await ok(cp.json('GET', '/api/structures'));
    expect((list.structures as Array<{ name: string }>).some((s) => s.name === 'Gate fence')).toBe(false);
  });

  it('a trigger under every configuration\'s limit at the design density: no problem in the calculator, and the save takes it', async () => {
    const gustMps = Math.round(scrimOnLimitAtDesign * 0.99 * 100) / 100;
    const calc = await ok(cp.json('POST', '/api/assess', { structure: fence, gustMps: 10, airDensityKgM3: design, levels: levelsAt(gustMps) }));
    expect(calc.levelOrderProblems).toEqual([]);
    const saved = await ok(cp.json('POST', '/api/structures', { record: fence, orientationDeg: 90, location: 'North gate', levels: levelsAt(gustMps) }), 201);
    expect(saved.structure.levels[1].trigger.gustMps).toBe(gustMps);
  });
});
