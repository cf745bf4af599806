import type { Metadata } from 'next';
import { LinkSignIn } from '@/components/auth/link-sign-in';

export const metadata: Metadata = { title: 'Sign in with a link' };
export const dynamic = 'force-dynamic';

export default async function LinkPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { token } = await searchParams;
  return (
    <section className="mx-auto max-w-md py-10">
      <h1 className="text-2xl font-bold">Sign in with a link</h1>
      {token ? (
        <>
          <p className="mt-2 text-ink-muted">The link works once. Press the button to sign in.</p>
          <div className="mt-6">
            <LinkSignIn token={token} />
          </div>
        </>
      ) : (
        <p role="alert" className="mt-4 text-fail">
          This link is incomplete. Ask for a new one on the sign-in page.
        </p>
      )}
    </section>
  );
}
