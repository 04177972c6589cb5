/**
 * A structure's margin (1 − effective utilization) in words a crew member cannot misread:
 * "38 %" left; past the limit "over the limit" with how far ("by 331 % of its capacity"), never
 * a negative percentage; "unknown" when there is no live reading, never a number.
 */
import { marginWords } from './marginWords.ts';

export function MarginValue({ margin, unbounded, noData, class: className }: { margin: number | null; unbounded: boolean; noData: boolean; class?: string }) {
  const w = marginWords(margin, unbounded, noData);
  const cls = [className, w.over ? 'is-over' : null, w.value === 'unknown' ? 'unknown-value' : null].filter(Boolean).join(' ');
  return (
    <dd class={cls || undefined}>
      {w.value}
      {w.note ? <span class="fig-note">{w.note}</span> : null}
    </dd>
  );
}
