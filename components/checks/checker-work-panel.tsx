'use client';

import { useRouter } from 'next/navigation';
import { useId, useState } from 'react';
import { api, errorText } from '@/components/data/api-client';
import { StatementView } from '@/components/calc/statement-view';
import { CalcEditor } from '@/components/sheet/calc-editor';
import type { VerificationMethod } from '@/db/schema';
import type { SheetResult } from '@/lib/calc/types';
import type { AlternateComparison } from '@/lib/checks/alternate-comparison';
import type { CarriedOver } from '@/lib/checks/carried-over';
import { AlternateComparisonTable } from './alternate-comparison-table';
import { CarriedMark, CarriedOverNotice } from './carried-over-notice';
import type { Cell } from '@/lib/sheets/content';
import { primaryButton, secondaryButton } from '@/components/ui/button';
import { Field } from '@/components/ui/field';

type Status = { kind: 'idle' | 'busy' } | { kind: 'done' | 'error'; text: string };

function newId(cells: Cell[]): string {
  const ids = new Set(cells.map((c) => c.id));
  let n = cells.length + 1;
  while (ids.has(`alt-${n}`)) n++;
  return `alt-${n}`;
}

function Results({ cells, results }: { cells: Cell[]; results: SheetResult | null }) {
  const byId = new Map((results?.cells ?? []).map((c) => [c.id, c]));
  return (
    <>
      {cells.map((cell, i) => {
        const r = byId.get(cell.id);
        return r ? (
          <div
            key={cell.id}
            aria-label={`Results of alternate cell ${i + 1}`}
            role="group"
            className="rounded border border-rule bg-surface px-3 py-1"
          >
            {r.statements.map((s) => (
              <StatementView key={`${s.line}:${s.source}`} statement={s} />
            ))}
          </div>
        ) : null;
      })}
    </>
  );
}

/**
 * The checker's record of how the version was verified (ASME NQA-1 Requirement 3: design review,
 * alternate calculation or qualification test), notes, and an alternate calculation evaluated by the
 * server's engine and kept with the check. Read-only for everyone else, and once the check is decided.
 */
export function CheckerWorkPanel({
  checkId,
  editable,
  methods,
  method: initialMethod,
  notes: initialNotes,
  alternateCells,
  alternateResults,
  tolerance: initialTolerance = null,
  comparison,
  carriedOver = null,
  versionNumber,
}: {
  checkId: string;
  editable: boolean;
  methods: Array<{ value: VerificationMethod; label: string }>;
  method: VerificationMethod | null;
  notes: string;
  alternateCells: Cell[];
  alternateResults: SheetResult | null;
  /** The checker's relative tolerance as written ("0.1 %"). */
  tolerance?: string | null;
  comparison?: AlternateComparison;
  carriedOver?: CarriedOver | null;
  versionNumber?: number;
}) {
  const id = useId();
  const router = useRouter();
  const [method, setMethod] = useState(initialMethod);
  const [notes, setNotes] = useState(initialNotes);
  const [cells, setCells] = useState<Cell[]>(alternateCells);
  const [results, setResults] = useState<SheetResult | null>(alternateResults);
  const [evaluated, setEvaluated] = useState<Cell[]>(alternateCells);
  const [status, setStatus] = useState<Status>({ kind: 'idle' });
  const [tolerance, setTolerance] = useState(initialTolerance ?? '');
  const evidence = (
    <>
      {comparison && versionNumber !== undefined && (cells.length > 0 || alternateCells.length > 0) ? (
        <AlternateComparisonTable comparison={comparison} versionNumber={versionNumber} />
      ) : null}
    </>
  );

  async function patch(
    body: Parameters<typeof api.saveCheckWork>[1],
  ): Promise<{ alternateResults: SheetResult | null } | null> {
    setStatus({ kind: 'busy' });
    try {
      return await api.saveCheckWork(checkId, body);
    } catch (error) {
      setStatus({ kind: 'error', text: errorText(error, 'The server could not be reached; nothing was saved.') });
      return null;
    }
  }

  async function chooseMethod(value: VerificationMethod) {
    const before = method;
    setMethod(value);
    if (await patch({ verificationMethod: value })) {
      setStatus({
        kind: 'done',
        text: `Verification method recorded: ${methods.find((m) => m.value === value)?.label}.`,
      });
      router.refresh();
    } else setMethod(before);
  }

  async function save() {
    const answer = await patch({
      verificationMethod: method,
      checkerNotes: notes,
      alternateCells: cells,
      tolerance: tolerance.trim() || null,
    });
    if (!answer) return;
    setResults(answer.alternateResults);
    setEvaluated(cells);
    const failed = (answer.alternateResults?.cells ?? []).filter((c) => !c.ok).length;
    setStatus({
      kind: 'done',
      text: `Saved${cells.length ? ` and evaluated${failed ? `: ${failed} cell${failed === 1 ? ' has' : 's have'} an error` : ''}` : ''}.`,
    });
    router.refresh();
  }

  async function confirmCarried() {
    if (await patch({ confirmCarriedOver: true })) {
      setStatus({
        kind: 'done',
        text: `Confirmed the work carried over from the check of version ${carriedOver?.fromVersion}.`,
      });
      router.refresh();
    }
  }

  const methodLabel = methods.find((m) => m.value === method)?.label;

  if (!editable) {
    return (
      <div className="space-y-3 text-sm">
        <CarriedOverNotice carried={carriedOver} />
        <p>
          <span className="font-semibold">Verification method:</span>{' '}
          {methodLabel ?? <span className="text-ink-muted">not recorded yet</span>}
          <CarriedMark carried={carriedOver} field="verificationMethod" />
        </p>
        <div>
          <p className="font-semibold">
            Checker&apos;s notes
            <CarriedMark carried={carriedOver} field="checkerNotes" />
          </p>
          {initialNotes ? (
            <p className="whitespace-pre-wrap">{initialNotes}</p>
          ) : (
            <p className="text-ink-muted">No notes.</p>
          )}
        </div>
        {alternateCells.length ? (
          <div className="space-y-2">
            <p className="font-semibold">
              Alternate calculation
              <CarriedMark carried={carriedOver} field="alternateCells" />
            </p>
            {alternateCells.map((c) => (
              <pre key={c.id} className="overflow-x-auto rounded bg-paper p-2 font-mono text-sm">
                {c.source}
              </pre>
            ))}
            <Results cells={alternateCells} results={alternateResults} />
          </div>
        ) : null}
        {evidence}
      </div>
    );
  }

  // Gutter markers for the errors of the last save, while the cell's text is what was evaluated.
  const lineErrorsOf = (cell: Cell) => {
    if (!evaluated.some((e) => e.id === cell.id && e.source === cell.source)) return undefined;
    return results?.cells
      .find((r) => r.id === cell.id)
      ?.statements.flatMap((s) => (s.error ? [{ line: s.line, message: s.error }] : []));
  };
  const namesAbove = (i: number) =>
    cells
      .slice(0, i)
      .flatMap((above) => (results?.cells.find((r) => r.id === above.id)?.defines ?? []).map((name) => ({ name })));

  return (
    <div className="space-y-4">
      {carriedOver && carriedOver.fields.length ? (
        <div className="space-y-2">
          <CarriedOverNotice carried={carriedOver} />
          {!carriedOver.confirmedAt ? (
            <p className="text-sm">
              Check the carried-over work against version {versionNumber}: edit what no longer holds, then confirm the
              rest (signing waits for it).{' '}
              <button
                type="button"
                onClick={confirmCarried}
                disabled={status.kind === 'busy'}
                className={`mt-1 ${secondaryButton}`}
              >
                Confirm the work carried over from version {carriedOver.fromVersion}
              </button>
            </p>
          ) : null}
        </div>
      ) : null}
      <fieldset className="space-y-1">
        <legend className="text-sm font-semibold">
          Verification method (ASME NQA-1 Requirement 3)
          <CarriedMark carried={carriedOver} field="verificationMethod" />
        </legend>
        {methods.map((m) => (
          <label key={m.value} className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              name={`${id}-method`}
              value={m.value}
              checked={method === m.value}
              onChange={() => chooseMethod(m.value)}
              disabled={status.kind === 'busy'}
              className="h-4 w-4"
            />
            {m.label}
          </label>
        ))}
      </fieldset>
      <Field
        label={
          <>
            Checker&apos;s notes
            <CarriedMark carried={carriedOver} field="checkerNotes" />
          </>
        }
        id={`${id}-notes`}
      >
        {(control) => (
          <textarea
            {...control}
            rows={3}
            value={notes}
            onChange={(e) => setNotes(e.target.value)}
            className="w-full rounded border border-rule-strong bg-surface px-3 py-2 text-sm"
          />
        )}
      </Field>
      <div className="space-y-2">
        <h3 className="text-sm font-semibold">
          Alternate calculation
          <CarriedMark carried={carriedOver} field="alternateCells" />
        </h3>
        <p id={`${id}-alt-help`} className="text-xs text-ink-muted">
          Work out the key results another way. The cells are evaluated by the server&apos;s engine and kept with this
          check; they are not part of the sheet.
        </p>
        {cells.map((cell, i) => (
          <div key={cell.id} className="space-y-1">
            <div className="flex items-center justify-between text-xs">
              <span className="font-semibold text-ink-muted">Alternate cell {i + 1}</span>
              <button
                type="button"
                onClick={() => setCells((cs) => cs.filter((c) => c.id !== cell.id))}
                className="rounded border border-fail px-2 py-0.5 text-fail"
                aria-label={`Delete alternate cell ${i + 1}`}
              >
                Delete
              </button>
            </div>
            <CalcEditor
              label={`Alternate cell ${i + 1} source`}
              describedBy={`${id}-alt-help`}
              value={cell.source}
              onChange={(source) => setCells((cs) => cs.map((c) => (c.id === cell.id ? { ...c, source } : c)))}
              namesAbove={namesAbove(i)}
              lineErrors={lineErrorsOf(cell)}
              minLines={2}
            />
          </div>
        ))}
        <button
          type="button"
          onClick={() => setCells((cs) => [...cs, { id: newId(cs), kind: 'calc', source: '' }])}
          className={secondaryButton}
        >
          Add an alternate calculation cell
        </button>
        <Field
          label={
            <>
              Tolerance of the comparison (relative)
              <CarriedMark carried={carriedOver} field="tolerance" />
            </>
          }
          id={`${id}-tolerance`}
          hint="Each name the alternate cells share with the sheet is compared: |alternate − sheet| / |sheet| must not exceed it. Write 1e-6, 0.1 % or 5 ppm."
        >
          {(control) => (
            <input
              {...control}
              value={tolerance}
              onChange={(e) => setTolerance(e.target.value)}
              className="w-40 rounded border border-rule-strong bg-surface px-3 py-1.5 font-mono text-sm"
            />
          )}
        </Field>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" onClick={save} disabled={status.kind === 'busy'} className={primaryButton}>
          {status.kind === 'busy' ? 'Saving…' : 'Save and evaluate'}
        </button>
        <p
          role={status.kind === 'error' ? 'alert' : 'status'}
          aria-live="polite"
          className={`text-sm ${status.kind === 'error' ? 'text-fail' : 'text-pass'}`}
        >
          {status.kind === 'done' || status.kind === 'error' ? status.text : ''}
        </p>
      </div>
      {evaluated.length && results ? (
        <div className="space-y-2">
          <h3 className="text-sm font-semibold">Results of the alternate calculation (as last saved)</h3>
          <Results cells={evaluated} results={results} />
        </div>
      ) : null}
      {evidence}
    </div>
  );
}
