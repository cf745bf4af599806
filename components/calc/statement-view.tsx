import type { StatementResult } from '@/lib/calc/types';
import { TexMath } from './tex-math';

/** One statement as a checker reads it: formula, values substituted, result; or its error. */
export function StatementView({ statement }: { statement: StatementResult }) {
  const s = statement;
  return (
    <div className="grid gap-1 border-t border-rule py-2 first:border-t-0 sm:grid-cols-[minmax(0,1fr)_auto] sm:gap-4">
      <div className="min-w-0 space-y-1 overflow-x-auto">
        {s.tex ? <TexMath tex={s.tex} className="block text-ink" /> : <code className="font-mono text-sm">{s.source}</code>}
        {s.substitutedTex && s.substitutedTex !== s.tex ? (
          <TexMath tex={s.substitutedTex} className="block text-sm text-ink-muted" />
        ) : null}
        {s.error ? (
          <p role="alert" className="rounded bg-fail-soft px-2 py-1 text-sm text-fail">
            Line {s.line}: {s.error}
          </p>
        ) : null}
      </div>
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
          <p className="font-mono text-sm text-ink" title={s.value.number !== null ? `full precision: ${s.value.number}${s.value.unit ? ` ${s.value.unit}` : ''}` : undefined}>
            {s.name ? <span className="sr-only">{s.name} = </span> : null}
            {s.value.text}
          </p>
        ) : null}
      </div>
    </div>
  );
}
