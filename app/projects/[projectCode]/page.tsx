import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db';
import { pageProject, ROLE_PAGES, type RolePage } from '@/lib/auth/page-guard';
import { CreateSheetForm } from '@/components/sheet/create-sheet-form';
import { ImportSheetForm } from '@/components/sheet/import-sheet-form';
import { StartFromForm } from '@/components/sheet/start-from-form';
import { SheetRegister } from '@/components/sheet/sheet-register';
import { listMembers, ROLE_LABELS } from '@/lib/projects/projects';
import { sheetInputFlags } from '@/lib/sheets/impact';
import { listSheets } from '@/lib/sheets/sheets';
import { startCandidates } from '@/lib/sheets/start-from';
import { Table, Td, Th } from '@/components/ui/table';

export const metadata: Metadata = { title: 'Project' };
export const dynamic = 'force-dynamic';

export default async function ProjectPage({
  params,
  searchParams,
}: {
  params: Promise<{ projectCode: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { projectCode } = await params;
  const asked = (await searchParams).notAllowed;
  // Only the known pages' explanations are shown (never the query's own text).
  const notAllowed =
    typeof asked === 'string' && Object.hasOwn(ROLE_PAGES, asked) ? ROLE_PAGES[asked as RolePage] : null;
  const { project, roles, actor } = await pageProject(projectCode, `/projects/${projectCode}`);
  const [members, sheets, stale, candidates] = await Promise.all([
    listMembers(getDb(), project.id),
    listSheets(getDb(), project.id, project.code),
    sheetInputFlags(getDb(), project.id),
    roles.includes('originator') ? startCandidates(getDb(), actor) : Promise.resolve([]),
  ]);
  const seesAudit = roles.some((r) => r !== 'viewer');
  return (
    <div className="space-y-8">
      {notAllowed ? (
        <p role="status" className="rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-caution">
          {notAllowed} Your roles in {project.code}: {roles.map((r) => ROLE_LABELS[r]).join(', ')}. An administrator
          gives roles per project.
        </p>
      ) : null}
      <header>
        <p className="font-mono text-sm text-ink-muted">{project.code}</p>
        <h1 className="text-2xl font-bold">{project.name}</h1>
        <p className="mt-1 text-ink-muted">
          Legal owner: {project.legal_owner}. Revisions numbered{' '}
          {project.revision_scheme === 'letters' ? 'A, B, C … (skipping I, O, Q, S, X, Z)' : '0, 1, 2 …'}. Your roles:{' '}
          {roles.map((r) => ROLE_LABELS[r]).join(', ')}.
        </p>
        <p className="mt-2 flex flex-wrap gap-4">
          <Link href={`/projects/${project.code}/register`} className="font-semibold text-accent underline">
            Document register
          </Link>
          {seesAudit ? (
            <Link href={`/projects/${project.code}/audit`} className="font-semibold text-accent underline">
              Audit trail
            </Link>
          ) : null}
        </p>
      </header>
      <section aria-labelledby="sheets-title" className="space-y-4">
        <h2 id="sheets-title" className="text-xl font-bold">
          Calculation sheets
        </h2>
        <SheetRegister
          rows={sheets.map((r) => ({
            ...r,
            updatedAt: r.updatedAt.toISOString(),
            supersededInputs: (stale.get(r.id) ?? []).map(
              (c) => `${c.sheet} rev ${c.revision} (${c.currentRevision ? `now ${c.currentRevision}` : c.status})`,
            ),
          }))}
          projectCode={project.code}
        />
        {roles.includes('originator') ? (
          <details className="max-w-xl rounded border border-rule bg-surface p-4">
            <summary className="cursor-pointer font-semibold">New sheet</summary>
            <div className="mt-3">
              <CreateSheetForm projectId={project.id} projectCode={project.code} />
            </div>
            <div className="mt-4 border-t border-rule pt-3">
              <StartFromForm projectId={project.id} projectCode={project.code} options={candidates} />
            </div>
            <div className="mt-4 border-t border-rule pt-3">
              <ImportSheetForm projectId={project.id} projectCode={project.code} />
            </div>
          </details>
        ) : null}
      </section>
      <section aria-labelledby="members-title">
        <h2 id="members-title" className="text-xl font-bold">
          Members
        </h2>
        <Table caption={`Members of ${project.code} and their roles`} className="mt-3 w-full border-collapse text-sm">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-4">Name</Th>
              <Th className="py-2 pr-4">E-mail</Th>
              <Th className="py-2">Roles</Th>
            </tr>
          </thead>
          <tbody>
            {members.map((m) => (
              <tr key={m.userId} className="border-b border-rule">
                <Td className="py-2 pr-4">
                  {m.name}
                  {m.disabledAt ? <span className="ml-2 text-xs text-fail">(disabled)</span> : null}
                </Td>
                <Td className="py-2 pr-4 font-mono">{m.email}</Td>
                <Td className="py-2">{m.roles.map((r) => ROLE_LABELS[r]).join(', ')}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </section>
    </div>
  );
}
