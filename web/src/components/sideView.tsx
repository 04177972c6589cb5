/**
 * A side view of a structure as the calculator sees it: the base (its depth along the wind), each
 * wind-loaded face as a rectangle at its heights with its force arrow at the centroid, each mass
 * as a block at its position with its kilograms, the edge it tips about, and the wind.
 *
 * Faces carry only an area and a centroid height; their vertical extent comes from the kind's
 * dimensions when the record has them (a tent wall runs from the ground to the eaves), otherwise
 * a face is drawn standing on the ground (top = twice its centroid), as the engine assumes for
 * the reference height of a custom record.
 */
import type { AssessAnswer } from '../types.ts';
import { kiloNewtons } from '../units.ts';

type Extent = [number, number];

function num(v: unknown, fallback = 0): number {
  return typeof v === 'number' && Number.isFinite(v) ? v : fallback;
}

/** Vertical extent of each expanded face, m. */
export function faceExtents(record: Record<string, unknown>, faces: AssessAnswer['expanded']['faces']): Extent[] {
  switch (record.kind) {
    case 'tent': {
      const eave = num(record.eaveHeightM);
      const ridge = num(record.ridgeHeightM, eave);
      return [
        [0, eave],
        [eave, ridge],
      ];
    }
    case 'banner': {
      const z = num(record.clearanceM);
      return [[z, z + num(record.heightM)]];
    }
    case 'screen': {
      const z = num(record.bottomHeightM);
      return [[z, z + num(record.heightM)]];
    }
    case 'shell': {
      const z = num(record.baseHeightM);
      return [[z, z + num(record.radiusM)]];
    }
    default:
      return faces.map((f) => [0, 2 * f.centroidHeightM]);
  }
}

const round3 = (v: number): number => Math.round(v * 1000) / 1000;

/** Masses grouped by position (within 2 % of the base depth), heaviest first in each stack. */
function massStacks(masses: AssessAnswer['expanded']['masses'], depthM: number): Array<{ xM: number; massesKg: number[] }> {
  const stacks: Array<{ xM: number; massesKg: number[] }> = [];
  for (const m of masses) {
    if (m.massKg <= 0) continue;
    const near = stacks.find((s) => Math.abs(s.xM - m.xM) <= 0.02 * depthM);
    if (near) near.massesKg.push(m.massKg);
    else stacks.push({ xM: m.xM, massesKg: [m.massKg] });
  }
  for (const s of stacks) s.massesKg.sort((a, b) => b - a);
  return stacks;
}

export function SideView({ answer, record }: { answer: AssessAnswer; record: Record<string, unknown> }) {
  const ex = answer.expanded;
  const depth = ex.baseDepthM;
  const extents = faceExtents(record, ex.faces);
  const topM = Math.max(0.5, ...extents.map((e) => e[1]), ...ex.faces.map((f) => f.centroidHeightM));
  // Wind onto the front comes from the left and tips the structure about the back (right) edge.
  const windFromLeft = Math.cos((answer.governingDirectionDeg * Math.PI) / 180) >= 0;
  const spanM = Math.max(depth, topM * 0.9);
  // Drawing space in SVG units: a strip on top for the wind, the structure below, labels left.
  const W = 480;
  const H = 460;
  const left = 130;
  const ground = H - 96;
  const skyTop = 70;
  const scale = Math.min((W - left - 60) / spanM, (ground - skyTop) / topM);
  const X = (m: number) => left + m * scale;
  const Y = (m: number) => ground - m * scale;
  const fullDepth = record.kind === 'tent' || record.kind === 'shell';
  const panelW = Math.max(6, Math.min(depth * scale, 0.12 * depth * scale));
  const maxForce = Math.max(1, ...ex.faces.map((f) => (windFromLeft ? f.cfFront : f.cfBack) * f.areaM2));
  const maxMass = Math.max(1, ...ex.masses.map((m) => m.massKg));
  const tipX = windFromLeft ? depth : 0;

  return (
    <figure class="side-view">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`Side view: base ${depth} m deep, ${ex.faces.length} loaded faces, ${ex.masses.length} masses, tipping edge at the ${windFromLeft ? 'back' : 'front'}`}>
        <defs>
          <pattern id="hatch-ground" width="8" height="8" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <line x1="0" y1="0" x2="0" y2="8" class="sv-hatch" />
          </pattern>
          <marker id="arrow-head" viewBox="0 0 10 10" refX="8" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse">
            <path d="M0 0 L10 5 L0 10 Z" class="sv-arrowhead" />
          </marker>
        </defs>
        <rect x="0" y={ground} width={W} height="14" fill="url(#hatch-ground)" />
        <line x1="0" y1={ground} x2={W} y2={ground} class="sv-ground" />
        {/* Base depth; below it the edges, the tipping one named. */}
        <line x1={X(0)} y1={ground + 52} x2={X(depth)} y2={ground + 52} class="sv-dim" marker-start="url(#arrow-head)" marker-end="url(#arrow-head)" />
        <text x={X(depth / 2)} y={ground + 70} text-anchor="middle" class="sv-text small">
          base {depth.toFixed(2)} m
        </text>
        <text x={X(0)} y={ground + 90} text-anchor={windFromLeft ? 'middle' : 'start'} class={`sv-text small${windFromLeft ? '' : ' strong'}`}>
          {windFromLeft ? 'front' : 'front: tipping edge'}
        </text>
        <text x={X(depth)} y={ground + 90} text-anchor={windFromLeft ? 'end' : 'middle'} class={`sv-text small${windFromLeft ? ' strong' : ''}`}>
          {windFromLeft ? 'back: tipping edge' : 'back'}
        </text>
        {/* Faces */}
        {ex.faces.map((f, i) => {
          const [bottom, top] = extents[i] ?? [0, 2 * f.centroidHeightM];
          const x0 = fullDepth ? X(0) : X(depth / 2) - panelW / 2;
          const w = fullDepth ? depth * scale : panelW;
          const cfWind = windFromLeft ? f.cfFront : f.cfBack;
          const forceN = cfWind * answer.qPa * f.areaM2;
          const len = 20 + 70 * ((cfWind * f.areaM2) / maxForce);
          const y = Y(f.centroidHeightM);
          const xFace = windFromLeft ? x0 : x0 + w;
          return (
            <g key={i}>
              {record.kind === 'shell' ? (
                // A quarter sphere seen from the side: its open face up the front edge, the curve to the back.
                <path d={`M${X(0)} ${Y(bottom)} V${Y(top)} A${(top - bottom) * scale} ${(top - bottom) * scale} 0 0 1 ${X(top - bottom)} ${Y(bottom)} Z`} class={`sv-face sv-face-${i % 3}`} />
              ) : (
                <rect x={x0} y={Y(top)} width={w} height={Math.max(2, (top - bottom) * scale)} class={`sv-face sv-face-${i % 3}`} />
              )}
              <line x1={windFromLeft ? xFace - len : xFace + len} y1={y} x2={xFace - (windFromLeft ? 2 : -2)} y2={y} class="sv-force" marker-end="url(#arrow-head)" />
              <text x={windFromLeft ? xFace - len : xFace + len} y={y - 7} text-anchor={windFromLeft ? 'start' : 'end'} class="sv-text small strong">
                {kiloNewtons(forceN)}
              </text>
              <text x={x0 + w / 2} y={Y((bottom + top) / 2) + 6} text-anchor="middle" class="sv-text strong">
                {i + 1}
              </text>
            </g>
          );
        })}
        {/* Masses: block height ∝ √mass so a 10 t block does not hide a 100 kg one; masses at one
            position are stacked and labelled together. */}
        {massStacks(ex.masses, depth).map((stack, i) => {
          const w = 26;
          const cx = Math.min(Math.max(X(stack.xM), X(0) + w / 2), X(depth) - w / 2);
          let top = ground;
          const blocks = stack.massesKg.map((kg, j) => {
            const h = 8 + 22 * Math.sqrt(kg / maxMass);
            top -= h;
            return <rect key={j} x={cx - w / 2} y={top} width={w} height={h} class="sv-mass" />;
          });
          return (
            <g key={`m${i}`}>
              {blocks}
              <line x1={cx} y1={ground} x2={cx} y2={ground + 18 + (i % 2) * 16} class="sv-dim" />
              <text x={cx} y={ground + 32 + (i % 2) * 16} text-anchor={cx < X(depth / 4) ? 'start' : cx > X((3 * depth) / 4) ? 'end' : 'middle'} class="sv-text small strong">
                {stack.massesKg.map((kg) => `${Math.round(kg).toLocaleString('en-GB')}`).join(' + ')} kg
              </text>
            </g>
          );
        })}
        {/* Tipping edge */}
        <path d={`M${X(tipX)} ${ground} l-9 14 h18 Z`} class="sv-tip" />
        {/* Wind */}
        <g transform={windFromLeft ? '' : `translate(${W} 0) scale(-1 1)`}>
          <line x1="10" y1="26" x2="90" y2="26" class="sv-wind" marker-end="url(#arrow-head)" />
          <line x1="10" y1="50" x2="90" y2="50" class="sv-wind" marker-end="url(#arrow-head)" />
        </g>
        <text x={windFromLeft ? 104 : W - 104} y="44" text-anchor={windFromLeft ? 'start' : 'end'} class="sv-text strong">
          wind onto the {windFromLeft ? 'front' : 'back'}
        </text>
        {/* Height scale */}
        <line x1={W - 14} y1={ground} x2={W - 14} y2={Y(topM)} class="sv-dim" />
        <line x1={W - 20} y1={Y(topM)} x2={W - 8} y2={Y(topM)} class="sv-dim" />
        <text x={W - 14} y={Y(topM) - 6} text-anchor="end" class="sv-text small">
          {topM.toFixed(1)} m
        </text>
      </svg>
      <ol class="sv-faces small">
        {ex.faces.map((f, i) => {
          const cfWind = windFromLeft ? f.cfFront : f.cfBack;
          return (
            <li>
              {f.label ?? `face ${i + 1}`}: {f.areaM2.toFixed(1)} m², c_f {round3(cfWind)}, at {f.centroidHeightM.toFixed(2)} m → {kiloNewtons(cfWind * answer.qPa * f.areaM2)}
            </li>
          );
        })}
      </ol>
      <figcaption class="muted small">
        Drawn for the governing side at the check gust (wind onto the {windFromLeft ? 'front' : 'back'}); forces at q = {answer.qPa.toFixed(0)} Pa. Not to scale across the wind.
      </figcaption>
    </figure>
  );
}
