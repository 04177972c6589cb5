/**
 * Stability of a ballasted structure in wind from every direction (design §2.3 v2): tipping about
 * each edge of its rectangular base, sliding on the vector sum of the face forces, and uplift.
 *
 * For one relative direction θ, with F⃗_i the face forces in plan, h_i their heights, F_up the
 * uplift at plan point u, W = gΣm and, for each base edge e with outward normal n_e:
 *   M_h,e = max(0, Σ h_i F⃗_i·n_e)          wind moment (a favourable wind effect is not counted:
 *                                           EN 1990 Table A1.2(A) γ_Q,inf = 0)
 *   M_u,e = F_up · dist(u, e)              uplift moment
 *   M_w,e = g Σ m_j · dist(m_j, e)         restoring moment
 *   U_ot = max_e γ_ot (M_h,e + M_u,e) / M_w,e   (unbounded when M_w,e ≤ 0 and the numerator > 0)
 *   U_sl = γ_sl (|F⃗| + μ F_up) / (μ W)
 *   U_up = γ_up F_up / W
 * The whole wind action is factored, uplift included (EN 1990 EQU: γ_Q on every destabilizing
 * variable action), and the resistance is self-weight alone. Every force and moment of the wind is
 * proportional to q = ½ρv², so every utilization is U = k·q: this module computes the k of each
 * direction and criterion once per structure (`stabilityCoefficients`), and everything else —
 * utilization at a gust, limit gusts, level gusts, required ballast — is closed-form from them:
 *   U(v) = k·½ρv²,   v_lim = √(2/(ρk)),   fraction f of capacity at v_lim·√f.
 *
 * A record without `baseWidthM` is a strip (first-round records): only the front and back edges
 * are checked, and the report warns that wind onto the ends was not.
 */
import { assertAirDensity } from './air.ts';
import { dynamicPressurePa, speedForDynamicPressureMps } from './dynamicPressure.ts';
import { assessedDirectionsDeg, azimuthDeg, faceIncidence, faceNormal, inSector, wrappedDeg, type DirectionSector } from './directions.ts';
import { standardGravityMps2 } from './gravity.ts';
import { assertAbove, assertInRange } from './rangeCheck.ts';
import type { ExpandedStructure, SafetyFactors, StabilityBody, Uplift } from './structure.ts';

export const criteria = ['overturning', 'sliding', 'uplift'] as const;
export type Criterion = (typeof criteria)[number];
/** Base edges: front x = 0, back x = d, ends y = 0 and y = w. */
export const edges = ['front', 'back', 'endY0', 'endYW'] as const;
export type Edge = (typeof edges)[number];

/** Defaults for γ_ot, γ_sl, γ_up, each with its source (design §2.3). */
export const defaultSafetyFactors: Readonly<SafetyFactors> = { overturning: 1.5, sliding: 2.0, uplift: 1.5 };
export const safetyFactorSources: Readonly<Record<Criterion, string>> = {
  overturning: 'common practice for ballasted temporary structures (EN 1990 Table A1.2(A) EQU gives about 1.67 effective against self-weight)',
  sliding: 'HSE research report RR071 "Friction in temporary works" (2003): at least 2.0 on lateral load carried by friction',
  uplift: 'common practice for ballasted temporary structures (EN 1990 Table A1.2(A) EQU gives about 1.67 effective against self-weight)',
};

export type Utilizations = Record<Criterion, number> & { governing: number };

/**
 * One direction of one body, per unit dynamic pressure: every figure of the wind × q gives its
 * value at that q. Restoring moments and the weight do not depend on the wind.
 */
export interface DirectionCoefficients {
  /** θ, degrees relative to the front (see directions.ts). */
  directionDeg: number;
  /** The uplift case assessed in this direction (the worst of those that apply), if any. */
  upliftLabel: string | null;
  /** |F⃗| per unit q, m² (N/Pa). */
  forcePerPaM2: number;
  /** F⃗ per unit q in plan, m². */
  forceXPerPaM2: number;
  forceYPerPaM2: number;
  /** F_up per unit q, m². */
  upliftPerPaM2: number;
  /** M_h,e + M_u,e per unit q about each edge, m³ (N·m/Pa). */
  windMomentPerPaM3: Record<Edge, number>;
  /** M_w,e, N·m. */
  restoringMomentNm: Record<Edge, number>;
  /** k of each criterion (overturning: the worst edge), and the highest as `governing`, 1/Pa. */
  utilizationPerPa: Utilizations;
  governing: Criterion;
  /** The edge the overturning check tips about. */
  tippingEdge: Edge;
}

/** A body (the structure or one element) reduced to its direction coefficients. */
export interface BodyCoefficients {
  /** null for the structure's body, else the element's name. */
  element: string | null;
  /** True for a strip record (no baseWidthM): only the front and back edges are checked. */
  strip: boolean;
  weightN: number;
  frictionCoefficient: number;
  safetyFactors: SafetyFactors;
  baseDepthM: number;
  baseWidthM: number | null;
  directions: DirectionCoefficients[];
  /** Directions found between grid points where k peaks (see `interiorMaximaDeg`); already in `directions` once aligned. */
  refinedDeg: number[];
}

/** A whole structure: its body, its elements and the rating. Compute once, evaluate per gust. */
export interface StabilityCoefficients {
  body: BodyCoefficients;
  elements: BodyCoefficients[];
  ratedGustMps: number | null;
}

/** The worst direction (and part) of a structure, by k: the same at every gust, since U = k·q. */
export interface GoverningCase {
  part: BodyCoefficients;
  direction: DirectionCoefficients;
}

function checked(caller: string, name: string, value: number, min: number, max: number, unit = ''): number {
  assertInRange(caller, name, value, min, max, unit);
  return value;
}

const edgeNormals: Readonly<Record<Edge, { x: number; y: number }>> = {
  front: { x: -1, y: 0 },
  back: { x: 1, y: 0 },
  endY0: { x: 0, y: -1 },
  endYW: { x: 0, y: 1 },
};

/** Distance of a plan point from each edge (the lever about that edge), m. */
function distancesM(xM: number, yM: number, depthM: number, widthM: number): Record<Edge, number> {
  return { front: xM, back: depthM - xM, endY0: yM, endYW: widthM - yM };
}

/** k = demand/capacity per unit q; unbounded when the capacity is gone and something loads it. */
function perPa(demandPerPa: number, capacity: number): number {
  if (demandPerPa <= 0) return 0;
  return capacity > 0 ? demandPerPa / capacity : Infinity;
}

function governingOf(utilization: Record<Criterion, number>): Criterion {
  let governing: Criterion = 'overturning';
  for (const criterion of criteria) if (utilization[criterion] > utilization[governing]) governing = criterion;
  return governing;
}

interface CheckedUplift {
  label: string | null;
  perPaM2: number;
  distancesM: Record<Edge, number>;
}

function checkedUplift(caller: string, path: string, uplift: Uplift, depthM: number, widthM: number): CheckedUplift {
  const planAreaM2 = checked(caller, `${path}.planAreaM2`, uplift.planAreaM2, 0, 40_000, 'm²');
  const lift = checked(caller, `${path}.liftCoefficient`, uplift.liftCoefficient, 0, 4);
  const xM = checked(caller, `${path}.xM`, uplift.xM ?? depthM / 2, 0, depthM, 'm (within the base)');
  const yM = checked(caller, `${path}.yM`, uplift.yM ?? widthM / 2, 0, widthM, 'm (within the base)');
  return { label: uplift.label ?? null, perPaM2: planAreaM2 * lift, distancesM: distancesM(xM, yM, depthM, widthM) };
}

/**
 * The direction coefficients of one body. Checks every number and throws a RangeError naming the
 * offending field: a NaN here would hide a failure.
 */
export interface BodyDirectionOptions {
  /** Facings of other parts' faces, whose normals and ψ corners are assessed too. */
  facingsDeg?: readonly number[];
  /** Directions assessed exactly as given. */
  exactDeg?: readonly number[];
  /** Search between the directions for peaks of k (default true). */
  refine?: boolean;
}

export function bodyCoefficients(body: StabilityBody, element: string | null = null, options: BodyDirectionOptions = {}): BodyCoefficients {
  const { facingsDeg = [], exactDeg = [], refine = true } = options;
  const caller = element === null ? 'stabilityCoefficients' : `stabilityCoefficients (element "${element}")`;
  const depthM = body.baseDepthM;
  assertAbove(caller, 'baseDepthM', depthM, 0, 200, 'm');
  const strip = body.baseWidthM === undefined;
  if (!strip) assertAbove(caller, 'baseWidthM', body.baseWidthM!, 0, 200, 'm');
  // A strip has no ends to tip about; its y positions do not enter.
  const widthM = body.baseWidthM ?? 0;
  assertAbove(caller, 'frictionCoefficient', body.frictionCoefficient, 0, 1);
  for (const criterion of criteria) assertInRange(caller, `safetyFactors.${criterion}`, body.safetyFactors[criterion], 1, 5);
  const usedEdges: readonly Edge[] = strip ? ['front', 'back'] : edges;

  const faces = body.faces.map((face, index) => {
    const areaM2 = checked(caller, `faces.${index}.areaM2`, face.areaM2, 0, 40_000, 'm²');
    const heightM = checked(caller, `faces.${index}.centroidHeightM`, face.centroidHeightM, 0, 200, 'm');
    const facingDeg = checked(caller, `faces.${index}.facingDeg`, face.facingDeg ?? 0, 0, 360, '°');
    return {
      facingDeg,
      heightM,
      frontPerPaM2: checked(caller, `faces.${index}.cfFront`, face.cfFront, 0, 4) * areaM2,
      backPerPaM2: checked(caller, `faces.${index}.cfBack`, face.cfBack, 0, 4) * areaM2,
      normal: faceNormal(facingDeg),
    };
  });

  let weightN = 0;
  const restoringMomentNm: Record<Edge, number> = { front: 0, back: 0, endY0: 0, endYW: 0 };
  body.masses.forEach((mass, index) => {
    const massWeightN = standardGravityMps2 * checked(caller, `masses.${index}.massKg`, mass.massKg, 0, 1e6, 'kg');
    const xM = checked(caller, `masses.${index}.xM`, mass.xM, 0, depthM, 'm (within the base)');
    const yM = checked(caller, `masses.${index}.yM`, mass.yM ?? widthM / 2, 0, widthM, 'm (within the base)');
    weightN += massWeightN;
    const levers = distancesM(xM, yM, depthM, widthM);
    for (const edge of edges) restoringMomentNm[edge] += massWeightN * levers[edge];
  });

  const plainUplift = body.uplift ? checkedUplift(caller, 'uplift', body.uplift, depthM, widthM) : null;
  const upliftCases = (body.upliftCases ?? []).map((uplift, index) => ({
    sector: { centreDeg: checked(caller, `upliftCases.${index}.centreDeg`, uplift.centreDeg, 0, 360, '°'), halfWidthDeg: uplift.halfWidthDeg },
    uplift: checkedUplift(caller, `upliftCases.${index}`, uplift, depthM, widthM),
  }));

  const { safetyFactors, frictionCoefficient: mu } = body;
  // An element may be checked for some criteria only (structure.ts, elementSchema `checks`).
  const checks = new Set<Criterion>('checks' in body && Array.isArray(body.checks) ? (body.checks as Criterion[]) : criteria);
  const directionsDeg = mergedDeg(assessedDirectionsDeg([...faces.map((face) => face.facingDeg), ...facingsDeg]), exactDeg);
  const assessDirection = (directionDeg: number): DirectionCoefficients => {
    let forceX = 0;
    let forceY = 0;
    const faceMoment: Record<Edge, number> = { front: 0, back: 0, endY0: 0, endYW: 0 };
    for (const face of faces) {
      const incidence = faceIncidence(directionDeg, face.facingDeg);
      if (incidence.share === 0) continue;
      // From the windward side to the leeward side: −n onto the front side, +n onto the back.
      const magnitude = (incidence.side === 'front' ? face.frontPerPaM2 : face.backPerPaM2) * incidence.share;
      const sign = incidence.side === 'front' ? -1 : 1;
      const fx = sign * magnitude * face.normal.x;
      const fy = sign * magnitude * face.normal.y;
      forceX += fx;
      forceY += fy;
      for (const edge of usedEdges) faceMoment[edge] += face.heightM * (fx * edgeNormals[edge].x + fy * edgeNormals[edge].y);
    }
    const forcePerPaM2 = Math.hypot(forceX, forceY);
    const applicable = upliftCases.filter((entry) => inSector(directionDeg, entry.sector)).map((entry) => entry.uplift);
    const alternatives: Array<CheckedUplift | null> = applicable.length > 0 ? applicable : [plainUplift];

    let best: DirectionCoefficients | null = null;
    for (const uplift of alternatives) {
      const upliftPerPaM2 = uplift?.perPaM2 ?? 0;
      const windMomentPerPaM3: Record<Edge, number> = { front: 0, back: 0, endY0: 0, endYW: 0 };
      let overturning = 0;
      let tippingEdge: Edge = 'back';
      for (const edge of usedEdges) {
        windMomentPerPaM3[edge] = Math.max(0, faceMoment[edge]) + upliftPerPaM2 * (uplift?.distancesM[edge] ?? 0);
        const k = perPa(safetyFactors.overturning * windMomentPerPaM3[edge], restoringMomentNm[edge]);
        if (k > overturning) {
          overturning = k;
          tippingEdge = edge;
        }
      }
      if (overturning === 0) tippingEdge = travelEdge(forceX, forceY);
      const utilization = {
        overturning: checks.has('overturning') ? overturning : 0,
        sliding: checks.has('sliding') ? perPa(safetyFactors.sliding * (forcePerPaM2 + mu * upliftPerPaM2), mu * weightN) : 0,
        uplift: checks.has('uplift') ? perPa(safetyFactors.uplift * upliftPerPaM2, weightN) : 0,
      };
      const governing = governingOf(utilization);
      const candidate: DirectionCoefficients = {
        directionDeg,
        upliftLabel: uplift?.label ?? null,
        forcePerPaM2,
        forceXPerPaM2: forceX,
        forceYPerPaM2: forceY,
        upliftPerPaM2,
        windMomentPerPaM3,
        restoringMomentNm: { ...restoringMomentNm },
        utilizationPerPa: { ...utilization, governing: utilization[governing] },
        governing,
        tippingEdge,
      };
      if (best === null || candidate.utilizationPerPa.governing > best.utilizationPerPa.governing) best = candidate;
    }
    return best!;
  };
  const gridDirections = directionsDeg.map(assessDirection);
  const refinedDeg = refine ? interiorMaximaDeg(gridDirections, assessDirection) : [];
  const directions =
    refinedDeg.length === 0 ? gridDirections : mergedDeg(directionsDeg, refinedDeg).map((deg) => gridDirections.find((d) => d.directionDeg === deg) ?? assessDirection(deg));

  return {
    element,
    strip,
    weightN,
    frictionCoefficient: mu,
    safetyFactors: { ...safetyFactors },
    baseDepthM: depthM,
    baseWidthM: strip ? null : widthM,
    directions,
    refinedDeg,
  };
}

/**
 * Directions between two assessed ones where the governing k peaks inside the interval. Between
 * ψ's corners every face force is constant or a cosine of θ, so a sum of them can peak between
 * grid points when two faces change in opposite senses. Where the midpoint of an interval is
 * above both ends, a golden-section search finds the peak (to about 0.001°); it is then assessed
 * too. Design §2.3 asks for at least every 15° and each face normal: this only adds directions.
 */
function interiorMaximaDeg(directions: readonly DirectionCoefficients[], assess: (deg: number) => DirectionCoefficients): number[] {
  const k = (deg: number) => assess(deg).utilizationPerPa.governing;
  const found: number[] = [];
  for (let i = 0; i < directions.length; i++) {
    const a = directions[i]!.directionDeg;
    const b = i + 1 < directions.length ? directions[i + 1]!.directionDeg : directions[0]!.directionDeg + 360;
    const ka = directions[i]!.utilizationPerPa.governing;
    const kb = directions[(i + 1) % directions.length]!.utilizationPerPa.governing;
    if (!Number.isFinite(ka) || !Number.isFinite(kb) || b - a < 0.01) continue;
    const kMid = k((a + b) / 2);
    if (!(kMid > Math.max(ka, kb) * (1 + 1e-12))) continue;
    let lo = a;
    let hi = b;
    const ratio = (Math.sqrt(5) - 1) / 2;
    for (let step = 0; step < 30; step++) {
      const x1 = hi - ratio * (hi - lo);
      const x2 = lo + ratio * (hi - lo);
      if (k(x1) >= k(x2)) hi = x2;
      else lo = x1;
    }
    found.push(((lo + hi) / 2) % 360);
  }
  return found;
}

/** Directions in [0, 360) from both lists, sorted, without repeats (to 1e-9°). */
function mergedDeg(a: readonly number[], b: readonly number[]): number[] {
  const found = new Map<number, number>();
  for (const deg of [...a, ...b]) {
    const value = Math.round(azimuthDeg(deg) * 1e9) / 1e9;
    found.set(value === 360 ? 0 : value, value === 360 ? 0 : value);
  }
  return [...found.values()].sort((x, y) => x - y);
}

/** The edge the horizontal force pushes across (for a direction with nothing to tip). */
function travelEdge(forceX: number, forceY: number): Edge {
  if (Math.abs(forceX) >= Math.abs(forceY)) return forceX >= 0 ? 'back' : 'front';
  return forceY >= 0 ? 'endYW' : 'endY0';
}

/** The whole structure's coefficients: body, elements (each on its own base), rating. */
export function stabilityCoefficients(structure: ExpandedStructure): StabilityCoefficients {
  if (structure.ratedGustMps !== undefined) assertAbove('stabilityCoefficients', 'ratedGustMps', structure.ratedGustMps, 0, 120, 'm/s');
  // Every part is assessed in every direction any part has a face normal in, so that the
  // structure's directions line up across its parts.
  const allParts = [structure, ...(structure.elements ?? [])];
  const normals = allParts.flatMap((part) => part.faces.map((face) => face.facingDeg ?? 0));
  // First pass: each part finds where its k peaks between the shared directions; second pass:
  // every part is assessed at all of them, so the parts' directions stay aligned.
  const names = [null, ...(structure.elements ?? []).map((element) => element.name)];
  const first = allParts.map((part, index) => bodyCoefficients(part, names[index]!, { facingsDeg: normals }));
  const refined = first.flatMap((part) => part.refinedDeg);
  const parts =
    refined.length === 0 || allParts.length === 1
      ? first
      : allParts.map((part, index) => ({ ...bodyCoefficients(part, names[index]!, { facingsDeg: normals, exactDeg: refined, refine: false }), refinedDeg: first[index]!.refinedDeg }));
  return { body: parts[0]!, elements: parts.slice(1), ratedGustMps: structure.ratedGustMps ?? null };
}

/** k × q, with an unbounded k giving 0 at q = 0 (no wind, no load) and Infinity above. */
export function utilizationAtPa(perPaValue: number, qPa: number): number {
  if (qPa === 0) return 0;
  return perPaValue * qPa;
}

/** Utilizations of one direction at dynamic pressure q. */
export function directionUtilizations(direction: DirectionCoefficients, qPa: number): Utilizations {
  const k = direction.utilizationPerPa;
  return {
    overturning: utilizationAtPa(k.overturning, qPa),
    sliding: utilizationAtPa(k.sliding, qPa),
    uplift: utilizationAtPa(k.uplift, qPa),
    governing: utilizationAtPa(k.governing, qPa),
  };
}

/** Relative direction of the wind, or the sector of directions to assess: null = every direction. */
export type AssessedDirections = DirectionSector | null;

/** Parts of the structure: the body first, then its elements. */
export function parts(coefficients: StabilityCoefficients): BodyCoefficients[] {
  return [coefficients.body, ...coefficients.elements];
}

/**
 * Where the highest k is: part p and direction d with the highest `kAt(p, d)`, over the directions
 * within `sector` (all when null), the first direction and then the body on a tie. A sector holds
 * at least one of the 15° directions when it is 7.5° wide or more; a narrower one falls back to the
 * direction assessed nearest its centre. One search for the calculator's full coefficients and the
 * watch's compact ones.
 */
function highestK(
  directionsDeg: ArrayLike<number>,
  partCount: number,
  kAt: (part: number, direction: number) => number,
  sector: AssessedDirections,
): { part: number; direction: number } {
  let best = { part: -1, direction: -1, k: -Infinity };
  let nearest = 0;
  for (let d = 0; d < directionsDeg.length; d++) {
    if (sector !== null && !inSector(directionsDeg[d]!, sector)) {
      if (Math.abs(wrappedDeg(directionsDeg[d]! - sector.centreDeg)) < Math.abs(wrappedDeg(directionsDeg[nearest]! - sector.centreDeg))) nearest = d;
      continue;
    }
    for (let p = 0; p < partCount; p++) {
      const k = kAt(p, d);
      if (best.part < 0 || k > best.k) best = { part: p, direction: d, k };
    }
  }
  if (best.part >= 0) return best;
  let part = 0;
  for (let p = 1; p < partCount; p++) if (kAt(p, nearest) > kAt(part, nearest)) part = p;
  return { part, direction: nearest };
}

/**
 * The governing case: the part and direction with the highest k (within `sector` when given).
 * Since every U = k·q this is the governing case at every gust.
 */
export function governingCase(coefficients: StabilityCoefficients, sector: AssessedDirections = null): GoverningCase {
  const all = parts(coefficients);
  const directions = coefficients.body.directions;
  const found = highestK(
    directions.map((direction) => direction.directionDeg),
    all.length,
    (p, d) => all[p]!.directions[d]!.utilizationPerPa.governing,
    sector,
  );
  const part = all[found.part]!;
  return { part, direction: part.directions[found.direction]! };
}

/**
 * What the live watch keeps of a structure's coefficients: per part and direction only the
 * governing k, its criterion and its tipping edge, in typed arrays (a thousand structures with
 * their elements hold tens of thousands of directions). Everything the watch shows follows from
 * these: U = k·q, limits, effective figures, and what governs in words.
 */
export interface CompactStability {
  /** Directions assessed, degrees relative to the front; the same for every part. */
  directionsDeg: Float64Array;
  /** Part names: null for the body, then the elements'. */
  parts: ReadonlyArray<string | null>;
  /** Governing k of part p in direction d at [p · directions + d], 1/Pa. */
  k: Float64Array;
  /** Index into `criteria` of that governing k. */
  criterion: Uint8Array;
  /** Index into `edges` of the edge that case tips about. */
  edge: Uint8Array;
  strip: boolean;
  ratedGustMps: number | null;
}

export function compactStability(coefficients: StabilityCoefficients): CompactStability {
  const all = parts(coefficients);
  const count = coefficients.body.directions.length;
  const k = new Float64Array(all.length * count);
  const criterion = new Uint8Array(all.length * count);
  const edge = new Uint8Array(all.length * count);
  all.forEach((part, p) =>
    part.directions.forEach((direction, d) => {
      k[p * count + d] = direction.utilizationPerPa.governing;
      criterion[p * count + d] = criteria.indexOf(direction.governing);
      edge[p * count + d] = edges.indexOf(direction.tippingEdge);
    }),
  );
  return {
    directionsDeg: Float64Array.from(coefficients.body.directions, (direction) => direction.directionDeg),
    parts: all.map((part) => part.element),
    k,
    criterion,
    edge,
    strip: coefficients.body.strip,
    ratedGustMps: coefficients.ratedGustMps,
  };
}

/** The governing case of a compact structure: part, direction, criterion, edge and k (the first on a tie). */
export function compactGoverningCase(
  stability: CompactStability,
  sector: AssessedDirections = null,
): { element: string | null; directionDeg: number; criterion: Criterion; tippingEdge: Edge; perPa: number } {
  const count = stability.directionsDeg.length;
  const found = highestK(stability.directionsDeg, stability.parts.length, (p, d) => stability.k[p * count + d]!, sector);
  const index = found.part * count + found.direction;
  return {
    element: stability.parts[found.part]!,
    directionDeg: stability.directionsDeg[found.direction]!,
    criterion: criteria[stability.criterion[index]!]!,
    tippingEdge: edges[stability.edge[index]!]!,
    perPa: stability.k[index]!,
  };
}

/** The structure's coefficients, full (the calculator's) or compact (the watch's). */
export type Stability = StabilityCoefficients | CompactStability;

/** The highest governing k (1/Pa) of the structure, within the sector when given. */
export function governingPerPa(stability: Stability, sector: AssessedDirections = null): number {
  if ('k' in stability) return compactGoverningCase(stability, sector).perPa;
  return governingCase(stability, sector).direction.utilizationPerPa.governing;
}

/** The gust (m/s) at which utilization k·q reaches `fraction`: √(2f/(ρk)); Infinity when k = 0, 0 when unbounded. */
export function gustAtPerPaMps(perPaValue: number, fraction: number, airDensityKgM3: number): number {
  if (perPaValue <= 0) return Infinity;
  if (!Number.isFinite(perPaValue)) return 0;
  return speedForDynamicPressureMps(fraction / perPaValue, airDensityKgM3);
}

/** The calculated limit gust (m/s): the lowest over parts, directions and criteria (within the sector). */
export function calculatedLimitGustMps(coefficients: Stability, airDensityKgM3: number, sector: AssessedDirections = null): number {
  assertAirDensity('calculatedLimitGustMps', airDensityKgM3);
  return gustAtPerPaMps(governingPerPa(coefficients, sector), 1, airDensityKgM3);
}

/** The effective limit (design §2.3): the lower of the calculated limit and the rated gust, m/s. */
export function effectiveLimitMps(coefficients: Stability, airDensityKgM3: number, sector: AssessedDirections = null): number {
  const calculated = calculatedLimitGustMps(coefficients, airDensityKgM3, sector);
  return coefficients.ratedGustMps === null ? calculated : Math.min(calculated, coefficients.ratedGustMps);
}

/** The effective utilization from the calculated one: max(U, (v / v_rated)²) (design §2.3). */
export function withRating(calculatedUtilization: number, gustMps: number, ratedGustMps: number | null): number {
  if (ratedGustMps === null) return calculatedUtilization;
  const ratio = gustMps / ratedGustMps;
  return Math.max(calculatedUtilization, ratio * ratio);
}

/** Effective utilization at a gust: max(U, (v / v_rated)²) (design §2.3). */
export function effectiveUtilization(coefficients: Stability, gustMps: number, airDensityKgM3: number, sector: AssessedDirections = null): number {
  return withRating(utilizationAtPa(governingPerPa(coefficients, sector), dynamicPressurePa(gustMps, airDensityKgM3)), gustMps, coefficients.ratedGustMps);
}

/** The gust (m/s) at which the effective utilization reaches `fraction` of capacity: v_lim,eff·√f. */
export function gustAtFractionMps(coefficients: Stability, fraction: number, airDensityKgM3: number, sector: AssessedDirections = null): number {
  assertAbove('gustAtFractionMps', 'fraction', fraction, 0, 10);
  return effectiveLimitMps(coefficients, airDensityKgM3, sector) * Math.sqrt(fraction);
}

/** The whole-structure effective limit from an expanded structure, m/s (compute coefficients once where it matters). */
export function effectiveLimitGustMps(structure: ExpandedStructure, airDensityKgM3: number): number {
  return effectiveLimitMps(stabilityCoefficients(structure), airDensityKgM3);
}

/** The gust at which a fraction of the effective capacity is reached, from an expanded structure. */
export function gustForUtilizationMps(structure: ExpandedStructure, fraction: number, airDensityKgM3: number): number {
  return gustAtFractionMps(stabilityCoefficients(structure), fraction, airDensityKgM3);
}

/** A stated answer for required ballast: the mass, or why no mass at that point can do it. */
export type RequiredBallast =
  | { possible: true; massKg: number }
  | { possible: false; massKg: null; reason: string };

/**
 * Extra mass at plan point (xM, yM) of the body that brings the effective governing utilization at
 * `designGustMps` to 1 (design §2.3). Every check is linear in the added mass Δm:
 *   overturning about e: Δm = (γ_ot (M_h,e + M_u,e) − M_w,e) / (g · dist(point, e)),
 *   sliding: Δm = (γ_sl (|F⃗| + μ F_up) / μ − W) / g,   uplift: Δm = (γ_up F_up − W) / g.
 * Not possible when the rating governs (the design gust is above the rated gust), when an element
 * fails at the design gust (ballast on the body does not hold down a part on its own feet), or
 * when the point sits on an edge that needs more restoring moment.
 */
export function requiredBallast(
  coefficients: StabilityCoefficients,
  designGustMps: number,
  airDensityKgM3: number,
  point: { xM: number; yM?: number | undefined },
): RequiredBallast {
  const caller = 'requiredBallast';
  assertInRange(caller, 'designGustMps', designGustMps, 0, 120, 'm/s');
  assertAirDensity(caller, airDensityKgM3);
  const body = coefficients.body;
  assertInRange(caller, 'xM', point.xM, 0, body.baseDepthM, 'm (within the base)');
  const widthM = body.baseWidthM ?? 0;
  const yM = point.yM ?? widthM / 2;
  assertInRange(caller, 'yM', yM, 0, widthM, 'm (within the base)');
  if (coefficients.ratedGustMps !== null && designGustMps > coefficients.ratedGustMps) {
    return { possible: false, massKg: null, reason: `the design gust is above the rated gust ${coefficients.ratedGustMps} m/s: no ballast raises a rating` };
  }
  const qPa = dynamicPressurePa(designGustMps, airDensityKgM3);
  for (const element of coefficients.elements) {
    const worst = Math.max(...element.directions.map((direction) => utilizationAtPa(direction.utilizationPerPa.governing, qPa)));
    if (worst > 1) {
      return { possible: false, massKg: null, reason: `${element.element} fails on its own at this gust: it needs ballast of its own` };
    }
  }
  const levers = distancesM(point.xM, yM, body.baseDepthM, widthM);
  const usedEdges: readonly Edge[] = body.strip ? ['front', 'back'] : edges;
  const { safetyFactors, frictionCoefficient: mu, weightN } = body;
  let neededWeightN = 0;
  for (const direction of body.directions) {
    const upliftN = direction.upliftPerPaM2 * qPa;
    neededWeightN = Math.max(
      neededWeightN,
      (safetyFactors.sliding * (direction.forcePerPaM2 * qPa + mu * upliftN)) / mu - weightN,
      safetyFactors.uplift * upliftN - weightN,
    );
    for (const edge of usedEdges) {
      const deficitNm = safetyFactors.overturning * direction.windMomentPerPaM3[edge] * qPa - direction.restoringMomentNm[edge];
      if (deficitNm <= 0) continue;
      if (levers[edge] <= 0) {
        return { possible: false, massKg: null, reason: `ballast on the ${edgeWords[edge]} adds nothing against tipping about it: place it elsewhere` };
      }
      neededWeightN = Math.max(neededWeightN, deficitNm / levers[edge]);
    }
  }
  return { possible: true, massKg: neededWeightN / standardGravityMps2 };
}

/** Edges in words, for reports and reasons. */
export const edgeWords: Readonly<Record<Edge, string>> = {
  front: 'front edge',
  back: 'back edge',
  endY0: 'end edge at y = 0',
  endYW: 'end edge at y = baseWidthM',
};
