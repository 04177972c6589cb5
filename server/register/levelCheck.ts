/**
 * The level lists a structure runs on, checked against that structure's effective limit before
 * they are saved (design §2.6 v2): levels out of order once every trigger is a gust, a gust trigger
 * at or above the limit, a fraction above 100 %. Used for a structure's own levels and for the
 * site's default levels, which every structure without its own list follows.
 */
import { isaAirDensityKgM3, recordConfigurations, type StructureRecord } from '../engine/index.ts';
import type { PathIssue as FieldIssue } from '../engine/issueWords.ts';
import type { LevelDefinition } from '../levels/index.ts';
import type { Storage } from '../storage/storage.ts';
import { densityDependent, levelProblems, structureModel, type StructureModel } from '../watch/structureModel.ts';

/**
 * The density a structure's levels are checked at on save: the site's fixed density, else ISA at
 * the site's altitude, and never less than the EN 1991-1-4 §4.5 recommended 1.25 kg/m³ (denser
 * air lowers the limit, so the check errs toward refusing).
 */
export function siteDesignDensityKgM3(site: { airDensityMode: string; fixedAirDensityKgM3: number | null; altitudeM: number }): number {
  const density = site.airDensityMode === 'fixed' && site.fixedAirDensityKgM3 !== null ? site.fixedAirDensityKgM3 : isaAirDensityKgM3(site.altitudeM);
  return Math.max(density, 1.25);
}

/** Problems of a structure's level list against its effective limit at the design density. */
export function modelLevelProblems(model: StructureModel, densityKgM3: number): ReturnType<typeof levelProblems> {
  return levelProblems(model.levels, densityDependent(model, densityKgM3).limitGustMps);
}

/** Problems of new site default levels for every active structure that follows them. */
export function siteDefaultLevelIssues(storage: Storage, levels: readonly LevelDefinition[], densityKgM3: number): FieldIssue[] {
  const rows = storage.structures.activeOnSiteLevels();
  return rows.flatMap((row) => {
    try {
      // Every configuration of the structure: the levels run on whichever it stands in (design §2.5).
      const configured = recordConfigurations(row.recordJson as StructureRecord);
      return configured.flatMap((c, i) =>
        modelLevelProblems(structureModel({ ...row, recordJson: c.record }, levels), densityKgM3).map((problem) => ({
          path: `defaultLevels.${problem.index}.trigger.${problem.field}`,
          message: `for "${row.name}"${i === 0 && configured.length === 1 ? '' : ` in configuration "${c.name}"`} (which follows the site's levels): ${problem.message}`,
        })),
      );
    } catch {
      // A stored record that cannot be assessed shows its own error on the board.
      return [];
    }
  });
}
