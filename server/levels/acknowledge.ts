/**
 * Acknowledging an alert (design §2.4): a named person says they have seen it, with an optional
 * note. An alert is acknowledged once; the first acknowledgement is what the log keeps.
 */
import type { Alert } from './alert.ts';

/** Longest accepted name, characters: a name, not a message (our limit). */
export const maxAcknowledgerNameLength = 100;
/** Longest accepted note, characters (same bound as an action text). */
export const maxAcknowledgementNoteLength = 2000;

export type AcknowledgementErrorCode = 'already-acknowledged' | 'invalid-name' | 'invalid-note' | 'invalid-time';

/** Refusal to acknowledge; `code` says why, so the HTTP layer can map it (409 vs 400). */
export class AcknowledgementError extends Error {
  readonly code: AcknowledgementErrorCode;
  constructor(code: AcknowledgementErrorCode, message: string) {
    super(message);
    this.name = 'AcknowledgementError';
    this.code = code;
  }
}

/**
 * The alert acknowledged by `by` at `atMs`, with `note` if given. Throws an AcknowledgementError
 * when the alert is already acknowledged ('already-acknowledged'), the name is empty after
 * trimming or too long ('invalid-name'), the note is too long ('invalid-note'), or the time is
 * not finite or before the alert was raised ('invalid-time').
 *
 * @example acknowledge(alert, { by: 'Sam (rigger)', note: 'Side walls closed', atMs }).acknowledgement?.by // → 'Sam (rigger)'
 */
export function acknowledge(alert: Alert, args: { by: string; note?: string | null; atMs: number }): Alert {
  if (alert.acknowledgement !== null) {
    const { by, atMs } = alert.acknowledgement;
    throw new AcknowledgementError(
      'already-acknowledged',
      `acknowledge: this alert was already acknowledged by ${by} at ${new Date(atMs).toISOString()}`,
    );
  }
  const by = typeof args.by === 'string' ? args.by.trim() : '';
  if (by.length === 0 || by.length > maxAcknowledgerNameLength) {
    throw new AcknowledgementError(
      'invalid-name',
      `acknowledge: by must name the person acknowledging (1 to ${maxAcknowledgerNameLength} characters), got '${String(args.by)}'`,
    );
  }
  const rawNote = args.note ?? null;
  if (rawNote !== null && typeof rawNote !== 'string') {
    throw new AcknowledgementError('invalid-note', `acknowledge: note must be text or absent, got ${typeof rawNote}`);
  }
  const note = rawNote === null || rawNote.trim().length === 0 ? null : rawNote.trim();
  if (note !== null && note.length > maxAcknowledgementNoteLength) {
    throw new AcknowledgementError(
      'invalid-note',
      `acknowledge: note must be at most ${maxAcknowledgementNoteLength} characters, got ${note.length}`,
    );
  }
  if (!(Number.isFinite(args.atMs) && args.atMs >= alert.raisedAtMs)) {
    throw new AcknowledgementError(
      'invalid-time',
      `acknowledge: atMs must be a finite time not before the alert was raised (${alert.raisedAtMs} ms), got ${args.atMs}`,
    );
  }
  return { ...alert, acknowledgement: { by, note, atMs: args.atMs } };
}
