/**
 * The kind registry (issue 15): each structure kind is declared once on the engine's side
 * (server/engine/kinds/<kind>.ts `defineKind`, listed in kinds/index.ts `kindDefinitions`) and once
 * on the web's (web/src/register/kinds/<kind>.ts, listed in register/kinds/index.ts), and
 * everything else iterates over those lists. The kinds themselves are those of design §2.4 and §4
 * (tent, banner, screen, shell, custom); the drawing data is checked on hand-worked geometry.
 */
import { describe, expect, it } from 'vitest';
import { kindDefinition, kindDefinitions } from '../../server/engine/kinds/index.ts';
import { structureKinds, structureRecordSchema, type StructureKind } from '../../server/engine/record.ts';
import { formKinds, kindForms, type KindForm } from '../../web/src/register/kinds/index.ts';
import { bannerForm } from '../../web/src/register/kinds/banner.ts';
import { screenForm } from '../../web/src/register/kinds/screen.ts';
import { shellForm } from '../../web/src/register/kinds/shell.ts';
import { tentForm } from '../../web/src/register/kinds/tent.ts';

describe('kind registry: one list on each side, the same kinds', () => {
  it('the engine has the kinds of design §2.4 and §4, in the order the form offers them', () => {
    // design.md §2.4 (tent, banner, screen, shell) and §4 (the custom record).
    expect(structureKinds).toEqual(['tent', 'banner', 'screen', 'shell', 'custom']);
  });

  it('each definition is its schema’s kind, and the record union holds the schemas in the list’s order', () => {
    for (const definition of kindDefinitions) expect(definition.schema.shape.kind.value).toBe(definition.kind);
    expect(structureRecordSchema.options.map((schema) => schema.shape.kind.value)).toEqual(kindDefinitions.map((d) => d.kind));
  });

  it('the web lists the engine’s kinds in the engine’s order (the form’s kind buttons)', () => {
    expect(formKinds).toEqual([...structureKinds]);
    expect(Object.keys(kindForms)).toEqual([...structureKinds]);
  });

  it('names a record of each kind with its article, as messages do (“is not a field of a screen record”)', () => {
    for (const kind of structureKinds) expect(kindDefinition(kind).recordWords).toMatch(new RegExp(`^an? ${kind}$`));
  });

  it('refuses a name that is not a kind', () => {
    expect(() => kindDefinition('yurt' as StructureKind)).toThrow(RangeError);
  });

  it('a web list without a kind is a type error (checked by `npx tsc --noEmit -p .`)', () => {
    // @ts-expect-error the custom kind is missing: a Record<StructureKind, KindForm> must list every kind.
    const incomplete: Readonly<Record<StructureKind, KindForm>> = { tent: tentForm, banner: bannerForm, screen: screenForm, shell: shellForm };
    expect(Object.keys(incomplete)).toHaveLength(4);
  });
});

describe('kind registry: the side view’s data, hand-worked', () => {
  // A drawing 10 units right of the base's left edge, the ground at 100, 10 units per metre, y up.
  const view = (axis: 'x' | 'y', spanM: number) => ({ axis, spanM, u: (m: number) => 10 + 10 * m, y: (m: number) => 100 - 10 * m, scale: 10 });

  it('faces start at the levels each record gives: a tent’s eaves, a fence’s clearance, a screen’s bottom and top edges, a shell’s base', () => {
    expect(tentForm.faceLevelsM({ kind: 'tent', eaveHeightM: 2.4, ridgeHeightM: 4 })).toEqual([2.4]);
    expect(bannerForm.faceLevelsM({ kind: 'banner', clearanceM: 0.1 })).toEqual([0.1]);
    // Bottom edge 3 m, screen 2.5 m high: its top at 3 + 2.5 = 5.5 m.
    expect(screenForm.faceLevelsM({ kind: 'screen', bottomHeightM: 3, heightM: 2.5 })).toEqual([3, 5.5]);
    // Half typed: the top is unknown until both are given.
    expect(screenForm.faceLevelsM({ kind: 'screen', bottomHeightM: 3 })).toEqual([3, null]);
    expect(shellForm.faceLevelsM({ kind: 'shell', baseHeightM: 1.2 })).toEqual([1.2]);
    expect(kindForms.custom.faceLevelsM({ kind: 'custom' })).toEqual([]);
  });

  it('a tent seen across its 6 m span is a gable: walls to the 2.4 m eaves, the 4 m ridge at mid-span', () => {
    // u(0) = 10, u(3) = 40, u(6) = 70; y(0) = 100, y(2.4) = 76, y(4) = 60.
    expect(tentForm.sideOutline!({ kind: 'tent', eaveHeightM: 2.4, ridgeHeightM: 4 }, view('x', 6))).toBe('M10 100 V76 L40 60 L70 76 V100 Z');
    // Along its 12 m length: a rectangle up to the ridge. u(12) = 130.
    expect(tentForm.sideOutline!({ kind: 'tent', eaveHeightM: 2.4, ridgeHeightM: 4 }, view('y', 12))).toBe('M10 100 V60 H130 V100 Z');
  });

  it('a band shell of radius 3 m on a 0.5 m deck is a quarter circle seen from the end', () => {
    // Across a 4 m depth: r = min(3, 4) = 3; from (u(0), y(0.5)) = (10, 95) up to y(3.5) = 65, an arc of radius 30 to (u(3), 95) = (40, 95).
    expect(shellForm.sideOutline!({ kind: 'shell', radiusM: 3, baseHeightM: 0.5 }, view('x', 4))).toBe('M10 95 V65 A30 30 0 0 1 40 95 Z');
    // Along a 6 m width: r = min(3, 6 / 2) = 3, a half circle from u(0) = 10 to u(6) = 70.
    expect(shellForm.sideOutline!({ kind: 'shell', radiusM: 3, baseHeightM: 0.5 }, view('y', 6))).toBe('M10 95 A30 30 0 0 1 70 95 Z');
  });
});
