import type { Metadata } from 'next';
import Link from 'next/link';
import { Suspense } from 'react';
import { notFound } from 'next/navigation';
import { SignatureList, SignatureTable, type SignatureRow } from '@/components/checks/signatures';
import { StatusBadge } from '@/components/checks/status-badge';
import { SubmitForCheckForm } from '@/components/checks/submit-for-check-form';
import { UtcTime } from '@/components/ui/utc-time';
import { MarkdownView } from '@/components/sheet/markdown-view';
import { SupersededInputs } from '@/components/sheet/superseded-inputs';
import { VersionPicker } from '@/components/sheet/version-picker';
import { VersionView } from '@/components/sheet/version-view';
import { CautionNotice, SafetyRelatedNotice } from '@/components/shell/caution-notice';
import { getDb } from '@/db';
import { pageParams, queryInt4 } from '@/lib/http/params';
import { pageProject } from '@/lib/auth/page-guard';
import { eligibleCheckers } from '@/lib/checks/submit';
import { MEANING_LABELS } from '@/lib/checks/workflow';
import { SHEET_STATUS_LABELS } from '@/lib/checks/status';
import { sheetWorkflow, type SheetWorkflow } from '@/lib/checks/queries';
import { IssuePanel } from '@/components/issue/issue-panel';
import { issueCandidates } from '@/lib/issue/request';
import { listRevisions } from '@/lib/issue/register';
import { supersededInputs } from '@/lib/sheets/impact';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getSheetByNumber, getVersion, listVersions } from '@/lib/sheets/sheets';
import { mayVoidSheet } from '@/lib/sheets/void';
import { sheetOrigin } from '@/lib/sheets/start-from';
import { submissionFindings } from '@/lib/checks/submission-findings';
import { VoidSheetForm } from '@/components/sheet/void-sheet-form';
import { VisibleText } from '@/components/data/visible-text';
import { Table, Td, Th } from '@/components/ui/table';
import { primaryButton } from '@/components/ui/button';

export const metadata: Metadata = { title: 'Sheet' };
export const dynamic = 'force-dynamic';

/** One sentence on where the sheet stands, and the check it concerns. */
function whereItStands(wf: SheetWorkflow): { text: string; checkId: string | null; linkText: string } {
  const newest = wf.checks[0];
  const later =
    newest && newest.versionNumber < wf.latestVersion ? ` Version ${wf.latestVersion} is a later draft.` : '';
  switch (wf.status) {
    case 'in_check':
      return {
        text: `Version ${newest.versionNumber} is in check by ${newest.checker}.${later}`,
        checkId: newest.id,
        linkText: 'Open the check',
      };
    case 'checked':
      return {
        text: `Version ${newest.versionNumber} is checked by ${newest.checker} and awaits approval.${later}`,
        checkId: newest.id,
        linkText: 'Open the check',
      };
    case 'approved':
      return {
        text: `Version ${newest.versionNumber} is approved (checked by ${newest.checker}).`,
        checkId: newest.id,
        linkText: 'Open the check',
      };
    case 'returned':
      return {
        text: `Version ${newest.versionNumber} was returned ${newest.state === 'approval_returned' ? 'by the approver' : `by ${newest.checker}`}: “${newest.returnReason ?? ''}”`,
        checkId: newest.id,
        linkText: 'Read the comments',
      };
    default:
      return {
        text:
          wf.lastApprovedVersion !== null
            ? `Version ${wf.lastApprovedVersion} is the last approved version; version ${wf.latestVersion} is a draft, not submitted for check.`
            : `Version ${wf.latestVersion} is a draft, not submitted for check.`,
        checkId: null,
        linkText: '',
      };
  }
}

type Sheet = NonNullable<Awaited<ReturnType<typeof getSheetByNumber>>>;
type Version = NonNullable<Awaited<ReturnType<typeof getVersion>>>;

/**
 * The submission form, streamed after the rest of the page: who may check each submittable version
 * (the independence rules, one query per version) and what each needs acknowledged in writing.
 */
async function SubmitSection({
  sheet,
  version,
  workflow,
  versions,
  userId,
  submittable,
  blocked,
}: {
  sheet: Sheet;
  version: Version;
  workflow: SheetWorkflow;
  versions: Awaited<ReturnType<typeof listVersions>>;
  userId: string;
  submittable: number[];
  blocked: string | null;
}) {
  // Eligibility depends on the version chosen (who saved what up to it): the newest ten, each its own.
  const submittableVersions = versions
    .map((v) => v.number)
    .filter((n) => workflow.lastApprovedVersion === null || n > workflow.lastApprovedVersion)
    .slice(0, 10);
  const latestCheckers = eligibleCheckers(getDb(), sheet, workflow.latestVersion, userId);
  const [checkers, checkersByVersion, findingsByVersion] = await Promise.all([
    latestCheckers,
    Promise.all(
      submittableVersions.map(
        async (n) =>
          [
            n,
            await (n === workflow.latestVersion ? latestCheckers : eligibleCheckers(getDb(), sheet, n, userId)),
          ] as const,
      ),
    ).then((entries) => Object.fromEntries(entries)),
    // What each submittable version needs acknowledged in writing, shown before the first attempt (the server asks again).
    Promise.all(
      submittableVersions.map(async (n) => {
        const v = n === version.number ? version : await getVersion(getDb(), sheet.id, n);
        return [
          n,
          v
            ? submissionFindings(v.content, v.results).map((f) => ({
                key: f.key,
                kind: f.kind,
                message: f.message,
              }))
            : [],
        ] as const;
      }),
    ).then((entries) => Object.fromEntries(entries)),
  ]);
  return (
    <SubmitForCheckForm
      sheetId={sheet.id}
      versions={submittable}
      checkers={checkers}
      checkersByVersion={checkersByVersion}
      findingsByVersion={findingsByVersion}
      blocked={blocked}
    />
  );
}

export default async function SheetPage({
  params,
  searchParams,
}: {
  params: Promise<{ projectCode: string; sheetNumber: string }>;
  searchParams: Promise<{ version?: string }>;
}) {
  const { projectCode, sheetNumber } = await params;
  const { version: versionParam } = await searchParams;
  const { project, roles, actor } = await pageProject(projectCode, `/projects/${projectCode}/sheets/${sheetNumber}`);
  const { sheetNumber: number } = pageParams({ sheetNumber }) ?? notFound();
  const sheet = await getSheetByNumber(getDb(), project.id, number);
  if (!sheet) notFound();
  const wanted = versionParam ? (queryInt4(versionParam) ?? notFound()) : undefined;
  const [version, versions, workflow, revisions, candidates, staleInputs, origin] = await Promise.all([
    getVersion(getDb(), sheet.id, wanted),
    listVersions(getDb(), sheet.id),
    sheetWorkflow(getDb(), sheet.id),
    listRevisions(getDb(), { sheetId: sheet.id }),
    issueCandidates(getDb(), sheet.id),
    // The latest version's citations decide the flag, whichever version is shown.
    supersededInputs(getDb(), sheet.id),
    sheetOrigin(getDb(), sheet.id),
  ]);
  const current = revisions.find((r) => r.status === 'current');
  if (!version) notFound();
  const latest = versions[0]?.number;
  const code = formatSheetNumber(project.code, sheet.number);
  const isOriginator = roles.includes('originator');
  const signatures: SignatureRow[] = workflow.signatures.map((s) => ({
    ...s,
    meaningLabel: MEANING_LABELS[s.meaning],
  }));
  const stands = whereItStands(workflow);
  // The newest check of each version says what became of it.
  const versionState = new Map<number, string>();
  for (const c of [...workflow.checks].reverse()) versionState.set(c.versionNumber, c.stateLabel);
  const open = workflow.status === 'in_check' || workflow.status === 'checked';
  const submittable = versions
    .map((v) => v.number)
    .filter((n) => workflow.lastApprovedVersion === null || n > workflow.lastApprovedVersion);
  const blocked = open
    ? `Version ${workflow.checks[0].versionNumber} is ${workflow.checks[0].stateLabel}; one submission at a time.`
    : submittable.length === 0
      ? `Version ${workflow.latestVersion} is approved. Save a new version to submit it for check.`
      : null;
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
          <h1 className="text-2xl font-bold">
            <VisibleText text={version.content.title} />
          </h1>
          <p className="mt-1 text-sm text-ink-muted">
            Version {version.number}
            {version.number !== latest ? ` (read-only; the latest is ${latest})` : ' (latest)'} ·{' '}
            {versionState.get(version.number) ?? 'not submitted for check'} · saved by {version.author} on{' '}
            <UtcTime iso={version.createdAt.toISOString()} /> · SHA-256{' '}
            <span className="font-mono">{version.sha256.slice(0, 16)}…</span>
          </p>
          {origin ? (
            <p className="mt-1 text-sm">
              Started from{' '}
              <Link
                href={`/projects/${origin.projectCode}/sheets/${origin.number}?version=${origin.version}`}
                className="font-semibold text-accent underline"
              >
                {origin.code} version {origin.version}
              </Link>{' '}
              (SHA-256 <span className="font-mono">{origin.sha256.slice(0, 12)}…</span>).
            </p>
          ) : null}
          <p className="mt-1 text-xs text-ink-muted">
            {version.engineVersion ?? 'not evaluated'} · constants {version.constantsEdition ?? '—'}
          </p>
          <p className="mt-2 text-sm">
            <a
              href={`/api/sheets/${sheet.id}/export?version=${version.number}`}
              download
              className="font-semibold text-accent underline"
            >
              Download version {version.number} as a sheet file
            </a>
            {version.content.attachments.length > 0 ? (
              <>
                {' · '}
                <a
                  href={`/api/sheets/${sheet.id}/export?version=${version.number}&attachments=include`}
                  download
                  className="font-semibold text-accent underline"
                >
                  with its{' '}
                  {version.content.attachments.length === 1
                    ? 'attachment'
                    : `${version.content.attachments.length} attachments`}
                </a>
              </>
            ) : null}
            {' · '}
            <Link
              href={`/projects/${project.code}/sheets/${sheet.number}/impact`}
              className="font-semibold text-accent underline"
            >
              Impact: what depends on this sheet
            </Link>
          </p>
          {roles.includes('originator') && !sheet.voided_at ? (
            <p className="mt-3">
              <Link
                href={`/projects/${project.code}/sheets/${sheet.number}/edit`}
                className={`${primaryButton} no-underline`}
              >
                Edit the sheet
              </Link>
            </p>
          ) : null}
        </header>
        <section
          aria-labelledby="status-title"
          className="flex flex-wrap items-baseline gap-x-3 gap-y-1 rounded border border-rule bg-surface px-4 py-3"
        >
          <h2 id="status-title" className="sr-only">
            Status
          </h2>
          {sheet.voided_at ? (
            <p
              role="status"
              className="w-full rounded border border-fail bg-fail-soft px-2 py-1 text-sm font-semibold text-fail"
            >
              Void since <UtcTime iso={sheet.voided_at.toISOString()} />. Reason: “
              <VisibleText text={sheet.void_reason ?? ''} />” The sheet stays in the register with its versions; it
              cannot be saved, submitted or issued.
            </p>
          ) : (
            <>
              <StatusBadge status={workflow.status} label={SHEET_STATUS_LABELS[workflow.status]} />
              {current ? (
                <span className="rounded bg-pass-soft px-1.5 py-0.5 text-xs font-bold text-pass">
                  Issued: revision {current.revision}
                </span>
              ) : null}
              <p className="text-sm">
                {stands.text}{' '}
                {stands.checkId ? (
                  <Link href={`/checks/${stands.checkId}`} className="font-semibold text-accent underline">
                    {stands.linkText}
                  </Link>
                ) : null}
              </p>
            </>
          )}
        </section>
        {latest !== undefined ? (
          <SupersededInputs inputs={staleInputs} projectCode={project.code} latestVersion={latest} />
        ) : null}
        <section aria-labelledby="revisions-title" className="space-y-2">
          <h2 id="revisions-title" className="text-lg font-bold">
            Issued revisions
          </h2>
          {revisions.length === 0 ? (
            <p className="text-sm text-ink-muted">Not issued yet.</p>
          ) : (
            <Table caption={`Issued revisions of ${code}`} className="w-full text-left text-sm">
              <thead>
                <tr className="border-b border-rule-strong">
                  <Th className="py-1 pr-3">Revision</Th>
                  <Th className="py-1 pr-3">Status</Th>
                  <Th className="py-1 pr-3">Version</Th>
                  <Th className="py-1 pr-3">Issued</Th>
                  <Th className="py-1 pr-3">Verification code</Th>
                  <Th className="py-1">PDF</Th>
                </tr>
              </thead>
              <tbody>
                {revisions.map((r) => (
                  <tr key={r.id} className="border-b border-rule">
                    <Td className="py-1 pr-3 font-semibold">{r.revision}</Td>
                    <Td className="py-1 pr-3">
                      {r.status}
                      {r.supersededBy ? ` by ${r.supersededBy}` : ''}
                      {r.withdrawnReason ? `: ${r.withdrawnReason}` : ''}
                    </Td>
                    <Td className="py-1 pr-3">{r.versionNumber}</Td>
                    <Td className="py-1 pr-3 whitespace-nowrap">
                      <UtcTime iso={r.issuedAt} /> · {r.issuedBy}
                    </Td>
                    <Td className="py-1 pr-3 font-mono">{r.verificationCode}</Td>
                    <Td className="py-1">
                      <a href={`/api/revisions/${r.id}/pdf`} download className="font-semibold text-accent underline">
                        {r.status === 'current'
                          ? `Download revision ${r.revision}`
                          : `Download revision ${r.revision} (stamped ${r.status})`}
                      </a>
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
          <p className="text-sm">
            <Link href={`/projects/${project.code}/register`} className="text-accent underline">
              The project&apos;s document register
            </Link>
          </p>
        </section>
        <section aria-labelledby="signatures-title" className="space-y-2">
          <h2 id="signatures-title" className="text-lg font-bold">
            Signatures
          </h2>
          <SignatureTable signatures={signatures} caption="Signatures of this sheet" />
        </section>
        {version.content.safetyRelated ? <SafetyRelatedNotice /> : null}
        <CautionNotice compact />
        <VersionView
          sheetId={sheet.id}
          sheetCode={code}
          versionNumber={version.number}
          content={version.content}
          results={version.results}
          renderText={(source) => <MarkdownView source={source} />}
        />
      </div>
      <aside aria-label="Check and history" className="space-y-6">
        {isOriginator && !sheet.voided_at ? (
          <section aria-labelledby="submit-title" className="space-y-2 rounded border border-rule bg-surface p-3">
            <h2 id="submit-title" className="font-bold">
              Submit for check
            </h2>
            <Suspense
              fallback={
                <p role="status" className="text-sm text-ink-muted">
                  Finding who may check each version…
                </p>
              }
            >
              <SubmitSection
                sheet={sheet}
                version={version}
                workflow={workflow}
                versions={versions}
                userId={actor.userId}
                submittable={submittable}
                blocked={blocked}
              />
            </Suspense>
          </section>
        ) : null}
        {roles.includes('controller') && !sheet.voided_at ? (
          <section aria-labelledby="issue-title" className="space-y-2 rounded border border-rule bg-surface p-3">
            <h2 id="issue-title" className="font-bold">
              Issue a revision
            </h2>
            <IssuePanel
              sheetId={sheet.id}
              approvedVersions={candidates.approvedVersions}
              nextRevision={candidates.nextRevision}
              pendingJobId={candidates.pendingJobId}
            />
          </section>
        ) : null}
        {!sheet.voided_at && revisions.length === 0 && mayVoidSheet(actor, roles, sheet) ? (
          <section aria-labelledby="void-title" className="space-y-2 rounded border border-rule bg-surface p-3">
            <h2 id="void-title" className="font-bold">
              Created by mistake?
            </h2>
            <VoidSheetForm sheetId={sheet.id} code={code} />
          </section>
        ) : null}
        <section aria-labelledby="history-title" className="space-y-2">
          <h2 id="history-title" className="font-bold">
            History
          </h2>
          {versions.length > 1 ? (
            <VersionPicker
              action={`/projects/${project.code}/sheets/${sheet.number}/compare`}
              versions={versions}
              base={versions.find((v) => v.number === version.number)?.parentNumber ?? null}
              target={version.number}
              idPrefix="history-compare"
              compact
            />
          ) : null}
          <ol className="space-y-2 text-sm">
            {versions.map((v) => (
              <li
                key={v.number}
                className={`rounded border px-3 py-2 ${v.number === version.number ? 'border-accent bg-accent-soft' : 'border-rule bg-surface'}`}
              >
                <Link
                  href={`/projects/${project.code}/sheets/${sheet.number}?version=${v.number}`}
                  className="font-semibold text-accent underline"
                >
                  Version {v.number}
                </Link>
                <span className="block text-ink">{v.message}</span>
                <span className="block text-xs text-ink-muted">
                  {v.author} · <UtcTime iso={v.createdAt.toISOString()} />
                </span>
                <span className="block font-mono text-xs text-ink-muted">{v.sha256.slice(0, 16)}…</span>
                {versionState.has(v.number) ? (
                  <span className="block text-xs font-semibold">{versionState.get(v.number)}</span>
                ) : null}
                {signatures.some((s) => s.versionNumber === v.number) ? (
                  <div className="mt-1 border-t border-rule pt-1">
                    <SignatureList
                      signatures={signatures.filter((s) => s.versionNumber === v.number)}
                      label={`Signatures of version ${v.number}`}
                    />
                  </div>
                ) : null}
                {v.parentNumber ? (
                  <Link
                    href={`/projects/${project.code}/sheets/${sheet.number}/compare?base=${v.parentNumber}&target=${v.number}`}
                    className="text-xs text-accent underline"
                  >
                    Compare with version {v.parentNumber}
                  </Link>
                ) : null}
              </li>
            ))}
          </ol>
        </section>
      </aside>
    </div>
  );
}
