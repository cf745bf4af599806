// The issued PDF's signatures section carries the checker's alternate calculation compared with the
// sheet (tolerance, both values, relative difference, the outcome in words), and nothing when the
// alternate calculation shares no name with the sheet. Read back with pdftotext (poppler).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { expect, it } from 'vitest';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { buildRevisionPdfData } from './pdf-fixture';

const folder = mkdtempSync(path.join(tmpdir(), 'ws-pdf-alt-'));
async function text(data: ReturnType<typeof buildRevisionPdfData>, name: string): Promise<string> {
  const file = path.join(folder, name);
  writeFileSync(file, await renderRevisionPdf(data));
  return execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

it('prints the alternate comparison after the signatures, outcome in words', async () => {
  const data = buildRevisionPdfData();
  data.alternateComparison = {
    toleranceText: '0.1 %',
    rows: [
      // 2.432 13 T·m / 1.35 m = 1.801 58 T (arithmetic); the alternate agrees to rounding.
      {
        name: 'B_max',
        sheet: '1.801 58 T',
        alternate: '1.801 58 T',
        relativeDifference: '2.1 × 10⁻¹⁶',
        outcome: 'within the tolerance of 0.1 %',
      },
      {
        name: 'T_max',
        sheet: '250 MeV',
        alternate: '250.1 MeV',
        relativeDifference: '4 × 10⁻⁴',
        outcome: 'within the tolerance of 0.1 %',
      },
    ],
  };
  const withTable = await text(data, 'with.pdf');
  expect(withTable).toContain("Checker's alternate calculation compared with the sheet (tolerance 0.1 %, relative)");
  expect(withTable).toMatch(/B_max 1\.801 58 T 1\.801 58 T 2\.1 × 10⁻¹⁶ within the tolerance of 0\.1 %/);
  expect(withTable).toMatch(/T_max 250 MeV 250\.1 MeV 4 × 10⁻⁴ within the tolerance of 0\.1 %/);
  data.alternateComparison = null;
  expect(await text(data, 'without.pdf')).not.toContain('alternate calculation compared');
}, 120_000);
