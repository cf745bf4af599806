import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db';
import { pageActor } from '@/lib/auth/page-guard';
import { listProjectsFor, ROLE_LABELS } from '@/lib/projects/projects';
import { Table, Td, Th } from '@/components/ui/table';

export const metadata: Metadata = { title: 'Projects' };
export const dynamic = 'force-dynamic';

export default async function ProjectsPage() {
  const actor = await pageActor('/projects');
  const projects = await listProjectsFor(getDb(), actor);
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-bold">Projects</h1>
        <p className="mt-1 text-ink-muted">
          {actor.isAdmin
            ? 'All projects (you are an administrator).'
            : 'The projects you are a member of, with your roles.'}
        </p>
      </header>
      {projects.length === 0 ? (
        <p className="rounded border border-rule bg-surface p-4 text-ink-muted">
          You are not a member of any project yet. An administrator gives roles per project.
        </p>
      ) : (
        <Table caption="Projects">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-4">Code</Th>
              <Th className="py-2 pr-4">Name</Th>
              <Th className="py-2 pr-4">Legal owner</Th>
              <Th className="py-2 pr-4">Revisions</Th>
              <Th className="py-2">Your roles</Th>
            </tr>
          </thead>
          <tbody>
            {projects.map((p) => (
              <tr key={p.id} className="border-b border-rule">
                <Td className="py-2 pr-4 font-mono">
                  {p.roles.length ? (
                    <Link href={`/projects/${p.code}`} className="font-semibold text-accent underline">
                      {p.code}
                    </Link>
                  ) : (
                    p.code
                  )}
                </Td>
                <Td className="py-2 pr-4">{p.name}</Td>
                <Td className="py-2 pr-4">{p.legal_owner}</Td>
                <Td className="py-2 pr-4">{p.revision_scheme === 'letters' ? 'A, B, C …' : '0, 1, 2 …'}</Td>
                <Td className="py-2">
                  {p.roles.length ? p.roles.map((r) => ROLE_LABELS[r]).join(', ') : '— (administration only)'}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </div>
  );
}
