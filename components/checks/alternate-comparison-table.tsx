import type { AlternateComparison, ComparisonStatus } from '@/lib/checks/alternate-comparison';
import { Table, Td, Th } from '@/components/ui/table';

const MARK: Record<ComparisonStatus, { sign: string; className: string }> = {
  within: { sign: '✓', className: 'text-pass' },
  outside: { sign: '✗', className: 'text-fail' },
  no_tolerance: { sign: '?', className: 'text-caution' },
  units_differ: { sign: '✗', className: 'text-fail' },
  not_compared: { sign: '–', className: 'text-ink-muted' },
};

/**
 * The alternate calculation compared with the sheet's stored results, name by name: both values as
 * displayed, the relative difference |a − s| / |s| (on SI values) and the outcome in words (the
 * colour and the sign only repeat it). Shown to the checker, the approver and everyone else alike.
 */
export function AlternateComparisonTable({
  comparison,
  versionNumber,
}: {
  comparison: AlternateComparison;
  versionNumber: number;
}) {
  const { rows } = comparison;
  return (
    <div className="space-y-2">
      <h3 className="text-sm font-semibold">Alternate calculation compared with version {versionNumber}</h3>
      <p className="text-sm">
        {comparison.tolerance === null ? (
          <span className="font-semibold text-caution">No tolerance stated yet.</span>
        ) : (
          <>
            Tolerance stated by the checker: <span className="font-semibold">{comparison.toleranceText}</span>
            {comparison.toleranceText !== comparison.toleranceWords ? <> ({comparison.toleranceWords})</> : null},
            relative.
          </>
        )}{' '}
        {rows.length === 0
          ? 'No name is defined both in the alternate calculation and in the sheet, so nothing is compared.'
          : rows.length === comparison.notWithin
            ? `None of the ${rows.length} shared name${rows.length === 1 ? ' is' : 's are'} within the tolerance.`
            : comparison.notWithin === 0
              ? `All ${rows.length} shared name${rows.length === 1 ? ' is' : 's are'} within the tolerance.`
              : `${comparison.notWithin} of ${rows.length} shared names ${comparison.notWithin === 1 ? 'is' : 'are'} not within the tolerance.`}
      </p>
      {rows.length ? (
        <Table caption="Alternate calculation compared with the sheet">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-1.5 pr-3">Name</Th>
              <Th className="py-1.5 pr-3">Sheet</Th>
              <Th className="py-1.5 pr-3">Alternate</Th>
              <Th className="py-1.5 pr-3">Relative difference</Th>
              <Th className="py-1.5">Outcome</Th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.name} className="border-b border-rule align-top">
                <Th scope="row" className="py-1.5 pr-3 text-left font-mono font-normal">
                  {r.name}
                </Th>
                <Td className="py-1.5 pr-3 tabular-nums">{r.sheet}</Td>
                <Td className="py-1.5 pr-3 tabular-nums">
                  {r.alternate}
                  {r.alternateInSheetUnit ? (
                    <span className="block text-xs text-ink-muted">= {r.alternateInSheetUnit}</span>
                  ) : null}
                </Td>
                <Td className="py-1.5 pr-3 tabular-nums">{r.relativeDifferenceText}</Td>
                <Td className={`py-1.5 font-semibold ${MARK[r.status].className}`}>
                  <span aria-hidden="true">{MARK[r.status].sign} </span>
                  {r.words[0].toUpperCase() + r.words.slice(1)}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      ) : null}
    </div>
  );
}
