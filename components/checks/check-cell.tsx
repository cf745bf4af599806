import { StatementView } from '@/components/calc/statement-view';
import { SourceDiff } from '@/components/sheet/source-diff';
import type { CellResult, StatementResult } from '@/lib/calc/types';
import type { CellComparison, CellStatus, ResultComparison, ResultSnapshot } from '@/lib/sheets/compare';
import { VisibleText } from '@/components/data/visible-text';

const STATUS_TONE: Record<CellStatus, string> = {
  added: 'bg-pass-soft text-pass',
  removed: 'bg-fail-soft text-fail',
  changed: 'bg-caution-soft text-caution',
  moved: 'bg-accent-soft text-accent-hover',
  unchanged: 'bg-paper text-ink-muted',
};

/** `+3.61 %`, `−0.120 %`: the relative change of a result, signed, to three significant figures. */
function formatRelativeChange(x: number): string {
  if (x === 0) return '0 %';
  return `${x > 0 ? '+' : '\u2212'}${Math.abs(x * 100).toPrecision(3)} %`;
}

function shown(s: ResultSnapshot | null): string {
  if (!s) return '—';
  return s.error ? `error: ${s.error}` : s.text || '—';
}

/** A criterion's margin (a fraction of the limit) as `9.92 %`, or its text when it has no number. */
function margin(s: ResultSnapshot | null): string {
  if (!s || s.error || s.number === null) return shown(s);
  return `${(s.number * 100).toPrecision(3)} %`;
}

/** What changed in one result since the base version, in words. */
function ResultChange({ change, baseNumber }: { change: ResultComparison; baseNumber: number | null }) {
  if (change.status === 'added')
    return (
      <p className="text-sm font-semibold text-caution">
        New result{baseNumber ? ` since version ${baseNumber}` : ''}.
      </p>
    );
  const verdict = (pass: boolean | null) => (pass === null ? 'no verdict' : pass ? 'Pass' : 'Fail');
  return (
    <p className="text-sm text-caution">
      <span className="font-semibold">Changed since version {baseNumber}:</span>{' '}
      {change.type === 'criterion' ? (
        <>
          {change.passOld !== change.passNew ? (
            <span className={change.flipped ? 'font-bold' : ''}>
              {verdict(change.passOld)} → {verdict(change.passNew)};{' '}
            </span>
          ) : null}
          margin to the limit <span className="font-mono">{margin(change.old)}</span> →{' '}
          <span className="font-mono">{margin(change.new)}</span>
        </>
      ) : (
        <>
          <span className="font-mono">
            <VisibleText text={shown(change.old)} />
          </span>{' '}
          →{' '}
          <span className="font-mono">
            <VisibleText text={shown(change.new)} />
          </span>
          {change.relativeChange !== null ? (
            <span className="font-mono"> ({formatRelativeChange(change.relativeChange)})</span>
          ) : null}
          {change.unitChanged ? ' (unit changed)' : null}
        </>
      )}
    </p>
  );
}

function changeFor(statement: StatementResult, changes: ResultComparison[]): ResultComparison | undefined {
  return changes.find((r) =>
    statement.kind === 'criterion'
      ? r.type === 'criterion' && r.name === statement.source
      : r.type === 'value' && statement.name !== null && r.name === statement.name,
  );
}

/**
 * One cell as the checker reviews it: what happened to it since the base version, its source with
 * the word diff, its recorded results with the changed ones marked (old → new, relative change),
 * and, below, its comment threads (`children`).
 */
export function CheckCell({
  cell,
  label,
  source,
  result,
  changes,
  baseNumber,
  first,
  renderText,
  children,
}: {
  cell: CellComparison;
  /** "Cell 2", "Removed cell (was cell 3)". */
  label: string;
  /** The source in the version under check (in the base for a removed cell). */
  source: string;
  result: CellResult | undefined;
  /** The results of this cell that differ from the base (none at a first check). */
  changes: ResultComparison[];
  baseNumber: number | null;
  /** A first check: every cell is new, so sources are shown plain rather than as one long addition. */
  first: boolean;
  renderText: (source: string) => React.ReactNode;
  children?: React.ReactNode;
}) {
  const kind = cell.kind === 'calc' ? 'calculation' : 'text';
  const status = cell.status === 'changed' && cell.moved ? 'changed and moved' : cell.status;
  const removedResults = changes.filter((r) => r.status === 'removed');
  // The physics lint's warnings (absent in results stored before they existed: none).
  const warningCount =
    cell.status === 'removed' ? 0 : (result?.statements ?? []).reduce((n, s) => n + (s.warnings?.length ?? 0), 0);
  return (
    <article
      aria-label={`${label} (${cell.id}), ${status}`}
      className={`rounded border bg-surface p-3 ${result && !result.ok ? 'border-fail' : 'border-rule'}`}
    >
      <p className="mb-2 flex flex-wrap items-baseline gap-x-2 text-xs">
        <span className="font-bold text-ink">{label}</span>
        <span className="font-mono text-ink-muted">{cell.id}</span>
        <span className="text-ink-muted">{kind}</span>
        {first ? null : <span className={`rounded px-1.5 py-0.5 font-bold ${STATUS_TONE[cell.status]}`}>{status}</span>}
        {warningCount ? (
          <span className="rounded border border-caution-rule bg-caution-soft px-1.5 py-0.5 font-bold text-caution">
            {warningCount} {warningCount === 1 ? 'warning' : 'warnings'}
          </span>
        ) : null}
        {cell.baseKind && cell.baseKind !== cell.kind ? (
          <span className="text-ink-muted">(was a {cell.baseKind === 'calc' ? 'calculation' : 'text'} cell)</span>
        ) : null}
      </p>
      {cell.sourceDiff && !first ? (
        <SourceDiff pieces={cell.sourceDiff} label={`Source of ${label.toLowerCase()}, with changes`} />
      ) : cell.kind === 'calc' ? (
        <pre className="overflow-x-auto rounded bg-paper p-2 font-mono text-sm">
          <VisibleText text={source} />
        </pre>
      ) : null}
      {cell.kind === 'text' && cell.status !== 'removed' ? <div className="py-2">{renderText(source)}</div> : null}
      {cell.kind === 'calc' && cell.status !== 'removed' ? (
        result ? (
          <div className="mt-2">
            {result.statements.map((s) => {
              const change = changeFor(s, changes);
              return change ? (
                <div key={`${s.line}:${s.source}`} className="border-l-4 border-caution-rule pl-3">
                  <StatementView statement={s} />
                  <ResultChange change={change} baseNumber={baseNumber} />
                </div>
              ) : (
                <StatementView key={`${s.line}:${s.source}`} statement={s} />
              );
            })}
          </div>
        ) : (
          <p className="text-sm text-ink-muted">Not evaluated.</p>
        )
      ) : null}
      {removedResults.length ? (
        <ul className="mt-2 space-y-1 text-sm text-caution">
          {removedResults.map((r) => (
            <li key={r.key}>
              <span className="font-semibold">No longer computed:</span>{' '}
              <span className="font-mono">
                <VisibleText text={r.name} />
              </span>{' '}
              (was <span className="font-mono">{shown(r.old)}</span> in version {baseNumber})
            </li>
          ))}
        </ul>
      ) : null}
      {children}
    </article>
  );
}
