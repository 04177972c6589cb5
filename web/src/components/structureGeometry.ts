/**
 * What the plan and side views need to know about an expanded structure beyond its numbers: which
 * side a face stands on, where an element's own base lies in the body's base, and each face's
 * force vector in a given wind direction (the engine's own rule: F = c_f · q · A · ψ(δ), normal to
 * the face, from its windward to its leeward side; server/engine/directions.ts).
 *
 * Frame (server/engine/structure.ts): x from the front edge (x = 0) to the back edge, y from the
 * y = 0 end to the y = baseWidthM end; a face's facing φ is relative to the front (0 looks out of
 * the front edge, 90 out of the y = baseWidthM end).
 *
 * The engine never uses a face's position in plan (a horizontal force's moment about a base edge
 * depends on its height only), so the records do not carry one. The views draw the walls of an
 * enclosure on their sides and any other face (a board on its feet, a face of a first-round
 * record, an oblique face) across the middle of the base; see `faceSide`.
 */
import { sideName } from '../../../server/engine/caseWords.ts';
import { faceIncidence, faceNormal, wrappedDeg } from '../../../server/engine/directions.ts';
import type { AssessAnswer } from '../types.ts';

export type Expanded = AssessAnswer['expanded'];
export type Face = Expanded['faces'][number];
export type Mass = Expanded['masses'][number];
export type ElementBody = NonNullable<Expanded['elements']>[number];
export type Side = 'front' | 'endYW' | 'back' | 'endY0';

const sideByQuarter: readonly Side[] = ['front', 'endYW', 'back', 'endY0'];

/** Short name of a side for a figure ("front", "east end", "y = W end"; W is baseWidthM). */
export function sideLabel(side: Side, frontAzimuthDeg: number | null): string {
  if (frontAzimuthDeg === null) return { front: 'front', back: 'back', endY0: 'y = 0 end', endYW: 'y = W end' }[side];
  return sideName(side, frontAzimuthDeg).replace(/^the /, '');
}

/**
 * The side a face stands on, or null when its position is not known. A face is put on the side it
 * looks out of only where the structure closes that direction: it has a stated facing of 0, 90,
 * 180 or 270 and some face looks the opposite way (the walls of a tent). A lone board (a screen,
 * a banner on its feet, facing 0 with nothing facing 180), a face without a stated facing (a
 * first-round record) or an oblique face stands somewhere the record does not say: null.
 */
export function faceSide(face: Face, faces: readonly Face[]): Side | null {
  const quarter = cardinalQuarter(face);
  if (quarter === null) return null;
  const opposite = (quarter + 2) % 4;
  return faces.some((other) => cardinalQuarter(other) === opposite) ? sideByQuarter[quarter]! : null;
}

function cardinalQuarter(face: Face): number | null {
  if (face.facingDeg === undefined) return null;
  const quarter = Math.round(face.facingDeg / 90) % 4;
  return Math.abs(wrappedDeg(face.facingDeg - quarter * 90)) < 1 ? quarter : null;
}

export const facingOf = (face: Face): number => face.facingDeg ?? 0;

/** A face's force in plan at relative wind θ and dynamic pressure q: (x, y) components and size, N. */
export function faceForce(face: Face, directionDeg: number, qPa: number): { xN: number; yN: number; forceN: number } {
  const incidence = faceIncidence(directionDeg, facingOf(face));
  if (incidence.side === 'edge') return { xN: 0, yN: 0, forceN: 0 };
  const cf = incidence.side === 'front' ? face.cfFront : face.cfBack;
  const forceN = cf * qPa * face.areaM2 * incidence.share;
  const n = faceNormal(facingOf(face));
  // Wind on the front side pushes the face against its front normal; on the back side, along it.
  const sign = incidence.side === 'front' ? -1 : 1;
  return { xN: sign * n.x * forceN, yN: sign * n.y * forceN, forceN };
}

/** Where an element's own base lies in the body's base, m, and whether that came from its name. */
export interface ElementPlacement {
  x0M: number;
  y0M: number;
  depthM: number;
  widthM: number;
  known: boolean;
}

/**
 * An element is assessed on its own base in the body's frame, with masses measured from its own
 * corner; where that base sits in the body's is not part of the record. Kinds name their elements
 * by place ("end panel at the y = 0 end", "tower at the y = baseWidthM end", "back row legs"): the
 * name places it; otherwise it is drawn in the middle and said to be unplaced.
 */
export function elementPlacement(element: ElementBody, bodyDepthM: number, bodyWidthM: number | null): ElementPlacement {
  const depthM = Math.min(element.baseDepthM, bodyDepthM);
  // An element without a width of its own (one tower on its outriggers) is a strip: drawn as a
  // narrow band, an eighth of the body's width.
  const widthM = bodyWidthM === null ? (element.baseWidthM ?? 0) : Math.min(element.baseWidthM ?? bodyWidthM / 8, bodyWidthM);
  const name = element.name.toLowerCase();
  let known = false;
  let y0M = bodyWidthM === null ? 0 : (bodyWidthM - widthM) / 2;
  if (bodyWidthM !== null) {
    if (/y\s*=\s*0(?![.\d])/.test(name) || /\bfirst\b/.test(name)) {
      y0M = 0;
      known = true;
    } else if (/y\s*=\s*(basewidthm|w\b|width)/.test(name) || /\blast\b|\bfar end\b/.test(name)) {
      y0M = bodyWidthM - widthM;
      known = true;
    }
  }
  let x0M = depthM >= 0.9 * bodyDepthM ? 0 : (bodyDepthM - depthM) / 2;
  if (/\bback\b|\brear\b/.test(name)) {
    x0M = bodyDepthM - depthM;
    known = true;
  } else if (/\bfront\b/.test(name) && !/wind onto the front/.test(name)) {
    x0M = 0;
    known = true;
  }
  return { x0M, y0M, depthM, widthM, known };
}

/** Masses at (nearly) one plan point, heaviest first, as one group. */
export interface MassGroup {
  xM: number;
  yM: number;
  massesKg: number[];
  totalKg: number;
}

export function massGroups(masses: readonly Mass[], depthM: number, widthM: number, toleranceM: number): MassGroup[] {
  const groups: MassGroup[] = [];
  for (const m of masses) {
    if (m.massKg <= 0) continue;
    const yM = m.yM ?? widthM / 2;
    const near = groups.find((g) => Math.abs(g.xM - m.xM) <= toleranceM && Math.abs(g.yM - yM) <= toleranceM);
    if (near) {
      near.massesKg.push(m.massKg);
      near.totalKg += m.massKg;
    } else groups.push({ xM: Math.min(m.xM, depthM), yM, massesKg: [m.massKg], totalKg: m.massKg });
  }
  for (const g of groups) g.massesKg.sort((a, b) => b - a);
  return groups;
}

const kg = (v: number): string => Math.round(v).toLocaleString('en-GB');

/** "7,000 kg", "7,000 + 1,600 kg", or "8,600 kg (4 masses)" when a sum would be too long. */
export function massGroupText(group: MassGroup): string {
  if (group.massesKg.length === 1) return `${kg(group.totalKg)}\u00a0kg`;
  if (group.massesKg.length <= 3) return `${group.massesKg.map(kg).join(' + ')}\u00a0kg`;
  return `${kg(group.totalKg)}\u00a0kg (${group.massesKg.length} masses)`;
}
