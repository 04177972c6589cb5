/**
 * A margin (1 − effective utilization, design §2.3) in words: a percentage left, "over the limit"
 * with how far past it, "none left" when nothing holds the structure down, "unknown" without a
 * live reading. Never a negative percentage: "−331 %" reads as a number to compare, not as a
 * structure past its limit.
 */
import { percent } from '../units.ts';

/** The margin's words: the figure and, past the limit, the note under it. */
export function marginWords(margin: number | null, unbounded: boolean, noData: boolean): { value: string; note: string | null; over: boolean } {
  if (noData) return { value: 'unknown', note: null, over: false };
  if (unbounded) return { value: 'none left', note: 'nothing holds it down in this wind', over: true };
  if (margin === null || !Number.isFinite(margin)) return { value: 'unknown', note: null, over: false };
  // Rounded as shown: a margin that rounds to 0 % says "0 %", not "over".
  if (Math.round(margin * 100) < 0) return { value: 'over the limit', note: `by ${percent(-margin)} of its capacity`, over: true };
  return { value: percent(Math.max(0, margin)), note: null, over: false };
}

