/**
 * The shell kind (design §2.4 v2): a band shell (quarter sphere) or a dome (hemisphere), faces for
 * wind from every side, default uplift with its source, the old records' meaning kept. Examples are
 * our own invented structures, worked by hand in the comments (ρ = 1.225 kg/m³, the calculator's
 * default, g = 9.80665 m/s²).
 */
import { describe, expect, it } from 'vitest';
import {
  assessStructure,
  defaultCoefficients,
  expandStructure,
} from '../../../server/engine/index.ts';
import { issuePaths, record } from './kindTestSupport.ts';
import { shellCoefficients } from '../../../server/engine/kinds/shell.ts';

function direction(report: ReturnType<typeof assessStructure>, directionDeg: number) {
  const found = report.directions.find((entry) => Math.abs(entry.directionDeg - directionDeg) < 1e-9);
  if (!found) throw new Error(`direction ${directionDeg} not assessed`);
  return found;
}

describe('shell default coefficients name their sources', () => {
  it('crown suction lift 1.2 (EN 1991-1-4 §7.2.8 Fig. 7.12 from memory; Maher −1.0, LES −1.2)', () => {
    expect(shellCoefficients.crownSuctionLift.value).toBe(1.2);
    expect(shellCoefficients.crownSuctionLift.source).toMatch(/Maher/);
    expect(shellCoefficients.crownSuctionLift.source).toMatch(/EN 1991-1-4 §7\.2\.8 Fig\. 7\.12 \(from memory/);
  });

  it('cup lift 1.42 derived from the hollow hemisphere of Munson fig. 9.20, and said to be derived', () => {
    expect(shellCoefficients.cupLift.value).toBe(defaultCoefficients.hollowHemisphereConcave.value);
    expect(shellCoefficients.cupLift.source).toMatch(/Munson.*fig\. 9\.20/);
    expect(shellCoefficients.cupLift.source).toMatch(/derivation is ours/);
  });

  it('internal pressure +0.2 closed and 0.90 × 0.8 = 0.72 through a windward opening (EN 1991-1-4 §7.2.9, from memory)', () => {
    expect(shellCoefficients.enclosedInternalPressure).toEqual({ value: 0.2, source: expect.stringMatching(/§7\.2\.9.*from memory/) });
    expect(shellCoefficients.windwardOpeningInternalPressure.value).toBeCloseTo(0.9 * 0.8, 12);
    expect(shellCoefficients.windwardOpeningInternalPressure.source).toMatch(/§7\.2\.9.*from memory/);
  });

  it('dome drag 0.47, the subcritical sphere (White, from memory), not below the solid hemisphere’s 0.42 (Munson fig. 9.20)', () => {
    expect(shellCoefficients.domeDrag).toEqual({ value: 0.47, source: expect.stringMatching(/White.*from memory/) });
    expect(shellCoefficients.domeDrag.value).toBeGreaterThan(defaultCoefficients.solidHemisphereCurved.value);
  });
});

describe('facts of the trade: a solid hemisphere’s drag is about 1.17 flat side to the wind and about 0.42 curved side (common practice; Munson fig. 9.20)', () => {
  it('through the custom kind and the calculator: a hemispherical sculpture on a post', () => {
    // Our own example: a solid hemisphere R 0.8 m on a 3 m post, flat face to the front, in free
    // air. Reference area the disc πR² = 2.010619 m². Gust 20 m/s: q = ½ · 1.225 · 400 = 245 Pa.
    // Flat face to the wind: F = 1.17 · 2.010619 · 245 = 576.344 N; curved side: 0.42 · 2.010619 · 245 = 206.893 N.
    const sculpture = record({
      kind: 'custom', name: 'Hemisphere sculpture', baseDepthM: 1.2, baseWidthM: 1.2, frictionCoefficient: 0.5,
      faces: [{ label: 'hemisphere (disc πR²)', areaM2: Math.PI * 0.64, centroidHeightM: 3, cfFront: 1.17, cfBack: 0.42 }],
      masses: [{ label: 'post and base', massKg: 600, xM: 0.6, yM: 0.6 }],
    });
    const report = assessStructure(sculpture, { gustMps: 20 });
    expect(report.qPa).toBeCloseTo(245, 9);
    expect(direction(report, 0).horizontalForceN).toBeCloseTo(576.344, 3);
    expect(direction(report, 180).horizontalForceN).toBeCloseTo(206.893, 3);
  });

  it('through the shell kind: a closed band shell takes 1.17 onto its flat wall and 0.42 onto its curve', () => {
    // A closed pod of our own: R 1.5 m; half disc πR²/2 = 3.534292 m². Gust 18 m/s: q = 198.45 Pa.
    // Front: 1.17 · 3.534292 · 198.45 = 820.615 N; back: 0.42 · 3.534292 · 198.45 = 294.580 N.
    const pod = assessStructure(record({ kind: 'shell', name: 'Closed pod', radiusM: 1.5, form: 'closed', selfWeightKg: 350, surface: 'hard' }), { gustMps: 18 });
    expect(direction(pod, 0).horizontalForceN).toBeCloseTo(820.615, 3);
    expect(direction(pod, 180).horizontalForceN).toBeCloseTo(294.58, 3);
  });
});

describe('band shell (quarter sphere), hand-worked', () => {
  // "Riverside band shell" (invented): R 4 m, open to the front, 1200 kg shell, 1000 kg ballast
  // along the opening, 600 kg at the back, on grass (μ 0.3). Gust 15 m/s: q = ½ · 1.225 · 225 = 137.8125 Pa.
  // Base: R = 4 m deep, 2R = 8 m wide. Front/back face: half disc πR²/2 = 25.132741 m²; end face:
  // quarter disc πR²/4 = 12.566371 m²; both at 4R/(3π) = 1.697653 m. End face c_f = max(1.42, 0.38).
  // Plan half disc 25.132741 m², lift at its centroid x = 1.697653 m, y = 4 m.
  // Masses: 1200 kg at x 2, 1000 at 0, 600 at 4: W = 2800 g = 27458.62 N.
  //   M_w about the back edge = g (1200·2 + 1000·4) = 6400 g = 62762.56 N·m;
  //   about the front edge = g (1200·2 + 600·4) = 4800 g = 47071.92 N·m; about either end = 2800 g · 4 = 109834.48 N·m.
  // θ = 0 (into the cup): F = 1.42 · 25.132741 · q = 35.688493 q = 4918.320 N; F_up with the wind into the opening takes the
  //   larger of the cup reading 1.42 and crown suction 1.2 + windward-opening c_pi 0.72 = 1.92: 1.92 · 25.132741 · q = 6650.123 N.
  //   Back edge: M = 1.697653 · 4918.320 + 6650.123 · (4 − 1.697653) = 23660.493 N·m;
  //   U_ot = 1.5 · 23660.493 / 62762.56 = 0.565476; U_sl = 2 (4918.320 + 0.3 · 6650.123) / (0.3 · 27458.62) = 1.678491;
  //   U_up = 1.5 · 6650.123 / 27458.62 = 0.363281.
  // θ = 45: both faces full (ψ = 1): F = √(4918.320² + 2459.160²) = 5498.849 N;
  //   U_sl = 2 (5498.849 + 0.3 · 6650.123) / 8237.586 = 1.819437 — the worst, for every θ from 30° to 60°:
  //   limit q = 137.8125 / 1.819437 = 75.7447 Pa → v = √(2 · 75.7447 / 1.225) = 11.1205 m/s.
  // θ = 90 (onto the y = w end): F = 1.42 · 12.566371 · q = 2459.160 N toward −y; cup lift still applies (90° is on
  //   both sectors: the larger, 1.92, governs); U_sl = 2 (2459.160 + 0.3 · 6650.123) / 8237.586 = 1.081433.
  // θ = 180 (onto the convex back): F = 0.38 · 25.132741 · q = 1316.170 N; F_up = 1.2 · 25.132741 · q = 4156.327 N;
  //   front edge: M = 1.697653 · 1316.170 + 4156.327 · 1.697653 = 9290.40 N·m; U_ot = 1.5 · 9290.40 / 47071.92 = 0.296049.
  const shell = record({ kind: 'shell', name: 'Riverside band shell', radiusM: 4, selfWeightKg: 1200, frontBallastKg: 1000, backBallastKg: 600 });
  const expansion = expandStructure(shell);
  const report = assessStructure(shell, { gustMps: 15 });

  it('is a quarter sphere by default: half disc from the front, quarter disc from the ends, base R × 2R', () => {
    const [front, end] = expansion.structure.faces;
    expect(front).toMatchObject({ facingDeg: 0, cfFront: 1.42, cfBack: 0.38 });
    expect(front!.areaM2).toBeCloseTo(25.132741, 6);
    expect(end).toMatchObject({ facingDeg: 90, cfFront: 1.42, cfBack: 1.42 });
    expect(end!.areaM2).toBeCloseTo(12.566371, 6);
    expect(front!.centroidHeightM).toBeCloseTo(1.697653, 6);
    expect(end!.centroidHeightM).toBeCloseTo(1.697653, 6);
    expect(expansion.structure).toMatchObject({ baseDepthM: 4, baseWidthM: 8 });
    expect(expansion.referenceHeightM).toBe(4);
  });

  it('lifts by default: 1.92 within 90° of the front (crown suction 1.2 + windward opening 0.72, above the cup reading 1.42), crown suction 1.2 from behind, at the plan centroid toward the front', () => {
    const cases = expansion.structure.upliftCases!;
    expect(cases.map((c) => [c.centreDeg, c.halfWidthDeg, c.liftCoefficient])).toEqual([
      [0, 90, 1.92],
      [180, 90, 1.2],
    ]);
    for (const c of cases) {
      expect(c.planAreaM2).toBeCloseTo(25.132741, 6);
      expect(c.xM).toBeCloseTo(1.697653, 6);
      expect(c.xM!).toBeLessThan(expansion.structure.baseDepthM / 2);
      expect(c.yM).toBe(4);
    }
  });

  it('gives the hand-worked loads and utilizations onto the front, the end and the back', () => {
    const front = direction(report, 0);
    expect(front.horizontalForceN).toBeCloseTo(4918.32, 2);
    expect(front.upliftN).toBeCloseTo(6650.123, 2);
    expect(front.tippingEdge).toBe('back');
    expect(front.overturningMomentNm).toBeCloseTo(23660.493, 2);
    expect(front.utilization.overturning).toBeCloseTo(0.565476, 6);
    expect(front.utilization.sliding).toBeCloseTo(1.678491, 6);
    expect(front.utilization.uplift).toBeCloseTo(0.363281, 6);
    const oblique = direction(report, 45);
    expect(oblique.horizontalForceN).toBeCloseTo(5498.849, 2);
    expect(oblique.utilization.sliding).toBeCloseTo(1.819437, 6);
    const end = direction(report, 90);
    expect(end.horizontalForceN).toBeCloseTo(2459.16, 2);
    expect(end.upliftN).toBeCloseTo(6650.123, 2);
    expect(end.utilization.sliding).toBeCloseTo(1.081433, 6);
    const back = direction(report, 180);
    expect(back.horizontalForceN).toBeCloseTo(1316.17, 2);
    expect(back.upliftN).toBeCloseTo(4156.327, 2);
    expect(back.tippingEdge).toBe('front');
    expect(back.overturningMomentNm).toBeCloseTo(9290.4, 1);
    expect(back.utilization.overturning).toBeCloseTo(0.296049, 6);
  });

  it('is governed by sliding in oblique wind into the cup, limit 11.1205 m/s', () => {
    expect(report.governing).toBe('sliding');
    expect([30, 45, 60]).toContain(report.governingDirectionDeg);
    expect(report.utilization.sliding).toBeCloseTo(1.819437, 6);
    expect(report.calculatedLimitGustMps).toBeCloseTo(11.1205, 4);
  });
});

describe('dome (hemisphere), hand-worked', () => {
  // "Hospitality dome" (invented): R 3 m, closed, 800 kg dome, 1500 kg ballast round its ring, on a
  // hard surface (μ 0.4). Gust 15 m/s: q = 137.8125 Pa. Base 6 × 6 m, every mass at the centre:
  // W = 2300 g = 22555.295 N; M_w about every edge = 3 W = 67665.885 N·m.
  // Two faces, each the half disc πR²/2 = 14.137167 m² at 4R/(3π) = 1.273240 m, c_f 0.47:
  //   drag C_D q A = 0.47 · 14.137167 · 137.8125 = 915.691 N. Uplift (1.2 + 0.2) · πR² · q = 1.4 · 28.274334 · q = 5455.179 N at the centre.
  // θ = 0: tipping moment 1.273240 · 915.691 + 5455.179 · 3 = 17531.432 N·m → U_ot = 1.5 · 17531.432 / 67665.885 = 0.388632;
  //   U_sl = 2 (915.691 + 0.4 · 5455.179) / (0.4 · 22555.295) = 0.686704; U_up = 1.5 · 5455.179 / 22555.295 = 0.362787.
  // θ = 45: both faces full: |F| = √2 · 915.691 = 1294.982 N; the moment about the back edge is the same as at 0
  //   (U_ot 0.388632: the full drag onto the tangent, as a dome tips); U_sl = 2 (1294.982 + 2182.072) / 9022.118 = 0.770784,
  //   the governing value: limit q = 137.8125 / 0.770784 = 178.795 Pa → 17.0854 m/s.
  const dome = record({ kind: 'shell', name: 'Hospitality dome', shape: 'hemisphere', form: 'closed', radiusM: 3, selfWeightKg: 800, ringBallastKg: 1500, surface: 'hard' });
  const expansion = expandStructure(dome);
  const report = assessStructure(dome, { gustMps: 15 });

  it('stands on a 2R × 2R base with two full half-disc faces and the plan disc πR² lifting at the centre', () => {
    expect(expansion.structure).toMatchObject({ baseDepthM: 6, baseWidthM: 6 });
    expect(expansion.structure.faces.map((f) => [f.facingDeg, f.cfFront, f.cfBack])).toEqual([
      [0, 0.47, 0.47],
      [90, 0.47, 0.47],
    ]);
    for (const face of expansion.structure.faces) {
      expect(face.areaM2).toBeCloseTo(14.137167, 6);
      expect(face.centroidHeightM).toBeCloseTo(1.27324, 6);
    }
    expect(expansion.structure.uplift).toMatchObject({ liftCoefficient: 1.4, xM: 3, yM: 3 });
    expect(expansion.structure.uplift!.planAreaM2).toBeCloseTo(28.274334, 6);
    expect(expansion.structure.masses.every((m) => m.xM === 3 && m.yM === 3)).toBe(true);
  });

  it('gives the hand-worked figures onto the front and at 45°', () => {
    const front = direction(report, 0);
    expect(front.horizontalForceN).toBeCloseTo(915.691, 3);
    expect(front.upliftN).toBeCloseTo(5455.179, 3);
    expect(front.overturningMomentNm).toBeCloseTo(17531.432, 2);
    expect(front.utilization.overturning).toBeCloseTo(0.388632, 6);
    expect(front.utilization.sliding).toBeCloseTo(0.686704, 6);
    expect(front.utilization.uplift).toBeCloseTo(0.362787, 6);
    const oblique = direction(report, 45);
    expect(oblique.horizontalForceN).toBeCloseTo(1294.982, 3);
    expect(oblique.utilization.overturning).toBeCloseTo(0.388632, 6);
    expect(oblique.utilization.sliding).toBeCloseTo(0.770784, 6);
    expect(report.calculatedLimitGustMps).toBeCloseTo(17.0854, 4);
  });

  it('is under-loaded in no direction: at least the free-stream drag, and the full tipping moment, from every side (axisymmetric body)', () => {
    const dragN = 0.47 * 14.137167 * 137.8125;
    expect(report.directions.length).toBeGreaterThanOrEqual(24);
    for (const entry of report.directions) {
      expect(entry.horizontalForceN).toBeGreaterThanOrEqual(dragN - 1e-3);
      expect(entry.horizontalForceN).toBeLessThanOrEqual(Math.SQRT2 * dragN + 1e-3);
      expect(entry.utilization.overturning).toBeCloseTo(0.388632, 6);
      expect(entry.utilization.uplift).toBeCloseTo(0.362787, 6);
    }
  });

  it('open, the door windward (within 60° of the front) adds 0.72 internal pressure: c_lift 1.92 there, 1.4 elsewhere', () => {
    // Same dome with a door at its front: F_up = 1.92 · 28.274334 · q = 7481.389 N within 60° of the front;
    // U_up = 1.5 · 7481.389 / 22555.295 = 0.497537. At 90°: 5455.179 N as closed.
    const open = assessStructure(record({ ...dome, form: 'open' }), { gustMps: 15 });
    for (const deg of [0, 45, 60, 300, 315]) {
      expect(direction(open, deg).upliftN).toBeCloseTo(7481.389, 3);
      expect(direction(open, deg).utilization.uplift).toBeCloseTo(0.497537, 6);
    }
    for (const deg of [75, 90, 180, 270]) expect(direction(open, deg).upliftN).toBeCloseTo(5455.179, 3);
  });
});

describe('shell records and validation', () => {
  const oldRecords = [
    { kind: 'shell', name: 'Band shell', radiusM: 4, selfWeightKg: 1200, frontBallastKg: 1000, backBallastKg: 600 },
    { kind: 'shell', name: 'Bandstand shell', radiusM: 4, form: 'open', selfWeightKg: 2400, frontBallastKg: 800, backBallastKg: 1800, surface: 'grass' },
    { kind: 'shell', name: 'Band shell', radiusM: 3.5, form: 'open', selfWeightKg: 2000, frontBallastKg: 600, backBallastKg: 1500, ratedGustMps: 20 },
    { kind: 'shell', name: 'Closed pod', radiusM: 1.5, form: 'closed', selfWeightKg: 350, surface: 'hard', baseDepthM: 2 },
    {
      kind: 'shell', name: 'Lifted shell', radiusM: 4, selfWeightKg: 1200,
      coefficients: { liftCoefficient: 0.5 }, coefficientSource: 'designer’s note (invented for this test)',
    },
  ];

  it.each(oldRecords.map((r) => [r.name, r] as const))('a first-round record (%s) still validates and keeps its meaning: a quarter sphere', (_name, old) => {
    const parsed = record(old);
    const explicit = record({ ...old, shape: 'quarterSphere' });
    expect(expandStructure(parsed)).toEqual(expandStructure(explicit));
    expect(expandStructure(parsed).notes[0]).toMatch(/quarter sphere/);
  });

  it('a first-round record now has uplift by default (issue 11 item 3), and a given c_lift replaces it in every direction', () => {
    const old = assessStructure(record(oldRecords[0]), { gustMps: 15 });
    expect(old.directions.every((entry) => entry.upliftN > 0)).toBe(true);
    const lifted = expandStructure(record(oldRecords[4]));
    expect(lifted.structure.upliftCases).toBeUndefined();
    expect(lifted.structure.uplift).toMatchObject({ liftCoefficient: 0.5 });
  });

  it('refuses a dome with front or back ballast, ring ballast on a band shell, and bases smaller than the footprint', () => {
    expect(issuePaths({ kind: 'shell', name: 'Dome', shape: 'hemisphere', radiusM: 3, selfWeightKg: 800, frontBallastKg: 200 })).toEqual(['frontBallastKg']);
    expect(issuePaths({ kind: 'shell', name: 'Shell', radiusM: 3, selfWeightKg: 800, ringBallastKg: 200 })).toEqual(['ringBallastKg']);
    expect(issuePaths({ kind: 'shell', name: 'Dome', shape: 'hemisphere', radiusM: 3, selfWeightKg: 800, baseDepthM: 5 })).toEqual(['baseDepthM']);
    expect(issuePaths({ kind: 'shell', name: 'Shell', radiusM: 3, selfWeightKg: 800, baseWidthM: 5 })).toEqual(['baseWidthM']);
    expect(issuePaths({ kind: 'shell', name: 'Shell', radiusM: 3, shape: 'sphere', selfWeightKg: 800 })).toEqual(['shape']);
    expect(issuePaths({ kind: 'shell', name: 'Shell', radiusM: 3, selfWeightKg: 800, coefficients: { cfSide: 0.9 } })).toEqual(['coefficientSource']);
  });
});

describe('shell properties (design §2.3: every utilization is K·v²)', () => {
  const variants = [
    { kind: 'shell', name: 'Open band shell', radiusM: 4, selfWeightKg: 1200, frontBallastKg: 1000, backBallastKg: 600 },
    { kind: 'shell', name: 'Closed band shell on a deck', radiusM: 2.5, form: 'closed', baseHeightM: 1, baseDepthM: 4, baseWidthM: 6, selfWeightKg: 900, backBallastKg: 400 },
    { kind: 'shell', name: 'Open dome', shape: 'hemisphere', radiusM: 3, selfWeightKg: 800, ringBallastKg: 1500, surface: 'hard', ratedGustMps: 16 },
    { kind: 'shell', name: 'Closed dome', shape: 'hemisphere', form: 'closed', radiusM: 5, baseDepthM: 12, selfWeightKg: 2500 },
  ];

  it.each(variants.map((v) => [v.name, v] as const))('%s: U(2v) = 4 U(v) exactly in every direction and criterion', (_name, input) => {
    const shell = record(input);
    const at10 = assessStructure(shell, { gustMps: 10 });
    const at20 = assessStructure(shell, { gustMps: 20 });
    at10.directions.forEach((entry, index) => {
      const doubled = at20.directions[index]!;
      expect(doubled.directionDeg).toBe(entry.directionDeg);
      for (const criterion of ['overturning', 'sliding', 'uplift', 'governing'] as const) {
        expect(doubled.utilization[criterion]!).toBeCloseTo(4 * entry.utilization[criterion]!, 12);
      }
    });
  });

  it.each(variants.map((v) => [v.name, v] as const))('%s: the limit gives effective utilization 1, and a fraction f of capacity is reached at v_lim·√f', (_name, input) => {
    const shell = record(input);
    const limitMps = assessStructure(shell, { gustMps: 10 }).limitGustMps!;
    expect(assessStructure(shell, { gustMps: limitMps }).effectiveUtilization).toBeCloseTo(1, 12);
    for (const fraction of [0.6, 0.8]) {
      expect(assessStructure(shell, { gustMps: limitMps * Math.sqrt(fraction) }).effectiveUtilization).toBeCloseTo(fraction, 12);
    }
  });

  it('the gust is taken at the top of the shell: base height + R', () => {
    expect(expandStructure(record(variants[1])).referenceHeightM).toBe(3.5);
    expect(expandStructure(record(variants[3])).referenceHeightM).toBe(5);
  });

  it('every default coefficient in the expansion has a source', () => {
    for (const input of variants) {
      for (const note of expandStructure(record(input)).sources) expect(note.source.length).toBeGreaterThan(10);
    }
  });
});
