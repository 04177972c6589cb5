/**
 * A registered structure made ready for the per-reading path: the engine's live structure
 * (engine/liveAssessment.ts: the record expanded once, its stability reduced to the governing k of
 * every part and direction), with what the watch adds from the register (its sensors, its levels)
 * and its level ladder turned into trigger gusts for the current air density
 * (levels/triggerLadder.ts). Everything here depends only on the register and the air density,
 * never on the reading.
 */
import { liveStructure, structureLimits, type AssessedDirections, type LiveStructure, type StructureLimits, type StructureRecord } from '../engine/index.ts';
import { maxLevelCount, triggerLadderMps, type LevelDefinition } from '../levels/index.ts';

export interface StructureModel extends LiveStructure {
  id: number;
  name: string;
  kind: string;
  orientationDeg: number;
  mobile: boolean;
  /** Keys of the governing sensors; null = every sensor on the site (the highest governs). */
  sensorKeys: ReadonlySet<string> | null;
  levels: readonly LevelDefinition[];
  /** Whether a level rises on a chance trigger (structureForesight.ts): such a structure is never calm by its gust alone. */
  hasChanceLevel: boolean;
}

/** What depends on the air density: recomputed when the density changes. */
export interface DensityDependent extends StructureLimits {
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
  const keys = row.sensorKeysJson as string[] | null;
  const live = liveStructure(row.recordJson as StructureRecord);
  const levels = (row.levelsJson as LevelDefinition[] | null) ?? siteLevels;
  // The register refuses these (levelDefinition.ts); a row from elsewhere is shown as it is, not run.
  if (!Array.isArray(levels) || levels.length < 1 || levels.length > maxLevelCount) throw new Error(`its stored level list has ${Array.isArray(levels) ? levels.length : 'no'} levels (1 to ${maxLevelCount} are needed): save its levels again, or leave them to the site's`);
  // Field by field, not spread: objects built as `{ ...x, more }` each got a shape (hidden class)
  // of their own (990 for 1,000 structures), so every read of a model on the per-reading path
  // missed V8's inline caches; re-assessing 1,000 structures took 2.0 ms instead of 0.7 ms
  // (`npm run bench`, in-process breakdown).
  return {
    stability: live.stability,
    referenceHeightM: live.referenceHeightM,
    ratedGustMps: live.ratedGustMps,
    warnings: live.warnings,
    id: row.id,
    name: row.name,
    kind: row.kind,
    orientationDeg: row.orientationDeg,
    mobile: row.mobile,
    sensorKeys: keys && keys.length > 0 ? new Set(keys) : null,
    levels,
    hasChanceLevel: levels.some((l) => l.trigger.kind === 'chance'),
  };
}

/** Limits and ladder at this density, over every direction or within a sector of them. */
export function densityDependent(model: StructureModel, airDensityKgM3: number, sector: AssessedDirections = null): DensityDependent {
  const limits = structureLimits(model.stability, airDensityKgM3, sector);
  // Field by field, not spread, for one shape across structures (see `structureModel`).
  return { airDensityKgM3: limits.airDensityKgM3, calculatedLimitGustMps: limits.calculatedLimitGustMps, limitGustMps: limits.limitGustMps, triggerGustsMps: triggerLadderMps(model.levels, limits.limitGustMps) };
}
