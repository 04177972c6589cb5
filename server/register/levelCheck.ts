/**
 * The level lists a structure runs on, checked against that structure's effective limit before
 * they are saved (design §2.6 v2): levels out of order once every trigger is a gust, a gust trigger
 * at or above the limit, a fraction above 100 %. Used for a structure's own levels and for the
 * site's default levels, which every structure without its own list follows.
 */
import { liveStructure, recordConfigurations, structureLimits, type StructureRecord } from '../engine/index.ts';
import type { PathIssue as FieldIssue } from '../engine/issueWords.ts';
import { levelProblems, type LevelDefinition, type LevelProblem } from '../levels/index.ts';
import type { Storage } from '../storage/storage.ts';

/** A level problem in one of the record's configurations (`configuration` 0 is the record as registered). */
export interface ConfigurationLevelProblem extends LevelProblem {
  configuration: number;
  configurationName: string;
  configurationCount: number;
}

/**
 * Problems of a level list on a record at one density, in every configuration the record has
 * (design §2.5: the levels run on whichever it stands in), the record as registered first. The
 * one rule the save, the site's default levels and the calculator (POST /api/assess `levels`)
 * check: each configuration's effective limit (engine/liveAssessment.ts) against the levels
 * (levels/triggerLadder.ts). Throws when the record cannot be assessed.
 */
export function recordLevelProblems(record: StructureRecord, levels: readonly LevelDefinition[], densityKgM3: number): ConfigurationLevelProblem[] {
  const configured = recordConfigurations(record);
  return configured.flatMap((c, configuration) =>
    levelProblems(levels, structureLimits(liveStructure(c.record).stability, densityKgM3).limitGustMps).map((problem) => ({
      ...problem,
      configuration,
      configurationName: c.name,
      configurationCount: configured.length,
    })),
  );
}

/**
 * The issues of a structure's own level list (paths `levels.<i>.trigger.<field>`), or of the
 * site's default levels it follows (path `levels`), as the save refuses them and the form shows
 * them: one issue per field, the configuration as registered first, another configuration named.
 */
export function structureLevelIssues(record: StructureRecord, levels: readonly LevelDefinition[], densityKgM3: number, followsSite: boolean): FieldIssue[] {
  const issues: FieldIssue[] = [];
  for (const problem of recordLevelProblems(record, levels, densityKgM3)) {
    const path = followsSite ? 'levels' : `levels.${problem.index}.trigger.${problem.field}`;
    if (problem.configuration > 0 && issues.some((i) => i.path === path)) continue;
    const message = followsSite ? `the site's default ${problem.message}` : problem.message;
    issues.push({ path, message: problem.configuration === 0 ? message : `in configuration "${problem.configurationName}": ${message}` });
  }
  return issues;
}

/** Problems of new site default levels for every active structure that follows them. */
export async function siteDefaultLevelIssues(storage: Storage, levels: readonly LevelDefinition[], densityKgM3: number): Promise<FieldIssue[]> {
  const rows = await storage.structures.activeOnSiteLevels();
  return rows.flatMap((row) => {
    try {
      return recordLevelProblems(row.recordJson as StructureRecord, levels, densityKgM3).map((problem) => ({
        path: `defaultLevels.${problem.index}.trigger.${problem.field}`,
        message: `for "${row.name}"${problem.configurationCount === 1 ? '' : ` in configuration "${problem.configurationName}"`} (which follows the site's levels): ${problem.message}`,
      }));
    } catch {
      // A stored record that cannot be assessed shows its own error on the board.
      return [];
    }
  });
}
