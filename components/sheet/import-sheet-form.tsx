'use client';

import { useRouter } from 'next/navigation';
import { useId, useRef, useState } from 'react';
import { api, errorText } from '@/components/data/api-client';
import { Table, Td, Th } from '@/components/ui/table';
import { Field } from '@/components/ui/field';
import { smallPrimaryButton } from '@/components/ui/button';

/** What the import would create, as POST …/sheets/import/preview answers it. */
type Preview = Awaited<ReturnType<typeof api.previewImport>>;

function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MiB`;
}

/**
 * Imports a sheet file (JSON) as a new sheet of the project, in two steps: the server checks the
 * file (attachments against their SHA-256) and says what it would create, creating nothing; the
 * originator confirms, with the title the sheet will have.
 */
export function ImportSheetForm({ projectId, projectCode }: { projectId: string; projectCode: string }) {
  const router = useRouter();
  const id = useId();
  const fileInput = useRef<HTMLInputElement>(null);
  const [text, setText] = useState<string | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [title, setTitle] = useState('');
  const [state, setState] = useState<{ error?: string; busy?: boolean }>({});

  function reset() {
    setText(null);
    setPreview(null);
    setState({});
    if (fileInput.current) fileInput.current.value = '';
  }

  async function onFile(file: File | undefined) {
    setPreview(null);
    if (!file) return;
    setState({ busy: true });
    const body = await file.text();
    let answer: Preview;
    try {
      answer = await api.previewImport(projectId, body);
    } catch (error) {
      setState({ error: errorText(error) });
      return;
    }
    setText(body);
    setPreview(answer);
    setTitle(answer.title);
    setState({});
  }

  async function confirm(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (text === null) return;
    setState({ busy: true });
    let answer;
    try {
      answer = await api.importSheet(projectId, text, { title: title.trim() });
    } catch (error) {
      setState({ error: errorText(error) });
      return;
    }
    router.push(`/projects/${projectCode}/sheets/${answer.number}`);
  }

  const notCarried = preview?.attachments.filter((a) => !a.carried) ?? [];
  return (
    <div className="space-y-2">
      <label htmlFor={id} className="block text-sm font-semibold">
        Import a sheet file (JSON)
      </label>
      <input
        ref={fileInput}
        id={id}
        type="file"
        accept="application/json,.json"
        disabled={state.busy}
        onChange={(e) => void onFile(e.target.files?.[0])}
        className="text-sm"
        aria-describedby={`${id}-hint`}
      />
      <p id={`${id}-hint`} className="text-xs text-ink-muted">
        Nothing is created until you confirm: the file is checked first, and what it holds is shown here.
      </p>
      {preview ? (
        <form
          onSubmit={confirm}
          aria-labelledby={`${id}-confirm`}
          className="space-y-2 rounded border border-rule-strong bg-paper p-3 text-sm"
        >
          <h3 id={`${id}-confirm`} className="font-bold">
            Confirm the import
          </h3>
          <p>
            {preview.calcCells} calculation cell{preview.calcCells === 1 ? '' : 's'} and {preview.textCells} text cell
            {preview.textCells === 1 ? '' : 's'}; {preview.significantFigures} significant figures;{' '}
            {preview.displayUnits === 'trade' ? 'units of the trade' : 'SI units'} shown
            {preview.safetyRelated ? '; marked safety-related' : ''}.
          </p>
          {preview.exportedFrom ? (
            <p className={preview.unchangedSinceExport ? '' : 'font-semibold text-caution'}>
              Exported from {preview.exportedFrom.sheet} version {preview.exportedFrom.version} (SHA-256{' '}
              <span className="font-mono">{preview.exportedFrom.sha256.slice(0, 12)}…</span>):{' '}
              {preview.unchangedSinceExport
                ? 'the content is unchanged since export.'
                : 'the content differs from that version: it was edited after export.'}
            </p>
          ) : (
            <p>The file does not say which sheet it was exported from.</p>
          )}
          {preview.attachments.length > 0 ? (
            <Table
              caption="Attachments in the file"
              className="w-full text-left text-xs"
              captionClassName="text-left font-semibold"
            >
              <thead>
                <tr className="border-b border-rule-strong">
                  <Th className="py-1 pr-2">Name</Th>
                  <Th className="py-1 pr-2">Size</Th>
                  <Th className="py-1 pr-2">SHA-256</Th>
                  <Th className="py-1">Imported</Th>
                </tr>
              </thead>
              <tbody>
                {preview.attachments.map((a) => (
                  <tr key={`${a.name}:${a.sha256}`} className="border-b border-rule">
                    <Td className="py-1 pr-2 break-all">{a.name}</Td>
                    <Td className="py-1 pr-2 whitespace-nowrap">{formatSize(a.size)}</Td>
                    <Td className="py-1 pr-2 font-mono">{a.sha256.slice(0, 16)}…</Td>
                    <Td className={`py-1 ${a.carried ? 'text-pass' : 'font-semibold text-caution'}`}>
                      {a.carried ? 'yes: bytes match the SHA-256' : 'no: the file lists it without its bytes'}
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          ) : null}
          {notCarried.length > 0 ? (
            <p className="font-semibold text-caution">
              {notCarried.length === 1 ? `${notCarried[0].name} is` : `${notCarried.length} attachments are`} not in the
              file: cells that read {notCarried.length === 1 ? 'it' : 'them'} will show errors until{' '}
              {notCarried.length === 1 ? 'it is' : 'they are'} uploaded again. Export with the attachments to bring them
              along.
            </p>
          ) : null}
          <Field label="Title of the new sheet" id={`${id}-title`} labelClassName="block font-semibold">
            {(control) => (
              <input
                {...control}
                required
                maxLength={300}
                value={title}
                onChange={(e) => setTitle(e.target.value)}
                className="w-full rounded border border-rule-strong bg-surface px-2 py-1"
              />
            )}
          </Field>
          <div className="flex flex-wrap gap-2">
            <button type="submit" disabled={state.busy || !title.trim()} className={smallPrimaryButton}>
              Create the sheet from this file
            </button>
            <button
              type="button"
              onClick={reset}
              className="rounded border border-rule-strong px-3 py-1.5 font-semibold"
            >
              Cancel
            </button>
          </div>
        </form>
      ) : null}
      <p role="alert" aria-live="polite" className="text-sm text-fail">
        {state.error ?? ''}
      </p>
    </div>
  );
}
