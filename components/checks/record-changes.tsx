import { SourceDiff } from '@/components/sheet/source-diff';
import type { RecordComparison, RecordFieldName } from '@/lib/sheets/compare';
import { VisibleText } from '@/components/data/visible-text';

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
              <span hidden={first} className={`mr-1 rounded px-1.5 text-xs font-bold ${i.status === 'added' ? 'bg-pass-soft text-pass' : i.status === 'removed' ? 'bg-fail-soft text-fail' : 'bg-caution-soft text-caution'}`}>
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
  const none = record.fields.length + record.inputs.length + record.assumptions.length + record.references.length + record.attachments.length === 0;
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
                → <span className="font-mono">
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
            <VisibleText text={i.name} />: <span className="font-mono">
              <VisibleText text={i.value} />
            </span>{' '}
            — <VisibleText text={i.source} />, revision <VisibleText text={i.sourceRevision} />
          </>
        )}
      />
      <ItemList title="Assumptions" first={first} items={record.assumptions} render={(a) => <><VisibleText text={a.text} />{a.needsVerification ? ' (to be verified)' : ''}</>} />
      <ItemList title="References" first={first} items={record.references} render={(r) => <VisibleText text={r} />} />
      <ItemList
        title="Attachments"
        items={record.attachments}
        first={first}
        render={(a) => (
          <>
            <VisibleText text={a.name} /> <span className="font-mono text-xs break-all text-ink-muted">SHA-256 {a.sha256}</span>
          </>
        )}
      />
    </dl>
  );
}
