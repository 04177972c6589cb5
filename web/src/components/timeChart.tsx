/**
 * A time-series chart (uPlot) sized to its container, with times in the site's time zone,
 * optional horizontal level lines (bands from a threshold, drawn under the data) and a legend of
 * our own: every series by its name and unit with a sample of its line (colour and dash pattern,
 * so the chart reads in black-and-white print too), the level lines with their names and
 * thresholds, and, on screen only, a read-out of the values under the pointer. uPlot's own
 * legend is off: without a pointer (always, on paper) it shows placeholders, not values.
 *
 * uPlot wants columnar data: x in seconds, one array per series, null for a gap (never 0: a gap
 * in the readings must show as a gap, not as calm).
 *
 * The canvas takes its colours from CSS variables when it is drawn, so it is drawn again when the
 * page switches to print (the print palette is darker, on white) and back.
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
  /** CSS variable name of the fill and the line, e.g. "--l2". */
  colorVar: string;
  /** Name drawn on the line ("2 · Prepare"). */
  label: string;
  /** The legend's words for the line; default: the label and "from" the threshold in the scale's unit. */
  legend?: string;
}

export interface ChartSeries {
  label: string;
  scale: string;
  /** CSS variable name of the stroke colour. */
  colorVar: string;
  width?: number;
  /** Dash pattern in CSS pixels (line, gap, …); solid when empty or missing. */
  dash?: number[];
  /** Draw points only (e.g. direction). */
  points?: boolean;
  /** Value shown in the read-out, with its unit. */
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

/**
 * Dash patterns that stay apart in grey print: solid, long dash, dots, dash-dot, short dash,
 * dash-dot-dot, long-short, dot-dash-long. With the six `--multi-*` colours (cycled apart from
 * the dashes) the first 24 series each have their own pair.
 */
export const seriesDashes: readonly (readonly number[])[] = [[], [10, 5], [2, 4], [12, 4, 2, 4], [5, 4], [10, 3, 2, 3, 2, 3], [16, 5, 4, 5], [2, 3, 2, 3, 10, 3]];
const multiColours = 6;

/** Colour and dash of the i-th of several like series (one per structure). */
export function multiSeriesStyle(i: number): { colorVar: string; dash: number[] } {
  return { colorVar: `--multi-${i % multiColours}`, dash: [...seriesDashes[(i + Math.floor(i / seriesDashes.length)) % seriesDashes.length]!] };
}

/** The dash a level line is drawn with: long dash, long gap, unlike every series pattern. */
const levelLineDash = [14, 4, 3, 4, 3, 4];

function cssVar(name: string): string {
  return getComputedStyle(document.documentElement).getPropertyValue(name).trim() || '#888';
}

function bandsPlugin(bands: readonly Band[]): uPlot.Plugin {
  return {
    hooks: {
      drawClear: (u: uPlot) => {
        const ctx = u.ctx;
        const px = devicePixelRatio;
        ctx.save();
        for (const b of bands) {
          const y0 = u.valToPos(b.from, b.scale, true);
          const y1 = u.valToPos(b.to, b.scale, true);
          const top = Math.max(u.bbox.top, Math.min(y0, y1));
          const bottom = Math.min(u.bbox.top + u.bbox.height, Math.max(y0, y1));
          if (bottom <= top) continue;
          ctx.fillStyle = cssVar(b.colorVar);
          ctx.globalAlpha = 0.18;
          ctx.fillRect(u.bbox.left, top, u.bbox.width, bottom - top);
          // A line at each band's threshold and its name on it: the level is not colour alone.
          ctx.globalAlpha = 1;
          ctx.strokeStyle = cssVar(b.colorVar);
          ctx.lineWidth = 2 * px;
          ctx.setLineDash(levelLineDash.map((v) => v * px));
          ctx.beginPath();
          ctx.moveTo(u.bbox.left, Math.max(y0, y1));
          ctx.lineTo(u.bbox.left + u.bbox.width, Math.max(y0, y1));
          ctx.stroke();
          ctx.setLineDash([]);
        }
        ctx.restore();
      },
      // The names over everything drawn (lines and data), so nothing crosses a name; a name that
      // would sit on an earlier one moves along its line instead.
      draw: (u: uPlot) => {
        const ctx = u.ctx;
        const px = devicePixelRatio;
        ctx.save();
        const drawn: Array<{ band: Band; y: number }> = [];
        for (const b of bands) {
          const y = Math.max(u.valToPos(b.from, b.scale, true), u.valToPos(b.to, b.scale, true));
          if (y >= u.bbox.top && y <= u.bbox.top + u.bbox.height) drawn.push({ band: b, y });
        }
        ctx.font = `600 ${12 * px}px system-ui, sans-serif`;
        // uPlot leaves the alignment of its last axis labels on the context.
        ctx.textAlign = 'left';
        ctx.textBaseline = 'alphabetic';
        const placed: Array<{ x0: number; x1: number; y0: number; y1: number }> = [];
        for (const { band, y: lineY } of drawn) {
          const text = band.label;
          const w = ctx.measureText(text).width;
          const y = lineY - 5 * px;
          let x = u.bbox.left + 6 * px;
          for (let moved = true; moved; ) {
            moved = false;
            for (const r of placed) {
              if (x - 3 * px < r.x1 && x + w + 3 * px > r.x0 && y - 12 * px < r.y1 && y + 3 * px > r.y0) {
                x = r.x1 + 10 * px;
                moved = true;
              }
            }
          }
          placed.push({ x0: x - 3 * px, x1: x + w + 3 * px, y0: y - 12 * px, y1: y + 3 * px });
          // A backing in the page colour so the name stays legible.
          ctx.fillStyle = cssVar('--bg');
          ctx.globalAlpha = 0.85;
          ctx.fillRect(x - 3 * px, y - 12 * px, w + 6 * px, 15 * px);
          ctx.globalAlpha = 1;
          ctx.fillStyle = cssVar('--fg');
          ctx.fillText(text, x, y);
        }
        ctx.restore();
      },
    },
  };
}

/** A sample of a series' line for the legend: the same colour, width and dash as on the chart. */
function LineSample({ colorVar, dash, width, points }: { colorVar: string; dash: readonly number[] | undefined; width: number; points?: boolean }) {
  return (
    <svg class="legend-sample" width="44" height="14" viewBox="0 0 44 14" aria-hidden="true" data-dash={points ? 'dots' : (dash ?? []).join(',') || 'solid'} data-colour={colorVar}>
      {points ? (
        [6, 17, 28, 39].map((x) => <circle cx={x} cy="7" r="2.6" style={{ fill: `var(${colorVar})` }} />)
      ) : (
        <line x1="1" y1="7" x2="43" y2="7" style={{ stroke: `var(${colorVar})`, strokeWidth: width, strokeDasharray: dash && dash.length > 0 ? dash.join(' ') : 'none' }} />
      )}
    </svg>
  );
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
  const readout = useRef<HTMLParagraphElement | null>(null);
  const plot = useRef<uPlot | null>(null);
  // The newest props, for a chart built after the library has loaded or redrawn for print.
  const propsRef = useRef(props);
  propsRef.current = props;
  const theme = useStore(prefs).theme;
  const shapeKey = JSON.stringify([
    theme,
    props.xRange,
    props.series.map((s) => [s.label, s.scale, s.colorVar, s.dash, s.width, s.points]),
    props.axes.map((a) => [a.scale, a.label, a.range, a.minMax]),
    props.bands,
    props.timeZone,
    props.height,
  ]);

  useEffect(() => {
    const el = host.current;
    if (!el) return;
    let cancelled = false;
    let teardown: (() => void) | null = null;
    let UPlotClass: typeof uPlot | null = null;
    // Synchronous, so a redraw on `beforeprint` is on the canvas before the page is printed.
    const rebuild = (): void => {
      if (cancelled || !UPlotClass) return;
      teardown?.();
      teardown = build(UPlotClass, el);
    };
    const printQuery = matchMedia('print');
    printQuery.addEventListener('change', rebuild);
    addEventListener('beforeprint', rebuild);
    addEventListener('afterprint', rebuild);
    void import('./uplotLoader.ts').then(({ default: UPlot }) => {
      UPlotClass = UPlot;
      rebuild();
    });
    return () => {
      cancelled = true;
      printQuery.removeEventListener('change', rebuild);
      removeEventListener('beforeprint', rebuild);
      removeEventListener('afterprint', rebuild);
      teardown?.();
      teardown = null;
    };
    // The chart is rebuilt only when its shape changes; new data goes through setData below.
  }, [shapeKey]);

  function build(UPlot: typeof uPlot, el: HTMLDivElement): () => void {
    const p = propsRef.current;
    const fg = cssVar('--fg');
    const grid = cssVar('--grid');
    const px = devicePixelRatio;
    const scales: uPlot.Scales = { x: p.xRange ? { time: true, range: () => p.xRange! } : { time: true } };
    for (const a of p.axes) {
      scales[a.scale] = a.range
        ? { range: a.range }
        : {
            range: (_u, _min, max) => {
              const top = Math.max(max ?? 0, a.minMax ?? 0, 1);
              return [0, top * 1.08];
            },
          };
    }
    const showReadout = (u: uPlot): void => {
      const out = readout.current;
      if (!out) return;
      const i = u.cursor.idx;
      if (i === null || i === undefined) {
        out.textContent = 'Point at or tap the chart to read its values.';
        return;
      }
      const t = u.data[0][i];
      const values = p.series.map((s, k) => `${s.label} ${s.format((u.data[k + 1]?.[i] as number | null | undefined) ?? null)}`);
      out.textContent = t === undefined ? '' : `${clockTime(t * 1000, p.timeZone)} · ${values.join(' · ')}`;
    };
    const opts: uPlot.Options = {
      width: Math.max(280, el.clientWidth),
      height: p.height ?? 260,
      tzDate: (ts) => UPlot.tzDate(new Date(ts * 1e3), p.timeZone),
      scales,
      legend: { show: false },
      cursor: { drag: { x: false, y: false } },
      hooks: { setCursor: [showReadout] },
      series: [
        { label: 'time' },
        ...p.series.map(
          (s): uPlot.Series => ({
            label: s.label,
            scale: s.scale,
            stroke: cssVar(s.colorVar),
            width: s.width ?? 2,
            ...(s.dash && s.dash.length > 0 ? { dash: s.dash.map((v) => v * px) } : {}),
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
            return splits.map((s) => (spanS > 36 * 3600 ? dateTime(s * 1000, p.timeZone) : spanS < 20 * 60 ? clockTime(s * 1000, p.timeZone) : hourMinute(s * 1000, p.timeZone)));
          },
        },
        ...p.axes.map(
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
      plugins: p.bands && p.bands.length > 0 ? [bandsPlugin(p.bands)] : [],
    };
    const u = new UPlot(opts, p.data, el);
    plot.current = u;
    showReadout(u);
    const ro = new ResizeObserver(() => u.setSize({ width: Math.max(280, el.clientWidth), height: propsRef.current.height ?? 260 }));
    ro.observe(el);
    return () => {
      ro.disconnect();
      u.destroy();
      if (plot.current === u) plot.current = null;
    };
  }

  useEffect(() => {
    plot.current?.setData(props.data);
  }, [props.data]);

  const bandLegend = (b: Band): string => {
    if (b.legend) return b.legend;
    const s = props.series.find((x) => x.scale === b.scale);
    return `${b.label}: from ${s ? s.format(b.from) : b.from}`;
  };

  return (
    <figure class="chart-fig">
      <figcaption>{props.title}</figcaption>
      <ul class="chart-legend" aria-label="Legend">
        {props.series.map((s) => (
          <li class="legend-series">
            <LineSample colorVar={s.colorVar} dash={s.dash} width={s.width ?? 2} points={s.points} />
            <span>{s.label}</span>
          </li>
        ))}
        {(props.bands ?? []).map((b) => (
          <li class="legend-level">
            <LineSample colorVar={b.colorVar} dash={levelLineDash} width={2} />
            <span>{bandLegend(b)}</span>
          </li>
        ))}
      </ul>
      <p class="chart-readout no-print" ref={readout} aria-hidden="true" />
      <div class="chart" ref={host} />
    </figure>
  );
}
