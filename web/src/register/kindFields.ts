/**
 * The fields of each structure kind as the register form shows them: label, unit and help text
 * (what it is, its unit, where its default comes from). The help follows the field docs of the
 * record schemas (server/engine/kinds/*.ts); the default coefficients and their sources are the
 * engine's own values, imported, so the form can never quote a different number than the
 * calculator uses.
 */
import { defaultCoefficients, frictionBySurface } from '../../../server/engine/kinds/coefficients.ts';
import { defaultSafetyFactors, safetyFactorSources } from '../../../server/engine/stability.ts';
import type { StructureKind } from '../types.ts';

export type FieldKind = 'number' | 'int' | 'text' | 'bool' | 'select' | 'speed';

export interface FieldDef {
  /** Dotted path in the record: "widthM", "coefficients.cf", "safetyFactors.sliding". */
  path: string;
  label: string;
  unit?: string;
  kind: FieldKind;
  optional?: boolean;
  help: string;
  options?: Array<[string, string]>;
  /** Value a new record starts with (text as typed). */
  initial?: string;
  /** Shown in the box when empty: the default that then applies. */
  placeholder?: string;
}

const cf = defaultCoefficients;
const boardRule =
  `Empty: the board rule — ${cf.signboard.source}; a board standing on the ground takes the EN 1991-1-4 Table 7.9 wall value averaged over zones A–D (not below 1.80); ` +
  'mesh is reduced by k(φ) = 1 − (1 − φ)^1.5 (ASCE 7-16 ch. 29, signs with openings). A value here replaces the rule (solidity is then not applied again) and needs a stated source.';

export const kindNames: Readonly<Record<StructureKind, string>> = {
  tent: 'Tent or marquee',
  banner: 'Banner, fence scrim or hoarding',
  screen: 'Screen on support towers',
  shell: 'Shell or curved canopy',
  custom: 'Other (faces and masses given directly)',
};

export const kindIntro: Readonly<Record<StructureKind, string>> = {
  tent: 'A rectangular tent with legs in two rows along the long sides, walls closed or open and a pitched roof. Assessed for wind broadside onto the long side (the worse direction for a tent at least as long as wide). Only weight resists: stakes and ground anchors are not credited.',
  banner: 'A banner fence, hoarding or mesh scrim on feet: a flat board with a clearance under it. The whole run is taken as one rigid body; the banner and its ballast stand at the middle of the feet.',
  screen: 'An LED screen or projection surface raised on support towers with outriggers front and back. The outrigger spread is the base; each tower’s ballast is split between its front and back feet.',
  shell: 'A curved canopy such as a band shell: a quarter sphere of radius R standing on its base with its open (concave) side to the front. Coefficients are hemisphere drag coefficients (Munson fig. 9.20).',
  custom: 'Wind-loaded faces and resisting masses given directly, for anything the other kinds do not fit. Every coefficient you give needs its source below.',
};

export const kindFields: Readonly<Record<StructureKind, FieldDef[]>> = {
  tent: [
    { path: 'lengthM', label: 'Length (long side)', unit: 'm', kind: 'number', initial: '12', help: 'The long side. The wind is assessed broadside onto this side.' },
    { path: 'widthM', label: 'Width (short side)', unit: 'm', kind: 'number', initial: '6', help: 'The short side: the base depth between the two rows of legs. Must not exceed the length.' },
    { path: 'eaveHeightM', label: 'Eave height', unit: 'm', kind: 'number', initial: '2.4', help: 'Height of the top of the walls above the ground.' },
    { path: 'ridgeHeightM', label: 'Ridge height', unit: 'm', kind: 'number', initial: '4', help: 'Height of the ridge, at least the eave height. The gust is taken at this height unless a reference height is given.' },
    {
      path: 'wallsClosed',
      label: 'Walls',
      kind: 'bool',
      initial: 'true',
      options: [
        ['true', 'closed (whole side elevation loaded)'],
        ['false', 'open or removed (wind passes under the roof)'],
      ],
      help: `Closed: walls and roof rise are loaded. Open: only the roof rise is loaded horizontally (${cf.tentOpenWall.source}).`,
    },
    { path: 'legs', label: 'Legs', unit: 'count', kind: 'int', initial: '8', help: 'Number of legs, an even number: half stand along each long side.' },
    { path: 'ballastPerLegKg', label: 'Ballast per leg', unit: 'kg', kind: 'number', initial: '500', help: 'Weights or water barrels on each leg. Pegs, stakes and anchors are not credited.' },
    { path: 'selfWeightKg', label: 'Self-weight', unit: 'kg', kind: 'number', initial: '800', help: 'Frame, cover and floor that move with the tent; acts at the middle of the base.' },
    { path: 'coefficients.wallCf', label: 'Wall force coefficient c_f', kind: 'number', optional: true, placeholder: 'default', help: `Empty: ${cf.tentElevation.value} with walls closed — ${cf.tentElevation.source}; ${cf.tentOpenWall.value} with walls open.` },
    { path: 'coefficients.roofCf', label: 'Roof force coefficient c_f (side elevation)', kind: 'number', optional: true, placeholder: String(cf.tentElevation.value), help: `Empty: ${cf.tentElevation.value} — ${cf.tentElevation.source}.` },
    { path: 'coefficients.liftCoefficient', label: 'Roof uplift coefficient c_lift', kind: 'number', optional: true, placeholder: String(cf.tentRoofLift.value), help: `Net upward force coefficient on the plan area. Empty: ${cf.tentRoofLift.value} — ${cf.tentRoofLift.source}.` },
  ],
  banner: [
    { path: 'widthM', label: 'Length of the run', unit: 'm', kind: 'number', initial: '10', help: 'Total length of the banner run, b.' },
    { path: 'heightM', label: 'Banner height', unit: 'm', kind: 'number', initial: '2', help: 'Height of the banner itself, h (not counting the gap under it).' },
    { path: 'clearanceM', label: 'Clearance under it', unit: 'm', kind: 'number', initial: '0.1', help: 'Gap between the ground and the banner’s bottom edge, z_g. Raised more than h/4 it counts as a signboard (EN 1991-1-4 §7.4.3).' },
    { path: 'solidity', label: 'Solidity φ', kind: 'number', optional: true, placeholder: '1', help: 'Solid area ÷ gross area: 1 for solid material (the default when empty), about 0.3–0.7 for mesh. Take it from the material sheet; a mesh that clogs with dirt or rain acts as solid.' },
    { path: 'feet', label: 'Feet', unit: 'count', kind: 'int', initial: '6', help: 'Number of feet (bases) along the run.' },
    { path: 'ballastPerFootKg', label: 'Ballast per foot', unit: 'kg', kind: 'number', initial: '100', help: 'Weights on each foot.' },
    { path: 'footDepthM', label: 'Foot depth', unit: 'm', kind: 'number', initial: '1', help: 'Depth of a foot in the wind direction (across the run): the base depth that resists tipping.' },
    { path: 'selfWeightKg', label: 'Self-weight', unit: 'kg', kind: 'number', initial: '150', help: 'Banner, frame and feet without the ballast.' },
    { path: 'coefficients.cf', label: 'Force coefficient c_f (gross area)', kind: 'number', optional: true, placeholder: 'board rule', help: boardRule },
  ],
  screen: [
    { path: 'widthM', label: 'Screen width', unit: 'm', kind: 'number', initial: '5', help: 'Width of the screen surface, b.' },
    { path: 'heightM', label: 'Screen height', unit: 'm', kind: 'number', initial: '3', help: 'Height of the screen surface, h.' },
    { path: 'bottomHeightM', label: 'Bottom edge height', unit: 'm', kind: 'number', initial: '3', help: 'Height of the screen’s bottom edge above the ground, z_g.' },
    { path: 'solidity', label: 'Solidity φ', kind: 'number', optional: true, placeholder: '1', help: 'Solid area ÷ gross area: 1 for a closed screen (the default when empty), less for a mesh LED screen (from the manufacturer).' },
    { path: 'supportTowers', label: 'Support towers', unit: 'count', kind: 'int', initial: '2', help: 'Number of towers carrying the screen.' },
    { path: 'towerMassKg', label: 'Mass per tower', unit: 'kg', kind: 'number', initial: '400', help: 'Each tower with its base and outriggers, without ballast.' },
    { path: 'screenMassKg', label: 'Screen mass', unit: 'kg', kind: 'number', initial: '800', help: 'Screen panels and their frame.' },
    { path: 'outriggerDepthM', label: 'Outrigger spread', unit: 'm', kind: 'number', initial: '4', help: 'Distance between the front and back outrigger feet in the wind direction: the base depth.' },
    { path: 'ballastPerTowerKg', label: 'Ballast per tower', unit: 'kg', kind: 'number', initial: '1000', help: 'Ballast on each tower, half on its front and half on its back outrigger foot.' },
    { path: 'coefficients.cf', label: 'Force coefficient c_f (gross area)', kind: 'number', optional: true, placeholder: 'board rule', help: boardRule },
  ],
  shell: [
    { path: 'radiusM', label: 'Radius R', unit: 'm', kind: 'number', initial: '4', help: 'Radius of the quarter sphere. Projected area πR²/2; the gust is taken at its top.' },
    {
      path: 'form',
      label: 'Form',
      kind: 'select',
      optional: true,
      initial: 'open',
      options: [
        ['open', 'open: hollow, concave side to the front'],
        ['closed', 'closed: flat wall across the opening'],
      ],
      help: `Open: c_f ${cf.hollowHemisphereConcave.value} into the cup, ${cf.hollowHemisphereConvex.value} onto the back (Munson fig. 9.20, hollow hemisphere). Closed: ${cf.solidHemisphereFlat.value} onto the flat face, ${cf.solidHemisphereCurved.value} onto the curve (solid hemisphere).`,
    },
    { path: 'baseHeightM', label: 'Base height', unit: 'm', kind: 'number', optional: true, placeholder: '0', help: 'Height of the shell’s base above the ground, e.g. on a stage deck. Empty: 0 m.' },
    { path: 'baseDepthM', label: 'Base depth', unit: 'm', kind: 'number', optional: true, placeholder: 'radius', help: 'Depth of the base from the opening to the back, at least R. Empty: the radius (the shell’s own footprint).' },
    { path: 'selfWeightKg', label: 'Self-weight', unit: 'kg', kind: 'number', initial: '2000', help: 'Shell and its frame; acts at R/2 behind the opening.' },
    { path: 'frontBallastKg', label: 'Front ballast', unit: 'kg', kind: 'number', optional: true, placeholder: '0', help: 'Ballast along the opening (the front edge of the base).' },
    { path: 'backBallastKg', label: 'Back ballast', unit: 'kg', kind: 'number', optional: true, placeholder: '0', help: 'Ballast at the back edge of the base.' },
    { path: 'coefficients.cfFront', label: 'c_f wind onto the front', kind: 'number', optional: true, placeholder: 'default', help: `Empty: ${cf.hollowHemisphereConcave.value} (open) — ${cf.hollowHemisphereConcave.source}; ${cf.solidHemisphereFlat.value} (closed).` },
    { path: 'coefficients.cfBack', label: 'c_f wind onto the back', kind: 'number', optional: true, placeholder: 'default', help: `Empty: ${cf.hollowHemisphereConvex.value} (open) — ${cf.hollowHemisphereConvex.source}; ${cf.solidHemisphereCurved.value} (closed).` },
    { path: 'coefficients.liftCoefficient', label: 'Uplift coefficient c_lift', kind: 'number', optional: true, placeholder: 'none', help: 'Adds uplift on the plan area πR²/2. Empty: no uplift (no source gives one for a shell); give the designer’s value with its source.' },
  ],
  custom: [
    { path: 'baseDepthM', label: 'Base depth', unit: 'm', kind: 'number', initial: '1.5', help: 'Depth of the base in the wind direction, between the two tipping edges. Mass positions are measured from its front edge.' },
  ],
};

/** Fields every kind has. */
export const commonFields: FieldDef[] = [
  { path: 'ratedGustMps', label: 'Rated gust (designer or manufacturer)', kind: 'speed', optional: true, placeholder: 'none', help: 'The designer’s or manufacturer’s rated operational gust (usually a 3-second gust). The effective limit is the lower of this and the calculated limit. Empty when there is none.' },
  {
    path: 'surface',
    label: 'Ground under the ballast',
    kind: 'select',
    optional: true,
    initial: 'grass',
    options: [
      ['grass', `grass (μ ${frictionBySurface.grass.value})`],
      ['hard', `hard surface (μ ${frictionBySurface.hard.value})`],
    ],
    help: `Sets the default friction coefficient. Grass: ${frictionBySurface.grass.source}. Hard: ${frictionBySurface.hard.source}.`,
  },
  { path: 'frictionCoefficient', label: 'Friction coefficient μ', kind: 'number', optional: true, placeholder: 'from the ground', help: 'Base-to-ground friction, 0–1. Empty: the value of the ground chosen above. Give a measured or published value for the actual feet and surface.' },
  { path: 'referenceHeightM', label: 'Reference height', unit: 'm', kind: 'number', optional: true, placeholder: 'top', help: 'Height the measured gust is moved to (EN 1991-1-4 profile). Empty: the top of the structure.' },
  { path: 'safetyFactors.overturning', label: 'Safety factor γ, overturning', kind: 'number', optional: true, placeholder: String(defaultSafetyFactors.overturning), help: `1–5. Empty: ${defaultSafetyFactors.overturning} — ${safetyFactorSources.overturning}.` },
  { path: 'safetyFactors.sliding', label: 'Safety factor γ, sliding', kind: 'number', optional: true, placeholder: String(defaultSafetyFactors.sliding), help: `1–5. Empty: ${defaultSafetyFactors.sliding} — ${safetyFactorSources.sliding}.` },
  { path: 'safetyFactors.uplift', label: 'Safety factor γ, uplift', kind: 'number', optional: true, placeholder: String(defaultSafetyFactors.uplift), help: `1–5. Empty: ${defaultSafetyFactors.uplift} — ${safetyFactorSources.uplift}.` },
  { path: 'coefficientSource', label: 'Source of overridden coefficients', kind: 'text', optional: true, help: 'Required when you give any coefficient above: name the standard and clause, the handbook and figure, or the manufacturer’s sheet. For an “other” structure it is quoted as the source of its faces’ coefficients.' },
];

export const faceColumns = [
  { key: 'label', label: 'Face', unit: '', help: 'A name for the face (optional).' },
  { key: 'areaM2', label: 'Area', unit: 'm²', help: 'Projected area normal to the wind: what you see looking along the wind.' },
  { key: 'centroidHeightM', label: 'Centroid height', unit: 'm', help: 'Height of the area’s centroid above the ground: the lever arm of its force.' },
  { key: 'cfFront', label: 'c_f front', unit: '', help: 'Force coefficient with the wind onto the front side.' },
  { key: 'cfBack', label: 'c_f back', unit: '', help: 'Force coefficient with the wind onto the back side.' },
] as const;

export const massColumns = [
  { key: 'label', label: 'Mass', unit: '', help: 'What it is: self-weight, ballast block, water barrel (optional).' },
  { key: 'massKg', label: 'Mass', unit: 'kg', help: 'Mass in kilograms.' },
  { key: 'xM', label: 'Position x', unit: 'm', help: 'Position across the base from the front edge, 0 to the base depth.' },
] as const;
