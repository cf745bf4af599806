import type { Metadata } from 'next';
import { CheckQueueTable } from '@/components/checks/check-queue-table';
import { getDb } from '@/db';
import { pageActor } from '@/lib/auth/page-guard';
import { listQueue } from '@/lib/checks/queries';

export const metadata: Metadata = { title: 'My approvals' };
export const dynamic = 'force-dynamic';

export default async function MyApprovalsPage() {
  const actor = await pageActor('/approvals');
  const rows = await listQueue(getDb(), actor, 'approval');
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-bold">My approvals</h1>
        <p className="mt-1 text-ink-muted">
          Checked versions in the projects where you approve, oldest first. Where the independence rules keep you from
          approving one, the reason is shown.
        </p>
      </header>
      {rows.length === 0 ? (
        <p className="rounded border border-rule bg-surface p-4 text-ink-muted">Nothing is waiting for approval.</p>
      ) : (
        <CheckQueueTable rows={rows} queue="approval" caption="Checked versions waiting for approval" />
      )}
    </div>
  );
}
