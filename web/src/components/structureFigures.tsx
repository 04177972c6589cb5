/**
 * A structure's live figures: margin, gust here and limit gust (and utilization on the structure
 * page). One place decides how missing data reads: "unknown", never a number.
 */
import type { StructureState } from '../types.ts';
import { percent, type SpeedUnit } from '../units.ts';
import { SpeedValue } from './speedValue.tsx';

export function StructureFigures({ s, unit, detailed = false }: { s: StructureState; unit: SpeedUnit; detailed?: boolean }) {
  return (
    <dl class={detailed ? 'sc-figures big' : 'sc-figures'}>
      <div>
        <dt>Margin</dt>
        <dd class={detailed ? undefined : 'sc-margin'}>{s.noData ? 'unknown' : s.unbounded ? 'none left' : percent(s.margin)}</dd>
      </div>
      {detailed ? (
        <div>
          <dt>Utilization</dt>
          <dd>{s.noData ? 'unknown' : s.unbounded ? 'unbounded' : percent(s.utilization)}</dd>
        </div>
      ) : null}
      <div>
        <dt>Gust here</dt>
        <dd>{s.noData ? 'unknown' : <SpeedValue mps={s.gustMps} unit={unit} />}</dd>
      </div>
      <div>
        <dt>Limit gust</dt>
        <dd>
          <SpeedValue mps={s.limitGustMps} unit={unit} />
        </dd>
      </div>
    </dl>
  );
}
