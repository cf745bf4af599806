import type { Metadata } from 'next';
import Link from 'next/link';
import { ScratchPad } from '@/components/calc/scratch-pad';
import { CautionNotice } from '@/components/shell/caution-notice';
import { pageActor } from '@/lib/auth/page-guard';

export const metadata: Metadata = { title: 'Scratch pad' };
export const dynamic = 'force-dynamic';

export default async function ScratchPage() {
  await pageActor('/scratch');
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-bold">Scratch pad</h1>
        <p className="mt-2 max-w-prose text-ink-muted">
          Try the calculation engine on one cell. Nothing here is saved or controlled: a result becomes usable only in a
          sheet that has been checked, approved and issued. The{' '}
          <Link href="/reference" className="font-semibold text-accent underline">
            function reference
          </Link>{' '}
          lists the constants and functions.
        </p>
      </header>
      <CautionNotice compact />
      <ScratchPad />
    </div>
  );
}
