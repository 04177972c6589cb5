/**
 * A small trend line of gusts (SVG, no chart library: it is on the board and must stay light).
 * Gaps in the data stay gaps. The scale starts at 0 so a lull does not look like a storm.
 */
export interface SparkPoint {
  tMs: number;
  value: number | null;
}

export function Sparkline(props: { points: SparkPoint[]; fromMs: number; toMs: number; label: string; width?: number; height?: number }) {
  const width = props.width ?? 300;
  const height = props.height ?? 56;
  const values = props.points.map((p) => p.value).filter((v): v is number => v !== null && Number.isFinite(v));
  if (values.length < 2) {
    return (
      <svg width="100%" height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={`${props.label}: not enough readings yet`} class="spark empty">
        <text x={width / 2} y={height / 2 + 5} text-anchor="middle">not enough readings for a trend yet</text>
      </svg>
    );
  }
  const max = Math.max(...values) * 1.1 || 1;
  const span = Math.max(1, props.toMs - props.fromMs);
  const x = (t: number) => ((t - props.fromMs) / span) * width;
  const y = (v: number) => height - 2 - (v / max) * (height - 6);
  let d = '';
  let pen = false;
  for (const p of props.points) {
    if (p.value === null || !Number.isFinite(p.value) || p.tMs < props.fromMs) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${x(p.tMs).toFixed(1)} ${y(p.value).toFixed(1)} `;
    pen = true;
  }
  return (
    <svg width="100%" height={height} viewBox={`0 0 ${width} ${height}`} preserveAspectRatio="none" role="img" aria-label={props.label} class="spark">
      <path d={d} class="spark-line" vector-effect="non-scaling-stroke" />
    </svg>
  );
}
