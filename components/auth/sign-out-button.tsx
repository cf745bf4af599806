'use client';

import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: '/' })}
      className="rounded px-2 py-1 text-sm font-semibold text-accent underline hover:text-accent-hover"
    >
      Sign out
    </button>
  );
}
