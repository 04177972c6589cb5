/**
 * A labelled form field with its help text (what it is, its unit, where a default comes from)
 * and the server's complaint about it right underneath.
 */
import type { ComponentChildren } from 'preact';

let counter = 0;
export const fieldId = (name: string): string => `f-${name.replace(/[^a-zA-Z0-9]/g, '-')}-${++counter}`;

export function Field(props: { id: string; label: string; unit?: string; help?: ComponentChildren; error?: string | undefined; children: ComponentChildren; wide?: boolean }) {
  const helpId = `${props.id}-help`;
  const errId = `${props.id}-err`;
  return (
    <div class={`field${props.error ? ' has-error' : ''}${props.wide ? ' wide' : ''}`}>
      <label for={props.id}>
        {props.label}
        {props.unit ? <span class="unit"> ({props.unit})</span> : null}
      </label>
      {props.children}
      {props.error ? (
        <p class="field-error" id={errId} role="alert">
          {props.error}
        </p>
      ) : null}
      {props.help ? (
        <p class="help" id={helpId}>
          {props.help}
        </p>
      ) : null}
    </div>
  );
}

/** aria-describedby for an input inside <Field id=...>. */
export function described(id: string, hasHelp: boolean, hasError: boolean): string | undefined {
  const ids = [hasError ? `${id}-err` : null, hasHelp ? `${id}-help` : null].filter(Boolean);
  return ids.length > 0 ? ids.join(' ') : undefined;
}
