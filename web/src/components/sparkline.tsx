/**
 * A small trend line of gusts with its axes (SVG, no chart library: it is on the board and must
 * stay light): the speed scale on the left, its top marked with the chosen unit ("30 m/s", "15",
 * "0"), the time span under it ("30 min ago" … "now"), so the line reads as a measurement.
 *
 * Gaps in the data stay gaps. The scale starts at 0 so a lull does not look like a storm; its top
 * is a round number at or above the highest value.
 */
import { mpsToSpeed, speedUnitLabels, type SpeedUnit } from '../units.ts';
import { niceTop } from './niceTop.ts';

export interface SparkPoint {
  tMs: number;
  /** m/s, null for a gap. */
  value: number | null;
}

const tickText = (v: number): string => (Number.isInteger(v) ? String(v) : v.toFixed(1));

export function Sparkline(props: { points: SparkPoint[]; fromMs: number; toMs: number; unit: SpeedUnit; label: string; width?: number; height?: number }) {
  const width = props.width ?? 300;
  const height = props.height ?? 64;
  const unitLabel = speedUnitLabels[props.unit];
  const spanMin = Math.round((props.toMs - props.fromMs) / 60_000);
  const shown = props.points
    .filter((p) => p.tMs >= props.fromMs && p.tMs <= props.toMs)
    .map((p) => ({ tMs: p.tMs, value: p.value !== null && Number.isFinite(p.value) ? mpsToSpeed(p.value, props.unit) : null }));
  const values = shown.map((p) => p.value).filter((v): v is number => v !== null);
  const xAxis = (
    <div class="spark-x" aria-hidden="true">
      <span>{spanMin} min ago</span>
      <span>{Math.round(spanMin / 2)} min ago</span>
      <span>now</span>
    </div>
  );
  if (values.length < 2) {
    return (
      <figure class="spark-chart empty" role="img" aria-label={`${props.label}: not enough readings yet`}>
        <span class="spark-y" aria-hidden="true">
          <span class="spark-tick tick-top">{unitLabel}</span>
          <span class="spark-tick tick-zero">0</span>
        </span>
        <svg width="100%" height={height} viewBox={`0 0 ${width} ${height}`} class="spark empty" aria-hidden="true">
          <line x1="0" x2={width} y1={height - 1} y2={height - 1} class="spark-axis" vector-effect="non-scaling-stroke" />
          <text x={width / 2} y={height / 2 + 5} text-anchor="middle">
            not enough readings for a trend yet
          </text>
        </svg>
        {xAxis}
      </figure>
    );
  }
  const top = niceTop(Math.max(...values));
  const span = Math.max(1, props.toMs - props.fromMs);
  const x = (t: number) => ((t - props.fromMs) / span) * width;
  const y = (v: number) => height - 1 - (v / top) * (height - 3);
  let d = '';
  let pen = false;
  for (const p of shown) {
    if (p.value === null) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${x(p.tMs).toFixed(1)} ${y(p.value).toFixed(1)} `;
    pen = true;
  }
  const high = Math.max(...values);
  return (
    <figure class="spark-chart" role="img" aria-label={`${props.label}: highest ${tickText(Math.round(high * 10) / 10)} ${unitLabel}; scale 0 to ${tickText(top)} ${unitLabel}, last ${spanMin} minutes`}>
      <span class="spark-y" aria-hidden="true">
        <span class="spark-tick tick-top">{`${tickText(top)}\u00a0${unitLabel}`}</span>
        <span class="spark-tick tick-mid">{tickText(top / 2)}</span>
        <span class="spark-tick tick-zero">0</span>
      </span>
      <svg width="100%" height={height} viewBox={`0 0 ${width} ${height}`} preserveAspectRatio="none" class="spark" aria-hidden="true">
        <line x1="0" x2={width} y1={y(top)} y2={y(top)} class="spark-grid" vector-effect="non-scaling-stroke" />
        <line x1="0" x2={width} y1={y(top / 2)} y2={y(top / 2)} class="spark-grid" vector-effect="non-scaling-stroke" />
        <line x1="0" x2={width} y1={y(0)} y2={y(0)} class="spark-axis" vector-effect="non-scaling-stroke" />
        <path d={d} class="spark-line" vector-effect="non-scaling-stroke" />
      </svg>
      {xAxis}
    </figure>
  );
}
