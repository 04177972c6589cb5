/**
 * Compass points of the 16-point rose, the direction the wind blows from, in degrees clockwise
 * from north: N = 0, NNE = 22.5, ..., NNW = 337.5 (each point is 360/16 = 22.5° from the next).
 */
const compassPoints = [
  'N', 'NNE', 'NE', 'ENE', 'E', 'ESE', 'SE', 'SSE',
  'S', 'SSW', 'SW', 'WSW', 'W', 'WNW', 'NW', 'NNW',
] as const;

/**
 * Degrees (0 ≤ d < 360) of a 16-point compass point written in any case, or null when the text is
 * not one.
 *
 * @example compassPointDeg('wsw') // → 247.5
 */
export function compassPointDeg(text: string): number | null {
  const index = (compassPoints as readonly string[]).indexOf(text.trim().toUpperCase());
  return index < 0 ? null : index * 22.5;
}
