/**
 * The register form's fields against the engine's record schemas (the source of truth for what a
 * record holds, server/engine/kinds/*.ts): every field of every kind has a form field (or is
 * listed below with the reason it has none), the form asks for what the schema requires, a new
 * form starts empty and says what is missing, and a stored record opened in the form and saved
 * again is the same record (checked by the engine's own validator).
 */
import { describe, expect, it } from 'vitest';
import { validateStructureRecord, type StructureRecord } from '../../server/engine/record.ts';
import { expandStructure } from '../../server/engine/kinds/index.ts';
import { faceSchema, massSchema, upliftSchema } from '../../server/engine/structure.ts';
import { domeOpeningSectorHalfWidthDeg, shellCoefficients } from '../../server/engine/kinds/shell.ts';
import { signboardEccentricityFraction } from '../../server/engine/kinds/screen.ts';
import { commonFields, configurationColumns, faceColumns, kindFields, massColumns, quotedKindValues, upliftColumns, type FieldDef } from '../../web/src/register/kindFields.ts';
import { draftFromView, draftLevels, draftRecord, emptyFaceRow, emptyMassRow, fieldsOf, newConfiguration, newDraft, renamedInLevels, withChangedField, type LocalIssues } from '../../web/src/register/structureDraft.ts';
import { recordConfigurations } from '../../server/engine/configuration.ts';
import { maxConfigurations } from '../../server/engine/kinds/recordBase.ts';
import { maxConfigurations as webMaxConfigurations } from '../../web/src/configurationState.ts';
import type { SpeedUnit } from '../../web/src/units.ts';
import { choicesOf, kindLeaves, schemaLeaves, structureKinds, type StructureKind } from './recordSchemaPaths.ts';

/** Schema fields without a FieldDef, each with the reason. */
const excluded: Readonly<Record<string, string>> = {
  kind: 'chosen with the kind buttons above the fields',
  name: 'its own input above the kind fields',
  wallsClosed: 'tent: the form sets each of the four sides (sides.*); a stored record’s wallsClosed fills the sides it does not list',
  faces: 'custom: its own row editor (faceColumns)',
  masses: 'custom: its own row editor (massColumns)',
  uplift: 'custom: its own editor (upliftColumns)',
  configurations: 'every kind: its own editor (configurationColumns, components/configurationsEditor.tsx), checked below',
};

/** Schema-optional fields the form requires anyway, each with the reason. */
const requiredInForm: Readonly<Record<string, string>> = {
  'sides.front': 'the form never writes wallsClosed, so every side must be chosen (no default: neither state is the safe one)',
  'sides.back': 'as sides.front',
  'sides.endY0': 'as sides.front',
  'sides.endYW': 'as sides.front',
};

const isExcluded = (path: string) => Object.keys(excluded).some((name) => path === name || path.startsWith(`${name}.`));

function formFields(kind: StructureKind): Map<string, FieldDef> {
  return new Map(fieldsOf(kind).map((field) => [field.path, field]));
}

describe('every field of every kind’s schema has a form field (server/engine/kinds/*.ts schemas)', () => {
  for (const kind of structureKinds) {
    it(`${kind}: every schema field is a FieldDef or excluded with a reason, and every FieldDef is a schema field`, () => {
      const fields = formFields(kind);
      const leaves = kindLeaves(kind);
      const missing = leaves.filter((leaf) => !isExcluded(leaf.path) && !fields.has(leaf.path)).map((leaf) => leaf.path);
      expect(missing).toEqual([]);
      const leafPaths = new Set(leaves.map((leaf) => leaf.path));
      const unknown = [...fields.keys()].filter((path) => !leafPaths.has(path));
      expect(unknown).toEqual([]);
    });

    it(`${kind}: a form field is optional exactly when the schema field is (except the listed ones), and its choices are the schema's`, () => {
      const fields = formFields(kind);
      for (const leaf of kindLeaves(kind)) {
        const field = fields.get(leaf.path);
        if (!field) continue;
        const expectedOptional = leaf.optional && !(leaf.path in requiredInForm);
        expect({ path: leaf.path, optional: field.optional === true }).toEqual({ path: leaf.path, optional: expectedOptional });
        const choices = choicesOf(leaf.schema);
        if (field.kind === 'select') {
          expect(choices, `${leaf.path} is a select but the schema has no choices`).not.toBeNull();
          expect(field.options!.map(([value]) => value).filter((value) => value !== '').sort()).toEqual([...choices!].sort());
        }
        if (field.kind === 'bool') expect(field.options?.map(([value]) => value).filter((value) => value !== '').sort() ?? ['false', 'true']).toEqual(['false', 'true']);
        if (field.kind === 'select' || field.kind === 'bool') {
          // The empty choice is listed, so a record without the field shows what applies, never a value it does not hold.
          expect(field.options!.some(([value]) => value === ''), `${leaf.path} lists no empty choice`).toBe(true);
        }
        if (field.kind === 'number' || field.kind === 'int' || field.kind === 'speed') expect(field.initial, `${leaf.path} starts with a number nobody typed`).toBeUndefined();
      }
    });
  }

  it('a custom record’s faces, masses and uplift have a column for every schema field (structure.ts faceSchema, massSchema, upliftSchema)', () => {
    expect(faceColumns.map((column) => column.key).sort()).toEqual(schemaLeaves(faceSchema).map((leaf) => leaf.path).sort());
    expect(massColumns.map((column) => column.key).sort()).toEqual(schemaLeaves(massSchema).map((leaf) => leaf.path).sort());
    // The uplift's label is kept from a loaded record (UpliftDraft.label) but not shown: one uplift needs no name.
    expect([...upliftColumns.map((column) => column.key), 'label'].sort()).toEqual(schemaLeaves(upliftSchema).map((leaf) => leaf.path).sort());
  });

  it('the configurations editor has a column for every field of a configuration, and the same limit on their number (kinds/recordBase.ts)', () => {
    for (const kind of structureKinds) {
      const leaves = kindLeaves(kind).filter((leaf) => leaf.arrayPath === 'configurations').map((leaf) => leaf.path.slice('configurations.'.length));
      expect(configurationColumns.map((column) => column.key).sort()).toEqual(leaves.sort());
    }
    expect(webMaxConfigurations).toBe(maxConfigurations);
  });

  it('every help text says something, and every kind field has a label (the form shows both)', () => {
    for (const field of [...Object.values(kindFields).flat(), ...commonFields]) {
      expect(field.label.length, field.path).toBeGreaterThan(2);
      expect(field.help.length, field.path).toBeGreaterThan(20);
    }
  });
});

describe('values the help quotes without importing them equal the engine’s (kinds/shell.ts, kinds/screen.ts)', () => {
  it('shell lift, dome drag and opening sector (shellCoefficients, domeOpeningSectorHalfWidthDeg) and the signboard eccentricity e = 0.25·b (EN 1991-1-4 §7.4.3)', () => {
    expect(quotedKindValues).toEqual({
      shellCrownSuctionLift: shellCoefficients.crownSuctionLift.value,
      shellCupLift: shellCoefficients.cupLift.value,
      shellEnclosedInternalPressure: shellCoefficients.enclosedInternalPressure.value,
      shellWindwardOpeningInternalPressure: shellCoefficients.windwardOpeningInternalPressure.value,
      shellDomeDrag: shellCoefficients.domeDrag.value,
      domeOpeningSectorHalfWidthDeg,
      signboardEccentricityFraction,
    });
  });

  it('the shell’s lift help quotes the engine’s closed-shell sum (1.2 + 0.2) as the calculator prints it', () => {
    const help = kindFields.shell.find((field) => field.path === 'coefficients.liftCoefficient')!.help;
    const closed = Math.round((shellCoefficients.crownSuctionLift.value + shellCoefficients.enclosedInternalPressure.value) * 1e9) / 1e9;
    expect(help).toContain(`band shell closed — ${closed} in every direction`);
  });
});

// --- Drafts and records.

function view(record: StructureRecord) {
  return {
    id: 1,
    name: record.name,
    kind: record.kind,
    record,
    orientationDeg: 0,
    location: '',
    latDeg: null,
    lonDeg: null,
    mobile: false,
    sensorKeys: null,
    levels: null,
    createdAtMs: 0,
    updatedAtMs: 0,
  };
}

function valid(input: unknown): StructureRecord {
  const result = validateStructureRecord(input);
  if (!result.ok) throw new Error(`example record is invalid: ${JSON.stringify(result.issues)}`);
  return result.record;
}

const source = 'invented calculation sheet for this test';

/** Invented example records: for each kind every field given, and the fewest fields a valid record needs. */
const examples: Readonly<Record<string, unknown>> = {
  'tent, every field': {
    kind: 'tent', name: 'Catering marquee', lengthM: 15, widthM: 9, eaveHeightM: 2.5, ridgeHeightM: 4.6,
    sides: { front: 'open', back: 'closed', endY0: 'closed', endYW: 'open' }, legs: 12, ballastPerLegKg: 400, selfWeightKg: 1300,
    coefficients: { wallCf: 1.3, openWallCf: 0.4, roofCf: 1.2, liftCoefficient: 1.1 }, coefficientSource: source,
    safetyFactors: { overturning: 1.6, sliding: 2.2, uplift: 1.7 }, ratedGustMps: 17.4, frictionCoefficient: 0.45, surface: 'hard', referenceHeightM: 5,
    configurationName: 'Sides as built',
    configurations: [
      { name: 'sides off', changes: { sides: { front: 'open', back: 'open', endY0: 'open', endYW: 'open' } } },
      { name: 'more ballast', changes: { ballastPerLegKg: 650, coefficients: { wallCf: 1.3, openWallCf: 0.4, roofCf: 1.2, liftCoefficient: 1.3 } } },
    ],
  },
  'tent, fewest fields': {
    kind: 'tent', name: 'Bar tent', lengthM: 6, widthM: 3, eaveHeightM: 2.1, ridgeHeightM: 3,
    sides: { front: 'closed', back: 'closed', endY0: 'closed', endYW: 'closed' }, legs: 4, ballastPerLegKg: 80, selfWeightKg: 150,
  },
  'banner, every field': {
    kind: 'banner', name: 'Gate hoarding', widthM: 10.5, panelWidthM: 3.5, panels: 3, heightM: 2, clearanceM: 0.1, solidity: 0.7, feet: 4,
    ballastPerFootKg: 60, endFootBallastKg: 90, footDepthM: 0.8, selfWeightKg: 120, coefficients: { cf: 1.5, endPanelCf: 2.4 }, coefficientSource: source,
    safetyFactors: { overturning: 1.5, sliding: 2.5, uplift: 1.5 }, ratedGustMps: 12.5, frictionCoefficient: 0.35, surface: 'grass', referenceHeightM: 2.5,
    configurationName: 'scrim on',
    // null removes the coefficients given: the board rule applies to the bare mesh.
    configurations: [{ name: 'scrim removed', changes: { solidity: 0.35, coefficients: null } }],
  },
  'banner, fewest fields': {
    kind: 'banner', name: 'Car-park fence', panels: 4, panelWidthM: 3.5, heightM: 1.8, clearanceM: 0, ballastPerFootKg: 50, footDepthM: 0.7, selfWeightKg: 100,
  },
  'screen, every field': {
    kind: 'screen', name: 'Main stage screen', widthM: 6, heightM: 3.5, bottomHeightM: 4, solidity: 0.9, supportTowers: 2, towerMassKg: 350, screenMassKg: 900,
    outriggerDepthM: 4.5, ballastPerTowerKg: 1200, towerSpacingM: 5.2, towerWidthM: 0.3, towerDepthM: 0.5, towerHeightM: 8, headerTrussDepthM: 0.3,
    structuralFactor: 1.1, onCrane: false, coefficients: { cf: 1.8, towerCf: 2, trussCf: 1.6 }, coefficientSource: source, ratedGustMps: 15,
    safetyFactors: { overturning: 1.7, sliding: 2, uplift: 1.6 }, frictionCoefficient: 0.4, surface: 'hard', referenceHeightM: 9,
    configurationName: 'Raised',
    configurations: [
      { name: 'lowered', changes: { bottomHeightM: 0.5, referenceHeightM: 5.5 } },
      // A speed in a configuration comes back exactly as stored, whatever unit the form shows.
      { name: 'lowered, rated', changes: { bottomHeightM: 0.5, ratedGustMps: 22.37, onCrane: false } },
    ],
  },
  'screen, fewest fields': {
    kind: 'screen', name: 'Side screen', widthM: 4, heightM: 2.5, bottomHeightM: 2, supportTowers: 2, towerMassKg: 200, screenMassKg: 400, outriggerDepthM: 3, ballastPerTowerKg: 600,
  },
  'shell (band shell), every field': {
    kind: 'shell', name: 'Band shell', radiusM: 5, shape: 'quarterSphere', form: 'closed', baseHeightM: 1, baseDepthM: 6, baseWidthM: 11, selfWeightKg: 2500,
    frontBallastKg: 800, backBallastKg: 600, coefficients: { cfFront: 1.2, cfBack: 0.5, cfSide: 1, liftCoefficient: 1.3 }, coefficientSource: source,
    safetyFactors: { overturning: 1.5, sliding: 2, uplift: 1.8 }, ratedGustMps: 18, frictionCoefficient: 0.6, surface: 'hard', referenceHeightM: 6.5,
    configurationName: 'curtains closed',
    configurations: [{ name: 'curtains open', changes: { form: 'open' } }],
  },
  'shell (dome), every field of a dome': {
    kind: 'shell', name: 'Dome tent', radiusM: 6, shape: 'hemisphere', form: 'open', baseDepthM: 12.5, baseWidthM: 12.5, selfWeightKg: 1800, ringBallastKg: 3000, referenceHeightM: 7,
  },
  'shell, fewest fields': { kind: 'shell', name: 'Old band shell', radiusM: 4, selfWeightKg: 2000 },
  'custom, every field': {
    kind: 'custom', name: 'Sponsor arch', baseDepthM: 2, baseWidthM: 4, frictionCoefficient: 0.5, surface: 'hard', referenceHeightM: 4.5,
    faces: [
      { label: 'sign', areaM2: 8, centroidHeightM: 3, cfFront: 1.8, cfBack: 1.8, facingDeg: 0 },
      { areaM2: 2, centroidHeightM: 3, cfFront: 1.2, cfBack: 1.1, facingDeg: 90 },
    ],
    uplift: { label: 'canopy', planAreaM2: 6, liftCoefficient: 0.8, xM: 1, yM: 2.5 },
    masses: [
      { label: 'block A', massKg: 900, xM: 0.2, yM: 0.5 },
      { massKg: 900, xM: 1.8 },
    ],
    safetyFactors: { overturning: 1.5, sliding: 2, uplift: 1.5 }, ratedGustMps: 20, coefficientSource: source,
    configurationName: 'sign up',
    configurations: [
      // The faces are edited in the form; masses have no editor in a configuration and are kept as stored.
      { name: 'sign off', changes: { faces: [{ label: 'frame', areaM2: 2, centroidHeightM: 3, cfFront: 1.2, cfBack: 1.1, facingDeg: 90 }], masses: [{ massKg: 900, xM: 0.2, yM: 0.5 }] } },
    ],
  },
  'custom, first-round strip (README example)': {
    kind: 'custom', name: 'Sponsor arch', baseDepthM: 1.5, frictionCoefficient: 0.3,
    faces: [{ areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 }],
    masses: [{ label: 'ballast', massKg: 1000, xM: 0.75 }],
    safetyFactors: { overturning: 1.5, sliding: 2, uplift: 1.5 }, ratedGustMps: 20,
  },
};

describe('a stored record opened in the form and saved again is the same record (engine validateStructureRecord)', () => {
  for (const [name, input] of Object.entries(examples)) {
    for (const unit of ['m/s', 'kn'] as const satisfies readonly SpeedUnit[]) {
      it(`${name}, speeds shown in ${unit}`, () => {
        const original = valid(input);
        const issues: LocalIssues = new Map();
        const saved = draftRecord(draftFromView(view(original), [], unit), unit, issues);
        expect([...issues]).toEqual([]);
        const again = validateStructureRecord(saved);
        expect(again.ok ? [] : again.issues).toEqual([]);
        expect(saved).toEqual(original);
      });
    }
  }

  it('the examples between them give every field of every kind (so the round trips cover the whole form)', () => {
    for (const kind of structureKinds) {
      const given = new Set<string>();
      for (const input of Object.values(examples).filter((record) => (record as { kind: string }).kind === kind)) {
        const collect = (value: unknown, prefix: string) => {
          if (Array.isArray(value)) value.forEach((item) => collect(item, prefix));
          else if (prefix === 'configurations.changes') given.add(prefix);
          else if (value !== null && typeof value === 'object') for (const [key, child] of Object.entries(value)) collect(child, prefix === '' ? key : `${prefix}.${key}`);
          else given.add(prefix);
        };
        collect(input, '');
      }
      const notGiven = kindLeaves(kind).map((leaf) => leaf.path).filter((path) => !given.has(path) && path !== 'wallsClosed');
      expect({ kind, notGiven }).toEqual({ kind, notGiven: [] });
    }
  });

  it('a tent stored with wallsClosed (a first-round record) opens with its four sides set and saves an equivalent record: the same expansion', () => {
    for (const wallsClosed of [true, false]) {
      const original = valid({ kind: 'tent', name: 'Hospitality marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed, legs: 8, ballastPerLegKg: 500, selfWeightKg: 900 });
      const draft = draftFromView(view(original), [], 'm/s');
      const state = wallsClosed ? 'closed' : 'open';
      expect(['sides.front', 'sides.back', 'sides.endY0', 'sides.endYW'].map((path) => draft.values[path])).toEqual([state, state, state, state]);
      const saved = valid(draftRecord(draft, 'm/s'));
      expect(saved).not.toHaveProperty('wallsClosed');
      expect(expandStructure(saved)).toEqual(expandStructure(original));
    }
    // A side listed in sides wins over wallsClosed (tent.ts resolvedTentSides), in the form as in the engine.
    const mixed = valid({ kind: 'tent', name: 'Mixed', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed: true, sides: { front: 'open' }, legs: 8, ballastPerLegKg: 500, selfWeightKg: 900 });
    const saved = valid(draftRecord(draftFromView(view(mixed), [], 'm/s'), 'm/s'));
    expect(saved).toMatchObject({ sides: { front: 'open', back: 'closed', endY0: 'closed', endYW: 'closed' } });
    expect(expandStructure(saved)).toEqual(expandStructure(mixed));
  });
});

describe('configurations in the form (design §2.5; engine/configuration.ts applies the changes)', () => {
  it('a first-round tent whose configurations change wallsClosed or some sides saves configurations with the same expansion each (kinds/tent.ts resolvedTentSides)', () => {
    const original = valid({
      kind: 'tent', name: 'Hospitality marquee', lengthM: 12, widthM: 6, eaveHeightM: 2.4, ridgeHeightM: 4, wallsClosed: true, legs: 8, ballastPerLegKg: 500, selfWeightKg: 900,
      configurations: [
        { name: 'walls off', changes: { wallsClosed: false } },
        { name: 'front open', changes: { sides: { front: 'open' } } },
        { name: 'back open, rest off', changes: { wallsClosed: false, sides: { back: 'closed' } } },
      ],
    });
    const saved = valid(draftRecord(draftFromView(view(original), [], 'm/s'), 'm/s'));
    expect(JSON.stringify(saved)).not.toContain('wallsClosed');
    const before = recordConfigurations(original);
    const after = recordConfigurations(saved);
    expect(after.map((c) => c.name)).toEqual(before.map((c) => c.name));
    after.forEach((c, i) => expect({ name: c.name, expansion: expandStructure(c.record) }).toEqual({ name: c.name, expansion: expandStructure(before[i]!.record) }));
  });

  it('a new configuration asks for its name and a change; a group change starts from the record as registered', () => {
    const draft = draftFromView(view(valid(examples['tent, fewest fields'])), [], 'm/s');
    draft.configurations = [newConfiguration()];
    const issues: LocalIssues = new Map();
    draftRecord(draft, 'm/s', issues);
    expect([...issues.keys()].sort()).toEqual(['configurations.0.changes', 'configurations.0.name']);

    const sidesOff = withChangedField({ ...newConfiguration('sides off') }, draft, 'sides');
    // The four sides as registered, to be changed one by one.
    expect(sidesOff.values).toEqual({ 'sides.front': 'closed', 'sides.back': 'closed', 'sides.endY0': 'closed', 'sides.endYW': 'closed' });
    sidesOff.values['sides.front'] = 'open';
    draft.configurations = [sidesOff];
    const again: LocalIssues = new Map();
    const record = draftRecord(draft, 'm/s', again);
    expect([...again]).toEqual([]);
    expect(record.configurations).toEqual([{ name: 'sides off', changes: { sides: { front: 'open', back: 'closed', endY0: 'closed', endYW: 'closed' } } }]);
    expect(validateStructureRecord(record).ok).toBe(true);
  });

  it('a configuration field left empty is named at the server’s path, and an optional one emptied is removed (null: its default applies)', () => {
    const draft = draftFromView(view(valid(examples['screen, every field'])), [], 'm/s');
    const lowered = withChangedField(withChangedField(newConfiguration('lowered'), draft, 'bottomHeightM'), draft, 'towerHeightM');
    lowered.values.bottomHeightM = '';
    lowered.values.towerHeightM = '';
    draft.configurations = [lowered];
    const issues: LocalIssues = new Map();
    const record = draftRecord(draft, 'm/s', issues);
    expect([...issues]).toEqual([['configurations.0.changes.bottomHeightM', 'is required']]);
    expect(record.configurations).toEqual([{ name: 'lowered', changes: { bottomHeightM: null, towerHeightM: null } }]);
  });
});

describe('a level’s action that moves the structure (levelDefinition.ts moveToConfiguration)', () => {
  it('is sent only when chosen, follows a renamed configuration, and is kept (visibly) while the name is retyped', () => {
    const rows = [
      { label: 'Watch', kind: 'utilization' as const, value: '60', actionText: 'Check the ballast.' },
      { label: 'Prepare', kind: 'utilization' as const, value: '80', actionText: 'Lower the screen.', moveToConfiguration: 'lowered' },
    ];
    expect(draftLevels(rows, 'm/s')).toEqual([
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Check the ballast.' },
      { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.8 }, actionText: 'Lower the screen.', moveToConfiguration: 'lowered' },
    ]);
    expect(renamedInLevels(rows, 'Lowered', 'lowered to the deck').map((l) => l.moveToConfiguration)).toEqual([undefined, 'lowered to the deck']);
    expect(renamedInLevels(rows, 'lowered', '').map((l) => l.moveToConfiguration)).toEqual([undefined, 'lowered']);
  });
});

describe('a new form starts empty and names what is missing (no default stands in for a dimension)', () => {
  for (const kind of structureKinds) {
    it(`${kind}: a new draft holds only the preselected defaults, and every required field is reported “is required”`, () => {
      const draft = newDraft(kind, [], 'm/s');
      const preselected = fieldsOf(kind).filter((field) => field.initial !== undefined);
      expect(Object.keys(draft.values).sort()).toEqual(preselected.map((field) => field.path).sort());
      for (const field of preselected) expect(['select', 'bool']).toContain(field.kind);

      const issues: LocalIssues = new Map();
      const record = draftRecord(draft, 'm/s', issues);
      const requiredPaths = fieldsOf(kind).filter((field) => !field.optional).map((field) => field.path);
      const expected = ['name', ...requiredPaths];
      if (kind === 'custom') expected.push('faces.0.areaM2', 'faces.0.centroidHeightM', 'faces.0.cfFront', 'faces.0.cfBack', 'masses.0.massKg', 'masses.0.xM');
      // A fence's run: the panel width and count are asked for (the schema needs one of the ways to give the run, kinds/banner.ts bannerLayout).
      if (kind === 'banner') expected.push('panelWidthM', 'panels');
      expect([...issues.keys()].sort()).toEqual(expected.sort());
      for (const message of issues.values()) expect(message).toMatch(/^is required/);
      // Nothing required was filled in, so the engine refuses the record too.
      for (const path of requiredPaths) expect(path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], record)).toBeUndefined();
      expect(validateStructureRecord(record).ok).toBe(false);
    });
  }

  it('empty optional fields of a custom row and its uplift are left out, not sent as 0 (engine defaults: facing 0, y and uplift point at the middle)', () => {
    const draft = newDraft('custom', [], 'm/s');
    draft.name = 'Arch';
    draft.values.baseDepthM = '2';
    draft.faces = [{ ...emptyFaceRow(), areaM2: '6', centroidHeightM: '2', cfFront: '1.8', cfBack: '1.8' }];
    // A row built the way structureForm.tsx builds one, without the new optional keys.
    draft.masses = [{ ...emptyMassRow(), massKg: '500', xM: '1' }, { label: '', massKg: '500', xM: '1.5' }];
    draft.upliftOn = true;
    draft.uplift = { planAreaM2: '4', liftCoefficient: '0.5' };
    const issues: LocalIssues = new Map();
    const record = draftRecord(draft, 'm/s', issues);
    expect([...issues]).toEqual([]);
    expect(record).toEqual({
      kind: 'custom',
      name: 'Arch',
      baseDepthM: 2,
      surface: 'grass',
      faces: [{ areaM2: 6, centroidHeightM: 2, cfFront: 1.8, cfBack: 1.8 }],
      masses: [{ massKg: 500, xM: 1 }, { massKg: 500, xM: 1.5 }],
      uplift: { planAreaM2: 4, liftCoefficient: 0.5 },
    });
    expect(validateStructureRecord(record).ok).toBe(true);
  });

  it('nested form paths become nested objects in the record (sides.front → { sides: { front } })', () => {
    const draft = newDraft('tent', [], 'm/s');
    Object.assign(draft.values, { 'sides.front': 'open', 'sides.back': 'closed', 'coefficients.openWallCf': '0,3' });
    const record = draftRecord(draft, 'm/s');
    expect(record.sides).toEqual({ front: 'open', back: 'closed' });
    expect(record.coefficients).toEqual({ openWallCf: 0.3 });
  });
});
