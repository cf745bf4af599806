'use client';

import { useRef, useState } from 'react';
import useSWR from 'swr';
import { api, errorText } from '@/components/data/api-client';
import type { AttachmentInfo } from '@/lib/attachments/attachments';
import type { VersionContent } from '@/lib/sheets/content';
import { AttachmentList } from './attachment-list';
import { Field } from '@/components/ui/field';

type Ref = VersionContent['attachments'][number];

const toRef = (a: AttachmentInfo): Ref => ({ name: a.name, mediaType: a.mediaType, size: a.size, sha256: a.sha256 });

/**
 * The editor's attachments: upload a reference document or a CSV data table, choose which uploaded
 * files the next version cites (a CSV table then feeds the cells as `table.column`), download them.
 */
/** The sheet's uploaded attachments (one SWR cache entry shared by the panel and the editor). */
export function useSheetAttachments(sheetId: string) {
  return useSWR(`/api/sheets/${sheetId}/attachments`, () => api.listAttachments(sheetId));
}

export function AttachmentsPanel({
  sheetId,
  cited,
  onChange,
}: {
  sheetId: string;
  cited: Ref[];
  onChange: (refs: Ref[]) => void;
}) {
  const { data, mutate } = useSheetAttachments(sheetId);
  const input = useRef<HTMLInputElement>(null);
  const [status, setStatus] = useState<{ kind: 'idle' | 'busy' | 'done' | 'error'; text?: string }>({ kind: 'idle' });

  const cite = (a: AttachmentInfo) => onChange([...cited.filter((c) => c.name !== a.name), toRef(a)]);
  const uncite = (ref: Ref) => onChange(cited.filter((c) => !(c.name === ref.name && c.sha256 === ref.sha256)));

  async function upload() {
    const file = input.current?.files?.[0];
    if (!file) {
      setStatus({ kind: 'error', text: 'Choose a file first.' });
      return;
    }
    setStatus({ kind: 'busy', text: `Uploading ${file.name}…` });
    let info: AttachmentInfo;
    try {
      info = await api.uploadAttachment(sheetId, file);
    } catch (error) {
      setStatus({ kind: 'error', text: errorText(error, 'The upload did not reach the server.') });
      return;
    }
    cite(info);
    await mutate();
    if (input.current) input.current.value = '';
    const table = info.table
      ? ` Use it in cells as ${info.table.columns.map((c) => `${info.table!.name}.${c.name}${c.unit ? ` [${c.unit}]` : ''}`).join(', ')}.`
      : '';
    setStatus({
      kind: 'done',
      text: `${info.name} uploaded (SHA-256 ${info.sha256.slice(0, 12)}…) and cited in this version.${table}`,
    });
  }

  const uncitedUploads = (data?.attachments ?? []).filter(
    (a) => !cited.some((c) => c.name === a.name && c.sha256 === a.sha256),
  );

  return (
    <section aria-labelledby="editor-attachments" className="space-y-3 rounded border border-rule bg-surface p-4">
      <h2 id="editor-attachments" className="text-lg font-bold">
        Attachments
      </h2>
      <p className="text-sm text-ink-muted">
        Reference documents (PDF, PNG, JPEG) and data tables (CSV with a header row such as{' '}
        <code className="font-mono">energy [MeV], field [T]</code>). A data table called{' '}
        <code className="font-mono">scan.csv</code> is used in cells as <code className="font-mono">scan.energy</code>,
        a list with its unit.
      </p>
      <AttachmentList
        sheetId={sheetId}
        attachments={cited}
        actions={(a) => (
          <button
            type="button"
            onClick={() => uncite(a)}
            className="rounded border border-rule px-2 py-1 text-xs"
            aria-label={`Stop citing ${a.name} in this version`}
          >
            Remove
          </button>
        )}
      />
      {uncitedUploads.length ? (
        <div>
          <h3 className="text-sm font-semibold">Uploaded earlier, not cited in this version</h3>
          <ul className="mt-1 space-y-1 text-sm">
            {uncitedUploads.map((a) => (
              <li key={`${a.name}:${a.sha256}`} className="flex flex-wrap items-center gap-2">
                <span>{a.name}</span>
                <code className="font-mono text-xs text-ink-muted">{a.sha256.slice(0, 12)}…</code>
                <button
                  type="button"
                  onClick={() => cite(a)}
                  className="rounded border border-rule px-2 py-1 text-xs"
                  aria-label={`Cite ${a.name} in this version`}
                >
                  Cite
                </button>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <div className="flex flex-wrap items-end gap-2">
        <Field label="File to upload" id="att-file">
          {(control) => (
            <input
              {...control}
              ref={input}
              type="file"
              accept=".pdf,.png,.jpg,.jpeg,.csv,application/pdf,image/png,image/jpeg,text/csv"
              className="text-sm"
            />
          )}
        </Field>
        <button
          type="button"
          onClick={upload}
          disabled={status.kind === 'busy'}
          className="rounded border border-rule-strong bg-surface px-3 py-2 text-sm font-semibold disabled:opacity-60"
        >
          Upload the file
        </button>
      </div>
      <p
        role={status.kind === 'error' ? 'alert' : 'status'}
        aria-live="polite"
        className={`text-sm ${status.kind === 'error' ? 'text-fail' : ''}`}
      >
        {status.text ?? ''}
      </p>
    </section>
  );
}
