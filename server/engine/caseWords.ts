/**
 * What governs, in words a crew and an engineer read the same way: "wind onto the y = 0 end:
 * sliding", "end panel at the y = 0 end, wind onto the front: overturning about the back edge".
 * With the structure's front azimuth known, ends and winds are named by compass point
 * ("wind from the WSW onto the west end").
 */
import { azimuthDeg, wrappedDeg } from './directions.ts';
import type { Criterion, Edge } from './stability.ts';

const compassPoints = ['N', 'NNE', 'NE', 'ENE', 'E', 'ESE', 'SE', 'SSE', 'S', 'SSW', 'SW', 'WSW', 'W', 'WNW', 'NW', 'NNW'] as const;
const sideCompass = ['north', 'north-east', 'east', 'south-east', 'south', 'south-west', 'west', 'north-west'] as const;

/** 16-point compass name of an azimuth. */
export function compassPointName(azimuth: number): string {
  return compassPoints[Math.round(azimuthDeg(azimuth) / 22.5) % 16]!;
}

/** 8-point name of the way a side looks ("east"). */
function sideLooksName(azimuth: number): string {
  return sideCompass[Math.round(azimuthDeg(azimuth) / 45) % 8]!;
}

type SideKey = 'front' | 'endYW' | 'back' | 'endY0';
const sideOrder: readonly SideKey[] = ['front', 'endYW', 'back', 'endY0'];
const sidePlain: Readonly<Record<SideKey, string>> = {
  front: 'the front',
  endYW: 'the y = baseWidthM end',
  back: 'the back',
  endY0: 'the y = 0 end',
};

/** Name of a side of the structure; with its front azimuth, by the way it looks ("the east end"). */
export function sideName(side: SideKey, frontAzimuthDeg: number | null): string {
  if (frontAzimuthDeg === null) return sidePlain[side];
  const looks = sideLooksName(frontAzimuthDeg + sideOrder.indexOf(side) * 90);
  return side === 'front' || side === 'back' ? `the ${side} (${looks} side)` : `the ${looks} end`;
}

/** Relative wind direction θ in words: "wind onto the front", "wind from the NE, 30° off the front". */
export function windWords(directionDeg: number, frontAzimuthDeg: number | null, strip = false): string {
  const nearest = Math.round(azimuthDeg(directionDeg) / 90) % 4;
  const offDeg = Math.abs(wrappedDeg(directionDeg - nearest * 90));
  const side = sideName(sideOrder[nearest]!, frontAzimuthDeg);
  const from = frontAzimuthDeg === null ? '' : ` from the ${compassPointName(frontAzimuthDeg + directionDeg)}`;
  const angle = offDeg < 0.5 ? '' : `, ${Math.round(offDeg)}° off square`;
  return strip && (nearest === 1 || nearest === 3) && offDeg < 0.5 ? `wind${from} along the run (onto ${side})` : `wind${from} onto ${side}${angle}`;
}

const edgeNames: Readonly<Record<Edge, SideKey>> = { front: 'front', back: 'back', endY0: 'endY0', endYW: 'endYW' };

/** "sliding", "uplift", "overturning about the back edge", "overturning about the east end edge". */
export function criterionWords(criterion: Criterion, tippingEdge: Edge, frontAzimuthDeg: number | null): string {
  if (criterion !== 'overturning') return criterion;
  const side = edgeNames[tippingEdge];
  if (side === 'front' || side === 'back') {
    const looks = frontAzimuthDeg === null ? '' : ` (${sideLooksName(frontAzimuthDeg + sideOrder.indexOf(side) * 90)} side)`;
    return `overturning about the ${side} edge${looks}`;
  }
  return `overturning about ${sideName(side, frontAzimuthDeg)} edge`;
}

/** The whole governing case in words. */
export function governingWords(input: {
  element: string | null;
  directionDeg: number;
  criterion: Criterion;
  tippingEdge: Edge;
  frontAzimuthDeg: number | null;
  strip?: boolean;
}): string {
  const wind = windWords(input.directionDeg, input.frontAzimuthDeg, input.strip);
  const what = criterionWords(input.criterion, input.tippingEdge, input.frontAzimuthDeg);
  if (input.element === null) return `${wind}: ${what}`;
  // Element names say "the y = 0 end"; with the front's azimuth known, name that end by compass.
  const element =
    input.frontAzimuthDeg === null
      ? input.element
      : input.element
          .replace(/the y = 0 end/g, sideName('endY0', input.frontAzimuthDeg))
          .replace(/the y = baseWidthM end/g, sideName('endYW', input.frontAzimuthDeg));
  return `${element}, ${wind}: ${what}`;
}
