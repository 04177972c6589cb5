/**
 * Configurations (design §2.5, issue 14): a record's named sets of changes to its kind's own
 * fields, each assessed by the same engine. The engine functions (server/engine/configuration.ts)
 * and the calculator's contract (POST /api/assess, exercised in-process with `app.request` as the
 * other assess tests do): the 400 paths, the answer's `configurations`, and a lowered LED screen
 * against a hand-worked limit.
 */
import { describe, expect, it } from 'vitest';
import { Hono } from 'hono';
import { assessRoute } from '../../server/http/assess.ts';
import {
  applyConfiguration,
  assessConfigurations,
  findConfiguration,
  maxConfigurations,
  recordConfigurations,
  validateStructureRecord,
  type StructureRecord,
} from '../../server/engine/index.ts';

const app = new Hono().route('/api/assess', assessRoute);

async function post(body: unknown): Promise<{ status: number; json: Record<string, any> }> {
  const response = await app.request('/api/assess', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: response.status, json: (await response.json()) as Record<string, any> };
}

function valid(input: unknown): StructureRecord {
  const result = validateStructureRecord(input);
  if (!result.ok) throw new Error(JSON.stringify(result.issues));
  return result.record;
}

/** Every issue path of a 400 answer. */
function paths(json: Record<string, any>): string[] {
  return (json.issues as Array<{ path: string }>).map((issue) => issue.path);
}

// Invented structures of an invented site.
const tent = {
  kind: 'tent', name: 'Catering marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 3.6,
  wallsClosed: true, legs: 8, ballastPerLegKg: 150, selfWeightKg: 900, surface: 'hard',
};
const fence = {
  kind: 'banner', name: 'North fence', widthM: 20, heightM: 2, clearanceM: 0.1, solidity: 1,
  feet: 11, ballastPerFootKg: 40, footDepthM: 0.8, selfWeightKg: 200,
};
const canopy = {
  kind: 'custom', name: 'Bar canopy', baseDepthM: 2, baseWidthM: 3, frictionCoefficient: 0.4,
  faces: [{ areaM2: 6, centroidHeightM: 1.8, cfFront: 1.2, cfBack: 1.2 }],
  masses: [{ label: 'ballast', massKg: 400, xM: 1, yM: 1.5 }],
};

/**
 * The LED screen of the hand-worked example. Towers and header truss are given no wind area
 * (towerWidthM 0, headerTrussDepthM 0), so the board alone is loaded and the arithmetic stays on
 * paper; the friction is given so that nothing is defaulted.
 */
const screen = {
  kind: 'screen', name: 'Main stage LED', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2,
  towerMassKg: 400, screenMassKg: 600, outriggerDepthM: 3, ballastPerTowerKg: 1500, frictionCoefficient: 0.7,
  towerWidthM: 0, headerTrussDepthM: 0,
};
const lowered = { name: 'lowered', changes: { bottomHeightM: 1.2 } };

describe('the calculator refuses bad configurations with the field named (POST /api/assess, 400)', () => {
  it('a field the kind does not have is named at structure.configurations.<i>.changes.<field>', async () => {
    const { status, json } = await post({ structure: { ...screen, configurations: [{ name: 'lowered', changes: { bottomHeightM: 1.2, depthM: 2 } }] }, gustMps: 10 });
    expect(status).toBe(400);
    expect(json.issues).toEqual([{ path: 'structure.configurations.0.changes.depthM', message: 'is not a field of a screen record (check the spelling)' }]);
  });

  it('kind, name, configurationName and configurations themselves cannot be changed', async () => {
    const changes = { kind: 'banner', name: 'Other', configurationName: 'x', configurations: [] };
    const { status, json } = await post({ structure: { ...screen, configurations: [{ name: 'lowered', changes }] }, gustMps: 10 });
    expect(status).toBe(400);
    expect(paths(json).sort()).toEqual(Object.keys(changes).map((field) => `structure.configurations.0.changes.${field}`).sort());
  });

  it('an invalid value is named with the kind’s own message, nested fields dotted on', async () => {
    const structure = {
      ...tent,
      configurations: [
        { name: 'short', changes: { eaveHeightM: -1 } },
        { name: 'ajar', changes: { sides: { front: 'ajar', back: 'open', endY0: 'open', endYW: 'open' } } },
        { name: 'no legs', changes: { legs: null } },
      ],
    };
    const { status, json } = await post({ structure, gustMps: 10 });
    expect(status).toBe(400);
    expect(json.issues).toEqual([
      { path: 'structure.configurations.0.changes.eaveHeightM', message: 'must be > 0 m' },
      { path: 'structure.configurations.1.changes.sides.front', message: 'must be “closed” or “open”, not “ajar”' },
      // null removes a field: a required one is then missing.
      { path: 'structure.configurations.2.changes.legs', message: 'is required (a number)' },
    ]);
  });

  it('a change that breaks a cross-field check of the kind is named at the changed field (tent: eave above the ridge)', async () => {
    // tent.ts: ridgeHeightM must be ≥ eaveHeightM. The eave is raised to 4 m under a 3.6 m ridge;
    // the legs change with it, so the check must find which change breaks it.
    const { status, json } = await post({ structure: { ...tent, configurations: [{ name: 'high eaves', changes: { eaveHeightM: 4, legs: 10 } }] }, gustMps: 10 });
    expect(status).toBe(400);
    expect(json.issues).toEqual([{ path: 'structure.configurations.0.changes.eaveHeightM', message: 'breaks a check of the record: ridgeHeightM must be ≥ eaveHeightM (4 m)' }]);
  });

  it('a screen raised above the record’s reference height is named at the changed field (record.ts: reference height below a face centroid)', async () => {
    // Registered 3 + 4/2 = 5 m centroid under a 6 m reference height; raised to 5 m the centroid is 7 m.
    const { status, json } = await post({ structure: { ...screen, referenceHeightM: 6, configurations: [{ name: 'raised high', changes: { bottomHeightM: 5 } }] }, gustMps: 10 });
    expect(status).toBe(400);
    expect(paths(json)).toEqual(['structure.configurations.0.changes.bottomHeightM']);
    expect(json.issues[0].message).toMatch(/^breaks a check of the record: referenceHeightM must be at least 7 m/);
  });

  it('duplicate names (ignoring case), the registered configuration’s name and “as registered” are refused at configurations.<i>.name', async () => {
    const structure = {
      ...screen,
      configurationName: 'Raised',
      configurations: [
        lowered,
        { name: 'LOWERED ', changes: { bottomHeightM: 1 } },
        { name: 'raised', changes: { bottomHeightM: 2 } },
        { name: 'As registered', changes: { bottomHeightM: 2.5 } },
      ],
    };
    const { status, json } = await post({ structure, gustMps: 10 });
    expect(status).toBe(400);
    expect(paths(json)).toEqual(['structure.configurations.1.name', 'structure.configurations.2.name', 'structure.configurations.3.name']);
    expect(json.issues[0].message).toBe('repeats the name of configurations.0 (“lowered”): names must differ, ignoring case');
  });

  it('an empty name, a configuration that changes nothing and more than the cap are refused', async () => {
    const { json: empty } = await post({ structure: { ...screen, configurations: [{ name: ' ', changes: { bottomHeightM: 1 } }] }, gustMps: 10 });
    expect(empty.issues).toEqual([{ path: 'structure.configurations.0.name', message: 'must not be empty' }]);
    const { json: nothing } = await post({ structure: { ...screen, configurations: [{ name: 'same', changes: {} }] }, gustMps: 10 });
    expect(nothing.issues).toEqual([{ path: 'structure.configurations.0.changes', message: 'must change at least one field of the record' }]);
    const many = Array.from({ length: maxConfigurations + 1 }, (_, i) => ({ name: `step ${i}`, changes: { bottomHeightM: 0.2 * i } }));
    const { status, json: tooMany } = await post({ structure: { ...screen, configurations: many }, gustMps: 10 });
    expect(status).toBe(400);
    expect(tooMany.issues).toEqual([{ path: 'structure.configurations', message: `must list at most ${maxConfigurations} configurations` }]);
    // At the cap it is accepted.
    expect((await post({ structure: { ...screen, configurations: many.slice(0, maxConfigurations) }, gustMps: 10 })).status).toBe(200);
  });
});

describe('the calculator answers every configuration (POST /api/assess, 200)', () => {
  it('a record without configurations is answered as before: no configurations field', async () => {
    const { status, json } = await post({ structure: screen, gustMps: 20 });
    expect(status).toBe(200);
    expect(json).not.toHaveProperty('configurations');
  });

  it('the record as registered comes first as “as registered”, its figures the top level’s; the top level is unchanged by the configurations', async () => {
    const plain = await post({ structure: screen, gustMps: 20 });
    const { json } = await post({ structure: { ...screen, configurations: [lowered] }, gustMps: 20 });
    expect(json.configurations.map((c: { name: string; registered: boolean }) => [c.name, c.registered])).toEqual([['as registered', true], ['lowered', false]]);
    const [registered] = json.configurations;
    for (const field of ['calculatedLimitGustMps', 'limitGustMps', 'utilization', 'governing', 'effectiveUtilization', 'governingElement']) {
      expect(registered[field], field).toEqual(json[field]);
    }
    const { configurations: _configurations, ...topLevel } = json;
    expect(topLevel).toEqual(plain.json);
  });

  it('the registered configuration takes the record’s configurationName', async () => {
    const { json } = await post({ structure: { ...screen, configurationName: 'raised', configurations: [lowered] }, gustMps: 20 });
    expect(json.configurations.map((c: { name: string }) => c.name)).toEqual(['raised', 'lowered']);
  });

  it('a lowered LED screen holds to a higher gust, as worked by hand (EN 1991-1-4 §7.4.3 signboard c_f and eccentricity)', async () => {
    const { status, json } = await post({ structure: { ...screen, configurations: [lowered] }, gustMps: 20 });
    expect(status).toBe(200);
    const [raisedAnswer, loweredAnswer] = json.configurations;

    // Hand calculation, independent of the engine.
    // Air: ISA sea level ρ = 1.225 kg/m³ (ISO 2533; the contract's default density, design §4).
    // q = ½ρv² = 0.5 × 1.225 × 20² = 245 Pa.
    const rho = 1.225;
    const v = 20;
    const q = 0.5 * rho * v * v;
    expect(q).toBe(245);
    // Board: b = 6 m, h = 4 m, A = 24 m². c_f = 1.80, EN 1991-1-4 §7.4.3 (signboard raised
    // z_g > h/4 = 1 m, references.md §1, verified): raised z_g = 3 m, lowered z_g = 1.2 m — both
    // above h/4, so 1.80 in both; centre height z_e = z_g + h/2: 5 m raised, 3.2 m lowered.
    const cf = 1.8;
    const areaM2 = 6 * 4;
    // The tower at either end takes the most: EN 1991-1-4 §7.4.3 puts the resultant at e = ±0.25·b
    // off centre (references.md §1, verified); towers at the screen's edges, s = b = 6 m apart, so
    // the near tower carries 0.5 + e/s = 0.5 + 1.5/6 = 0.75 of the board's wind (lever rule, statics).
    const share = 0.5 + (0.25 * 6) / 6;
    expect(share).toBe(0.75);
    // Force on that tower's part, wind square onto the front: F = 0.75 × 1.80 × 245 × 24 = 7938 N.
    const forceN = share * cf * q * areaM2;
    expect(forceN).toBeCloseTo(7938, 9);
    // It tips about the back outrigger feet (the leeward edge, x = d = 3 m). Overturning moment
    // M_h = F·z_e: raised 7938 × 5 = 39 690 N·m, lowered 7938 × 3.2 = 25 401.6 N·m.
    const raisedMomentNm = forceN * (3 + 4 / 2);
    const loweredMomentNm = forceN * (1.2 + 4 / 2);
    // Restoring moment about the back feet, g = 9.80665 m/s² (standard gravity, 3rd CGPM 1901):
    // the tower 400 kg at d/2 = 1.5 m, its ballast 1500 kg half on the front foot (750 kg at 3 m)
    // and half on the back foot (750 kg at 0 m), half the screen 300 kg at 1.5 m:
    // M_w = g·(400·1.5 + 750·3 + 750·0 + 300·1.5) = g·3300 = 32 361.945 N·m.
    const g = 9.80665;
    const restoringNm = g * (400 * 1.5 + 750 * 3 + 750 * 0 + 300 * 1.5);
    expect(restoringNm).toBeCloseTo(32_361.945, 6);
    // Safety factor on the wind moment γ_ot = 1.5 (common practice for ballasted temporary
    // structures; EN 1990 EQU about 1.67): U_ot = 1.5·M_h / M_w
    //   raised  1.5 × 39 690 / 32 361.945 = 1.8397, lowered 1.5 × 25 401.6 / 32 361.945 = 1.1774.
    const raisedU = (1.5 * raisedMomentNm) / restoringNm;
    const loweredU = (1.5 * loweredMomentNm) / restoringNm;
    expect(raisedU).toBeCloseTo(1.8397, 4);
    expect(loweredU).toBeCloseTo(1.1774, 4);
    // Sliding of that tower, γ_sl = 2.0 (HSE RR071), μ = 0.7 as given, weight g·(400 + 1500 + 300):
    // U_sl = 2 × 7938 / (0.7 × 2200 × 9.80665) = 1.0512 — below overturning in both, so overturning governs.
    const slidingU = (2 * forceN) / (0.7 * 2200 * g);
    expect(slidingU).toBeCloseTo(1.0512, 4);
    // U grows with v², so the limit gust is v·√(1/U): raised 20/√1.8397 = 14.75 m/s,
    // lowered 20/√1.1774 = 18.43 m/s.
    const raisedLimitMps = v * Math.sqrt(1 / raisedU);
    const loweredLimitMps = v * Math.sqrt(1 / loweredU);
    expect(raisedLimitMps).toBeCloseTo(14.75, 2);
    expect(loweredLimitMps).toBeCloseTo(18.43, 2);

    expect(raisedAnswer.governing).toBe('overturning');
    expect(raisedAnswer.utilization.overturning).toBeCloseTo(raisedU, 9);
    expect(raisedAnswer.utilization.sliding).toBeCloseTo(slidingU, 9);
    expect(raisedAnswer.calculatedLimitGustMps).toBeCloseTo(raisedLimitMps, 9);
    expect(loweredAnswer.name).toBe('lowered');
    expect(loweredAnswer.governing).toBe('overturning');
    expect(loweredAnswer.governingElement).toBe('tower at the y = 0 end');
    expect(loweredAnswer.utilization.overturning).toBeCloseTo(loweredU, 9);
    expect(loweredAnswer.utilization.sliding).toBeCloseTo(slidingU, 9);
    expect(loweredAnswer.calculatedLimitGustMps).toBeCloseTo(loweredLimitMps, 9);
    expect(loweredAnswer.limitGustMps).toBeCloseTo(loweredLimitMps, 9);
    expect(loweredAnswer.limitGustMps).toBeGreaterThan(raisedAnswer.limitGustMps);
    expect(loweredAnswer.effectiveUtilization).toBeCloseTo(loweredU, 9);
  });

  it('each configuration is answered exactly as the record with its changes applied by hand would be (fence scrim removed, tent sides off, custom faces)', async () => {
    const cases: Array<[Record<string, unknown>, Record<string, unknown>]> = [
      [fence, { solidity: 0.35 }],
      [tent, { sides: { front: 'open', back: 'open', endY0: 'open', endYW: 'open' } }],
      [canopy, { faces: [{ areaM2: 2, centroidHeightM: 1.8, cfFront: 1.2, cfBack: 1.2 }] }],
    ];
    for (const [record, changes] of cases) {
      const { json } = await post({ structure: { ...record, configurations: [{ name: 'changed', changes }] }, gustMps: 15 });
      const alone = await post({ structure: { ...record, ...changes }, gustMps: 15 });
      const changed = json.configurations[1];
      for (const field of ['calculatedLimitGustMps', 'limitGustMps', 'utilization', 'governing', 'governingDirectionDeg', 'governingElement', 'effectiveUtilization', 'warnings']) {
        expect(changed[field], `${record.name as string}: ${field}`).toEqual(alone.json[field]);
      }
      expect(changed.calculatedLimitGustMps, `${record.name as string} changes its limit`).not.toBeCloseTo(json.calculatedLimitGustMps, 3);
    }
  });

  it('the effective limit of each configuration counts its own rating (design §2.3: min of calculated and rated)', async () => {
    const { json } = await post({ structure: { ...screen, ratedGustMps: 12, configurations: [{ name: 'lowered', changes: { bottomHeightM: 1.2, ratedGustMps: 25 } }] }, gustMps: 10 });
    expect(json.configurations[0]).toMatchObject({ limitGustMps: 12, limitGovernedBy: 'rated' });
    expect(json.configurations[1].limitGovernedBy).toBe('calculated');
    expect(json.configurations[1].limitGustMps).toBe(json.configurations[1].calculatedLimitGustMps);
  });

  it('with levels, each configuration has its own level gusts: a fraction f of capacity at v_lim·√f (design §2.6)', async () => {
    const levels = [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Walk the screen and check the ballast.' },
      { label: 'Lower', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Lower the screen.' },
    ];
    const { json } = await post({ structure: { ...screen, configurations: [lowered] }, gustMps: 10, levels });
    for (const configuration of json.configurations) {
      expect(configuration.levels.map((level: { triggerGustMps: number }) => level.triggerGustMps)).toEqual([
        expect.closeTo(configuration.limitGustMps * Math.sqrt(0.6), 9),
        expect.closeTo(configuration.limitGustMps * Math.sqrt(0.8), 9),
      ]);
    }
  });
});

describe('the engine’s configuration functions (server/engine/configuration.ts)', () => {
  it('applyConfiguration replaces top-level fields, and null removes an optional one (its default applies)', () => {
    const record = valid({ ...fence, solidity: 0.5 });
    const { solidity: _solidity, ...solidFence } = fence;
    expect(applyConfiguration(record, { solidity: null })).toEqual({ ok: true, record: valid(solidFence) });
    expect(applyConfiguration(record, { solidity: 0.35 })).toEqual({ ok: true, record: valid({ ...fence, solidity: 0.35 }) });
    // An object field is replaced whole: the sides not listed fall back to wallsClosed.
    const sides = applyConfiguration(valid(tent), { sides: { front: 'open' } });
    expect(sides.ok && sides.record.kind === 'tent' && sides.record.sides).toEqual({ front: 'open' });
    expect(sides.ok && sides.record.kind === 'tent' && sides.record.wallsClosed).toBe(true);
  });

  it('recordConfigurations lists the registered one first without the configurations; findConfiguration ignores case', () => {
    const record = valid({ ...screen, configurationName: 'raised', configurations: [lowered] });
    const list = recordConfigurations(record);
    expect(list.map((c) => [c.name, c.registered])).toEqual([['raised', true], ['lowered', false]]);
    expect(list[0]!.record).toEqual(valid(screen));
    // Lowered on its towers, which stay standing: their height as registered (3 + 4 + no truss = 7 m).
    expect(list[1]!.record).toEqual(valid({ ...screen, bottomHeightM: 1.2, towerHeightM: 7 }));
    expect(findConfiguration(record, ' LOWERED')?.record).toEqual(list[1]!.record);
    expect(findConfiguration(record, 'Raised')?.registered).toBe(true);
    expect(findConfiguration(record, 'folded')).toBeNull();
    expect(recordConfigurations(valid(screen)).map((c) => c.name)).toEqual(['as registered']);
  });

  it('a screen lowered on its towers keeps the towers standing: their height is the registered one unless the change sets it (engineering review)', () => {
    const withTowers = valid({ ...screen, towerWidthM: 0.4, headerTrussDepthM: 0.4, configurations: [lowered, { name: 'mast down', changes: { bottomHeightM: 1.2, towerHeightM: 5.6 } }] });
    const [, down, mast] = recordConfigurations(withTowers);
    // Registered: the towers reach the screen's top and its truss, 3 + 4 + 0.4 = 7.4 m.
    expect((down!.record as { towerHeightM?: number }).towerHeightM).toBe(7.4);
    expect((mast!.record as { towerHeightM?: number }).towerHeightM).toBe(5.6);
  });

  it('recordConfigurations throws a RangeError naming the configuration when the record was not validated', () => {
    const unchecked = { ...valid(screen), configurations: [{ name: 'sunk', changes: { bottomHeightM: -2 } }] } as StructureRecord;
    expect(() => recordConfigurations(unchecked)).toThrow(RangeError);
    expect(() => recordConfigurations(unchecked)).toThrow(/configurations\.0 \(“sunk”\) is invalid: changes\.bottomHeightM must be ≥ 0 m/);
  });

  it('assessConfigurations gives one entry per configuration at the same gust', () => {
    const answers = assessConfigurations(valid({ ...screen, configurations: [lowered, { name: 'on the ground', changes: { bottomHeightM: 0 } }] }), { gustMps: 20 });
    expect(answers.map((a) => a.name)).toEqual(['as registered', 'lowered', 'on the ground']);
    // Lower boards hold to higher gusts (same c_f 1.80: §7.4.3 down to z_g = h/4; on the ground the
    // Table 7.9 mean at l/h 1.5 is 1.76, floored at 1.80 by boardCoefficient.ts).
    const limits = answers.map((a) => a.limitGustMps!);
    expect(limits[1]!).toBeGreaterThan(limits[0]!);
    expect(limits[2]!).toBeGreaterThan(limits[1]!);
  });
});
