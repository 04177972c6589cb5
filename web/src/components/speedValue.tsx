/** A speed for big figures: the number large, the unit small beside it, "unknown" when missing. */
import { speedNumber, speedUnitLabels, type SpeedUnit } from '../units.ts';

export function SpeedValue({ mps, unit }: { mps: number | null | undefined; unit: SpeedUnit }) {
  // Smaller than a figure so the word fits the figure's column on a phone; never grey: unknown is not calm.
  if (mps === null || mps === undefined || !Number.isFinite(mps)) return <span class="unknown-value">unknown</span>;
  return (
    <>
      {speedNumber(mps, unit)}
      <span class="dd-unit"> {speedUnitLabels[unit]}</span>
    </>
  );
}
