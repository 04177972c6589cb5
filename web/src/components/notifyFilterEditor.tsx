/**
 * Which alerts a person or a webhook gets: every alert, from a level up, or the alerts of chosen
 * structures (README "Who gets what"). Each choice is a full-width row to tap; the words under it
 * say what the filter lets through, no-data and sensor alerts included (they are never calm).
 */
import { filterFromDraft, filterWords, levelName, type FilterDraft } from '../notifyWords.ts';

export function NotifyFilterEditor(props: {
  idBase: string;
  draft: FilterDraft;
  onChange: (next: FilterDraft) => void;
  levelLabels: readonly string[];
  structures: ReadonlyArray<{ id: number; name: string }>;
  legend?: string;
}) {
  const { idBase, draft, onChange, levelLabels, structures } = props;
  const levelCount = Math.max(levelLabels.length, draft.atLeast, 1);
  const names = new Map(structures.map((s) => [s.id, s.name]));
  const built = filterFromDraft(draft);
  const set = (change: Partial<FilterDraft>) => onChange({ ...draft, ...change });
  return (
    <fieldset class="notify-filter">
      <legend>{props.legend ?? 'Which alerts'}</legend>
      <label class="check choice">
        <input type="radio" name={`${idBase}-kind`} checked={draft.kind === 'all'} onChange={() => set({ kind: 'all' })} />
        Every alert
      </label>
      <label class="check choice">
        <input type="radio" name={`${idBase}-kind`} checked={draft.kind === 'levels'} onChange={() => set({ kind: 'levels' })} />
        From a level up
      </label>
      {draft.kind === 'levels' ? (
        <div class="choice-detail">
          <label for={`${idBase}-level`} class="label-like">
            This level and higher
          </label>
          <select id={`${idBase}-level`} value={String(draft.atLeast)} onChange={(e) => set({ atLeast: Number(e.currentTarget.value) })}>
            {Array.from({ length: levelCount }, (_, i) => i + 1).map((n) => (
              <option value={String(n)}>{levelName(n, levelLabels)}</option>
            ))}
          </select>
        </div>
      ) : null}
      <label class="check choice">
        <input type="radio" name={`${idBase}-kind`} checked={draft.kind === 'structures'} onChange={() => set({ kind: 'structures' })} />
        Only chosen structures
      </label>
      {draft.kind === 'structures' ? (
        <div class="choice-detail">
          {structures.length === 0 ? <p class="muted">No structures are registered yet.</p> : null}
          <ul class="plain-list">
            {structures.map((s) => (
              <li key={s.id}>
                <label class="check">
                  <input
                    type="checkbox"
                    checked={draft.structureIds.includes(s.id)}
                    onChange={(e) => set({ structureIds: e.currentTarget.checked ? [...draft.structureIds, s.id] : draft.structureIds.filter((x) => x !== s.id) })}
                  />
                  {s.name}
                </label>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <p class="help filter-means" data-testid={`${idBase}-means`}>
        {'filter' in built ? `Gets ${filterWords(built.filter, levelLabels, names)}.` : <strong class="bad-text">✖ {built.error}</strong>}
      </p>
    </fieldset>
  );
}
