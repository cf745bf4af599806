import type { AlternateComparison } from '@/lib/checks/alternate-comparison';
import { carriedFieldsText, type CarriedOver } from '@/lib/checks/carried-over';

/**
 * The checker's evidence in two lines beside the decision, so the approver reads it before
 * approving: the verification method, the alternate comparison's outcome, and what is carried over.
 */
export function EvidenceSummary({
  method,
  comparison,
  carriedOver,
}: {
  method: string | null;
  comparison: AlternateComparison;
  carriedOver: CarriedOver | null;
}) {
  const rows = comparison.rows.length;
  return (
    <div
      role="group"
      aria-label="The checker's evidence"
      className="space-y-1 rounded border border-rule bg-paper px-3 py-2 text-sm"
    >
      <p>
        <span className="font-semibold">Verification method:</span> {method ?? 'not recorded'}
      </p>
      <p>
        <span className="font-semibold">Alternate comparison:</span>{' '}
        {rows === 0
          ? 'none (no name shared with the sheet)'
          : comparison.tolerance === null
            ? `${rows} shared name${rows === 1 ? '' : 's'}, no tolerance stated`
            : `${rows - comparison.notWithin} of ${rows} shared name${rows === 1 ? '' : 's'} within ${comparison.toleranceText}`}
        {rows ? ' (table under “The checker’s work”)' : ''}
      </p>
      {carriedOver && carriedOver.fields.length ? (
        <p>
          <span className="font-semibold">Carried over from the check of version {carriedOver.fromVersion}:</span>{' '}
          {carriedFieldsText(carriedOver.fields)}
          {carriedOver.confirmedAt ? `; confirmed by ${carriedOver.confirmedBy}` : '; not confirmed by the checker'}.
        </p>
      ) : null}
    </div>
  );
}
