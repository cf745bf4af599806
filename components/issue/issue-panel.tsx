'use client';

import { useRouter } from 'next/navigation';
import { useEffect, useRef, useState } from 'react';
import useSWR from 'swr';
import { api, errorText } from '@/components/data/api-client';
import { primaryButton } from '@/components/ui/button';
import { Field } from '@/components/ui/field';

const STEPS = ['queued', 'rendering', 'signing', 'storing', 'recording', 'done'] as const;
const STEP_LABELS: Record<string, string> = {
  queued: 'Waiting for the issuing service',
  rendering: 'Typesetting the PDF',
  signing: 'Signing it with the organisation\u2019s certificate',
  storing: 'Storing it',
  recording: 'Recording the revision',
  done: 'Issued',
};

/**
 * Document control issues an approved version as the next revision: the password signs it
 * ("issued"), then the progress of the job shows until the signed PDF is stored and recorded.
 */
export function IssuePanel({
  sheetId,
  approvedVersions,
  nextRevision,
  pendingJobId = null,
}: {
  sheetId: string;
  approvedVersions: number[];
  nextRevision: string;
  pendingJobId?: string | null;
}) {
  const router = useRouter();
  const [version, setVersion] = useState(approvedVersions[approvedVersions.length - 1] ?? 0);
  const [password, setPassword] = useState('');
  const [jobId, setJobId] = useState<string | null>(pendingJobId);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // Once the request is taken the form gives way to its progress: the focus follows it there.
  const progressBox = useRef<HTMLDivElement>(null);
  const asked = useRef(false);
  useEffect(() => {
    if (jobId && asked.current) progressBox.current?.focus();
  }, [jobId]);
  const { data: job } = useSWR(jobId ? `/api/issuing/${jobId}` : null, () => api.issueJob(jobId!), {
    refreshInterval: (latest) => (latest && latest.state !== 'pending' ? 0 : 700),
    onSuccess: (latest) => {
      if (latest.state === 'done') router.refresh();
    },
  });

  async function issue(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    setError(null);
    let answer;
    try {
      answer = await api.issueRevision(sheetId, { versionNumber: version, password });
    } catch (error) {
      setError(errorText(error));
      return;
    } finally {
      setBusy(false);
      setPassword('');
    }
    asked.current = true;
    setJobId(answer.jobId);
  }

  if (approvedVersions.length === 0 && !jobId) {
    return <p className="text-sm text-ink-muted">No approved version waits to be issued.</p>;
  }
  const stepIndex = job ? STEPS.indexOf(job.step as (typeof STEPS)[number]) : -1;
  return (
    <div className="space-y-3">
      {!jobId || job?.state === 'failed' ? (
        <form onSubmit={issue} className="flex flex-wrap items-end gap-3">
          <Field label="Approved version" id="issue-version">
            {(control) => (
              <select
                {...control}
                value={version}
                onChange={(e) => setVersion(Number(e.target.value))}
                className="rounded border border-rule-strong bg-surface px-2 py-1.5"
              >
                {approvedVersions.map((v) => (
                  <option key={v} value={v}>
                    Version {v}
                  </option>
                ))}
              </select>
            )}
          </Field>
          <Field label="Your password (signs as issued)" id="issue-password">
            {(control) => (
              <input
                {...control}
                type="password"
                autoComplete="current-password"
                value={password}
                onChange={(e) => setPassword(e.target.value)}
                required
                className="rounded border border-rule-strong bg-surface px-2 py-1.5"
              />
            )}
          </Field>
          <button type="submit" disabled={busy || !password} className={primaryButton}>
            {busy ? 'Signing…' : `Issue as revision ${nextRevision}`}
          </button>
        </form>
      ) : null}
      {error ? (
        <p role="alert" className="rounded bg-fail-soft px-3 py-2 text-sm text-fail">
          {error}
        </p>
      ) : null}
      {jobId ? (
        <div
          ref={progressBox}
          tabIndex={-1}
          role="status"
          aria-live="polite"
          className="space-y-2 rounded border border-rule bg-paper p-3 text-sm"
        >
          <p className="font-semibold">
            Revision {job?.revision ?? nextRevision}:{' '}
            {job
              ? job.state === 'failed'
                ? 'not issued'
                : (STEP_LABELS[job.step] ?? job.step)
              : 'Waiting for the issuing service'}
          </p>
          <progress
            max={STEPS.length - 1}
            value={Math.max(0, stepIndex)}
            aria-label="Issuing progress"
            className="w-full"
          />
          {job?.state === 'failed' ? (
            <p className="text-fail">Issuing failed and nothing was recorded: {job.error}</p>
          ) : null}
          {job?.state === 'done' && job.revisionId ? (
            <p>
              Issued.{' '}
              <a href={`/api/revisions/${job.revisionId}/pdf`} download className="font-semibold text-accent underline">
                Download the signed PDF
              </a>{' '}
              (verification code <span className="font-mono">{job.verificationCode}</span>).
            </p>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
