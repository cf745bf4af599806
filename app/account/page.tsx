import type { Metadata } from 'next';
import { ApiTokensPanel } from '@/components/account/api-tokens-panel';
import { JsonForm } from '@/components/forms/json-form';
import { API_TOKEN_SETTINGS } from '@/lib/auth/api-tokens';
import { pageActor } from '@/lib/auth/page-guard';

export const metadata: Metadata = { title: 'Your account' };
export const dynamic = 'force-dynamic';

export default async function AccountPage() {
  const actor = await pageActor('/account');
  return (
    <div className="space-y-10">
      <header>
        <h1 className="text-2xl font-bold">Your account</h1>
        <p className="mt-1 text-ink-muted">
          {actor.name} · <span className="font-mono">{actor.email}</span>
          {actor.isAdmin ? ' · administrator' : ''}
        </p>
      </header>
      <section aria-labelledby="password-title" className="max-w-md">
        <h2 id="password-title" className="text-xl font-bold">
          Change the password
        </h2>
        <div className="mt-3">
          <JsonForm
            action="/api/account/password"
            fields={[
              {
                name: 'currentPassword',
                label: 'Current password',
                type: 'password',
                required: true,
                autoComplete: 'current-password',
              },
              {
                name: 'newPassword',
                label: 'New password',
                type: 'password',
                required: true,
                autoComplete: 'new-password',
                hint: 'At least 12 characters.',
              },
              { name: 'revokeTokens', label: 'Also revoke all my API tokens', type: 'checkbox' },
            ]}
            submitLabel="Change the password"
            successMessage="Your password is changed. Your other sessions are signed out."
          />
        </div>
      </section>
      <section aria-labelledby="tokens-title">
        <h2 id="tokens-title" className="text-xl font-bold">
          API tokens
        </h2>
        <p className="mt-1 max-w-prose text-sm text-ink-muted">
          For scripts and integrations. A token carries your roles; its writes are audited under your name. A read-only
          token may only read; signing always asks for your password. Tokens expire (you choose when, after at most{' '}
          {API_TOKEN_SETTINGS.maxDays} days) and stop working while your account is locked or disabled; a password reset
          revokes them all. Revoke a token you no longer use.
        </p>
        <div className="mt-3">
          <ApiTokensPanel defaultDays={API_TOKEN_SETTINGS.defaultDays} maxDays={API_TOKEN_SETTINGS.maxDays} />
        </div>
      </section>
    </div>
  );
}
