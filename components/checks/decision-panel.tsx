'use client';

import { useRouter } from 'next/navigation';
import { useEffect, useId, useRef, useState } from 'react';
import { api, errorText } from '@/components/data/api-client';
import type { Decision } from '@/lib/checks/workflow';
import { primaryButton } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';

type Action = Decision['action'];
// Each outcome belongs to the form that asked for it and is shown under that form, not under another.
type Outcome =
  | { kind: 'idle' }
  | { kind: 'busy'; action: Action }
  | { kind: 'done'; action: Action; text: string }
  | { kind: 'error'; action: Action; text: string };

const DONE: Record<Action, string> = {
  return: 'Returned to the originator with comments.',
  sign: 'Signed as checked. The version now awaits approval.',
  approve: 'Approved. Document control can now issue it as a revision.',
  reject: 'Returned to the originator.',
};

/**
 * The decisions the server allows the person looking (`actions`): the checker returns the version
 * with comments or signs it as checked; an approver approves it or returns it to the originator.
 * Signing asks for the password again and says what the signature means.
 */
export function DecisionPanel({
  checkId,
  actions,
  versionNumber,
  sha256,
  signWaitsFor,
}: {
  checkId: string;
  actions: Action[];
  versionNumber: number;
  sha256: string;
  /** What signing as checked still waits for, in the server's words (the check policy's answer). */
  signWaitsFor: string[];
}) {
  const id = useId();
  const router = useRouter();
  const [outcome, setOutcome] = useState<Outcome>({ kind: 'idle' });
  // After a decision its form is gone (the check moved on): the focus goes to what became of it.
  const done = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (outcome.kind === 'done') done.current?.focus();
  }, [outcome]);

  async function decide(event: React.FormEvent<HTMLFormElement>, action: Action) {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    const body =
      action === 'sign' || action === 'approve'
        ? { action, password: String(data.get('password') ?? '') }
        : { action, reason: String(data.get('reason') ?? '') };
    setOutcome({ kind: 'busy', action });
    try {
      await api.decide(checkId, body);
    } catch (error) {
      setOutcome({
        kind: 'error',
        action,
        text: errorText(error, 'The server could not be reached; nothing was decided.'),
      });
      const field = form.elements.namedItem(action === 'sign' || action === 'approve' ? 'password' : 'reason');
      if (field instanceof HTMLInputElement || field instanceof HTMLTextAreaElement) field.focus();
      return;
    }
    form.reset();
    setOutcome({ kind: 'done', action, text: DONE[action] });
    router.refresh();
  }

  const busy = outcome.kind === 'busy';
  /** A refusal of `action`'s request, under its own form (not under another form's). */
  const outcomeOf = (action: Action) => (
    <div id={`${id}-${action}-outcome`} aria-live="assertive" className="text-sm">
      {outcome.kind === 'error' && outcome.action === action ? (
        <p role="alert" className="rounded bg-fail-soft px-3 py-2 text-fail">
          {outcome.text}
        </p>
      ) : null}
    </div>
  );

  const meaning = (word: string) => (
    <p className="text-xs text-ink-muted">
      Meaning of your signature: <strong className="text-ink">{word}</strong>. It binds to version {versionNumber},
      SHA-256 <span className="font-mono break-all">{sha256}</span>.
    </p>
  );
  const reasonForm = (action: 'return' | 'reject', title: string, label: string, button: string) => (
    <form onSubmit={(e) => decide(e, action)} className="space-y-2" aria-labelledby={`${id}-${action}`}>
      <h3 id={`${id}-${action}`} className="text-sm font-bold">
        {title}
      </h3>
      <label htmlFor={`${id}-${action}-reason`} className="block text-sm font-semibold">
        {label}
      </label>
      <textarea
        id={`${id}-${action}-reason`}
        name="reason"
        required
        rows={3}
        className="w-full rounded border border-rule-strong bg-surface px-3 py-2 text-sm"
      />
      <button
        type="submit"
        disabled={busy}
        className="rounded border border-rule-strong bg-surface px-4 py-2 font-semibold text-ink hover:bg-paper disabled:opacity-60"
      >
        {button}
      </button>
      {outcomeOf(action)}
    </form>
  );
  const signForm = (
    action: 'sign' | 'approve',
    title: string,
    word: string,
    button: string,
    note?: React.ReactNode,
  ) => (
    <form onSubmit={(e) => decide(e, action)} className="space-y-2" aria-labelledby={`${id}-${action}`}>
      <h3 id={`${id}-${action}`} className="text-sm font-bold">
        {title}
      </h3>
      {meaning(word)}
      {note}
      <label htmlFor={`${id}-${action}-password`} className="block text-sm font-semibold">
        Your password (signs as {word.toLowerCase()})
      </label>
      <input
        id={`${id}-${action}-password`}
        name="password"
        type="password"
        required
        autoComplete="current-password"
        className={inputClass}
      />
      <button type="submit" disabled={busy} className={primaryButton}>
        {button}
      </button>
      {outcomeOf(action)}
    </form>
  );

  const signNote = signWaitsFor.length ? (
    <ul className="list-disc pl-5 text-xs text-caution">
      {signWaitsFor.map((reason) => (
        <li key={reason}>{reason}</li>
      ))}
    </ul>
  ) : null;

  return (
    <div className="space-y-4">
      {actions.includes('sign') ? signForm('sign', 'Sign as checked', 'Checked', 'Sign as checked', signNote) : null}
      {actions.includes('return')
        ? reasonForm('return', 'Return with comments', 'Reason for returning', 'Return with comments')
        : null}
      {actions.includes('approve') ? signForm('approve', 'Approve', 'Approved', 'Approve') : null}
      {actions.includes('reject')
        ? reasonForm('reject', 'Return to originator', 'Reason for not approving', 'Return to originator')
        : null}
      <div ref={done} tabIndex={-1} role="status" aria-live="polite" className="text-sm">
        {outcome.kind === 'done' ? <p className="rounded bg-pass-soft px-3 py-2 text-pass">{outcome.text}</p> : null}
      </div>
    </div>
  );
}
