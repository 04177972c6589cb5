/** A speed for big figures: the number large, the unit small beside it, "unknown" when missing. */
import { speedNumber, speedUnitLabels, type SpeedUnit } from '../units.ts';

export function SpeedValue({ mps, unit }: { mps: number | null | undefined; unit: SpeedUnit }) {
  if (mps === null || mps === undefined || !Number.isFinite(mps)) return <>unknown</>;
  return (
    <>
      {speedNumber(mps, unit)}
      <span class="dd-unit"> {speedUnitLabels[unit]}</span>
    </>
  );
}
