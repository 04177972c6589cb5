/**
 * A side view of the governing case as the calculator sees it: the base along the wind, each
 * wind-loaded face at its height with its extent and its force arrow at the centroid (the force's
 * component along the view, in the governing wind), each mass as a block at its position with its
 * kilograms, the uplift, the edge the overturning check tips about, the height the gust is taken
 * at, and the wind coming from the side it comes from.
 *
 * The view looks along the base edge that matters: across the depth (front on the left, back on
 * the right) when the case tips about the front or back edge or the wind is more onto the front
 * or back; along the width (y = 0 end on the left) when it tips about an end or the wind is more
 * onto an end. A structure with elements can be drawn part by part (the governing one first).
 *
 * Faces carry an area and a centroid height only. Their extent comes from the heights the record
 * gives (a tent wall from the ground to the eaves, a screen from its bottom edge up), taken so
 * that the centroid is in the middle: from the highest such level below the centroid to as far
 * above it. Towers, legs and masts stand on the ground. Without any level (a custom record), a
 * face stands on the ground up to twice its centroid, as the custom record's reference height
 * assumes. The horizontal width is the face's area over that height, seen at its facing.
 */
import { useState } from 'preact/hooks';
import { windWords } from '../../../server/engine/caseWords.ts';
import type { Criterion, Edge } from '../../../server/engine/stability.ts';
import type { AssessAnswer, StructureKind } from '../types.ts';
import { kindForms, type KindForm } from '../register/kinds/index.ts';
import { kiloNewtons } from '../units.ts';
import { placeLabels, spreadAlong, spreadInRows, textWidth, type Box } from './labelLayout.ts';
import { faceForce, faceSide, facingOf, massGroupText, sideLabel, type Face, type Mass, type MassGroup } from './structureGeometry.ts';
import { engineWords, partName } from './assessmentSummary.tsx';

type Extent = [number, number];
type Uplift = NonNullable<AssessAnswer['expanded']['uplift']>;

const radiansPerDegree = Math.PI / 180;
const viewWidth = 480;
const viewHeight = 480;
const font = 16;
const rowHeight = 20;
const maxArrowPx = 84;
/** Labels that stand on the ground whatever levels the record gives. */
const standsOnGround = /\b(towers?|legs?|masts?|poles?|posts?|uprights?)\b/i;

/** The kind's drawing data (register/kinds/<kind>.ts), or null for a record without a known kind. */
function kindFormOf(record: Readonly<Record<string, unknown>>): KindForm | null {
  return typeof record.kind === 'string' && Object.hasOwn(kindForms, record.kind) ? kindForms[record.kind as StructureKind] : null;
}

/** Heights the record gives where a face may start (above the ground), m: the kind's `faceLevelsM`. */
function recordLevelsM(record: Record<string, unknown>): number[] {
  const levels = kindFormOf(record)?.faceLevelsM(record) ?? [];
  return levels.filter((v): v is number => v !== null && v > 0);
}

/** Vertical extent of a face, m (see the module comment). */
export function faceExtent(face: Face, levelsM: readonly number[]): Extent {
  const c = face.centroidHeightM;
  const below = standsOnGround.test(face.label ?? '') ? [0] : [0, ...levelsM.filter((level) => level < c - 1e-6)];
  const bottom = Math.max(...below);
  return [bottom, Math.max(2 * c - bottom, bottom + 0.05)];
}

interface Part {
  key: string;
  title: string;
  faces: Face[];
  masses: Mass[];
  depthM: number;
  widthM: number | null;
  uplift: Uplift | null;
  directionDeg: number;
  edge: Edge;
  criterion: Criterion;
  upliftN: number;
  element: boolean;
}

function partsOf(answer: AssessAnswer): Part[] {
  const ex = answer.expanded;
  // The body's own worst direction: the governing case when the body governs, else the body's entry
  // that is worst among the directions the report lists for it.
  let body = { directionDeg: answer.governingDirectionDeg, edge: answer.governingEdge, criterion: answer.governing, upliftN: answer.upliftN };
  if (answer.governingElement !== null) {
    const own = answer.directions.filter((d) => d.element === null);
    const worst = own.reduce<(typeof own)[number] | null>((a, b) => (a === null || (b.utilization.governing ?? Infinity) > (a.utilization.governing ?? Infinity) ? b : a), null);
    if (worst) body = { directionDeg: worst.directionDeg, edge: worst.tippingEdge, criterion: worst.governing, upliftN: worst.upliftN };
  }
  const parts: Part[] = [
    {
      key: '',
      title: 'whole structure',
      faces: ex.faces,
      masses: ex.masses,
      depthM: ex.baseDepthM,
      widthM: ex.baseWidthM ?? null,
      uplift: ex.uplift ?? null,
      ...body,
      element: false,
    },
  ];
  for (const report of answer.elements) {
    const element = ex.elements?.find((e) => e.name === report.name);
    if (!element) continue;
    parts.push({
      key: report.name,
      title: report.name,
      faces: element.faces,
      masses: element.masses,
      depthM: element.baseDepthM,
      widthM: element.baseWidthM ?? null,
      uplift: element.uplift ?? null,
      directionDeg: report.governingDirectionDeg,
      edge: report.tippingEdge,
      criterion: report.governing,
      upliftN: report.upliftN,
      element: true,
    });
  }
  return parts;
}

/** The wind's words wrapped to lines no wider than `maxWidth` (words kept whole). */
function windLines(text: string, maxWidth: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    const next = line === '' ? word : `${line} ${word}`;
    if (line !== '' && textWidth(next, font, true) > maxWidth) {
      lines.push(line);
      line = word;
    } else line = next;
  }
  if (line !== '') lines.push(line);
  return lines;
}

export function SideView({ answer, record, frontAzimuthDeg = null }: { answer: AssessAnswer; record: Record<string, unknown>; frontAzimuthDeg?: number | null }) {
  // Elements' names with their ends by compass, as the list and the governing words say them.
  const kind = typeof record.kind === 'string' ? (record.kind as StructureKind) : null;
  const parts = partsOf(answer).map((p) => (p.element ? { ...p, title: partName(p.title, frontAzimuthDeg, kind) } : p));
  const governingKey = answer.governingElement ?? '';
  const [chosen, setChosen] = useState<string | null>(null);
  const part = parts.find((p) => p.key === (chosen ?? governingKey)) ?? parts[0]!;
  return (
    <figure class="side-view">
      {parts.length > 1 ? (
        <div class="seg wrap sv-parts" role="group" aria-label="Part drawn">
          {parts.map((p) => (
            <button type="button" class={p.key === part.key ? 'on' : ''} aria-pressed={p.key === part.key} onClick={() => setChosen(p.key)}>
              {p.title}
              {p.key === governingKey ? ' (governs)' : ''}
            </button>
          ))}
        </div>
      ) : null}
      <SideDrawing answer={answer} record={record} part={part} frontAzimuthDeg={frontAzimuthDeg} />
    </figure>
  );
}

function SideDrawing({ answer, record, part, frontAzimuthDeg }: { answer: AssessAnswer; record: Record<string, unknown>; part: Part; frontAzimuthDeg: number | null }) {
  const kind = typeof record.kind === 'string' ? (record.kind as StructureKind) : null;
  const theta = part.directionDeg;
  const strip = part.widthM === null;
  // Which way to look: the tipping edge decides for overturning, else the wind's larger component.
  const alongEnds = !strip && (part.criterion === 'overturning' ? part.edge === 'endY0' || part.edge === 'endYW' : Math.abs(Math.sin(theta * radiansPerDegree)) > Math.abs(Math.cos(theta * radiansPerDegree)));
  const axis: 'x' | 'y' = alongEnds ? 'y' : 'x';
  const spanM = axis === 'x' ? part.depthM : part.widthM!;
  const travelAlong = axis === 'x' ? Math.cos(theta * radiansPerDegree) : -Math.sin(theta * radiansPerDegree);
  const fromLeft = travelAlong >= -1e-9;
  const names = axis === 'x' ? [sideLabel('front', frontAzimuthDeg), sideLabel('back', frontAzimuthDeg)] : [sideLabel('endY0', frontAzimuthDeg), sideLabel('endYW', frontAzimuthDeg)];
  const tipAtRight = axis === 'x' ? part.edge === 'back' : part.edge === 'endYW';
  // The edge is marked only where the case is overturning: a sliding or uplift case tips about nothing.
  const tipKnown = part.criterion === 'overturning' && (axis === 'x' ? part.edge === 'front' || part.edge === 'back' : part.edge === 'endY0' || part.edge === 'endYW');

  // ---- faces: extent, position along the view, force in the governing wind ----
  // An element is a part of the same record: its faces start at the same levels.
  const levels = recordLevelsM(record);
  const faces = part.faces.map((face, i) => {
    const [bottom, top] = faceExtent(face, levels);
    const phi = facingOf(face) * radiansPerDegree;
    const planAlong = axis === 'x' ? Math.abs(Math.sin(phi)) : Math.abs(Math.cos(phi));
    const widthM = Math.min(spanM, (face.areaM2 / (top - bottom)) * planAlong);
    const side = faceSide(face, part.faces);
    const at: 'start' | 'end' | 'middle' =
      axis === 'x' ? (side === 'front' ? 'start' : side === 'back' ? 'end' : 'middle') : side === 'endY0' ? 'start' : side === 'endYW' ? 'end' : 'middle';
    const force = faceForce(face, theta, answer.qPa);
    const alongN = axis === 'x' ? force.xN : force.yN;
    return { face, i, bottom, top, widthM, at, alongN, forceN: force.forceN };
  });
  const topM = Math.max(0.5, ...faces.map((f) => f.top), answer.expanded.referenceHeightM * (part.element ? 0 : 1));
  const maxAlong = Math.max(1e-9, ...faces.map((f) => Math.abs(f.alongN)));
  const loaded = faces.filter((f) => Math.abs(f.alongN) > 0.01 * maxAlong);

  // ---- horizontal layout: labels and arrows on the windward side, the height scale leeward ----
  const labelTexts = loaded.map((f) => `${f.i + 1} · ${kiloNewtons(Math.abs(f.alongN))}`);
  const labelW = Math.min(150, Math.max(60, ...labelTexts.map((t) => textWidth(t, font, true))));
  const windward = labelW + 14 + maxArrowPx;
  const leeward = 70;
  const availPx = viewWidth - windward - leeward;
  const skyTop = 92;
  const ground = viewHeight - 128;
  const scale = Math.min(availPx / Math.max(spanM, 0.1), (ground - skyTop) / topM);
  const drawnSpan = spanM * scale;
  const x0 = (fromLeft ? windward : leeward) + (availPx - drawnSpan) / 2;
  const U = (m: number) => x0 + m * scale;
  const Y = (m: number) => ground - m * scale;

  // Rectangles of the faces; thin ones at one position are set side by side.
  const thinAt = new Map<string, number>();
  const rects = faces.map((f) => {
    const w = Math.max(7, f.widthM * scale);
    let left = f.at === 'start' ? U(0) : f.at === 'end' ? U(spanM) - w : U(spanM / 2) - w / 2;
    if (w < 14) {
      const k = thinAt.get(f.at) ?? 0;
      thinAt.set(f.at, k + 1);
      const step = 10 * Math.ceil(k / 2) * (k % 2 === 1 ? 1 : -1);
      left += f.at === 'start' ? 10 * k : f.at === 'end' ? -10 * k : step;
    }
    left = Math.min(Math.max(left, U(0) - 4), U(spanM) - w + 4);
    return { ...f, left, w, yTop: Y(f.top), yBottom: Y(f.bottom), yc: Y(f.face.centroidHeightM) };
  });

  // Arrows at the true centroid heights; labels in one column, pushed apart, with leaders.
  const arrows = rects
    .filter((r) => Math.abs(r.alongN) > 0.01 * maxAlong)
    .map((r) => {
      const len = 22 + (maxArrowPx - 22) * (Math.abs(r.alongN) / maxAlong);
      const hit = fromLeft ? r.left : r.left + r.w;
      const tail = fromLeft ? hit - len : hit + len;
      return { r, hit: fromLeft ? hit - 2 : hit + 2, tail, text: `${r.i + 1} · ${kiloNewtons(Math.abs(r.alongN))}` };
    });
  const column = fromLeft ? Math.min(...arrows.map((a) => a.tail), viewWidth) - 6 : Math.max(...arrows.map((a) => a.tail), 0) + 6;
  const spread = spreadAlong(
    arrows.map((a) => ({ centre: a.r.yc, size: rowHeight })),
    skyTop - 20,
    ground - 2,
    1,
  ).centres;

  // ---- masses: stacked blocks, labels in rows under the ground ----
  const groups: MassGroup[] = [];
  for (const m of part.masses) {
    if (m.massKg <= 0) continue;
    const u = axis === 'x' ? m.xM : (m.yM ?? spanM / 2);
    const near = groups.find((g) => Math.abs(g.xM - u) <= 0.02 * spanM);
    if (near) {
      near.massesKg.push(m.massKg);
      near.totalKg += m.massKg;
    } else groups.push({ xM: Math.min(u, spanM), yM: 0, massesKg: [m.massKg], totalKg: m.massKg });
  }
  for (const g of groups) g.massesKg.sort((a, b) => b - a);
  groups.sort((a, b) => a.xM - b.xM);
  const maxKg = Math.max(1, ...groups.map((g) => g.totalKg));
  const blockW = 24;
  const massTexts = groups.map((g) => massGroupText(g));
  const massWidths = massTexts.map((t) => textWidth(t, font, true));
  const blockCentres = groups.map((g) => Math.min(Math.max(U(g.xM), U(0) + blockW / 2), U(spanM) - blockW / 2));
  const massLayout = spreadInRows(
    blockCentres.map((c, i) => ({ centre: c, size: massWidths[i]! })),
    4,
    viewWidth - 4,
    8,
    3,
  );
  const massRows = massLayout.rowCount;
  const massX = massLayout;
  const massRowOf = massLayout.rows;
  const massRowY = (row: number) => ground + 34 + row * rowHeight;
  const edgeRowY = massRowY(massRows) + 8;

  // Edge names and the base's length in one row.
  const leftName = `${names[0]}${tipKnown && !tipAtRight ? ': tipping edge' : ''}`;
  const rightName = `${names[1]}${tipKnown && tipAtRight ? ': tipping edge' : ''}`;
  const spanText = `${spanM.toFixed(2)} m`;
  const edgeTexts = [leftName, spanText, rightName];
  const edgeWidths = edgeTexts.map((t) => textWidth(t, font, t !== spanText));
  const edgeRow = spreadInRows(
    [
      { centre: U(0), size: edgeWidths[0]! },
      { centre: U(spanM / 2), size: edgeWidths[1]! },
      { centre: U(spanM), size: edgeWidths[2]! },
    ],
    4,
    viewWidth - 4,
    10,
    3,
  );
  const edgeRowYs = edgeRow.rows.map((row) => edgeRowY + row * rowHeight);
  // Taller than the standard frame only when labels needed more rows.
  const svgHeight = Math.max(viewHeight, edgeRowY + (edgeRow.rowCount - 1) * rowHeight + 18);

  // ---- the wind, the uplift, the height scale ----
  const windText = windWords(theta, frontAzimuthDeg, strip);
  const lines = windLines(windText, viewWidth - 96 - 8);
  const windBox: Box = { x: 0, y: 0, width: viewWidth, height: 24 + lines.length * rowHeight + 6 };
  const upliftAt = part.uplift ? (axis === 'x' ? (part.uplift.xM ?? spanM / 2) : (part.uplift.yM ?? spanM / 2)) : spanM / 2;
  const showUplift = part.upliftN > 0;
  const upliftText = `uplift ${kiloNewtons(part.upliftN)}`;
  const upliftX = U(Math.min(upliftAt, spanM));
  const upliftTop = Math.max(windBox.height + 8, Y(topM) - 46);
  const scaleX = fromLeft ? viewWidth - 24 : 24;
  const refM = part.element ? null : answer.expanded.referenceHeightM;
  const scaleMarks = [
    { m: topM, text: `${topM.toFixed(1)} m` },
    ...(refM !== null && Math.abs(refM - topM) > 0.05 ? [{ m: refM, text: `gust at ${refM.toFixed(1)} m` }] : []),
  ];
  const markYs = spreadAlong(
    scaleMarks.map((mark) => ({ centre: Y(mark.m), size: rowHeight })),
    windBox.height,
    ground - 4,
    1,
  ).centres;

  const scaleBoxes: Box[] = scaleMarks.map((mark, i) => {
    const w = textWidth(mark.text, font);
    return { x: fromLeft ? scaleX - 9 - w : scaleX + 9, y: markYs[i]! - rowHeight / 2, width: w, height: rowHeight };
  });
  const upliftLabel = showUplift
    ? placeLabels(
        [{ x: upliftX, y: upliftTop + 10, width: textWidth(upliftText, font, true), height: rowHeight, offset: 8 }],
        [windBox, ...scaleBoxes, ...arrows.map((a, i) => ({ x: fromLeft ? column - labelW : column, y: spread[i]! - rowHeight / 2, width: labelW, height: rowHeight }))],
        { x: 2, y: windBox.height, width: viewWidth - 4, height: ground - windBox.height },
      )[0]!
    : null;
  // ---- outline of the kind, for recognition (behind the faces) ----
  // The kind's own (register/kinds/<kind>.ts `sideOutline`: a tent's gable, a shell's curve), for the whole structure only.
  const outline: string | null = part.element ? null : (kindFormOf(record)?.sideOutline?.(record, { axis, spanM, u: U, y: Y, scale }) ?? null);

  const seenFrom = axis === 'x' ? 'across the depth, front on the left' : 'along the width, the y = 0 end on the left';
  return (
    <>
      <svg viewBox={`0 0 ${viewWidth} ${svgHeight}`} role="img" data-testid="side-view" aria-label={`Side view of the ${part.title}, ${seenFrom}: ${faces.length} loaded faces, ${groups.length} mass positions, ${windText}`}>
        <defs>
          <pattern id="hatch-ground" width="8" height="8" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <line x1="0" y1="0" x2="0" y2="8" class="sv-hatch" />
          </pattern>
          <marker id="arrow-head" viewBox="0 0 10 10" refX="8" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse">
            <path d="M0 0 L10 5 L0 10 Z" class="sv-arrowhead" />
          </marker>
        </defs>
        <rect x="0" y={ground} width={viewWidth} height="14" fill="url(#hatch-ground)" />
        <line x1="0" y1={ground} x2={viewWidth} y2={ground} class="sv-ground" />
        {outline ? <path d={outline} class="sv-outline" /> : null}
        {/* Faces: their extent, thick; those the wind does not load here, faint */}
        {rects.map((r) => (
          <rect key={`f${r.i}`} x={r.left} y={r.yTop} width={r.w} height={Math.max(2, r.yBottom - r.yTop)} class={`sv-face sv-face-${r.i % 3}${Math.abs(r.alongN) > 0.01 * maxAlong ? '' : ' unloaded'}`} />
        ))}
        {rects.map((r) => (
          <line key={`c${r.i}`} x1={r.left - 3} y1={r.yc} x2={r.left + r.w + 3} y2={r.yc} class="sv-centroid" />
        ))}
        {/* Force arrows at the centroids, their labels in a column */}
        {arrows.map((a, i) => {
          const y = spread[i]!;
          const textX = column;
          return (
            <g key={`a${a.r.i}`}>
              <line x1={a.tail} y1={a.r.yc} x2={a.hit} y2={a.r.yc} class="sv-force" marker-end="url(#arrow-head)" />
              {Math.abs(y - a.r.yc) > 2 || Math.abs(textX - a.tail) > 8 ? <line x1={textX + (fromLeft ? 2 : -2)} y1={y} x2={a.tail} y2={a.r.yc} class="sv-leader" /> : null}
              <text x={textX} y={y + 5} text-anchor={fromLeft ? 'end' : 'start'} class="sv-text small strong">
                {a.text}
              </text>
            </g>
          );
        })}
        {/* Masses: block height ∝ √mass so a 10 t block does not hide a 100 kg one */}
        {groups.map((g, i) => {
          const cx = blockCentres[i]!;
          // One block per position, its height ∝ √(total mass), so a stack of legs does not tower.
          const h = 8 + 26 * Math.sqrt(g.totalKg / maxKg);
          const blocks = <rect x={cx - blockW / 2} y={ground - h} width={blockW} height={h} class="sv-mass" />;
          const ly = massRowY(massRowOf[i]!);
          return (
            <g key={`m${i}`}>
              {blocks}
              <line x1={cx} y1={ground} x2={massX.centres[i]!} y2={ly - 14} class="sv-dim" />
              <text x={massX.centres[i]!} y={ly} text-anchor="middle" class="sv-text small strong">
                {massTexts[i]}
              </text>
            </g>
          );
        })}
        {/* Base and its edges */}
        <line x1={U(0)} y1={ground + 8} x2={U(spanM)} y2={ground + 8} class="sv-base" />
        {tipKnown ? <path d={`M${U(tipAtRight ? spanM : 0)} ${ground} l-9 14 h18 Z`} class="sv-tip" /> : null}
        {edgeTexts.map((t, i) => (
          <text key={`e${i}`} x={edgeRow.centres[i]!} y={edgeRowYs[i]! + 10} text-anchor="middle" class={`sv-text small${i !== 1 ? ' strong' : ''}${(i === 0 && tipKnown && !tipAtRight) || (i === 2 && tipKnown && tipAtRight) ? ' sv-tip-text' : ''}`}>
            {t}
          </text>
        ))}
        {/* Uplift */}
        {showUplift && upliftLabel ? (
          <g>
            <line x1={upliftX} y1={Y(topM) - 4} x2={upliftX} y2={upliftTop} class="sv-uplift" marker-end="url(#arrow-head)" />
            <text x={upliftLabel.x + upliftLabel.width / 2} y={upliftLabel.y + rowHeight - 5} text-anchor="middle" class="sv-text small strong">
              {upliftText}
            </text>
          </g>
        ) : null}
        {/* Wind, from the side it comes from */}
        <g transform={fromLeft ? '' : `translate(${viewWidth} 0) scale(-1 1)`}>
          <line x1="10" y1="20" x2="80" y2="20" class="sv-wind" marker-end="url(#arrow-head)" />
          <line x1="10" y1="40" x2="80" y2="40" class="sv-wind" marker-end="url(#arrow-head)" />
        </g>
        {lines.map((line, i) => (
          <text key={`w${i}`} x={fromLeft ? 96 : viewWidth - 96} y={26 + i * rowHeight} text-anchor={fromLeft ? 'start' : 'end'} class="sv-text small strong">
            {line}
          </text>
        ))}
        {/* Height scale, with the height the gust is taken at */}
        <line x1={scaleX} y1={ground} x2={scaleX} y2={Y(topM)} class="sv-dim" />
        {scaleMarks.map((mark, i) => (
          <g key={`h${i}`}>
            <line x1={scaleX - 6} y1={Y(mark.m)} x2={scaleX + 6} y2={Y(mark.m)} class="sv-dim" />
            <text x={fromLeft ? scaleX - 9 : scaleX + 9} y={markYs[i]! + 5} text-anchor={fromLeft ? 'end' : 'start'} class="sv-text small">
              {mark.text}
            </text>
          </g>
        ))}
      </svg>
      <ol class="sv-faces small">
        {faces.map((f) => {
          const incidence = Math.abs(f.alongN) > 0.01 * maxAlong ? `${kiloNewtons(f.forceN)} normal to it, ${kiloNewtons(Math.abs(f.alongN))} along this view` : 'not loaded along this view';
          return (
            <li key={f.i}>
              {f.face.label ? engineWords(f.face.label, kind) : `face ${f.i + 1}`}: {f.face.areaM2.toFixed(1)} m² at {f.face.centroidHeightM.toFixed(2)} m (drawn {f.bottom.toFixed(2)}–{f.top.toFixed(2)} m), c_f {f.face.cfFront.toFixed(2)} front / {f.face.cfBack.toFixed(2)} back → {incidence}
            </li>
          );
        })}
      </ol>
      <figcaption class="muted small">
        The {part.title}, seen {seenFrom}, in the governing wind of this part ({windText}) at q = {answer.qPa.toFixed(0)} Pa. Faces are drawn at the heights the numbers use; their place along the base is only drawn, the result does not depend on it.
      </figcaption>
    </>
  );
}
