/**
 * The banner / fence-run kind of design §2.4 v2: panels and feet, the whole run as one rigid body,
 * and the end panel on its own feet as an element (issue 11 item 7). Every number is checked
 * against EN 1991-1-4 Table 7.9 (references.md §1 and the §9 check values) or a case worked by
 * hand in the comments (fences of our own invention).
 */
import { describe, expect, it } from 'vitest';
import {
  assessStructure,
  directionUtilizations,
  dynamicPressurePa,
  expandStructure,
  freeStandingWallMeanCpNet,
  stabilityCoefficients,
  type BodyCoefficients,
} from '../../../server/engine/index.ts';
import { direction, expectRelative, issuePaths, record } from './kindTestSupport.ts';
import { freeStandingWallStretchCpNet, wallZoneAt } from '../../../server/engine/kinds/boardCoefficient.ts';
import { bannerLayout } from '../../../server/engine/kinds/banner.ts';
import { demoStructures } from '../../../server/demo/demoSite.ts';

describe('EN 1991-1-4 Table 7.9 over a stretch of a free-standing wall (references.md §1, §9)', () => {
  // Wall 15 m long and 2 m high: l/h = 7.5, halfway between the rows l/h 5 and l/h 10 (linear in l/h).
  // Zones from the nearer free end: A 0–0.6 m (0.3h), B 0.6–4 m (2h), C 4–8 m (4h), D beyond (here none: l/2 = 7.5 m < 8 m).
  const wall = { lengthM: 15, heightM: 2 };

  it('gives the §9 check values A 3.15, B 1.95, C 1.55 at l/h 7.5 and φ 1, zone by zone (EN Table 7.9, linear in l/h)', () => {
    expect(freeStandingWallStretchCpNet({ ...wall, fromM: 0, toM: 0.6 })).toBeCloseTo(3.15, 12);
    expect(freeStandingWallStretchCpNet({ ...wall, fromM: 0.6, toM: 4 })).toBeCloseTo(1.95, 12);
    expect(freeStandingWallStretchCpNet({ ...wall, fromM: 4, toM: 7.5 })).toBeCloseTo(1.55, 12);
    // Zones are counted from the NEARER end: the far end's zone A is 3.15 too.
    expect(freeStandingWallStretchCpNet({ ...wall, fromM: 14.4, toM: 15 })).toBeCloseTo(3.15, 12);
  });

  it('gives zone D 1.2 where the wall is long enough to have one (EN Table 7.9: D is 1.2 in every row; §9 at l/h 7.5)', () => {
    // Zone D starts 4h from each end, so it needs l > 8h; at l/h 7.5 there is none. A 40 m × 2 m wall (l/h 20, the
    // l/h ≥ 10 row) has D from 8 m to 32 m.
    expect(freeStandingWallStretchCpNet({ lengthM: 40, heightM: 2, fromM: 8, toM: 32 })).toBeCloseTo(1.2, 12);
    expect(wallZoneAt(4)).toBe('D');
    expect(wallZoneAt(0.29)).toBe('A');
    expect(wallZoneAt(0.3)).toBe('B');
  });

  it('gives zone A 2.175 at l/h 7.5 and φ 0.9 (references.md §9: linear in φ between 0.8 and 1)', () => {
    expect(freeStandingWallStretchCpNet({ ...wall, fromM: 0, toM: 0.6, solidity: 0.9 })).toBeCloseTo(2.175, 12);
  });

  it('averaged over the whole wall it equals the zone mean the body uses, 1.838 at l/h 10 (hand: 9.19 / 5)', () => {
    // l/h 10, half length 5h: A 0.3 × 3.4 + B 1.7 × 2.1 + C 2 × 1.7 + D 1 × 1.2 = 1.02 + 3.57 + 3.4 + 1.2 = 9.19 → 1.838.
    expect(freeStandingWallStretchCpNet({ lengthM: 20, heightM: 2, fromM: 0, toM: 20 })).toBeCloseTo(1.838, 12);
    for (const lengthToHeight of [2, 4, 7.5, 12]) {
      expect(freeStandingWallStretchCpNet({ lengthM: 2 * lengthToHeight, heightM: 2, fromM: 0, toM: 2 * lengthToHeight })).toBeCloseTo(freeStandingWallMeanCpNet(lengthToHeight), 12);
    }
  });

  it('refuses a stretch outside the wall, an empty stretch and a lattice below φ 0.8 (EN §7.11) with a RangeError', () => {
    expect(() => freeStandingWallStretchCpNet({ ...wall, fromM: 0, toM: 16 })).toThrow(/toM/);
    expect(() => freeStandingWallStretchCpNet({ ...wall, fromM: 3, toM: 3 })).toThrow(RangeError);
    expect(() => freeStandingWallStretchCpNet({ ...wall, fromM: 0, toM: 1, solidity: 0.7 })).toThrow(/solidity/);
  });
});

describe('panels and feet (design §2.4: the feet follow from the panels)', () => {
  it('a foot at every joint and at each end: 10 panels of 3.5 m stand on 11 feet over 35 m (common practice for fence panels)', () => {
    const layout = bannerLayout({ panelWidthM: 3.5, panels: 10 });
    expect(layout.ok && layout.value).toMatchObject({ runLengthM: 35, panels: 10, panelWidthM: 3.5, feet: 11 });
    expect(layout.ok && layout.value.feetPositionsM).toEqual([0, 3.5, 7, 10.5, 14, 17.5, 21, 24.5, 28, 31.5, 35]);
  });

  it('an old record with widthM and feet keeps its meaning: 10 m on 6 feet is 5 panels of 2 m, feet at every 2 m', () => {
    const layout = bannerLayout({ widthM: 10, feet: 6 });
    expect(layout.ok && layout.value).toMatchObject({ runLengthM: 10, panels: 5, panelWidthM: 2, feet: 6, feetPositionsM: [0, 2, 4, 6, 8, 10] });
    // One foot: one panel, the foot at the middle.
    expect(bannerLayout({ widthM: 6, feet: 1 })).toMatchObject({ ok: true, value: { panels: 1, feet: 1, feetPositionsM: [3] } });
  });

  it('widthM with panelWidthM gives the panel count; feet given stand evenly spaced as given', () => {
    expect(bannerLayout({ widthM: 14, panelWidthM: 3.5 })).toMatchObject({ ok: true, value: { panels: 4, feet: 5 } });
    expect(bannerLayout({ widthM: 15, panels: 5, feet: 11 })).toMatchObject({ ok: true, value: { panelWidthM: 3, feet: 11, feetPositionsM: [0, 1.5, 3, 4.5, 6, 7.5, 9, 10.5, 12, 13.5, 15] } });
  });

  const base = { kind: 'banner', name: 'Gate fence', heightM: 2, clearanceM: 0, ballastPerFootKg: 40, footDepthM: 0.8, selfWeightKg: 100 };

  it('rejects a record that says neither how long nor how many panels, and one whose panels do not add up to widthM', () => {
    // Nothing about the length: the panel width is named, the natural way in (the form's first field).
    expect(issuePaths({ ...base })).toEqual(['panelWidthM']);
    expect(issuePaths({ ...base, panelWidthM: 3.5 })).toEqual(['panels']);
    expect(issuePaths({ ...base, widthM: 12, panelWidthM: 3.5 })).toEqual(['panelWidthM']);
    expect(issuePaths({ ...base, widthM: 12, panelWidthM: 3.5, panels: 4 })).toEqual(['panelWidthM']);
    expect(issuePaths({ ...base, panelWidthM: 3.5, panels: 60 })).toEqual(['panelWidthM']);
    expect(issuePaths({ ...base, widthM: 14, panelWidthM: 3.5, panels: 4 })).toEqual([]);
  });

  it('reports a bad count at its own field only, without throwing', () => {
    expect(issuePaths({ ...base, widthM: 10, feet: 2.5 })).toEqual(['feet']);
    expect(issuePaths({ ...base, widthM: -3, feet: 4 })).toEqual(['widthM']);
    expect(issuePaths({ ...base, panelWidthM: 3.5, panels: 1e9 })).toEqual(['panels']);
  });

  it('old record shapes still validate: the demo fence and the records the other tests register', () => {
    const oldShapes = [
      ...demoStructures.filter((structure) => (structure.record as { kind?: string }).kind === 'banner').map((structure) => structure.record),
      { kind: 'banner', name: 'North fence scrim', widthM: 20, heightM: 2, clearanceM: 0.1, solidity: 0.5, feet: 10, ballastPerFootKg: 40, footDepthM: 1.2, selfWeightKg: 300 },
      { kind: 'banner', name: 'North fence scrim', widthM: 20, heightM: 2, clearanceM: 0.1, solidity: 0.5, feet: 12, ballastPerFootKg: 300, footDepthM: 1.6, selfWeightKg: 300, coefficients: { cf: 1.3 }, coefficientSource: 'Manufacturer sheet HF-22, table 3' },
      { kind: 'banner', name: 'Intruder banner', widthM: 6, heightM: 2, clearanceM: 0, feet: 4, ballastPerFootKg: 50, footDepthM: 1, selfWeightKg: 80 },
      { kind: 'banner', name: 'Scrim', widthM: 5, heightM: 2, clearanceM: 0, feet: 3, ballastPerFootKg: 20, footDepthM: 0.6, selfWeightKg: 30 },
      { kind: 'banner', name: 'Single', widthM: 3, heightM: 2, clearanceM: 0, feet: 1, ballastPerFootKg: 20, footDepthM: 0.6, selfWeightKg: 30 },
    ];
    expect(oldShapes.length).toBeGreaterThanOrEqual(6);
    for (const shape of oldShapes) {
      const parsed = record(shape);
      const { structure } = expandStructure(parsed);
      expect(structure.baseWidthM).toBe((shape as { widthM: number }).widthM);
      const feet = (shape as { feet: number }).feet;
      expect(structure.elements?.length ?? 0).toBe(feet >= 3 ? 1 : 0);
    }
  });
});

describe('a solid fence on the ground, hand-worked (EN 1991-1-4 Table 7.9, design §2.3)', () => {
  const fence = record({
    kind: 'banner', name: 'Car-park hoarding', panelWidthM: 3, panels: 5, heightM: 2, clearanceM: 0,
    ballastPerFootKg: 150, footDepthM: 1, selfWeightKg: 150, surface: 'hard',
  });
  // Run 5 × 3 = 15 m, h 2 m: l/h 7.5; 6 feet at 0, 3, …, 15 m, 150 kg each, 1 m deep; self-weight 150 kg; μ 0.4 (hard).
  // Body c_f: on the ground (z_g 0 ≤ h/4) with b/h > 1, EN §7.4.1 → Table 7.9 mean over half the length (3.75h),
  //   A 0.3 × 3.15 + B 1.7 × 1.95 + C 1.75 × 1.55 = 0.945 + 3.315 + 2.7125 = 6.9725 → 1.859333 (> 1.80, kept).
  // End panel, 0–3 m = 0–1.5h from the free end: A 0.3 × 3.15 + B 1.2 × 1.95 = 0.945 + 2.34 = 3.285 → 2.19.
  // Gust 10 m/s, ρ 1.225: q = ½ · 1.225 · 100 = 61.25 Pa.
  // Front-on (θ 0): F = 1.859333 · 30 · 61.25 = 3416.525 N at 1 m; every mass at x = 0.5 m:
  //   W = 1050 g = 10296.9825 N, M_w about the back edge = 0.5 W = 5148.49125 N·m;
  //   U_ot = 1.5 · 3416.525 / 5148.49125 = 0.995396; U_sl = 2 · 3416.525 / (0.4 · 10296.9825) = 1.658993.
  // End panel: F = 2.19 · 6 · 61.25 = 804.825 N; masses 150 · 3/15 = 30 kg self-weight, end foot 150 kg in full,
  //   the foot at 3 m half (tributary 1.5–4.5 m, half on the panel): 75 kg; W = 255 g = 2500.69575 N, M_w = 1250.347875 N·m;
  //   U_ot = 1.5 · 804.825 / 1250.347875 = 0.965521; U_sl = 2 · 804.825 / (0.4 · 2500.69575) = 1.609202.
  // So with equal feet the body governs, just; the end panel is the more loaded per metre (2.19 against 1.8593).
  const expansion = expandStructure(fence);
  const coefficients = stabilityCoefficients(expansion.structure);
  const qPa = dynamicPressurePa(10, 1.225);
  const endPanel = coefficients.elements[0]!;

  it('expands to a 15 m × 1 m base with each foot at its plan point along y and one end-panel element', () => {
    const { structure } = expansion;
    expect(structure.baseDepthM).toBe(1);
    expect(structure.baseWidthM).toBe(15);
    expect(structure.faces).toEqual([expect.objectContaining({ areaM2: 30, centroidHeightM: 1, facingDeg: 0 })]);
    expect(structure.faces[0]!.cfFront).toBeCloseTo(1.859333333333, 11);
    expect(structure.faces[0]!.cfBack).toBe(structure.faces[0]!.cfFront);
    expect(structure.masses.map((mass) => [mass.massKg, mass.xM, mass.yM])).toEqual([
      [150, 0.5, 7.5], [150, 0.5, 0], [150, 0.5, 3], [150, 0.5, 6], [150, 0.5, 9], [150, 0.5, 12], [150, 0.5, 15],
    ]);
    expect(structure.elements).toHaveLength(1);
    const element = structure.elements![0]!;
    expect(element.name).toBe('end panel at the y = 0 end');
    expect(element.baseDepthM).toBe(1);
    expect(element.baseWidthM).toBe(3);
    expect(element.faces[0]!.areaM2).toBe(6);
    expect(element.faces[0]!.cfFront).toBeCloseTo(2.19, 12);
    expect(element.masses.map((mass) => [mass.massKg, mass.yM])).toEqual([[30, 1.5], [150, 0], [75, 3]]);
  });

  it('front-on gives the hand-worked loads and utilizations of the body and the end panel', () => {
    const body = directionUtilizations(direction(coefficients.body, 0), qPa);
    expect(direction(coefficients.body, 0).forcePerPaM2 * qPa).toBeCloseTo(3416.525, 9);
    expect(direction(coefficients.body, 0).tippingEdge).toBe('back');
    expect(body.overturning).toBeCloseTo(0.995396, 6);
    expect(body.sliding).toBeCloseTo(1.658993, 6);
    const element = directionUtilizations(direction(endPanel, 0), qPa);
    expect(direction(endPanel, 0).forcePerPaM2 * qPa).toBeCloseTo(804.825, 9);
    expect(element.overturning).toBeCloseTo(0.965521, 6);
    expect(element.sliding).toBeCloseTo(1.609202, 6);
  });

  it('45° off the front gives the same as front-on: the panels keep their full normal force (ψ(45°) = 1, design §2.3)', () => {
    for (const part of [coefficients.body, endPanel]) {
      expect(direction(part, 45).utilizationPerPa).toEqual(direction(part, 0).utilizationPerPa);
      expect(direction(part, 315).utilizationPerPa).toEqual(direction(part, 0).utilizationPerPa);
    }
  });

  it('end-on, along the run, the panels are edge-on and carry nothing (design §2.3: ψ(90°) = 0)', () => {
    for (const part of [coefficients.body, endPanel]) {
      for (const along of [90, 270]) {
        expect(direction(part, along).forcePerPaM2).toBe(0);
        expect(direction(part, along).utilizationPerPa.governing).toBe(0);
      }
    }
  });

  it('the end panel is more loaded than the average, per metre of run (issue 11 item 7, EN Table 7.9 zone A)', () => {
    const perMetre = (part: BodyCoefficients, widthM: number) => direction(part, 0).forcePerPaM2 / widthM;
    expect(perMetre(endPanel, 3) / perMetre(coefficients.body, 15)).toBeCloseTo(2.19 / 1.859333333333, 10);
    expect(perMetre(endPanel, 3)).toBeGreaterThan(perMetre(coefficients.body, 15));
  });

  it('with equal feet the body governs, just (hand: sliding 1.658993 against 1.609202)', () => {
    const report = assessStructure(fence, { gustMps: 10, airDensityKgM3: 1.225 });
    expect(report.governingElement).toBeNull();
    expect(report.utilization.sliding).toBeCloseTo(1.658993, 6);
    expect(report.elements[0]!.utilization.sliding).toBeCloseTo(1.609202, 6);
  });

  // Regression, issue 11 item 7. The end feet carry only their share of the run's ballast: 150 kg per 3 m of run
  // is 50 kg/m, and an end foot holds 1.5 m of it (half a panel) → 75 kg. Then the body has 4 × 150 + 2 × 75 + 150 = 900 kg:
  //   U_sl = 2 · 3416.525 / (0.4 · 900 g) = 1.935492; the end panel 30 + 75 + 75 = 180 kg: U_sl = 2 · 804.825 / (0.4 · 180 g) = 2.279703.
  //   Its limit: q = 0.4 · 180 g / (2 · 2.19 · 6) = 26.867534 Pa → v = √(2 · 26.867534 / 1.225) = 6.623093 m/s
  //   (the body's alone: 7.187937 m/s).
  it('the end panel governs when the end feet carry only their share, and names itself (issue 11 item 7)', () => {
    const sharing = record({ ...fence, endFootBallastKg: 75 });
    const report = assessStructure(sharing, { gustMps: 10, airDensityKgM3: 1.225 });
    expect(report.governingElement).toBe('end panel at the y = 0 end');
    expect(report.governingText).toBe('end panel at the y = 0 end, wind onto the front: sliding');
    expect(report.utilization.sliding).toBeCloseTo(2.279703, 6);
    expect(report.calculatedLimitGustMps).toBeCloseTo(6.623093, 6);
    const body = stabilityCoefficients(expandStructure(sharing).structure).body;
    expect(directionUtilizations(direction(body, 0), qPa).sliding).toBeCloseTo(1.935492, 6);
  });

  it('U(v) = K·v² exactly for the body and the end panel in every direction (design §2.3)', () => {
    const at = (gustMps: number) => assessStructure(fence, { gustMps, airDensityKgM3: 1.25 });
    const single = at(7);
    const double = at(14);
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
    // The limit gives utilization 1 and a fraction f of capacity is reached at v_lim·√f.
    const limit = single.calculatedLimitGustMps!;
    expectRelative(at(limit).effectiveUtilization!, 1, 1e-12);
    expectRelative(at(limit * Math.sqrt(0.6)).effectiveUtilization!, 0.6, 1e-12);
  });

  it('names every default coefficient with its source: Table 7.9 for the run and the end panel, tributary shares as common practice', () => {
    const bySource = Object.fromEntries(expansion.sources.map((note) => [note.item, note]));
    expect(bySource['c_f of the whole run on the gross area b·h (front and back)']!.source).toMatch(/EN 1991-1-4 §7\.4\.3 → §7\.4\.1.*Table 7\.9/);
    expect(bySource['c of the end panel on its gross area w·h (front and back)']).toMatchObject({ value: expect.closeTo(2.19, 12), source: expect.stringMatching(/Table 7\.9.*l\/h = 7\.50.*φ = 1/) });
    expect(bySource['share of each foot holding the end panel']).toMatchObject({ value: 0.5, source: expect.stringMatching(/^common practice/) });
  });
});

describe('the end panel in the other cases of the rule (EN 1991-1-4 Table 7.9, §7.4.3, §7.11)', () => {
  const base = { kind: 'banner', name: 'Fence', heightM: 2, clearanceM: 0, ballastPerFootKg: 100, footDepthM: 1, selfWeightKg: 100 };
  const endPanelCf = (input: Record<string, unknown>) => expandStructure(record({ ...base, ...input })).structure.elements![0]!.faces[0]!.cfFront;

  it('at φ 0.9 a 0.6 m end panel (zone A only) takes 2.175 (references.md §9), above the run\'s 1.859333·(1 − 0.1^1.5) = 1.800536', () => {
    const { structure } = expandStructure(record({ ...base, panelWidthM: 0.6, panels: 25, solidity: 0.9 }));
    expect(structure.faces[0]!.cfFront).toBeCloseTo(1.8005360507, 9);
    expect(structure.elements![0]!.faces[0]!.cfFront).toBeCloseTo(2.175, 12);
  });

  it('a mesh below φ 0.8 has no end zones (EN §7.11 lattice; Table 7.9 is 1.2 everywhere at φ 0.8): the end panel takes the run\'s c_f', () => {
    const { structure, sources } = expandStructure(record({ ...base, panelWidthM: 2, panels: 12, solidity: 0.55 }));
    expect(structure.elements![0]!.faces[0]!.cfFront).toBe(structure.faces[0]!.cfFront);
    expect(sources.find((note) => note.item.startsWith('c of the end panel'))!.source).toMatch(/§7\.11/);
  });

  it('a raised board (z_g > h/4, EN §7.4.3 c_f 1.80) still takes the Table 7.9 end zones at its panel: 2.19 at l/h 7.5, stated as assumed', () => {
    const { structure, sources } = expandStructure(record({ ...base, clearanceM: 1, panelWidthM: 3, panels: 5 }));
    expect(structure.faces[0]!.cfFront).toBe(1.8);
    expect(structure.elements![0]!.faces[0]!.cfFront).toBeCloseTo(2.19, 12);
    expect(sources.find((note) => note.item.startsWith('c of the end panel'))!.source).toMatch(/raised.*assumed, conservative/);
  });

  it('a short wall keeps the run\'s 1.80 when Table 7.9 gives its end panel less (l/h 3: 0.3 × 2.3 + 0.7 × 1.4 = 1.67 over 0–h)', () => {
    expect(endPanelCf({ panelWidthM: 2, panels: 3 })).toBe(1.8);
  });

  it('with the run\'s c_f given, the end panel takes it × the Table 7.9 ratio: 1.3 × 2.19 / 1.859333 = 1.531194', () => {
    expect(endPanelCf({ panelWidthM: 3, panels: 5, coefficients: { cf: 1.3 }, coefficientSource: 'maker’s sheet F-3' })).toBeCloseTo(1.5311939763, 9);
    expect(endPanelCf({ panelWidthM: 3, panels: 5, coefficients: { endPanelCf: 2.6 }, coefficientSource: 'wind tunnel report W-9' })).toBe(2.6);
    expect(issuePaths({ ...base, panelWidthM: 3, panels: 5, coefficients: { endPanelCf: 2.6 } })).toEqual(['coefficientSource']);
  });

  it('feet between the joints count by the tributary length on the end panel: feet every 1.5 m under 3 m panels give 1 + 1 + ½ feet', () => {
    // Feet at 0, 1.5, 3, …: tributaries 0–0.75 (all on the panel), 0.75–2.25 (all), 2.25–3.75 (half of it on 0–3 m).
    const element = expandStructure(record({ ...base, widthM: 15, panels: 5, feet: 11 })).structure.elements![0]!;
    expect(element.masses.map((mass) => [mass.massKg, mass.yM])).toEqual([[20, 1.5], [100, 0], [100, 1.5], [50, 3]]);
  });

  it('end feet with extra ballast hold the end panel: endFootBallastKg enters the body and the element in full', () => {
    const { structure } = expandStructure(record({ ...base, panelWidthM: 3, panels: 5, endFootBallastKg: 400 }));
    expect(structure.masses.filter((mass) => mass.massKg === 400).map((mass) => mass.yM)).toEqual([0, 15]);
    expect(structure.elements![0]!.masses.map((mass) => mass.massKg)).toEqual([20, 400, 50]);
  });
});
