import type { Metadata } from 'next';
import { CheckQueueTable } from '@/components/checks/check-queue-table';
import { getDb } from '@/db';
import { pageActor } from '@/lib/auth/page-guard';
import { listQueue } from '@/lib/checks/queries';

export const metadata: Metadata = { title: 'My checks' };
export const dynamic = 'force-dynamic';

export default async function MyChecksPage() {
  const actor = await pageActor('/checks');
  const rows = await listQueue(getDb(), actor, 'check');
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-bold">My checks</h1>
        <p className="mt-1 text-ink-muted">
          Versions submitted to you for an independent check, oldest first. Each names one exact version by its SHA-256.
        </p>
      </header>
      {rows.length === 0 ? (
        <p className="rounded border border-rule bg-surface p-4 text-ink-muted">Nothing is waiting for your check.</p>
      ) : (
        <CheckQueueTable rows={rows} queue="check" caption="Versions waiting for your check" />
      )}
    </div>
  );
}
