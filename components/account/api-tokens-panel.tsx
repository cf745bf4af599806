'use client';

import { useState } from 'react';
import useSWR from 'swr';
import { fetchJson as fetcher } from '@/components/data/fetch-json';
import { JsonForm } from '@/components/forms/json-form';

interface TokenRow {
  id: string;
  name: string;
  prefix: string;
  created_at: string;
  last_used_at: string | null;
  revoked_at: string | null;
}


export function ApiTokensPanel() {
  const { data, mutate } = useSWR<{ tokens: TokenRow[] }>('/api/account/tokens', fetcher);
  const [secret, setSecret] = useState<string | null>(null);
  async function revoke(id: string) {
    await fetch(`/api/account/tokens/${id}`, { method: 'DELETE' });
    await mutate();
  }
  return (
    <div className="space-y-4">
      <JsonForm
        action="/api/account/tokens"
        fields={[{ name: 'name', label: 'Token name', required: true, hint: 'What the token is for, e.g. "nightly export script".' }]}
        submitLabel="Create a token"
        successMessage="Token created."
        onDone={(body) => {
          setSecret(String(body.token));
          void mutate();
        }}
      />
      {secret ? (
        <div role="status" className="rounded border border-caution-rule bg-caution-soft p-3 text-sm text-caution">
          <p className="font-bold">Copy this token now: it is shown only once.</p>
          <code className="mt-1 block break-all font-mono text-ink">{secret}</code>
          <p className="mt-1">Send it as <code className="font-mono">Authorization: Bearer …</code>. It acts with your roles.</p>
        </div>
      ) : null}
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">Your API tokens</caption>
        <thead>
          <tr className="border-b border-rule-strong text-left">
            <th scope="col" className="py-2 pr-3">Name</th>
            <th scope="col" className="py-2 pr-3">Begins with</th>
            <th scope="col" className="py-2 pr-3">Created</th>
            <th scope="col" className="py-2 pr-3">Last used</th>
            <th scope="col" className="py-2">State</th>
          </tr>
        </thead>
        <tbody>
          {(data?.tokens ?? []).map((t) => (
            <tr key={t.id} className="border-b border-rule">
              <td className="py-2 pr-3">{t.name}</td>
              <td className="py-2 pr-3 font-mono">{t.prefix}…</td>
              <td className="py-2 pr-3">{t.created_at.slice(0, 10)}</td>
              <td className="py-2 pr-3">{t.last_used_at ? t.last_used_at.slice(0, 16).replace('T', ' ') : 'never'}</td>
              <td className="py-2">
                {t.revoked_at ? (
                  'revoked'
                ) : (
                  <button type="button" onClick={() => revoke(t.id)} className="font-semibold text-fail underline">
                    Revoke {t.name}
                  </button>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
