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
 * direction and criterion once per structure (`stabilityCoefficients`, this file), and everything
 * else is closed-form from them: utilization at a gust, the governing case, limit gusts and level
 * gusts (utilization.ts), required ballast (requiredBallast.ts):
 *   U(v) = k·½ρv²,   v_lim = √(2/(ρk)),   fraction f of capacity at v_lim·√f.
 *
 * A record without `baseWidthM` is a strip (first-round records): only the front and back edges
 * are checked, and the report warns that wind onto the ends was not.
 */
import { assessedDirectionsDeg, azimuthDeg, faceIncidence, faceNormal, inSector } from './directions.ts';
import { standardGravityMps2 } from './gravity.ts';
import { maxDimensionM, maxMassKg, maxPlausibleSpeedMps } from './limits.ts';
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
export function distancesM(xM: number, yM: number, depthM: number, widthM: number): Record<Edge, number> {
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
  const planAreaM2 = checked(caller, `${path}.planAreaM2`, uplift.planAreaM2, 0, maxDimensionM * maxDimensionM, 'm²');
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
  assertAbove(caller, 'baseDepthM', depthM, 0, maxDimensionM, 'm');
  const strip = body.baseWidthM === undefined;
  if (!strip) assertAbove(caller, 'baseWidthM', body.baseWidthM!, 0, maxDimensionM, 'm');
  // A strip has no ends to tip about; its y positions do not enter.
  const widthM = body.baseWidthM ?? 0;
  assertAbove(caller, 'frictionCoefficient', body.frictionCoefficient, 0, 1);
  for (const criterion of criteria) assertInRange(caller, `safetyFactors.${criterion}`, body.safetyFactors[criterion], 1, 5);
  const usedEdges: readonly Edge[] = strip ? ['front', 'back'] : edges;

  const faces = body.faces.map((face, index) => {
    const areaM2 = checked(caller, `faces.${index}.areaM2`, face.areaM2, 0, maxDimensionM * maxDimensionM, 'm²');
    const heightM = checked(caller, `faces.${index}.centroidHeightM`, face.centroidHeightM, 0, maxDimensionM, 'm');
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
    const massWeightN = standardGravityMps2 * checked(caller, `masses.${index}.massKg`, mass.massKg, 0, maxMassKg, 'kg');
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
  if (structure.ratedGustMps !== undefined) assertAbove('stabilityCoefficients', 'ratedGustMps', structure.ratedGustMps, 0, maxPlausibleSpeedMps, 'm/s');
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

/** Edges in words, for reports and reasons. */
export const edgeWords: Readonly<Record<Edge, string>> = {
  front: 'front edge',
  back: 'back edge',
  endY0: 'end edge at y = 0',
  endYW: 'end edge at y = baseWidthM',
};
