import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { AdminConsole } from '@/components/admin/admin-console';
import { pageActor } from '@/lib/auth/page-guard';

export const metadata: Metadata = { title: 'Administration' };
export const dynamic = 'force-dynamic';

export default async function AdminPage() {
  const actor = await pageActor('/admin');
  if (!actor.isAdmin) notFound();
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-bold">Administration</h1>
        <p className="mt-1 max-w-prose text-ink-muted">
          People, projects and roles. Accounts are disabled, never deleted: their signatures must stay readable. Every
          change asks for a reason and is audited.
        </p>
      </header>
      <AdminConsole />
    </div>
  );
}
