import type { VersionContent } from '@/lib/sheets/content';
import { tableNameFor } from '@/lib/attachments/table-name';
import { VisibleText } from '@/components/data/visible-text';
import { revealBidiControls } from '@/lib/calc/bidi-controls';
import { Table, Td, Th } from '@/components/ui/table';

type Ref = VersionContent['attachments'][number];

function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / (1024 * 1024)).toFixed(1)} MiB`;
}

const KIND_LABEL: Record<string, string> = {
  'application/pdf': 'PDF',
  'image/png': 'PNG image',
  'image/jpeg': 'JPEG image',
  'text/csv': 'CSV data table',
};

/** The attachments a version cites, with their SHA-256 and a download link; read-only. */
export function AttachmentList({
  sheetId,
  attachments,
  actions,
}: {
  sheetId: string;
  attachments: Ref[];
  actions?: (a: Ref) => React.ReactNode;
}) {
  if (attachments.length === 0) return <p className="text-sm text-ink-muted">No attachments.</p>;
  return (
    <Table caption="Attachments cited by this version" className="w-full text-left text-sm">
      <thead>
        <tr className="border-b border-rule-strong">
          <Th className="py-1 pr-3">File</Th>
          <Th className="py-1 pr-3">Kind</Th>
          <Th className="py-1 pr-3">Size</Th>
          <Th className="py-1 pr-3">SHA-256</Th>
          <Th className="py-1 pr-3">In cells as</Th>
          {actions ? (
            <Th className="py-1">
              <span className="sr-only">Actions</span>
            </Th>
          ) : null}
        </tr>
      </thead>
      <tbody>
        {attachments.map((a) => (
          <tr key={`${a.name}:${a.sha256}`} className="border-b border-rule align-top">
            <Td className="py-1 pr-3">
              <a
                href={`/api/sheets/${sheetId}/attachments/${a.sha256}`}
                download={revealBidiControls(a.name)}
                className="font-semibold text-accent underline"
              >
                <VisibleText text={a.name} />
              </a>
            </Td>
            <Td className="py-1 pr-3">{KIND_LABEL[a.mediaType] ?? a.mediaType}</Td>
            <Td className="py-1 pr-3 whitespace-nowrap">{formatBytes(a.size)}</Td>
            <Td className="py-1 pr-3">
              <code className="break-all font-mono text-xs" title={a.sha256}>
                {a.sha256}
              </code>
            </Td>
            <Td className="py-1 pr-3">
              {a.mediaType === 'text/csv' ? (
                <span>
                  table <code className="font-mono">{tableNameFor(a.name)}</code>; a column by its name after a dot
                </span>
              ) : (
                <span className="text-ink-muted">—</span>
              )}
            </Td>
            {actions ? <Td className="py-1">{actions(a)}</Td> : null}
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
