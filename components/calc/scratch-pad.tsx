'use client';

import { useEffect, useId, useState } from 'react';
import useSWR from 'swr';
import { CalcEditor } from '@/components/sheet/calc-editor';
import { oneAtATime, postEvaluation } from './one-evaluation-at-a-time';
import { StatementView } from './statement-view';

const EXAMPLE = [
  'T_kin = 250 MeV                # kinetic energy',
  'p_1 = momentumFromKinetic(T_kin, m_p)',
  'Brho = magneticRigidity(p_1, q_e) to T*m',
  'Brho < 2.5 T*m                 # design criterion',
  'gamma_1 = lorentzFactor(speedFromKinetic(T_kin, m_p))',
].join('\n');

// One evaluation in flight; see one-evaluation-at-a-time.ts.
const evaluate = oneAtATime(([, source]: [string, string]) =>
  postEvaluation({ sheetKey: 'scratch', cells: [{ id: 'scratch', kind: 'calc', source }] }),
);

/** A single calculation cell evaluated by the server as you type. Nothing here is saved. */
export function ScratchPad() {
  const [source, setSource] = useState(EXAMPLE);
  const [debounced, setDebounced] = useState(EXAMPLE);
  const inputId = useId();
  const helpId = useId();
  useEffect(() => {
    const t = setTimeout(() => setDebounced(source), 350);
    return () => clearTimeout(t);
  }, [source]);
  const { data, error, isLoading } = useSWR(['evaluate', debounced], evaluate, {
    keepPreviousData: true,
    revalidateOnFocus: false,
  });
  const cell = data?.cells[0];

  return (
    <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
      <div>
        <p id={inputId} className="block font-semibold">
          Calculation cell
        </p>
        <p id={helpId} className="text-sm text-ink-muted">
          One statement per line; <code className="font-mono">#</code> starts a comment. Names are defined once, above
          their use. Ctrl-Space lists names, constants and functions; Escape then Tab leaves the editor.
        </p>
        <CalcEditor
          value={source}
          onChange={setSource}
          label="Calculation cell"
          describedBy={helpId}
          lineErrors={cell?.statements.flatMap((s) => (s.error ? [{ line: s.line, message: s.error }] : []))}
          minLines={14}
          className="mt-2"
        />
      </div>
      <section aria-labelledby={`${inputId}-results`} aria-live="polite" aria-busy={isLoading}>
        <h2 id={`${inputId}-results`} className="font-semibold">
          Results
        </h2>
        {error ? (
          <p role="alert" className="mt-2 rounded bg-fail-soft px-3 py-2 text-sm text-fail">
            {(error as Error).message}
          </p>
        ) : null}
        <div className="mt-2 rounded border border-rule bg-surface px-4 py-2">
          {cell ? (
            cell.statements.map((s) => <StatementView key={`${s.line}:${s.source}`} statement={s} />)
          ) : (
            <p className="py-2 text-sm text-ink-muted">Evaluating…</p>
          )}
        </div>
        {data ? (
          <p className="mt-2 text-xs text-ink-muted">
            {data.engineVersion}; constants {data.constantsEdition}
          </p>
        ) : null}
      </section>
    </div>
  );
}
