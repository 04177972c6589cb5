import { describe, expect, it } from 'vitest';
import {
  angleBetweenDeg,
  assessedDirectionsDeg,
  faceIncidence,
  faceNormal,
  highestTravelSpeedMps,
  inSector,
  obliqueShare,
  relativeWindMps,
  travelDirection,
  wrappedDeg,
} from '../../../server/engine/index.ts';

describe('the structure frame and face incidence (design §2.3 v2)', () => {
  it('ψ(δ) = min(1, 2 cos δ): full within 60° of the normal, 2 cos 75° = 0.5176 at 75°, nothing edge-on (Hoerner ch. 3, from memory)', () => {
    expect(obliqueShare(0)).toBe(1);
    expect(obliqueShare(60)).toBe(1);
    expect(obliqueShare(75)).toBeCloseTo(0.517638, 6);
    expect(obliqueShare(90)).toBe(0);
  });

  it('the 0.25 face share at 60° of the first release is gone: a face 60° off its normal keeps its full force', () => {
    // The first release loaded faces with (v cos Δ)²: cos² 60° = 0.25.
    expect(faceIncidence(60, 0)).toEqual({ side: 'front', deltaDeg: 60, share: 1 });
  });

  it('wind onto the back side of a face is 180° − |Δ| from that side’s normal, measured across north', () => {
    expect(faceIncidence(150, 0)).toMatchObject({ side: 'back', deltaDeg: 30, share: 1 });
    expect(faceIncidence(350, 10).deltaDeg).toBeCloseTo(20, 12);
    expect(faceIncidence(90, 0)).toMatchObject({ side: 'edge', share: 0 });
    expect(angleBetweenDeg(350, 10)).toBe(20);
  });

  it('frame: θ = 0 travels toward +x, θ = 90 toward −y; a face looking 90° has its outward normal along +y', () => {
    expect(travelDirection(0).x).toBeCloseTo(1, 12);
    expect(travelDirection(90).y).toBeCloseTo(-1, 12);
    expect(faceNormal(0).x).toBeCloseTo(-1, 12);
    expect(faceNormal(90).y).toBeCloseTo(1, 12);
  });

  it('wraps to (−180°, 180°] and takes a sector with its bounds', () => {
    expect(wrappedDeg(190)).toBe(-170);
    expect(wrappedDeg(-180)).toBe(180);
    expect(inSector(350, { centreDeg: 20, halfWidthDeg: 30 })).toBe(true);
    expect(inSector(60, { centreDeg: 20, halfWidthDeg: 30 })).toBe(false);
  });

  it('assesses every 15° plus, for each face, both normals, the ψ corners 60° off them and edge-on', () => {
    const directions = assessedDirectionsDeg([7]);
    expect(directions).toHaveLength(24 + 8);
    for (const deg of [7, 67, 97, 127, 187, 247, 277, 307]) expect(directions).toContain(deg);
  });
});

describe('relative wind on a moving structure (design §2.2)', () => {
  it('driving at 5 m/s into a 10 m/s wind gives 15 m/s from ahead', () => {
    const relative = relativeWindMps({ windMps: 10, windFromDeg: 0, travelSpeedMps: 5, headingDeg: 0 });
    expect(relative.speedMps).toBeCloseTo(15, 12);
    expect(relative.fromDeg).toBeCloseTo(0, 9);
  });

  it('driving downwind at 5 m/s in a 10 m/s wind gives 5 m/s from behind the structure', () => {
    const relative = relativeWindMps({ windMps: 10, windFromDeg: 0, travelSpeedMps: 5, headingDeg: 180 });
    expect(relative.speedMps).toBeCloseTo(5, 12);
    expect(relative.fromDeg).toBeCloseTo(0, 9);
  });

  it('driving east at 10 m/s in a 10 m/s north wind gives 14.14 m/s from the north-east (vector difference)', () => {
    const relative = relativeWindMps({ windMps: 10, windFromDeg: 0, travelSpeedMps: 10, headingDeg: 90 });
    expect(relative.speedMps).toBeCloseTo(10 * Math.SQRT2, 12);
    expect(relative.fromDeg).toBeCloseTo(45, 9);
  });
});

describe('highest travel speed with the face raised (design §2.2)', () => {
  it('with the heading unknown the worst case is straight into the wind: limit − gust', () => {
    expect(highestTravelSpeedMps({ limitGustMps: 20, gustMps: 12, windFromDeg: 90, headingDeg: null })).toEqual({ possible: true, speedMps: 8 });
  });

  it('into the wind, downwind and across it: 8, 32 and 16 m/s for a 20 m/s limit in a 12 m/s gust', () => {
    const at = (headingDeg: number) => highestTravelSpeedMps({ limitGustMps: 20, gustMps: 12, windFromDeg: 0, headingDeg }).speedMps;
    expect(at(0)).toBeCloseTo(8, 12);
    expect(at(180)).toBeCloseTo(32, 12);
    expect(at(90)).toBeCloseTo(16, 12);
  });

  it('at that speed the relative wind equals the limit', () => {
    const { speedMps } = highestTravelSpeedMps({ limitGustMps: 18, gustMps: 9, windFromDeg: 200, headingDeg: 245 });
    const relative = relativeWindMps({ windMps: 9, windFromDeg: 200, travelSpeedMps: speedMps, headingDeg: 245 });
    expect(relative.speedMps).toBeCloseTo(18, 9);
  });

  it('is not possible when the wind alone exceeds the limit', () => {
    expect(highestTravelSpeedMps({ limitGustMps: 15, gustMps: 16, windFromDeg: 0, headingDeg: 180 })).toEqual({ possible: false, speedMps: 0 });
  });
});

describe('azimuths', () => {
  it('a direction a hair west of north folds to 0°, never 360° (regression: atan2 gave −1e-15)', () => {
    expect(relativeWindMps({ windMps: 10, windFromDeg: 0, travelSpeedMps: 5, headingDeg: 0 }).fromDeg).toBeLessThan(360);
  });
});
