'use client';

import { useRouter } from 'next/navigation';
import { useEffect, useId, useRef, useState } from 'react';
import { api, errorText } from '@/components/data/api-client';
import { UtcTime } from '@/components/ui/utc-time';
import type { CheckDetail } from '@/lib/checks/queries';
import { VisibleText } from '@/components/data/visible-text';
import { revealBidiControls } from '@/lib/calc/bidi-controls';
import { Field } from '@/components/ui/field';
import { secondaryButton, smallPrimaryButton } from '@/components/ui/button';

export type Thread = CheckDetail['threads'][number];

/** After a form closes, focus goes back to the button that opened it (rather than to the page). */
function useFocusOnClose(open: boolean) {
  const button = useRef<HTMLButtonElement>(null);
  const wasOpen = useRef(open);
  useEffect(() => {
    if (wasOpen.current && !open) button.current?.focus();
    wasOpen.current = open;
  }, [open]);
  return button;
}

/** Sends one request to the check's comment routes; answers the server's message on failure. */
async function send(request: () => Promise<unknown>): Promise<string | null> {
  try {
    await request();
    return null;
  } catch (error) {
    return errorText(error);
  }
}

function Comments({ thread }: { thread: Thread }) {
  return (
    <ol className="space-y-2">
      {thread.comments.map((c) => (
        <li key={c.id} className="text-sm">
          <p className="text-xs text-ink-muted">
            <span className="font-semibold text-ink">{c.author}</span> · <UtcTime iso={c.createdAt} />
          </p>
          <p className="whitespace-pre-wrap">
            <VisibleText text={c.body} />
          </p>
        </li>
      ))}
    </ol>
  );
}

function where(thread: Thread, versionNumber: number): string {
  const line = thread.statementLine ? `Line ${thread.statementLine}` : 'Whole cell';
  return thread.openedOnVersion !== versionNumber
    ? `${line} · opened at the check of version ${thread.openedOnVersion}`
    : line;
}

/** One open thread: its comments, a reply form, and (for the checker) Resolve. */
function OpenThread({
  checkId,
  thread,
  versionNumber,
  canReply,
  canResolve,
}: {
  checkId: string;
  thread: Thread;
  versionNumber: number;
  canReply: boolean;
  canResolve: boolean;
}) {
  const id = useId();
  const router = useRouter();
  const [replying, setReplying] = useState(false);
  const replyButton = useFocusOnClose(replying);
  const [body, setBody] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function reply(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    const problem = await send(() => api.addComment(checkId, { cellId: thread.cellId, threadId: thread.id, body }));
    setBusy(false);
    setError(problem);
    if (!problem) {
      setBody('');
      setReplying(false);
      router.refresh();
    }
  }

  async function resolve() {
    setBusy(true);
    const problem = await send(() => api.resolveComment(checkId, thread.id, { resolved: true }));
    setBusy(false);
    setError(problem);
    if (!problem) router.refresh();
  }

  return (
    <li className="rounded border border-caution-rule bg-surface p-3">
      <p className="mb-2 text-xs font-bold text-caution">Open thread · {where(thread, versionNumber)}</p>
      <Comments thread={thread} />
      {replying ? (
        <form onSubmit={reply} className="mt-2 space-y-2">
          <label htmlFor={`${id}-reply`} className="block text-sm font-semibold">
            Your reply
          </label>
          <textarea
            id={`${id}-reply`}
            autoFocus
            required
            rows={3}
            value={body}
            onChange={(e) => setBody(e.target.value)}
            className="w-full rounded border border-rule-strong bg-surface px-3 py-2 text-sm"
          />
          <div className="flex gap-2">
            <button type="submit" disabled={busy || !body.trim()} className={`${smallPrimaryButton} text-sm`}>
              Send the reply
            </button>
            <button
              type="button"
              onClick={() => setReplying(false)}
              className="rounded border border-rule-strong px-3 py-1.5 text-sm font-semibold"
            >
              Cancel
            </button>
          </div>
        </form>
      ) : canReply || canResolve ? (
        <div className="mt-2 flex gap-2">
          {canReply ? (
            <button ref={replyButton} type="button" onClick={() => setReplying(true)} className={secondaryButton}>
              Reply
            </button>
          ) : null}
          {canResolve ? (
            <button
              type="button"
              onClick={resolve}
              disabled={busy}
              className="rounded border border-pass bg-pass-soft px-3 py-1.5 text-sm font-semibold text-pass disabled:opacity-60"
            >
              Resolve
            </button>
          ) : null}
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="mt-2 rounded bg-fail-soft px-2 py-1 text-sm text-fail">
          {error}
        </p>
      ) : null}
    </li>
  );
}

/**
 * The comment threads anchored to one cell: open threads in full, resolved ones folded; the
 * checker opens a thread on the cell or one of its statement lines; checker and originator reply.
 */
export function CellThreads({
  checkId,
  cellId,
  cellLabel,
  lines,
  threads,
  versionNumber,
  canOpen,
  canReply,
  canResolve,
}: {
  checkId: string;
  cellId: string;
  /** "cell 2 (rigidity)": says which cell in labels. */
  cellLabel: string;
  /** The cell's source lines, for anchoring a comment to one statement. */
  lines: Array<{ line: number; text: string }>;
  threads: Thread[];
  versionNumber: number;
  canOpen: boolean;
  canReply: boolean;
  canResolve: boolean;
}) {
  const id = useId();
  const router = useRouter();
  const [opening, setOpening] = useState(false);
  const openButton = useFocusOnClose(opening);
  const [body, setBody] = useState('');
  const [line, setLine] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const open = threads.filter((t) => !t.resolvedAt);
  const resolved = threads.filter((t) => t.resolvedAt);
  if (threads.length === 0 && !canOpen) return null;

  async function add(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    const problem = await send(() =>
      api.addComment(checkId, { cellId, statementLine: line ? Number(line) : null, body }),
    );
    setBusy(false);
    setError(problem);
    if (!problem) {
      setBody('');
      setLine('');
      setOpening(false);
      router.refresh();
    }
  }

  return (
    <section aria-label={`Comments on ${cellLabel}`} className="mt-3 space-y-2 border-t border-rule pt-3">
      {open.length ? (
        <ul className="space-y-2">
          {open.map((t) => (
            <OpenThread
              key={t.id}
              checkId={checkId}
              thread={t}
              versionNumber={versionNumber}
              canReply={canReply}
              canResolve={canResolve}
            />
          ))}
        </ul>
      ) : null}
      {resolved.map((t) => (
        <details key={t.id} className="rounded border border-rule bg-paper px-3 py-2">
          <summary className="cursor-pointer text-sm text-ink-muted">
            Resolved thread · {where(t, versionNumber)} · resolved by {t.resolvedBy} ({t.comments.length} comment
            {t.comments.length === 1 ? '' : 's'})
          </summary>
          <div className="mt-2">
            <Comments thread={t} />
          </div>
        </details>
      ))}
      {canOpen && !opening ? (
        <button ref={openButton} type="button" onClick={() => setOpening(true)} className={secondaryButton}>
          Comment on this cell
        </button>
      ) : null}
      {canOpen && opening ? (
        <form onSubmit={add} className="space-y-2 rounded border border-rule bg-paper p-3">
          {lines.length > 0 ? (
            <Field label="Statement line (optional)" id={`${id}-line`}>
              {(control) => (
                <select
                  {...control}
                  autoFocus
                  value={line}
                  onChange={(e) => setLine(e.target.value)}
                  className="w-full rounded border border-rule-strong bg-surface px-3 py-2 font-mono text-sm"
                >
                  <option value="">The whole cell</option>
                  {lines.map((l) => (
                    <option key={l.line} value={l.line}>
                      Line {l.line}: {revealBidiControls(l.text.length > 60 ? `${l.text.slice(0, 59)}…` : l.text)}
                    </option>
                  ))}
                </select>
              )}
            </Field>
          ) : null}
          <Field label="Comment" id={`${id}-body`}>
            {(control) => (
              <textarea
                {...control}
                autoFocus={lines.length === 0}
                required
                rows={3}
                value={body}
                onChange={(e) => setBody(e.target.value)}
                className="w-full rounded border border-rule-strong bg-surface px-3 py-2 text-sm"
              />
            )}
          </Field>
          <div className="flex gap-2">
            <button type="submit" disabled={busy || !body.trim()} className={`${smallPrimaryButton} text-sm`}>
              Add the comment
            </button>
            <button type="button" onClick={() => setOpening(false)} className={secondaryButton}>
              Cancel
            </button>
          </div>
        </form>
      ) : null}
      {error ? (
        <p role="alert" className="rounded bg-fail-soft px-2 py-1 text-sm text-fail">
          {error}
        </p>
      ) : null}
    </section>
  );
}
