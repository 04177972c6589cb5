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

/** A chance trigger in words, as typed or stored: "a chance over 20 % of 100 % of load capacity within 30 min" ("?" for what is not typed yet). */
export function chanceTriggerWords(capacityPct: string, withinMinutes: string, chancePct: string): string {
  return `a chance over ${chancePct || '?'}\u00a0% of ${capacityPct || '?'}\u00a0% of load capacity within ${withinMinutes || '?'}\u00a0min`;
}

export function triggerText(t: LevelTrigger, unit: SpeedUnit): string {
  if (t.kind === 'chance') return `${chanceTriggerWords(String(Math.round(t.fraction * 100)), String(t.withinMinutes), String(Math.round(t.probability * 1000) / 10))} (an estimate; the gust above raises it in any case)`;
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
