// The issued PDF carries the originator's written acknowledgements of the version's errors and
// warnings, and, for a design input linked to a cell, the value the engine used or the mismatch.
// Read back with pdftotext (poppler).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { expect, it } from 'vitest';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { buildRevisionPdfData } from './pdf-fixture';

const folder = mkdtempSync(path.join(tmpdir(), 'ws-pdf-ack-'));
async function text(data: ReturnType<typeof buildRevisionPdfData>, name: string): Promise<string> {
  const file = path.join(folder, name);
  writeFileSync(file, await renderRevisionPdf(data));
  return execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

it('prints the acknowledgements and the design inputs checked against the cells', async () => {
  const data = buildRevisionPdfData();
  expect(data.version.content.record.inputs.length).toBeGreaterThan(0);
  data.acknowledgements = [
    {
      item: 'Cell error: cell 1, line 2 (L = 2 m + 3 s): units do not match',
      text: 'Line 2 is a placeholder kept for the next revision.',
    },
  ];
  data.designInputChecks = [
    {
      index: 0,
      cell: 'T',
      engineValue: '160 MeV',
      match: false,
      words: 'does not match: the record gives 150 MeV, the sheet uses 160 MeV',
    },
  ];
  const withAcks = await text(data, 'with.pdf');
  expect(withAcks).toContain('Acknowledged in writing by the originator on submission');
  expect(withAcks).toContain('Line 2 is a placeholder kept for the next revision.');
  expect(withAcks).toMatch(/cell T: ERROR, does not match: the record gives 150 MeV, the sheet uses 160 MeV/);
  data.acknowledgements = [];
  data.designInputChecks = [];
  const without = await text(data, 'without.pdf');
  expect(without).not.toContain('Acknowledged in writing');
  expect(without).not.toContain('cell T');
}, 120_000);
