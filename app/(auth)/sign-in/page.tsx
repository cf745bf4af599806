import type { Metadata } from 'next';
import Link from 'next/link';
import { SignInForm } from '@/components/auth/sign-in-form';
import { oidcConfigured } from '@/lib/auth/oidc';
import { config } from '@/lib/config';
import { appUrl } from '@/lib/http/app-url';
import { safeSameOriginPath } from '@/lib/http/same-origin';

export const metadata: Metadata = { title: 'Sign in' };
export const dynamic = 'force-dynamic';

const SIGN_IN_ERRORS: Record<string, string> = {
  OidcNotAllowed: 'Your organisation account is not allowed to sign in here. Ask an administrator.',
  OidcEmailUnverified: 'Your organisation account has no verified e-mail address, so it cannot sign in here.',
  OAuthSignin: 'The organisation sign-in could not start. Try again.',
  OAuthCallback: 'The organisation sign-in did not complete. Try again.',
  AccessDenied: 'Sign-in was refused.',
  SessionRequired: 'Sign in to see that page.',
};

const DEMO = ['originator', 'checker', 'approver', 'controller', 'viewer', 'admin'];

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const raw = await searchParams;
  // A parameter given twice arrives as an array: only a single value counts.
  const query = Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, typeof v === 'string' ? v : undefined]));
  // Only a path on the app's own origin, as the URL parser resolves it (lib/http/same-origin.ts).
  const callbackUrl = safeSameOriginPath(query.callbackUrl, appUrl(), '/projects');
  const settings = config();
  const demo = settings.WORLDSHEET_DEMO;
  // Only fixed messages, chosen by code: text from the address bar is never shown as a message.
  const error = query.error
    ? Object.hasOwn(SIGN_IN_ERRORS, query.error)
      ? SIGN_IN_ERRORS[query.error]
      : 'Sign-in failed. Try again, or ask an administrator.'
    : null;
  return (
    <div className="mx-auto grid max-w-sheet grid-cols-1 gap-10 py-6 md:grid-cols-2">
      <section aria-labelledby="sign-in-title" className="max-w-md">
        <h1 id="sign-in-title" className="text-2xl font-bold">
          Sign in
        </h1>
        <p className="mt-2 text-ink-muted">Your account is given by an administrator of your organisation.</p>
        <div className="mt-6">
          <SignInForm
            callbackUrl={callbackUrl}
            initialError={error}
            oidcName={oidcConfigured() ? settings.WORLDSHEET_OIDC_NAME : null}
          />
        </div>
      </section>
      {demo ? (
        <aside aria-labelledby="demo-title" className="rounded border border-rule bg-surface p-5">
          <h2 id="demo-title" className="font-bold">
            Demo accounts
          </h2>
          <p className="mt-1 text-sm text-ink-muted">
            This installation holds fictional demo data. Every account below uses the password{' '}
            <code className="font-mono text-ink">worldsheet-demo</code>.
          </p>
          <ul className="mt-3 space-y-1 font-mono text-sm">
            {DEMO.map((d) => (
              <li key={d}>{d}@demo.test</li>
            ))}
          </ul>
          <p className="mt-3 text-sm">
            E-mails (sign-in links, password resets) are caught by the local demo mail server:{' '}
            <Link href="/mailbox" className="font-semibold text-accent underline">
              open the demo mailbox
            </Link>
            .
          </p>
        </aside>
      ) : null}
    </div>
  );
}
