/**
 * Standard acceleration of gravity, g_n = 9.80665 m/s² (3rd CGPM 1901; the g0 of ISO 2533).
 * Used for weights (W = g·m) and the ISA barometric formula alike.
 */
export const standardGravityMps2 = 9.80665;
