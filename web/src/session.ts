/**
 * Who is signed in, and what their role lets them do. The server enforces every role; the
 * screens only hide what would be refused, so nobody taps a button that cannot work.
 */
import { api, setCsrfToken, whenSignedOut } from './api.ts';
import { forgetSiteData } from './offline.ts';
import { unsubscribePush } from './push.ts';
import { createStore } from './store.ts';
import type { Role, Session } from './types.ts';

export type SessionState = { status: 'loading' } | { status: 'error'; message: string } | ({ status: 'ready' } & Session);

export const session = createStore<SessionState>({ status: 'loading' });

const rank: Readonly<Record<Role, number>> = { viewer: 0, crew: 1, 'competent-person': 2, admin: 3 };

export const roleNames: Readonly<Record<Role, string>> = {
  viewer: 'viewer',
  crew: 'crew',
  'competent-person': 'competent person',
  admin: 'administrator',
};

/** True when the signed-in person holds `needed` or a role above it. */
export function may(state: SessionState, needed: Role): boolean {
  return state.status === 'ready' && state.signedIn && rank[state.role] >= rank[needed];
}

export async function loadSession(): Promise<void> {
  try {
    const s = await api<Session>('/api/session', { quiet401: true });
    if (s.signedIn) setCsrfToken(s.csrfToken);
    session.set({ status: 'ready', ...s });
  } catch (err) {
    session.set({ status: 'error', message: err instanceof Error ? err.message : String(err) });
  }
}

export async function signOut(): Promise<void> {
  try {
    // A phone handed on (a shared crew phone) must stop receiving this person's alerts: this
    // device's push subscription goes before the session does. Failing that, sign out anyway.
    await unsubscribePush().catch(() => undefined);
    await api('/api/session', { method: 'DELETE' });
  } finally {
    setCsrfToken('');
    await forgetSiteData();
    await loadSession();
  }
}

// Any 401 from the API: the session ended (expired, signed out elsewhere, password changed).
whenSignedOut(() => {
  const s = session.get();
  if (s.status === 'ready' && s.signedIn) void loadSession();
});
