/**
 * Default coefficients of the kinds, each with its source as shown in the response and the form's
 * help text. "From memory" and "common practice" mark values no retrieved text confirms; near the
 * ground the code values (EN 1991-1-4) are preferred to free-stream handbook drag coefficients,
 * as they include ground effect and are calibrated to peak pressure.
 */

/** A value and where it comes from. */
export interface SourcedValue {
  value: number;
  source: string;
}

export const defaultCoefficients = {
  /** Signboard raised above the ground (z_g > h/4), or narrow (b/h ≤ 1). */
  signboard: {
    value: 1.8,
    source: 'EN 1991-1-4 §7.4.3: signboard, c_f = 1.80 (z_g > h/4, or b/h ≤ 1)',
  },
  /**
   * Closed tent elevation (a closed wall or gable end on its windward side, the roof's rise), on
   * its area: the whole body's drag, carried by the windward face (tent.ts).
   */
  tentElevation: {
    value: 1.8,
    source:
      'EN 1991-1-4 §7.4.3 signboard c_f = 1.80, taken as a conservative stand-in for a tent elevation: ' +
      'no tent coefficient was retrieved (EN 13782 not consulted); a closed building’s net wall coefficient is lower ' +
      '(Table 7.1 zones D + E, about 0.8 + 0.5 = 1.3, from memory)',
  },
  /** Wall of a tent with its sides open or removed. */
  tentOpenWall: {
    value: 0,
    source: 'common practice: open sides let the wind through; the frame members are small and neglected',
  },
  /**
   * @deprecated The first release's single tent roof lift on the plan area. The v2 tent computes
   * its lift per direction and opening (tentRoofSuction, tentInternalPressure, tentDominantOpening*,
   * tentCanopyLift); this entry is no longer used by the engine and stays only while the register
   * form still cites it.
   */
  tentRoofLift: {
    value: 1.0,
    source:
      'common practice (no retrieved source): about the area-averaged suction on a low-pitched roof plus internal ' +
      'pressure through a windward opening; give the manufacturer’s value with coefficientSource',
  },
  /** External pressure on a tent's windward wall, where a windward opening lets it into the tent. */
  tentWindwardWallPressure: {
    value: 0.8,
    source: 'EN 1991-1-4 Table 7.1 zone D (windward wall), from memory: +0.8 for h/d ≥ 1, +0.7 for h/d ≤ 0.25; the higher taken',
  },
  /** c_pi / c_pe at a dominant opening whose area is at least twice the other openings (also taken below twice). */
  tentDominantOpeningTwice: {
    value: 0.75,
    source:
      'EN 1991-1-4 §7.2.9(6), from memory of the clause (references.md §10): c_pi = 0.75·c_pe where the dominant face ' +
      'has at least twice the openings of the rest; linear to 0.90 at three times; kept at 0.75 below twice with the ' +
      'windward side open (conservative: the clause then gives a lower c_pi from the opening ratio)',
  },
  /** c_pi / c_pe at a dominant opening whose area is at least three times the other openings. */
  tentDominantOpeningThrice: {
    value: 0.9,
    source: 'EN 1991-1-4 §7.2.9(6), from memory of the clause (references.md §10): c_pi = 0.90·c_pe where the dominant face has at least three times the openings of the rest',
  },
  /** Internal pressure of a tent whose windward side is closed. */
  tentInternalPressure: {
    value: 0.2,
    source:
      'EN 1991-1-4 §7.2.9 Note 2, from memory (references.md §10): without a dominant face c_pi is the more onerous of ' +
      '+0.2 and −0.3; +0.2 for roof lift, also taken when a leeward or side opening would make it negative (conservative)',
  },
  /** Net lift of a tent with all four sides open (a duopitch canopy), on the plan area, at its centre. */
  tentCanopyLift: {
    value: 1.5,
    source:
      'EN 1991-1-4 §7.3 canopy roofs: overall force coefficient with the canopy blocked under its downwind edge (φ = 1: ' +
      'tables, bars and people under an event tent); −1.4 to −1.5 for monopitch canopies of 5°–30° (BS 6399-2 Table 13, ' +
      'read in a public transcription; EN Table 7.6 from memory), duopitch (Table 7.7) about −1.3 to −1.4 from memory: 1.5 taken. ' +
      'Centre of pressure at the centre of each slope (§7.3(6), read in a public transcription), so at the middle of the plan',
  },
  /** Hollow hemisphere (cup) with its concave side to the flow, on the projected disc. */
  hollowHemisphereConcave: {
    value: 1.42,
    source: 'Munson, Fundamentals of Fluid Mechanics, fig. 9.20: hollow hemisphere, concave side to the flow',
  },
  /** Hollow hemisphere with its convex side to the flow. */
  hollowHemisphereConvex: {
    value: 0.38,
    source: 'Munson, Fundamentals of Fluid Mechanics, fig. 9.20: hollow hemisphere, convex side to the flow',
  },
  /** Solid hemisphere with its flat face to the flow. */
  solidHemisphereFlat: {
    value: 1.17,
    source: 'Munson, Fundamentals of Fluid Mechanics, fig. 9.20: solid hemisphere, flat face to the flow; also common practice',
  },
  /** Solid hemisphere with its curved face to the flow. */
  solidHemisphereCurved: {
    value: 0.42,
    source: 'Munson, Fundamentals of Fluid Mechanics, fig. 9.20: solid hemisphere, curved face to the flow; also common practice',
  },
} as const satisfies Record<string, SourcedValue>;

/** Roof zones of EN 1991-1-4 Figure 7.8 for a duopitch roof (F, G, H windward; I, J leeward). */
export type TentRoofZone = 'F' | 'G' | 'H' | 'I' | 'J';

const roofZonesSource =
  'EN 1991-1-4 §7.2.5 Tables 7.4a (θ = 0°) and 7.4b (θ = 90°), duopitch c_pe,10, from memory; the values agree with a ' +
  'public transcription of the tables read while writing this (not the standard itself). Each zone takes the most onerous ' +
  'suction of the pitch rows 5°, 15°, 30° and 45°, so one set serves every tent pitch from 5° to 45° (60° and 75° are milder)';

/**
 * Suction on a tent roof, −c_pe,10 (positive lifts), per zone, the envelope of the positive-pitch
 * rows 5°–45° (the positive alternatives of Table 7.4a, which press the roof down, are not credited).
 * Across the ridge (θ = 0°): 5° F −1.7, G −1.2, H −0.6, I −0.6, J +0.2/−0.6; 15° −0.9, −0.8, −0.3,
 * −0.4, −1.0; 30° −0.5, −0.5, −0.2, −0.4, −0.5; 45° −0.0, −0.0, −0.0, −0.2, −0.3. Along the ridge
 * (θ = 90°): 5° F −1.6, G −1.3, H −0.7, I −0.6; 15° −1.3, −1.3, −0.6, −0.5; 30° −1.1, −1.4, −0.8,
 * −0.5; 45° −1.1, −1.4, −0.9, −0.5 (all from memory, as above).
 */
export const tentRoofSuction = {
  acrossRidge: {
    F: { value: 1.7, source: `${roofZonesSource}: zone F across the ridge, −1.7 at 5°` },
    G: { value: 1.2, source: `${roofZonesSource}: zone G across the ridge, −1.2 at 5°` },
    H: { value: 0.6, source: `${roofZonesSource}: zone H across the ridge, −0.6 at 5°` },
    I: { value: 0.6, source: `${roofZonesSource}: zone I across the ridge, −0.6 at 5°` },
    J: { value: 1.0, source: `${roofZonesSource}: zone J across the ridge, −1.0 at 15°` },
  },
  alongRidge: {
    F: { value: 1.6, source: `${roofZonesSource}: zone F along the ridge, −1.6 at 5°` },
    G: { value: 1.4, source: `${roofZonesSource}: zone G along the ridge, −1.4 at 30° and 45°` },
    H: { value: 0.9, source: `${roofZonesSource}: zone H along the ridge, −0.9 at 45°` },
    I: { value: 0.6, source: `${roofZonesSource}: zone I along the ridge, −0.6 at 5°` },
  },
} as const satisfies Record<'acrossRidge' | 'alongRidge', Partial<Record<TentRoofZone, SourcedValue>>>;

/** Friction coefficient of ballast on the ground when the record gives none. */
export const frictionBySurface = {
  grass: {
    value: 0.3,
    source: 'from memory: ballast on grass about 0.3–0.5, lower when wet; the lowest value taken',
  },
  hard: {
    value: 0.4,
    source:
      'HSE RR071 via the Concrete Society: concrete on concrete 0.4, lowest measured; asphalt 0.5–0.7 from memory. ' +
      'Steel feet on cast concrete can be as low as 0.1 (HSE RR071): give frictionCoefficient for those',
  },
} as const satisfies Record<string, SourcedValue>;

export type Surface = keyof typeof frictionBySurface;

/**
 * Friction of steel feet or base plates (tent legs, screen outriggers) on a hard surface when the
 * record gives none: lower than concrete ballast on concrete.
 */
export const steelFeetOnHardFriction: SourcedValue = {
  value: 0.3,
  source:
    'EN 12812 range for steel on concrete 0.3–0.4, the lower end; HSE RR071 measured as low as 0.1 for steel on cast concrete: ' +
    'give frictionCoefficient for the actual feet and surface',
};
