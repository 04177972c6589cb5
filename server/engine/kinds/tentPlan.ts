/**
 * The tent in plan (kinds/tent.ts): its four sides, named as the base edges they stand on, which
 * way each looks and their words; the plan rectangles the roof zones and the frames' strips are
 * measured in (x from the front edge, y from the y = 0 gable end, design §2.3); and which part of
 * the tent a face belongs to, for the frames' shares.
 */
import type { Face } from '../structure.ts';

/** The four sides of a tent, named as the base edges they stand on (stability.ts `Edge`). */
export const tentSides = ['front', 'endYW', 'back', 'endY0'] as const;
export type TentSide = (typeof tentSides)[number];
export type SideState = 'closed' | 'open';

/** Which way each side looks, relative to the front (design §2.3). */
export const sideFacingDeg: Readonly<Record<TentSide, number>> = { front: 0, endYW: 90, back: 180, endY0: 270 };
/** The side across the tent from each side. */
export const oppositeSide: Readonly<Record<TentSide, TentSide>> = { front: 'back', back: 'front', endY0: 'endYW', endYW: 'endY0' };
/** Each side in words. */
export const sideWords: Readonly<Record<TentSide, string>> = {
  front: 'front wall',
  back: 'back wall',
  endY0: 'gable end at y = 0',
  endYW: 'gable end at y = lengthM',
};
/** Wind onto each side, in words. */
export const windWords: Readonly<Record<TentSide, string>> = {
  front: 'wind onto the front',
  back: 'wind onto the back',
  endY0: 'wind onto the y = 0 gable end',
  endYW: 'wind onto the y = lengthM gable end',
};
/** Each side as the object of "onto", in words. */
export const ontoWords: Readonly<Record<TentSide, string>> = {
  front: 'the front',
  back: 'the back',
  endY0: 'the y = 0 gable end',
  endYW: 'the y = lengthM gable end',
};

/** A rectangle in plan, m: x from the front edge, y from the y = 0 end. */
export interface Rect {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

/** The roof in plan and the ridge height (EN Figure 7.8: h, the height to the ridge; the higher h gives the wider edge zones). */
export interface Plan {
  lengthM: number;
  widthM: number;
  ridgeHeightM: number;
}

/** Area of a plan rectangle, m² (0 when it is empty). */
export function areaOf(rect: Rect): number {
  return Math.max(0, rect.x1 - rect.x0) * Math.max(0, rect.y1 - rect.y0);
}

/** The part of two plan rectangles that both cover (empty when they do not meet). */
export function overlap(a: Rect, b: Rect): Rect {
  return { x0: Math.max(a.x0, b.x0), x1: Math.min(a.x1, b.x1), y0: Math.max(a.y0, b.y0), y1: Math.min(a.y1, b.y1) };
}

/** Which part of the tent a face belongs to: the long walls and roof rise run along the ridge; a gable's faces stand at its end. */
export type FacePart = 'alongRidge' | 'endY0' | 'endYW';

/** A face of the tent and the part it belongs to. */
export interface TaggedFace {
  face: Face;
  part: FacePart;
}

/** A figure for words (labels, notes, the internal pressure found): rounded to 0.001. */
export function round(value: number): number {
  return Math.round(value * 1000) / 1000;
}
