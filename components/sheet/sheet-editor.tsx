'use client';

import Link from 'next/link';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import useSWR from 'swr';
import { oneAtATime, postEvaluation } from '@/components/calc/one-evaluation-at-a-time';
import { api, ApiError, detail, errorText } from '@/components/data/api-client';
import { StatementView } from '@/components/calc/statement-view';
import { AttachmentsPanel, useSheetAttachments } from './attachments-panel';
import { CalcEditor } from './calc-editor';
import { MarkdownView } from './markdown-view';
import { RecordListsEditor } from './record-lists-editor';
import { DISPLAY_UNITS, DISPLAY_UNITS_DEFAULT, DISPLAY_UNITS_LABEL, type DisplayUnits } from '@/lib/calc/display-units';
import type { Cell, VersionContent } from '@/lib/sheets/content';
import { primaryButton } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';

interface Props {
  sheetId: string;
  projectCode: string;
  sheetNumber: number;
  base: { number: number; content: VersionContent };
}

interface Draft {
  parentNumber: number;
  content: VersionContent;
  savedAt: string;
}

const draftKey = (sheetId: string) => `worldsheet:draft:${sheetId}`;

function newCellId(cells: Cell[]): string {
  let n = cells.length + 1;
  const ids = new Set(cells.map((c) => c.id));
  while (ids.has(`c${n}`)) n++;
  return `c${n}`;
}

// One evaluation in flight per editor; see components/calc/one-evaluation-at-a-time.ts.
const evaluate = oneAtATime(([, sheetKey, body]: [string, string, string]) =>
  postEvaluation({ ...JSON.parse(body), sheetKey }),
);

/**
 * Edits a sheet: cells (insert, delete, move), the calculation record, evaluation on the server as
 * you type (debounced; the server re-evaluates only what changed), and "save version". Unsaved
 * edits are kept in this browser until saved, so a reload or a crashed tab loses nothing.
 */
export function SheetEditor({ sheetId, projectCode, sheetNumber, base }: Props) {
  const [parentNumber, setParentNumber] = useState(base.number);
  const [content, setContent] = useState<VersionContent>(base.content);
  const [restored, setRestored] = useState(false);
  const [message, setMessage] = useState('');
  const [status, setStatus] = useState<{
    kind: 'idle' | 'saving' | 'saved' | 'error' | 'conflict';
    text?: string;
    latest?: number;
  }>({ kind: 'idle' });
  const loaded = useRef(false);

  // Restore a draft kept in this browser (only if it was based on the version we start from or later).
  useEffect(() => {
    const raw = localStorage.getItem(draftKey(sheetId));
    if (raw) {
      try {
        const draft = JSON.parse(raw) as Draft;
        if (draft.parentNumber >= base.number) {
          setContent(draft.content);
          setParentNumber(draft.parentNumber);
          setRestored(true);
        }
      } catch {
        localStorage.removeItem(draftKey(sheetId));
      }
    }
    loaded.current = true;
  }, [sheetId, base.number]);

  useEffect(() => {
    if (!loaded.current) return;
    const draft: Draft = { parentNumber, content, savedAt: new Date().toISOString() };
    localStorage.setItem(draftKey(sheetId), JSON.stringify(draft));
  }, [sheetId, parentNumber, content]);

  const [debounced, setDebounced] = useState(content);
  useEffect(() => {
    const t = setTimeout(() => setDebounced(content), 400);
    return () => clearTimeout(t);
  }, [content]);
  const body = useMemo(
    () =>
      JSON.stringify({
        cells: debounced.cells,
        significantFigures: debounced.significantFigures,
        displayUnits: debounced.displayUnits,
        sheetId,
        attachments: debounced.attachments
          .filter((a) => a.mediaType === 'text/csv')
          .map(({ name, sha256 }) => ({ name, sha256 })),
      }),
    [debounced, sheetId],
  );
  const { data: results, error } = useSWR(['evaluate', sheetId, body], evaluate, {
    keepPreviousData: true,
    revalidateOnFocus: false,
  });
  const resultById = useMemo(() => new Map((results?.cells ?? []).map((c) => [c.id, c])), [results]);
  // The cited CSV tables, offered in completion as `table.` with their columns.
  const { data: uploads } = useSheetAttachments(sheetId);
  const tableNames = useMemo(
    () =>
      (uploads?.attachments ?? [])
        .filter((a) => a.table && content.attachments.some((c) => c.name === a.name && c.sha256 === a.sha256))
        .map((a) => ({
          name: a.table!.name,
          summary: `input table from ${a.name}, ${a.table!.rows} rows`,
          columns: a.table!.columns,
        })),
    [uploads, content.attachments],
  );

  const update = useCallback((change: (c: VersionContent) => VersionContent) => setContent((c) => change(c)), []);
  const setCell = (i: number, source: string) =>
    update((c) => ({ ...c, cells: c.cells.map((x, j) => (j === i ? { ...x, source } : x)) }));
  const insertCell = (at: number, kind: Cell['kind']) =>
    update((c) => ({
      ...c,
      cells: [...c.cells.slice(0, at), { id: newCellId(c.cells), kind, source: '' }, ...c.cells.slice(at)],
    }));
  const removeCell = (i: number) => update((c) => ({ ...c, cells: c.cells.filter((_, j) => j !== i) }));
  const moveCell = (i: number, by: -1 | 1) =>
    update((c) => {
      const j = i + by;
      if (j < 0 || j >= c.cells.length) return c;
      const cells = [...c.cells];
      [cells[i], cells[j]] = [cells[j], cells[i]];
      return { ...c, cells };
    });

  async function save() {
    setStatus({ kind: 'saving' });
    let answer;
    try {
      answer = await api.saveVersion(sheetId, { parentNumber, message, content });
    } catch (error) {
      if (error instanceof ApiError && error.status === 409) {
        const latest = detail(error, 'latestNumber');
        setStatus({ kind: 'conflict', text: error.message, latest: typeof latest === 'number' ? latest : undefined });
      } else setStatus({ kind: 'error', text: errorText(error) });
      return;
    }
    localStorage.removeItem(draftKey(sheetId));
    setParentNumber(answer.number);
    setMessage('');
    setRestored(false);
    setStatus({ kind: 'saved', text: `Saved as version ${answer.number}.` });
  }

  /** Keeps the edits and bases them on the latest version; the next save records that. */
  function carryOver() {
    if (status.latest) setParentNumber(status.latest);
    setStatus({ kind: 'idle', text: undefined });
  }

  const record = content.record;
  const setRecord = (patch: Partial<VersionContent['record']>) =>
    update((c) => ({ ...c, record: { ...c.record, ...patch } }));

  return (
    <div className="space-y-6">
      {restored ? (
        <p role="status" className="rounded border border-caution-rule bg-caution-soft px-3 py-2 text-sm text-caution">
          Unsaved edits from this browser were restored (based on version {parentNumber}).
        </p>
      ) : null}

      <section aria-labelledby="editor-record" className="space-y-3 rounded border border-rule bg-surface p-4">
        <h2 id="editor-record" className="text-lg font-bold">
          Calculation record
        </h2>
        <Field label="Title" id="ed-title">
          {(control) => (
            <input
              {...control}
              value={content.title}
              onChange={(e) => update((c) => ({ ...c, title: e.target.value }))}
              className={inputClass}
            />
          )}
        </Field>
        <Field
          label="Units shown"
          id="ed-display-units"
          hint={
            <>
              How results are shown; the values are the same either way. A unit written in a formula (<code>3 kg</code>,{' '}
              <code>x to J</code>) is always kept.
            </>
          }
          hintClassName="text-sm text-ink-muted"
        >
          {(control) => (
            <select
              {...control}
              value={content.displayUnits ?? DISPLAY_UNITS_DEFAULT}
              onChange={(e) => update((c) => ({ ...c, displayUnits: e.target.value as DisplayUnits }))}
              className="rounded border border-rule-strong bg-surface px-3 py-2"
            >
              {DISPLAY_UNITS.map((d) => (
                <option key={d} value={d}>
                  {DISPLAY_UNITS_LABEL[d]}
                </option>
              ))}
            </select>
          )}
        </Field>
        {(['objective', 'method', 'conclusions'] as const).map((field) => (
          <Field key={field} label={field} id={`ed-${field}`} labelClassName="block text-sm font-semibold capitalize">
            {(control) => (
              <textarea
                {...control}
                rows={2}
                value={record[field]}
                onChange={(e) => setRecord({ [field]: e.target.value })}
                className={inputClass}
              />
            )}
          </Field>
        ))}
        <Field label="References (one per line)" id="ed-references">
          {(control) => (
            <textarea
              {...control}
              rows={2}
              value={record.references.join('\n')}
              onChange={(e) => setRecord({ references: e.target.value.split('\n').filter((x) => x.trim() !== '') })}
              className={inputClass}
            />
          )}
        </Field>
        <RecordListsEditor record={record} onChange={setRecord} />
      </section>

      <AttachmentsPanel
        sheetId={sheetId}
        cited={content.attachments}
        onChange={(attachments) => update((c) => ({ ...c, attachments }))}
      />

      <section aria-labelledby="editor-cells" className="space-y-3">
        <h2 id="editor-cells" className="text-lg font-bold">
          Cells
        </h2>
        {error ? (
          <p role="alert" className="rounded bg-fail-soft px-3 py-2 text-sm text-fail">
            Evaluation failed: {(error as Error).message}
          </p>
        ) : null}
        {content.cells.map((cell, i) => {
          const result = resultById.get(cell.id);
          const label = `Cell ${i + 1} (${cell.kind === 'calc' ? 'calculation' : 'text'})`;
          return (
            <article
              key={cell.id}
              aria-label={label}
              className={`rounded border bg-surface p-3 ${result && !result.ok ? 'border-fail' : 'border-rule'}`}
            >
              <div className="mb-2 flex flex-wrap items-center gap-2 text-xs">
                <span className="font-semibold text-ink-muted">{label}</span>
                <span className="ml-auto flex gap-1">
                  <button
                    type="button"
                    onClick={() => moveCell(i, -1)}
                    disabled={i === 0}
                    className="rounded border border-rule px-2 py-1 disabled:opacity-40"
                    aria-label={`Move cell ${i + 1} up`}
                  >
                    ↑
                  </button>
                  <button
                    type="button"
                    onClick={() => moveCell(i, 1)}
                    disabled={i === content.cells.length - 1}
                    className="rounded border border-rule px-2 py-1 disabled:opacity-40"
                    aria-label={`Move cell ${i + 1} down`}
                  >
                    ↓
                  </button>
                  <button
                    type="button"
                    onClick={() => insertCell(i + 1, 'calc')}
                    className="rounded border border-rule px-2 py-1"
                    aria-label={`Insert a calculation cell after cell ${i + 1}`}
                  >
                    + calc
                  </button>
                  <button
                    type="button"
                    onClick={() => insertCell(i + 1, 'text')}
                    className="rounded border border-rule px-2 py-1"
                    aria-label={`Insert a text cell after cell ${i + 1}`}
                  >
                    + text
                  </button>
                  <button
                    type="button"
                    onClick={() => removeCell(i)}
                    className="rounded border border-fail px-2 py-1 text-fail"
                    aria-label={`Delete cell ${i + 1}`}
                  >
                    Delete
                  </button>
                </span>
              </div>
              {cell.kind === 'calc' ? (
                <CalcEditor
                  label={`${label} source`}
                  value={cell.source}
                  onChange={(value) => setCell(i, value)}
                  namesAbove={[
                    ...tableNames,
                    ...content.cells
                      .slice(0, i)
                      .flatMap((above) => (resultById.get(above.id)?.defines ?? []).map((name) => ({ name }))),
                  ]}
                  lineErrors={result?.statements.flatMap((s) => (s.error ? [{ line: s.line, message: s.error }] : []))}
                  minLines={2}
                />
              ) : (
                <>
                  <textarea
                    aria-label={`${label} source`}
                    value={cell.source}
                    onChange={(e) => setCell(i, e.target.value)}
                    rows={Math.max(2, cell.source.split('\n').length + 1)}
                    className="w-full rounded border border-rule-strong bg-surface p-2 text-sm"
                  />
                  <MarkdownView source={cell.source} className="mt-2" />
                </>
              )}
              {cell.kind === 'calc' && result ? (
                <div aria-live="polite" className="mt-2">
                  {result.statements.map((s) => (
                    <StatementView
                      key={`${s.line}:${s.source}`}
                      statement={s}
                      significantFigures={content.significantFigures}
                    />
                  ))}
                </div>
              ) : null}
            </article>
          );
        })}
        <div className="flex gap-2">
          <button
            type="button"
            onClick={() => insertCell(content.cells.length, 'calc')}
            className="rounded border border-rule-strong bg-surface px-3 py-2 text-sm font-semibold"
          >
            Add a calculation cell
          </button>
          <button
            type="button"
            onClick={() => insertCell(content.cells.length, 'text')}
            className="rounded border border-rule-strong bg-surface px-3 py-2 text-sm font-semibold"
          >
            Add a text cell
          </button>
        </div>
      </section>

      <section aria-labelledby="editor-save" className="space-y-2 rounded border border-rule bg-surface p-4">
        <h2 id="editor-save" className="text-lg font-bold">
          Save a version
        </h2>
        <p className="text-sm text-ink-muted">
          Based on version {parentNumber}. A saved version never changes; its SHA-256 identifies it.
        </p>
        <label htmlFor="ed-message" className="block text-sm font-semibold">
          What changed
        </label>
        <input id="ed-message" value={message} onChange={(e) => setMessage(e.target.value)} className={inputClass} />
        <button
          type="button"
          onClick={save}
          disabled={!message.trim() || status.kind === 'saving'}
          className={primaryButton}
        >
          {status.kind === 'saving' ? 'Saving…' : 'Save version'}
        </button>
        <div
          role={status.kind === 'error' || status.kind === 'conflict' ? 'alert' : 'status'}
          aria-live="polite"
          className="text-sm"
        >
          {status.kind === 'saved' ? (
            <span className="text-pass">
              {status.text}{' '}
              <Link
                href={`/projects/${projectCode}/sheets/${sheetNumber}`}
                className="font-semibold text-accent underline"
              >
                View the sheet
              </Link>
            </span>
          ) : null}
          {status.kind === 'error' ? <span className="text-fail">{status.text}</span> : null}
          {status.kind === 'conflict' ? (
            <span className="text-fail">
              {status.text}{' '}
              <Link
                href={`/projects/${projectCode}/sheets/${sheetNumber}/compare?base=${parentNumber}&target=${status.latest}`}
                className="font-semibold text-accent underline"
              >
                See what changed
              </Link>{' '}
              <button type="button" onClick={carryOver} className="font-semibold text-accent underline">
                Keep my edits on top of version {status.latest}
              </button>
            </span>
          ) : null}
        </div>
      </section>
    </div>
  );
}
