import { SourceDiff } from '@/components/sheet/source-diff';
import type { AttachmentChange, RecordComparison, RecordFieldName, TableDiff } from '@/lib/sheets/compare';
import { VisibleText } from '@/components/data/visible-text';
import { Table, Td, Th } from '@/components/ui/table';

const FIELD_LABELS: Record<RecordFieldName, string> = {
  title: 'Title',
  safetyRelated: 'Safety-related',
  significantFigures: 'Significant figures',
  displayUnits: 'Units shown',
  objective: 'Objective',
  method: 'Method',
  conclusions: 'Conclusions',
};

const STATUS_WORD = { added: 'Added', removed: 'Removed', changed: 'Changed' } as const;

/** A file size as people read it (1 KiB = 1024 bytes), with the exact byte count. */
function fileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  const kib = bytes / 1024;
  return kib < 1024 ? `${kib.toFixed(1)} KiB (${bytes} bytes)` : `${(kib / 1024).toFixed(1)} MiB (${bytes} bytes)`;
}

const COLUMN_WORD = {
  added: 'added',
  removed: 'removed',
  unitChanged: 'unit changed',
  unchanged: 'unchanged',
} as const;

/** The row/column diff of a CSV data table, as a table of the rows that changed. */
function TableDiffView({ name, diff, first }: { name: string; diff: TableDiff; first: boolean }) {
  const unit = (u: string | null) => (u ? ` [${u}]` : '');
  const columnNotes = diff.columns.filter((c) => c.status !== 'unchanged');
  const n = diff.rowCounts;
  return (
    <div className="mt-1 space-y-1 rounded border border-rule bg-paper p-2">
      <p className="text-xs">
        Data table: {diff.oldRows ?? '—'} → {diff.newRows ?? '—'} rows.{' '}
        {first ? null : (
          <>
            Rows {n.added} added, {n.removed} removed, {n.changed} changed.
          </>
        )}
      </p>
      {!first && columnNotes.length ? (
        <ul className="text-xs">
          {columnNotes.map((c) => (
            <li key={c.name}>
              Column <span className="font-mono">{c.name}</span> {COLUMN_WORD[c.status]}
              {c.status === 'unitChanged' ? (
                <>
                  : <span className="font-mono">{c.oldUnit ?? 'no unit'}</span> →{' '}
                  <span className="font-mono">{c.newUnit ?? 'no unit'}</span>
                </>
              ) : c.status === 'added' ? (
                <span className="font-mono">{unit(c.newUnit)}</span>
              ) : (
                <span className="font-mono">{unit(c.oldUnit)}</span>
              )}
            </li>
          ))}
        </ul>
      ) : null}
      {diff.rows.length ? (
        <Table caption={`Rows of ${name} that changed`} className="border-collapse font-mono text-xs">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-1 pr-3 font-sans">Row</Th>
              <Th className="py-1 pr-3 font-sans">Change</Th>
              {diff.columns.map((c) => (
                <Th key={c.name} className="py-1 pr-3">
                  {c.name}
                  {unit(c.newUnit ?? c.oldUnit)}
                </Th>
              ))}
            </tr>
          </thead>
          <tbody>
            {diff.rows.map((r, i) => (
              <tr key={i} className="border-b border-rule">
                <Th scope="row" className="py-1 pr-3 text-left font-normal">
                  {r.oldRow ?? '—'} → {r.newRow ?? '—'}
                </Th>
                <Td
                  className={`py-1 pr-3 font-sans font-semibold ${r.status === 'added' ? 'text-pass' : r.status === 'removed' ? 'text-fail' : 'text-caution'}`}
                >
                  {r.status}
                </Td>
                {diff.columns.map((c, k) => {
                  const o = r.old?.[k] ?? null;
                  const v = r.new?.[k] ?? null;
                  return (
                    <Td key={c.name} className="py-1 pr-3">
                      {r.status === 'changed' && r.changedColumns.includes(c.name) ? (
                        <>
                          <del className="bg-fail-soft text-fail">{o}</del>{' '}
                          <ins className="bg-pass-soft text-pass no-underline">{v}</ins>
                        </>
                      ) : r.status === 'removed' ? (
                        (o ?? '')
                      ) : (
                        (v ?? o ?? '')
                      )}
                    </Td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </Table>
      ) : null}
      {diff.truncated ? (
        <p className="text-xs text-ink-muted">Only the first {diff.rows.length} row changes are listed.</p>
      ) : null}
    </div>
  );
}

function AttachmentLine({ a }: { a: NonNullable<AttachmentChange['new']> }) {
  return (
    <>
      <VisibleText text={a.name} /> <span className="text-xs text-ink-muted">{fileSize(a.size)}</span>{' '}
      <span className="font-mono text-xs break-all text-ink-muted">SHA-256 {a.sha256}</span>
    </>
  );
}

function plain(value: string | number | boolean | null): string {
  if (value === null) return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return String(value);
}

function ItemList<T>({
  title,
  items,
  render,
  first,
}: {
  title: string;
  items: Array<{ key: string; status: 'added' | 'removed' | 'changed'; old: T | null; new: T | null }>;
  render: (item: T) => React.ReactNode;
  first: boolean;
}) {
  if (items.length === 0) return null;
  return (
    <div className="contents">
      <dt className="font-semibold">{title}</dt>
      <dd className="min-w-0">
        <ul className="space-y-1">
          {items.map((i, n) => (
            <li key={`${i.key}:${n}`}>
              <span
                hidden={first}
                className={`mr-1 rounded px-1.5 text-xs font-bold ${i.status === 'added' ? 'bg-pass-soft text-pass' : i.status === 'removed' ? 'bg-fail-soft text-fail' : 'bg-caution-soft text-caution'}`}
              >
                {STATUS_WORD[i.status]}
              </span>
              {i.status === 'changed' ? (
                <>
                  {render(i.old as T)} → {render(i.new as T)}
                </>
              ) : (
                render((i.new ?? i.old) as T)
              )}
            </li>
          ))}
        </ul>
      </dd>
    </div>
  );
}

/**
 * What changed in the calculation record (NQA-1 fields) and the attachments since the base version;
 * at a first check (`first`), the whole record as it stands.
 */
export function RecordChanges({ record, first }: { record: RecordComparison; first: boolean }) {
  const none =
    record.fields.length +
      record.inputs.length +
      record.assumptions.length +
      record.references.length +
      record.attachments.length ===
    0;
  if (none) return <p className="text-sm text-ink-muted">No change to the calculation record or the attachments.</p>;
  return (
    <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-[10rem_minmax(0,1fr)]">
      {record.fields.map((f) => (
        <div key={f.field} className="contents">
          <dt className="font-semibold">{FIELD_LABELS[f.field]}</dt>
          <dd className="min-w-0">
            {first ? (
              <span className="whitespace-pre-wrap">
                <VisibleText text={plain(f.new)} />
              </span>
            ) : f.diff ? (
              <SourceDiff pieces={f.diff} label={`${FIELD_LABELS[f.field]}, with changes`} />
            ) : (
              <>
                <span className="font-mono">
                  <VisibleText text={plain(f.old)} />
                </span>{' '}
                →{' '}
                <span className="font-mono">
                  <VisibleText text={plain(f.new)} />
                </span>
              </>
            )}
          </dd>
        </div>
      ))}
      <ItemList
        title="Design inputs"
        items={record.inputs}
        first={first}
        render={(i) => (
          <>
            <VisibleText text={i.name} />:{' '}
            <span className="font-mono">
              <VisibleText text={i.value} />
            </span>{' '}
            — <VisibleText text={i.source} />, revision{' '}
            <span className="font-semibold">
              <VisibleText text={i.sourceRevision} />
            </span>
          </>
        )}
      />
      <ItemList
        title="Assumptions"
        first={first}
        items={record.assumptions}
        render={(a) => (
          <>
            <VisibleText text={a.text} />
            {a.needsVerification ? ' (to be verified)' : ' (verified)'}
          </>
        )}
      />
      <ItemList title="References" first={first} items={record.references} render={(r) => <VisibleText text={r} />} />
      {record.attachments.length ? (
        <div className="contents">
          <dt className="font-semibold">Attachments</dt>
          <dd className="min-w-0">
            <ul className="space-y-2">
              {record.attachments.map((a, n) => (
                <li
                  key={`${a.key}:${n}`}
                  aria-label={`Attachment ${a.key}, ${a.status === 'changed' ? 'replaced' : a.status}`}
                >
                  <span
                    hidden={first}
                    className={`mr-1 rounded px-1.5 text-xs font-bold ${a.status === 'added' ? 'bg-pass-soft text-pass' : a.status === 'removed' ? 'bg-fail-soft text-fail' : 'bg-caution-soft text-caution'}`}
                  >
                    {a.status === 'changed' ? 'Replaced' : STATUS_WORD[a.status]}
                  </span>
                  {a.status === 'changed' ? (
                    <>
                      <AttachmentLine a={a.old!} />
                      <span className="block">
                        by <AttachmentLine a={a.new!} />
                      </span>
                    </>
                  ) : (
                    <AttachmentLine a={(a.new ?? a.old)!} />
                  )}
                  {a.table ? <TableDiffView name={a.key} diff={a.table} first={first} /> : null}
                </li>
              ))}
            </ul>
          </dd>
        </div>
      ) : null}
    </dl>
  );
}
