import { describe, expect, it } from 'vitest';
import { angleBetweenDeg, highestTravelSpeedMps, horizontalShare, relativeWindMps, windOnStructure } from '../../../server/engine/index.ts';

describe('wind on a structure by direction (design §2.2)', () => {
  it('a wind from within 90° of the orientation blows onto the front, with the normal component v·|cos Δ|', () => {
    const [windCase, ...rest] = windOnStructure({ gustMps: 20, windFromDeg: 30, orientationDeg: 0, directional: true });
    expect(rest).toHaveLength(0);
    expect(windCase).toMatchObject({ side: 'front', gustMps: 20 });
    expect(windCase!.normalGustMps).toBeCloseTo(20 * Math.cos(Math.PI / 6), 12);
  });

  it('measures the angle across north: wind from 350° onto a front facing 10° is 20° off', () => {
    expect(angleBetweenDeg(350, 10)).toBe(20);
    const [windCase] = windOnStructure({ gustMps: 10, windFromDeg: 350, orientationDeg: 10, directional: true });
    expect(windCase!.side).toBe('front');
    expect(windCase!.normalGustMps).toBeCloseTo(10 * Math.cos((20 * Math.PI) / 180), 12);
  });

  it('a wind from behind blows onto the back at full normal speed', () => {
    const [windCase] = windOnStructure({ gustMps: 15, windFromDeg: 180, orientationDeg: 0, directional: true });
    expect(windCase).toMatchObject({ side: 'back', normalGustMps: 15 });
  });

  it('without directional assessment, or without a direction, both sides are assessed at full speed', () => {
    const expected = [
      { side: 'front', gustMps: 12, normalGustMps: 12 },
      { side: 'back', gustMps: 12, normalGustMps: 12 },
    ];
    expect(windOnStructure({ gustMps: 12, windFromDeg: 45, orientationDeg: 0, directional: false })).toEqual(expected);
    expect(windOnStructure({ gustMps: 12, windFromDeg: null, orientationDeg: 0, directional: true })).toEqual(expected);
  });

  it('the faces carry (v_n / v)² of the full-gust pressure', () => {
    const [windCase] = windOnStructure({ gustMps: 20, windFromDeg: 60, orientationDeg: 0, directional: true });
    expect(horizontalShare(windCase!)).toBeCloseTo(0.25, 12);
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
