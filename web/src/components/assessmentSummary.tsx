/**
 * The calculator's answer in words and a table: what governs, what could not be checked, each
 * element with its own limit, and every direction assessed (relative to the front and, with the
 * structure's orientation, by compass) with its utilization, criterion and limit — the governing
 * one marked. Used by the register form and the structure page, so both say the same.
 */
import { compassPointName, criterionWords, sideName, windWords } from '../../../server/engine/caseWords.ts';
import { formWords } from '../register/fieldWords.ts';
import type { AssessAnswer, StructureKind } from '../types.ts';
import { percent, speed, type SpeedUnit } from '../units.ts';
import { sideLabel, type Side } from './structureGeometry.ts';

type DirectionReport = AssessAnswer['directions'][number];

const sides: readonly Side[] = ['front', 'endYW', 'back', 'endY0'];

/** "0° front", "15°", "90° north end": θ relative to the front, naming the side it is square onto. */
function relativeDirection(directionDeg: number, frontAzimuthDeg: number | null): string {
  const rounded = Math.round(directionDeg * 10) / 10;
  const quarter = Math.round(directionDeg / 90) % 4;
  const square = Math.abs(directionDeg - quarter * 90) < 0.05 || Math.abs(directionDeg - 360) < 0.05;
  const side = sides[quarter]!;
  // The front and back keep their plain names here; the compass point follows on its own line.
  const name = side === 'front' || side === 'back' ? side : sideLabel(side, frontAzimuthDeg);
  return square ? `${rounded}° ${name}` : `${rounded}°`;
}

/** "sliding", "uplift", "tips about the back edge" — short, for a table cell. */
function criterionShort(d: { governing: DirectionReport['governing']; tippingEdge: DirectionReport['tippingEdge'] }, frontAzimuthDeg: number | null): string {
  if (d.governing !== 'overturning') return d.governing;
  const side = d.tippingEdge;
  return `tips about ${side === 'front' || side === 'back' ? `the ${side} edge` : `the ${sideLabel(side, frontAzimuthDeg)}`}`;
}

const utilizationText = (value: number | null): string => (value === null ? 'unbounded' : percent(value));

/**
 * An engine sentence or name in the form's words: with the kind known, field names become the
 * form's labels (register/fieldWords.ts formWords: "give referenceHeightM" → "give “Reference
 * height”"); without it, the far end is still said plainly ("y = baseWidthM" → "y = base width").
 */
export function engineWords(text: string, kind?: StructureKind | null): string {
  if (kind) return formWords(text, kind);
  return text.replace(/y = lengthM\b/g, 'y = length').replace(/y = baseWidthM\b/g, 'y = base width');
}

/**
 * A part's name as the crew reads it: the engine names ends "the y = 0 end"; with the front's
 * azimuth known that end is named by compass ("end panel at the west end"), as the governing words
 * (caseWords.ts governingWords) already do, so the list, the table and the drawings say the same.
 * Otherwise the far end is named in the form's words (engineWords).
 */
export function partName(name: string, frontAzimuthDeg: number | null, kind?: StructureKind | null): string {
  if (frontAzimuthDeg === null) return engineWords(name, kind);
  return engineWords(name.replace(/the y = 0 end/g, sideName('endY0', frontAzimuthDeg)).replace(/the y = baseWidthM end/g, sideName('endYW', frontAzimuthDeg)), kind);
}

/** The warnings of the answer, or of the live state: what the engine could not check (in the form's words when the kind is known). */
export function Warnings({ warnings, kind }: { warnings: readonly string[]; kind?: StructureKind | null }) {
  if (warnings.length === 0) return null;
  return (
    <div class="warn-box" role="note" data-testid="assess-warnings">
      <p class="warn-h">{warnings.length === 1 ? 'Not checked or assumed' : `Not checked or assumed (${warnings.length})`}</p>
      <ul>
        {warnings.map((w) => (
          <li>{engineWords(w, kind)}</li>
        ))}
      </ul>
    </div>
  );
}

/** Each element with its own limit and what governs it. */
export function ElementsList({ answer, unit, frontAzimuthDeg, kind }: { answer: AssessAnswer; unit: SpeedUnit; frontAzimuthDeg: number | null; kind?: StructureKind | null }) {
  if (answer.elements.length === 0) return null;
  return (
    <section class="elements-list" aria-label="Parts that can fail on their own">
      <h3>Parts that can fail on their own</h3>
      <ul class="plain-list">
        {answer.elements.map((e) => {
          const governs = answer.governingElement === e.name;
          const strip = answer.expanded.elements?.find((x) => x.name === e.name)?.baseWidthM === undefined;
          return (
            <li class={governs ? 'governs' : ''}>
              <strong>{partName(e.name, frontAzimuthDeg, kind)}</strong>
              {governs ? <span class="gov-tag"> governs</span> : null}: limit {speed(e.calculatedLimitGustMps, unit)}, {utilizationText(e.utilization.governing)} at {speed(answer.gustMps, unit)} —{' '}
              {windWords(e.governingDirectionDeg, frontAzimuthDeg, strip)}: {criterionWords(e.governing, e.tippingEdge, frontAzimuthDeg)}
            </li>
          );
        })}
      </ul>
    </section>
  );
}

/** Every direction assessed, in a collapsible table, the governing one marked (not by colour alone). */
export function DirectionsTable({ answer, unit, frontAzimuthDeg, kind }: { answer: AssessAnswer; unit: SpeedUnit; frontAzimuthDeg: number | null; kind?: StructureKind | null }) {
  const governs = (d: DirectionReport) => Math.abs(d.directionDeg - answer.governingDirectionDeg) < 1e-6 && d.element === answer.governingElement;
  const anyElement = answer.directions.some((d) => d.element !== null);
  const ratedCaps = answer.limitGovernedBy === 'rated';
  return (
    <details class="directions" data-testid="directions">
      <summary>All {answer.directions.length} wind directions assessed</summary>
      <div class="table-scroll">
        <table class="data directions-table">
          <caption>
            Each direction's worst part at a gust of {speed(answer.gustMps, unit)}, and its limit; θ is measured clockwise from wind straight onto the front.
            {ratedCaps && answer.limitGustMps !== null ? ` The rated gust of ${speed(answer.limitGustMps, unit)} caps every direction.` : ''}
          </caption>
          <thead>
            <tr>
              <th scope="col">Wind</th>
              <th scope="col">Utilization, limit</th>
              <th scope="col">Governs</th>
            </tr>
          </thead>
          <tbody>
            {answer.directions.map((d) => {
              const g = governs(d);
              return (
                <tr class={g ? 'gov-row' : undefined} aria-current={g ? 'true' : undefined}>
                  <th scope="row">
                    {g ? <span class="gov-mark" aria-hidden="true">▶ </span> : null}
                    {relativeDirection(d.directionDeg, frontAzimuthDeg)}
                    {frontAzimuthDeg !== null ? <span class="dir-compass"> from {compassPointName(frontAzimuthDeg + d.directionDeg)}</span> : null}
                    {g ? <span class="visually-hidden"> (governs)</span> : null}
                  </th>
                  <td class="dir-util">
                    {utilizationText(d.utilization.governing)}
                    <span class="dir-limit">limit {speed(d.calculatedLimitGustMps, unit)}</span>
                  </td>
                  <td>
                    {anyElement && d.element !== null ? <span class="dir-part">{partName(d.element, frontAzimuthDeg, kind)}: </span> : null}
                    {criterionShort(d, frontAzimuthDeg)}
                    {d.upliftCase ? <span class="dir-case">{engineWords(d.upliftCase, kind)}</span> : null}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </details>
  );
}
