/**
 * The structure seen from above as the calculator sees it: the base rectangle (front edge at the
 * top, so the y = 0 end is on the left and the y = baseWidthM end on the right, as on a map turned
 * so that the front looks up), each mass as a dot sized by its mass with its kilograms, the faces
 * as thick lines on the side they look toward, the uplift point(s), the elements' own bases, the
 * governing wind as an arrow coming from outside the base, and north when the orientation is known.
 *
 * Frame (server/engine/structure.ts, directions.ts): x from the front edge (x = 0) to the back
 * edge, y from the y = 0 end; θ = 0 is wind onto the front (travelling +x, down the drawing), 90
 * onto the y = baseWidthM end (travelling −y, right to left). A screen direction turned clockwise
 * by α from "up" is the azimuth front + α: the drawing is a map turned, never mirrored.
 *
 * A strip record (no baseWidthM) has no ends: its depth is drawn with the width dashed, and the
 * figure says that the ends were not checked.
 */
import { compassPointName } from '../../../server/engine/caseWords.ts';
import type { AssessAnswer, StructureKind } from '../types.ts';
import { nearestPoint, overlaps, placeLabels, textWidth, type Box, type PointLabel } from './labelLayout.ts';
import { elementPlacement, faceSide, facingOf, massGroups, massGroupText, sideLabel, type Side } from './structureGeometry.ts';
import { engineWords, partName } from './assessmentSummary.tsx';

const radiansPerDegree = Math.PI / 180;
/** viewBox width; the height follows the base's shape. */
const viewWidth = 480;
/** Room around the base for the wind arrow, the edge names and labels pushed outside. */
const margin = 84;
const labelFont = 16;
const labelHeight = 19;
/** A side drawn shorter than this (a 24 m × 1.4 m fence run) is stretched, and the caption says so. */
const minimumSidePx = 64;

type Pt = { x: number; y: number };

/** Where the ray from `c` toward −t leaves the rectangle: the windward point of the base. */
function windwardPoint(c: Pt, t: Pt, halfW: number, halfH: number): Pt {
  const sx = Math.abs(t.x) < 1e-9 ? Infinity : halfW / Math.abs(t.x);
  const sy = Math.abs(t.y) < 1e-9 ? Infinity : halfH / Math.abs(t.y);
  const s = Math.min(sx, sy);
  return { x: c.x - t.x * s, y: c.y - t.y * s };
}

/** A line through `c` along `dir`, clipped to the box. */
function clipThrough(c: Pt, dir: Pt, box: Box): [Pt, Pt] {
  const ts: number[] = [];
  const tx = (edge: number) => (edge - c.x) / dir.x;
  const ty = (edge: number) => (edge - c.y) / dir.y;
  if (Math.abs(dir.x) > 1e-9) ts.push(tx(box.x), tx(box.x + box.width));
  if (Math.abs(dir.y) > 1e-9) ts.push(ty(box.y), ty(box.y + box.height));
  const within = ts.filter((t) => {
    const p = { x: c.x + dir.x * t, y: c.y + dir.y * t };
    return p.x >= box.x - 1e-6 && p.x <= box.x + box.width + 1e-6 && p.y >= box.y - 1e-6 && p.y <= box.y + box.height + 1e-6;
  });
  const lo = Math.min(...within);
  const hi = Math.max(...within);
  return [
    { x: c.x + dir.x * lo, y: c.y + dir.y * lo },
    { x: c.x + dir.x * hi, y: c.y + dir.y * hi },
  ];
}

function segmentBoxes(a: Pt, b: Pt, thickness: number): Box[] {
  const steps = Math.max(1, Math.ceil(Math.hypot(b.x - a.x, b.y - a.y) / 24));
  const boxes: Box[] = [];
  for (let i = 0; i <= steps; i++) {
    const p = { x: a.x + ((b.x - a.x) * i) / steps, y: a.y + ((b.y - a.y) * i) / steps };
    boxes.push({ x: p.x - thickness / 2, y: p.y - thickness / 2, width: thickness, height: thickness });
  }
  return boxes;
}

export function PlanView({ answer, frontAzimuthDeg, kind = null }: { answer: AssessAnswer; frontAzimuthDeg: number | null; kind?: StructureKind | null }) {
  const ex = answer.expanded;
  const depthM = ex.baseDepthM;
  const strip = ex.baseWidthM === undefined;
  const widthM = ex.baseWidthM ?? 0;
  const innerW = viewWidth - 2 * margin;

  // Scales: screen x per metre of y (sy), screen y per metre of x (sx); equal unless a side is stretched.
  let pxW: number;
  let pxD: number;
  let stretched: 'depth' | 'width' | null = null;
  if (strip) {
    pxW = innerW;
    pxD = Math.min(170, Math.max(90, depthM * 40));
  } else {
    const s = Math.min(innerW / widthM, 320 / depthM);
    pxW = widthM * s;
    pxD = depthM * s;
    if (pxD < minimumSidePx) {
      pxD = minimumSidePx;
      stretched = 'depth';
    } else if (pxW < minimumSidePx) {
      pxW = minimumSidePx;
      stretched = 'width';
    }
  }
  const sy = strip ? 0 : pxW / widthM;
  const sx = pxD / depthM;
  const bottomExtra = strip ? 24 : 0;
  const viewHeight = pxD + 2 * margin + bottomExtra;
  const base: Box = { x: (viewWidth - pxW) / 2, y: margin, width: pxW, height: pxD };
  const at = (xM: number, yM: number): Pt => ({ x: strip ? base.x + pxW / 2 : base.x + yM * sy, y: base.y + xM * sx });
  const centre: Pt = { x: base.x + pxW / 2, y: base.y + pxD / 2 };
  const bounds: Box = { x: 2, y: 2, width: viewWidth - 4, height: viewHeight - 4 };

  const obstacles: Box[] = [];
  // Lines a label may sit on (its background keeps it readable): the faces.
  const softObstacles: Box[] = [];
  const thetaDeg = answer.governingDirectionDeg;
  const overturningEdge = answer.governing === 'overturning' && answer.governingElement === null ? answer.governingEdge : null;

  // ---- the governing wind: from outside the base toward its windward side ----
  const travel: Pt = { x: -Math.sin(thetaDeg * radiansPerDegree), y: Math.cos(thetaDeg * radiansPerDegree) };
  const entry = windwardPoint(centre, travel, pxW / 2, pxD / 2);
  const arrowEnd = { x: entry.x - travel.x * 8, y: entry.y - travel.y * 8 };
  const arrowLength = Math.min(62, margin - 18);
  const arrowStart = { x: arrowEnd.x - travel.x * arrowLength, y: arrowEnd.y - travel.y * arrowLength };
  obstacles.push(...segmentBoxes(arrowStart, arrowEnd, 14));
  const windFrom = frontAzimuthDeg === null ? `wind at θ = ${Math.round(thetaDeg)}°` : `wind from the ${compassPointName(frontAzimuthDeg + thetaDeg)}`;

  // ---- north, in the corner farthest from the wind arrow ----
  const corners: Pt[] = [
    { x: 36, y: 36 },
    { x: viewWidth - 36, y: 36 },
    { x: 36, y: viewHeight - 36 },
    { x: viewWidth - 36, y: viewHeight - 36 },
  ];
  const northAt = corners.reduce((a, b) => (Math.hypot(b.x - arrowStart.x, b.y - arrowStart.y) > Math.hypot(a.x - arrowStart.x, a.y - arrowStart.y) ? b : a));
  // North lies at −front azimuth from "up" (the front looks up the drawing).
  const northRad = frontAzimuthDeg === null ? 0 : (-frontAzimuthDeg * Math.PI) / 180;
  const northLetter = { x: northAt.x + Math.sin(northRad) * 24, y: northAt.y - Math.cos(northRad) * 24 };
  if (frontAzimuthDeg !== null) obstacles.push({ x: northAt.x - 32, y: northAt.y - 32, width: 64, height: 64 });

  // ---- a strip's missing width, said under the base (clear of the wind arrow) ----
  const stripText = 'width not given: ends not checked';
  let stripNote: { x: number; y: number; box: Box } | null = null;
  if (strip) {
    const w = textWidth(stripText, labelFont, true);
    const y = base.y + pxD + 8 + 2 * labelHeight + 4;
    for (const x of [centre.x, base.x + w / 2, base.x + pxW - w / 2]) {
      const box = { x: x - w / 2, y: y - labelHeight + 4, width: w, height: labelHeight };
      stripNote ??= { x, y, box };
      if (!obstacles.some((o) => overlaps(box, o, 2))) {
        stripNote = { x, y, box };
        break;
      }
    }
    obstacles.push(stripNote!.box);
  }

  // ---- edges and their names ----
  const edgeLines: Record<Side, [Pt, Pt]> = {
    front: [{ x: base.x, y: base.y }, { x: base.x + pxW, y: base.y }],
    back: [{ x: base.x, y: base.y + pxD }, { x: base.x + pxW, y: base.y + pxD }],
    endY0: [{ x: base.x, y: base.y }, { x: base.x, y: base.y + pxD }],
    endYW: [{ x: base.x + pxW, y: base.y }, { x: base.x + pxW, y: base.y + pxD }],
  };
  const edgeNames: Array<{ side: Side; text: string; box: Box; x: number; y: number; rotate: number }> = [];
  for (const side of ['front', 'back', 'endY0', 'endYW'] as const) {
    if (strip && (side === 'endY0' || side === 'endYW')) continue;
    const text = `${sideLabel(side, frontAzimuthDeg)}${overturningEdge === side ? ': tipping edge' : ''}`;
    const w = textWidth(text, labelFont, true);
    const along = side === 'front' || side === 'back' ? pxW : pxD;
    // Along the edge, outside it: the middle first, then toward either end, away from the wind arrow.
    const reach = along / 2 + w / 2;
    const shifts = [0];
    for (let step = 8; step <= reach; step += 8) shifts.push(step, -step);
    let chosen: { box: Box; x: number; y: number } | null = null;
    for (const shift of shifts) {
      let box: Box;
      let x: number;
      let y: number;
      if (side === 'front' || side === 'back') {
        x = centre.x + shift;
        y = side === 'front' ? base.y - 8 : base.y + pxD + 8 + labelHeight - 4;
        box = { x: x - w / 2, y: y - labelHeight + 4, width: w, height: labelHeight };
      } else {
        // The ends' names run along their edges (turned), so a long compass name still fits the margin.
        x = side === 'endY0' ? base.x - 10 : base.x + pxW + 10;
        y = centre.y + shift;
        box = { x: x - labelHeight / 2 - 2, y: y - w / 2, width: labelHeight, height: w };
      }
      const candidate = { box, x, y };
      chosen ??= candidate;
      if (box.x < bounds.x || box.y < bounds.y || box.x + box.width > bounds.x + bounds.width || box.y + box.height > bounds.y + bounds.height) continue;
      if (!obstacles.some((o) => overlaps(box, o, 2))) {
        chosen = candidate;
        break;
      }
    }
    obstacles.push(chosen!.box);
    edgeNames.push({ side, text, ...chosen!, rotate: side === 'endY0' ? -90 : side === 'endYW' ? 90 : 0 });
  }

  // ---- faces: on their side, or across the middle when their position is not known ----
  const perSide = new Map<Side, number>();
  const acrossByFacing = new Map<number, number>();
  const unplaced = ex.faces.map((f) => (faceSide(f, ex.faces) === null ? Math.round(facingOf(f)) % 180 : null));
  const faceLines = ex.faces.map((face, i) => {
    const side = faceSide(face, ex.faces);
    const phi = facingOf(face) * radiansPerDegree;
    const normal: Pt = { x: Math.sin(phi), y: -Math.cos(phi) };
    let a: Pt;
    let b: Pt;
    if (side !== null && !(strip && (side === 'endY0' || side === 'endYW'))) {
      const k = perSide.get(side) ?? 0;
      perSide.set(side, k + 1);
      const inset = 4 + 7 * k;
      const [p, q] = edgeLines[side];
      // Inward: against the side's outward normal (which is the face's front normal here).
      a = { x: p.x - normal.x * inset, y: p.y - normal.y * inset };
      b = { x: q.x - normal.x * inset, y: q.y - normal.y * inset };
      const shorten = side === 'front' || side === 'back' ? { x: 6, y: 0 } : { x: 0, y: 6 };
      a = { x: a.x + shorten.x, y: a.y + shorten.y };
      b = { x: b.x - shorten.x, y: b.y - shorten.y };
    } else {
      const key = unplaced[i]!;
      const same = unplaced.filter((u) => u === key).length;
      const k = acrossByFacing.get(key) ?? 0;
      acrossByFacing.set(key, k + 1);
      const offset = (k - (same - 1) / 2) * 9;
      const c = { x: centre.x + normal.x * offset, y: centre.y + normal.y * offset };
      [a, b] = clipThrough(c, { x: normal.y * -1, y: normal.x }, { x: base.x + 6, y: base.y + 6, width: pxW - 12, height: pxD - 12 });
    }
    softObstacles.push(...segmentBoxes(a, b, 8));
    const mid = { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 };
    return { i, a, b, mid, normal, across: side === null || (strip && (side === 'endY0' || side === 'endYW')) };
  });

  // ---- elements' own bases ----
  const elements = (ex.elements ?? []).map((element) => {
    const place = elementPlacement(element, depthM, strip ? null : widthM);
    const p0 = at(place.x0M, place.y0M);
    const w = strip ? Math.max(30, pxW * 0.18) : Math.max(8, place.widthM * sy);
    const h = Math.max(8, place.depthM * sx);
    const x = strip ? centre.x - w / 2 : p0.x;
    return { element, place, box: { x: Math.min(x, base.x + pxW - w), y: Math.min(p0.y, base.y + pxD - h), width: w, height: h }, governs: answer.governingElement === element.name };
  });

  // ---- uplift points ----
  const governingCase = answer.directions.find((d) => Math.abs(d.directionDeg - thetaDeg) < 1e-6)?.upliftCase ?? null;
  const uplifts = [
    ...(ex.uplift ? [{ label: ex.uplift.label ?? 'uplift', xM: ex.uplift.xM ?? depthM / 2, yM: ex.uplift.yM ?? widthM / 2, governs: governingCase === null || governingCase === ex.uplift.label }] : []),
    ...(ex.upliftCases ?? []).map((u, i) => ({
      label: u.label ?? `uplift case ${i + 1}`,
      xM: u.xM ?? depthM / 2,
      yM: u.yM ?? widthM / 2,
      governs: governingCase !== null && governingCase === u.label,
    })),
  ].map((u) => ({ ...u, p: at(u.xM, u.yM) }));
  for (const u of uplifts) obstacles.push({ x: u.p.x - 10, y: u.p.y - 10, width: 20, height: 20 });

  // ---- masses ----
  const groups = massGroups(ex.masses, depthM, widthM, 0.02 * Math.max(depthM, widthM)).sort((g, h) => h.totalKg - g.totalKg);
  const maxKg = Math.max(1, ...groups.map((g) => g.totalKg));
  const points = groups.map((g) => at(g.xM, g.yM));
  // Dots in a tight row (a fence's feet, a tent's legs) shrink so they stay apart.
  let nearestPx = Infinity;
  for (let i = 0; i < points.length; i++) for (let j = i + 1; j < points.length; j++) nearestPx = Math.min(nearestPx, Math.hypot(points[i]!.x - points[j]!.x, points[i]!.y - points[j]!.y));
  const largestR = Math.max(4, Math.min(14, nearestPx / 2 - 1));
  const dots = groups.map((g, i) => ({ g, p: points[i]!, r: Math.min(largestR, 4 + 10 * Math.sqrt(g.totalKg / maxKg)), text: massGroupText(g) }));
  for (const dot of dots) obstacles.push({ x: dot.p.x - dot.r, y: dot.p.y - dot.r, width: 2 * dot.r, height: 2 * dot.r });
  // Three or more equal masses in a line along an edge get one label ("13 × 250 kg"), the others their own.
  const rowOf = new Map<number, number>();
  const rows: Array<{ members: number[]; text: string; x: number; y: number; offset: number }> = [];
  for (const along of ['x', 'y'] as const) {
    const buckets = new Map<string, number[]>();
    dots.forEach((d, i) => {
      if (rowOf.has(i) || d.g.massesKg.length > 1) return;
      const line = along === 'x' ? d.g.xM : d.g.yM;
      const key = `${Math.round(d.g.totalKg * 2)}|${Math.round(line * 100)}`;
      buckets.set(key, [...(buckets.get(key) ?? []), i]);
    });
    for (const members of buckets.values()) {
      if (members.length < 3 || (strip && along === 'y')) continue;
      const rowIndex = rows.length;
      for (const i of members) rowOf.set(i, rowIndex);
      const xs = members.map((i) => dots[i]!.p.x);
      const ys = members.map((i) => dots[i]!.p.y);
      const kgText = massGroupText(dots[members[0]!]!.g);
      rows.push({ members, text: `${members.length} × ${kgText}`, x: (Math.min(...xs) + Math.max(...xs)) / 2, y: (Math.min(...ys) + Math.max(...ys)) / 2, offset: dots[members[0]!]!.r + 3 });
    }
  }
  const singles = dots.filter((_, i) => !rowOf.has(i));
  // Uplift points are numbered in the drawing when their names are long or several; the list names them.
  const numberUplifts = uplifts.length > 1 || uplifts.some((u) => u.label.length > 14);
  const upliftText = (i: number) => (numberUplifts ? `↑${i + 1}` : `↑ ${uplifts[i]!.label}`);

  // ---- labels around points: the wind first, then masses (heaviest first), uplift, faces, elements ----
  const pointLabels: Array<PointLabel & { text: string; kind: string; bold?: boolean }> = [
    { x: arrowStart.x, y: arrowStart.y, text: windFrom, kind: 'wind', bold: true, offset: 6, width: textWidth(windFrom, labelFont, true), height: labelHeight },
    ...rows.map((r) => ({ x: r.x, y: r.y, text: r.text, kind: 'mass', bold: true, offset: r.offset, width: textWidth(r.text, labelFont, true), height: labelHeight })),
    ...singles.map((d) => ({ x: d.p.x, y: d.p.y, text: d.text, kind: 'mass', bold: true, offset: d.r + 3, width: textWidth(d.text, labelFont, true), height: labelHeight })),
    ...uplifts.map((u, i) => ({ x: u.p.x, y: u.p.y, text: upliftText(i), kind: 'uplift', bold: true, offset: 12, width: textWidth(upliftText(i), labelFont, true), height: labelHeight })),
    ...faceLines.map((f) => ({ x: f.mid.x, y: f.mid.y, text: String(f.i + 1), kind: 'face', bold: true, offset: 6, width: textWidth(String(f.i + 1), labelFont, true) + 6, height: labelHeight })),
    ...elements.map((e) => {
      const text = partName(e.element.name, frontAzimuthDeg, kind);
      return { x: e.box.x + e.box.width / 2, y: e.box.y + e.box.height / 2, text, kind: 'element', offset: Math.min(e.box.width, e.box.height) / 2 + 4, width: textWidth(text, labelFont - 2), height: labelHeight - 2 };
    }),
  ];
  const placed = placeLabels(pointLabels, obstacles, bounds, 2, softObstacles);

  const description = strip
    ? `Plan: base ${depthM.toFixed(2)} m deep, width not given (ends not checked); ${groups.length} mass points; ${ex.faces.length} faces; ${windFrom}.`
    : `Plan: base ${depthM.toFixed(2)} m deep by ${widthM.toFixed(2)} m wide; ${groups.length} mass points; ${ex.faces.length} faces; ${windFrom}.`;

  return (
    <figure class="plan-view">
      <svg viewBox={`0 0 ${viewWidth} ${viewHeight}`} role="img" aria-label={description} data-testid="plan-view">
        <defs>
          <marker id="pv-head" viewBox="0 0 10 10" refX="8" refY="5" markerWidth="5" markerHeight="5" orient="auto-start-reverse">
            <path d="M0 0 L10 5 L0 10 Z" class="pv-wind-head" />
          </marker>
        </defs>
        {/* Base */}
        {strip ? (
          <g>
            <rect x={base.x + pxW * 0.2} y={base.y} width={pxW * 0.6} height={pxD} class="pv-base pv-base-fill" />
            <line x1={base.x + pxW * 0.2} y1={base.y} x2={base.x + pxW * 0.8} y2={base.y} class="pv-edge" />
            <line x1={base.x + pxW * 0.2} y1={base.y + pxD} x2={base.x + pxW * 0.8} y2={base.y + pxD} class="pv-edge" />
            {[0, 1].map((end) => (
              <g key={end}>
                <line x1={end ? base.x + pxW * 0.8 : base.x} y1={base.y} x2={end ? base.x + pxW : base.x + pxW * 0.2} y2={base.y} class="pv-edge pv-unknown" />
                <line x1={end ? base.x + pxW * 0.8 : base.x} y1={base.y + pxD} x2={end ? base.x + pxW : base.x + pxW * 0.2} y2={base.y + pxD} class="pv-edge pv-unknown" />
                <line x1={end ? base.x + pxW : base.x} y1={base.y} x2={end ? base.x + pxW : base.x} y2={base.y + pxD} class="pv-edge pv-unknown" />
              </g>
            ))}
            {stripNote ? (
              <text x={stripNote.x} y={stripNote.y} text-anchor="middle" class="pv-text strong pv-warn">
                {stripText}
              </text>
            ) : null}
          </g>
        ) : (
          <rect x={base.x} y={base.y} width={pxW} height={pxD} class="pv-base pv-base-fill" />
        )}
        {!strip
          ? (['front', 'back', 'endY0', 'endYW'] as const).map((side) => {
              const [p, q] = edgeLines[side];
              return <line key={side} x1={p.x} y1={p.y} x2={q.x} y2={q.y} class={`pv-edge${overturningEdge === side ? ' pv-tip' : ''}`} />;
            })
          : overturningEdge === 'front' || overturningEdge === 'back'
            ? (() => {
                const [p, q] = edgeLines[overturningEdge];
                return <line x1={p.x} y1={p.y} x2={q.x} y2={q.y} class="pv-edge pv-tip" />;
              })()
            : null}
        {/* Elements' own bases */}
        {elements.map((e) => (
          <rect key={e.element.name} x={e.box.x} y={e.box.y} width={e.box.width} height={e.box.height} class={`pv-element${e.governs ? ' governs' : ''}${e.place.known ? '' : ' unplaced'}`} />
        ))}
        {/* Faces, with a tick toward the way their front side looks */}
        {faceLines.map((f) => (
          <g key={`f${f.i}`} class={`pv-face pv-face-${f.i % 3}${f.across ? ' across' : ''}`}>
            <line x1={f.a.x} y1={f.a.y} x2={f.b.x} y2={f.b.y} />
            <path d={`M${f.mid.x + f.normal.y * 5} ${f.mid.y - f.normal.x * 5} L${f.mid.x + f.normal.x * 9} ${f.mid.y + f.normal.y * 9} L${f.mid.x - f.normal.y * 5} ${f.mid.y + f.normal.x * 5} Z`} class="pv-face-tick" />
          </g>
        ))}
        {/* Uplift points */}
        {uplifts.map((u, i) => (
          <g key={`u${i}`} class={`pv-uplift${u.governs ? ' governs' : ''}`}>
            <circle cx={u.p.x} cy={u.p.y} r="9" />
            <path d={`M${u.p.x} ${u.p.y + 5} V${u.p.y - 5} M${u.p.x - 4} ${u.p.y - 1} L${u.p.x} ${u.p.y - 5} L${u.p.x + 4} ${u.p.y - 1}`} />
          </g>
        ))}
        {/* Masses */}
        {dots.map((d, i) => (
          <circle key={`m${i}`} cx={d.p.x} cy={d.p.y} r={d.r} class="pv-mass" />
        ))}
        {/* Wind */}
        <line x1={arrowStart.x} y1={arrowStart.y} x2={arrowEnd.x} y2={arrowEnd.y} class="pv-wind" marker-end="url(#pv-head)" />
        {/* North */}
        {frontAzimuthDeg !== null ? (
          <g class="pv-north" aria-hidden="true">
            <circle cx={northAt.x} cy={northAt.y} r="14" />
            <g transform={`rotate(${-frontAzimuthDeg} ${northAt.x} ${northAt.y})`}>
              <path d={`M${northAt.x} ${northAt.y - 12} L${northAt.x + 6} ${northAt.y + 9} L${northAt.x} ${northAt.y + 5} L${northAt.x - 6} ${northAt.y + 9} Z`} />
            </g>
            <text x={northLetter.x} y={northLetter.y} text-anchor="middle" dominant-baseline="central" class="pv-north-n">
              N
            </text>
          </g>
        ) : null}
        {/* Edge names */}
        {edgeNames.map((e) => (
          <text key={e.side} x={e.x} y={e.y} text-anchor="middle" dominant-baseline={e.rotate === 0 ? undefined : 'central'} transform={e.rotate === 0 ? undefined : `rotate(${e.rotate} ${e.x} ${e.y})`} class={`pv-text strong${overturningEdge === e.side ? ' pv-tip-text' : ''}`}>
            {e.text}
          </text>
        ))}
        {/* Point labels, with a leader where one had to move away */}
        {placed.map((box, i) => {
          const label = pointLabels[i]!;
          const to = nearestPoint(box, label.x, label.y);
          return (
            <g key={`l${i}`}>
              {box.leader ? <line x1={label.x} y1={label.y} x2={to.x} y2={to.y} class="pv-leader" /> : null}
              <rect x={box.x - 1} y={box.y} width={box.width + 2} height={box.height} rx="3" class="pv-label-bg" />
              <text x={box.x + box.width / 2} y={box.y + box.height - 4} text-anchor="middle" class={`pv-text pv-${label.kind}-text${label.bold ? ' strong' : ''}${label.kind === 'element' ? ' small' : ''}`}>
                {label.text}
              </text>
            </g>
          );
        })}
      </svg>
      <ol class="pv-faces small">
        {ex.faces.map((f, i) => {
          const side = faceSide(f, ex.faces);
          return (
            <li key={i}>
              <span class={`pv-swatch pv-face-${i % 3}`} aria-hidden="true" /> {f.label ? engineWords(f.label, kind) : `face ${i + 1}`}: {f.areaM2.toFixed(1)} m², looks {f.facingDeg === undefined ? 'toward the front (position not given: drawn across the base)' : side ? `out of the ${sideLabel(side, frontAzimuthDeg)}` : `${Math.round(f.facingDeg)}° from the front (drawn across the base)`}
            </li>
          );
        })}
      </ol>
      {numberUplifts ? (
        <ul class="pv-uplifts small">
          {uplifts.map((u, i) => (
            <li key={i}>
              <strong>↑{i + 1}</strong> {engineWords(u.label, kind)}
              {u.governs ? ' (in the governing wind)' : ''}
            </li>
          ))}
        </ul>
      ) : null}
      <figcaption class="muted small">
        Seen from above, front at the top. {strip ? `Base ${depthM.toFixed(2)} m deep; its width is not given, so wind onto the ends was not checked.` : `Base ${depthM.toFixed(2)} m deep × ${widthM.toFixed(2)} m wide (W).`}
        {stretched ? ` The ${stretched} is drawn wider than to scale so the masses can be told apart.` : ''} Dots: masses, larger for more kilograms. A face's plan position does not change the result (only its height and facing do).
        {elements.some((e) => !e.place.known) ? ' A dashed element base whose place is not given is drawn in the middle.' : ''}
      </figcaption>
    </figure>
  );
}
