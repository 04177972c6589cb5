/**
 * Editing a level ladder: up to 8 rows of label, trigger (percent of load capacity, a gust
 * in the chosen unit, or the chance of a percent of capacity within some minutes) and the action text the crew will read when the level is reached.
 * `readOnly`: the same ladder as a table, no inputs and no buttons, for a role that cannot
 * change it. With `configurations` (a structure's, design §2.5), each level can also name the
 * configuration its action moves the structure to: the board then offers the crew "Done: <name>".
 */
import type { LevelRowDraft } from '../register/structureDraft.ts';
import { speedUnitLabels, type SpeedUnit } from '../units.ts';
import { maxLevelLabelLength, maxTextLength } from '../../../server/engine/limits.ts';
import { LevelShape, levelTone } from './levelBadge.tsx';
import { chanceTriggerWords } from './levelsTable.tsx';

const maxLevels = 8;

export function LevelsEditor(props: {
  idPrefix: string;
  levels: LevelRowDraft[];
  unit: SpeedUnit;
  onChange: (levels: LevelRowDraft[]) => void;
  errors: Map<string, string>;
  /** Each level's wind speed for this structure, from the calculator (m/s), when known. */
  gustsText?: Array<string | null>;
  /** Shown as a table: nothing to type into, nothing to press. */
  readOnly?: boolean;
  /** Names of the structure's configurations (besides the one as registered) a level's action may move it to. */
  configurations?: string[];
}) {
  const { levels, unit } = props;
  const configurations = props.configurations ?? [];
  if (props.readOnly) return <LevelsReadOnly levels={levels} unit={unit} gustsText={props.gustsText} />;
  const set = (i: number, patch: Partial<LevelRowDraft>) => props.onChange(levels.map((l, j) => (j === i ? { ...l, ...patch } : l)));
  const err = (i: number, k: string) => props.errors.get(`levels.${i}.${k}`) ?? (k === 'trigger' ? (props.errors.get(`levels.${i}.trigger.fraction`) ?? props.errors.get(`levels.${i}.trigger.gustMps`) ?? props.errors.get(`levels.${i}.trigger.kind`)) : undefined);
  return (
    <div class="levels-editor">
      {props.errors.get('levels') ? <p class="field-error">{props.errors.get('levels')}</p> : null}
      {levels.map((l, i) => {
        const id = `${props.idPrefix}-${i}`;
        const tErr = err(i, 'trigger');
        const lErr = err(i, 'label');
        return (
          <fieldset class="level-row" key={i}>
            <legend>
              <LevelShape tone={levelTone(i + 1, levels.length)} size={22} /> Level {i + 1}
              {props.gustsText?.[i] ? <span class="muted small"> — reached at {props.gustsText[i]}</span> : null}
            </legend>
            <div class="grid2">
              <div class={`field${lErr ? ' has-error' : ''}`}>
                <label for={`${id}-label`}>Label</label>
                <input id={`${id}-label`} maxLength={maxLevelLabelLength} value={l.label} onInput={(e) => set(i, { label: e.currentTarget.value })} />
                {lErr ? <p class="field-error">{lErr}</p> : null}
              </div>
              <div class={`field${tErr ? ' has-error' : ''}`}>
                <label for={`${id}-value`}>Trigger</label>
                <div class="input-with-unit">
                  <input id={`${id}-value`} inputMode="decimal" value={l.value} onInput={(e) => set(i, { value: e.currentTarget.value })} />
                  <select aria-label={`Level ${i + 1} trigger kind`} value={l.kind} onChange={(e) => set(i, { kind: e.currentTarget.value as LevelRowDraft['kind'] })}>
                    <option value="utilization">% of capacity</option>
                    <option value="gust">{speedUnitLabels[unit]} gust</option>
                    <option value="chance">chance of %</option>
                  </select>
                </div>
                {tErr ? <p class="field-error">{tErr}</p> : null}
                <p class="help">
                  {l.kind === 'chance'
                    ? 'The level rises when the estimated chance that the gust reaches this percent of load capacity (100 is the limit) within the minutes below is over the chance below. An estimate: the measured gust reaching it raises the level too.'
                    : 'Percent of load capacity (60 means the governing utilization reaches 0.6), or a gust at the structure (e.g. from the manufacturer’s sheet).'}
                </p>
              </div>
            </div>
            {l.kind === 'chance' ? <ChanceFields id={id} level={l} onChange={(patch) => set(i, patch)} errors={{ minutes: err(i, 'trigger.withinMinutes'), chance: err(i, 'trigger.probability') }} /> : null}
            <div class={`field wide${err(i, 'actionText') ? ' has-error' : ''}`}>
              <label for={`${id}-action`}>Action the crew reads</label>
              <textarea id={`${id}-action`} rows={3} maxLength={maxTextLength} value={l.actionText} onInput={(e) => set(i, { actionText: e.currentTarget.value })} />
              {err(i, 'actionText') ? <p class="field-error">{err(i, 'actionText')}</p> : null}
            </div>
            {configurations.length > 0 || (l.moveToConfiguration ?? '') !== '' ? (
              <MoveToChoice id={`${id}-move`} level={i + 1} value={l.moveToConfiguration ?? ''} configurations={configurations} error={err(i, 'moveToConfiguration')} onChange={(v) => set(i, { moveToConfiguration: v })} />
            ) : null}
            <div class="row">
              <button type="button" disabled={i === 0} onClick={() => props.onChange(levels.map((x, j) => (j === i - 1 ? levels[i]! : j === i ? levels[i - 1]! : x)))}>
                Move up
              </button>
              <button type="button" disabled={levels.length <= 1} onClick={() => props.onChange(levels.filter((_, j) => j !== i))}>
                Remove level {i + 1}
              </button>
            </div>
          </fieldset>
        );
      })}
      <button type="button" disabled={levels.length >= maxLevels} onClick={() => props.onChange([...levels, { label: '', kind: 'utilization', value: '', actionText: '', moveToConfiguration: '' }])}>
        Add a level
      </button>
    </div>
  );
}

/** A chance trigger's horizon and chance (levels/levelDefinition.ts: 1-180 minutes, a chance in (0, 100) %). */
function ChanceFields(props: { id: string; level: LevelRowDraft; onChange: (patch: Partial<LevelRowDraft>) => void; errors: { minutes: string | undefined; chance: string | undefined } }) {
  const { id, level, errors } = props;
  return (
    <div class="grid2 chance-fields">
      <div class={`field${errors.minutes ? ' has-error' : ''}`}>
        <label for={`${id}-within`}>Within (minutes)</label>
        <input id={`${id}-within`} inputMode="numeric" value={level.withinMinutes ?? ''} onInput={(e) => props.onChange({ withinMinutes: e.currentTarget.value })} />
        {errors.minutes ? <p class="field-error">{errors.minutes}</p> : null}
        <p class="help">How far ahead, 1 to 180 minutes: the time the action takes and a margin (lowering a screen, clearing a tent).</p>
      </div>
      <div class={`field${errors.chance ? ' has-error' : ''}`}>
        <label for={`${id}-chance`}>When the chance is over (%)</label>
        <input id={`${id}-chance`} inputMode="decimal" value={level.chancePct ?? ''} onInput={(e) => props.onChange({ chancePct: e.currentTarget.value })} />
        {errors.chance ? <p class="field-error">{errors.chance}</p> : null}
        <p class="help">It falls back only when the chance stays under this less the site’s dead band for the hold time, as a gust does.</p>
      </div>
    </div>
  );
}


/**
 * Which configuration the level's action moves the structure to. A stored name the structure no
 * longer lists stays selectable (marked), so saving never drops it unseen; the server refuses it.
 */
function MoveToChoice(props: { id: string; level: number; value: string; configurations: string[]; error?: string; onChange: (value: string) => void }) {
  const known = props.configurations.some((c) => c.toLowerCase() === props.value.trim().toLowerCase());
  return (
    <div class={`field wide${props.error ? ' has-error' : ''}`}>
      <label for={props.id}>The action moves the structure to</label>
      <select id={props.id} value={props.value} aria-describedby={`${props.id}-help`} onChange={(e) => props.onChange(e.currentTarget.value)}>
        <option value="">no configuration (the action changes nothing the calculation knows)</option>
        {props.configurations.map((c) => (
          <option value={c}>{c}</option>
        ))}
        {props.value !== '' && !known ? <option value={props.value}>{props.value} (not a configuration of this structure)</option> : null}
      </select>
      {props.error ? <p class="field-error">{props.error}</p> : null}
      <p class="help" id={`${props.id}-help`}>
        When level {props.level} is reached the crew see “Done: {props.value || 'configuration'}” beside Acknowledge; pressing it switches the live assessment to that configuration at once. An action not marked
        done in the site’s set time is signalled again as overdue.
      </p>
    </div>
  );
}

/** The draft ladder as text (a trigger that is not a number is shown as typed). */
function LevelsReadOnly({ levels, unit, gustsText }: { levels: LevelRowDraft[]; unit: SpeedUnit; gustsText?: Array<string | null> }) {
  return (
    <table class="levels-table levels-readonly">
      <thead>
        <tr>
          <th scope="col">Level</th>
          <th scope="col">Reached at</th>
          <th scope="col">Action</th>
        </tr>
      </thead>
      <tbody>
        {levels.map((l, i) => (
          <tr key={i} class={`tone-${levelTone(i + 1, levels.length)}`}>
            <th scope="row">
              <span class="lvl-cell">
                <LevelShape tone={levelTone(i + 1, levels.length)} size={22} />
                <span>
                  {i + 1} · {l.label || <span class="muted">no label</span>}
                </span>
              </span>
            </th>
            <td>
              <span class="reached">Reached at </span>
              {l.kind === 'utilization' ? `${l.value}\u00a0% of load capacity` : l.kind === 'chance' ? `${chanceTriggerWords(l.value, l.withinMinutes ?? '', l.chancePct ?? '')} (estimate)` : `a gust of ${l.value} ${speedUnitLabels[unit]}`}
              {gustsText?.[i] ? <span class="muted small"> — {gustsText[i]} here</span> : null}
            </td>
            <td class="action-cell">
              {l.actionText || <span class="muted">no action written</span>}
              {l.moveToConfiguration ? <span class="moves-to small"> Moves it to “{l.moveToConfiguration}”.</span> : null}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
