/**
 * Words that reach people from the register form and the API: the validation library's defaults
 * become plain phrases (server/engine/issueWords.ts), engine sentences are said with the form's
 * labels (web/src/register/fieldWords.ts), issue paths are named by the label beside the field, and
 * the fence form's "the run: … on N feet" follows the engine's own layout rule (kinds/banner.ts).
 *
 * The library phrases checked against are zod's own default messages, produced here by zod itself
 * (the reference library), not copied by hand.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { plainIssueMessage } from '../../server/engine/issueWords.ts';
import { validateStructureRecord } from '../../server/engine/record.ts';
import { expandStructure } from '../../server/engine/kinds/index.ts';
import { bannerLayout } from '../../server/engine/kinds/banner.ts';
import { fieldIssues } from '../../server/http/httpError.ts';
import { formWords, issueFields, namedField } from '../../web/src/register/fieldWords.ts';
import { commonFields, kindFields, panelPresets } from '../../web/src/register/kindFields.ts';
import { bannerRun } from '../../web/src/register/structureDraft.ts';
import type { StructureKind } from '../../web/src/types.ts';

const libraryWords = /Invalid (input|option|discriminator|string|number|key|element)|expected \w+, received|Too (small|big)|Unrecognized/;

describe('the validation library’s defaults become plain phrases (zod 4 default messages, produced by zod)', () => {
  const schema = z.strictObject({
    count: z.number().int(),
    name: z.string().min(3),
    tags: z.array(z.string()).min(2),
    side: z.enum(['closed', 'open']),
    flag: z.boolean(),
    step: z.number().multipleOf(5),
    small: z.number().max(10),
    email: z.string().email(),
  });
  const issues = schema.safeParse({ count: 1.5, name: 'ab', tags: ['x'], side: 'ajar', flag: 'yes', step: 3, small: 11, email: 'nope' }, { reportInput: true }).error!.issues;
  const byPath = new Map(issues.map((issue) => [issue.path.join('.'), plainIssueMessage(issue)]));

  it('every default message is rewritten and none keeps the library’s words', () => {
    for (const issue of issues) expect(issue.message, 'zod still words it its own way').toMatch(/^(Invalid|Too (small|big))\b/);
    for (const [path, message] of byPath) expect(message, path).not.toMatch(libraryWords);
  });

  it('each says what would be accepted, and the value given where it helps', () => {
    expect(Object.fromEntries(byPath)).toEqual({
      count: 'must be a whole number',
      name: 'must be at least 3 characters',
      tags: 'must list at least 2',
      side: 'must be “closed” or “open”, not “ajar”',
      flag: 'must be true or false, not text (“yes”)',
      step: 'must be a multiple of 5',
      small: 'must be ≤ 10',
      email: 'must be an e-mail address',
    });
  });

  it('a missing field is required, with what kind of value; without the input reported the phrase still holds', () => {
    const missing = z.object({ heightM: z.number(), label: z.string() }).safeParse({}).error!.issues;
    expect(missing.map(plainIssueMessage)).toEqual(['is required (a number)', 'is required (text)']);
    const text = z.object({ heightM: z.number() }).safeParse({ heightM: '2' }).error!.issues;
    expect(text.map(plainIssueMessage)).toEqual(['must be a number, not text']);
  });

  it('a message the schema gives itself is kept as it is', () => {
    const own = z.object({ heightM: z.number().gt(0, 'must be > 0 m') }).safeParse({ heightM: -1 }).error!.issues;
    expect(own.map(plainIssueMessage)).toEqual(['must be > 0 m']);
  });

  it('the HTTP layer’s mapper (every route’s 400) words them the same, unknown keys at their own path', () => {
    const result = z.strictObject({ heightM: z.number() }).safeParse({ hieghtM: 2 });
    expect(fieldIssues(result.error!.issues, 'record')).toEqual([
      { path: 'record.heightM', message: 'is required (a number)' },
      { path: 'record.hieghtM', message: 'is not a field here (check the spelling)' },
    ]);
  });

  it('a structure record: an unknown kind names the kinds there are and the one given; not an object says so', () => {
    expect(validateStructureRecord({ kind: 'yurt', name: 'Bar' })).toEqual({ ok: false, issues: [{ path: 'kind', message: 'must be one of tent, banner, screen, shell or custom, not “yurt”' }] });
    expect(validateStructureRecord({ name: 'Bar' })).toEqual({ ok: false, issues: [{ path: 'kind', message: 'is required: one of tent, banner, screen, shell or custom' }] });
    expect(validateStructureRecord('tent')).toEqual({ ok: false, issues: [{ path: '', message: 'must be an object, not text (“tent”)' }] });
  });
});

describe('a reference height below a face’s centroid is refused (the gust there under-reads that face: EN 1991-1-4 §4.3, the profile grows with height)', () => {
  const arch = {
    kind: 'custom',
    name: 'Arch',
    baseDepthM: 1.2,
    faces: [
      { label: 'header board', areaM2: 5, centroidHeightM: 3.2, cfFront: 1.8, cfBack: 1.8 },
      { areaM2: 1.8, centroidHeightM: 1.4, cfFront: 1.2, cfBack: 1.2 },
    ],
    masses: [{ massKg: 800, xM: 0.6 }],
    coefficientSource: 'demo values for an invented arch',
  };

  it('custom: below the header board’s 3.2 m it is refused with the height, the face and the default (2 × 3.2 = 6.4 m)', () => {
    const result = validateStructureRecord({ ...arch, referenceHeightM: 3 });
    expect(result.ok).toBe(false);
    const issues = result.ok ? [] : result.issues;
    expect(issues.map((i) => i.path)).toEqual(['referenceHeightM']);
    expect(issues[0]!.message).toContain('must be at least 3.2 m, the height of the centroid of “header board”');
    expect(issues[0]!.message).toContain('the top of the structure (6.4 m)');
    expect(validateStructureRecord({ ...arch, referenceHeightM: 3.2 }).ok).toBe(true);
  });

  it('a face of no area loads nothing and does not count', () => {
    const faces = [...arch.faces, { label: 'empty frame', areaM2: 0, centroidHeightM: 9, cfFront: 1.2, cfBack: 1.2 }];
    expect(validateStructureRecord({ ...arch, faces, referenceHeightM: 3.5 }).ok).toBe(true);
  });

  // For every kind, from its own expansion: just below the highest loaded face centroid is refused, at it accepted.
  const kindsRecords: Array<Record<string, unknown>> = [
    { kind: 'tent', name: 'Tent', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed: true, legs: 8, ballastPerLegKg: 500, selfWeightKg: 900 },
    { kind: 'banner', name: 'Fence', panelWidthM: 3.5, panels: 3, heightM: 2, clearanceM: 0.1, ballastPerFootKg: 40, footDepthM: 1, selfWeightKg: 100 },
    { kind: 'screen', name: 'Screen', widthM: 4, heightM: 2.5, bottomHeightM: 3, supportTowers: 2, towerMassKg: 400, screenMassKg: 700, outriggerDepthM: 3.5, ballastPerTowerKg: 1200 },
    { kind: 'shell', name: 'Shell', radiusM: 3.5, selfWeightKg: 2000, frontBallastKg: 600, backBallastKg: 1500 },
  ];
  for (const record of kindsRecords) {
    it(`${String(record.kind)}: refused 1 cm below its highest face centroid, accepted at it`, () => {
      const checked = validateStructureRecord(record);
      expect(checked.ok).toBe(true);
      const expansion = expandStructure((checked as { ok: true; record: Parameters<typeof expandStructure>[0] }).record);
      const highestM = Math.max(...[...expansion.structure.faces, ...(expansion.structure.elements ?? []).flatMap((e) => e.faces)].filter((f) => f.areaM2 > 0).map((f) => f.centroidHeightM));
      const low = validateStructureRecord({ ...record, referenceHeightM: highestM - 0.01 });
      expect(low.ok ? [] : low.issues.map((i) => i.path)).toEqual(['referenceHeightM']);
      expect(validateStructureRecord({ ...record, referenceHeightM: highestM }).ok).toBe(true);
    });
  }

  it('tent: the highest centroid is the roof’s side elevation at eave + rise / 2 = 2.4 + 0.8 = 3.2 m (hand-worked)', () => {
    const low = validateStructureRecord({ ...kindsRecords[0], referenceHeightM: 3.19 });
    expect(low.ok ? '' : low.issues[0]!.message).toContain('must be at least 3.2 m, the height of the centroid of “roof, side elevation”');
  });
});

describe('engine sentences in the form’s words (fieldWords.ts formWords)', () => {
  it('ends and field names become what the form shows', () => {
    expect(formWords('gable end at y = lengthM (closed, with its gable triangle)', 'tent')).toBe('gable end at y = length (closed, with its gable triangle)');
    expect(formWords('end frame at the y = baseWidthM end', 'tent')).toBe('end frame at the y = length end');
    expect(formWords('must be ≥ eaveHeightM (2.4 m)', 'tent')).toBe('must be ≥ “Eave height” (2.4 m)');
    expect(formWords('coefficients.wallCf applies to closed sides only. Give coefficients.openWallCf if they carry wind.', 'tent')).toBe(
      '“Closed wall force coefficient c_f” applies to closed sides only. Give “Open side force coefficient c_f” if they carry wind.',
    );
    expect(formWords('give referenceHeightM.', 'custom')).toBe('give “Reference height”.');
    expect(formWords('Have an engineer give structuralFactor (with coefficientSource).', 'screen')).toBe('Have an engineer give “Structural factor c_s·c_d” (with “Source of overridden coefficients”).');
    // Plain words that happen to be field names (panels, feet, legs) stay words.
    expect(formWords('is required: the number of panels, or give the number of feet', 'banner')).toBe('is required: the number of panels, or give the number of feet');
  });

  const brokenRecords: Record<StructureKind, Array<Record<string, unknown>>> = {
    tent: [{ kind: 'tent', name: 'T', lengthM: 12, widthM: 6, eaveHeightM: 3, ridgeHeightM: 2, wallsClosed: true, legs: 7, ballastPerLegKg: 0, selfWeightKg: 0 }],
    banner: [
      { kind: 'banner', name: 'B', heightM: 2, clearanceM: 0, ballastPerFootKg: 1, footDepthM: 1, selfWeightKg: 1 },
      { kind: 'banner', name: 'B', widthM: 12, panelWidthM: 3.5, panels: 4, heightM: 2, clearanceM: 0, ballastPerFootKg: 1, footDepthM: 1, selfWeightKg: 1 },
      { kind: 'banner', name: 'B', panelWidthM: 3.5, heightM: 2, clearanceM: 0, ballastPerFootKg: 1, footDepthM: 1, selfWeightKg: 1, coefficients: { cf: 1 } },
    ],
    screen: [{ kind: 'screen', name: 'S', widthM: 4, heightM: 2.5, bottomHeightM: 3, supportTowers: 1, towerSpacingM: 3, towerMassKg: 0, screenMassKg: 0, outriggerDepthM: 3.5, ballastPerTowerKg: 0, structuralFactor: 1.2 }],
    shell: [{ kind: 'shell', name: 'Sh', radiusM: 3.5, shape: 'hemisphere', baseDepthM: 2, baseWidthM: 2, selfWeightKg: 0, frontBallastKg: 5 }],
    custom: [{ kind: 'custom', name: 'C', baseDepthM: 1, faces: [{ areaM2: 1, centroidHeightM: 1, cfFront: 1, cfBack: 1 }], masses: [{ massKg: 10, xM: 2, yM: 1 }], uplift: { planAreaM2: 1, liftCoefficient: 1, xM: 3 }, referenceHeightM: 0.5 }],
  };

  for (const [kind, records] of Object.entries(brokenRecords) as Array<[StructureKind, Array<Record<string, unknown>>]>) {
    it(`${kind}: no issue message, said in the form's words, names a field the form shows by its API name`, () => {
      const fieldNames = [...kindFields[kind], ...commonFields].map((f) => f.path).filter((p) => /[a-z][A-Z]|\./.test(p));
      for (const record of records) {
        const result = validateStructureRecord(record);
        expect(result.ok, JSON.stringify(record)).toBe(false);
        for (const issue of result.ok ? [] : result.issues) {
          const words = formWords(issue.message, kind);
          expect(words).not.toMatch(libraryWords);
          for (const name of fieldNames) expect(words, `${issue.path}: ${words}`).not.toMatch(new RegExp(`(?<![\\w.])${name.replace(/\./g, '\\.')}(?![\\w])`));
          expect(words).not.toMatch(/y = (lengthM|baseWidthM)/);
        }
      }
    });
  }
});

describe('issue paths named as the form names its fields (fieldWords.ts namedField, issueFields)', () => {
  it('kind fields, rows, levels and placement by their labels, each with the control to go to', () => {
    expect(namedField('record.lengthM', 'tent')).toEqual({ label: 'Length along the ridge', controlId: 'sf-lengthM' });
    expect(namedField('structure.sides.front', 'tent')).toEqual({ label: 'Front wall', controlId: 'sf-sides-front' });
    expect(namedField('structure.faces.1.areaM2', 'custom')).toEqual({ label: 'Face 2: area', controlId: 'face-1-areaM2' });
    expect(namedField('levels.2.trigger.gustMps', 'banner')).toEqual({ label: 'Level 3: trigger', controlId: 'sl-2-value' });
    expect(namedField('orientationDeg', 'banner')).toEqual({ label: 'Front faces towards', controlId: 'sf-orient' });
    expect(namedField('structure.panelWidthM', 'banner')).toEqual({ label: 'Panel width', controlId: 'sf-panelWidthM' });
    expect(namedField('record', 'banner')).toEqual({ label: 'The structure as a whole', controlId: null });
  });

  it('a configuration’s fields and a level’s configuration by the form’s labels, numbered after the one as registered (issue 14)', () => {
    expect(namedField('record.configurations.0.name', 'screen')).toEqual({ label: 'Configuration 2: name', controlId: 'cf-0-name' });
    expect(namedField('structure.configurations.1.changes.bottomHeightM', 'screen')).toEqual({ label: 'Configuration 3: Bottom edge height', controlId: 'cf-1-bottomHeightM' });
    expect(namedField('structure.configurations.0.changes.sides.front', 'tent')).toEqual({ label: 'Configuration 2: Front wall', controlId: 'cf-0-sides-front' });
    // A change of a whole group names its first field.
    expect(namedField('structure.configurations.0.changes.sides', 'tent')).toEqual({ label: 'Configuration 2: Front wall', controlId: 'cf-0-sides-front' });
    expect(namedField('structure.configurations.0.changes.faces.1.areaM2', 'custom')).toEqual({ label: 'Configuration 2: face 2 area', controlId: 'cf-0-face-1-areaM2' });
    expect(namedField('record.configurations.0.changes', 'banner')).toEqual({ label: 'Configuration 2: changes', controlId: 'cf-0-add' });
    expect(namedField('levels.1.moveToConfiguration', 'screen')).toEqual({ label: 'Level 2: moves the structure to', controlId: 'sl-1-move' });
  });

  it('several complaints about one field are one entry, in the form’s words', () => {
    expect(issueFields([['record.ridgeHeightM', 'must be ≥ eaveHeightM (2.4 m)'], ['ridgeHeightM', 'must be ≤ 200 m']], 'tent')).toEqual([
      { label: 'Ridge height', controlId: 'sf-ridgeHeightM', problem: 'must be ≥ “Eave height” (2.4 m); must be ≤ 200 m' },
    ]);
  });
});

describe('the fence form says the run as the engine lays it out (kinds/banner.ts bannerLayout)', () => {
  const cases: Array<Record<string, number>> = [
    { panelWidthM: 3.5, panels: 3 },
    { panelWidthM: 3.5, panels: 3, feet: 6 },
    { widthM: 14, panelWidthM: 3.5 },
    { widthM: 20, feet: 10 },
    { widthM: 6, feet: 1 },
    { widthM: 15, panels: 5, feet: 11 },
    { panels: 4, panelWidthM: 2.3 },
  ];
  for (const given of cases) {
    it(`${JSON.stringify(given)}`, () => {
      const layout = bannerLayout(given);
      expect(layout.ok).toBe(true);
      const run = bannerRun(Object.fromEntries(Object.entries(given).map(([k, v]) => [k, String(v)])));
      const { runLengthM, panels, panelWidthM, feet } = (layout as { ok: true; value: ReturnType<typeof bannerRun> & object }).value;
      expect(run).toEqual({ runLengthM, panels, panelWidthM, feet });
    });
  }

  it('says nothing until it can be told, or when the numbers disagree (the calculator names that)', () => {
    expect(bannerRun({ panelWidthM: '3.5' })).toBeNull();
    expect(bannerRun({ widthM: '12', panelWidthM: '3.5', panels: '4' })).toBeNull();
    expect(bannerLayout({ widthM: 12, panelWidthM: 3.5, panels: 4 }).ok).toBe(false);
  });

  it('the panel presets are plain sizes the engine takes (common practice, from memory: 3.5 m × 2.0 m mesh site fence panels)', () => {
    expect(panelPresets.find((p) => p.id === 'mesh-fence')).toMatchObject({ panelWidthM: 3.5, heightM: 2.0 });
    for (const p of panelPresets) expect(bannerLayout({ panelWidthM: p.panelWidthM, panels: 3 }).ok).toBe(true);
  });
});
