/**
 * The screen kind of design §2.4 v2: a screen on support towers with outriggers, the towers and
 * header truss loaded too, the EN 1991-1-4 §7.4.3 eccentricity splitting the load between the
 * towers (each tower with its ballast an element: issue 11 item 7), and the tall-screen warning
 * on c_s·c_d (EN 1991-1-4 §6). Checked against references.md §9 (the 6 m × 4 m screen) and cases
 * worked by hand in the comments (screens of our own invention).
 */
import { describe, expect, it } from 'vitest';
import {
  assessStructure,
  directionUtilizations,
  dynamicPressurePa,
  expandStructure,
  stabilityCoefficients,
  standardGravityMps2,
} from '../../../server/engine/index.ts';
import { direction, expectRelative, issuePaths, record } from './kindTestSupport.ts';
import { demoStructures } from '../../../server/demo/demoSite.ts';

const g = standardGravityMps2;

/** The references.md §9 screen: 6 m × 4 m, bottom 3 m, on two towers at its edges with 5 m outriggers. */
const referenceScreen = {
  kind: 'screen', name: 'Main stage LED', widthM: 6, heightM: 4, bottomHeightM: 3, supportTowers: 2,
  towerMassKg: 400, screenMassKg: 600, outriggerDepthM: 5, ballastPerTowerKg: 1500, surface: 'hard',
  // Given, so that the hand-worked figures below take concrete on concrete 0.4 (HSE RR071).
  frictionCoefficient: 0.4,
} as const;

describe('a tower that is not square (review finding)', () => {
  it('takes c_f 2.4 (EN 1991-1-4 Fig. 7.23 near d/b = 0.5, from memory) instead of the square section’s 2.1', () => {
    const square = expandStructure(record({ ...referenceScreen, towerWidthM: 0.4 }));
    const oblong = expandStructure(record({ ...referenceScreen, towerWidthM: 0.4, towerDepthM: 0.8 }));
    const towerCf = (e: ReturnType<typeof expandStructure>) => e.structure.faces.find((f) => /tower/.test(f.label ?? ''))!.cfFront;
    expect(towerCf(square)).toBe(2.1);
    expect(towerCf(oblong)).toBe(2.4);
  });
});

describe('friction of steel outrigger feet on a hard surface (review finding)', () => {
  it('defaults to 0.3, the lower end of EN 12812 steel on concrete, and warns that smooth cast concrete can be 0.1 (HSE RR071)', () => {
    const { frictionCoefficient: _given, ...withoutFriction } = referenceScreen;
    const expansion = expandStructure(record(withoutFriction));
    expect(expansion.structure.frictionCoefficient).toBe(0.3);
    expect(expansion.warnings!.join(' ')).toMatch(/0\.1 \(HSE RR071\)/);
  });
});

describe('the references.md §9 screen, towers and truss left out (EN 1991-1-4 §7.4.3)', () => {
  const screen = record({ ...referenceScreen, towerWidthM: 0, headerTrussDepthM: 0 });
  // c_f 1.8 (z_g 3 > h/4 = 1, EN §7.4.3); 20 m/s, ρ 1.225: q = 245 Pa; F = 1.8 · 24 · 245 = 10 584 N at 3 + 2 = 5 m:
  // base moment 52 920 N·m. e = 0.25 · 6 = 1.5 m: torsion F·e = 15 876 N·m (references.md §9).
  // Lever rule, towers s = 6 m apart, resultant 1.5 m off centre toward the y = 0 tower: 3 − 1.5 = 1.5 m from it and
  // 4.5 m from the other, so the near share is 4.5 / 6 = 0.75 and the far share 1.5 / 6 = 0.25.
  // Check: (0.75 − 0.25) · F · s/2 = 0.5 · 10 584 · 3 = 15 876 N·m = F·e.
  // Body: W = 4400 g = 43 149.26 N, M_w about the back edge = g (1400 · 2.5 + 1500 · 5) = 11 000 g = 107 873.15 N·m;
  //   U_ot = 1.5 · 52 920 / 107 873.15 = 0.735864; U_sl = 2 · 10 584 / (0.4 · 43 149.26) = 1.226440.
  // Near tower: F = 0.75 · 10 584 = 7938 N at 5 m = 39 690 N·m; its masses: tower 400 + half the screen 300 at 2.5 m,
  //   750 kg at x = 0 and at x = 5: W = 2200 g = 21 574.63 N, M_w = g (700 · 2.5 + 750 · 5) = 5500 g = 53 936.575 N·m;
  //   U_ot = 1.5 · 39 690 / 53 936.575 = 1.103796; U_sl = 2 · 7938 / (0.4 · 21 574.63) = 1.839661: 1.5 × the body's.
  const gustQPa = dynamicPressurePa(20, 1.225);
  const expansion = expandStructure(screen);
  const coefficients = stabilityCoefficients(expansion.structure);
  const tower = coefficients.elements[0]!;

  it('gives q 245 Pa, F 10 584 N and the base moment 52.92 kN·m (references.md §9)', () => {
    expect(gustQPa).toBeCloseTo(245, 10);
    const front = direction(coefficients.body, 0);
    expect(front.forcePerPaM2 * gustQPa).toBeCloseTo(10_584, 8);
    expect(front.windMomentPerPaM3.back * gustQPa).toBeCloseTo(52_920, 7);
    expect(expansion.structure.faces).toHaveLength(1);
  });

  it('the near tower takes 75 % of the screen load, and the split gives the torsion F·e = 15.88 kN·m (EN §7.4.3, references.md §9; issue 11 item 7)', () => {
    const bodyForceN = direction(coefficients.body, 0).forcePerPaM2 * gustQPa;
    const nearForceN = direction(tower, 0).forcePerPaM2 * gustQPa;
    expect(nearForceN).toBeCloseTo(7938, 8);
    expectRelative(nearForceN / bodyForceN, 0.75);
    const farForceN = bodyForceN - nearForceN;
    expect(((nearForceN - farForceN) * 6) / 2).toBeCloseTo(15_876, 7);
    expect(expansion.notes.join(' ')).toMatch(/±0\.25·b = 1\.50 m/);
  });

  it('the near tower governs, at 1.5 × the rigid body\'s utilization (hand: 1.839661 against 1.226440)', () => {
    const report = assessStructure(screen, { gustMps: 20, airDensityKgM3: 1.225 });
    expect(report.governingElement).toBe('tower at the y = 0 end');
    expect(report.utilization.sliding).toBeCloseTo(1.839661, 6);
    expect(report.elements[0]!.directions.find((entry) => entry.directionDeg === 0)!.utilization.overturning).toBeCloseTo(1.103796, 6);
    const body = directionUtilizations(direction(coefficients.body, 0), gustQPa);
    expect(body.overturning).toBeCloseTo(0.735864, 6);
    expect(body.sliding).toBeCloseTo(1.22644, 6);
  });

  it('towers inboard take more, by the lever rule: towers 4 m apart under a 6 m screen give 0.5 + 1.5/4 = 0.875', () => {
    const inboard = expandStructure(record({ ...screen, towerSpacingM: 4 })).structure;
    expect(inboard.baseWidthM).toBe(4);
    expect(inboard.elements![0]!.faces[0]!.areaM2).toBeCloseTo(0.875 * 24, 12);
  });
});

describe('the screen with its towers and header truss, hand-worked (design §2.3 directions)', () => {
  const screen = record(referenceScreen);
  // Defaults: towers 0.4 × 0.4 m (common practice, from memory) up to 7 + 0.4 = 7.4 m, header truss 0.4 m deep and
  // max(6, 6 + 0.4) = 6.4 m long at 7.2 m, member c_f 2.1 on the envelope (EN §7.6, from memory); c_s·c_d = 1.
  // Per unit q (c_f·A, m²): screen 1.8 · 24 = 43.2 at 5 m; truss 2.1 · 2.56 = 5.376 at 7.2 m;
  //   towers from the front 2.1 · 2 · 0.4 · 7.4 = 12.432 at 3.7 m; from the side the same, facing the y = 6 m end.
  // q = 245 Pa (20 m/s, ρ 1.225).
  // Front-on (θ 0): F = 61.008 · 245 = 14 946.96 N; M = (216 + 38.7072 + 45.9984) · 245 = 300.7056 · 245 = 73 672.872 N·m;
  //   U_ot = 1.5 · 73 672.872 / 107 873.15 = 1.024438; U_sl = 2 · 14 946.96 / (0.4 · 43 149.26) = 1.732007.
  // 45° off the front (θ 45): every face within 60° of its normal takes its full force (ψ = 1): x 61.008, y −12.432:
  //   |F| = √(61.008² + 12.432²) · 245 = 15 254.139 N, U_sl = 1.767601; about the back edge as front-on; about the
  //   y = 0 end: M = 12.432 · 3.7 · 245 = 11 269.608 N·m against M_w = g (600 · 3 + 400 · 6 + 1500 · 6) = 13 200 g.
  // End-on (θ 90, wind onto the y = 6 m end): screen and truss edge-on, only the towers' sides: F = 12.432 · 245 = 3045.84 N;
  //   U_ot about the y = 0 end = 1.5 · 11 269.608 / 129 447.78 = 0.130589; U_sl = 2 · 3045.84 / (0.4 · 43 149.26) = 0.352942.
  // Near tower front-on: 0.75 · 43.2 = 32.4, 0.75 · 5.376 = 4.032, its own tower 2.1 · 0.4 · 7.4 = 6.216: F = 42.648 · 245 =
  //   10 448.76 N, M = (162 + 29.0304 + 22.9992) · 245 = 52 437.252 N·m; U_ot = 1.5 · 52 437.252 / 53 936.575 = 1.458303;
  //   U_sl = 2 · 10 448.76 / (0.4 · 21 574.63) = 2.421539. At 45°: |F| = √(42.648² + 6.216²) · 245 → U_sl = 2.447124.
  const expansion = expandStructure(screen);
  const coefficients = stabilityCoefficients(expansion.structure);
  const qPa = dynamicPressurePa(20, 1.225);
  const tower = coefficients.elements[0]!;

  it('expands to a 5 m × 6 m base with each tower\'s outrigger feet front and back at its own y', () => {
    const { structure, referenceHeightM } = expansion;
    expect(structure.baseDepthM).toBe(5);
    expect(structure.baseWidthM).toBe(6);
    expect(referenceHeightM).toBeCloseTo(7.4, 12);
    expect(structure.masses.map((mass) => [mass.massKg, mass.xM, mass.yM])).toEqual([
      [600, 2.5, 3],
      [400, 2.5, 0], [750, 0, 0], [750, 5, 0],
      [400, 2.5, 6], [750, 0, 6], [750, 5, 6],
    ]);
    expect(structure.faces.map((face) => [face.facingDeg, face.areaM2, face.centroidHeightM, face.cfFront])).toEqual([
      [0, 24, 5, 1.8],
      [0, expect.closeTo(2.56, 12), expect.closeTo(7.2, 12), 2.1],
      [0, expect.closeTo(5.92, 12), expect.closeTo(3.7, 12), 2.1],
      [90, expect.closeTo(5.92, 12), expect.closeTo(3.7, 12), 2.1],
    ]);
    expect(structure.elements!.map((element) => element.name)).toEqual(['tower at the y = 0 end']);
    expect(structure.elements![0]!.baseWidthM).toBeUndefined();
  });

  it('front-on gives the hand-worked body and near-tower figures', () => {
    const front = direction(coefficients.body, 0);
    expect(front.forcePerPaM2 * qPa).toBeCloseTo(14_946.96, 7);
    expect(front.windMomentPerPaM3.back * qPa).toBeCloseTo(73_672.872, 6);
    expect(directionUtilizations(front, qPa).overturning).toBeCloseTo(1.024438, 6);
    expect(directionUtilizations(front, qPa).sliding).toBeCloseTo(1.732007, 6);
    const near = direction(tower, 0);
    expect(near.forcePerPaM2 * qPa).toBeCloseTo(10_448.76, 7);
    expect(directionUtilizations(near, qPa).overturning).toBeCloseTo(1.458303, 6);
    expect(directionUtilizations(near, qPa).sliding).toBeCloseTo(2.421539, 6);
  });

  it('45° off the front loads the screen in full and the towers on two faces (ψ(45°) = 1, design §2.3)', () => {
    const oblique = direction(coefficients.body, 45);
    expect(oblique.forcePerPaM2 * qPa).toBeCloseTo(15_254.139, 3);
    expect(oblique.forceYPerPaM2).toBeCloseTo(-12.432, 12);
    expect(oblique.windMomentPerPaM3.back).toBeCloseTo(direction(coefficients.body, 0).windMomentPerPaM3.back, 12);
    expect(oblique.windMomentPerPaM3.endY0 * qPa).toBeCloseTo(11_269.608, 6);
    expect(directionUtilizations(oblique, qPa).sliding).toBeCloseTo(1.767601, 6);
    expect(directionUtilizations(direction(tower, 45), qPa).sliding).toBeCloseTo(2.447124, 6);
  });

  it('end-on only the towers\' sides are loaded, tipping the body about its y = 0 end (hand: U_ot 0.130589, U_sl 0.352942)', () => {
    const along = direction(coefficients.body, 90);
    expect(along.forcePerPaM2 * qPa).toBeCloseTo(3045.84, 8);
    expect(along.tippingEdge).toBe('endY0');
    expect(along.restoringMomentNm.endY0).toBeCloseTo(13_200 * g, 6);
    expect(directionUtilizations(along, qPa).overturning).toBeCloseTo(0.130589, 6);
    expect(directionUtilizations(along, qPa).sliding).toBeCloseTo(0.352942, 6);
  });

  it('U(v) = K·v² exactly for the body and the tower in every direction; the limit gives effective utilization 1 (design §2.3)', () => {
    const at = (gustMps: number) => assessStructure(screen, { gustMps, airDensityKgM3: 1.25 });
    const single = at(9);
    const double = at(18);
    const all = (report: typeof single) => [...report.directions, ...report.elements.flatMap((element) => element.directions)];
    const [low, high] = [all(single), all(double)];
    expect(low.length).toBeGreaterThan(24);
    low.forEach((entry, index) => {
      for (const criterion of ['overturning', 'sliding', 'governing'] as const) {
        const value = entry.utilization[criterion]!;
        if (value === 0) expect(high[index]!.utilization[criterion]).toBe(0);
        else expectRelative(high[index]!.utilization[criterion]!, 4 * value);
      }
    });
    const limit = single.calculatedLimitGustMps!;
    expectRelative(at(limit).effectiveUtilization!, 1, 1e-12);
    expectRelative(at(limit * Math.sqrt(0.8)).effectiveUtilization!, 0.8, 1e-12);
  });

  it('names every default with its source: §7.4.3 for the screen and its eccentricity, §7.6 (from memory) for the members, common practice for their sizes, §6 for c_s·c_d', () => {
    const byItem = Object.fromEntries(expansion.sources.map((note) => [note.item, note]));
    expect(byItem['c_f of the screen on the gross area b·h (front and back)']).toMatchObject({ value: 1.8, source: expect.stringMatching(/EN 1991-1-4 §7\.4\.3/) });
    expect(byItem['c_f of each tower on its envelope area (front and side)']).toMatchObject({ value: 2.1, source: expect.stringMatching(/EN 1991-1-4 §7\.6.*from memory/) });
    expect(byItem['c_f of the header truss on its envelope area (front and back)']).toMatchObject({ value: 2.1, source: expect.stringMatching(/§7\.6.*from memory/) });
    expect(byItem['tower width seen from the front, m']).toMatchObject({ value: 0.4, source: expect.stringMatching(/^common practice.*from memory/) });
    expect(byItem['header truss depth, m']).toMatchObject({ value: 0.4, source: expect.stringMatching(/^common practice/) });
    expect(byItem['structural factor c_s·c_d']).toMatchObject({ value: 1, source: expect.stringMatching(/EN 1991-1-4 §6/) });
    expect(byItem['eccentricity of the resultant, fraction of the screen width b']).toMatchObject({ value: 0.25, source: expect.stringMatching(/§7\.4\.3/) });
    expect(byItem['share of the screen’s and truss’s wind on the tower at the y = 0 end']).toMatchObject({ value: 0.75, source: expect.stringMatching(/lever rule/) });
  });
});

describe('tall screens and the structural factor (EN 1991-1-4 §6, c_s·c_d)', () => {
  const cSCdWarning = /c_s·c_d = 1 was assumed \(EN 1991-1-4 §6, structural factor\)/;

  it('a screen whose top is above about 15 m is warned that c_s·c_d = 1 was assumed (EN §6.2(1), from memory)', () => {
    // Top: 12 + 4 + 0.4 (truss) = 16.4 m > 15 m.
    const tall = assessStructure(record({ ...referenceScreen, bottomHeightM: 12 }), { gustMps: 10 });
    expect(tall.warnings.some((warning) => cSCdWarning.test(warning) && /16\.4 m/.test(warning))).toBe(true);
    const low = assessStructure(record(referenceScreen), { gustMps: 10 });
    expect(low.warnings.some((warning) => cSCdWarning.test(warning))).toBe(false);
  });

  it('a screen on a crane is warned whatever its height', () => {
    const hung = assessStructure(record({ ...referenceScreen, onCrane: true }), { gustMps: 10 });
    expect(hung.warnings.some((warning) => cSCdWarning.test(warning) && /crane/.test(warning))).toBe(true);
  });

  it('an engineer\'s c_s·c_d of 1.2 multiplies every wind force, so every utilization × 1.2 exactly (EN expression 5.3), and ends the warning', () => {
    const base = record({ ...referenceScreen, bottomHeightM: 12 });
    const factored = record({ ...referenceScreen, bottomHeightM: 12, structuralFactor: 1.2, coefficientSource: 'dynamic check by the engineer, calc ref. S-14' });
    const plain = assessStructure(base, { gustMps: 10 });
    const withFactor = assessStructure(factored, { gustMps: 10 });
    const pairs = [...plain.directions, ...plain.elements.flatMap((element) => element.directions)].map((entry, index) => [
      entry,
      [...withFactor.directions, ...withFactor.elements.flatMap((element) => element.directions)][index]!,
    ] as const);
    for (const [before, after] of pairs) {
      if (before.utilization.governing === 0) continue;
      expectRelative(after.utilization.governing!, 1.2 * before.utilization.governing!, 1e-12);
    }
    expect(withFactor.warnings.some((warning) => cSCdWarning.test(warning))).toBe(false);
    expect(withFactor.sources.find((note) => note.item === 'structural factor c_s·c_d')).toMatchObject({ value: 1.2, source: expect.stringMatching(/S-14/) });
  });

  it('refuses a structural factor without its source, and one that would push a coefficient above 4', () => {
    expect(issuePaths({ ...referenceScreen, structuralFactor: 1.2 })).toEqual(['coefficientSource']);
    expect(issuePaths({ ...referenceScreen, structuralFactor: 2, coefficientSource: 'calc S-2' })).toEqual(['structuralFactor', 'structuralFactor']);
  });
});

describe('other tower counts', () => {
  it('three towers: each is checked with the two-tower share 0.75, without the screen\'s weight, and the answer says it was assumed', () => {
    const screen = record({ ...referenceScreen, supportTowers: 3, towerWidthM: 0, headerTrussDepthM: 0 });
    const { structure, warnings } = expandStructure(screen);
    expect(structure.masses.filter((mass) => mass.label?.startsWith('tower ') && !mass.label.includes('ballast')).map((mass) => mass.yM)).toEqual([0, 3, 6]);
    const element = structure.elements![0]!;
    expect(element.faces[0]!.areaM2).toBeCloseTo(18, 12);
    expect(element.masses.map((mass) => mass.massKg)).toEqual([400, 750, 750]);
    expect(warnings!.join(' ')).toMatch(/3 support towers.*assumed/);
  });

  it('one tower is a strip: front and back only, and the answer says the ends and the torsion were not checked', () => {
    const single = record({ ...referenceScreen, supportTowers: 1 });
    const { structure } = expandStructure(single);
    expect(structure.baseWidthM).toBeUndefined();
    expect(structure.elements).toBeUndefined();
    const report = assessStructure(single, { gustMps: 10 });
    expect(report.warnings.join(' ')).toMatch(/One support tower.*strip/);
    expect(issuePaths({ ...referenceScreen, supportTowers: 1, towerSpacingM: 4 })).toEqual(['towerSpacingM']);
  });

  it('old record shapes still validate and gain a tower element: the demo screen and the records the other tests register', () => {
    const oldShapes = [
      ...demoStructures.filter((structure) => (structure.record as { kind?: string }).kind === 'screen').map((structure) => structure.record),
      { kind: 'screen', name: 'Side screen', widthM: 4, heightM: 2.5, bottomHeightM: 3, supportTowers: 2, towerMassKg: 400, screenMassKg: 700, outriggerDepthM: 3.5, ballastPerTowerKg: 1200 },
      { kind: 'screen', name: 'Fuzz screen', widthM: 4, heightM: 3, bottomHeightM: 2, supportTowers: 2, towerMassKg: 300, screenMassKg: 500, outriggerDepthM: 3, ballastPerTowerKg: 1000 },
      { kind: 'screen', name: 'Mesh LED', widthM: 8, heightM: 4.5, bottomHeightM: 2, supportTowers: 2, towerMassKg: 300, screenMassKg: 900, outriggerDepthM: 4, ballastPerTowerKg: 1000, coefficients: { cf: 1.2 }, coefficientSource: 'manufacturer’s wind tunnel sheet, rev. C' },
    ];
    expect(oldShapes.length).toBeGreaterThanOrEqual(4);
    for (const shape of oldShapes) {
      const { structure } = expandStructure(record(shape));
      expect(structure.baseWidthM).toBe((shape as { widthM: number }).widthM);
      expect(structure.elements!.map((element) => element.name)).toEqual(['tower at the y = 0 end']);
    }
  });
});
