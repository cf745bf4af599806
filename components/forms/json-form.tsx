'use client';

import { useId, useState } from 'react';
import { primaryButton, secondaryButton } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { api, errorText } from '@/components/data/api-client';

export interface FieldSpec {
  name: string;
  label: string;
  type?: 'text' | 'email' | 'password' | 'select' | 'checkbox' | 'textarea';
  options?: Array<{ value: string; label: string }>;
  required?: boolean;
  autoComplete?: string;
  hint?: string;
  defaultValue?: string;
}

/**
 * A form that sends its fields as JSON to one of our route handlers and shows the server's answer.
 * The server validates everything again; the browser's checks only save a round trip.
 */
export function JsonForm({
  action,
  method = 'POST',
  fields,
  submitLabel,
  onDone,
  successMessage,
  extra,
  onCancel,
}: {
  action: string;
  method?: 'POST' | 'PATCH' | 'DELETE';
  fields: FieldSpec[];
  submitLabel: string;
  onDone?: (body: Record<string, unknown>) => void;
  successMessage?: string;
  extra?: Record<string, unknown>;
  /** Shows a Cancel button (and lets Escape cancel): the form is left without sending anything. */
  onCancel?: () => void;
}) {
  const id = useId();
  const [state, setState] = useState<{ kind: 'idle' | 'busy' | 'error' | 'done'; message?: string }>({ kind: 'idle' });
  async function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const body: Record<string, unknown> = { ...extra };
    for (const f of fields)
      body[f.name] = f.type === 'checkbox' ? form.get(f.name) === 'on' : String(form.get(f.name) ?? '');
    setState({ kind: 'busy' });
    let answer: Record<string, unknown>;
    try {
      answer = await api.sendForm(method, action, body);
    } catch (error) {
      setState({ kind: 'error', message: errorText(error) });
      return;
    }
    const said = typeof answer.message === 'string' ? answer.message : undefined;
    setState({ kind: 'done', message: successMessage ?? said ?? 'Done.' });
    onDone?.(answer);
  }
  return (
    <form
      onSubmit={submit}
      onKeyDown={
        onCancel
          ? (event) => {
              if (event.key === 'Escape' && state.kind !== 'busy') onCancel();
            }
          : undefined
      }
      className="space-y-3"
      aria-describedby={`${id}-status`}
    >
      {fields.map((f) => {
        const fieldId = `${id}-${f.name}`;
        const common = {
          name: f.name,
          required: f.required,
          autoComplete: f.autoComplete,
          defaultValue: f.defaultValue,
        };
        if (f.type === 'checkbox') {
          const hintId = f.hint ? `${fieldId}-hint` : undefined;
          return (
            <div key={f.name} className="flex items-center gap-2">
              <input {...common} id={fieldId} aria-describedby={hintId} type="checkbox" className="h-4 w-4" />
              <label htmlFor={fieldId} className="text-sm">
                {f.label}
              </label>
              {f.hint ? (
                <p id={hintId} className="text-xs text-ink-muted">
                  {f.hint}
                </p>
              ) : null}
            </div>
          );
        }
        return (
          <Field key={f.name} label={f.label} id={fieldId} hint={f.hint}>
            {(control) =>
              f.type === 'select' ? (
                <select {...common} {...control} className={inputClass}>
                  {f.options!.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              ) : f.type === 'textarea' ? (
                <textarea {...common} {...control} rows={2} className={inputClass} />
              ) : (
                <input {...common} {...control} type={f.type ?? 'text'} className={inputClass} />
              )
            }
          </Field>
        );
      })}
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" disabled={state.kind === 'busy'} className={primaryButton}>
          {state.kind === 'busy' ? 'Working…' : submitLabel}
        </button>
        {onCancel ? (
          <button type="button" onClick={onCancel} disabled={state.kind === 'busy'} className={secondaryButton}>
            Cancel
          </button>
        ) : null}
      </div>
      <p
        id={`${id}-status`}
        role={state.kind === 'error' ? 'alert' : 'status'}
        aria-live="polite"
        className={state.kind === 'error' ? 'text-sm text-fail' : 'text-sm text-pass'}
      >
        {state.kind === 'error' || state.kind === 'done' ? state.message : ''}
      </p>
    </form>
  );
}
