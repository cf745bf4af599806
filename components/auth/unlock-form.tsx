'use client';

import Link from 'next/link';
import { useState } from 'react';
import { JsonForm } from '@/components/forms/json-form';

export function UnlockForm({ token }: { token: string }) {
  const [done, setDone] = useState(false);
  return done ? (
    <p role="status" className="text-pass">
      Your account is unlocked.{' '}
      <Link href="/sign-in" className="font-semibold text-accent underline">
        Sign in
      </Link>
      .
    </p>
  ) : (
    <JsonForm
      action="/api/auth/unlock"
      extra={{ token }}
      fields={[]}
      submitLabel="Unlock my account"
      onDone={() => setDone(true)}
    />
  );
}
