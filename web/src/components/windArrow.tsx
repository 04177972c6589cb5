/**
 * The wind direction as an arrow that points where the wind goes (downwind), with north up; the
 * compass point it comes from is written beside it by the caller. Unknown direction: a ring with
 * a question mark, never an arrow pointing somewhere.
 */
export function WindArrow({ fromDeg, size = 56 }: { fromDeg: number | null; size?: number }) {
  if (fromDeg === null || !Number.isFinite(fromDeg)) {
    return (
      <svg width={size} height={size} viewBox="0 0 64 64" role="img" aria-label="direction unknown" class="wind-arrow">
        <circle cx="32" cy="32" r="28" class="dial" />
        <text x="32" y="42" text-anchor="middle" class="dial-q">?</text>
      </svg>
    );
  }
  return (
    <svg width={size} height={size} viewBox="0 0 64 64" role="img" aria-label={`wind from ${Math.round(fromDeg)} degrees`} class="wind-arrow">
      <circle cx="32" cy="32" r="28" class="dial" />
      <text x="32" y="12" text-anchor="middle" class="dial-n">N</text>
      {/* Drawn pointing down (from north to south) and turned by the from-direction. */}
      <g transform={`rotate(${fromDeg} 32 32)`}>
        <path d="M32 10 V46" class="shaft" />
        <path d="M22 40 L32 54 L42 40 Z" class="head" />
      </g>
    </svg>
  );
}
