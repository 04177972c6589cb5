/**
 * The bounds shared by more than one layer, each written once, with where it comes from. Pure
 * constants: the engine, wind, foresight, levels, ingest, register, http and web/ import them
 * from here (web/ through its relative imports of server/, like engine/units.ts).
 *
 * Most of these are plausibility bounds: they catch typos and unit errors (mm for m, g for kg,
 * km/h for m/s), they are not design limits. A bound used by one function only stays beside it.
 */

/**
 * Highest plausible wind speed, m/s: the sensor interface's plausible range "0 ≤ speed ≤ 120 m/s"
 * (design.md §3). Every speed the system accepts (a reading, a gust trigger, a rated gust, the
 * calculators' gusts, a forecast speed) and every gust the engine assesses lies in 0..this.
 */
export const maxPlausibleSpeedMps = 120;

/**
 * Highest point and longest edge accepted, m: EN 1991-1-4 Table 4.1 gives z_max = 200 m for every
 * terrain category, where the wind profile ends (engine/windProfile.ts). Structure dimensions,
 * heights and the forecast feed's reference height lie within it.
 */
export const maxDimensionM = 200;

/** Highest anemometer mounting height accepted, m (our own: a typo catch above any event mast). */
export const maxSensorHeightM = 300;

/** Heaviest mass accepted on a structure, kg: 1 000 t (our own: a typo catch, g for kg). */
export const maxMassKg = 1e6;

/**
 * Plausible air density near the ground, kg/m³ (our own, from ISO 2533 figures): a site at 5 000 m
 * on a hot day is about 0.7, −40 °C at sea level about 1.5. Anything outside is a typo or a unit
 * error. The calculator's and the engine's density check.
 */
export const plausibleAirDensityKgM3 = { min: 0.5, max: 1.6 } as const;

/**
 * A site's fixed air density, kg/m³ (our own): narrower than the plausible range, around
 * EN 1991-1-4 §4.5(1) Note 2's recommended 1.25 kg/m³, since a fixed value stands for every day.
 */
export const fixedAirDensityRangeKgM3 = { min: 0.9, max: 1.5 } as const;

/** A site's altitude, m (our own: below −500 m is not a place for an event; above 5 000 m is outside ISA use here). */
export const siteAltitudeRangeM = { min: -500, max: 5000 } as const;

/** Air temperature a reading may report, °C (our own, generous for outdoor events). */
export const readingTempRangeC = { min: -60, max: 60 } as const;

/** Air pressure a reading may report, Pa: 500–1100 hPa (our own: sea-level highs and sites up to about 5 km, generous). */
export const readingPressureRangePa = { min: 50_000, max: 110_000 } as const;

/** Longest name of a sensor, gateway, person, site link or configuration, characters (our own). */
export const maxNameLength = 100;

/** Longest structure name, label (face, mass) or location text, characters (our own). */
export const maxLabelLength = 200;

/** Longest site name, characters (our own: it heads every screen). */
export const maxSiteNameLength = 120;

/** Longest level label, characters (our own: it must fit a phone screen). */
export const maxLevelLabelLength = 60;

/** Longest free text (a level's action, an acknowledgement or switch note), characters (our own: a paragraph, not a document). */
export const maxTextLength = 2000;

/** Longest web address accepted (a forecast feed, a webhook, a push endpoint), characters (common practice: about 2 000 is what browsers and servers reliably pass). */
export const maxUrlLength = 2000;

/** Longest password accepted (people, gateways, the first administrator), characters (our own: far above any passphrase, short enough to hash cheaply). */
export const maxPasswordLength = 200;
