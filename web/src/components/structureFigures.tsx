/**
 * A structure's live figures: margin, gust here and limit gust (and utilization on the structure
 * page). One place decides how missing data reads: "unknown", once, never a number; a margin past
 * the limit says so in words (marginValue.tsx), never as a negative percentage.
 */
import type { StructureState } from '../types.ts';
import { percent, type SpeedUnit } from '../units.ts';
import { MarginValue } from './marginValue.tsx';
import { SpeedValue } from './speedValue.tsx';

export function StructureFigures({ s, unit, detailed = false }: { s: StructureState; unit: SpeedUnit; detailed?: boolean }) {
  return (
    <dl class={detailed ? 'sc-figures big' : 'sc-figures'}>
      {s.noData ? (
        // No live reading: margin, utilization and gust here are all unknown — said once.
        <div class="fig-unknown">
          <dt>{detailed ? 'Margin, utilization and gust here' : 'Margin and gust here'}</dt>
          <dd class={detailed ? 'unknown-value' : 'sc-margin unknown-value'}>unknown</dd>
        </div>
      ) : (
        <>
          <div>
            <dt>Margin</dt>
            <MarginValue margin={s.margin} unbounded={s.unbounded} noData={false} class={detailed ? undefined : 'sc-margin'} />
          </div>
          {detailed ? (
            <div>
              <dt>Utilization</dt>
              <dd>{s.unbounded ? 'unbounded' : percent(s.utilization)}</dd>
            </div>
          ) : null}
          <div>
            <dt>Gust here</dt>
            <dd>
              <SpeedValue mps={s.gustMps} unit={unit} />
            </dd>
          </div>
        </>
      )}
      <div>
        <dt>Limit gust</dt>
        <dd>
          <SpeedValue mps={s.limitGustMps} unit={unit} />
        </dd>
      </div>
    </dl>
  );
}
