import { describe, expect, it } from 'vitest';
import {
  airDensity,
  airDensityKgM3,
  isaAirDensityKgM3,
  isaPressurePa,
  isaTemperatureK,
  moistAirDensityKgM3,
  saturationVapourPressurePa,
  recommendedAirDensityKgM3,
  siteAirDensity,
  siteDesignDensityKgM3,
} from '../../../server/engine/index.ts';

describe('International Standard Atmosphere (ISO 2533 / ICAO Doc 7488)', () => {
  it('sea level is 288.15 K, 101 325 Pa and 1.225 kg/m³ (ISO 2533 constants)', () => {
    expect(isaTemperatureK(0)).toBe(288.15);
    expect(isaPressurePa(0)).toBe(101_325);
    expect(isaAirDensityKgM3(0)).toBeCloseTo(1.225, 4);
  });

  it('temperature falls 6.5 K per km in the troposphere (ISO 2533 lapse rate)', () => {
    expect(isaTemperatureK(1000)).toBeCloseTo(281.65, 10);
  });

  it('at 500 m the barometric formula gives 95 461 Pa and 1.1673 kg/m³ (references §5 check values)', () => {
    expect(isaPressurePa(500)).toBeCloseTo(95_461, -0.5); // ±1 Pa
    expect(isaAirDensityKgM3(500)).toBeCloseTo(1.1673, 4);
  });

  it('at 1000 m the density is 1.1116 kg/m³ (references §5 check value)', () => {
    expect(isaAirDensityKgM3(1000)).toBeCloseTo(1.1116, 4);
  });

  it('rejects altitudes outside the troposphere layer with a RangeError naming the argument', () => {
    expect(() => isaAirDensityKgM3(12_000)).toThrow(RangeError);
    expect(() => isaAirDensityKgM3(Number.NaN)).toThrow(/altitudeM/);
  });
});

describe('moist air density, WMO CIMO simple method', () => {
  // The simple method treats air as an ideal gas (compressibility Z ≈ 0.9996 ignored) and uses
  // Magnus without the enhancement factor (≈ 1.004); CIPM-2007 includes both. Together they move
  // the result by a few parts in 10⁴, so the method is held to 0.05 % of CIPM-2007.
  const cipmTolerance = 5e-4;

  it('dry air at 20 °C and 101 325 Pa is 1.2041 kg/m³ (references §5 check value)', () => {
    expect(moistAirDensityKgM3({ tempC: 20, pressurePa: 101_325 })).toBeCloseTo(1.2041, 4);
  });

  it('20 °C, 50 % RH is 1.1989 kg/m³, within 0.05 % of CIPM-2007 1.1993 (Picard et al. 2008)', () => {
    const density = moistAirDensityKgM3({ tempC: 20, pressurePa: 101_325, rhPct: 50 });
    expect(density).toBeCloseTo(1.1989, 4);
    expect(Math.abs(density / 1.1993 - 1)).toBeLessThan(cipmTolerance);
  });

  it('30 °C, 80 % RH is 1.1497 kg/m³, within 0.05 % of CIPM-2007 1.1500 (Picard et al. 2008)', () => {
    const density = moistAirDensityKgM3({ tempC: 30, pressurePa: 101_325, rhPct: 80 });
    expect(density).toBeCloseTo(1.1497, 4);
    expect(Math.abs(density / 1.15 - 1)).toBeLessThan(cipmTolerance);
  });

  it('humid air is lighter than dry air at the same temperature and pressure (water vapour is lighter)', () => {
    const dry = moistAirDensityKgM3({ tempC: 25, pressurePa: 100_000 });
    const humid = moistAirDensityKgM3({ tempC: 25, pressurePa: 100_000, rhPct: 90 });
    expect(humid).toBeLessThan(dry);
  });

  it('saturation vapour pressure at 20 °C is about 23.4 hPa (Magnus, WMO CIMO coefficients)', () => {
    expect(saturationVapourPressurePa(20)).toBeCloseTo(2_333, -1);
  });

  it('air at sea level and 15 °C is about 1.23 kg/m³ (common practice)', () => {
    expect(Math.abs(moistAirDensityKgM3({ tempC: 15, pressurePa: 101_325 }) - 1.23)).toBeLessThan(0.01);
  });

  it('rejects temperatures, pressures and humidities outside their ranges (RangeError)', () => {
    expect(() => moistAirDensityKgM3({ tempC: 80, pressurePa: 101_325 })).toThrow(/tempC/);
    expect(() => moistAirDensityKgM3({ tempC: 20, pressurePa: 1013.25 })).toThrow(/pressurePa/);
    expect(() => moistAirDensityKgM3({ tempC: 20, pressurePa: 101_325, rhPct: 120 })).toThrow(/rhPct/);
  });
});

describe("the site's air density modes (design §2.1)", () => {
  it('isa mode is ISA at the site altitude', () => {
    expect(airDensityKgM3({ mode: 'isa', altitudeM: 500 })).toBe(isaAirDensityKgM3(500));
  });

  it('measured mode uses the measurement: 20 °C, 50 % RH at 101 325 Pa gives 1.1989 kg/m³', () => {
    const result = airDensity({ mode: 'measured', tempC: 20, pressurePa: 101_325, rhPct: 50, altitudeM: 0 });
    expect(result.basis).toBe('measured');
    expect(result.densityKgM3).toBeCloseTo(1.1989, 4);
  });

  it('measured mode falls back to ISA at the altitude when temperature or pressure is missing', () => {
    expect(airDensity({ mode: 'measured', tempC: null, pressurePa: 95_000, altitudeM: 500 })).toEqual({
      densityKgM3: isaAirDensityKgM3(500),
      basis: 'isa',
    });
    expect(airDensity({ mode: 'measured', tempC: 12, altitudeM: 1000 }).basis).toBe('isa');
  });

  it('fixed mode takes the value (EN 1991-1-4 recommends 1.25 kg/m³) and rejects implausible ones', () => {
    expect(airDensityKgM3({ mode: 'fixed', densityKgM3: 1.25 })).toBe(1.25);
    expect(() => airDensityKgM3({ mode: 'fixed', densityKgM3: 12.5 })).toThrow(RangeError);
  });

  it('a site\'s settings pick the mode; a measurement outside the plausible range is not used (ISA at the altitude instead)', () => {
    const site = { airDensityMode: 'measured' as const, fixedAirDensityKgM3: null, altitudeM: 500 };
    // 20 °C, 50 % RH at 101 325 Pa: 1.1989 kg/m³ (the CIPM-2007 check above).
    expect(siteAirDensity(site, { tempC: 20, pressurePa: 101_325, rhPct: 50 }).densityKgM3).toBeCloseTo(1.1989, 4);
    expect(siteAirDensity(site, null)).toEqual({ densityKgM3: isaAirDensityKgM3(500), basis: 'isa' });
    // 2 000 hPa is no air pressure at a site: refused by the moist-air formula's range, so ISA.
    expect(siteAirDensity(site, { tempC: 20, pressurePa: 200_000, rhPct: 50 })).toEqual({ densityKgM3: isaAirDensityKgM3(500), basis: 'isa' });
    expect(siteAirDensity({ airDensityMode: 'fixed', fixedAirDensityKgM3: 1.25, altitudeM: 500 }, null)).toEqual({ densityKgM3: 1.25, basis: 'fixed' });
    // Fixed without a value (the settings refuse it; a stored row could lack it): ISA, never a guess.
    expect(siteAirDensity({ airDensityMode: 'fixed', fixedAirDensityKgM3: null, altitudeM: 0 }, null).basis).toBe('isa');
    expect(siteAirDensity({ airDensityMode: 'isa', fixedAirDensityKgM3: 1.3, altitudeM: 1000 }, { tempC: -10, pressurePa: 90_000, rhPct: null }).densityKgM3).toBe(isaAirDensityKgM3(1000));
  });

  it('the design density (levels checked on save): fixed or ISA, never under the 1.25 kg/m³ EN 1991-1-4 §4.5(1) Note 2 recommends, and never the weather of the moment', () => {
    expect(recommendedAirDensityKgM3).toBe(1.25);
    expect(siteDesignDensityKgM3({ airDensityMode: 'isa', fixedAirDensityKgM3: null, altitudeM: 0 })).toBe(1.25);
    expect(siteDesignDensityKgM3({ airDensityMode: 'fixed', fixedAirDensityKgM3: 1.3, altitudeM: 0 })).toBe(1.3);
    expect(siteDesignDensityKgM3({ airDensityMode: 'fixed', fixedAirDensityKgM3: 1.2, altitudeM: 0 })).toBe(1.25);
    // Measured: ISA at the altitude (1.1673 at 500 m, ISO 2533), floored at 1.25.
    expect(siteDesignDensityKgM3({ airDensityMode: 'measured', fixedAirDensityKgM3: null, altitudeM: 500 })).toBe(1.25);
  });
});
