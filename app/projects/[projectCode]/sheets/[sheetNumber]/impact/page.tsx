import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { UtcTime } from '@/components/ui/utc-time';
import { SupersededInputs } from '@/components/sheet/superseded-inputs';
import { getDb } from '@/db';
import { pageParams } from '@/lib/http/params';
import { pageProject } from '@/lib/auth/page-guard';
import { sheetImpact, supersededInputs, type ImpactDependent } from '@/lib/sheets/impact';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getSheetByNumber, listVersions } from '@/lib/sheets/sheets';
import { VisibleText } from '@/components/data/visible-text';
import { StatusBadge } from '@/components/ui/status-badge';
import { Table, Td, Th } from '@/components/ui/table';

export const metadata: Metadata = { title: 'Impact' };
export const dynamic = 'force-dynamic';

function LatestState({ d }: { d: ImpactDependent }) {
  return (
    <>
      Version {d.latestVersion}{' '}
      {d.latestCitesVia ? `still cites revision ${d.via.revision}` : `no longer cites revision ${d.via.revision}`}
      {d.latestCitesSuperseded ? (
        <span className="mt-1 block w-fit rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution">
          cites a superseded or withdrawn revision
        </span>
      ) : null}
    </>
  );
}

export default async function ImpactPage({
  params,
}: {
  params: Promise<{ projectCode: string; sheetNumber: string }>;
}) {
  const { projectCode, sheetNumber } = await params;
  const { project } = await pageProject(projectCode, `/projects/${projectCode}/sheets/${sheetNumber}/impact`);
  const { sheetNumber: number } = pageParams({ sheetNumber }) ?? notFound();
  const sheet = await getSheetByNumber(getDb(), project.id, number);
  if (!sheet) notFound();
  const [revisions, inputs, versions] = await Promise.all([
    sheetImpact(getDb(), sheet.id),
    supersededInputs(getDb(), sheet.id),
    listVersions(getDb(), sheet.id),
  ]);
  const code = formatSheetNumber(project.code, sheet.number);
  const sheetHref = (n: number) => `/projects/${project.code}/sheets/${n}`;
  return (
    <div className="space-y-6">
      <header>
        <p className="font-mono text-sm text-ink-muted">
          <Link href={`/projects/${project.code}`} className="underline">
            {project.code}
          </Link>{' '}
          /{' '}
          <Link href={sheetHref(sheet.number)} className="underline">
            {code}
          </Link>{' '}
          / impact
        </p>
        <h1 className="text-2xl font-bold">Impact of {code}</h1>
        <p className="mt-1 text-ink-muted">
          <VisibleText text={sheet.title} />
        </p>
        <p className="mt-2 max-w-prose text-sm">
          For each issued revision of this sheet, the sheets whose versions cite it with{' '}
          <code className="font-mono">fromRevision</code> (depth 1), then the sheets citing revisions issued from those
          versions (depth 2), and so on. When a revision is superseded or withdrawn, each of these may need to be
          checked again.
        </p>
      </header>
      {versions[0] ? (
        <SupersededInputs inputs={inputs} projectCode={project.code} latestVersion={versions[0].number} />
      ) : null}
      {revisions.length === 0 ? (
        <p className="text-ink-muted">{code} has no issued revision, so no sheet can cite it.</p>
      ) : null}
      {revisions.map((r) => (
        <section key={r.id} aria-labelledby={`rev-${r.id}`} className="space-y-2">
          <h2 id={`rev-${r.id}`} className="flex flex-wrap items-baseline gap-2 text-lg font-bold">
            Revision {r.revision}
            <StatusBadge status={r.status} />
            <span className="text-sm font-normal text-ink-muted">
              version {r.versionNumber}, issued <UtcTime iso={r.issuedAt} />
            </span>
          </h2>
          {r.dependents.length === 0 ? (
            <p className="text-sm text-ink-muted">No sheet cites revision {r.revision}.</p>
          ) : (
            <Table
              caption={`Sheets that depend on ${code} revision ${r.revision}`}
              className="w-full text-left text-sm"
              box="rounded border border-rule bg-surface"
            >
              <thead>
                <tr className="border-b border-rule-strong">
                  <Th className="px-3 py-2">Depth</Th>
                  <Th className="px-3 py-2">Sheet</Th>
                  <Th className="px-3 py-2">Cites</Th>
                  <Th className="px-3 py-2">Versions citing it</Th>
                  <Th className="px-3 py-2">Issued as</Th>
                  <Th className="px-3 py-2">Latest version</Th>
                </tr>
              </thead>
              <tbody>
                {r.dependents.map((d) => (
                  <tr
                    key={`${d.via.sheetId}:${d.via.revision}:${d.sheetId}`}
                    className="border-b border-rule align-top"
                  >
                    <Td className="px-3 py-2 whitespace-nowrap">
                      {d.depth === 1 ? '1 (direct)' : `${d.depth} (indirect)`}
                    </Td>
                    <Th scope="row" className="px-3 py-2 text-left font-normal">
                      <Link href={sheetHref(d.sheetNumber)} className="font-mono font-semibold text-accent underline">
                        {d.sheet}
                      </Link>
                      <div>
                        <VisibleText text={d.title} />
                      </div>
                    </Th>
                    <Td className="px-3 py-2">
                      <span className="font-mono whitespace-nowrap">
                        {d.via.sheet} rev {d.via.revision}
                      </span>
                      <div className="font-mono text-xs text-ink-muted">{d.names.join(', ')}</div>
                    </Td>
                    <Td className="px-3 py-2">
                      {d.versions.map((v, i) => (
                        <span key={v}>
                          {i > 0 ? ', ' : ''}
                          <Link href={`${sheetHref(d.sheetNumber)}?version=${v}`} className="text-accent underline">
                            {v}
                          </Link>
                        </span>
                      ))}
                    </Td>
                    <Td className="px-3 py-2">
                      {d.issuedAs.length === 0
                        ? '—'
                        : d.issuedAs.map((x) => (
                            <div key={x.id} className="whitespace-nowrap">
                              rev {x.revision} <StatusBadge status={x.status} compact />
                            </div>
                          ))}
                    </Td>
                    <Td className="px-3 py-2">
                      <LatestState d={d} />
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
        </section>
      ))}
      <p className="text-sm">
        <Link href={sheetHref(sheet.number)} className="text-accent underline">
          Back to {code}
        </Link>
      </p>
    </div>
  );
}
