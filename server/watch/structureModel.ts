/**
 * A registered structure made ready for the per-reading path: its record expanded into faces
 * and masses once, its stability reduced to coefficients once, its level ladder turned into
 * trigger gusts for the current air density, and its height on the wind profile. Everything
 * here depends only on the register and the air density, never on the reading.
 */
import {
  calculatedLimitGust,
  effectiveLimitGustMps,
  expandStructure,
  gustForUtilizationMps,
  stabilityCoefficients,
  type ExpandedStructure,
  type StabilityCoefficients,
  type StructureRecord,
} from '../engine/index.ts';
import type { LevelDefinition } from '../levels/index.ts';

export interface StructureModel {
  id: number;
  name: string;
  kind: string;
  orientationDeg: number;
  mobile: boolean;
  /** Keys of the governing sensors; null = every sensor on the site (the highest governs). */
  sensorKeys: ReadonlySet<string> | null;
  expanded: ExpandedStructure;
  coefficients: StabilityCoefficients;
  /** Height the gust is transferred to, m (the structure's top unless set). */
  referenceHeightM: number;
  levels: readonly LevelDefinition[];
  ratedGustMps: number | null;
}

/** What depends on the air density: recomputed when the density changes. */
export interface DensityDependent {
  airDensityKgM3: number;
  calculatedLimitGustMps: number;
  limitGustMps: number;
  /** Equivalent gust of each level's trigger, m/s, strictly rising (see `triggerLadderMps`). */
  triggerGustsMps: number[];
}

export interface StructureRow {
  id: number;
  name: string;
  kind: string;
  recordJson: unknown;
  orientationDeg: number;
  mobile: boolean;
  sensorKeysJson: unknown;
  levelsJson: unknown;
}

export function structureModel(row: StructureRow, siteLevels: readonly LevelDefinition[]): StructureModel {
  const { structure, referenceHeightM } = expandStructure(row.recordJson as StructureRecord);
  const levels = (row.levelsJson as LevelDefinition[] | null) ?? siteLevels;
  const keys = row.sensorKeysJson as string[] | null;
  return {
    id: row.id,
    name: row.name,
    kind: row.kind,
    orientationDeg: row.orientationDeg,
    mobile: row.mobile,
    sensorKeys: keys && keys.length > 0 ? new Set(keys) : null,
    expanded: structure,
    coefficients: stabilityCoefficients(structure),
    referenceHeightM,
    levels,
    ratedGustMps: structure.ratedGustMps ?? null,
  };
}

/**
 * The trigger gust of each level at this density. A capacity fraction f becomes the gust at
 * which the governing utilization reaches f (solved exactly, uplift included) — and, when the
 * manufacturer's rated gust is lower than the calculated limit, no more than rated·√f: the
 * capacity is then the rating, and a level must not come later than the rating allows
 * (conservative; our reading of design.md 2.3's effective limit). A gust trigger is taken as is.
 *
 * Mixed trigger kinds can cross when the density changes; the ladder is then made strictly
 * rising by lowering the lower level (it escalates earlier, never later).
 */
export function triggerLadderMps(model: StructureModel, airDensityKgM3: number): number[] {
  const ladder = rawTriggerGustsMps(model, airDensityKgM3).map((g) => (Number.isFinite(g) ? g : 120));
  for (let i = ladder.length - 2; i >= 0; i--) {
    if (ladder[i]! >= ladder[i + 1]!) ladder[i] = ladder[i + 1]! * 0.999;
  }
  return ladder.map((g) => Math.max(g, 0.01));
}

/** Each level's equivalent trigger gust as the levels say, before any ordering (m/s). */
export function rawTriggerGustsMps(model: Pick<StructureModel, 'levels' | 'expanded' | 'ratedGustMps'>, airDensityKgM3: number): number[] {
  return model.levels.map((level) => {
    if (level.trigger.kind === 'gust') return level.trigger.gustMps;
    const fraction = level.trigger.fraction;
    const exact = gustForUtilizationMps(model.expanded, fraction, airDensityKgM3);
    return model.ratedGustMps === null ? exact : Math.min(exact, model.ratedGustMps * Math.sqrt(fraction));
  });
}

export function densityDependent(model: StructureModel, airDensityKgM3: number): DensityDependent {
  return {
    airDensityKgM3,
    calculatedLimitGustMps: calculatedLimitGust(model.expanded, airDensityKgM3).gustMps,
    limitGustMps: effectiveLimitGustMps(model.expanded, airDensityKgM3),
    triggerGustsMps: triggerLadderMps(model, airDensityKgM3),
  };
}
