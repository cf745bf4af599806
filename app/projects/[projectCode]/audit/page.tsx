import type { Metadata } from 'next';
import { getDb } from '@/db';
import { pageProject } from '@/lib/auth/page-guard';
import Link from 'next/link';
import { auditFilterSchema, auditNames, listProjectAudit, listProjectAuditActions } from '@/lib/audit/query';
import { auditSentence } from '@/lib/audit/sentences';
import { listMembers } from '@/lib/projects/projects';
import { Table, Td, Th } from '@/components/ui/table';
import { smallPrimaryButton } from '@/components/ui/button';
import { Field } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Audit trail' };
export const dynamic = 'force-dynamic';

/** A stored value as it is kept (JSON), for the disclosure under each sentence. */
function raw(value: unknown): string {
  return JSON.stringify(value, null, 1);
}

export default async function AuditPage({
  params,
  searchParams,
}: {
  params: Promise<{ projectCode: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { projectCode } = await params;
  const { project } = await pageProject(
    projectCode,
    `/projects/${projectCode}/audit`,
    ['originator', 'checker', 'approver', 'controller'],
    'audit',
  );
  const query = await searchParams;
  const parsed = auditFilterSchema.safeParse(query);
  const filter = parsed.success ? parsed.data : auditFilterSchema.parse({});
  const [events, actions, members] = await Promise.all([
    listProjectAudit(getDb(), project.id, filter),
    listProjectAuditActions(getDb(), project.id),
    listMembers(getDb(), project.id),
  ]);
  const names = await auditNames(getDb(), project, events);
  const csv = new URLSearchParams({
    ...Object.fromEntries(
      Object.entries(filter)
        .filter(([, v]) => v !== undefined)
        .map(([k, v]) => [k, String(v)]),
    ),
    format: 'csv',
  });
  return (
    <div className="space-y-6">
      <header>
        <p className="font-mono text-sm text-ink-muted">{project.code}</p>
        <h1 className="text-2xl font-bold">Audit trail</h1>
        <p className="mt-1 max-w-prose text-ink-muted">
          Every change in this project, newest first, as the database recorded it (UTC, database clock). Each
          event&apos;s SHA-256 covers the one before, so a changed or missing event shows.
        </p>
      </header>
      <form method="get" className="flex flex-wrap items-end gap-3 rounded border border-rule bg-surface p-3 text-sm">
        <Field label="Person" id="person" labelClassName="block font-semibold">
          {(control) => (
            <select
              {...control}
              name="person"
              defaultValue={filter.person ?? ''}
              className="rounded border border-rule-strong bg-surface px-2 py-1"
            >
              <option value="">Anyone</option>
              {members.map((m) => (
                <option key={m.userId} value={m.userId}>
                  {m.name}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field label="Action" id="action" labelClassName="block font-semibold">
          {(control) => (
            <select
              {...control}
              name="action"
              defaultValue={filter.action ?? ''}
              className="rounded border border-rule-strong bg-surface px-2 py-1"
            >
              <option value="">Any</option>
              {actions.map((a) => (
                <option key={a} value={a}>
                  {a}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field label="From (UTC)" id="from" labelClassName="block font-semibold">
          {(control) => (
            <input
              {...control}
              name="from"
              type="date"
              defaultValue={filter.from ?? ''}
              className="rounded border border-rule-strong bg-surface px-2 py-1"
            />
          )}
        </Field>
        <Field label="To (UTC)" id="to" labelClassName="block font-semibold">
          {(control) => (
            <input
              {...control}
              name="to"
              type="date"
              defaultValue={filter.to ?? ''}
              className="rounded border border-rule-strong bg-surface px-2 py-1"
            />
          )}
        </Field>
        <button type="submit" className={smallPrimaryButton}>
          Filter
        </button>
        <a href={`/api/projects/${project.id}/audit?${csv}`} className="font-semibold text-accent underline">
          Download CSV
        </a>
      </form>
      <Table caption="Audit events">
        <thead>
          <tr className="border-b border-rule-strong text-left">
            <Th className="py-2 pr-3">#</Th>
            <Th className="py-2 pr-3">Time (UTC)</Th>
            <Th className="py-2 pr-3">Event</Th>
            <Th className="py-2">Reason</Th>
          </tr>
        </thead>
        <tbody>
          {events.map((e) => (
            <tr key={e.id} className="border-b border-rule align-top">
              <Td className="py-2 pr-3 font-mono">{e.id}</Td>
              <Td className="py-2 pr-3 font-mono whitespace-nowrap">
                {e.occurred_at.toISOString().replace('T', ' ').slice(0, 19)}
              </Td>
              <Td className="py-2 pr-3">
                <AuditEventCell event={e} names={names} projectCode={project.code} />
              </Td>
              <Td className="py-2">{e.reason ?? ''}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {events.length === 0 ? <p className="text-ink-muted">No events match.</p> : null}
    </div>
  );
}

function AuditEventCell({
  event,
  names,
  projectCode,
}: {
  event: Awaited<ReturnType<typeof listProjectAudit>>[number];
  names: Awaited<ReturnType<typeof auditNames>>;
  projectCode: string;
}) {
  const { text, sheet } = auditSentence(event, names);
  return (
    <>
      <span className="block">
        {text}
        {event.token_id ? ' (through an API token)' : ''}.
      </span>
      {sheet ? (
        <Link href={`/projects/${projectCode}/sheets/${sheet.number}`} className="text-sm text-accent underline">
          Open {sheet.code}
        </Link>
      ) : null}
      <details className="mt-1 text-xs text-ink-muted">
        <summary className="cursor-pointer">As recorded: {event.action}</summary>
        <dl className="mt-1 grid gap-x-2 sm:grid-cols-[auto_minmax(0,1fr)]">
          {event.old_value !== null ? (
            <>
              <dt className="font-semibold">Was</dt>
              <dd>
                <pre className="whitespace-pre-wrap break-all font-mono">{raw(event.old_value)}</pre>
              </dd>
            </>
          ) : null}
          {event.new_value !== null ? (
            <>
              <dt className="font-semibold">Now</dt>
              <dd>
                <pre className="whitespace-pre-wrap break-all font-mono">{raw(event.new_value)}</pre>
              </dd>
            </>
          ) : null}
          <dt className="font-semibold">SHA-256</dt>
          <dd className="break-all font-mono">{event.hash}</dd>
        </dl>
      </details>
    </>
  );
}
