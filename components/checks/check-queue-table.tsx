import Link from 'next/link';
import { UtcTime } from '@/components/ui/utc-time';
import type { listQueue } from '@/lib/checks/queries';
import { VisibleText } from '@/components/data/visible-text';
import { Table, Td, Th } from '@/components/ui/table';

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
    <Table caption={caption}>
      <thead>
        <tr className="border-b border-rule-strong text-left">
          <Th className="py-2 pr-3">Sheet</Th>
          <Th className="py-2 pr-3">Version</Th>
          <Th className="py-2 pr-3">Submitted by</Th>
          <Th className="py-2 pr-3">Checker</Th>
          <Th className="py-2 pr-3">Submitted (UTC)</Th>
          {queue === 'approval' ? <Th className="py-2 pr-3">You may approve</Th> : null}
          <Th className="py-2">
            <span className="sr-only">Open</span>
          </Th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id} className="border-b border-rule align-top">
            <Td className="py-2 pr-3">
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
            </Td>
            <Td className="py-2 pr-3 font-mono">
              {r.versionNumber}
              <span className="block text-xs text-ink-muted" title={r.sha256}>
                {r.sha256.slice(0, 12)}…
              </span>
            </Td>
            <Td className="py-2 pr-3">{r.submittedBy}</Td>
            <Td className="py-2 pr-3">{r.checker}</Td>
            <Td className="py-2 pr-3 whitespace-nowrap font-mono">
              <UtcTime iso={r.submittedAt} />
            </Td>
            {queue === 'approval' ? (
              <Td className="max-w-xs py-2 pr-3">
                {r.eligible ? 'Yes' : <span className="text-fail">No: {r.reason}</span>}
              </Td>
            ) : null}
            <Td className="py-2 whitespace-nowrap">
              <Link href={`/checks/${r.id}`} className="font-semibold text-accent underline">
                Open the check
                <span className="sr-only">
                  {' '}
                  of {r.sheet.code} version {r.versionNumber}
                </span>
              </Link>
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
