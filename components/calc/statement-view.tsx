import { ScrollBox } from '@/components/ui/scroll-box';
import { referenceText } from '@/lib/calc/reference-text';
import type { ResolvedReference, StatementResult } from '@/lib/calc/types';
import { PlotView } from './plot-view';
import { StudyTable } from './study-table';
import { TexMath } from './tex-math';
import { UncertaintyDetails, UncertaintyValue } from './uncertainty-view';
import { VisibleText } from '@/components/data/visible-text';

/** Where a version's sweep table downloads from (its study route); without it the CSV is built in the page. */
export type StudyCsvLink = (line: number) => { href: string; fileName: string };

/** "from TPT2-CALC-0003 rev. B, Brho", with a badge when that revision is superseded or withdrawn. */
function ReferenceLines({ references }: { references: ResolvedReference[] }) {
  return (
    <ul className="space-y-0.5 text-xs text-ink-muted">
      {references.map((ref, i) => {
        const r = referenceText(ref);
        return (
          <li key={i} className="flex flex-wrap items-baseline gap-x-2">
            <span title={r.title ?? undefined}>
              <VisibleText text={r.text} />
            </span>
            {r.badge ? (
              <span className="rounded border border-caution-rule bg-caution-soft px-1.5 text-xs font-bold text-caution">
                {r.badge}
              </span>
            ) : null}
            {r.problem ? <span className="text-fail">Cannot be used: {r.problem}</span> : null}
          </li>
        );
      })}
    </ul>
  );
}

/** "`h` here is the hour…" (a warning or an error): the names between backquotes in the code face, the rest as text. */
function WarningText({ text }: { text: string }) {
  return (
    <>
      {text.split('`').map((piece, i) =>
        i % 2 === 1 ? (
          <code key={i} className="font-mono">
            <VisibleText text={piece} />
          </code>
        ) : (
          <VisibleText key={i} text={piece} />
        ),
      )}
    </>
  );
}

/**
 * The physics lint's warnings beside a statement (lib/calc/lint.ts): in the caution colours, each
 * introduced by the word "Warning" (not by colour alone), and distinct from an error's alert.
 */
function StatementWarnings({ line, warnings }: { line: number; warnings: readonly string[] | undefined }) {
  if (!warnings?.length) return null;
  return (
    <ul aria-label={`Warnings, line ${line}`} className="space-y-0.5">
      {warnings.map((w, i) => (
        <li key={i} className="rounded border-l-4 border-caution-rule bg-caution-soft px-2 py-1 text-sm text-caution">
          <span className="font-bold">Warning, line {line}:</span> <WarningText text={w} />
        </li>
      ))}
    </ul>
  );
}

/** One statement as a checker reads it: formula, values substituted, result; or its error. Then what it cites, its plot, sweep table and uncertainty budget. */
export function StatementView({
  statement,
  significantFigures = 6,
  studyCsv,
  quietErrors = false,
}: {
  statement: StatementResult;
  significantFigures?: number;
  studyCsv?: StudyCsvLink;
  /** The error shown without role="alert": in the sheet editor, which announces errors itself once typing pauses. */
  quietErrors?: boolean;
}) {
  const s = statement;
  const references = s.references ?? [];
  const extras = !s.error && (s.plot || s.table || s.uncertainty?.kind === 'propagated');
  const csv = s.table && studyCsv ? studyCsv(s.line) : null;
  return (
    <div className="grid gap-1 border-t border-rule py-2 first:border-t-0 sm:grid-cols-[minmax(0,1fr)_auto] sm:gap-4">
      <ScrollBox className="min-w-0 space-y-1" scrollLabel={`Line ${s.line}, typeset (scrolls sideways)`}>
        {s.tex ? (
          <TexMath tex={s.tex} className="block text-ink" />
        ) : (
          <code className="font-mono text-sm">
            <VisibleText text={s.source} />
          </code>
        )}
        {s.substitutedTex && s.substitutedTex !== s.tex ? (
          <TexMath tex={s.substitutedTex} className="block text-sm text-ink-muted" />
        ) : null}
        {s.error ? (
          <p role={quietErrors ? undefined : 'alert'} className="rounded bg-fail-soft px-2 py-1 text-sm text-fail">
            Line {s.line}: <WarningText text={s.error} />
          </p>
        ) : null}
        <StatementWarnings line={s.line} warnings={s.warnings} />
        {references.length ? <ReferenceLines references={references} /> : null}
      </ScrollBox>
      <div className="text-right sm:min-w-40">
        {s.criterion ? (
          <p>
            <span
              className={`inline-block rounded px-2 py-0.5 text-sm font-bold ${s.criterion.pass ? 'bg-pass-soft text-pass' : 'bg-fail-soft text-fail'}`}
            >
              {s.criterion.pass ? 'Pass' : 'Fail'}
            </span>
            <span className="mt-1 block text-xs text-ink-muted">{s.criterion.marginText}</span>
          </p>
        ) : s.value && !s.error ? (
          <p
            className="font-mono text-sm text-ink"
            title={
              s.value.number !== null
                ? `full precision: ${s.value.number}${s.value.unit ? ` ${s.value.unit}` : ''}`
                : undefined
            }
          >
            {s.name ? <span className="sr-only">{s.name} = </span> : null}
            {s.value.text}
          </p>
        ) : null}
        {!s.error && s.uncertainty ? <UncertaintyValue uncertainty={s.uncertainty} /> : null}
      </div>
      {extras ? (
        <div className="min-w-0 sm:col-span-2">
          {s.plot ? (
            <PlotView plot={s.plot} significantFigures={significantFigures} label={`Figure, line ${s.line}`} />
          ) : null}
          {s.table ? (
            <StudyTable
              table={s.table}
              line={s.line}
              significantFigures={significantFigures}
              csvHref={csv?.href}
              csvFileName={csv?.fileName}
            />
          ) : null}
          {s.uncertainty?.kind === 'propagated' ? (
            <UncertaintyDetails uncertainty={s.uncertainty} line={s.line} />
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
