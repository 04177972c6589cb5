/**
 * Sign-in, and on a fresh server the "First start" screen that creates the first administrator
 * with the one-time setup code from the server's log.
 */
import { useState } from 'preact/hooks';
import { api, ApiError, errorText, issuesByPath, setCsrfToken } from '../api.ts';
import { Field } from '../components/field.tsx';
import { loadSession } from '../session.ts';

export function SignIn() {
  const [username, setUsername] = useState('');
  const [password, setPassword] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      const answer = await api<{ csrfToken: string }>('/api/session', { body: { username: username.trim(), password }, quiet401: true });
      setCsrfToken(answer.csrfToken);
      await loadSession();
    } catch (err) {
      setError(err instanceof ApiError && err.status === 401 ? 'Wrong username or password.' : errorText(err));
    } finally {
      setBusy(false);
    }
  };

  return (
    <main class="narrow" id="main">
      <h1>Sign in</h1>
      <p class="lead">Live wind and load margins of the site's temporary structures.</p>
      <form onSubmit={submit} class="stack">
        <Field id="si-user" label="Username">
          <input id="si-user" name="username" autocomplete="username" autocapitalize="none" spellcheck={false} required value={username} onInput={(e) => setUsername(e.currentTarget.value)} />
        </Field>
        <Field id="si-pass" label="Password">
          <input id="si-pass" name="password" type="password" autocomplete="current-password" required value={password} onInput={(e) => setPassword(e.currentTarget.value)} />
        </Field>
        {error ? (
          <p class="error-box" role="alert">
            {error}
          </p>
        ) : null}
        <button type="submit" class="primary" disabled={busy}>
          {busy ? 'Signing in…' : 'Sign in'}
        </button>
      </form>
      <p class="muted">Stewards without an account: ask the site office for a site link; it opens the live board read-only.</p>
    </main>
  );
}

export function FirstStart() {
  const [form, setForm] = useState({ code: '', username: '', displayName: '', password: '' });
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const set = (k: keyof typeof form) => (e: Event) => setForm({ ...form, [k]: (e.currentTarget as HTMLInputElement).value });

  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    setError(null);
    setIssues(new Map());
    try {
      await api('/api/setup', { body: { ...form, code: form.code.trim(), username: form.username.trim() } });
      const answer = await api<{ csrfToken: string }>('/api/session', { body: { username: form.username.trim(), password: form.password }, quiet401: true });
      setCsrfToken(answer.csrfToken);
      await loadSession();
    } catch (err) {
      if (err instanceof ApiError && err.issues.length > 0) setIssues(issuesByPath(err.issues));
      setError(errorText(err));
    } finally {
      setBusy(false);
    }
  };

  return (
    <main class="narrow" id="main">
      <h1>First start</h1>
      <p class="lead">Nobody can sign in yet. Create the first administrator with the one-time setup code the server printed in its log when it started.</p>
      <form onSubmit={submit} class="stack">
        <Field id="fs-code" label="Setup code" error={issues.get('code')} help="From the server log: the line that says “create the first administrator with setup code …”. Restarting the server makes a new one.">
          <input id="fs-code" autocomplete="one-time-code" autocapitalize="none" spellcheck={false} required value={form.code} onInput={set('code')} />
        </Field>
        <Field id="fs-user" label="Username" error={issues.get('username')} help="2–64 characters: a–z, 0–9, dot, underscore, hyphen.">
          <input id="fs-user" autocomplete="username" autocapitalize="none" spellcheck={false} required value={form.username} onInput={set('username')} />
        </Field>
        <Field id="fs-name" label="Your name" error={issues.get('displayName')} help="Shown on acknowledgements and in the audit trail.">
          <input id="fs-name" autocomplete="name" required value={form.displayName} onInput={set('displayName')} />
        </Field>
        <Field id="fs-pass" label="Password" error={issues.get('password')} help="At least 12 characters.">
          <input id="fs-pass" type="password" autocomplete="new-password" required minLength={12} value={form.password} onInput={set('password')} />
        </Field>
        {error ? (
          <p class="error-box" role="alert">
            {error}
          </p>
        ) : null}
        <button type="submit" class="primary" disabled={busy}>
          {busy ? 'Creating…' : 'Create administrator and sign in'}
        </button>
      </form>
    </main>
  );
}
