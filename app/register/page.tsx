import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db';
import { pageActor } from '@/lib/auth/page-guard';
import { listProjectsFor } from '@/lib/projects/projects';
import { staleRevisionCounts } from '@/lib/sheets/impact';

export const metadata: Metadata = { title: 'Document register' };
export const dynamic = 'force-dynamic';

export default async function RegisterPage() {
  const actor = await pageActor('/register');
  const projects = await listProjectsFor(getDb(), actor);
  const stale = await staleRevisionCounts(
    getDb(),
    projects.map((p) => p.id),
  );
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Document register</h1>
      <p className="max-w-prose text-ink-muted">
        The issued revisions of each project you belong to. Anyone can check a PDF on the{' '}
        <Link href="/verify" className="text-accent underline">
          verification page
        </Link>
        .
      </p>
      {projects.length === 0 ? (
        <p className="text-ink-muted">You are not a member of any project.</p>
      ) : (
        <ul className="space-y-2">
          {projects.map((p) => (
            <li key={p.id}>
              <Link href={`/projects/${p.code}/register`} className="font-semibold text-accent underline">
                {p.code} — {p.name}
              </Link>
              {stale.get(p.id) ? (
                <span className="ml-2 rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution">
                  {stale.get(p.id) === 1 ? '1 current revision cites' : `${stale.get(p.id)} current revisions cite`} a
                  superseded input
                </span>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
