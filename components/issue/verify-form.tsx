'use client';

import { useEffect, useRef, useState } from 'react';
import type { VerificationAnswer } from '@/lib/issue/verification';
import { api, errorText } from '@/components/data/api-client';
import { VisibleText } from '@/components/data/visible-text';
import { primaryButton } from '@/components/ui/button';

/** Upload a PDF or type a verification code; the server says whether it is an authentic issued revision. */
export function VerifyForm() {
  const [answer, setAnswer] = useState<VerificationAnswer | null>(null);
  const [state, setState] = useState<{ kind: 'idle' | 'busy' | 'error'; message?: string }>({ kind: 'idle' });
  // The answer is what the visitor came for: the focus goes to it, so it is read out first.
  const answerBox = useRef<HTMLElement>(null);
  useEffect(() => {
    if (answer) answerBox.current?.focus();
  }, [answer]);

  async function send(request: () => Promise<VerificationAnswer>) {
    setState({ kind: 'busy' });
    setAnswer(null);
    let data: VerificationAnswer;
    try {
      data = await request();
    } catch (error) {
      setState({ kind: 'error', message: errorText(error) });
      return;
    }
    setAnswer(data);
    setState({ kind: 'idle' });
  }

  async function onFile(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = event.currentTarget.elements.namedItem('verify-file') as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) {
      setState({ kind: 'error', message: 'Choose a PDF first.' });
      return;
    }
    await send(() => api.verifyFile(file));
  }

  async function onCode(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const code = (event.currentTarget.elements.namedItem('verify-code') as HTMLInputElement).value;
    await send(() => api.verifyCode(code));
  }

  const r = answer?.revision;
  return (
    <div className="space-y-6">
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <form onSubmit={onFile} className="space-y-2 rounded border border-rule bg-surface p-4">
          <h2 className="text-lg font-bold">Check a PDF</h2>
          <label htmlFor="verify-file" className="block text-sm font-semibold">
            The PDF you were given
          </label>
          <input id="verify-file" name="verify-file" type="file" accept="application/pdf,.pdf" className="text-sm" />
          <button type="submit" disabled={state.kind === 'busy'} className={`block ${primaryButton}`}>
            Check the file
          </button>
          <p className="text-xs text-ink-muted">
            The file is compared by its SHA-256 with the register, and its embedded signature is checked. It is not
            kept.
          </p>
        </form>
        <form onSubmit={onCode} className="space-y-2 rounded border border-rule bg-surface p-4">
          <h2 className="text-lg font-bold">Look up a verification code</h2>
          <label htmlFor="verify-code" className="block text-sm font-semibold">
            Verification code (printed on every issued PDF)
          </label>
          <input
            id="verify-code"
            name="verify-code"
            autoComplete="off"
            spellCheck={false}
            aria-describedby="verify-code-hint"
            className="w-full rounded border border-rule-strong bg-surface px-3 py-2 font-mono"
          />
          <p id="verify-code-hint" className="text-xs text-ink-muted">
            Three groups of four letters and digits joined by hyphens, as printed in the PDF&apos;s title block.
          </p>
          <button type="submit" disabled={state.kind === 'busy'} className={primaryButton}>
            Look it up
          </button>
        </form>
      </div>
      <div aria-live="polite">
        {state.kind === 'busy' ? <p role="status">Checking…</p> : null}
        {state.kind === 'error' ? (
          <p role="alert" className="rounded bg-fail-soft px-3 py-2 text-fail">
            {state.message}
          </p>
        ) : null}
        {answer ? (
          <section
            ref={answerBox}
            tabIndex={-1}
            aria-labelledby="verify-answer"
            className={`space-y-3 rounded border-2 p-4 ${answer.authentic && r?.status === 'current' ? 'border-pass bg-pass-soft' : answer.authentic ? 'border-caution-rule bg-caution-soft' : 'border-fail bg-fail-soft'}`}
          >
            <h2 id="verify-answer" className="text-lg font-bold">
              {answer.authentic && answer.checks.stampedCopy
                ? `Authentic stamped copy of revision ${r?.revision}, ${r?.status}`
                : answer.authentic
                  ? r?.status === 'current'
                    ? 'Authentic and current'
                    : `Authentic, but ${r?.status}`
                  : 'Not an authentic issued revision'}
            </h2>
            <p>{answer.summary}</p>
            {r ? (
              <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[12rem_minmax(0,1fr)]">
                <dt className="font-semibold">Sheet</dt>
                <dd>
                  {r.sheet} — <VisibleText text={r.title} />
                </dd>
                <dt className="font-semibold">Revision</dt>
                <dd>
                  {r.revision} (
                  {r.status === 'superseded' && r.supersededBy ? `superseded by revision ${r.supersededBy}` : r.status}
                  {r.withdrawnReason ? `: ${r.withdrawnReason}` : ''})
                </dd>
                <dt className="font-semibold">Issued (UTC)</dt>
                <dd>{r.issuedAt.slice(0, 19).replace('T', ' ')}</dd>
                <dt className="font-semibold">Issued by</dt>
                <dd>{r.legalOwner}</dd>
                <dt className="font-semibold">Version and its SHA-256</dt>
                <dd className="break-all font-mono text-xs">
                  {r.versionNumber} · {r.versionSha256}
                </dd>
                <dt className="font-semibold">SHA-256 of the issued PDF</dt>
                <dd className="break-all font-mono text-xs">{r.pdfSha256}</dd>
              </dl>
            ) : null}
            {answer.sha256 ? (
              <ul className="text-sm">
                <li>
                  SHA-256 of your file: <span className="break-all font-mono text-xs">{answer.sha256}</span>
                </li>
                <li>In the register: {answer.checks.hashInRegister ? 'yes' : 'no'}</li>
                <li>
                  Embedded signature:{' '}
                  {answer.checks.signatureValid === null
                    ? 'none'
                    : answer.checks.signatureValid
                      ? 'valid, covering the whole file'
                      : 'not valid'}
                </li>
                <li>
                  Signed by the organisation&apos;s certificate:{' '}
                  {answer.checks.signedByOrganisation === null
                    ? '—'
                    : answer.checks.signedByOrganisation
                      ? 'yes'
                      : 'no'}
                </li>
                {answer.checks.stampedCopy ? (
                  <li>
                    This is a stamped copy made for reading: the issued original, byte for byte, with a stamp added
                    after it and signed by document control (the original&apos;s signature still verifies).
                  </li>
                ) : null}
              </ul>
            ) : null}
          </section>
        ) : null}
      </div>
    </div>
  );
}
