// The physics lint's warnings in the issued PDF (issue 15): beside the statement, and counted in the
// evaluation summary; a revision whose stored results predate warnings renders with none.
// Rendered from a real engine evaluation and read back with poppler's pdftotext.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { RevisionPdfData } from '../../lib/issue/pdf-data';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { buildRevisionPdfData } from './pdf-fixture';

const folder = mkdtempSync(path.join(tmpdir(), 'ws-pdf-warnings-'));
/** Whitespace runs to one space: text wrapped over lines reads as one run. */
const flat = (s: string) => s.replace(/\s+/g, ' ');

async function pdfText(data: RevisionPdfData, name: string): Promise<string> {
  const file = path.join(folder, name);
  writeFileSync(file, await renderRevisionPdf(data));
  return flat(execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' }));
}

const CELLS = [
  {
    id: 'photon',
    kind: 'calc' as const,
    source: 'lambda_1 = 500 nm\nE_ph = h * c / lambda_1\nE_ok = h_P * c / lambda_1 to eV',
  },
];

let withWarnings: string;
let stored: string;

beforeAll(async () => {
  const data = buildRevisionPdfData({ cells: CELLS });
  // The engine's own result carries the warning (checked here so the PDF check below cannot pass vacuously).
  expect(data.version.results.cells[0].statements[1].warnings).toHaveLength(1);
  withWarnings = await pdfText(data, 'warnings.pdf');
  // The same revision as stored before warnings existed: the field is absent.
  const old = buildRevisionPdfData({ cells: CELLS });
  for (const cell of old.version.results.cells) {
    delete cell.warnings;
    for (const st of cell.statements) delete st.warnings;
  }
  stored = await pdfText(old, 'stored.pdf');
}, 180_000);

describe('the issued PDF', () => {
  it('prints the warning beside the statement, introduced by the word (not by colour alone)', () => {
    // Issue 15: `h` in h*c/λ is the hour (common practice: mathjs reads h as the hour).
    expect(withWarnings).toContain('Warning: `h` here is the hour (a unit of time); the Planck constant is `h_P`');
    // Beside its own statement: after the statement's source, before the next statement's.
    const at = withWarnings.indexOf('Warning: `h` here is the hour');
    expect(withWarnings.lastIndexOf('E_ph = h * c / lambda_1', at)).toBeGreaterThan(-1);
    expect(withWarnings.indexOf('E_ok = h_P * c / lambda_1', at)).toBeGreaterThan(at);
  });

  it('counts the warnings in the evaluation summary', () => {
    expect(withWarnings).toMatch(
      /Warnings 1 \(a name read as a unit or a mathematical constant where a physical constant may be meant; shown beside each statement\)/,
    );
  });

  it('renders results stored without the field as having no warnings', () => {
    expect(stored).not.toContain('Warning:');
    expect(stored).toContain('Warnings none');
    expect(stored).toContain('E_ph = h * c / lambda_1');
  });
});
