// Which cell results a save stores anew (lib/sheets/result-storage.ts, resultRows): the cells whose
// digests the version before does not list, each once, with the exact text its digest was made from.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import type { CellResult, SheetResult } from '../../lib/calc/types';
import { resultRows } from '../../lib/sheets/result-storage';

const cell = (id: string, text: string) => ({ id, kind: 'text', error: null, text }) as unknown as CellResult;
const result = (cells: CellResult[]) =>
  ({ ok: true, engineVersion: 'e', constantsEdition: 'c', cells }) as unknown as SheetResult;
const digest = (c: CellResult) => createHash('sha256').update(JSON.stringify(c), 'utf8').digest();

describe('resultRows', () => {
  const [a, b, c, d] = ['a', 'b', 'c', 'd'].map((x) => cell(x, `cell ${x}`));

  it('lists every cell by its SHA-256 in order, and stores each distinct one once when nothing is known', () => {
    const rows = resultRows(result([a, b, a]), null);
    expect(rows.result_cells).toEqual(Buffer.concat([digest(a), digest(b), digest(a)]));
    expect(rows.newHashes).toEqual([digest(a).toString('hex'), digest(b).toString('hex')]);
    expect(rows.newTexts).toEqual([JSON.stringify(a), JSON.stringify(b)]);
    expect(JSON.parse(rows.result_head)).toEqual({ ok: true, engineVersion: 'e', constantsEdition: 'c' });
  });

  it('stores only the cells the version before does not list, wherever they stood in it', () => {
    const known = Buffer.concat([digest(a), digest(b), digest(c)]);
    // b and a moved, c removed, d new.
    const rows = resultRows(result([b, a, d]), known);
    expect(rows.newHashes).toEqual([digest(d).toString('hex')]);
    expect(rows.newTexts).toEqual([JSON.stringify(d)]);
  });

  it('does not take a digest found across two listed digests (not at a 32-byte boundary) as listed', () => {
    const dd = digest(d);
    const known = Buffer.concat([digest(a).subarray(0, 16), dd, digest(b).subarray(16)]);
    expect(known.indexOf(dd)).toBe(16);
    const rows = resultRows(result([a, d]), known);
    expect(rows.newHashes).toEqual([digest(a).toString('hex'), dd.toString('hex')]);
  });
});
