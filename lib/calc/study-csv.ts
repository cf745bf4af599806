// A sweep's table as a CSV file (RFC 4180: comma-separated, CRLF line ends, fields with a comma,
// quote or line break quoted with quotes doubled). The header names each column as the data-table
// attachments are written, `name [unit]`, so a file without failed steps can be attached to another
// sheet as an input table. Numbers are written at full double precision (`String(n)` is the
// shortest text that reads back as the same double), never rounded for display.
import type { StudyTable } from './types';

/** A text field quoted as RFC 4180 asks; a leading =, +, - or @ is prefixed so spreadsheet programs do not run it (OWASP CSV injection). */
function textField(value: string): string {
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** A number field: empty for a missing value, otherwise the shortest round-trip text. */
function numberField(value: number | null): string {
  return value === null ? '' : String(value);
}

/**
 * The table as CSV text. When a step failed its values are empty, and a last column `error` says
 * why (only present when some step failed).
 */
export function studyTableCsv(table: StudyTable): string {
  const failed = table.errors.some((e) => e !== null);
  const header = table.columns.map((c) => textField(c.unit ? `${c.name} [${c.unit}]` : c.name));
  if (failed) header.push('error');
  const lines = table.rows.map((row, r) => {
    const cells = table.columns.map((_, c) => numberField(row[c] ?? null));
    if (failed) cells.push(textField(table.errors[r] ?? ''));
    return cells.join(',');
  });
  return `${[header.join(','), ...lines].join('\r\n')}\r\n`;
}

/** The download's file name: `TPT2-CALC-0003-v4-cell2-line3.csv` (cell number as shown, from 1). */
export function studyCsvFileName({
  sheet,
  version,
  cellNumber,
  line,
}: {
  sheet: string;
  version: number;
  cellNumber: number;
  line: number;
}): string {
  return `${sheet}-v${version}-cell${cellNumber}-line${line}.csv`;
}
