/**
 * Required ballast (design §2.3): the extra mass at a plan point of the body that brings the
 * effective governing utilization at a design gust to 1, from the structure's stability
 * coefficients (stability.ts), or the reason no mass at that point can.
 */
import { assertAirDensity } from './air.ts';
import { dynamicPressurePa } from './dynamicPressure.ts';
import { standardGravityMps2 } from './gravity.ts';
import { maxPlausibleSpeedMps } from './limits.ts';
import { assertInRange } from './rangeCheck.ts';
import { distancesM, edges, edgeWords, type Edge, type StabilityCoefficients } from './stability.ts';
import { utilizationAtPa } from './utilization.ts';

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
  assertInRange(caller, 'designGustMps', designGustMps, 0, maxPlausibleSpeedMps, 'm/s');
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
