/**
 * The line at the top of a screen a role can read but not change: plainly "Read only", what the
 * role may do here, and whom to ask for a change. The screen below it has no inputs or buttons
 * for what the role cannot do.
 */
import { session, type SessionState } from '../session.ts';
import { useStore } from '../store.ts';

/** "a viewer", "crew", "a site-link viewer": how the note names the one reading it. */
export function roleAs(s: SessionState): string {
  if (s.status !== 'ready' || !s.signedIn) return 'a viewer';
  if (s.kind === 'link') return 'a site-link viewer';
  return s.role === 'crew' ? 'crew' : s.role === 'viewer' ? 'a viewer' : s.role === 'admin' ? 'an administrator' : 'a competent person';
}

export function ReadOnlyNote({ what, ask, extra }: { what: string; ask: string; extra?: string }) {
  const s = useStore(session);
  return (
    <p class="note-box readonly-note" role="note">
      <strong>Read only.</strong> As {roleAs(s)} you can read {what} here. For a change, ask {ask}.
      {extra ? ` ${extra}` : ''}
    </p>
  );
}
