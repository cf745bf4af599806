import { StatementView } from '@/components/calc/statement-view';
import type { SheetResult } from '@/lib/calc/types';
import { studyCsvFileName } from '@/lib/calc/study-csv';
import type { VersionContent } from '@/lib/sheets/content';
import { AttachmentList } from './attachment-list';
import { VisibleText } from '@/components/data/visible-text';
import { checkDesignInputs } from '@/lib/checks/submission-findings';

/** A version as recorded: the calculation record fields, then every cell with its recorded results. */
export function VersionView({
  sheetId,
  sheetCode,
  versionNumber,
  content,
  results,
  renderText,
}: {
  sheetId: string;
  /** "TPT2-CALC-0004" and the version shown: sweep tables download from the version's study route. */
  sheetCode: string;
  versionNumber: number;
  content: VersionContent;
  results: SheetResult | null;
  renderText: (source: string) => React.ReactNode;
}) {
  const r = content.record;
  const byId = new Map((results?.cells ?? []).map((c) => [c.id, c]));
  const linked = new Map(checkDesignInputs(r, results).map((d) => [d.index, d]));
  return (
    <div className="space-y-8">
      <section aria-labelledby="record-title" className="rounded border border-rule bg-surface p-4">
        <h2 id="record-title" className="text-lg font-bold">
          Calculation record
        </h2>
        <dl className="mt-2 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[10rem_minmax(0,1fr)]">
          <dt className="font-semibold">Objective</dt>
          <dd>
            {r.objective ? <VisibleText text={r.objective} /> : <span className="text-ink-muted">not stated</span>}
          </dd>
          <dt className="font-semibold">Design inputs</dt>
          <dd>
            {r.inputs.length ? (
              <ul className="list-disc pl-5">
                {r.inputs.map((i, index) => {
                  const d = linked.get(index);
                  return (
                    <li key={`${index}-${i.name}`}>
                      <VisibleText text={i.name} />:{' '}
                      <span className="font-mono">
                        <VisibleText text={i.value} />
                      </span>{' '}
                      — <VisibleText text={i.source} />, revision <VisibleText text={i.sourceRevision} />
                      {d ? (
                        <span
                          className={`block ${d.status === 'match' ? 'text-ink-muted' : 'font-semibold text-fail'}`}
                        >
                          {d.status === 'match' ? (
                            <>
                              feeds <code className="font-mono">{d.cell}</code>; value used: {d.engineValue}
                            </>
                          ) : (
                            <>
                              Error: feeds <code className="font-mono">{d.cell}</code>, {d.words}
                            </>
                          )}
                        </span>
                      ) : null}
                    </li>
                  );
                })}
              </ul>
            ) : (
              <span className="text-ink-muted">none listed</span>
            )}
          </dd>
          <dt className="font-semibold">Assumptions</dt>
          <dd>
            {r.assumptions.length ? (
              <ul className="list-disc pl-5">
                {r.assumptions.map((a) => (
                  <li key={a.text}>
                    <VisibleText text={a.text} />
                    {a.needsVerification ? (
                      <span className="ml-2 rounded bg-caution-soft px-1.5 text-xs font-bold text-caution">
                        to be verified
                      </span>
                    ) : null}
                  </li>
                ))}
              </ul>
            ) : (
              <span className="text-ink-muted">none listed</span>
            )}
          </dd>
          <dt className="font-semibold">Method</dt>
          <dd>{r.method ? <VisibleText text={r.method} /> : <span className="text-ink-muted">not stated</span>}</dd>
          <dt className="font-semibold">References</dt>
          <dd>
            {r.references.length ? (
              <ul className="list-disc pl-5">
                {r.references.map((x) => (
                  <li key={x}>
                    <VisibleText text={x} />
                  </li>
                ))}
              </ul>
            ) : (
              <span className="text-ink-muted">none listed</span>
            )}
          </dd>
          <dt className="font-semibold">Conclusions</dt>
          <dd>
            {r.conclusions ? <VisibleText text={r.conclusions} /> : <span className="text-ink-muted">not stated</span>}
          </dd>
        </dl>
      </section>
      <section aria-labelledby="attachments-title" className="rounded border border-rule bg-surface p-4">
        <h2 id="attachments-title" className="mb-2 text-lg font-bold">
          Attachments
        </h2>
        <AttachmentList sheetId={sheetId} attachments={content.attachments} />
      </section>
      <section aria-labelledby="cells-title" className="space-y-3">
        <h2 id="cells-title" className="text-lg font-bold">
          Cells
        </h2>
        {content.cells.length === 0 ? <p className="text-ink-muted">No cells yet.</p> : null}
        {content.cells.map((cell, i) => {
          const result = byId.get(cell.id);
          return (
            <article
              key={cell.id}
              aria-label={`Cell ${i + 1}`}
              className={`rounded border bg-surface px-4 py-2 ${result && !result.ok ? 'border-fail' : 'border-rule'}`}
            >
              <p className="text-xs text-ink-muted">
                Cell {i + 1} · {cell.kind === 'calc' ? 'calculation' : 'text'}
              </p>
              {cell.kind === 'text' ? (
                <div className="py-2">{renderText(cell.source)}</div>
              ) : (
                <>
                  <pre className="my-2 whitespace-pre-wrap break-words rounded bg-paper p-2 font-mono text-sm">
                    <VisibleText text={cell.source} />
                  </pre>
                  {result ? (
                    result.statements.map((s) => (
                      <StatementView
                        key={`${s.line}:${s.source}`}
                        statement={s}
                        significantFigures={content.significantFigures}
                        studyCsv={(line) => ({
                          href: `/api/sheets/${sheetId}/versions/${versionNumber}/studies/${result.index}/${line}`,
                          fileName: studyCsvFileName({
                            sheet: sheetCode,
                            version: versionNumber,
                            cellNumber: i + 1,
                            line,
                          }),
                        })}
                      />
                    ))
                  ) : (
                    <p className="text-sm text-ink-muted">Not evaluated.</p>
                  )}
                </>
              )}
            </article>
          );
        })}
      </section>
    </div>
  );
}
