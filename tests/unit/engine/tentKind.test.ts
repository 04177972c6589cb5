/**
 * The tent kind of design §2.4 v2, hand-worked (numbers of our own invention, worked in the
 * comments, not by the engine): gable ends, each side closed or open, roof lift by the EN
 * 1991-1-4 Figure 7.8 zones plus the §7.2.9 internal pressure, its resultant toward the windward
 * zones, and the most loaded windward leg as an element.
 *
 * Common figures: g = 9.80665 m/s²; a gust of 15 m/s in ISA sea-level air (ρ = 1.225 kg/m³, the
 * calculator's default, design §4) gives q = ½ · 1.225 · 15² = 137.8125 Pa.
 * Defaults used (coefficients.ts): closed elevation c_f 1.80 (EN 1991-1-4 §7.4.3 signboard value
 * as a stand-in), γ_ot 1.5 and γ_up 1.5 (common practice), γ_sl 2.0 (HSE RR071), μ on grass 0.3
 * (from memory). Roof suctions −c_pe,10 (EN 1991-1-4 Tables 7.4a/b, the envelope of the pitch rows
 * 5°–45°, from memory): across the ridge F 1.7, G 1.2, H 0.6, I 0.6, J 1.0; along it F 1.6,
 * G 1.4, H 0.9, I 0.6. Internal pressure (§7.2.9, from memory of the clause): +0.2 with the
 * windward side closed; 0.75 / 0.90 × c_pe = +0.8 (Table 7.1 zone D, from memory) at a windward
 * opening at least twice / three times the other openings.
 */
import { describe, expect, it } from 'vitest';
import {
  assessStructure,
  defaultCoefficients,
  directionUtilizations,
  expandStructure,
  stabilityCoefficients,
  validateStructureRecord,
  type AssessmentReport,
  type DirectionReport,
  type StructureRecord,
} from '../../../server/engine/index.ts';
import { tentRoofSuction } from '../../../server/engine/kinds/coefficients.ts';

const g = 9.80665;
const q15 = 137.8125;

/** Parses a record as the route would, so the examples are valid records. */
function record(input: unknown): StructureRecord {
  const result = validateStructureRecord(input);
  if (!result.ok) throw new Error(JSON.stringify(result.issues));
  return result.record;
}

function expectRelativelyClose(actual: number | null | undefined, expected: number, tolerance = 1e-6): void {
  expect(actual).not.toBeNull();
  expect(actual).toBeDefined();
  expect(Math.abs(actual! - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

function bodyDirection(report: AssessmentReport, directionDeg: number): DirectionReport {
  const found = report.directions.find((direction) => direction.directionDeg === directionDeg);
  if (!found) throw new Error(`no direction ${directionDeg}`);
  expect(found.element).toBeNull();
  return found;
}

/**
 * The issue 11 item 1 tent: 10 m along the ridge, 5 m span, eaves 2.3 m, ridge 3.3 m (rise 1 m,
 * pitch atan(1 / 2.5) = 21.8°), all sides closed, 8 legs (4 per row, 10/3 m apart) with 150 kg
 * each, 400 kg of frame and cover, on grass. W = (400 + 8 · 150) g = 1600 g = 15 690.64 N.
 */
const closedTent = {
  kind: 'tent', name: 'Craft tent', lengthM: 10, widthM: 5, eaveHeightM: 2.3, ridgeHeightM: 3.3,
  wallsClosed: true, legs: 8, ballastPerLegKg: 150, selfWeightKg: 400,
};
const closedWeightN = 1600 * g;

/*
 * Roof lift of the closed tent, worked by hand from EN 1991-1-4 Figure 7.8 (h = the ridge, 3.3 m):
 *
 * Across the ridge (wind onto the front): b = 10, e = min(10, 2 · 3.3) = 6.6, e/10 = 0.66, e/4 = 1.65.
 *   F 2 · 1.65 · 0.66 = 2.178 m² × 1.7 = 3.7026   G (10 − 3.3) · 0.66 = 4.422 m² × 1.2 = 5.3064
 *   H 10 · (2.5 − 0.66) = 18.4 m² × 0.6 = 11.04   J 10 · 0.66 = 6.6 m² × 1.0 = 6.6   I 18.4 m² × 0.6 = 11.04
 *   external 37.689 m², internal +0.2 · 50 = 10 → 47.689 m² per Pa (average c = 0.95378).
 *   Moment about x = 0: (3.7026 + 5.3064) · 0.33 + 11.04 · 1.58 + 6.6 · 2.83 + 11.04 · 4.08 + 10 · 2.5
 *   = 2.97297 + 17.4432 + 18.678 + 45.0432 + 25 = 109.13737 → resultant at x = 2.288523 m (mid-base 2.5).
 * Along the ridge (wind onto the y = 10 end): b = 5, e = min(5, 6.6) = 5, e/10 = 0.5, e/4 = 1.25, e/2 = 2.5.
 *   F 2 · 1.25 · 0.5 = 1.25 m² × 1.6 = 2   G 2.5 · 0.5 = 1.25 m² × 1.4 = 1.75   H 5 · 2 = 10 m² × 0.9 = 9
 *   I 5 · 7.5 = 37.5 m² × 0.6 = 22.5 → external 35.25, +10 internal = 45.25 m² per Pa (c = 0.905).
 *   Moment about the windward end: 3.75 · 0.25 + 9 · 1.5 + 22.5 · 6.25 + 10 · 5 = 205.0625
 *   → 4.531768 m from the y = 10 end: y = 5.468232 m; about the y = 0 edge 45.25 · 5.468232 = 247.4375.
 */
const acrossLiftPerPa = 47.689;
const acrossResultantXM = 109.13737 / 47.689;
const alongLiftPerPa = 45.25;
const alongResultantYM = 10 - 205.0625 / 45.25;

/* Gable end with its triangle: 5 · 2.3 = 11.5 m² at 1.15 m and ½ · 5 · 1 = 2.5 m² at 2.3 + 1/3 m:
 * 14 m² at (13.225 + 6.583333) / 14 = 1.414881 m. */
const gableAreaM2 = 14;
const gableCentroidM = (11.5 * 1.15 + 2.5 * (2.3 + 1 / 3)) / 14;

describe('tent faces: a closed box whose windward face carries the body drag (design §2.4 v2)', () => {
  const { structure } = expandStructure(record(closedTent));

  it('has long walls facing 0 and 180, gable ends with their triangle facing 90 and 270, and the roof rise both ways (EN 1991-1-4 §7.4.3 c_f 1.80 stand-in)', () => {
    const byLabel = new Map(structure.faces.map((face) => [face.label, face]));
    expect(structure.baseDepthM).toBe(5);
    expect(structure.baseWidthM).toBe(10);
    expect(byLabel.get('front wall (closed)')).toEqual({ label: 'front wall (closed)', areaM2: 23, centroidHeightM: 1.15, cfFront: 1.8, cfBack: 0, facingDeg: 0 });
    expect(byLabel.get('back wall (closed)')).toMatchObject({ areaM2: 23, cfFront: 1.8, cfBack: 0, facingDeg: 180 });
    const gable = byLabel.get('gable end at y = lengthM (closed, with its gable triangle)')!;
    expect(gable).toMatchObject({ cfFront: 1.8, cfBack: 0, facingDeg: 90 });
    expectRelativelyClose(gable.areaM2, gableAreaM2, 1e-12);
    expectRelativelyClose(gable.centroidHeightM, gableCentroidM, 1e-12);
    expect(byLabel.get('gable end at y = 0 (closed, with its gable triangle)')).toMatchObject({ facingDeg: 270, cfBack: 0 });
    expect(byLabel.get('roof, side elevation')).toMatchObject({ areaM2: 10, centroidHeightM: 2.8, cfFront: 1.8, cfBack: 1.8, facingDeg: 0 });
  });

  it('puts every leg at its plan point and the frame at the centre (legs evenly spaced 10/3 m along each row)', () => {
    const legs = structure.masses.filter((mass) => mass.label?.includes('leg'));
    expect(legs).toHaveLength(8);
    const points = legs.map((mass) => [mass.xM, Number(mass.yM!.toFixed(9))]);
    for (const xM of [0, 5]) for (const yM of [0, 3.333333333, 6.666666667, 10]) expect(points).toContainEqual([xM, yM]);
    expect(structure.masses[0]).toMatchObject({ massKg: 400, xM: 2.5, yM: 5 });
  });

  it('with the side opposite open, a closed wall is loaded from inside too; an open side has no wall face; the gable triangle stays (common practice)', () => {
    const { structure: halfOpen } = expandStructure(record({ ...closedTent, sides: { back: 'open', endY0: 'open' } }));
    const byLabel = new Map(halfOpen.faces.map((face) => [face.label, face]));
    expect(byLabel.get('front wall (closed)')).toMatchObject({ cfFront: 1.8, cfBack: 1.8 });
    expect(byLabel.has('back wall (open)')).toBe(false);
    expect(byLabel.get('gable end at y = lengthM (closed, with its gable triangle)')).toMatchObject({ cfFront: 1.8, cfBack: 1.8 });
    expect(byLabel.get('gable triangle above the open gable end at y = 0')).toMatchObject({ areaM2: 2.5, cfFront: 1.8, cfBack: 0, facingDeg: 270 });
    expectRelativelyClose(byLabel.get('gable triangle above the open gable end at y = 0')!.centroidHeightM, 2.3 + 1 / 3, 1e-12);
  });
});

describe('tent, hand-worked directions (design §2.3 v2: ψ = 1 within 60° of a face normal)', () => {
  const report = assessStructure(record(closedTent), { gustMps: 15 });

  it('issue 11 item 1 regression: wind along the ridge loads the gable end of the closed 10 × 5 m tent and its sliding check matches the hand calculation (the first model loaded nothing at 90°)', () => {
    // θ = 90: only the y = 10 gable end's outside is loaded (long walls and roof rise edge-on, the
    // y = 0 end sees its inside, c_f 0 for a closed tent): F = 1.8 · 14 · 137.8125 = 3472.875 N.
    // Lift 45.25 · 137.8125 = 6235.9 N. U_sl = 2 · (3472.875 + 0.3 · 6235.9) / (0.3 · 15 690.64)
    //   = 2 · (3472.875 + 1870.805) / 4707.192 = 2.270432.
    const along = bodyDirection(report, 90);
    const forceN = 1.8 * gableAreaM2 * q15;
    expectRelativelyClose(forceN, 3472.875, 1e-12);
    expectRelativelyClose(along.horizontalForceN, forceN);
    expectRelativelyClose(along.upliftN, alongLiftPerPa * q15);
    const sliding = (2 * (forceN + 0.3 * alongLiftPerPa * q15)) / (0.3 * closedWeightN);
    expectRelativelyClose(sliding, 2.270432, 1e-6);
    expectRelativelyClose(along.utilization.sliding, sliding);
    expect(along.governing).toBe('sliding');
    expect(along.upliftCase).toMatch(/y = lengthM gable end/);
    // Tipping about the y = 0 edge: M_h = 25.2 · 1.414881 q = 35.655 q, M_u = 247.4375 q,
    // M_w = g (400 · 5 + 2 · 150 · (0 + 10/3 + 20/3 + 10)) = 8000 g = 78 453.2 N·m → U_ot = 0.745929.
    expect(along.tippingEdge).toBe('endY0');
    expectRelativelyClose(along.utilization.overturning, (1.5 * (35.655 + 247.4375) * q15) / (8000 * g));
    expectRelativelyClose(along.utilization.overturning, 0.745929, 1e-6);
  });

  it('broadside onto the front: wall and roof rise at c_f 1.80, lift toward the front, tipping about the back edge (hand-worked)', () => {
    // F = 1.8 · (23 + 10) q = 59.4 q = 8186.0625 N. U_sl = 2 · (8186.0625 + 0.3 · 47.689 q) / 4707.192 = 4.315823.
    // About the back edge: M_h = 1.8 · (23 · 1.15 + 10 · 2.8) q = 98.01 q, M_u = 47.689 q · (5 − 2.288523) = 129.30763 q,
    // M_w = g (400 · 2.5 + 4 · 150 · 5) = 4000 g = 39 226.6 N·m → U_ot = 1.5 · 227.31763 q / 39 226.6 = 1.197932.
    // U_up = 1.5 · 47.689 q / 15 690.64 = 0.628286.
    const broadside = bodyDirection(report, 0);
    expectRelativelyClose(broadside.horizontalForceN, 8186.0625);
    expectRelativelyClose(broadside.utilization.sliding, 4.315823, 1e-6);
    expect(broadside.tippingEdge).toBe('back');
    expectRelativelyClose(broadside.overturningMomentNm, (98.01 + 47.689 * (5 - acrossResultantXM)) * q15);
    expectRelativelyClose(broadside.restoringMomentNm, 4000 * g);
    expectRelativelyClose(broadside.utilization.overturning, 1.197932, 1e-6);
    expectRelativelyClose(broadside.utilization.uplift, 0.628286, 1e-6);
  });

  it('oblique 45°: the front wall, the roof rise and the y = 10 gable end all take their full force and the worse roof case governs (ψ(45°) = 1, design §2.3)', () => {
    // F = (59.4, −25.2) q → |F| = √(59.4² + 25.2²) q = 64.524414 q = 8892.2708 N.
    // Both the front case (47.689) and the gable case (45.25) apply at 45°; sliding with the front
    // case 2 · (64.524414 + 0.3 · 47.689) q / 4707.192 = 4.615878 beats the gable case's 4.573034.
    const oblique = bodyDirection(report, 45);
    expectRelativelyClose(oblique.horizontalForceN, Math.hypot(59.4, 25.2) * q15);
    expectRelativelyClose(oblique.horizontalForceN, 8892.2708, 1e-6);
    expectRelativelyClose(oblique.upliftN, acrossLiftPerPa * q15);
    expect(oblique.upliftCase).toMatch(/onto the front/);
    expectRelativelyClose(oblique.utilization.sliding, 4.615878, 1e-6);
    expect((2 * (Math.hypot(59.4, 25.2) + 0.3 * alongLiftPerPa) * q15) / (0.3 * closedWeightN)).toBeLessThan(oblique.utilization.sliding!);
    // The structure's governing case is one of the oblique directions (the 30°–60° band is alike).
    expect(report.governing).toBe('sliding');
    expectRelativelyClose(report.utilization.governing, 4.615878, 1e-6);
  });
});

describe('tent roof lift: zones, openings and the resultant toward the windward zones (EN 1991-1-4 §7.2.5, §7.2.9)', () => {
  const closed = expandStructure(record(closedTent)).structure;
  const caseOnto = (structure: typeof closed, centreDeg: number) => structure.upliftCases!.find((entry) => entry.centreDeg === centreDeg)!;

  it('has one case per windward side, 60° either side of its normal, with the hand-worked lift and resultant', () => {
    expect(closed.upliftCases!.map((entry) => [entry.centreDeg, entry.halfWidthDeg])).toEqual([[0, 60], [90, 60], [180, 60], [270, 60]]);
    const front = caseOnto(closed, 0);
    expectRelativelyClose(front.planAreaM2 * front.liftCoefficient, acrossLiftPerPa);
    expectRelativelyClose(front.xM, acrossResultantXM);
    expectRelativelyClose(front.xM, 2.288523, 1e-6);
    expect(front.yM).toBeCloseTo(5, 12);
    const back = caseOnto(closed, 180);
    expectRelativelyClose(back.xM, 5 - acrossResultantXM);
    const gable = caseOnto(closed, 90);
    expectRelativelyClose(gable.planAreaM2 * gable.liftCoefficient, alongLiftPerPa);
    expectRelativelyClose(gable.yM, alongResultantYM);
    expectRelativelyClose(caseOnto(closed, 270).yM, 10 - alongResultantYM);
  });

  it('an open windward side raises the net lift: c_pi = 0.90 · 0.8 = +0.72 with the front the only opening (§7.2.9, from memory)', () => {
    // External 37.689 as before, internal 0.72 · 50 = 36 → 73.689 m² per Pa (c = 1.47378), against 47.689 closed.
    // Resultant: (109.13737 − 25 + 36 · 2.5) / 73.689 = 174.13737 / 73.689 = 2.363139 m.
    // U_up = 1.5 · 73.689 · 137.8125 / 15 690.64 = 0.970827 (closed 0.628286).
    const openFront = record({ ...closedTent, sides: { front: 'open' } });
    const front = caseOnto(expandStructure(openFront).structure, 0);
    expectRelativelyClose(front.planAreaM2 * front.liftCoefficient, 73.689);
    expectRelativelyClose(front.xM, 174.13737 / 73.689);
    const direction = bodyDirection(assessStructure(openFront, { gustMps: 15 }), 0);
    expectRelativelyClose(direction.utilization.uplift, 0.970827, 1e-6);
    expect(direction.utilization.uplift!).toBeGreaterThan(bodyDirection(assessStructure(record(closedTent), { gustMps: 15 }), 0).utilization.uplift!);
    // The leeward cases keep +0.2: the open front is not on their windward side.
    expectRelativelyClose(caseOnto(expandStructure(openFront).structure, 180).liftCoefficient, 0.95378);
  });

  it('interpolates c_pi between twice and three times the other openings, and keeps 0.75 · c_pe below twice (§7.2.9, from memory)', () => {
    // 12.5 × 5 m, front (12.5 · 2.3) and y = 0 end (5 · 2.3) open: R = 12.5 / 5 = 2.5 → 0.75 + 0.15 · 0.5 = 0.825,
    // c_pi = 0.825 · 0.8 = 0.66, i.e. 0.46 above the closed +0.2 on the same external suction.
    const long = { ...closedTent, lengthM: 12.5 };
    const closedLong = caseOnto(expandStructure(record(long)).structure, 0).liftCoefficient;
    const interpolated = caseOnto(expandStructure(record({ ...long, sides: { front: 'open', endY0: 'open' } })).structure, 0).liftCoefficient;
    expectRelativelyClose(interpolated - closedLong, 0.66 - 0.2, 1e-9);
    // Front and back open (R = 1): still 0.75 · 0.8 = 0.6 (conservative), 0.4 above closed.
    const through = caseOnto(expandStructure(record({ ...long, sides: { front: 'open', back: 'open' } })).structure, 0).liftCoefficient;
    expectRelativelyClose(through - closedLong, 0.6 - 0.2, 1e-9);
  });

  it('places the lift toward the windward zones: overturning about the leeward edge exceeds that of a centred lift (hand-checked)', () => {
    // Broadside, about the back edge: (98.01 + 129.30763) q against (98.01 + 47.689 · 2.5 = 119.2225) q centred:
    // U_ot 1.197932 against 1.144785. Along the ridge, about the y = 0 edge: (35.655 + 247.4375) q against
    // (35.655 + 45.25 · 5 = 226.25) q centred: U_ot 0.745929 against 0.690102.
    const report = assessStructure(record(closedTent), { gustMps: 15 });
    const broadside = bodyDirection(report, 0);
    const centredBroadside = (1.5 * (98.01 + 47.689 * 2.5) * q15) / (4000 * g);
    expectRelativelyClose(centredBroadside, 1.144785, 1e-6);
    expect(broadside.utilization.overturning!).toBeGreaterThan(centredBroadside);
    const along = bodyDirection(report, 90);
    const centredAlong = (1.5 * (35.655 + 45.25 * 5) * q15) / (8000 * g);
    expectRelativelyClose(centredAlong, 0.690102, 1e-6);
    expect(along.utilization.overturning!).toBeGreaterThan(centredAlong);
  });

  it('treats all four sides open as a canopy: net lift 1.5 over the plan at its centre (EN 1991-1-4 §7.3, canopy φ = 1)', () => {
    const canopy = expandStructure(record({ ...closedTent, wallsClosed: false })).structure;
    for (const entry of canopy.upliftCases!) {
      expect(entry).toMatchObject({ planAreaM2: 50, liftCoefficient: 1.5, xM: 2.5, yM: 5 });
    }
    expect(defaultCoefficients.tentCanopyLift).toEqual({ value: 1.5, source: expect.stringMatching(/§7\.3.*φ = 1/) });
  });

  it('takes a given lift coefficient as the area average, keeping the default resultant (the record names its source)', () => {
    const given = expandStructure(record({ ...closedTent, coefficients: { liftCoefficient: 1.2 }, coefficientSource: 'maker’s data sheet, invented for this test' })).structure;
    const front = caseOnto(given, 0);
    expectRelativelyClose(front.liftCoefficient, 1.2, 1e-12);
    expectRelativelyClose(front.xM, acrossResultantXM);
  });
});

describe('tent element: the most loaded windward leg in uplift (design §2.4 v2)', () => {
  it('gives an interior windward leg its tributary lift, bay × half the span (hand-worked, closed tent)', () => {
    // Wind onto the front; the leg at y = 10/3 m takes x 0..2.5, y 1.667..5 (8.3333 m²): G over
    // y 1.667..5 (F ends at 1.65) × 0.66 = 2.2 m² × 1.2 = 2.64; H 3.3333 × 1.84 = 6.1333 m² × 0.6 = 3.68;
    // internal 0.2 · 8.3333 = 1.6667 → 7.98667 m² per Pa. Ballast 150 kg + the end leg's share of the
    // self-weight, 400 · (10/3) / (4 · 10) = 33.333 kg.
    const { structure } = expandStructure(record(closedTent));
    const leg = structure.elements![0]!;
    expect(leg.name).toBe('windward leg (most loaded)');
    expect(leg).toMatchObject({ baseDepthM: 0.3, baseWidthM: 0.3, faces: [] });
    expectRelativelyClose(leg.masses[0]!.massKg, 150 + 400 / 12);
    const front = leg.upliftCases!.find((entry) => entry.centreDeg === 0)!;
    expectRelativelyClose(front.planAreaM2, 2.5 * (10 / 3));
    expectRelativelyClose(front.planAreaM2 * front.liftCoefficient, 7.986667, 1e-6);
  });

  it('governs when the leg ballast is small: an open canopy on timber feet on concrete (μ 0.7, HSE RR071), 6 legs of 10 kg', () => {
    // 10 × 5 m, all sides open, 6 legs (3 per row, 5 m apart), 10 kg each, 400 kg self-weight, μ 0.7.
    // Interior leg (y = 5): 5 × 2.5 = 12.5 m² × 1.5 = 18.75 q = 2583.984 N against (10 + 400 · 5 / 40 = 50) kg = 60 g:
    // U_up = 1.5 · 2583.984 / 588.399 = 6.587327.
    // Body: W = 460 g = 4511.059 N; worst sliding at 45°, roof rise 1.8 · 10 = 18 q along x, both gable triangles
    // 2 · 1.8 · 2.5 = 9 q along y (the far one from inside: its opposite end is open): |F| = √(18² + 9²) q,
    // U_sl = 2 · (20.124612 + 0.7 · 75) q / (0.7 · 4511.059) = 6.339075. The leg governs.
    const canopy = record({
      kind: 'tent', name: 'Open bar canopy', lengthM: 10, widthM: 5, eaveHeightM: 2.3, ridgeHeightM: 3.3,
      wallsClosed: false, legs: 6, ballastPerLegKg: 10, selfWeightKg: 400, frictionCoefficient: 0.7,
    });
    const report = assessStructure(canopy, { gustMps: 15 });
    expect(report.governingElement).toBe('windward leg (most loaded)');
    expect(report.governing).toBe('uplift');
    expectRelativelyClose(report.utilization.uplift, 6.587327, 1e-6);
    expectRelativelyClose(report.upliftN, 2583.984375);
    expect(report.governingText).toMatch(/^windward leg \(most loaded\), .*: uplift$/);
    // The report's per-direction list names the worst part (here the leg at every direction); the
    // body's own figures come from its coefficients.
    expect(report.directions.every((direction) => direction.element === 'windward leg (most loaded)')).toBe(true);
    const body = stabilityCoefficients(expandStructure(canopy).structure).body;
    const body45 = directionUtilizations(body.directions.find((direction) => direction.directionDeg === 45)!, q15);
    const bodySliding45 = (2 * (Math.hypot(18, 9) + 0.7 * 75) * q15) / (0.7 * 460 * g);
    expectRelativelyClose(bodySliding45, 6.339075, 1e-6);
    expectRelativelyClose(body45.sliding, bodySliding45);
    const bodyWorst = Math.max(...body.directions.map((direction) => directionUtilizations(direction, q15).governing));
    expectRelativelyClose(bodyWorst, bodySliding45);
    expect(report.utilization.governing!).toBeGreaterThan(bodyWorst);

    // With 200 kg per leg the body governs: leg 1.5 · 2583.984 / (250 g) = 1.580958 < body sliding
    // 2 · (20.124612 + 52.5) q / (0.7 · 1600 g) = 1.822484.
    const ballasted = assessStructure(record({ ...canopy, ballastPerLegKg: 200 }), { gustMps: 15 });
    expect(ballasted.governingElement).toBeNull();
    expectRelativelyClose(ballasted.utilization.governing, 1.822484, 1e-6);
    expectRelativelyClose(ballasted.elements[0]!.utilization.uplift, 1.580958, 1e-6);
  });
});

describe('tent properties and records', () => {
  const variants = [
    closedTent,
    { ...closedTent, sides: { front: 'open' } },
    { ...closedTent, wallsClosed: false },
    { ...closedTent, lengthM: 4, widthM: 9, sides: { endYW: 'open', back: 'open' } },
  ];

  it('every utilization of the tent, every direction and the leg, is K·v² exactly: U(2v) = 4·U(v), and the limit gust gives 1 (design §2.3 v2)', () => {
    for (const variant of variants) {
      const tent = record(variant);
      const low = assessStructure(tent, { gustMps: 9 });
      const high = assessStructure(tent, { gustMps: 18 });
      const lowAll = [...low.directions, ...low.elements.flatMap((element) => element.directions)];
      const highAll = [...high.directions, ...high.elements.flatMap((element) => element.directions)];
      expect(lowAll.length).toBe(highAll.length);
      lowAll.forEach((direction, index) => {
        for (const criterion of ['overturning', 'sliding', 'uplift', 'governing'] as const) {
          const u = direction.utilization[criterion]!;
          if (u === 0) expect(highAll[index]!.utilization[criterion]).toBe(0);
          else expectRelativelyClose(highAll[index]!.utilization[criterion], 4 * u, 1e-12);
        }
      });
      const atLimit = assessStructure(tent, { gustMps: low.calculatedLimitGustMps! });
      expectRelativelyClose(atLimit.utilization.governing, 1, 1e-9);
    }
  });

  it('keeps the first-round record shape valid: wallsClosed true is four closed sides, false four open (old records keep validating)', () => {
    const old = validateStructureRecord({
      kind: 'tent', name: 'Bar tent', lengthM: 6, widthM: 3, eaveHeightM: 2.2, ridgeHeightM: 3,
      wallsClosed: false, legs: 4, ballastPerLegKg: 100, selfWeightKg: 120,
    });
    expect(old.ok).toBe(true);
    const openFaces = expandStructure(record({ ...closedTent, wallsClosed: false })).structure.faces.map((face) => face.label);
    expect(openFaces).toEqual(['gable triangle above the open gable end at y = lengthM', 'gable triangle above the open gable end at y = 0', 'roof, side elevation']);
    const closedFaces = expandStructure(record(closedTent)).structure.faces;
    expect(closedFaces.filter((face) => face.label?.includes('(closed'))).toHaveLength(4);
  });

  it('needs every side from sides or wallsClosed, and accepts a span wider than the length (every direction is assessed)', () => {
    const { wallsClosed: _walls, ...withoutWalls } = closedTent;
    const missing = validateStructureRecord({ ...withoutWalls, sides: { front: 'closed', back: 'open' } });
    expect(missing.ok).toBe(false);
    if (!missing.ok) expect(missing.issues.map((issue) => issue.path).sort()).toEqual(['sides.endY0', 'sides.endYW']);
    expect(validateStructureRecord({ ...withoutWalls, sides: { front: 'closed', back: 'open', endY0: 'open', endYW: 'closed' } }).ok).toBe(true);
    expect(validateStructureRecord({ ...closedTent, sides: { front: 'ajar' } }).ok).toBe(false);
    const wide = assessStructure(record({ ...closedTent, lengthM: 4, widthM: 9 }), { gustMps: 15 });
    expect(wide.expanded.baseDepthM).toBe(9);
    expect(wide.expanded.baseWidthM).toBe(4);
    expect(wide.directions.map((direction) => direction.directionDeg)).toContain(90);
  });

  it('warns when the roof is flatter than 5° (EN 1991-1-4 §7.2.3 flat roofs, from memory)', () => {
    expect(expandStructure(record({ ...closedTent, ridgeHeightM: 2.4 })).warnings?.join(' ')).toMatch(/below 5°/);
    expect(expandStructure(record(closedTent)).warnings).toBeUndefined();
  });

  it('lists its roof suctions and internal pressures with their sources, marked from memory (EN 1991-1-4 Tables 7.4a/b, §7.2.9, Table 7.1)', () => {
    expect(Object.fromEntries(Object.entries(tentRoofSuction.acrossRidge).map(([zone, value]) => [zone, value.value]))).toEqual({ F: 1.7, G: 1.2, H: 0.6, I: 0.6, J: 1.0 });
    expect(Object.fromEntries(Object.entries(tentRoofSuction.alongRidge).map(([zone, value]) => [zone, value.value]))).toEqual({ F: 1.6, G: 1.4, H: 0.9, I: 0.6 });
    for (const value of [...Object.values(tentRoofSuction.acrossRidge), ...Object.values(tentRoofSuction.alongRidge)]) {
      expect(value.source).toMatch(/Tables 7\.4a.*from memory/);
    }
    expect(defaultCoefficients.tentDominantOpeningTwice).toEqual({ value: 0.75, source: expect.stringMatching(/§7\.2\.9.*from memory/) });
    expect(defaultCoefficients.tentDominantOpeningThrice).toEqual({ value: 0.9, source: expect.stringMatching(/§7\.2\.9.*from memory/) });
    expect(defaultCoefficients.tentInternalPressure).toEqual({ value: 0.2, source: expect.stringMatching(/§7\.2\.9 Note 2, from memory/) });
    expect(defaultCoefficients.tentWindwardWallPressure).toEqual({ value: 0.8, source: expect.stringMatching(/Table 7\.1 zone D.*from memory/) });
    const items = expandStructure(record(closedTent)).sources.map((note) => note.item);
    expect(items).toContain('c_pi with the windward side closed');
    expect(items.some((item) => item.startsWith('roof suction −c_pe,10 zone J'))).toBe(true);
  });
});
