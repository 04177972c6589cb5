/**
 * A wind rose of a window (SVG): how often the wind came from each of 16 directions, stacked by
 * speed band. Each sample is one history bucket with both a mean and a direction; buckets without
 * a direction are counted apart ("direction unknown"), not dropped silently.
 */
import { compassPoint, speedNumber, speedUnitLabels, type SpeedUnit } from '../units.ts';

/** Speed bands of the mean, m/s: roughly Beaufort 0–3, 4, 5, 6 and above. */
const bandEdgesMps = [0, 5.5, 8, 10.8, 13.9];

export interface RoseSample {
  dirDeg: number | null;
  meanMps: number | null;
}

export function WindRose({ samples, unit, size = 300 }: { samples: RoseSample[]; unit: SpeedUnit; size?: number }) {
  const counts = Array.from({ length: 16 }, () => new Array<number>(bandEdgesMps.length).fill(0));
  let withDir = 0;
  let withoutDir = 0;
  for (const s of samples) {
    if (s.meanMps === null) continue;
    if (s.dirDeg === null) {
      withoutDir++;
      continue;
    }
    const sector = Math.round((((s.dirDeg % 360) + 360) % 360) / 22.5) % 16;
    let band = 0;
    for (let i = 0; i < bandEdgesMps.length; i++) if (s.meanMps >= bandEdgesMps[i]!) band = i;
    counts[sector]![band]!++;
    withDir++;
  }
  if (withDir === 0) return <p class="unknown-box">No direction readings in this window: no wind rose.</p>;
  const c = size / 2;
  const rMax = size / 2 - 28;
  const maxSector = Math.max(...counts.map((bands) => bands.reduce((a, b) => a + b, 0)));
  const radius = (n: number) => (n / maxSector) * rMax;
  const wedge = (sector: number, r0: number, r1: number) => {
    const a0 = ((sector * 22.5 - 9) * Math.PI) / 180;
    const a1 = ((sector * 22.5 + 9) * Math.PI) / 180;
    const p = (r: number, a: number) => `${(c + r * Math.sin(a)).toFixed(1)} ${(c - r * Math.cos(a)).toFixed(1)}`;
    return `M${p(r0, a0)} L${p(r1, a0)} A${r1} ${r1} 0 0 1 ${p(r1, a1)} L${p(r0, a1)} A${r0} ${r0} 0 0 0 ${p(r0, a0)} Z`;
  };
  const bandLabel = (i: number) =>
    i + 1 < bandEdgesMps.length ? `${speedNumber(bandEdgesMps[i]!, unit)}–${speedNumber(bandEdgesMps[i + 1]!, unit)} ${speedUnitLabels[unit]}` : `≥ ${speedNumber(bandEdgesMps[i]!, unit)} ${speedUnitLabels[unit]}`;
  const top = counts.map((b, i) => [i, b.reduce((x, y) => x + y, 0)] as const).sort((a, b) => b[1] - a[1])[0]!;

  return (
    <figure class="rose">
      <svg width={size} height={size} viewBox={`0 0 ${size} ${size}`} role="img" aria-label={`Wind rose: most often from ${compassPoint(top[0] * 22.5)} (${Math.round((top[1] / withDir) * 100)} % of the time)`}>
        {[0.25, 0.5, 0.75, 1].map((f) => (
          <circle cx={c} cy={c} r={rMax * f} class="rose-ring" />
        ))}
        {['N', 'E', 'S', 'W'].map((t, i) => {
          const a = (i * 90 * Math.PI) / 180;
          return (
            <text x={c + (rMax + 14) * Math.sin(a)} y={c - (rMax + 14) * Math.cos(a) + 5} text-anchor="middle" class="rose-label">
              {t}
            </text>
          );
        })}
        {counts.map((bands, sector) => {
          let acc = 0;
          return bands.map((n, band) => {
            if (n === 0) return null;
            const r0 = radius(acc);
            acc += n;
            return <path d={wedge(sector, r0, radius(acc))} class={`rose-b${band}`} />;
          });
        })}
      </svg>
      <figcaption>
        <ul class="rose-key">
          {bandEdgesMps.map((_, i) => (
            <li>
              <span class={`swatch rose-b${i}`} aria-hidden="true" />
              {bandLabel(i)} (mean)
            </li>
          ))}
        </ul>
        <p class="muted small">
          Most often from {compassPoint(top[0] * 22.5)} ({Math.round((top[1] / withDir) * 100)}&nbsp;%). Outer ring = {Math.round((maxSector / withDir) * 100)}&nbsp;% of the time.
          {withoutDir > 0 ? ` ${withoutDir} periods without a direction are not in the rose.` : ''}
        </p>
      </figcaption>
    </figure>
  );
}
