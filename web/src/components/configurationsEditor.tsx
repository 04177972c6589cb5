/**
 * The register form's configurations (design §2.5): the structure as registered has a name
 * ("raised"), and up to 8 other configurations each change some of the kind's fields (a screen's
 * bottom edge lowered, a tent's sides off, a fence's scrim removed, a custom record's faces).
 * Beside each one the calculator's answer for it (POST /api/assess `configurations`): its own
 * limit gust and level gusts, with the registered one's for comparison.
 *
 * Renaming a configuration renames it in the levels that move the structure to it; removing one
 * clears those levels' choice (and says so), so no level points at a name the record lacks.
 */
import type { ComponentChildren } from 'preact';
import { useState } from 'preact/hooks';
import { configurationColumns, faceColumns, suggestedChanges } from '../register/kindFields.ts';
import {
  configurableFields,
  emptyFaceRow,
  newConfiguration,
  renamedInLevels,
  withChangedField,
  withoutChangedField,
  type ConfigurationDraft,
  type Draft,
} from '../register/structureDraft.ts';
import { maxConfigurations } from '../configurationState.ts';
import type { AssessAnswer, AssessConfiguration } from '../types.ts';
import { speed, speedUnitLabels, type SpeedUnit } from '../units.ts';
import { maxNameLength } from '../../../server/engine/limits.ts';
import { described, Field } from './field.tsx';

/** The id of a configuration's control (fieldWords.ts names them the same way). */
export const configurationControlId = (index: number, path: string): string => `cf-${index}-${path.replace(/\./g, '-')}`;

const nameKey = (name: string): string => name.trim().toLowerCase();

/** The calculator's answer for a configuration, by name (the answer lists only those it was sent). */
export function assessedConfiguration(answer: AssessAnswer | null, name: string): AssessConfiguration | null {
  if (!answer?.configurations || nameKey(name) === '') return null;
  return answer.configurations.find((c) => !c.registered && nameKey(c.name) === nameKey(name)) ?? null;
}

export function ConfigurationsEditor(props: {
  draft: Draft;
  unit: SpeedUnit;
  answer: AssessAnswer | null;
  pending: boolean;
  /** The registered configuration's name field (the form's own control for `configurationName`). */
  registeredNameField: ComponentChildren;
  errorFor: (path: string) => string | undefined;
  touch: (path: string) => void;
  onChange: (patch: Pick<Draft, 'configurations' | 'levels'>) => void;
  readOnly: boolean;
}) {
  const { draft, unit, answer } = props;
  const list = draft.configurations;
  const [notice, setNotice] = useState<string | null>(null);
  const registeredName = (draft.values.configurationName ?? '').trim() || 'as registered';
  const registeredAnswer = answer?.configurations?.[0] ?? (answer ? { limitGustMps: answer.limitGustMps } : null);
  const setAt = (i: number, next: ConfigurationDraft, levels = draft.levels) => props.onChange({ configurations: list.map((c, j) => (j === i ? next : c)), levels });

  const rename = (i: number, name: string) => {
    props.touch(`configurations.${i}.name`);
    setAt(i, { ...list[i]!, name }, renamedInLevels(draft.levels, list[i]!.name, name));
  };
  const remove = (i: number) => {
    const gone = list[i]!;
    const key = nameKey(gone.name);
    const cleared = draft.levels.filter((l) => key !== '' && nameKey(l.moveToConfiguration ?? '') === key).map((l) => l.label || 'a level');
    const levels = draft.levels.map((l) => (key !== '' && nameKey(l.moveToConfiguration ?? '') === key ? { ...l, moveToConfiguration: '' } : l));
    props.onChange({ configurations: list.filter((_, j) => j !== i), levels });
    setNotice(cleared.length > 0 ? `Removed “${gone.name}”. ${cleared.join(', ')} no longer ${cleared.length === 1 ? 'moves' : 'move'} the structure to a configuration: choose again under Levels and actions.` : null);
  };

  return (
    <section aria-labelledby="cfg-h" class="configurations">
      <h2 id="cfg-h">Configurations</h2>
      <p class="help">
        Other shapes the crew can put this structure in: a screen lowered, a tent’s sides off or on, a fence with its scrim removed. {configurationColumns[1].help} A level’s action can move the
        structure to one (under Levels and actions); the crew mark it done on the board.
      </p>
      {props.registeredNameField}
      <p class="cfg-registered" data-testid="cfg-registered">
        <strong>{registeredName}</strong> (the fields above): limit <LimitText value={registeredAnswer?.limitGustMps} answered={answer !== null} pending={props.pending} unit={unit} />
      </p>
      {notice ? (
        <p class="note-box" role="status">
          {notice}
        </p>
      ) : null}
      {list.map((c, i) => (
        <ConfigurationRow
          key={i}
          index={i}
          c={c}
          draft={draft}
          unit={unit}
          assessed={assessedConfiguration(answer, c.name)}
          registeredLimitMps={registeredAnswer?.limitGustMps ?? null}
          answered={answer !== null}
          pending={props.pending}
          errorFor={props.errorFor}
          touch={props.touch}
          set={(next) => setAt(i, next)}
          rename={(name) => rename(i, name)}
          remove={() => remove(i)}
          readOnly={props.readOnly}
        />
      ))}
      {props.readOnly ? null : (
        <button type="button" disabled={list.length >= maxConfigurations} onClick={() => props.onChange({ configurations: [...list, newConfiguration()], levels: draft.levels })}>
          {list.length >= maxConfigurations ? `At most ${maxConfigurations} configurations` : 'Add a configuration'}
        </button>
      )}
      {list.length > 0 && !draft.ownLevels ? (
        <p class="help">To have a level’s action move the structure to a configuration, give this structure its own levels (untick “Use the site’s default levels” below).</p>
      ) : null}
    </section>
  );
}

function LimitText({ value, answered, pending, unit }: { value: number | null | undefined; answered: boolean; pending: boolean; unit: SpeedUnit }) {
  if (!answered || value === undefined) return <span class="muted">{pending ? 'calculating…' : 'not calculated yet'}</span>;
  return <strong class="nowrap">{value === null ? 'no limit found' : speed(value, unit)}</strong>;
}

function ConfigurationRow(props: {
  index: number;
  c: ConfigurationDraft;
  draft: Draft;
  unit: SpeedUnit;
  assessed: AssessConfiguration | null;
  registeredLimitMps: number | null;
  answered: boolean;
  pending: boolean;
  errorFor: (path: string) => string | undefined;
  touch: (path: string) => void;
  set: (next: ConfigurationDraft) => void;
  rename: (name: string) => void;
  remove: () => void;
  readOnly: boolean;
}) {
  const { index: i, c, draft, unit, assessed } = props;
  const groups = configurableFields(draft.kind);
  const open = groups.filter((g) => !c.fields.includes(g.field));
  const suggested = suggestedChanges[draft.kind].map((field) => open.find((g) => g.field === field)).filter((g) => g !== undefined);
  const [adding, setAdding] = useState('');
  const nameId = configurationControlId(i, 'name');
  const nameErr = props.errorFor(`configurations.${i}.name`);
  const changesErr = props.errorFor(`configurations.${i}.changes`);
  const title = c.name.trim() || `configuration ${i + 2}`;
  const levelGusts = assessed?.levels?.filter((l) => l.triggerGustMps !== null) ?? [];
  return (
    <fieldset class="config-row" data-testid={`config-${i}`}>
      <legend>
        Configuration {i + 2}: {title}
      </legend>
      <Field id={nameId} label={configurationColumns[0].label} error={nameErr} help={configurationColumns[0].help}>
        <input id={nameId} maxLength={maxNameLength} value={c.name} disabled={props.readOnly} aria-invalid={nameErr ? true : undefined} aria-describedby={described(nameId, true, !!nameErr)} onInput={(e) => props.rename(e.currentTarget.value)} />
      </Field>
      <p class="cfg-limit" data-testid={`config-${i}-limit`} aria-live="polite">
        Limit in this configuration:{' '}
        {assessed ? (
          <>
            <strong class="nowrap">{assessed.limitGustMps === null ? 'no limit found' : speed(assessed.limitGustMps, unit)}</strong>
            {props.registeredLimitMps !== null ? <span class="muted"> (as registered {speed(props.registeredLimitMps, unit)})</span> : null}
            {assessed.governingText ? <> · governs: {assessed.governingText}</> : null}
            {levelGusts.length > 0 ? <span class="cfg-levels"> · levels at {levelGusts.map((l) => `${l.label} ${speed(l.triggerGustMps, unit)}`).join(', ')}</span> : null}
          </>
        ) : (
          <span class="muted">{props.pending ? 'calculating…' : c.fields.length === 0 ? 'add a change first' : props.answered ? 'not calculated: put right the fields named here' : 'not calculated yet'}</span>
        )}
      </p>
      {changesErr ? <p class="field-error">{changesErr}</p> : null}
      {c.fields.map((field) => {
        const group = groups.find((g) => g.field === field);
        return (
          <div class="cfg-change" key={field}>
            {/* A single field says its own name in its label; a group (the sides, the faces) is named here. */}
            {group && group.defs.length === 1 ? null : <p class="cfg-change-h">{group?.label ?? field}</p>}
            {field === 'faces' ? (
              <ConfigurationFaces index={i} c={c} set={props.set} errorFor={props.errorFor} touch={props.touch} readOnly={props.readOnly} />
            ) : (
              <div class="grid2">
                {(group?.defs ?? []).map((def) => {
                  const id = configurationControlId(i, def.path);
                  const path = `configurations.${i}.changes.${def.path}`;
                  const err = props.errorFor(path);
                  const value = c.values[def.path] ?? '';
                  const setValue = (v: string) => {
                    props.touch(path);
                    props.set({ ...c, values: { ...c.values, [def.path]: v } });
                  };
                  const unitLabel = def.kind === 'speed' ? speedUnitLabels[unit] : def.unit === 'count' ? undefined : def.unit;
                  const registered = draft.values[def.path] ?? '';
                  return (
                    <Field id={id} key={def.path} label={def.label} unit={unitLabel} error={err} help={`As registered: ${registered.trim() === '' ? 'not given' : (def.options?.find(([v]) => v === registered)?.[1] ?? registered)}.`}>
                      {def.kind === 'bool' || def.kind === 'select' ? (
                        <select id={id} value={value} disabled={props.readOnly} aria-describedby={described(id, true, !!err)} onChange={(e) => setValue(e.currentTarget.value)}>
                          {def.optional && def.kind === 'select' && !def.initial ? <option value="">default</option> : null}
                          {def.options!.map(([v, label]) => (
                            <option value={v}>{label}</option>
                          ))}
                        </select>
                      ) : (
                        <input
                          id={id}
                          value={value}
                          disabled={props.readOnly}
                          inputMode={def.kind === 'text' ? 'text' : def.kind === 'int' ? 'numeric' : 'decimal'}
                          placeholder={def.placeholder ?? ''}
                          aria-invalid={err ? true : undefined}
                          aria-describedby={described(id, true, !!err)}
                          onInput={(e) => setValue(e.currentTarget.value)}
                        />
                      )}
                    </Field>
                  );
                })}
              </div>
            )}
            {props.readOnly ? null : (
              <button type="button" class="link-btn" onClick={() => props.set(withoutChangedField(c, field))}>
                Keep {group && group.defs.length === 1 ? `“${group.label}”` : 'these'} as registered
              </button>
            )}
          </div>
        );
      })}
      {Object.keys(c.kept).length > 0 ? (
        <p class="help">Also changes {Object.keys(c.kept).join(', ')}: kept as stored (this form has no editor for {Object.keys(c.kept).length === 1 ? 'it' : 'them'}; change it in the register file).</p>
      ) : null}
      {props.readOnly ? null : (
        <div class="cfg-add">
          {suggested.map((g) => (
            <button type="button" key={g.field} onClick={() => props.set(withChangedField(c, draft, g.field))}>
              Change: {g.label}
            </button>
          ))}
          {open.length > 0 ? (
            <div class="cfg-add-other">
              <label for={configurationControlId(i, 'add')}>Another field this configuration changes</label>
              <div class="row">
                <select id={configurationControlId(i, 'add')} value={adding} onChange={(e) => setAdding(e.currentTarget.value)}>
                  <option value="">choose a field</option>
                  {open.map((g) => (
                    <option value={g.field}>{g.label}</option>
                  ))}
                </select>
                <button
                  type="button"
                  disabled={adding === ''}
                  onClick={() => {
                    props.set(withChangedField(c, draft, adding));
                    setAdding('');
                  }}
                >
                  Add the change
                </button>
              </div>
            </div>
          ) : null}
          <button type="button" class="danger" onClick={props.remove}>
            Remove “{title}”
          </button>
        </div>
      )}
    </fieldset>
  );
}

/** A custom record's faces in one configuration: the same rows as the record's own. */
function ConfigurationFaces(props: { index: number; c: ConfigurationDraft; set: (next: ConfigurationDraft) => void; errorFor: (path: string) => string | undefined; touch: (path: string) => void; readOnly: boolean }) {
  const { index: i, c } = props;
  return (
    <div class="rows-editor">
      {props.errorFor(`configurations.${i}.changes.faces`) ? <p class="field-error">{props.errorFor(`configurations.${i}.changes.faces`)}</p> : null}
      {c.faces.map((f, j) => (
        <div class="row-grid faces" key={j}>
          {faceColumns.map((col) => {
            const path = `configurations.${i}.changes.faces.${j}.${col.key}`;
            const err = props.errorFor(path);
            const id = configurationControlId(i, `face.${j}.${col.key}`);
            return (
              <div class={`field${err ? ' has-error' : ''}`}>
                <label for={id}>
                  {col.label}
                  {col.unit ? ` (${col.unit})` : ''}
                </label>
                <input
                  id={id}
                  disabled={props.readOnly}
                  inputMode={col.key === 'label' ? 'text' : 'decimal'}
                  placeholder={col.placeholder}
                  value={f[col.key] ?? ''}
                  onInput={(e) => {
                    props.touch(path);
                    props.set({ ...c, faces: c.faces.map((x, k) => (k === j ? { ...x, [col.key]: e.currentTarget.value } : x)) });
                  }}
                />
                {err ? <p class="field-error">{err}</p> : null}
              </div>
            );
          })}
          {props.readOnly ? null : (
            <button type="button" class="row-remove" aria-label={`Remove face ${j + 1} of this configuration`} disabled={c.faces.length <= 1} onClick={() => props.set({ ...c, faces: c.faces.filter((_, k) => k !== j) })}>
              Remove
            </button>
          )}
        </div>
      ))}
      {props.readOnly ? null : (
        <button type="button" onClick={() => props.set({ ...c, faces: [...c.faces, emptyFaceRow()] })}>
          Add a face
        </button>
      )}
    </div>
  );
}
