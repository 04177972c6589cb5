/**
 * Every structure kind as the web shows it, in the order the register form offers them (the
 * engine's order, server/engine/kinds/index.ts `kindDefinitions`; tests/unit/kindRegistry.test.ts
 * checks both lists agree). A `Record<StructureKind, KindForm>`: a kind the engine has and this
 * list lacks fails the web type check (`npm run typecheck`).
 */
import type { StructureKind } from '../../types.ts';
import { bannerForm } from './banner.ts';
import { customForm } from './custom.ts';
import type { KindForm } from './kindForm.ts';
import { screenForm } from './screen.ts';
import { shellForm } from './shell.ts';
import { tentForm } from './tent.ts';

export const kindForms: Readonly<Record<StructureKind, KindForm>> = {
  tent: tentForm,
  banner: bannerForm,
  screen: screenForm,
  shell: shellForm,
  custom: customForm,
};

/** Every kind, in the form's order. */
export const formKinds = Object.keys(kindForms) as StructureKind[];

export type { FieldDef, FieldKind, KindForm, OutlineView } from './kindForm.ts';
