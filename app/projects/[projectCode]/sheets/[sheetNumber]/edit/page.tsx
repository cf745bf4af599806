import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { SheetEditor } from '@/components/sheet/sheet-editor';
import { CautionNotice } from '@/components/shell/caution-notice';
import { getDb } from '@/db';
import { pageParams } from '@/lib/http/params';
import { pageProject } from '@/lib/auth/page-guard';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getSheetByNumber, getVersion } from '@/lib/sheets/sheets';
import { VisibleText } from '@/components/data/visible-text';

export const metadata: Metadata = { title: 'Edit sheet' };
export const dynamic = 'force-dynamic';

export default async function EditSheetPage({
  params,
}: {
  params: Promise<{ projectCode: string; sheetNumber: string }>;
}) {
  const { projectCode, sheetNumber } = await params;
  const { project } = await pageProject(
    projectCode,
    `/projects/${projectCode}/sheets/${sheetNumber}/edit`,
    ['originator'],
    'edit',
  );
  const { sheetNumber: n } = pageParams({ sheetNumber }) ?? notFound();
  const sheet = await getSheetByNumber(getDb(), project.id, n);
  if (!sheet) notFound();
  const version = await getVersion(getDb(), sheet.id);
  if (!version) notFound();
  return (
    <div className="space-y-6">
      <header>
        <p className="font-mono text-sm text-ink-muted">
          <Link href={`/projects/${project.code}/sheets/${sheet.number}`} className="underline">
            {formatSheetNumber(project.code, sheet.number)}
          </Link>
        </p>
        <h1 className="text-2xl font-bold">
          Edit: <VisibleText text={version.content.title} />
        </h1>
      </header>
      <CautionNotice compact />
      <SheetEditor
        sheetId={sheet.id}
        projectCode={project.code}
        sheetNumber={sheet.number}
        base={{ number: version.number, content: version.content }}
      />
    </div>
  );
}
