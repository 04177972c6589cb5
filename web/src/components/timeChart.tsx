/**
 * A time-series chart (uPlot) sized to its container, with times in the site's time zone and
 * optional horizontal bands (the level thresholds) drawn under the data.
 *
 * uPlot wants columnar data: x in seconds, one array per series, null for a gap (never 0: a gap
 * in the readings must show as a gap, not as calm).
 */
import { useEffect, useRef } from 'preact/hooks';
import type uPlot from 'uplot';
import { prefs } from '../prefs.ts';
import { useStore } from '../store.ts';
import { clockTime, dateTime, hourMinute } from '../units.ts';

export interface Band {
  scale: string;
  from: number;
  to: number;
  /** CSS variable name of the fill, e.g. "--band-l1". */
  colorVar: string;
  label: string;
}

export interface ChartSeries {
  label: string;
  scale: string;
  /** CSS variable name of the stroke colour. */
  colorVar: string;
  width?: number;
  dash?: number[];
  /** Draw points only (e.g. direction). */
  points?: boolean;
  /** Value shown in the legend and the tooltip, with its unit. */
  format: (v: number | null) => string;
}

export interface ChartAxis {
  scale: string;
  label: string;
  side: 'left' | 'right';
  format?: (v: number) => string;
  /** Fixed range, else from the data (at least up to `minMax`). */
  range?: [number, number];
  minMax?: number;
}

function cssVar(name: string): string {
  return getComputedStyle(document.documentElement).getPropertyValue(name).trim() || '#888';
}

function bandsPlugin(bands: readonly Band[]): uPlot.Plugin {
  return {
    hooks: {
      drawClear: (u: uPlot) => {
        const ctx = u.ctx;
        ctx.save();
        for (const b of bands) {
          const y0 = u.valToPos(b.from, b.scale, true);
          const y1 = u.valToPos(b.to, b.scale, true);
          const top = Math.max(u.bbox.top, Math.min(y0, y1));
          const bottom = Math.min(u.bbox.top + u.bbox.height, Math.max(y0, y1));
          if (bottom <= top) continue;
          ctx.fillStyle = cssVar(b.colorVar);
          ctx.globalAlpha = 0.22;
          ctx.fillRect(u.bbox.left, top, u.bbox.width, bottom - top);
          // A solid line at each band's lower edge and its name: the band is not colour alone.
          ctx.globalAlpha = 1;
          ctx.strokeStyle = cssVar(b.colorVar);
          ctx.lineWidth = 2 * devicePixelRatio;
          ctx.setLineDash([8 * devicePixelRatio, 5 * devicePixelRatio]);
          ctx.beginPath();
          ctx.moveTo(u.bbox.left, Math.max(y0, y1));
          ctx.lineTo(u.bbox.left + u.bbox.width, Math.max(y0, y1));
          ctx.stroke();
          ctx.setLineDash([]);
          ctx.fillStyle = cssVar('--fg');
          ctx.font = `${12 * devicePixelRatio}px system-ui, sans-serif`;
          ctx.fillText(b.label, u.bbox.left + 6 * devicePixelRatio, Math.max(y0, y1) - 5 * devicePixelRatio);
        }
        ctx.restore();
      },
    },
  };
}

export function TimeChart(props: {
  data: uPlot.AlignedData;
  series: ChartSeries[];
  axes: ChartAxis[];
  bands?: Band[];
  timeZone: string;
  height?: number;
  title: string;
  /** The x range in seconds (the whole window asked for), else the data's own range. */
  xRange?: [number, number];
}) {
  const host = useRef<HTMLDivElement | null>(null);
  const plot = useRef<uPlot | null>(null);
  // The newest data, for a chart built after the library has loaded.
  const dataRef = useRef(props.data);
  dataRef.current = props.data;
  const theme = useStore(prefs).theme;
  const shapeKey = JSON.stringify([theme, props.xRange, props.series.map((s) => [s.label, s.scale, s.colorVar]), props.axes.map((a) => [a.scale, a.label, a.range, a.minMax]), props.bands, props.timeZone, props.height]);

  useEffect(() => {
    const el = host.current;
    if (!el) return;
    let cancelled = false;
    let cleanup: (() => void) | null = null;
    void import('./uplotLoader.ts').then(({ default: UPlot }) => {
      if (cancelled) return;
      cleanup = build(UPlot, el);
    });
    return () => {
      cancelled = true;
      cleanup?.();
    };
    // The chart is rebuilt only when its shape changes; new data goes through setData below.
  }, [shapeKey]);

  function build(UPlot: typeof uPlot, el: HTMLDivElement): () => void {
    const fg = cssVar('--fg');
    const grid = cssVar('--grid');
    const scales: uPlot.Scales = { x: props.xRange ? { time: true, range: () => props.xRange! } : { time: true } };
    for (const a of props.axes) {
      scales[a.scale] = a.range
        ? { range: a.range }
        : {
            range: (_u, _min, max) => {
              const top = Math.max(max ?? 0, a.minMax ?? 0, 1);
              return [0, top * 1.08];
            },
          };
    }
    const opts: uPlot.Options = {
      width: Math.max(280, el.clientWidth),
      height: props.height ?? 260,
      tzDate: (ts) => UPlot.tzDate(new Date(ts * 1e3), props.timeZone),
      scales,
      legend: { live: true },
      cursor: { drag: { x: false, y: false } },
      series: [
        { label: 'time' },
        ...props.series.map(
          (s): uPlot.Series => ({
            label: s.label,
            scale: s.scale,
            stroke: cssVar(s.colorVar),
            width: s.width ?? 2,
            ...(s.dash ? { dash: s.dash } : {}),
            // Lines show their points only where data is sparse (uPlot's default), so a lone reading is visible.
            ...(s.points ? { paths: () => null, points: { show: true, size: 5, fill: cssVar(s.colorVar) } } : {}),
            spanGaps: false,
            value: (_u, v) => s.format(v),
          }),
        ),
      ],
      axes: [
        {
          stroke: fg,
          grid: { stroke: grid, width: 1 },
          ticks: { stroke: grid },
          space: 70,
          // 24-hour times in the site's zone; the date too when the window spans days.
          values: (u: uPlot, splits: number[]) => {
            const spanS = (u.scales.x?.max ?? 0) - (u.scales.x?.min ?? 0);
            return splits.map((s) => (spanS > 36 * 3600 ? dateTime(s * 1000, props.timeZone) : spanS < 20 * 60 ? clockTime(s * 1000, props.timeZone) : hourMinute(s * 1000, props.timeZone)));
          },
        },
        ...props.axes.map(
          (a): uPlot.Axis => ({
            scale: a.scale,
            side: a.side === 'left' ? 3 : 1,
            label: a.label,
            stroke: fg,
            grid: { show: a.side === 'left', stroke: grid, width: 1 },
            ticks: { stroke: grid },
            size: 56,
            ...(a.format ? { values: (_u: uPlot, vals: number[]) => vals.map((v) => a.format!(v)) } : {}),
          }),
        ),
      ],
      plugins: props.bands && props.bands.length > 0 ? [bandsPlugin(props.bands)] : [],
    };
    const u = new UPlot(opts, dataRef.current, el);
    plot.current = u;
    const ro = new ResizeObserver(() => u.setSize({ width: Math.max(280, el.clientWidth), height: props.height ?? 260 }));
    ro.observe(el);
    return () => {
      ro.disconnect();
      u.destroy();
      plot.current = null;
    };
  }

  useEffect(() => {
    plot.current?.setData(props.data);
  }, [props.data]);

  return (
    <figure class="chart-fig">
      <figcaption>{props.title}</figcaption>
      <div class="chart" ref={host} />
    </figure>
  );
}
