/**
 * Kinds: templates that expand plain dimensions into faces and masses (design §2.3), and the
 * expansion of any record.
 */
import type { StructureRecord } from '../record.ts';
import { expandBanner } from './banner.ts';
import { expandCustom } from './custom.ts';
import { expandScreen } from './screen.ts';
import { expandShell } from './shell.ts';
import { expandTent } from './tent.ts';
import type { Expansion } from './recordBase.ts';

export type { Expansion, SourceNote } from './recordBase.ts';
export { defaultCoefficients, frictionBySurface, type SourcedValue, type Surface } from './coefficients.ts';
export {
  boardForceCoefficient,
  freeStandingWallCpNet,
  freeStandingWallMeanCpNet,
  solidBoardCoefficient,
  solidityFactor,
  wallZones,
  type WallZone,
} from './boardCoefficient.ts';

/** Any valid record as the expanded structure, the sources of its values and its reference height. */
export function expandStructure(record: StructureRecord): Expansion {
  switch (record.kind) {
    case 'tent':
      return expandTent(record);
    case 'banner':
      return expandBanner(record);
    case 'screen':
      return expandScreen(record);
    case 'shell':
      return expandShell(record);
    case 'custom':
      return expandCustom(record);
  }
}
