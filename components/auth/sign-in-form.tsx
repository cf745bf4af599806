'use client';

import { signIn } from 'next-auth/react';
import { useRouter } from 'next/navigation';
import { useId, useState } from 'react';
import { JsonForm } from '@/components/forms/json-form';
import { safeSameOriginPath } from '@/lib/http/same-origin';
import { primaryButton } from '@/components/ui/button';
import { Field, inputClass, PasswordField } from '@/components/ui/field';

export function SignInForm({
  callbackUrl,
  initialError,
  oidcName,
}: {
  callbackUrl: string;
  initialError: string | null;
  oidcName: string | null;
}) {
  const router = useRouter();
  const id = useId();
  const [error, setError] = useState<string | null>(initialError);
  const [busy, setBusy] = useState(false);
  const [mode, setMode] = useState<'password' | 'link' | 'reset'>('password');

  async function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setError(null);
    const result = await signIn('password', {
      email: String(form.get('email')),
      password: String(form.get('password')),
      redirect: false,
    });
    setBusy(false);
    if (!result || result.error) {
      setError(result?.error && result.error !== 'CredentialsSignin' ? result.error : 'Sign-in failed.');
      return;
    }
    // The page passed a same-origin path; resolved once more against the page's own origin, so that
    // this form never sends the browser to another host whatever it is given.
    router.push(safeSameOriginPath(callbackUrl, window.location.origin, '/projects'));
    router.refresh();
  }

  return (
    <div className="space-y-6">
      {mode === 'password' ? (
        <form onSubmit={submit} className="space-y-3" aria-describedby={`${id}-error`}>
          <Field label="E-mail" id={`${id}-email`}>
            {(control) => (
              <input {...control} name="email" type="email" required autoComplete="username" className={inputClass} />
            )}
          </Field>
          <PasswordField label="Password" id={`${id}-password`} />
          <button type="submit" disabled={busy} className={primaryButton}>
            {busy ? 'Signing in…' : 'Sign in'}
          </button>
          <p id={`${id}-error`} role="alert" aria-live="assertive" className="text-sm text-fail">
            {error ?? ''}
          </p>
        </form>
      ) : mode === 'link' ? (
        <JsonForm
          action="/api/auth/sign-in-link"
          fields={[{ name: 'email', label: 'E-mail', type: 'email', required: true, autoComplete: 'username' }]}
          submitLabel="E-mail me a sign-in link"
        />
      ) : (
        <JsonForm
          action="/api/auth/password-reset"
          fields={[{ name: 'email', label: 'E-mail', type: 'email', required: true, autoComplete: 'username' }]}
          submitLabel="E-mail me a reset link"
        />
      )}
      <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {mode !== 'password' ? (
          <button type="button" className="text-accent underline" onClick={() => setMode('password')}>
            Sign in with a password
          </button>
        ) : null}
        {mode !== 'link' ? (
          <button type="button" className="text-accent underline" onClick={() => setMode('link')}>
            Sign in with an e-mailed link
          </button>
        ) : null}
        {mode !== 'reset' ? (
          <button type="button" className="text-accent underline" onClick={() => setMode('reset')}>
            Forgot the password?
          </button>
        ) : null}
      </div>
      {oidcName ? (
        <button
          type="button"
          onClick={() => signIn('oidc', { callbackUrl })}
          className="rounded border border-rule-strong bg-surface px-4 py-2 font-semibold hover:bg-paper"
        >
          Sign in with {oidcName}
        </button>
      ) : null}
    </div>
  );
}
