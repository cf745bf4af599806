import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { MarkdownView } from '@/components/sheet/markdown-view';
import { VersionView } from '@/components/sheet/version-view';
import { CautionNotice } from '@/components/shell/caution-notice';
import { getDb } from '@/db';
import { pageProject } from '@/lib/auth/page-guard';
import { SAFETY_RELATED_CAUTION } from '@/lib/safety/cautions';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getSheetByNumber, getVersion, listVersions } from '@/lib/sheets/sheets';

export const metadata: Metadata = { title: 'Sheet' };
export const dynamic = 'force-dynamic';

export default async function SheetPage({ params, searchParams }: { params: Promise<{ projectCode: string; sheetNumber: string }>; searchParams: Promise<{ version?: string }> }) {
  const { projectCode, sheetNumber } = await params;
  const { version: versionParam } = await searchParams;
  const { project, roles } = await pageProject(projectCode, `/projects/${projectCode}/sheets/${sheetNumber}`);
  const number = Number(sheetNumber);
  const sheet = Number.isInteger(number) && number > 0 ? await getSheetByNumber(getDb(), project.id, number) : undefined;
  if (!sheet) notFound();
  const wanted = versionParam ? Number(versionParam) : undefined;
  const [version, versions] = await Promise.all([getVersion(getDb(), sheet.id, wanted), listVersions(getDb(), sheet.id)]);
  if (!version) notFound();
  const latest = versions[0]?.number;
  const code = formatSheetNumber(project.code, sheet.number);
  return (
    <div className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_18rem]">
      <div className="min-w-0 space-y-6">
        <header>
          <p className="font-mono text-sm text-ink-muted">
            <Link href={`/projects/${project.code}`} className="underline">
              {project.code}
            </Link>{' '}
            / {code}
          </p>
          <h1 className="text-2xl font-bold">{version.content.title}</h1>
          <p className="mt-1 text-sm text-ink-muted">
            Version {version.number}
            {version.number !== latest ? ` (read-only; the latest is ${latest})` : ' (latest)'} · draft · saved by {version.author} on{' '}
            {version.createdAt.toISOString().slice(0, 16).replace('T', ' ')} UTC · SHA-256 <span className="font-mono">{version.sha256.slice(0, 16)}…</span>
          </p>
          <p className="mt-1 text-xs text-ink-muted">
            {version.engineVersion ?? 'not evaluated'} · constants {version.constantsEdition ?? '—'}
          </p>
          <p className="mt-2 text-sm">
            <a href={`/api/sheets/${sheet.id}/export?version=${version.number}`} download className="font-semibold text-accent underline">
              Download version {version.number} as a sheet file
            </a>
          </p>
          {roles.includes('originator') ? (
            <p className="mt-3">
              <Link href={`/projects/${project.code}/sheets/${sheet.number}/edit`} className="rounded bg-accent px-4 py-2 font-semibold text-surface no-underline hover:bg-accent-hover">
                Edit the sheet
              </Link>
            </p>
          ) : null}
        </header>
        {version.content.safetyRelated ? (
          <p role="note" className="rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-sm font-semibold text-caution">
            {SAFETY_RELATED_CAUTION}
          </p>
        ) : null}
        <CautionNotice compact />
        <VersionView sheetId={sheet.id} content={version.content} results={version.results} renderText={(source) => <MarkdownView source={source} />} />
      </div>
      <aside aria-labelledby="history-title" className="space-y-2">
        <h2 id="history-title" className="font-bold">
          History
        </h2>
        <ol className="space-y-2 text-sm">
          {versions.map((v) => (
            <li key={v.number} className={`rounded border px-3 py-2 ${v.number === version.number ? 'border-accent bg-accent-soft' : 'border-rule bg-surface'}`}>
              <Link href={`/projects/${project.code}/sheets/${sheet.number}?version=${v.number}`} className="font-semibold text-accent underline">
                Version {v.number}
              </Link>
              <span className="block text-ink">{v.message}</span>
              <span className="block text-xs text-ink-muted">
                {v.author} · {v.createdAt.toISOString().slice(0, 16).replace('T', ' ')} UTC
              </span>
              <span className="block font-mono text-xs text-ink-muted">{v.sha256.slice(0, 16)}…</span>
              {v.parentNumber ? (
                <Link href={`/projects/${project.code}/sheets/${sheet.number}/compare?base=${v.parentNumber}&target=${v.number}`} className="text-xs text-accent underline">
                  Compare with version {v.parentNumber}
                </Link>
              ) : null}
            </li>
          ))}
        </ol>
      </aside>
    </div>
  );
}
