import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db';
import { WithdrawForm } from '@/components/issue/withdraw-form';
import { pageProject } from '@/lib/auth/page-guard';
import { listRevisions, registerQuerySchema } from '@/lib/issue/register';
import { revisionInputFlags } from '@/lib/sheets/impact';
import { VisibleText } from '@/components/data/visible-text';
import { StatusBadge } from '@/components/ui/status-badge';
import { Table, Td, Th } from '@/components/ui/table';
import { smallPrimaryButton } from '@/components/ui/button';
import { Field } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Document register' };
export const dynamic = 'force-dynamic';

export default async function ProjectRegisterPage({
  params,
  searchParams,
}: {
  params: Promise<{ projectCode: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { projectCode } = await params;
  const { project, roles } = await pageProject(projectCode, `/projects/${projectCode}/register`);
  const parsed = registerQuerySchema.safeParse(await searchParams);
  const filter = parsed.success ? parsed.data : registerQuerySchema.parse({});
  const [rows, stale] = await Promise.all([
    listRevisions(getDb(), { projectId: project.id, status: filter.status, q: filter.q }),
    revisionInputFlags(getDb(), project.id),
  ]);
  const controller = roles.includes('controller');
  const csv = new URLSearchParams({ status: filter.status, ...(filter.q ? { q: filter.q } : {}), format: 'csv' });
  return (
    <div className="space-y-6">
      <header>
        <p className="font-mono text-sm text-ink-muted">{project.code}</p>
        <h1 className="text-2xl font-bold">Document register</h1>
        <p className="mt-1 max-w-prose text-ink-muted">
          Every issued revision of {project.name}, with its status. Only the current revision of a sheet is for use; a
          superseded or withdrawn one downloads as a copy stamped with its status. “Superseded input” marks a revision
          whose version cites a revision of another sheet that has since been superseded or withdrawn.
        </p>
      </header>
      <form method="get" className="flex flex-wrap items-end gap-3 rounded border border-rule bg-surface p-3 text-sm">
        <Field label="Status" id="reg-status" labelClassName="block font-semibold">
          {(control) => (
            <select
              {...control}
              name="status"
              defaultValue={filter.status}
              className="rounded border border-rule-strong bg-surface px-2 py-1"
            >
              <option value="all">Any</option>
              <option value="current">Current</option>
              <option value="superseded">Superseded</option>
              <option value="withdrawn">Withdrawn</option>
            </select>
          )}
        </Field>
        <Field label="Sheet number or title" id="reg-q" labelClassName="block font-semibold">
          {(control) => (
            <input
              {...control}
              name="q"
              defaultValue={filter.q ?? ''}
              className="rounded border border-rule-strong bg-surface px-2 py-1"
            />
          )}
        </Field>
        <button type="submit" className={smallPrimaryButton}>
          Filter
        </button>
        <a
          href={`/api/projects/${project.id}/register?${csv}`}
          download
          className="ml-auto font-semibold text-accent underline"
        >
          Export as CSV
        </a>
      </form>
      {rows.length === 0 ? (
        <p className="text-ink-muted">No issued revision matches.</p>
      ) : (
        <Table
          caption={`Issued revisions of ${project.code}`}
          className="w-full text-left text-sm"
          box="rounded border border-rule bg-surface"
        >
          <thead>
            <tr className="border-b border-rule-strong">
              <Th className="px-3 py-2">Sheet</Th>
              <Th className="px-3 py-2">Title</Th>
              <Th className="px-3 py-2">Revision</Th>
              <Th className="px-3 py-2">Status</Th>
              <Th className="px-3 py-2">Version</Th>
              <Th className="px-3 py-2">Issued (UTC)</Th>
              <Th className="px-3 py-2">Verification code</Th>
              <Th className="px-3 py-2">PDF</Th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id} className="border-b border-rule align-top">
                <Td className="px-3 py-2 font-mono whitespace-nowrap">
                  <Link href={`/projects/${project.code}/sheets/${r.sheetNumber}`} className="text-accent underline">
                    {r.sheet}
                  </Link>
                </Td>
                <Td className="px-3 py-2">
                  <VisibleText text={r.title} />
                </Td>
                <Td className="px-3 py-2 font-semibold">{r.revision}</Td>
                <Td className="px-3 py-2">
                  <StatusBadge status={r.status} />
                  {r.supersededBy ? <div className="text-xs text-ink-muted">by revision {r.supersededBy}</div> : null}
                  {r.withdrawnReason ? <div className="text-xs text-ink-muted">{r.withdrawnReason}</div> : null}
                  {stale.has(r.id) ? (
                    <div className="mt-1 w-fit rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution">
                      Superseded input:{' '}
                      {stale
                        .get(r.id)!
                        .map(
                          (c) =>
                            `${c.sheet} rev ${c.revision} (${c.currentRevision ? `now ${c.currentRevision}` : c.status})`,
                        )
                        .join('; ')}
                    </div>
                  ) : null}
                </Td>
                <Td className="px-3 py-2">
                  {r.versionNumber}
                  <div className="font-mono text-xs text-ink-muted" title={r.versionSha256}>
                    {r.versionSha256.slice(0, 12)}…
                  </div>
                </Td>
                <Td className="px-3 py-2 whitespace-nowrap">
                  {r.issuedAt.slice(0, 16).replace('T', ' ')}
                  <div className="text-xs text-ink-muted">{r.issuedBy}</div>
                </Td>
                <Td className="px-3 py-2 font-mono whitespace-nowrap">{r.verificationCode}</Td>
                <Td className="space-y-1 px-3 py-2">
                  <a href={`/api/revisions/${r.id}/pdf`} download className="block font-semibold text-accent underline">
                    {r.status === 'current' ? 'Download' : `Download (stamped ${r.status})`}
                  </a>
                  {controller && r.status !== 'current' ? (
                    <a href={`/api/revisions/${r.id}/pdf?original=1`} download className="block text-accent underline">
                      Original file
                    </a>
                  ) : null}
                  <div className="font-mono text-xs text-ink-muted" title={`SHA-256 of the PDF: ${r.pdfSha256}`}>
                    {r.pdfSha256.slice(0, 12)}…
                  </div>
                  {controller && r.status !== 'withdrawn' ? (
                    <WithdrawForm revisionId={r.id} label={`${r.sheet} revision ${r.revision}`} />
                  ) : null}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </div>
  );
}
