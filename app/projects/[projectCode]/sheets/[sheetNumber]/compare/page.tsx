import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { SourceDiff } from '@/components/sheet/source-diff';
import { getDb } from '@/db';
import { pageParams, queryInt4 } from '@/lib/http/params';
import { pageProject } from '@/lib/auth/page-guard';
import { compareStoredVersions } from '@/lib/sheets/comparison';
import { resultChangesText } from '@/lib/sheets/compare';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getSheetByNumber, getVersion, listVersions } from '@/lib/sheets/sheets';
import { VisibleText } from '@/components/data/visible-text';
import { RecordChanges } from '@/components/sheet/record-changes';
import { VersionPicker } from '@/components/sheet/version-picker';
import { Table, Td, Th } from '@/components/ui/table';

export const metadata: Metadata = { title: 'Compare versions' };
export const dynamic = 'force-dynamic';

export default async function ComparePage({
  params,
  searchParams,
}: {
  params: Promise<{ projectCode: string; sheetNumber: string }>;
  searchParams: Promise<{ base?: string; target?: string }>;
}) {
  const { projectCode, sheetNumber } = await params;
  const q = await searchParams;
  const { project } = await pageProject(projectCode, `/projects/${projectCode}/sheets/${sheetNumber}/compare`);
  const { sheetNumber: number } = pageParams({ sheetNumber }) ?? notFound();
  const sheet = await getSheetByNumber(getDb(), project.id, number);
  if (!sheet) notFound();
  const baseNumber = q.base ? (queryInt4(q.base) ?? notFound()) : null;
  const targetNumber = q.target ? (queryInt4(q.target) ?? notFound()) : undefined;
  const [base, target, versions] = await Promise.all([
    baseNumber !== null ? getVersion(getDb(), sheet.id, baseNumber) : Promise.resolve(null),
    getVersion(getDb(), sheet.id, targetNumber),
    listVersions(getDb(), sheet.id),
  ]);
  if (!target || base === undefined) notFound();
  const c = await compareStoredVersions(getDb(), sheet.id, base, target);
  const compareHref = `/projects/${project.code}/sheets/${sheet.number}/compare`;
  const changed = c.cells.filter((x) => x.status !== 'unchanged');
  return (
    <div className="space-y-6">
      <header>
        <p className="font-mono text-sm text-ink-muted">{formatSheetNumber(project.code, sheet.number)}</p>
        <h1 className="text-2xl font-bold">
          {base
            ? `Version ${base.number} → version ${target.number}`
            : `Version ${target.number} (first check: everything is new)`}
        </h1>
        <p className="mt-1 text-sm text-ink-muted">
          Cells: {c.summary.cells.added} added, {c.summary.cells.removed} removed, {c.summary.cells.changed} changed,{' '}
          {c.summary.cells.moved} moved, {c.summary.cells.unchanged} unchanged.{' '}
          {sentence(resultChangesText(c.summary.results))} Criteria that flipped: {c.summary.criteriaFlipped}.
          Calculation record: {c.summary.recordChanges} change
          {c.summary.recordChanges === 1 ? '' : 's'}; attachments: {c.summary.attachmentChanges} change
          {c.summary.attachmentChanges === 1 ? '' : 's'}.
        </p>
      </header>
      <section aria-labelledby="pick-title" className="space-y-2 rounded border border-rule bg-surface p-3">
        <h2 id="pick-title" className="font-bold">
          Compare other versions
        </h2>
        <VersionPicker action={compareHref} versions={versions} base={base?.number ?? null} target={target.number} />
      </section>
      <section aria-labelledby="record-title" className="space-y-2 rounded border border-rule bg-surface p-4">
        <h2 id="record-title" className="text-lg font-bold">
          {base
            ? `Calculation record and attachments: changes since version ${base.number}`
            : 'Calculation record and attachments'}
        </h2>
        <RecordChanges record={c.record} first={c.firstCheck} />
      </section>
      <section aria-labelledby="changed-cells" className="space-y-3">
        <h2 id="changed-cells" className="text-lg font-bold">
          Changed cells
        </h2>
        {changed.length === 0 ? <p className="text-ink-muted">No cell changed.</p> : null}
        {changed.map((cell) => (
          <article
            key={cell.id}
            aria-label={`Cell ${cell.id}, ${cell.status}`}
            className="rounded border border-rule bg-surface p-3"
          >
            <p className="text-xs font-semibold text-ink-muted">
              {cell.id} · {cell.status}
              {cell.moved ? ' · moved' : ''}
            </p>
            {cell.sourceDiff ? <SourceDiff pieces={cell.sourceDiff} /> : null}
          </article>
        ))}
      </section>
      <section aria-labelledby="changed-results" className="space-y-2">
        <h2 id="changed-results" className="text-lg font-bold">
          Results
        </h2>
        <Table caption="Results that changed">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-3">Result</Th>
              <Th className="py-2 pr-3">Status</Th>
              <Th className="py-2 pr-3">Old</Th>
              <Th className="py-2 pr-3">New</Th>
              <Th className="py-2">Relative change</Th>
            </tr>
          </thead>
          <tbody>
            {c.results
              .filter((r) => r.status !== 'unchanged')
              .map((r) => (
                <tr key={r.key} className="border-b border-rule">
                  <Td className="py-2 pr-3 font-mono">
                    <VisibleText text={r.name ?? r.key} />
                  </Td>
                  <Td className="py-2 pr-3">
                    {r.status}
                    {r.flipped ? ' (pass/fail flipped)' : ''}
                  </Td>
                  <Td className="py-2 pr-3 font-mono">
                    {r.old?.error ? `error: ${r.old.error}` : (r.old?.text ?? '—')}
                  </Td>
                  <Td className="py-2 pr-3 font-mono">
                    {r.new?.error ? `error: ${r.new.error}` : (r.new?.text ?? '—')}
                  </Td>
                  <Td className="py-2 font-mono">
                    {r.relativeChange === null ? '—' : `${(r.relativeChange * 100).toPrecision(3)} %`}
                  </Td>
                </tr>
              ))}
          </tbody>
        </Table>
      </section>
      <p>
        <Link
          href={`/projects/${project.code}/sheets/${sheet.number}?version=${target.number}`}
          className="font-semibold text-accent underline"
        >
          Open version {target.number}
        </Link>
      </p>
    </div>
  );
}

/** "results: 5 added" as a sentence of its own: "Results: 5 added." */
function sentence(text: string): string {
  return `${text.charAt(0).toUpperCase()}${text.slice(1)}.`;
}
