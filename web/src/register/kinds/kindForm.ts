/**
 * What the web needs of one structure kind, declared once in the kind's own file
 * (web/src/register/kinds/<kind>.ts; the engine's side is server/engine/kinds/<kind>.ts): its name
 * and introduction on the form, its fields with their help, the changes its crew usually make, the
 * words for its far end, what the side view draws for it, and the form's rules that are the
 * kind's own. `kinds/index.ts` lists them as a `Record<StructureKind, KindForm>`, so a kind the
 * engine has and the web does not fails the web type check.
 *
 * Why a second file per kind: the engine's kind file holds the zod schema, and importing it would
 * put zod (about 0.4 MB) into the phone's app. What the help quotes is imported from the engine's
 * zod-free modules (coefficients.ts, memberCoefficients.ts, stability.ts), or quoted in
 * `quotedKindValues` and checked against the engine by tests/unit/registerFields.test.ts.
 */
import { defaultCoefficients } from '../../../../server/engine/kinds/coefficients.ts';

export type FieldKind = 'number' | 'int' | 'text' | 'bool' | 'select' | 'speed';

export interface FieldDef {
  /** Dotted path in the record: "widthM", "coefficients.cf", "safetyFactors.sliding", "sides.front". */
  path: string;
  label: string;
  unit?: string;
  kind: FieldKind;
  /** The record may leave it out (a default then applies, named in the help). Otherwise empty is "is required". */
  optional?: boolean;
  help: string;
  /** Choices of a select or bool: [value, words]. A '' value is the "not given" choice. */
  options?: Array<[string, string]>;
  /** Value a new record starts with (text as typed): only a true default, never a dimension. */
  initial?: string;
  /** Shown in the box when empty: an example ("e.g. 12") or the default that then applies. */
  placeholder?: string;
  /** Another way to give what the fields before it give (a fence's run length and feet): shown folded, under the others. */
  alternative?: boolean;
}

/** How the side view places an outline (sideView.tsx): the axis it looks along and its scale. */
export interface OutlineView {
  /** 'x': across the depth, front on the left; 'y': along the width, the y = 0 end on the left. */
  axis: 'x' | 'y';
  /** The base's extent along the view, m. */
  spanM: number;
  /** Drawing x of a distance along the view from its left edge, m. */
  u(m: number): number;
  /** Drawing y of a height above the ground, m. */
  y(m: number): number;
  /** Drawing units per metre. */
  scale: number;
}

/** Problems found before asking the server, keyed like the server's issues (structureDraft.ts LocalIssues). */
export type FormIssues = Map<string, string>;

export interface KindForm {
  /** The kind's name on the form's kind buttons and in the register list. */
  name: string;
  /** What the kind is and how it is assessed, under the kind buttons. */
  intro: string;
  /** Its own fields in the form's order (the fields every kind has follow: kindFields.ts commonFields). */
  fields: FieldDef[];
  /** The fields its crew typically change with a plan action (design §2.5): offered first in the configurations editor. */
  suggestedChanges: readonly string[];
  /** What the base width is called on its form, for the engine's "the y = baseWidthM end" (fieldWords.ts). */
  baseWidthWords: string;
  /** Heading of the folded alternative fields (`alternative: true`), when it has any. */
  alternativesSummary?: string;
  /**
   * Heights the record gives where a face may start (the side view: a face's extent runs from the
   * highest such level below its centroid). Empty: faces stand on the ground.
   */
  faceLevelsM(record: Readonly<Record<string, unknown>>): Array<number | null>;
  /** The kind's outline behind the faces of the whole structure, for recognition: an SVG path, or null. */
  sideOutline?(record: Readonly<Record<string, unknown>>, view: OutlineView): string | null;
  /**
   * An editor the form shows besides the fields: 'fencePanels' (common panel sizes, the panel
   * width and count and the run they make, above the fields: `editorFields` are shown there, not in
   * the grid); 'rows' (faces, masses and an uplift given directly as rows, below the fields: the
   * record's `faces`, `masses` and `uplift`).
   */
  editor?: 'fencePanels' | 'rows';
  /** Fields the editor shows instead of the grid. */
  editorFields?: readonly string[];
  /** Problems the form names before asking the server (a check of the engine that only runs once every number is there). */
  localIssues?(values: Readonly<Record<string, string>>, issues: FormIssues): void;
  /** Form values filled from a stored record's fields the form has none for (a tent's `wallsClosed`), after the fields are read. */
  loadValues?(record: Readonly<Record<string, unknown>>, values: Record<string, string>): void;
  /** Stored configuration changes the form writes another way (`loadChanges` handles them), skipped when reading changes. */
  changesReadElsewhere?: readonly string[];
  /** A stored configuration's changes read into its form fields and values, after the others (a tent's `wallsClosed` as its four sides). */
  loadChanges?(record: Readonly<Record<string, unknown>>, changes: Readonly<Record<string, unknown>>, into: { fields: string[]; values: Record<string, string> }): void;
}

/**
 * Engine values the help quotes that cannot be imported without zod (see the module comment);
 * each is checked against its engine constant by tests/unit/registerFields.test.ts.
 */
export const quotedKindValues = {
  /** kinds/shell.ts shellCoefficients.crownSuctionLift */
  shellCrownSuctionLift: 1.2,
  /** kinds/shell.ts shellCoefficients.cupLift */
  shellCupLift: 1.42,
  /** kinds/shell.ts shellCoefficients.enclosedInternalPressure */
  shellEnclosedInternalPressure: 0.2,
  /** kinds/shell.ts shellCoefficients.windwardOpeningInternalPressure */
  shellWindwardOpeningInternalPressure: 0.72,
  /** kinds/shell.ts shellCoefficients.domeDrag */
  shellDomeDrag: 0.47,
  /** kinds/shell.ts domeOpeningSectorHalfWidthDeg */
  domeOpeningSectorHalfWidthDeg: 60,
  /** kinds/screen.ts signboardEccentricityFraction */
  signboardEccentricityFraction: 0.25,
} as const;

/** The engine's default coefficients with their sources (kinds/coefficients.ts), as the help quotes them. */
export const cf = defaultCoefficients;
export const q = quotedKindValues;

/** A number the record gives, or null (the side view reads records as typed, which may be half done). */
export function recordNumber(v: unknown): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

/** The help of a board's coefficient field (a banner's run, a screen). */
export const boardRule =
  `Empty: the board rule — ${cf.signboard.source}; a board standing on the ground takes the EN 1991-1-4 Table 7.9 wall value averaged over zones A–D (not below 1.80); ` +
  'mesh is reduced by k(φ) = 1 − (1 − φ)^1.5 (ASCE 7-16 ch. 29, signs with openings). A value here replaces the rule (solidity is then not applied again) and needs a stated source.';

export const overrideNote = 'A value here needs a stated source (below).';

export const everyDirection = 'Assessed for wind from every direction (every 15° and the normal of each face), the worst one governing.';
