import { formatUtc } from '@/components/ui/utc-time';
import { carriedFieldsText, type CarriedOver } from '@/lib/checks/carried-over';

/**
 * Which of the checker's work is still as carried over from the returned check of an earlier
 * version, and whether the checker has confirmed it: the approver reads this beside the evidence.
 */
export function CarriedOverNotice({ carried }: { carried: CarriedOver | null }) {
  if (!carried || carried.fields.length === 0) return null;
  const what = carriedFieldsText(carried.fields);
  return (
    <p
      role="note"
      aria-label="Carried over"
      className="rounded border-l-4 border-caution-rule bg-caution-soft px-3 py-2 text-sm text-ink"
    >
      <span className="font-bold">From the check of version {carried.fromVersion}:</span> the {what}{' '}
      {carried.fields.length === 1 ? 'was' : 'were'} carried over from the returned check of version{' '}
      {carried.fromVersion}, not recorded on this version.{' '}
      {carried.confirmedAt ? (
        <>
          Confirmed for this version by {carried.confirmedBy} on{' '}
          <time dateTime={carried.confirmedAt}>{formatUtc(carried.confirmedAt)}</time>.
        </>
      ) : (
        <span className="font-semibold">Not yet confirmed by the checker for this version.</span>
      )}
    </p>
  );
}

/** The small mark beside a field still as carried over. */
export function CarriedMark({ carried, field }: { carried: CarriedOver | null; field: CarriedOver['fields'][number] }) {
  if (!carried?.fields.includes(field)) return null;
  return (
    <span className="ml-2 rounded border border-caution-rule bg-caution-soft px-1.5 py-0.5 text-xs font-semibold text-caution">
      from the check of version {carried.fromVersion}
    </span>
  );
}
