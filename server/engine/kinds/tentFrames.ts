/**
 * The tent's elements (kinds/tent.ts), design §2.4 v2.
 *
 * Elements, the portal frames (issue 11 item 7; an engineering review found that a leg checked on
 * its tributary lift alone misses the frame's overturning couple, which is what lifts a windward
 * leg): a frame is the pair of legs across the span at one y with its rafters, standing on a strip
 * as deep as the span (its two legs at x = 0 and x = widthM). Common practice for frame tents,
 * assumed here: the roof and wall cover carry their load to the frames by tributary width (half a
 * bay either side of a frame). A frame element carries:
 * - its bay's share of the long walls and the roof's side elevation (one bay for an interior
 *   frame, half a bay for an end frame), by the body's rules, and at an end frame the whole of its
 *   gable end (with its triangle): the cover hangs from the frame and stakes are not credited, and
 *   bracing, eave rails and purlins are not credited with spreading the gable's push along the
 *   ridge to the other frames, so an end frame's own feet take it (conservative: a braced end bay
 *   would share it with the next frame's feet);
 * - the net roof lift on its tributary strip in every roof case, with the zone distribution along
 *   the ridge (the end bay under a windward gable takes the F, G and H zones), at the strip's
 *   centroid of lift;
 * - its two legs' ballast and its share of the self-weight, half at each leg.
 * A frame is checked for tipping in its own plane and uplift, not for sliding: the eave rails and
 * purlins tie it to the other frames, so the tent slides as a whole (the body's check, on the
 * vector sum of every face, the gable push included).
 * Its overturning about the leeward leg line is the windward leg's uplift: with the leeward leg as
 * the pivot, the leg's tension is (M_h + M_lift)/widthM and the check γ·(M_h + M_lift)/(W_leg·widthM)
 * is γ·T/W_leg. Its out-of-plane tipping (about a line along the span) is not checked on the
 * frame (a strip: its ends are not checked): out of plane a frame stands by the eave rails,
 * purlins and bracing that tie it to the others, so that is the whole body's tipping about its
 * gable-end edges. "portal frame (interior)" is, in each roof case, the most loaded interior frame
 * (all interior frames have the same faces and masses; where no single frame has the most lift
 * and the largest moments about both leg lines, two entries envelope them); "end frame at the
 * y = 0 end" is the end frame there, and the one at y = lengthM is the same by symmetry unless the
 * two gable ends differ, when it is assessed too. Self-weight credited: an interior frame W_s/N
 * (N frames), an end frame W_s·(bay/2)/lengthM; whatever the split of the self-weight between
 * frames (the same for every frame) and cover (by plan area), neither exceeds the frame's own share.
 */
import type { DirectionalUplift, Element, Face } from '../structure.ts';
import type { resistanceSettings, SourceNote } from './recordBase.ts';
import type { TentRecord } from './tent.ts';
import { round, sideWords, type Rect, type SideState, type TaggedFace, type TentSide } from './tentPlan.ts';
import { liftOver, roofCaseBasis, upliftOf, type RoofCase } from './tentRoof.ts';

/** Element names (the y = baseWidthM end is the tent's y = lengthM end; caseWords names both ends by compass). */
export const tentElementNames = {
  interior: 'portal frame (interior)',
  endY0: 'end frame at the y = 0 end',
  endYW: 'end frame at the y = baseWidthM end',
} as const;

/** One frame's net lift per unit q (m²) at xM across the span, for the frame standing at yM. */
export interface FrameLift {
  yM: number;
  perPaM2: number;
  xM: number;
}

/**
 * The lift entries that stand for the worst of several frames with the same faces and masses (the
 * interior frames). A frame's checks grow with its lift (uplift, sliding) and with its lift's
 * moment about each leg line (overturning about the back legs: F·(widthM − x); about the front
 * legs: F·x), so the frame with the most of all three is the worst in every direction: one entry.
 * Where no single frame has the most of all three, two entries, each with the most lift and one
 * leg line's largest moment, are at least as onerous as every frame in every check (the engine
 * takes the worse of the alternatives). With the zones of Figure 7.8 the frames' strips differ only
 * along the ridge and a single frame always has the most; the envelope stands for other layouts.
 */
export function worstFrameLifts(lifts: readonly FrameLift[], widthM: number): Array<{ yM: number | null; perPaM2: number; xM: number; aboutLegs: 'front' | 'back' | null }> {
  if (lifts.length === 0) throw new RangeError('worstFrameLifts: lifts must list at least one frame');
  for (const [index, lift] of lifts.entries()) {
    if (!(lift.perPaM2 >= 0)) throw new RangeError(`worstFrameLifts: lifts.${index}.perPaM2 must be ≥ 0 m², got ${lift.perPaM2}`);
    if (!(lift.xM >= -1e-9 && lift.xM <= widthM + 1e-9)) throw new RangeError(`worstFrameLifts: lifts.${index}.xM must be within 0..${widthM} m, got ${lift.xM}`);
  }
  const clampX = (xM: number) => Math.min(widthM, Math.max(0, xM));
  const near = (value: number, best: number) => value >= best - 1e-9 * Math.max(1, Math.abs(best));
  const mostLift = Math.max(...lifts.map((lift) => lift.perPaM2));
  const mostAboutBack = Math.max(...lifts.map((lift) => lift.perPaM2 * (widthM - lift.xM)));
  const mostAboutFront = Math.max(...lifts.map((lift) => lift.perPaM2 * lift.xM));
  const worst = lifts.find(
    (lift) => near(lift.perPaM2, mostLift) && near(lift.perPaM2 * (widthM - lift.xM), mostAboutBack) && near(lift.perPaM2 * lift.xM, mostAboutFront),
  );
  if (worst !== undefined) return [{ yM: worst.yM, perPaM2: worst.perPaM2, xM: clampX(worst.xM), aboutLegs: null }];
  return [
    { yM: null, perPaM2: mostLift, xM: clampX(widthM - mostAboutBack / mostLift), aboutLegs: 'back' },
    { yM: null, perPaM2: mostLift, xM: clampX(mostAboutFront / mostLift), aboutLegs: 'front' },
  ];
}

/** What the frames take of the tent: its plan, sides, legs, faces, roof cases and resistance settings. */
export interface TentFrameInput {
  record: Pick<TentRecord, 'ballastPerLegKg' | 'selfWeightKg'>;
  lengthM: number;
  widthM: number;
  states: Record<TentSide, SideState>;
  settings: ReturnType<typeof resistanceSettings>['settings'];
  tagged: readonly TaggedFace[];
  cases: readonly RoofCase[];
  /** Each roof case's scale (tentRoof.ts `tentRoofLift`). */
  scales: readonly number[];
  /** The legs' positions along a row, m from the y = 0 end. */
  legYsM: readonly number[];
  legsPerRow: number;
  bayM: number;
}

/** The portal frames as elements, each on a strip as deep as the span (module comment), with their notes and sources. */
export function tentFrames(input: TentFrameInput): { elements: Element[]; notes: string[]; sources: SourceNote[] } {
  const { record, lengthM, widthM, states, settings, tagged, cases, scales, legYsM, legsPerRow, bayM } = input;
  const { ratedGustMps: _rated, ...elementSettings } = settings;
  const stripOf = (yM: number): Rect => ({ x0: 0, x1: widthM, y0: Math.max(0, yM - bayM / 2), y1: Math.min(lengthM, yM + bayM / 2) });
  const frameNotes: string[] = [];
  const frameElement = (name: string, framesYM: readonly number[], gable: 'endY0' | 'endYW' | null, selfShareKg: number, shareWords: string): Element => {
    const stripLengthM = framesYM.length > 0 ? stripOf(framesYM[0]!).y1 - stripOf(framesYM[0]!).y0 : 0;
    const share = stripLengthM / lengthM;
    const frameFaces: Face[] = tagged
      .filter((entry) => entry.part === 'alongRidge' || entry.part === gable)
      .map(({ face, part }) => (part === 'alongRidge' ? { ...face, label: `${face.label}, ${round(stripLengthM)} m of it`, areaM2: face.areaM2 * share } : face));
    const stripAreaM2 = widthM * stripLengthM;
    const frameCases: DirectionalUplift[] = cases.flatMap((roofCase, index) => {
      const lifts = framesYM.map((yM) => {
        const lift = liftOver(roofCase, stripOf(yM));
        return { yM, perPaM2: lift.perPaM2 * scales[index]!, xM: lift.xM };
      });
      return worstFrameLifts(lifts, widthM).map((worst) => ({
        label: `frame lift, ${roofCase.words} (${roofCaseBasis(roofCase)}; ${worst.yM === null ? `envelope of the frames: the largest moment about the ${worst.aboutLegs} legs` : `frame at y = ${round(worst.yM)} m`})`,
        ...upliftOf(stripAreaM2, worst.perPaM2),
        xM: worst.xM,
        centreDeg: roofCase.centreDeg,
        halfWidthDeg: roofCase.halfWidthDeg,
      }));
    });
    const halfShareKg = selfShareKg / 2;
    const legWords = `${record.ballastPerLegKg} kg of ballast and ${round(halfShareKg)} kg of self-weight`;
    frameNotes.push(
      `Element "${name}": ${round(stripLengthM)} m of the long walls and the roof's side elevation${gable === null ? '' : ` and the whole ${sideWords[gable]}`}, ` +
        `the roof lift on its ${round(widthM)} × ${round(stripLengthM)} m strip, and two legs, each with ${legWords} (${shareWords}).`,
    );
    return {
      name,
      baseDepthM: widthM,
      ...elementSettings,
      // Tipping in its own plane and its windward legs lifting; not sliding: the eave rails and
      // purlins tie it to the other frames, so the tent slides as a whole (the body's check).
      checks: ['overturning', 'uplift'],
      faces: frameFaces,
      upliftCases: frameCases,
      masses: [
        { label: `front leg: ${legWords}`, massKg: record.ballastPerLegKg + halfShareKg, xM: 0 },
        { label: `back leg: ${legWords}`, massKg: record.ballastPerLegKg + halfShareKg, xM: widthM },
      ],
    };
  };
  const interiorShareKg = record.selfWeightKg / legsPerRow;
  const endShareKg = (record.selfWeightKg * (bayM / 2)) / lengthM;
  const elements: Element[] = [];
  const interiorYsM = legYsM.slice(1, -1);
  if (interiorYsM.length > 0) {
    elements.push(frameElement(tentElementNames.interior, interiorYsM, null, interiorShareKg, `the self-weight over ${legsPerRow} frames`));
  }
  elements.push(frameElement(tentElementNames.endY0, [0], 'endY0', endShareKg, 'half a bay of the self-weight'));
  if (states.endY0 !== states.endYW) {
    elements.push(frameElement(tentElementNames.endYW, [lengthM], 'endYW', endShareKg, 'half a bay of the self-weight'));
  }
  const sources: SourceNote[] = [
    {
      item: 'bay between frames, m (a frame’s tributary width: half a bay either side)',
      value: bayM,
      source: 'common practice for frame tents: the roof and wall cover span between the frames and carry their load to them by tributary width, half a bay either side',
    },
    {
      item: 'share of its gable end’s wind taken by the end frame',
      value: 1,
      source:
        'assumed (conservative): the gable cover hangs from the end frame and stakes are not credited; bracing, eave rails and purlins are not credited with spreading the push along the ridge to the other frames',
    },
    ...(interiorYsM.length > 0
      ? [
          {
            item: 'self-weight credited to an interior frame, kg',
            value: interiorShareKg,
            source: 'assumed (conservative): the self-weight over the frames, W_s/N; no more than a frame’s own share whatever the split between frames and cover',
          },
        ]
      : []),
    {
      item: 'self-weight credited to an end frame, kg',
      value: endShareKg,
      source: 'assumed (conservative): half a bay of the self-weight by plan length, W_s·(bay/2)/lengthM; no more than the end frame’s own share whatever the split',
    },
  ];
  const notes = [
    'Elements: the portal frames, each a pair of legs across the span on a strip as deep as the span, with its tributary share of the cover (half a bay either side) and of the roof lift. ' +
      'A frame’s overturning about its leeward legs is its windward leg’s uplift: the leg’s tension (M_h + M_lift)/widthM against its ballast and self-weight share. ' +
      'An end frame takes the whole of its gable end’s wind on its own feet (bracing not credited along the ridge: conservative); out of plane a frame stands by the eave rails, purlins and bracing, so its tipping along the ridge is the body’s.' +
      (interiorYsM.length === 0 ? ' With two legs per row there are only the end frames.' : '') +
      (states.endY0 === states.endYW ? ' The end frame at y = lengthM is the mirror of the one at y = 0.' : ''),
    ...frameNotes,
  ];
  return { elements, notes, sources };
}
