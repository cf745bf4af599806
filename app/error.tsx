'use client';

import { useEffect } from 'react';
import { primaryButton } from '@/components/ui/button';

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <section role="alert" className="mx-auto max-w-prose py-12">
      <h1 className="text-2xl font-bold">Something went wrong</h1>
      <p className="mt-3 text-ink-muted">
        The page could not be shown. Nothing you saved is lost: versions are written whole or not at all.
        {error.digest ? (
          <>
            {' '}
            Reference for the administrator: <code className="font-mono">{error.digest}</code>.
          </>
        ) : null}
      </p>
      <button type="button" onClick={reset} className={`mt-6 ${primaryButton}`}>
        Try again
      </button>
    </section>
  );
}
