import Link from 'next/link';
import { UtcTime } from '@/components/ui/utc-time';
import type { listQueue } from '@/lib/checks/queries';
import { VisibleText } from '@/components/data/visible-text';

export type QueueRow = Awaited<ReturnType<typeof listQueue>>[number];

/** "My checks" and "My approvals": the checks waiting for me, oldest first. */
export function CheckQueueTable({
  rows,
  queue,
  caption,
}: {
  rows: QueueRow[];
  queue: 'check' | 'approval';
  caption: string;
}) {
  return (
    <table className="w-full border-collapse text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="border-b border-rule-strong text-left">
          <th scope="col" className="py-2 pr-3">
            Sheet
          </th>
          <th scope="col" className="py-2 pr-3">
            Version
          </th>
          <th scope="col" className="py-2 pr-3">
            Submitted by
          </th>
          <th scope="col" className="py-2 pr-3">
            Checker
          </th>
          <th scope="col" className="py-2 pr-3">
            Submitted (UTC)
          </th>
          {queue === 'approval' ? (
            <th scope="col" className="py-2 pr-3">
              You may approve
            </th>
          ) : null}
          <th scope="col" className="py-2">
            <span className="sr-only">Open</span>
          </th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id} className="border-b border-rule align-top">
            <td className="py-2 pr-3">
              <Link
                href={`/projects/${r.sheet.projectCode}/sheets/${r.sheet.number}`}
                className="font-mono font-semibold text-accent underline"
              >
                {r.sheet.code}
              </Link>
              <span className="block">
                <VisibleText text={r.sheet.title} />
              </span>
              {r.sheet.safetyRelated ? (
                <span className="mt-1 inline-block rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution">
                  safety-related
                </span>
              ) : null}
            </td>
            <td className="py-2 pr-3 font-mono">
              {r.versionNumber}
              <span className="block text-xs text-ink-muted" title={r.sha256}>
                {r.sha256.slice(0, 12)}…
              </span>
            </td>
            <td className="py-2 pr-3">{r.submittedBy}</td>
            <td className="py-2 pr-3">{r.checker}</td>
            <td className="py-2 pr-3 whitespace-nowrap font-mono">
              <UtcTime iso={r.submittedAt} />
            </td>
            {queue === 'approval' ? (
              <td className="max-w-xs py-2 pr-3">
                {r.eligible ? 'Yes' : <span className="text-fail">No: {r.reason}</span>}
              </td>
            ) : null}
            <td className="py-2 whitespace-nowrap">
              <Link href={`/checks/${r.id}`} className="font-semibold text-accent underline">
                Open the check
                <span className="sr-only">
                  {' '}
                  of {r.sheet.code} version {r.versionNumber}
                </span>
              </Link>
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
