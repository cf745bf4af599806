import type { VersionContent } from '@/lib/sheets/content';
import { tableNameFor } from '@/lib/attachments/table-name';
import { VisibleText } from '@/components/data/visible-text';
import { revealBidiControls } from '@/lib/calc/bidi-controls';

type Ref = VersionContent['attachments'][number];

export function formatBytes(n: number): string {
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
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Attachments cited by this version</caption>
        <thead>
          <tr className="border-b border-rule-strong">
            <th scope="col" className="py-1 pr-3">
              File
            </th>
            <th scope="col" className="py-1 pr-3">
              Kind
            </th>
            <th scope="col" className="py-1 pr-3">
              Size
            </th>
            <th scope="col" className="py-1 pr-3">
              SHA-256
            </th>
            <th scope="col" className="py-1 pr-3">
              In cells
            </th>
            {actions ? (
              <th scope="col" className="py-1">
                <span className="sr-only">Actions</span>
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody>
          {attachments.map((a) => (
            <tr key={`${a.name}:${a.sha256}`} className="border-b border-rule align-top">
              <td className="py-1 pr-3">
                <a
                  href={`/api/sheets/${sheetId}/attachments/${a.sha256}`}
                  download={revealBidiControls(a.name)}
                  className="font-semibold text-accent underline"
                >
                  <VisibleText text={a.name} />
                </a>
              </td>
              <td className="py-1 pr-3">{KIND_LABEL[a.mediaType] ?? a.mediaType}</td>
              <td className="py-1 pr-3 whitespace-nowrap">{formatBytes(a.size)}</td>
              <td className="py-1 pr-3">
                <code className="break-all font-mono text-xs" title={a.sha256}>
                  {a.sha256}
                </code>
              </td>
              <td className="py-1 pr-3">
                {a.mediaType === 'text/csv' ? (
                  <code className="font-mono">{tableNameFor(a.name)}.column</code>
                ) : (
                  <span className="text-ink-muted">—</span>
                )}
              </td>
              {actions ? <td className="py-1">{actions(a)}</td> : null}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
