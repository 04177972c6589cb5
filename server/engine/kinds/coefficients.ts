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
  /** Side elevation of a closed tent (walls and roof rise). */
  tentElevation: {
    value: 1.8,
    source:
      'EN 1991-1-4 §7.4.3 signboard c_f = 1.80, taken as a conservative stand-in for a tent elevation: ' +
      'no tent coefficient was retrieved (EN 13782 not consulted); a closed building’s net wall coefficient is lower',
  },
  /** Wall of a tent with its sides open or removed. */
  tentOpenWall: {
    value: 0,
    source: 'common practice: open sides let the wind through; the frame members are small and neglected',
  },
  /** Net uplift on a tent roof, on its plan area. */
  tentRoofLift: {
    value: 1.0,
    source:
      'common practice (no retrieved source): about the area-averaged suction on a low-pitched roof plus internal ' +
      'pressure through a windward opening; give the manufacturer’s value with coefficientSource',
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
