'use client';

import { useRouter } from 'next/navigation';
import { useId, useState } from 'react';
import { api, errorText } from '@/components/data/api-client';
import { primaryButton } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';

export interface StartOption {
  sheetId: string;
  code: string;
  title: string;
  version: number;
  sha256: string;
  kind: 'starter' | 'approved';
}

/**
 * Starts a new sheet from a starter or an approved version (lib/sheets/start-from.ts): the copy is a
 * new draft that records where it came from; it is checked and approved on its own.
 */
export function StartFromForm({
  projectId,
  projectCode,
  options,
}: {
  projectId: string;
  projectCode: string;
  options: StartOption[];
}) {
  const router = useRouter();
  const id = useId();
  const [chosen, setChosen] = useState('');
  const [title, setTitle] = useState('');
  const [state, setState] = useState<{ error?: string; busy?: boolean }>({});
  const option = options.find((o) => `${o.sheetId}:${o.version}` === chosen);

  async function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (!option) return;
    setState({ busy: true });
    let answer;
    try {
      answer = await api.startFrom(projectId, {
        sheetId: option.sheetId,
        version: option.version,
        title: title.trim(),
      });
    } catch (error) {
      setState({ error: errorText(error) });
      return;
    }
    router.push(`/projects/${projectCode}/sheets/${answer.number}`);
  }

  if (options.length === 0) {
    return <p className="text-sm text-ink-muted">No starter sheet or approved version to start from yet.</p>;
  }
  const starters = options.filter((o) => o.kind === 'starter');
  const approved = options.filter((o) => o.kind === 'approved');
  const label = (o: StartOption) => `${o.code} v${o.version}: ${o.title}`;
  return (
    <form onSubmit={submit} className="space-y-2" aria-labelledby={`${id}-title`}>
      <h3 id={`${id}-title`} className="text-sm font-semibold">
        Start from a starter or an approved sheet
      </h3>
      <div>
        <label htmlFor={`${id}-source`} className="block text-sm font-semibold">
          Start from
        </label>
        <select
          id={`${id}-source`}
          required
          value={chosen}
          onChange={(e) => {
            setChosen(e.target.value);
            const o = options.find((x) => `${x.sheetId}:${x.version}` === e.target.value);
            if (o && !title.trim()) setTitle(o.title);
          }}
          className={inputClass}
        >
          <option value="" disabled>
            Choose a sheet
          </option>
          {starters.length > 0 ? (
            <optgroup label="Starter sheets">
              {starters.map((o) => (
                <option key={`${o.sheetId}:${o.version}`} value={`${o.sheetId}:${o.version}`}>
                  {label(o)}
                </option>
              ))}
            </optgroup>
          ) : null}
          {approved.length > 0 ? (
            <optgroup label="Approved versions">
              {approved.map((o) => (
                <option key={`${o.sheetId}:${o.version}`} value={`${o.sheetId}:${o.version}`}>
                  {label(o)}
                </option>
              ))}
            </optgroup>
          ) : null}
        </select>
        {option ? (
          <p className="mt-1 text-xs text-ink-muted">
            Copies version {option.version} of {option.code} (SHA-256{' '}
            <span className="font-mono">{option.sha256.slice(0, 12)}…</span>): cells, record, settings and attachments.
            The new sheet records where it came from and is checked and approved on its own.
          </p>
        ) : null}
      </div>
      <Field label="Title of the new sheet" id={`${id}-new-title`}>
        {(control) => (
          <input
            {...control}
            required
            maxLength={300}
            value={title}
            onChange={(e) => setTitle(e.target.value)}
            className={inputClass}
          />
        )}
      </Field>
      <button type="submit" disabled={state.busy || !option || !title.trim()} className={primaryButton}>
        Start the new sheet
      </button>
      <p role="alert" aria-live="polite" className="text-sm text-fail">
        {state.error ?? ''}
      </p>
    </form>
  );
}
