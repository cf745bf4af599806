import type { Metadata } from 'next';
import { UnlockForm } from '@/components/auth/unlock-form';

export const metadata: Metadata = { title: 'Unlock your account' };
export const dynamic = 'force-dynamic';

/** The page of the unlock link e-mailed when failed passwords lock an account. A button, not the visit, unlocks: mail scanners open links. */
export default async function UnlockPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { token } = await searchParams;
  return (
    <section className="mx-auto max-w-md py-10">
      <h1 className="text-2xl font-bold">Unlock your account</h1>
      {token ? (
        <>
          <p className="mt-2 text-ink-muted">
            Your account was locked after several wrong passwords. The link works once. If the wrong passwords were not
            yours, change your password after signing in and tell an administrator.
          </p>
          <div className="mt-6">
            <UnlockForm token={token} />
          </div>
        </>
      ) : (
        <p role="alert" className="mt-4 text-fail">
          This link is incomplete.
        </p>
      )}
    </section>
  );
}
