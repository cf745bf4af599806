// The sections of the check view (app/checks/[checkId]/page.tsx), each rendered from the check's read
// model (getCheckDetail, lib/checks/queries.ts): what the policy allows is in `check.you`, and the
// sections only render it.
import Link from 'next/link';
import { CellThreads } from '@/components/checks/cell-threads';
import { CheckCell } from '@/components/checks/check-cell';
import { CheckerWorkPanel } from '@/components/checks/checker-work-panel';
import { DecisionPanel } from '@/components/checks/decision-panel';
import { EvidenceSummary } from '@/components/checks/evidence-summary';
import { SignatureList } from '@/components/checks/signatures';
import { VisibleText } from '@/components/data/visible-text';
import { MarkdownView } from '@/components/sheet/markdown-view';
import { RecordChanges } from '@/components/sheet/record-changes';
import { SourceDiff } from '@/components/sheet/source-diff';
import { UtcTime } from '@/components/ui/utc-time';
import type { CheckDetail } from '@/lib/checks/queries';
import { MEANING_LABELS, VERIFICATION_LABELS, VERIFICATION_METHODS } from '@/lib/checks/workflow';
import { resultChangesText, type CellComparison } from '@/lib/sheets/compare';

/** A re-check after a return: the version that was returned, and who returned it. */
export interface SinceReturn {
  comparisonBase: number;
  byYou: boolean;
  by: string;
}

/** The re-check's facts for the viewer, or null when this is not a re-check after a return. */
export function sinceReturnOf(check: CheckDetail, userId: string): SinceReturn | null {
  return check.sinceReturn
    ? {
        comparisonBase: check.sinceReturn.versionNumber,
        byYou: check.sinceReturn.returnedById === userId,
        by:
          check.sinceReturn.returnedBy ??
          (check.sinceReturn.state === 'approval_returned' ? 'the approver' : 'the checker'),
      }
    : null;
}

const sheetHrefOf = (check: CheckDetail) => `/projects/${check.sheet.projectCode}/sheets/${check.sheet.number}`;

/** Where the check stands, for whoever cannot act on it now. */
function standing(check: CheckDetail): string {
  switch (check.state) {
    case 'in_check':
      return check.you.isChecker
        ? `You are the checker of version ${check.version.number}.`
        : `Waiting for ${check.checker.name}\u2019s check.`;
    case 'checked':
      return check.you.actions.includes('approve')
        ? 'Checked; it awaits your approval.'
        : 'Checked; it awaits approval.';
    case 'approved':
      return `Version ${check.version.number} is approved.`;
    case 'returned':
      return `Returned by ${check.checker.name}. The originator answers the comments and submits a new version.`;
    case 'approval_returned':
      return 'Returned by the approver. The originator revises the sheet and submits a new version.';
  }
}

/** The sheet, the versions compared, who submitted and checks it, and the state. */
export function CheckHeader({ check, sinceReturn }: { check: CheckDetail; sinceReturn: SinceReturn | null }) {
  const { comparison, version, base, sheet } = check;
  const first = comparison.firstCheck;
  const sheetHref = sheetHrefOf(check);
  return (
    <header>
      <p className="font-mono text-sm text-ink-muted">
        <Link href={`/projects/${sheet.projectCode}`} className="underline">
          {sheet.projectCode}
        </Link>{' '}
        /{' '}
        <Link href={sheetHref} className="underline">
          {sheet.code}
        </Link>{' '}
        / check
      </p>
      <h1 className="text-2xl font-bold">
        <VisibleText text={sheet.title} />
      </h1>
      <p className="mt-1 text-lg">
        {sinceReturn ? (
          <>
            Version {version.number}, re-check after the return of version {sinceReturn.comparisonBase}
            {first ? '; no version is approved yet' : `, and against version ${base!.number}, the last approved one`}
          </>
        ) : first ? (
          <>Version {version.number}, first check: the whole sheet</>
        ) : (
          <>
            Version {version.number} against version {base!.number}, the last approved one
          </>
        )}
      </p>
      <dl className="mt-2 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[11rem_minmax(0,1fr)]">
        <dt className="text-ink-muted">Version {version.number}</dt>
        <dd className="min-w-0 font-mono text-xs break-all sm:text-sm">SHA-256 {version.sha256}</dd>
        {base ? (
          <>
            <dt className="text-ink-muted">Base version {base.number}</dt>
            <dd className="min-w-0 font-mono text-xs break-all sm:text-sm">SHA-256 {base.sha256}</dd>
          </>
        ) : null}
        <dt className="text-ink-muted">Submitted</dt>
        <dd>
          by {check.submittedBy} on <UtcTime iso={check.submittedAt} />
        </dd>
        <dt className="text-ink-muted">Checker</dt>
        <dd>{check.checker.name}</dd>
        <dt className="text-ink-muted">State</dt>
        <dd className="font-semibold">{check.stateLabel}</dd>
      </dl>
      <p className="mt-2 text-sm">
        <Link href={`${sheetHref}?version=${version.number}`} className="font-semibold text-accent underline">
          Open version {version.number} on the sheet page
        </Link>
      </p>
    </header>
  );
}

/** A re-check after a return: what changed since the returned version, shown first. */
export function SinceReturnSection({ check, sinceReturn }: { check: CheckDetail; sinceReturn: SinceReturn }) {
  const sr = check.sinceReturn!.comparison;
  const { version } = check;
  const sheetHref = sheetHrefOf(check);
  return (
    <section aria-labelledby="since-return-title" className="space-y-3 rounded border-2 border-accent bg-surface p-4">
      <h2 id="since-return-title" className="text-lg font-bold">
        Changes since version {sinceReturn.comparisonBase}, the version{' '}
        {sinceReturn.byYou ? 'you returned' : `${sinceReturn.by} returned`}
      </h2>
      <p className="text-sm text-ink-muted">
        {sr!.summary.cells.added} added, {sr!.summary.cells.removed} removed, {sr!.summary.cells.changed} changed,{' '}
        {sr!.summary.cells.moved} moved, {sr!.summary.cells.unchanged} unchanged;{' '}
        {resultChangesText(sr!.summary.results)}; criteria that flipped: {sr!.summary.criteriaFlipped}.{' '}
        <Link
          href={`${sheetHref}/compare?base=${sinceReturn.comparisonBase}&target=${version.number}`}
          className="text-accent underline"
        >
          Open this comparison
        </Link>
      </p>
      {sr!.cells.filter((c) => c.status !== 'unchanged').length === 0 ? (
        <p className="text-ink-muted">No cell changed since version {sinceReturn.comparisonBase}.</p>
      ) : null}
      {sr!.cells
        .filter((c) => c.status !== 'unchanged')
        .map((cell) => (
          <article
            key={cell.id}
            aria-label={`Cell ${cell.id}, ${cell.status} since version ${sinceReturn.comparisonBase}`}
            className="rounded border border-rule bg-paper p-3"
          >
            <p className="text-xs font-semibold text-ink-muted">
              {cell.targetIndex !== null
                ? `Cell ${cell.targetIndex + 1}`
                : `Removed cell (was cell ${cell.baseIndex! + 1})`}{' '}
              · {cell.status}
              {cell.moved ? ' · moved' : ''}
            </p>
            {cell.sourceDiff ? <SourceDiff pieces={cell.sourceDiff} /> : null}
          </article>
        ))}
      {sr!.results.some((r) => r.status !== 'unchanged') ? (
        <ul className="text-sm">
          {sr!.results
            .filter((r) => r.status !== 'unchanged')
            .map((r) => (
              <li key={r.key}>
                <span className="font-mono">
                  <VisibleText text={r.name} />
                </span>
                : {r.old?.error ? `error: ${r.old.error}` : (r.old?.text ?? '—')} →{' '}
                {r.new?.error ? `error: ${r.new.error}` : (r.new?.text ?? '—')}
                {r.flipped ? ' (pass/fail flipped)' : ''}
              </li>
            ))}
        </ul>
      ) : null}
      <h3 className="font-bold">Calculation record and attachments since version {sinceReturn.comparisonBase}</h3>
      <RecordChanges record={sr!.record} first={false} />
    </section>
  );
}

/** The cells of the version under check against the last approved one, each with its threads. */
export function CellsSection({ check, sinceReturn }: { check: CheckDetail; sinceReturn: SinceReturn | null }) {
  const { comparison, version, base, you } = check;
  const first = comparison.firstCheck;
  const changed = comparison.cells.filter((c) => c.status !== 'unchanged');
  const unchanged = comparison.cells.filter((c) => c.status === 'unchanged');
  const resultsById = new Map((version.results?.cells ?? []).map((c) => [c.id, c]));
  const renderCell = (cell: CellComparison) => {
    const removed = cell.status === 'removed';
    const source = removed
      ? (base?.content.cells[cell.baseIndex!]?.source ?? '')
      : (version.content.cells[cell.targetIndex!]?.source ?? '');
    const label = removed ? `Removed cell (was cell ${cell.baseIndex! + 1})` : `Cell ${cell.targetIndex! + 1}`;
    const lines =
      cell.kind === 'calc'
        ? source
            .split('\n')
            .map((text, i) => ({ line: i + 1, text: text.trim() }))
            .filter((l) => l.text !== '' && !l.text.startsWith('#'))
        : [];
    return (
      <CheckCell
        key={cell.id}
        cell={cell}
        label={label}
        source={source}
        result={removed ? undefined : resultsById.get(cell.id)}
        changes={first ? [] : comparison.results.filter((r) => r.cellId === cell.id && r.status !== 'unchanged')}
        baseNumber={base?.number ?? null}
        first={first}
        renderText={(text) => <MarkdownView source={text} />}
      >
        <CellThreads
          checkId={check.id}
          cellId={cell.id}
          cellLabel={`${label.toLowerCase()} (${cell.id})`}
          lines={lines}
          threads={check.threads.filter((t) => t.cellId === cell.id)}
          versionNumber={version.number}
          canOpen={you.canOpenThreads}
          canReply={you.canComment}
          canResolve={you.canResolve}
        />
      </CheckCell>
    );
  };

  const s = comparison.summary;
  return (
    <section aria-labelledby="changes-title" className="space-y-3">
      <h2 id="changes-title" className="text-lg font-bold">
        {first
          ? sinceReturn
            ? 'Since the last approved version: none is approved yet, so every cell is new'
            : 'Cells (first check: every cell is new)'
          : `Cells changed since version ${base!.number}, the last approved one`}
      </h2>
      {!first ? (
        <p className="text-sm text-ink-muted">
          {s.cells.added} added, {s.cells.removed} removed, {s.cells.changed} changed, {s.cells.moved} moved,{' '}
          {s.cells.unchanged} unchanged; {resultChangesText(s.results)}; criteria that flipped: {s.criteriaFlipped}.
        </p>
      ) : null}
      {changed.length === 0 ? <p className="text-ink-muted">No cell changed since version {base?.number}.</p> : null}
      {changed.map(renderCell)}
      {unchanged.length ? (
        <details
          open={unchanged.some((c) => check.threads.some((t) => t.cellId === c.id && !t.resolvedAt)) || undefined}
          className="rounded border border-rule bg-paper px-3 py-2"
        >
          <summary className="cursor-pointer text-sm font-semibold">
            {unchanged.length} unchanged cell{unchanged.length === 1 ? '' : 's'}
          </summary>
          <div className="mt-3 space-y-3">{unchanged.map(renderCell)}</div>
        </details>
      ) : null}
    </section>
  );
}

/** Threads on cells the version under check no longer has. */
export function OtherThreadsSection({ check }: { check: CheckDetail }) {
  const { version, you } = check;
  const cellIds = new Set(check.comparison.cells.map((c) => c.id));
  const otherThreads = check.threads.filter((t) => !cellIds.has(t.cellId));
  if (!otherThreads.length) return null;
  return (
    <section aria-labelledby="other-threads-title" className="space-y-2">
      <h2 id="other-threads-title" className="text-lg font-bold">
        Comments on cells not in this version
      </h2>
      {[...new Set(otherThreads.map((t) => t.cellId))].map((cellId) => (
        <div key={cellId} className="rounded border border-rule bg-surface p-3">
          <p className="text-xs font-semibold text-ink-muted">
            Cell <span className="font-mono">{cellId}</span>
          </p>
          <CellThreads
            checkId={check.id}
            cellId={cellId}
            cellLabel={`cell ${cellId}`}
            lines={[]}
            threads={otherThreads.filter((t) => t.cellId === cellId)}
            versionNumber={version.number}
            canOpen={false}
            canReply={you.canComment}
            canResolve={you.canResolve}
          />
        </div>
      ))}
    </section>
  );
}

/** The calculation record's changes and the checker's work. */
export function RecordAndWork({ check }: { check: CheckDetail }) {
  const { comparison, version, base, you } = check;
  const first = comparison.firstCheck;
  return (
    <>
      <section aria-labelledby="record-title" className="space-y-2 rounded border border-rule bg-surface p-4">
        <h2 id="record-title" className="text-lg font-bold">
          {first ? 'Calculation record' : `Calculation record: changes since version ${base!.number}`}
        </h2>
        <RecordChanges record={comparison.record} first={first} />
      </section>

      <section aria-labelledby="work-title" className="space-y-2 rounded border border-rule bg-surface p-4">
        <h2 id="work-title" className="text-lg font-bold">
          The checker&apos;s work
        </h2>
        <CheckerWorkPanel
          checkId={check.id}
          editable={you.canRecordWork}
          methods={VERIFICATION_METHODS.map((value) => ({ value, label: VERIFICATION_LABELS[value] }))}
          method={check.verificationMethod}
          notes={check.checkerNotes}
          alternateCells={check.alternateCells}
          alternateResults={check.alternateResults}
          tolerance={check.toleranceText}
          comparison={check.alternateComparison}
          carriedOver={check.carriedOver}
          versionNumber={version.number}
        />
      </section>
    </>
  );
}

/** The decision the viewer may take (or why not) and the version's signatures. */
export function DecisionColumn({ check }: { check: CheckDetail }) {
  const { version, you } = check;
  return (
    <aside aria-label="Decision and signatures" className="space-y-6">
      <section aria-labelledby="decision-title" className="space-y-3 rounded border border-rule bg-surface p-4">
        <h2 id="decision-title" className="text-lg font-bold">
          Decision
        </h2>
        <p className="text-sm">{standing(check)}</p>
        {you.approverRefusal ? (
          <p role="note" className="rounded bg-caution-soft px-3 py-2 text-sm text-caution">
            {you.approverRefusal}
          </p>
        ) : null}
        {you.checkerRefusal ? (
          <p role="note" className="rounded bg-caution-soft px-3 py-2 text-sm text-caution">
            {you.checkerRefusal}
          </p>
        ) : null}
        {you.seesEvidence ? (
          <EvidenceSummary
            method={check.verificationMethod ? VERIFICATION_LABELS[check.verificationMethod] : null}
            comparison={check.alternateComparison}
            carriedOver={check.carriedOver}
          />
        ) : null}
        <DecisionPanel
          checkId={check.id}
          actions={you.actions}
          versionNumber={version.number}
          sha256={version.sha256}
          signWaitsFor={you.signWaitsFor}
        />
      </section>
      <section aria-labelledby="signatures-title" className="space-y-2 rounded border border-rule bg-surface p-4">
        <h2 id="signatures-title" className="text-lg font-bold">
          Signatures of version {version.number}
        </h2>
        <SignatureList
          signatures={check.signatures.map((x) => ({ ...x, meaningLabel: MEANING_LABELS[x.meaning] }))}
          label={`Signatures of version ${version.number}`}
        />
      </section>
    </aside>
  );
}
