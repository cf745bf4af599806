'use client';

import Link from 'next/link';
import { useState } from 'react';
import { JsonForm } from '@/components/forms/json-form';

export function ResetPasswordForm({ token }: { token: string }) {
  const [done, setDone] = useState(false);
  return done ? (
    <p role="status" className="text-pass">
      Your password is set.{' '}
      <Link href="/sign-in" className="font-semibold text-accent underline">
        Sign in
      </Link>
      .
    </p>
  ) : (
    <JsonForm
      action="/api/auth/password-reset/confirm"
      extra={{ token }}
      fields={[
        {
          name: 'newPassword',
          label: 'New password',
          type: 'password',
          required: true,
          autoComplete: 'new-password',
          hint: 'At least 12 characters.',
        },
      ]}
      submitLabel="Set the password"
      onDone={() => setDone(true)}
    />
  );
}
