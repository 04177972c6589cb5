/**
 * A structure's foresight on screen (design §2.7): always tagged as an estimate and set below the
 * measured figures, smaller and on a dashed panel, so it never reads as a measurement.
 *
 * - `ForesightStrip`: the board's one line under a structure's card ("Estimate · Watch: 12 %
 *   within 30 min · limit: 3 % within 30 min · expected peak in 10 min 17.2 m/s"); tapping it opens
 *   the inputs behind each figure. It sits beside the card's link, not inside it (a control inside
 *   a link is neither valid nor operable), and is the same for viewers: it only reads.
 * - `ForesightSection`: the structure page's "What may come", the same figures in a table, the
 *   inputs one tap away.
 * Words: foresightWords.ts.
 */
import { estimateNote, foresightInputs, foresightLineParts, nextIsLimit, noEstimateText, readForesight, chanceText, trendText, triggerChanceText, type SensorNamer } from '../foresightWords.ts';
import type { SensorState, StructureState } from '../types.ts';
import { speed, type SpeedUnit } from '../units.ts';

export function sensorNamer(sensors: readonly SensorState[]): SensorNamer {
  return (key) => sensors.find((x) => x.key === key)?.name ?? key;
}

export function EstimateTag() {
  return <span class="fs-tag">Estimate</span>;
}

function ForesightInputs({ s, unit, sensorName }: { s: StructureState; unit: SpeedUnit; sensorName: SensorNamer }) {
  const r = readForesight(s);
  if (!r.known) return null;
  return (
    <>
      <dl class="fs-inputs" data-testid="foresight-inputs">
        {foresightInputs(r.view, unit, sensorName).map((row) => (
          <div key={row.key} class={`fs-input fs-${row.key}`}>
            <dt>{row.label}</dt>
            {row.lines.map((l, i) => (
              <dd key={i}>{l}</dd>
            ))}
            <dd class="fs-rule">{row.rule}</dd>
          </div>
        ))}
      </dl>
      <p class="fs-note">{estimateNote}</p>
    </>
  );
}

export function ForesightStrip({ s, unit, sensors }: { s: StructureState; unit: SpeedUnit; sensors: readonly SensorState[] }) {
  const r = readForesight(s);
  const sensorName = sensorNamer(sensors);
  if (!r.known) {
    return (
      <p class="fs-strip is-unknown" data-testid="foresight-line">
        <EstimateTag /> <span class="fs-line">{noEstimateText(r.reason, sensorName)}</span>
      </p>
    );
  }
  const parts = foresightLineParts(r.view, unit);
  return (
    <details class="fs-strip" data-testid="foresight-line">
      <summary>
        <EstimateTag />{' '}
        <span class="fs-line">
          {parts.map((p, i) => (
            <span key={i} class="fs-part">
              {i > 0 ? <span class="fs-sep" aria-hidden="true"> · </span> : null}
              {p}
            </span>
          ))}
        </span>{' '}
        <span class="fs-more">inputs</span>
      </summary>
      <ForesightInputs s={s} unit={unit} sensorName={sensorName} />
    </details>
  );
}

export function ForesightSection({ s, unit, sensors }: { s: StructureState; unit: SpeedUnit; sensors: readonly SensorState[] }) {
  const r = readForesight(s);
  const sensorName = sensorNamer(sensors);
  return (
    <section aria-labelledby="foresight-h" class="foresight-section" data-testid="foresight-section">
      <h2 id="foresight-h">
        What may come <EstimateTag />
      </h2>
      {!r.known ? (
        <p class="fs-unknown-box">{noEstimateText(r.reason, sensorName)}</p>
      ) : (
        <>
          <table class="data fs-table">
            <caption class="visually-hidden">Chance of a gust at this structure reaching each figure (estimate)</caption>
            <thead>
              <tr>
                <th scope="col">Chance of reaching</th>
                <th scope="col">within 10 min</th>
                <th scope="col">within 30 min</th>
              </tr>
            </thead>
            <tbody>
              {r.view.nextLevel !== null && r.view.nextTriggerGustMps !== null && !nextIsLimit(r.view) ? (
                <tr>
                  <th scope="row">
                    {r.view.nextLabel ?? `Level ${r.view.nextLevel}`} <span class="nowrap">{speed(r.view.nextTriggerGustMps, unit)}</span>
                  </th>
                  <td>{chanceText(r.view.nextChance10)}</td>
                  <td>{chanceText(r.view.nextChance30)}</td>
                </tr>
              ) : null}
              <tr>
                <th scope="row">
                  {r.view.nextLevel !== null && nextIsLimit(r.view) ? `${r.view.nextLabel ?? `Level ${r.view.nextLevel}`} (the limit)` : 'The limit'}{' '}
                  <span class="nowrap">{speed(r.view.limitGustMps, unit)}</span>
                </th>
                <td>{chanceText(r.view.limitChance10)}</td>
                <td>{chanceText(r.view.limitChance30)}</td>
              </tr>
            </tbody>
          </table>
          {(r.view.triggerChances ?? []).length > 0 ? (
            <ul class="plain-list fs-trigger-chances" data-testid="trigger-chances">
              {r.view.triggerChances.map((c) => (
                <li key={c.level}>
                  <strong>Level {c.level}</strong> {triggerChanceText(c, unit)}
                </li>
              ))}
            </ul>
          ) : null}
          <p class="fs-figure">
            Expected peak gust here in the next 10 min: <strong class="nowrap">{speed(r.view.expectedPeak10Mps, unit)}</strong>
          </p>
          <p class="fs-figure">
            {r.view.nextLevel !== null ? `Time to ${r.view.nextLabel ?? `Level ${r.view.nextLevel}`}: ` : 'Time to the next level: '}
            {trendText(r.view, unit)}
          </p>
          <details class="fs-page-inputs">
            <summary>Inputs behind the figures</summary>
            <ForesightInputs s={s} unit={unit} sensorName={sensorName} />
          </details>
        </>
      )}
    </section>
  );
}
