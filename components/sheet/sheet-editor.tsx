'use client';

import Link from 'next/link';
import { Fragment, useCallback, useEffect, useMemo, useRef, useState } from 'react';
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
import { primaryButton, secondaryButton } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { discardDraft, keepDraft, readDraft } from './editor-draft';
import { MenuButton } from './menu-button';

interface Props {
  sheetId: string;
  projectCode: string;
  sheetNumber: number;
  base: { number: number; content: VersionContent };
}

/** What a cell is called on the screen: "Cell 3 (calculation)", "Cell 1 (note)". */
const cellLabel = (cell: Cell, i: number) => `Cell ${i + 1} (${cell.kind === 'calc' ? 'calculation' : 'note'})`;

/** The kinds of cell, as the insert menus offer them. */
const KINDS: ReadonlyArray<{ kind: Cell['kind']; label: string }> = [
  { kind: 'calc', label: 'Calculation step' },
  { kind: 'text', label: 'Note' },
];

/** Where the focus goes once the cells have been rendered after an insert, a move or an undo. */
interface FocusRequest {
  cellId: string;
  on: 'source' | 'actions';
}

/** The text of a cell's errors, as the editor describes it and announces it. */
interface CellErrorLine {
  key: string;
  text: string;
}

// How long the errors must stay the same before they are announced (the evaluation itself already
// waits for a pause in typing): a screen reader hears the errors of what was written, not of every keystroke.
const ANNOUNCE_AFTER_MS = 1000;

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
 * Edits a sheet: cells (insert below, move, delete with undo), the calculation record, evaluation on
 * the server as you type (debounced; the server re-evaluates only what changed), and "save version"
 * (also Ctrl+S, ⌘S on a Mac). Unsaved edits are kept in this browser until saved, so a reload or a
 * crashed tab loses nothing (components/sheet/editor-draft.ts); they can be discarded.
 */
export function SheetEditor({ sheetId, projectCode, sheetNumber, base }: Props) {
  const [parentNumber, setParentNumber] = useState(base.number);
  const [content, setContent] = useState<VersionContent>(base.content);
  // The version the edits are based on, as saved: what "Discard my edits" shows and what a draft is compared with.
  const [saved, setSaved] = useState(base);
  const [draftNotice, setDraftNotice] = useState<'restored' | 'discarded' | null>(null);
  const [message, setMessage] = useState('');
  const [status, setStatus] = useState<{
    kind: 'idle' | 'saving' | 'saved' | 'error' | 'conflict';
    text?: string;
    latest?: number;
  }>({ kind: 'idle' });
  const [ready, setReady] = useState(false);
  // The last deleted cell and where it was, until it is restored or another cell is deleted.
  const [deleted, setDeleted] = useState<{ cell: Cell; index: number } | null>(null);
  const [arranged, setArranged] = useState('');
  const focusRequest = useRef<FocusRequest | null>(null);
  const undoButton = useRef<HTMLButtonElement>(null);
  const discardedNote = useRef<HTMLParagraphElement>(null);
  const messageField = useRef<HTMLInputElement>(null);

  // Restore a draft kept in this browser: only one based on the version we start from (or later)
  // that differs from it.
  useEffect(() => {
    const draft = readDraft(localStorage, sheetId, base);
    if (draft) {
      setContent(draft.content);
      setParentNumber(draft.parentNumber);
      setDraftNotice('restored');
    }
    setReady(true);
  }, [sheetId, base]);

  useEffect(() => {
    if (ready) keepDraft(localStorage, sheetId, { parentNumber, content }, saved);
  }, [ready, sheetId, parentNumber, content, saved]);

  /** Throws the kept draft away and shows the saved version the edits were based on. */
  function discardEdits() {
    discardDraft(localStorage, sheetId);
    setContent(saved.content);
    setParentNumber(saved.number);
    setDeleted(null);
    setDraftNotice('discarded');
  }
  useEffect(() => {
    if (draftNotice === 'discarded') discardedNote.current?.focus();
  }, [draftNotice]);

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

  // Each calculation cell's errors in words: the cell's editor is described by them, and a live region
  // announces the new ones once they have stayed the same for a moment.
  const errorsById = useMemo(() => {
    const byId = new Map<string, CellErrorLine[]>();
    content.cells.forEach((cell, i) => {
      const r = resultById.get(cell.id);
      if (cell.kind !== 'calc' || !r) return;
      const lines = r.statements.flatMap((s) =>
        s.error
          ? [
              {
                key: `${cell.id}:${s.line}:${s.error}`,
                text: `Cell ${i + 1}, line ${s.line}: ${s.error.replace(/`/g, '')}`,
              },
            ]
          : [],
      );
      if (!lines.length && r.error)
        lines.push({ key: `${cell.id}:${r.error}`, text: `Cell ${i + 1}: ${r.error.replace(/`/g, '')}` });
      if (lines.length) byId.set(cell.id, lines);
    });
    return byId;
  }, [content.cells, resultById]);
  const errorsKey = JSON.stringify([...errorsById.values()].flat());
  const [errorAnnouncement, setErrorAnnouncement] = useState('');
  const announcedErrors = useRef<Set<string>>(new Set());
  useEffect(() => {
    const t = setTimeout(() => {
      const now = JSON.parse(errorsKey) as CellErrorLine[];
      const before = announcedErrors.current;
      const fresh = now.filter((e) => !before.has(e.key));
      announcedErrors.current = new Set(now.map((e) => e.key));
      if (fresh.length) setErrorAnnouncement(`Error: ${fresh.map((e) => e.text).join('. ')}`);
      else if (before.size && !now.length) setErrorAnnouncement('No errors left in the cells.');
    }, ANNOUNCE_AFTER_MS);
    return () => clearTimeout(t);
  }, [errorsKey]);

  const update = useCallback((change: (c: VersionContent) => VersionContent) => setContent((c) => change(c)), []);
  const setCell = (i: number, source: string) =>
    update((c) => ({ ...c, cells: c.cells.map((x, j) => (j === i ? { ...x, source } : x)) }));
  const insertCell = (at: number, kind: Cell['kind']) => {
    const id = newCellId(content.cells);
    focusRequest.current = { cellId: id, on: 'source' };
    setArranged(`${kind === 'calc' ? 'Calculation step' : 'Note'} inserted as cell ${at + 1}.`);
    update((c) => ({ ...c, cells: [...c.cells.slice(0, at), { id, kind, source: '' }, ...c.cells.slice(at)] }));
  };
  const removeCell = (i: number) => {
    const cell = content.cells[i];
    if (!cell) return;
    setDeleted({ cell, index: i });
    setArranged(`Cell ${i + 1} deleted.`);
    update((c) => ({ ...c, cells: c.cells.filter((x) => x.id !== cell.id) }));
  };
  /** Puts the last deleted cell back where it was (its id again, unless a new cell took it meanwhile). */
  const undoDelete = () => {
    if (!deleted) return;
    const at = Math.min(deleted.index, content.cells.length);
    const taken = content.cells.some((x) => x.id === deleted.cell.id);
    const cell = taken ? { ...deleted.cell, id: newCellId(content.cells) } : deleted.cell;
    focusRequest.current = { cellId: cell.id, on: 'source' };
    setDeleted(null);
    setArranged(`Cell ${at + 1} restored.`);
    update((c) => ({ ...c, cells: [...c.cells.slice(0, at), cell, ...c.cells.slice(at)] }));
  };
  const moveCell = (i: number, by: -1 | 1) => {
    const j = i + by;
    if (j < 0 || j >= content.cells.length) return;
    focusRequest.current = { cellId: content.cells[i].id, on: 'actions' };
    setArranged(`Cell ${i + 1} moved ${by < 0 ? 'up' : 'down'}; it is now cell ${j + 1}.`);
    update((c) => {
      const cells = [...c.cells];
      [cells[i], cells[j]] = [cells[j], cells[i]];
      return { ...c, cells };
    });
  };

  // After an insert, a move or an undo the focus goes to that cell (a moved node loses the focus);
  // after a delete, to the Undo button that stands in its place.
  useEffect(() => {
    const request = focusRequest.current;
    if (!request) return;
    focusRequest.current = null;
    const article = document.getElementById(`cell-${request.cellId}`);
    const target =
      request.on === 'actions'
        ? article?.querySelector<HTMLElement>('button[aria-haspopup="menu"]')
        : article?.querySelector<HTMLElement>('.cm-content, textarea');
    target?.focus();
  }, [content.cells]);
  useEffect(() => {
    if (deleted) undoButton.current?.focus();
  }, [deleted]);

  // The Save button is disabled while saving and after (the summary is emptied), which drops its focus
  // on the page: the focus then goes to what became of the save. A save by Ctrl+S from a cell leaves
  // the focus in the cell.
  const statusBox = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (status.kind !== 'saved' && status.kind !== 'conflict' && status.kind !== 'error') return;
    const active = document.activeElement;
    if (!active || active === document.body) statusBox.current?.focus();
  }, [status]);

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
    // The saved content is the version now: nothing is left to keep as a draft.
    setSaved({ number: answer.number, content });
    setParentNumber(answer.number);
    setMessage('');
    setDraftNotice(null);
    setDeleted(null);
    setStatus({ kind: 'saved', text: `Saved as version ${answer.number}.` });
  }

  // Ctrl+S (⌘S on a Mac) anywhere in the editor saves, as the Save button does, instead of the
  // browser's own "save page". Without a summary of the change, it asks for one there.
  const saveFromKeyboard = useRef<() => void>(() => undefined);
  saveFromKeyboard.current = () => {
    if (status.kind === 'saving') return;
    if (!message.trim()) {
      setStatus({ kind: 'error', text: 'Say what changed, then save.' });
      messageField.current?.focus();
      return;
    }
    void save();
  };
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if ((e.ctrlKey || e.metaKey) && !e.altKey && !e.shiftKey && e.key.toLowerCase() === 's') {
        e.preventDefault();
        saveFromKeyboard.current();
      }
    };
    document.addEventListener('keydown', onKey);
    return () => document.removeEventListener('keydown', onKey);
  }, []);

  /** Keeps the edits and bases them on the latest version; the next save records that. */
  function carryOver() {
    if (status.latest) setParentNumber(status.latest);
    setStatus({ kind: 'idle', text: undefined });
  }

  const insertItems = (at: number) => KINDS.map(({ kind, label }) => ({ label, onSelect: () => insertCell(at, kind) }));
  const undoLine = deleted ? (
    <p className="flex flex-wrap items-center gap-3 rounded border border-dashed border-rule-strong px-3 py-2 text-sm">
      <span id="cell-deleted-note">Cell {deleted.index + 1} deleted.</span>
      <button
        ref={undoButton}
        type="button"
        onClick={undoDelete}
        aria-describedby="cell-deleted-note"
        className={secondaryButton}
      >
        Undo
      </button>
    </p>
  ) : null;

  const record = content.record;
  const setRecord = (patch: Partial<VersionContent['record']>) =>
    update((c) => ({ ...c, record: { ...c.record, ...patch } }));

  return (
    <div className="space-y-6">
      {draftNotice === 'restored' ? (
        <div
          role="status"
          className="flex flex-wrap items-center gap-x-3 gap-y-2 rounded border border-caution-rule bg-caution-soft px-3 py-2 text-sm text-caution"
        >
          <p>Unsaved edits from this browser were restored (based on version {parentNumber}).</p>
          <button type="button" onClick={discardEdits} className={secondaryButton}>
            Discard my edits
          </button>
        </div>
      ) : null}
      {draftNotice === 'discarded' ? (
        <p
          ref={discardedNote}
          tabIndex={-1}
          role="status"
          className="rounded border border-rule bg-surface px-3 py-2 text-sm focus:outline-3 focus:outline-focus"
        >
          Your edits were discarded: this is version {parentNumber} as saved.
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
        {/* What the editor says about arranging cells and about the cells' errors, for screen readers. */}
        <p role="status" className="sr-only">
          {arranged}
        </p>
        <p role="status" aria-label="Errors in the cells" className="sr-only">
          {errorAnnouncement}
        </p>
        {content.cells.length === 0 ? (
          <MenuButton label="Add to the sheet" items={insertItems(0)} className={secondaryButton}>
            Add to the sheet…
          </MenuButton>
        ) : null}
        {content.cells.map((cell, i) => {
          const result = resultById.get(cell.id);
          const label = cellLabel(cell, i);
          const errors = errorsById.get(cell.id);
          const errorsId = `cell-${cell.id}-errors`;
          return (
            <Fragment key={cell.id}>
              {deleted && deleted.index === i ? undoLine : null}
              <article
                id={`cell-${cell.id}`}
                aria-label={label}
                className={`rounded border bg-surface p-3 ${result && !result.ok ? 'border-fail' : 'border-rule'}`}
              >
                <div className="mb-2 flex flex-wrap items-center gap-2 text-xs">
                  <span className="font-semibold text-ink-muted">{label}</span>
                  <span className="ml-auto">
                    <MenuButton
                      label={`Cell ${i + 1} actions`}
                      align="end"
                      items={[
                        { label: 'Move up', onSelect: () => moveCell(i, -1), disabled: i === 0 },
                        {
                          label: 'Move down',
                          onSelect: () => moveCell(i, 1),
                          disabled: i === content.cells.length - 1,
                        },
                        { label: 'Delete', onSelect: () => removeCell(i) },
                      ]}
                    >
                      Actions <span aria-hidden="true">▾</span>
                    </MenuButton>
                  </span>
                </div>
                {errors ? (
                  <p id={errorsId} className="sr-only">
                    {errors.map((e) => e.text).join('. ')}
                  </p>
                ) : null}
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
                    lineErrors={result?.statements.flatMap((s) =>
                      s.error ? [{ line: s.line, message: s.error }] : [],
                    )}
                    describedBy={errors ? errorsId : undefined}
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
                  <div className="mt-2">
                    {result.statements.map((s) => (
                      <StatementView
                        key={`${s.line}:${s.source}`}
                        statement={s}
                        significantFigures={content.significantFigures}
                        quietErrors
                      />
                    ))}
                  </div>
                ) : null}
                <div className="mt-2">
                  <MenuButton label={`Insert below cell ${i + 1}`} items={insertItems(i + 1)}>
                    Insert below…
                  </MenuButton>
                </div>
              </article>
            </Fragment>
          );
        })}
        {deleted && deleted.index >= content.cells.length ? undoLine : null}
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
        <input
          id="ed-message"
          ref={messageField}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
          className={inputClass}
        />
        <button
          type="button"
          onClick={save}
          disabled={!message.trim() || status.kind === 'saving'}
          className={primaryButton}
        >
          {status.kind === 'saving' ? 'Saving…' : 'Save version'}
        </button>
        <div
          ref={statusBox}
          tabIndex={-1}
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
