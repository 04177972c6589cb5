import { describe, expect, it } from 'vitest';
import {
  boardForceCoefficient,
  freeStandingWallCpNet,
  freeStandingWallMeanCpNet,
  solidityFactor,
  wallZones,
} from '../../../server/engine/kinds/index.ts';

describe('EN 1991-1-4 Table 7.9, free-standing walls (references §1, §9)', () => {
  it('at l/h 7.5 and φ = 1 zones A–D are 3.15, 1.95, 1.55 and 1.2 (linear in l/h)', () => {
    expect(wallZones.map((zone) => freeStandingWallCpNet(zone, 7.5))).toEqual([
      expect.closeTo(3.15, 10),
      expect.closeTo(1.95, 10),
      expect.closeTo(1.55, 10),
      expect.closeTo(1.2, 10),
    ]);
  });

  it('at l/h 7.5 and φ = 0.9 zone A is 2.175 (linear in φ between 0.8 and 1)', () => {
    expect(freeStandingWallCpNet('A', 7.5, 0.9)).toBeCloseTo(2.175, 10);
  });

  it('below φ 0.8 a wall is a plane lattice (EN §7.11), not Table 7.9', () => {
    expect(() => freeStandingWallCpNet('A', 5, 0.7)).toThrow(RangeError);
  });

  // l/h 10, zones from both ends over half the length (5h): A 0.3h × 3.4 + B 1.7h × 2.1 + C 2h × 1.7 + D 1h × 1.2
  // = 1.02 + 3.57 + 3.4 + 1.2 = 9.19 → mean 9.19 / 5 = 1.838.
  it('the mean c_p,net of a solid wall with l/h 10 is 1.838', () => {
    expect(freeStandingWallMeanCpNet(10)).toBeCloseTo(1.838, 10);
  });

  // l/h 3, half length 1.5h: A 0.3h × 2.3 + B 1.2h × 1.4 = 0.69 + 1.68 = 2.37 → 1.58.
  it('the mean c_p,net of a short solid wall with l/h 3 is 1.58, below the signboard 1.80', () => {
    expect(freeStandingWallMeanCpNet(3)).toBeCloseTo(1.58, 10);
  });
});

describe('board force coefficient rule (EN 1991-1-4 §7.4.3, §7.4.1; ASCE 7-16 ch. 29)', () => {
  it('a raised board (z_g > h/4) takes the signboard 1.80 (EN §7.4.3)', () => {
    expect(boardForceCoefficient({ widthM: 6, heightM: 4, clearanceM: 3, solidity: 1 })).toMatchObject({ value: 1.8, source: expect.stringMatching(/7\.4\.3/) });
  });

  it('a narrow board on the ground (b/h ≤ 1) takes 1.80 as well (EN §7.4.3)', () => {
    expect(boardForceCoefficient({ widthM: 2, heightM: 3, clearanceM: 0, solidity: 1 }).value).toBe(1.8);
  });

  it('a long board on the ground takes the Table 7.9 mean when higher: 1.838 at l/h 10 (EN §7.4.1)', () => {
    expect(boardForceCoefficient({ widthM: 20, heightM: 2, clearanceM: 0.2, solidity: 1 }).value).toBeCloseTo(1.838, 10);
    expect(boardForceCoefficient({ widthM: 6, heightM: 2, clearanceM: 0, solidity: 1 }).value).toBe(1.8);
  });

  it('the reduction for openings is 0.9106 at solidity 0.8 (ASCE 7 open-sign factor, references §9)', () => {
    expect(solidityFactor(0.8)).toBeCloseTo(0.9106, 4);
  });

  it('on the gross area it is never below the ASCE open-sign C_f × φ nor an EN lattice 2.0 × φ (φ < 0.8)', () => {
    // ASCE 7-16 ch. 29 open signs, C_f on the solid area: ε < 0.1 → 2.0, 0.1–0.29 → 1.8, 0.3–0.7 → 1.6.
    const asceOpenSignCf = (solidity: number) => (solidity < 0.1 ? 2.0 : solidity < 0.3 ? 1.8 : 1.6);
    for (let solidity = 0.01; solidity < 0.8; solidity += 0.01) {
      const gross = boardForceCoefficient({ widthM: 6, heightM: 2, clearanceM: 1, solidity }).value;
      if (solidity <= 0.7) expect(gross).toBeGreaterThanOrEqual(asceOpenSignCf(solidity) * solidity);
      expect(gross).toBeGreaterThanOrEqual(2.0 * solidity);
    }
  });

  it('on the ground it is never below EN Table 7.9 interpolated to φ between 0.8 and 1 (zone mean)', () => {
    for (const lengthToHeight of [2, 4, 5, 7.5, 10, 20]) {
      const solidMean = freeStandingWallMeanCpNet(lengthToHeight);
      for (let solidity = 0.8; solidity <= 1; solidity += 0.02) {
        const enValue = 1.2 + ((solidity - 0.8) / 0.2) * (solidMean - 1.2);
        const gross = boardForceCoefficient({ widthM: 2 * lengthToHeight, heightM: 2, clearanceM: 0, solidity }).value;
        expect(gross).toBeGreaterThanOrEqual(enValue - 1e-12);
      }
    }
  });
});
