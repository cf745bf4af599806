import type { Metadata } from 'next';
import { ResetPasswordForm } from '@/components/auth/reset-password-form';

export const metadata: Metadata = { title: 'Choose a password' };
export const dynamic = 'force-dynamic';

export default async function ResetPasswordPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { token, invitation } = await searchParams;
  return (
    <section className="mx-auto max-w-md py-10">
      <h1 className="text-2xl font-bold">{invitation ? 'Welcome: choose your password' : 'Choose a new password'}</h1>
      <p className="mt-2 text-ink-muted">The link works once. Setting a new password signs you out everywhere else.</p>
      <div className="mt-6">
        {token ? (
          <ResetPasswordForm token={token} />
        ) : (
          <p role="alert" className="text-fail">
            This link is incomplete.
          </p>
        )}
      </div>
    </section>
  );
}
