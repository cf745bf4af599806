'use client';

import { useRouter } from 'next/navigation';
import { useEffect, useId, useRef, useState } from 'react';
import { api, ApiError, detail, errorText } from '@/components/data/api-client';
import { primaryButton } from '@/components/ui/button';
import { Field, inputClass, PasswordField } from '@/components/ui/field';

export interface CheckerOption {
  userId: string;
  name: string;
  eligible: boolean;
  reason: string | null;
}

/** An item the server asks to be acknowledged in writing (lib/checks/submission-findings.ts). */
interface Finding {
  key: string;
  kind: string;
  message: string;
}

const KIND_LABELS: Record<string, string> = {
  'cell-error': 'Cell error',
  'criterion-failed': 'Failed design criterion',
  'lint-warning': 'Engine warning',
  'design-input': 'Design input does not match the sheet',
};

type Status = { kind: 'idle' | 'busy' } | { kind: 'done'; text: string } | { kind: 'error'; text: string };

/**
 * The originator submits one exact version to a named checker. Submitting signs the version as
 * "prepared", so the password is asked again. Checkers the independence rules exclude are listed,
 * disabled, with the reason; the server applies the same rules again.
 */
export function SubmitForCheckForm({
  sheetId,
  versions,
  checkers: latestCheckers,
  checkersByVersion,
  findingsByVersion,
  blocked,
}: {
  sheetId: string;
  /** The versions that may be submitted, newest first. */
  versions: number[];
  checkers: CheckerOption[];
  /** Each submittable version's checkers with their eligibility, which depends on who changed what up to it. */
  checkersByVersion?: Record<number, CheckerOption[]>;
  /** What each version needs acknowledged in writing (cell errors, failed criteria, engine warnings, mismatched design inputs), shown before submitting. */
  findingsByVersion?: Record<number, Finding[]>;
  /** Why nothing can be submitted now (an open check, an approved latest version), or null. */
  blocked: string | null;
}) {
  const id = useId();
  const router = useRouter();
  const [status, setStatus] = useState<Status>({ kind: 'idle' });
  // After a submission the form is gone (the version is in check): the focus goes to what became of it.
  const statusBox = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (status.kind === 'done') statusBox.current?.focus();
  }, [status]);
  const [version, setVersion] = useState<number | undefined>(versions[0]);
  const [needed, setNeeded] = useState<{ version: number; items: Finding[] } | null>(null);
  // The server's list after a refusal wins (it is the one it will check); before that, the page's.
  const items =
    needed && needed.version === version
      ? needed.items
      : version !== undefined
        ? (findingsByVersion?.[version] ?? [])
        : [];
  const checkers = (version !== undefined ? checkersByVersion?.[version] : undefined) ?? latestCheckers;
  const ineligible = checkers.filter((c) => !c.eligible);
  const anyEligible = checkers.some((c) => c.eligible);

  async function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    const versionNumber = Number(data.get('versionNumber'));
    const checkerId = String(data.get('checkerId') ?? '');
    setStatus({ kind: 'busy' });
    let answer;
    try {
      answer = await api.submitForCheck(sheetId, {
        versionNumber,
        checkerId,
        password: String(data.get('password') ?? ''),
        acknowledgements: items.map((f) => ({ key: f.key, text: String(data.get(`ack:${f.key}`) ?? '') })),
      });
    } catch (error) {
      const asked =
        error instanceof ApiError ? (detail(error, 'acknowledgementsNeeded') as Finding[] | undefined) : undefined;
      if (error instanceof ApiError && error.status !== null && asked) {
        setNeeded({ version: versionNumber, items: asked });
        setStatus({
          kind: 'error',
          text: `${error.message} Write an acknowledgement for each item below, then submit again.`,
        });
        return;
      }
      // The message says what is wrong in words; a wrong password sends the person back to the field.
      if (error instanceof ApiError && detail(error, 'rule') === 'password') {
        const field = form.elements.namedItem('password');
        if (field instanceof HTMLInputElement) {
          field.value = '';
          field.focus();
        }
      }
      setStatus({
        kind: 'error',
        text: errorText(error, 'The server could not be reached; nothing was submitted.'),
      });
      return;
    }
    form.reset();
    setNeeded(null);
    const checker = checkers.find((c) => c.userId === checkerId)?.name ?? 'the checker';
    setStatus({
      kind: 'done',
      text: `Version ${answer.versionNumber} is submitted to ${checker} for check and signed as prepared.`,
    });
    router.refresh();
  }

  return (
    <div className="space-y-3">
      {blocked ? <p className="text-sm text-ink-muted">{blocked}</p> : null}
      {!blocked ? (
        <form onSubmit={submit} className="space-y-3" aria-describedby={`${id}-status`}>
          <Field label="Version" id={`${id}-version`}>
            {(control) => (
              <select
                {...control}
                name="versionNumber"
                value={version}
                onChange={(e) => setVersion(Number(e.target.value))}
                className={inputClass}
              >
                {versions.map((v, i) => (
                  <option key={v} value={v}>
                    Version {v}
                    {i === 0 ? ' (latest)' : ''}
                  </option>
                ))}
              </select>
            )}
          </Field>
          <div>
            <label htmlFor={`${id}-checker`} className="block text-sm font-semibold">
              Checker
            </label>
            <select
              key={version}
              id={`${id}-checker`}
              name="checkerId"
              required
              defaultValue=""
              aria-describedby={ineligible.length ? `${id}-ineligible` : undefined}
              className={inputClass}
            >
              <option value="" disabled>
                {anyEligible ? 'Choose a checker' : 'No eligible checker'}
              </option>
              {checkers.map((c) => (
                <option key={c.userId} value={c.userId} disabled={!c.eligible}>
                  {c.name}
                  {c.eligible ? '' : ' (not eligible)'}
                </option>
              ))}
            </select>
            {ineligible.length ? (
              <ul id={`${id}-ineligible`} className="mt-1 space-y-1 text-xs text-ink-muted">
                {ineligible.map((c) => (
                  <li key={c.userId}>
                    <span className="font-semibold text-ink">{c.name}</span> is not eligible: {c.reason}
                  </li>
                ))}
              </ul>
            ) : null}
            {checkers.length === 0 ? (
              <p className="mt-1 text-xs text-ink-muted">
                The project has no checker; an administrator gives the checker role.
              </p>
            ) : null}
          </div>
          {items.length ? (
            <fieldset className="space-y-2 rounded border border-fail px-3 py-2">
              <legend className="px-1 text-sm font-semibold text-fail">
                Acknowledge in writing before submitting ({items.length})
              </legend>
              <p className="text-xs text-ink-muted">
                Each acknowledgement goes with the version to the checker, the approver and the issued PDF, and cannot
                be changed after submission.
              </p>
              {items.map((f, i) => (
                <Field
                  key={f.key}
                  label={
                    <>
                      <span className="font-semibold">{KIND_LABELS[f.kind] ?? f.kind}:</span> {f.message}
                    </>
                  }
                  id={`${id}-ack-${i}`}
                  labelClassName="block text-sm"
                >
                  {(control) => (
                    <textarea
                      {...control}
                      name={`ack:${f.key}`}
                      required
                      rows={2}
                      maxLength={5000}
                      className="w-full rounded border border-rule-strong bg-surface px-3 py-2 text-sm"
                    />
                  )}
                </Field>
              ))}
            </fieldset>
          ) : null}
          <PasswordField label="Your password (signs as prepared)" id={`${id}-password`} />
          <button type="submit" disabled={status.kind === 'busy' || !anyEligible} className={primaryButton}>
            {status.kind === 'busy' ? 'Submitting…' : 'Submit for check'}
          </button>
        </form>
      ) : null}
      <div
        ref={statusBox}
        tabIndex={-1}
        id={`${id}-status`}
        role={status.kind === 'error' ? 'alert' : 'status'}
        aria-live="polite"
        className="text-sm"
      >
        {status.kind === 'error' ? <p className="rounded bg-fail-soft px-3 py-2 text-fail">{status.text}</p> : null}
        {status.kind === 'done' ? <p className="text-pass">{status.text}</p> : null}
      </div>
    </div>
  );
}
