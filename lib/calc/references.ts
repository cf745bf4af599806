// Citations of other sheets' issued results: `fromRevision("TPT2-CALC-0003", "B", "Brho")` in a
// calculation cell reads the result named Brho of revision B of sheet TPT2-CALC-0003, pinned to that
// revision. The server finds the citations before evaluating (the engine never reads the database),
// resolves each to the value as issued, and records which revisions a version depends on.
import type { CellInput, SheetReference } from './types';

/** The function a cell calls to cite an issued result. */
export const REFERENCE_FUNCTION = 'fromRevision';

/** Strips a `#` comment that is not inside a string. */
export function stripComment(line: string): string {
  let quote: string | null = null;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quote) {
      if (ch === '\\') i++;
      else if (ch === quote) quote = null;
    } else if (ch === '"' || ch === "'") quote = ch;
    else if (ch === '#') return line.slice(0, i);
  }
  return line;
}

const CALL =
  /\bfromRevision\s*\(\s*(["'])([^"'\\]{1,100})\1\s*,\s*(["'])([^"'\\]{1,20})\3\s*,\s*(["'])([^"'\\]{1,100})\5\s*\)/g;

export function referenceKey(r: SheetReference): string {
  return `${r.sheet}\u0000${r.revision}\u0000${r.name}`;
}

/**
 * Every citation written in the calculation cells, once each, in order of first appearance. Only
 * citations written with three quoted strings are found; the engine refuses any other form.
 */
export function findReferences(cells: readonly Pick<CellInput, 'kind' | 'source'>[]): SheetReference[] {
  const out = new Map<string, SheetReference>();
  for (const cell of cells) {
    if (cell.kind !== 'calc' || !cell.source.includes(REFERENCE_FUNCTION)) continue;
    for (const raw of cell.source.split(/\r?\n/)) {
      const line = stripComment(raw);
      for (const m of line.matchAll(CALL)) {
        const ref = { sheet: m[2].trim().toUpperCase(), revision: m[4].trim().toUpperCase(), name: m[6].trim() };
        out.set(referenceKey(ref), ref);
      }
    }
  }
  return [...out.values()];
}
