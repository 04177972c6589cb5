/**
 * The README documents every field of every structure kind (issue 11: "a page in the README
 * documents every field of every kind with its unit, default and source"; design §4: "every field
 * of every kind is documented in the README"). The fields are read from the engine's own zod
 * schemas (tests/unit/recordSchemaPaths.ts), so a field added to a kind without a line in the
 * README fails here. Each must appear in backticks in its kind's ### subsection of
 * "## Structure kinds" (nested fields dotted: `coefficients.cf`, `sides.front`; an array's fields
 * as `faces[].areaM2`), the fields every record has in "### Fields every kind has".
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { commonFieldsHeading, kindDocsProblems, markdownSection, structureKinds } from './recordSchemaPaths.ts';

const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
const problems = kindDocsProblems(readme);
/** The problems of one kind (or "common"), and the missing section's, which leaves every field undocumented. */
const problemsOf = (prefix: string) => problems.filter((problem) => problem.startsWith(`${prefix}:`) || problem.startsWith('section:'));

describe('README "## Structure kinds" documents every field of every kind (engine record schemas)', () => {
  it('has the section the README links to as #structure-kinds', () => {
    expect(readme).toContain('](#structure-kinds)');
    expect(markdownSection(readme, 'Structure kinds'), 'README.md has no "## Structure kinds" heading').not.toBeNull();
  });

  it(`documents the fields every record has (recordBase.ts) in "${commonFieldsHeading}"`, () => {
    expect(problemsOf('common')).toEqual([]);
  });

  for (const kind of structureKinds) {
    it(`documents every field of ${kind} in its own ### subsection, in backticks`, () => {
      expect(problemsOf(kind)).toEqual([]);
    });
  }

  it('catches an undocumented field (the check itself can fail: a section without `sides.front` is reported)', () => {
    const section = markdownSection(readme, 'Structure kinds') ?? '';
    const withoutSide = readme.replace(section, section.split('`sides.front`').join('sides.front'));
    expect(kindDocsProblems(withoutSide)).toContain('tent: `sides.front` is not in ### Tent (`tent`)');
  });
});
