/**
 * A structure's levels as a crew reads them: shape and label, what triggers it, the gust at the
 * structure that reaches it (in the chosen unit and in km/h, as a printed plan needs both), and
 * the action.
 */
import type { LevelTrigger } from '../types.ts';
import { speed, type SpeedUnit } from '../units.ts';
import { LevelShape, levelTone } from './levelBadge.tsx';

export interface LevelRow {
  level: number;
  label: string;
  actionText: string;
  triggerGustMps: number | null;
  trigger: LevelTrigger;
  /** The configuration the level's action moves the structure to (issue 14), when the server says. */
  moveToConfiguration?: string | null;
}

export function triggerText(t: LevelTrigger, unit: SpeedUnit): string {
  if (t.kind === 'chance') return `a chance over ${Math.round(t.probability * 1000) / 10}\u00a0% of ${Math.round(t.fraction * 100)}\u00a0% of load capacity within ${t.withinMinutes}\u00a0min (an estimate; the gust above raises it in any case)`;
  return t.kind === 'utilization' ? `${Math.round(t.fraction * 100)}\u00a0% of load capacity` : `gust of ${speed(t.gustMps, unit)} (set directly)`;
}

export function LevelsTable({ levels, unit, caption }: { levels: LevelRow[]; unit: SpeedUnit; caption?: string }) {
  return (
    <table class="levels-table">
      {caption ? <caption>{caption}</caption> : null}
      <thead>
        <tr>
          <th scope="col">Level</th>
          <th scope="col">Reached at a gust here of</th>
          <th scope="col">Action</th>
        </tr>
      </thead>
      <tbody>
        {levels.map((l) => (
          <tr key={l.level} class={`tone-${levelTone(l.level, levels.length)}`}>
            <th scope="row">
              <span class="lvl-cell">
                <LevelShape tone={levelTone(l.level, levels.length)} size={22} />
                <span>
                  {l.level} · {l.label}
                </span>
              </span>
            </th>
            <td>
              <span class="reached">Reached at a gust here of </span>
              <strong>{speed(l.triggerGustMps, unit)}</strong>
              {unit !== 'km/h' ? <span class="muted"> = {speed(l.triggerGustMps, 'km/h')}</span> : null}
              <br />
              <span class="muted small">{triggerText(l.trigger, unit)}</span>
            </td>
            <td class="action-cell">
              {l.actionText || <span class="muted">no action written</span>}
              {typeof l.moveToConfiguration === 'string' && l.moveToConfiguration !== '' ? <span class="moves-to small"> Moves it to “{l.moveToConfiguration}”.</span> : null}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
