'use client';

import { formatUtc } from '@/components/ui/utc-time';
import { useEffect, useId, useRef, useState } from 'react';
import useSWR from 'swr';
import { api, errorText } from '@/components/data/api-client';
import { primaryButton, secondaryButton } from '@/components/ui/button';
import { Table, Td, Th } from '@/components/ui/table';
import { Field, inputClass } from '@/components/ui/field';

type Scope = 'read' | 'read-write';

interface Created {
  token: string;
  scope: Scope;
  expires_at: string;
}

const SCOPE_TEXT: Record<Scope, string> = { read: 'read only', 'read-write': 'read and write' };

/** Lifetimes offered at creation: the usual ones up to the maximum, and the default. */
function lifetimes(defaultDays: number, maxDays: number): number[] {
  return [...new Set([7, 30, 90, 180, 365, defaultDays, maxDays])]
    .filter((d) => d >= 1 && d <= maxDays)
    .sort((a, b) => a - b);
}

export function ApiTokensPanel({ defaultDays, maxDays }: { defaultDays: number; maxDays: number }) {
  const id = useId();
  const { data, mutate } = useSWR('/api/account/tokens', api.listApiTokens);
  const [created, setCreated] = useState<Created | null>(null);
  const [state, setState] = useState<{ kind: 'idle' | 'busy' | 'error' | 'done'; message?: string }>({ kind: 'idle' });

  async function create(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const body = {
      name: String(form.get('name') ?? ''),
      scope: String(form.get('scope') ?? 'read') as Scope,
      expiresInDays: Number(form.get('expiresInDays')),
    };
    setState({ kind: 'busy' });
    let answer;
    try {
      answer = await api.createApiToken(body);
    } catch (error) {
      setState({ kind: 'error', message: errorText(error) });
      return;
    }
    setCreated({ token: answer.token, scope: answer.scope, expires_at: answer.expires_at });
    setState({ kind: 'done', message: 'Token created.' });
    void mutate();
  }

  return (
    <div className="space-y-4">
      <form onSubmit={create} className="max-w-md space-y-3" aria-describedby={`${id}-status`}>
        <Field
          label="Token name"
          id={`${id}-name`}
          hint={<>What the token is for, e.g. &quot;nightly export script&quot;.</>}
        >
          {(control) => <input {...control} name="name" required maxLength={100} className={inputClass} />}
        </Field>
        <fieldset>
          <legend className="text-sm font-semibold">What it may do</legend>
          <div className="flex items-center gap-2">
            <input id={`${id}-scope-read`} type="radio" name="scope" value="read" defaultChecked className="h-6 w-6" />
            <label htmlFor={`${id}-scope-read`} className="text-sm">
              Read only
            </label>
          </div>
          <div className="flex items-center gap-2">
            <input id={`${id}-scope-rw`} type="radio" name="scope" value="read-write" className="h-6 w-6" />
            <label htmlFor={`${id}-scope-rw`} className="text-sm">
              Read and write (signing still asks for your password)
            </label>
          </div>
        </fieldset>
        <Field label="Expires after" id={`${id}-days`}>
          {(control) => (
            <select {...control} name="expiresInDays" defaultValue={String(defaultDays)} className={inputClass}>
              {lifetimes(defaultDays, maxDays).map((d) => (
                <option key={d} value={d}>
                  {d} days
                </option>
              ))}
            </select>
          )}
        </Field>
        <button type="submit" disabled={state.kind === 'busy'} className={primaryButton}>
          {state.kind === 'busy' ? 'Working…' : 'Create a token'}
        </button>
        <p
          id={`${id}-status`}
          role={state.kind === 'error' ? 'alert' : 'status'}
          aria-live="polite"
          className={state.kind === 'error' ? 'text-sm text-fail' : 'text-sm text-pass'}
        >
          {state.kind === 'error' || state.kind === 'done' ? state.message : ''}
        </p>
      </form>
      {created ? (
        <div role="status" className="rounded border border-caution-rule bg-caution-soft p-3 text-sm text-caution">
          <p className="font-bold">Copy this token now: it is shown only once.</p>
          <code className="mt-1 block break-all font-mono text-ink">{created.token}</code>
          <p className="mt-1">
            {SCOPE_TEXT[created.scope] ?? created.scope}; expires {formatUtc(created.expires_at)}. Send it as{' '}
            <code className="font-mono">Authorization: Bearer …</code>. It acts with your roles.
          </p>
        </div>
      ) : null}
      <Table caption="Your API tokens">
        <thead>
          <tr className="border-b border-rule-strong text-left">
            <Th className="py-2 pr-3">Name</Th>
            <Th className="py-2 pr-3">Begins with</Th>
            <Th className="py-2 pr-3">May</Th>
            <Th className="py-2 pr-3">Created</Th>
            <Th className="py-2 pr-3">Expires</Th>
            <Th className="py-2 pr-3">Last used</Th>
            <Th className="py-2">State</Th>
          </tr>
        </thead>
        <tbody>
          {(data?.tokens ?? []).map((t) => (
            <tr key={t.id} className="border-b border-rule">
              <Td className="py-2 pr-3">{t.name}</Td>
              <Td className="py-2 pr-3 font-mono">{t.prefix}…</Td>
              <Td className="py-2 pr-3">{SCOPE_TEXT[t.scope] ?? t.scope}</Td>
              <Td className="py-2 pr-3">{t.created_at.slice(0, 10)}</Td>
              <Td className="py-2 pr-3">{formatUtc(t.expires_at)}</Td>
              <Td className="py-2 pr-3">{t.last_used_at ? t.last_used_at.slice(0, 16).replace('T', ' ') : 'never'}</Td>
              <Td className="py-2">
                {t.revoked_at ? (
                  'revoked'
                ) : t.expired ? (
                  'expired'
                ) : (
                  <RevokeToken id={t.id} name={t.name} onRevoked={() => void mutate()} />
                )}
              </Td>
            </tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}

/**
 * Revoking asks first: the button opens a question with the revoking button focused and a Cancel
 * (or Escape) that leaves the token as it is and puts the focus back on the first button.
 */
function RevokeToken({ id, name, onRevoked }: { id: string; name: string; onRevoked: () => void }) {
  const questionId = useId();
  const [state, setState] = useState<{ kind: 'closed' | 'asking' | 'busy' | 'error'; message?: string }>({
    kind: 'closed',
  });
  const opener = useRef<HTMLButtonElement>(null);
  const confirm = useRef<HTMLButtonElement>(null);
  const wasOpen = useRef(false);
  const open = state.kind !== 'closed';
  useEffect(() => {
    if (open && !wasOpen.current) confirm.current?.focus();
    else if (!open && wasOpen.current) opener.current?.focus();
    wasOpen.current = open;
  }, [open]);

  async function revoke() {
    setState({ kind: 'busy' });
    try {
      await api.revokeApiToken(id);
    } catch (error) {
      setState({ kind: 'error', message: errorText(error) });
      return;
    }
    onRevoked();
  }

  if (!open) {
    return (
      <button
        ref={opener}
        type="button"
        onClick={() => setState({ kind: 'asking' })}
        className="font-semibold text-fail underline"
      >
        Revoke {name}
      </button>
    );
  }
  return (
    <div
      role="group"
      aria-labelledby={questionId}
      className="min-w-56 space-y-2"
      onKeyDown={(event) => {
        if (event.key === 'Escape' && state.kind !== 'busy') setState({ kind: 'closed' });
      }}
    >
      <p id={questionId}>Revoke {name}? Whatever uses it is refused from then on; this cannot be undone.</p>
      <div className="flex flex-wrap gap-2">
        <button
          ref={confirm}
          type="button"
          onClick={() => void revoke()}
          disabled={state.kind === 'busy'}
          className="rounded bg-fail px-3 py-1.5 text-sm font-semibold text-surface disabled:opacity-60"
        >
          {state.kind === 'busy' ? 'Working…' : 'Revoke the token'}
        </button>
        <button
          type="button"
          onClick={() => setState({ kind: 'closed' })}
          disabled={state.kind === 'busy'}
          className={secondaryButton}
        >
          Cancel
        </button>
      </div>
      {state.kind === 'error' ? (
        <p role="alert" className="text-sm text-fail">
          {state.message}
        </p>
      ) : null}
    </div>
  );
}
