import type { Metadata, Viewport } from 'next';
import Link from 'next/link';
import { AppHeader } from '@/components/shell/app-header';
import { getDb } from '@/db';
import { getActor } from '@/lib/auth/current-actor';
import { config } from '@/lib/config';
import { myWork, navigationCounts } from '@/lib/home/my-work';
import { APP_VERSION } from '@/lib/version';
import { monoFont, textFont } from './fonts';
import 'katex/dist/katex.min.css';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Worldsheet', template: '%s · Worldsheet' },
  description: 'Relativistic calculation sheets with units, independent check, approval and signed, verifiable issue.',
};

export const viewport: Viewport = { themeColor: '#0b5a61' };

// Every page is rendered per request: its scripts carry the nonce of that response's
// Content-Security-Policy (lib/ops/server.ts), which a page prerendered at build time could not.
export const dynamic = 'force-dynamic';

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  const demo = config().WORLDSHEET_DEMO;
  // Shows who is signed in; it protects nothing (every page and route handler checks for itself).
  const actor = await getActor().catch(() => null);
  // The counts beside the navigation (what waits for this person). A failure to count leaves the
  // links without figures and is logged; it does not take the page down.
  const counts = actor
    ? await myWork(getDb(), actor)
        .then(navigationCounts)
        .catch((error: unknown) => {
          console.error('navigation counts', error);
          return null;
        })
    : null;
  return (
    <html lang="en" className={`${textFont.variable} ${monoFont.variable}`}>
      <body className="flex min-h-screen flex-col">
        <a
          href="#main"
          className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:z-50 focus:rounded focus:bg-surface focus:px-3 focus:py-2 focus:text-ink"
        >
          Skip to content
        </a>
        <AppHeader userName={actor?.name ?? null} isAdmin={actor?.isAdmin ?? false} counts={counts} />
        <main id="main" className="mx-auto w-full max-w-sheet flex-1 px-gutter py-8">
          {children}
        </main>
        <footer className="border-t border-rule bg-surface">
          <div className="mx-auto flex max-w-sheet flex-wrap items-center justify-between gap-2 px-gutter py-3 text-xs text-ink-muted">
            <span>
              Worldsheet <span className="font-mono">{APP_VERSION}</span>
            </span>
            <nav aria-label="Tools" className="flex gap-4">
              <Link href="/reference" className="underline hover:text-ink">
                Function reference
              </Link>
              <Link href="/scratch" className="underline hover:text-ink">
                Scratch pad
              </Link>
            </nav>
            {demo ? <span>Demo installation: fictional organisation and data</span> : null}
          </div>
        </footer>
      </body>
    </html>
  );
}
