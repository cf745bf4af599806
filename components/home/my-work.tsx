import Link from 'next/link';
import type { MyWork, WorkSheet } from '@/lib/home/my-work';

function Section({
  id,
  title,
  empty,
  children,
  count,
}: {
  id: string;
  title: string;
  empty: string;
  count: number;
  children: React.ReactNode;
}) {
  return (
    <section aria-labelledby={id} className="rounded border border-rule bg-surface p-4">
      <h2 id={id} className="text-lg font-bold">
        {title} <span className="font-mono text-sm text-ink-muted">({count})</span>
      </h2>
      {count === 0 ? (
        <p className="mt-2 text-sm text-ink-muted">{empty}</p>
      ) : (
        <ul className="mt-2 space-y-1">{children}</ul>
      )}
    </section>
  );
}

function SheetItem({ s, note }: { s: WorkSheet; note: string }) {
  return (
    <li>
      <Link href={`/projects/${s.projectCode}/sheets/${s.number}`} className="font-semibold text-accent underline">
        {s.code}
      </Link>{' '}
      {s.title} <span className="text-sm text-ink-muted">({note})</span>
    </li>
  );
}

/** The signed-in home page: one section for each of the person's roles. */
export function MyWorkView({ name, work }: { name: string; work: MyWork }) {
  const none = !work.returned && !work.drafts && !work.toCheck && !work.toApprove && !work.toIssue;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Your work, {name}</h1>
      {none ? <p>You have no role in any project yet. A project administrator adds you to a project.</p> : null}
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
        {work.returned ? (
          <Section
            id="work-returned"
            title="Returned to you"
            count={work.returned.length}
            empty="Nothing returned to you."
          >
            {work.returned.map((s) => (
              <SheetItem key={s.id} s={s} note={`version ${s.latestVersion}`} />
            ))}
          </Section>
        ) : null}
        {work.drafts ? (
          <Section id="work-drafts" title="Your drafts" count={work.drafts.length} empty="No drafts.">
            {work.drafts.map((s) => (
              <SheetItem key={s.id} s={s} note={`version ${s.latestVersion}`} />
            ))}
          </Section>
        ) : null}
        {work.toCheck ? (
          <Section id="work-check" title="To check" count={work.toCheck.length} empty="No check assigned to you.">
            {work.toCheck.map((c) => (
              <li key={c.id}>
                <Link href={`/checks/${c.id}`} className="font-semibold text-accent underline">
                  {c.sheet.code}
                </Link>{' '}
                {c.sheet.title}{' '}
                <span className="text-sm text-ink-muted">
                  (version {c.versionNumber}, from {c.submittedBy})
                </span>
              </li>
            ))}
          </Section>
        ) : null}
        {work.toApprove ? (
          <Section id="work-approve" title="To approve" count={work.toApprove.length} empty="Nothing awaits approval.">
            {work.toApprove.map((c) => (
              <li key={c.id}>
                <Link href={`/checks/${c.id}`} className="font-semibold text-accent underline">
                  {c.sheet.code}
                </Link>{' '}
                {c.sheet.title}{' '}
                <span className="text-sm text-ink-muted">
                  (version {c.versionNumber}
                  {c.eligible ? '' : `; ${c.reason ?? 'you may not approve it'}`})
                </span>
              </li>
            ))}
          </Section>
        ) : null}
        {work.toIssue ? (
          <Section
            id="work-issue"
            title="Approved, waiting for issue"
            count={work.toIssue.length}
            empty="Nothing waits for issue."
          >
            {work.toIssue.map((s) => (
              <SheetItem key={s.checkId} s={s} note={`version ${s.versionNumber} approved`} />
            ))}
          </Section>
        ) : null}
      </div>
    </div>
  );
}
