/**
 * The register: every structure with its kind, limit gust and levels source; links to register a
 * new one, to the site settings, and the register's import and export (JSON and CSV).
 */
import { useEffect, useState } from 'preact/hooks';
import { api, errorText } from '../api.ts';
import { LevelBadge } from '../components/levelBadge.tsx';
import { ReadOnlyNote } from '../components/readOnlyNote.tsx';
import { kindNames } from '../register/kindFields.ts';
import { prefs } from '../prefs.ts';
import { refreshSnapshot } from '../live.ts';
import { href } from '../router.ts';
import { may, session } from '../session.ts';
import { useStore } from '../store.ts';
import type { StructureWithLive } from '../types.ts';
import type { ImportSummary } from '../../../server/register/registerFile.ts';
import { speed } from '../units.ts';

export function RegisterList() {
  const who = useStore(session);
  const unit = useStore(prefs).unit;
  const canEdit = may(who, 'competent-person');
  const [list, setList] = useState<StructureWithLive[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [reload, setReload] = useState(0);

  useEffect(() => {
    api<{ structures: StructureWithLive[] }>('/api/structures')
      .then((a) => setList(a.structures))
      .catch((err) => setError(errorText(err)));
  }, [reload]);

  return (
    <main id="main">
      <h1>Structures</h1>
      {!canEdit ? <ReadOnlyNote what="every structure, its limit and its levels" ask="the site’s competent person" /> : null}
      <div class="row">
        {canEdit ? (
          <a class="button primary" href={href('/register/new')}>
            Register a structure
          </a>
        ) : null}
        <a class="button" href={href('/site')}>
          {canEdit ? 'Site settings' : 'Site settings (read only)'}
        </a>
      </div>
      {error ? <p class="error-box">{error}</p> : null}
      {list === null && !error ? <p class="muted">Loading…</p> : null}
      {list && list.length === 0 ? <p class="empty">No structures registered yet.</p> : null}
      <ul class="register-list">
        {(list ?? []).map((s) => (
          <li key={s.id}>
            <a href={href(canEdit ? `/register/${s.id}` : `/structure/${s.id}`)} class="register-item">
              <span class="ri-name">{s.name}</span>
              <span class="ri-kind">
                {kindNames[s.record.kind]}
                {s.location ? ` · ${s.location}` : ''}
              </span>
              <span class="ri-limit">
                limit {s.live ? speed(s.live.limitGustMps, unit) : 'unknown'} · {s.levels ? 'own levels' : 'site levels'} · {s.sensorKeys ? `sensors: ${s.sensorKeys.join(', ')}` : 'all sensors'}
              </span>
              {s.live ? <LevelBadge level={s.live.level} label={s.live.levelLabel} count={s.live.levels.length} noData={s.live.noData} /> : null}
            </a>
          </li>
        ))}
      </ul>
      <RegisterFile canEdit={canEdit} onImported={() => setReload(reload + 1)} />
    </main>
  );
}

function RegisterFile({ canEdit, onImported }: { canEdit: boolean; onImported: () => void }) {
  const [mode, setMode] = useState<'merge' | 'replace'>('merge');
  const [result, setResult] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  const upload = async (file: File) => {
    setBusy(true);
    setResult(null);
    try {
      const text = await file.text();
      const isCsv = file.name.toLowerCase().endsWith('.csv') || file.type.includes('csv');
      const answer = isCsv
        ? await api<{ imported: ImportSummary }>(`/api/register/import?mode=${mode}`, { raw: { text, contentType: 'text/csv' } })
        : await api<{ imported: ImportSummary }>('/api/register/import', { body: { mode, register: JSON.parse(text) as unknown } });
      const n = answer.imported;
      setResult({
        ok: true,
        text:
          `Loaded. Sensors: ${n.sensorsAdded} added, ${n.sensorsUpdated} updated, ${n.sensorsRetired} retired. ` +
          `Structures: ${n.structuresAdded} added, ${n.structuresUpdated} updated, ${n.structuresRetired} retired.` +
          (n.gatewaysSkipped > 0 ? ` ${n.gatewaysSkipped} gateways skipped (credentials are never in a file: make them on the Sensors screen).` : ''),
      });
      void refreshSnapshot();
      onImported();
    } catch (err) {
      setResult({ ok: false, text: err instanceof SyntaxError ? 'The file is not valid JSON.' : errorText(err) });
    } finally {
      setBusy(false);
    }
  };

  return (
    <section aria-labelledby="file-h" class="panel">
      <h2 id="file-h">Register file</h2>
      <p>Download the whole register (site, sensors, structures, levels) to keep with the wind management plan or to load on another server.</p>
      <div class="row">
        <a class="button" href="/api/register" download="register.json">
          Download JSON
        </a>
        <a class="button" href="/api/register.csv" download="register.csv">
          Download CSV
        </a>
      </div>
      {canEdit ? (
        <>
          <h3>Load a register file</h3>
          <fieldset class="inline-radios">
            <legend>How to load it</legend>
            <label class="check">
              <input type="radio" name="import-mode" checked={mode === 'merge'} onChange={() => setMode('merge')} />
              Merge: add and update by sensor key and structure name
            </label>
            <label class="check">
              <input type="radio" name="import-mode" checked={mode === 'replace'} onChange={() => setMode('replace')} />
              Replace: also retire what the file does not list
            </label>
          </fieldset>
          <label class="button file-button">
            {busy ? 'Loading…' : 'Choose a .json or .csv file'}
            <input
              type="file"
              accept=".json,.csv,application/json,text/csv"
              class="visually-hidden"
              onChange={(e) => {
                const f = e.currentTarget.files?.[0];
                if (f) void upload(f);
                e.currentTarget.value = '';
              }}
            />
          </label>
          {result ? <p class={result.ok ? 'ok-box' : 'error-box'}>{result.text}</p> : null}
        </>
      ) : null}
    </section>
  );
}
