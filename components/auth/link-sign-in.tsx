'use client';

import { signIn } from 'next-auth/react';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { primaryButton } from '@/components/ui/button';

/** Uses a sign-in link only when the person presses the button: mail scanners that open links do not spend it. */
export function LinkSignIn({ token }: { token: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function go() {
    setBusy(true);
    const result = await signIn('link', { token, redirect: false });
    setBusy(false);
    if (!result || result.error) {
      setError(result?.error && result.error !== 'CredentialsSignin' ? result.error : 'Sign-in failed.');
      return;
    }
    router.push('/projects');
    router.refresh();
  }
  return (
    <div className="space-y-3">
      <button type="button" onClick={go} disabled={busy} className={primaryButton}>
        {busy ? 'Signing in…' : 'Sign in to Worldsheet'}
      </button>
      <p role="alert" aria-live="assertive" className="text-sm text-fail">
        {error ?? ''}
      </p>
    </div>
  );
}
