/** People and roles (administrators): add a person, change a role or name, set a password, disable. */
import { useEffect, useState } from 'preact/hooks';
import { api, ApiError, errorText, issuesByPath } from '../api.ts';
import { Field } from '../components/field.tsx';
import { roleNames } from '../session.ts';
import { useTimeZone } from '../site.ts';
import type { Person, Role } from '../types.ts';
import { dateTime } from '../units.ts';

const roles: Role[] = ['viewer', 'crew', 'competent-person', 'admin'];
const roleHelp = 'Viewer: watch the board, read the log. Crew: also acknowledge alerts. Competent person: also edit the site, structures, levels, sensors and gateways and hand out site links. Administrator: also people and roles.';

export function People() {
  const tz = useTimeZone();
  const [people, setPeople] = useState<Person[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [form, setForm] = useState({ username: '', displayName: '', role: 'crew' as Role, password: '' });
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [reload, setReload] = useState(0);
  const [note, setNote] = useState<string | null>(null);

  useEffect(() => {
    api<{ people: Person[] }>('/api/people')
      .then((a) => setPeople(a.people))
      .catch((err) => setError(errorText(err)));
  }, [reload]);

  const add = async (e: Event) => {
    e.preventDefault();
    setIssues(new Map());
    setError(null);
    try {
      await api('/api/people', { body: { ...form, username: form.username.trim(), displayName: form.displayName.trim() } });
      setNote(`Added ${form.displayName}. Give them their username and password in person.`);
      setForm({ username: '', displayName: '', role: 'crew', password: '' });
      setReload(reload + 1);
    } catch (err) {
      if (err instanceof ApiError) setIssues(issuesByPath(err.issues));
      setError(errorText(err));
    }
  };
  const patch = async (p: Person, body: Record<string, unknown>, done: string) => {
    setError(null);
    try {
      await api(`/api/people/${p.id}`, { method: 'PATCH', body });
      setNote(done);
      setReload(reload + 1);
    } catch (err) {
      setError(errorText(err));
    }
  };

  return (
    <main id="main">
      <h1>People and roles</h1>
      <p class="help">{roleHelp} A new role, a new password or disabling ends that person’s sessions.</p>
      {error ? <p class="error-box">{error}</p> : null}
      {note ? <p class="ok-box">{note}</p> : null}
      <ul class="cards">
        {(people ?? []).map((p) => (
          <li key={p.id}>
            <article class={`person-card${p.disabledAtMs !== null ? ' revoked' : ''}`}>
              <h2 class="card-h">
                {p.displayName} <span class="muted small">({p.username})</span>
              </h2>
              <p class="small">
                {roleNames[p.role]} · added {dateTime(p.createdAtMs, tz)}
                {p.disabledAtMs !== null ? ` · disabled ${dateTime(p.disabledAtMs, tz)}` : ''}
              </p>
              <div class="row">
                <label class="inline-label" for={`role-${p.id}`}>
                  Role
                </label>
                <select id={`role-${p.id}`} value={p.role} onChange={(e) => void patch(p, { role: e.currentTarget.value }, `${p.displayName} is now ${roleNames[e.currentTarget.value as Role]}.`)}>
                  {roles.map((r) => (
                    <option value={r}>{roleNames[r]}</option>
                  ))}
                </select>
                <button
                  type="button"
                  onClick={() => {
                    const pw = prompt(`New password for ${p.displayName} (at least 12 characters):`);
                    if (pw) void patch(p, { password: pw }, `New password set for ${p.displayName}.`);
                  }}
                >
                  Set password
                </button>
                <button type="button" class={p.disabledAtMs === null ? 'danger' : ''} onClick={() => void patch(p, { disabled: p.disabledAtMs === null }, p.disabledAtMs === null ? `${p.displayName} is disabled.` : `${p.displayName} is enabled again.`)}>
                  {p.disabledAtMs === null ? 'Disable' : 'Enable'}
                </button>
              </div>
            </article>
          </li>
        ))}
      </ul>
      <form class="panel stack" onSubmit={add}>
        <h2>Add a person</h2>
        <div class="grid2">
          <Field id="pp-user" label="Username" error={issues.get('username')} help="2–64 characters: a–z, 0–9, . _ -">
            <input id="pp-user" autocapitalize="none" spellcheck={false} value={form.username} onInput={(e) => setForm({ ...form, username: e.currentTarget.value })} />
          </Field>
          <Field id="pp-name" label="Name" error={issues.get('displayName')} help="Shown on acknowledgements: “Sam Okoro (site crew)”.">
            <input id="pp-name" value={form.displayName} onInput={(e) => setForm({ ...form, displayName: e.currentTarget.value })} />
          </Field>
          <Field id="pp-role" label="Role" error={issues.get('role')}>
            <select id="pp-role" value={form.role} onChange={(e) => setForm({ ...form, role: e.currentTarget.value as Role })}>
              {roles.map((r) => (
                <option value={r}>{roleNames[r]}</option>
              ))}
            </select>
          </Field>
          <Field id="pp-pass" label="Password" error={issues.get('password')} help="At least 12 characters.">
            <input id="pp-pass" type="password" autocomplete="new-password" value={form.password} onInput={(e) => setForm({ ...form, password: e.currentTarget.value })} />
          </Field>
        </div>
        <button type="submit" class="primary">
          Add person
        </button>
      </form>
    </main>
  );
}
