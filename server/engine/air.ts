/**
 * Air density for wind loads (design §2.1): the International Standard Atmosphere at the site's
 * altitude, a density measured from temperature, pressure and humidity, or a fixed value.
 *
 * ISA: ISO 2533 / ICAO Doc 7488, troposphere layer (constant lapse rate). The altitude is taken as
 * geopotential altitude; below 11 km it differs from the height above sea level by < 0.2 %.
 * Moist air: the simple method of the WMO CIMO guide (ideal-gas partial pressures with the Magnus
 * formula over water), checked against CIPM-2007 in the tests.
 */
import { assertInRange } from './rangeCheck.ts';
import { standardGravityMps2 } from './gravity.ts';
import { plausibleAirDensityKgM3 } from './limits.ts';

/** ISO 2533 sea-level temperature, K. */
export const isaSeaLevelTemperatureK = 288.15;
/** ISO 2533 sea-level pressure, Pa. */
export const isaSeaLevelPressurePa = 101_325;
/** ISO 2533 sea-level density, kg/m³ (also the calculator's default, design §4). */
export const isaSeaLevelDensityKgM3 = 1.225;
/** The air density EN 1991-1-4 §4.5(1) Note 2 recommends, kg/m³: a new site's fixed density and the floor of the design density. */
export const recommendedAirDensityKgM3 = 1.25;
/** ISO 2533 troposphere temperature lapse rate, K/m. */
export const isaLapseRateKPerM = 0.0065;
/** ISO 2533 specific gas constant of dry air, J/(kg·K). */
export const dryAirGasConstantJPerKgK = 287.05287;
/** Specific gas constant of water vapour, J/(kg·K) (WMO CIMO guide). */
export const waterVapourGasConstantJPerKgK = 461.5;

/** Range of the ISA troposphere layer, geopotential metres (ISO 2533 tabulates from −2 000 m). */
const isaAltitudeRangeM = { min: -2000, max: 11_000 } as const;

/** Plausible air density near the ground, kg/m³ (engine/limits.ts). */
export { plausibleAirDensityKgM3 };

/** Exponent g0/(R·L) of the barometric formula: 5.25588 (ISO 2533). */
const barometricExponent = standardGravityMps2 / (dryAirGasConstantJPerKgK * isaLapseRateKPerM);

function assertIsaAltitude(caller: string, altitudeM: number): void {
  assertInRange(caller, 'altitudeM', altitudeM, isaAltitudeRangeM.min, isaAltitudeRangeM.max, 'm');
}

/** ISA temperature in K at `altitudeM`: T = T0 − L·h (ISO 2533). */
export function isaTemperatureK(altitudeM: number): number {
  assertIsaAltitude('isaTemperatureK', altitudeM);
  return isaSeaLevelTemperatureK - isaLapseRateKPerM * altitudeM;
}

/** ISA pressure in Pa at `altitudeM`: p = p0 (T/T0)^(g0/(R·L)) (ISO 2533 barometric formula). */
export function isaPressurePa(altitudeM: number): number {
  assertIsaAltitude('isaPressurePa', altitudeM);
  const temperatureRatio = (isaSeaLevelTemperatureK - isaLapseRateKPerM * altitudeM) / isaSeaLevelTemperatureK;
  return isaSeaLevelPressurePa * temperatureRatio ** barometricExponent;
}

/** ISA density in kg/m³ at `altitudeM`: ρ = p/(R·T) (ISO 2533). 1.225 at sea level. */
export function isaAirDensityKgM3(altitudeM: number): number {
  return isaPressurePa(altitudeM) / (dryAirGasConstantJPerKgK * isaTemperatureK(altitudeM));
}

/**
 * Saturation vapour pressure over water in Pa at `tempC`, Magnus form with the WMO CIMO guide
 * coefficients: e_s = 6.112 hPa · exp(17.62 t / (243.12 + t)), valid −45..60 °C.
 */
export function saturationVapourPressurePa(tempC: number): number {
  assertInRange('saturationVapourPressurePa', 'tempC', tempC, -45, 60, '°C');
  return 611.2 * Math.exp((17.62 * tempC) / (243.12 + tempC));
}

export interface MoistAirInput {
  /** Air temperature, °C (−45..60, the Magnus formula's range). */
  tempC: number;
  /** Station (not sea-level-reduced) pressure, Pa (30 000..110 000). */
  pressurePa: number;
  /** Relative humidity over water, % (0..100); dry air when omitted. */
  rhPct?: number | undefined;
}

/**
 * Density of moist air in kg/m³, WMO CIMO simple method: ρ = (p − e)/(R_d T) + e/(R_v T) with
 * e = RH · e_s(t). Within 0.05 % of CIPM-2007 for ordinary outdoor air (see the tests).
 */
export function moistAirDensityKgM3({ tempC, pressurePa, rhPct }: MoistAirInput): number {
  const caller = 'moistAirDensityKgM3';
  assertInRange(caller, 'tempC', tempC, -45, 60, '°C');
  assertInRange(caller, 'pressurePa', pressurePa, 30_000, 110_000, 'Pa');
  if (rhPct !== undefined) assertInRange(caller, 'rhPct', rhPct, 0, 100, '%');
  const temperatureK = tempC + 273.15;
  const vapourPressurePa = ((rhPct ?? 0) / 100) * saturationVapourPressurePa(tempC);
  return (
    (pressurePa - vapourPressurePa) / (dryAirGasConstantJPerKgK * temperatureK) +
    vapourPressurePa / (waterVapourGasConstantJPerKgK * temperatureK)
  );
}

/** The names of the three ways a site sets its air density (design §2.1): the site setting and its stored column. */
export const airDensityModes = ['isa', 'measured', 'fixed'] as const;

/** The three ways a site sets its air density (design §2.1). */
export type AirDensityMode =
  | { mode: 'isa'; altitudeM: number }
  | {
      mode: 'measured';
      /** Missing temperature or pressure (a sensor without them, or silent): ISA at `altitudeM`. */
      tempC?: number | null | undefined;
      pressurePa?: number | null | undefined;
      rhPct?: number | null | undefined;
      altitudeM: number;
    }
  | { mode: 'fixed'; densityKgM3: number };

export interface AirDensity {
  densityKgM3: number;
  /** What the value rests on: a measured mode without a measurement falls back to 'isa'. */
  basis: 'isa' | 'measured' | 'fixed';
}

/** The site's air density and what it rests on. Throws RangeError on out-of-range input. */
export function airDensity(mode: AirDensityMode): AirDensity {
  switch (mode.mode) {
    case 'isa':
      return { densityKgM3: isaAirDensityKgM3(mode.altitudeM), basis: 'isa' };
    case 'measured': {
      if (mode.tempC == null || mode.pressurePa == null) {
        return { densityKgM3: isaAirDensityKgM3(mode.altitudeM), basis: 'isa' };
      }
      assertIsaAltitude('airDensity', mode.altitudeM);
      const rhPct = mode.rhPct ?? undefined;
      return { densityKgM3: moistAirDensityKgM3({ tempC: mode.tempC, pressurePa: mode.pressurePa, rhPct }), basis: 'measured' };
    }
    case 'fixed':
      assertAirDensity('airDensity', mode.densityKgM3, 'densityKgM3');
      return { densityKgM3: mode.densityKgM3, basis: 'fixed' };
  }
}

/**
 * The density a site's settings give: fixed when fixed (and a value given), measured from the
 * first sensor reporting temperature and pressure in measured mode, else ISA at the altitude. A
 * measurement outside the plausible range is not used: ISA at the site's altitude instead.
 */
export function siteAirDensity(
  site: { airDensityMode: AirDensityMode['mode']; fixedAirDensityKgM3: number | null; altitudeM: number },
  measured: { tempC: number; pressurePa: number; rhPct: number | null } | null,
): AirDensity {
  if (site.airDensityMode === 'fixed' && site.fixedAirDensityKgM3 !== null) return airDensity({ mode: 'fixed', densityKgM3: site.fixedAirDensityKgM3 });
  if (site.airDensityMode !== 'measured') return airDensity({ mode: 'isa', altitudeM: site.altitudeM });
  try {
    return airDensity({ mode: 'measured', altitudeM: site.altitudeM, ...(measured ?? {}) });
  } catch {
    return { densityKgM3: isaAirDensityKgM3(site.altitudeM), basis: 'isa' };
  }
}

/**
 * The density a structure's levels are checked at on save and the register form calculates at:
 * the site's fixed density, else ISA at the site's altitude, and never less than the 1.25 kg/m³
 * EN 1991-1-4 §4.5 recommends (denser air lowers the limit, so the check errs toward refusing).
 * Not the measured density: a save must not depend on the weather at that moment.
 */
export function siteDesignDensityKgM3(site: { airDensityMode: string; fixedAirDensityKgM3: number | null; altitudeM: number }): number {
  const density = site.airDensityMode === 'fixed' && site.fixedAirDensityKgM3 !== null ? site.fixedAirDensityKgM3 : isaAirDensityKgM3(site.altitudeM);
  return Math.max(density, recommendedAirDensityKgM3);
}

/** The site's air density in kg/m³ (see `airDensity` for the basis). */
export function airDensityKgM3(mode: AirDensityMode): number {
  return airDensity(mode).densityKgM3;
}

/** Throws a RangeError unless `densityKgM3` is within the plausible range (used by every load function). */
export function assertAirDensity(caller: string, densityKgM3: number, name = 'airDensityKgM3'): void {
  assertInRange(caller, name, densityKgM3, plausibleAirDensityKgM3.min, plausibleAirDensityKgM3.max, 'kg/m³');
}
