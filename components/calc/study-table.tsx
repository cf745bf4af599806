import { formatNumberText } from '@/lib/calc/format';
import { studyTableCsv } from '@/lib/calc/study-csv';
import type { StudyTable as StudyTableData } from '@/lib/calc/types';
import { unitLabel } from '@/lib/calc/unit-label';
import { Table, Td, Th } from '@/components/ui/table';

/**
 * A sweep's results as a table: one row per value of the swept input, numbers at the sheet's
 * significant figures, a failed step with its error. "Download CSV" gives the numbers at full
 * precision: from `csvHref` (the version's study route) when given, otherwise built here from the
 * same table (the editor's unsaved results).
 */
export function StudyTable({
  table,
  line,
  significantFigures = 6,
  csvHref,
  csvFileName,
}: {
  table: StudyTableData;
  line: number;
  significantFigures?: number;
  csvHref?: string;
  csvFileName?: string;
}) {
  const failed = table.errors.filter((e) => e !== null).length;
  const caption = `Sweep, line ${line}: ${table.rows.length} step${table.rows.length === 1 ? '' : 's'}${failed ? `, ${failed} failed` : ''}`;
  const href = csvHref ?? `data:text/csv;charset=utf-8,${encodeURIComponent(studyTableCsv(table))}`;
  const n = table.columns.length;
  return (
    <div className="my-2 min-w-0">
      <Table
        caption={caption}
        captionClassName="bg-paper px-2 py-1 text-left text-xs font-semibold text-ink"
        box="max-h-96 overflow-auto rounded border border-rule"
        boxLabel={caption}
      >
        <thead className="sticky top-0 bg-surface">
          <tr>
            {table.columns.map((c, i) => (
              <Th key={i} className="border-b border-rule-strong px-2 py-1 text-right align-bottom font-semibold">
                <span className="font-mono">{c.name}</span>
                {c.unit ? <span className="block text-xs font-normal text-ink-muted">{unitLabel(c.unit)}</span> : null}
              </Th>
            ))}
          </tr>
        </thead>
        <tbody className="font-mono">
          {table.rows.map((row, r) => {
            const error = table.errors[r];
            return (
              <tr key={r} className="border-t border-rule first:border-t-0">
                {error ? (
                  <>
                    <Td numeric className="px-2 py-0.5">
                      {row[0] === null || row[0] === undefined ? '—' : formatNumberText(row[0], significantFigures)}
                    </Td>
                    {n > 1 ? (
                      <Td colSpan={n - 1} className="bg-fail-soft px-2 py-0.5 font-sans text-fail">
                        Step failed: {error}
                      </Td>
                    ) : null}
                  </>
                ) : (
                  table.columns.map((_, i) => (
                    <Td
                      key={i}
                      numeric
                      className="px-2 py-0.5"
                      title={row[i] === null || row[i] === undefined ? undefined : `full precision: ${row[i]}`}
                    >
                      {row[i] === null || row[i] === undefined ? (
                        <>
                          <span aria-hidden="true">—</span>
                          <span className="sr-only">no value</span>
                        </>
                      ) : (
                        formatNumberText(row[i]!, significantFigures)
                      )}
                    </Td>
                  ))
                )}
              </tr>
            );
          })}
        </tbody>
      </Table>
      <p className="mt-1 text-xs">
        <a
          href={href}
          download={csvFileName ?? `sweep-line${line}.csv`}
          className="text-accent underline hover:text-accent-hover"
        >
          Download CSV<span className="sr-only"> of the sweep on line {line}</span>
        </a>{' '}
        <span className="text-ink-muted">(full precision)</span>
      </p>
    </div>
  );
}
