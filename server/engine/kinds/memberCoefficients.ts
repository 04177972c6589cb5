/**
 * Default coefficients and sizes for the members that carry a screen: support towers and the
 * header truss (design §2.4 v2: "towers and trusses carry wind too"), and the structural factor.
 * Each with its source; "from memory" marks values no retrieved text confirms (references.md
 * lists what has been checked). They sit here rather than in coefficients.ts because they belong
 * to the screen kind alone.
 */
import type { SourcedValue } from './coefficients.ts';

export const memberCoefficients = {
  /**
   * Force coefficient of a tower or truss on its ENVELOPE (outline) area, wind onto any of its
   * faces. Taken as a solid square section: conservative for a lattice truss, whose load on the
   * solid members (EN 1991-1-4 §7.11, c_f,0 of Fig. 7.33 on φ·envelope, φ about 0.2–0.4) is well
   * below a solid block's.
   */
  squareSection: {
    value: 2.1,
    source:
      'EN 1991-1-4 §7.6, Fig. 7.23: rectangular section with sharp corners, c_f,0 about 2.1 at d/b = 1 (from memory; ' +
      'references.md does not list it), with ψ_r = ψ_λ = 1 (no credit for rounded corners or the end effect), on the ' +
      'envelope area: conservative for a lattice tower (EN §7.11 on the solid members gives less)',
  },
  /**
   * A rectangular (not square) section: c_f,0 of EN Fig. 7.23 rises above the square value for
   * sections shallower in the wind direction than they are wide.
   */
  rectangularSection: {
    value: 2.4,
    source:
      'EN 1991-1-4 §7.6, Fig. 7.23: rectangular section with sharp corners, c_f,0 up to about 2.4 near d/b = 0.5 (from memory), ' +
      'taken for every face of a tower that is not square (conservative)',
  },
} as const satisfies Record<string, SourcedValue>;

export const memberSizes = {
  /** Width (and depth) of a support tower seen from any side, m. */
  towerWidthM: {
    value: 0.4,
    source: 'common practice: a 400 mm square box truss, one of the larger standard sizes for ground-supported screens (from memory); give the real size',
  },
  /** Depth of the header truss across the top of the screen, m. */
  headerTrussDepthM: {
    value: 0.4,
    source: 'common practice: a 400 mm square box truss across the top of the screen (from memory); give the real size, or 0 where there is none',
  },
} as const satisfies Record<string, SourcedValue>;

/** EN 1991-1-4 §6: the structural factor c_s·c_d, 1 unless an engineer gives another. */
export const structuralFactorDefault: SourcedValue = {
  value: 1,
  source:
    'EN 1991-1-4 §6.2(1): c_s·c_d = 1 may be taken for buildings under about 15 m high and for elements with a natural ' +
    'frequency above 5 Hz (from memory; references.md lists only F_w = c_s·c_d·c_f·q_p·A_ref, expression 5.3): assumed here',
};

/** Top of a screen above which c_s·c_d = 1 is no longer taken for granted, m (EN 1991-1-4 §6.2(1)(a), from memory). */
export const tallScreenTopM = 15;
