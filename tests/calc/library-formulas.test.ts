// Every library function's formula, as the function reference page shows it, typesets in KaTeX
// (common practice: a formula the reader cannot see is a formula the checker cannot check).
import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { LIBRARY } from '../../lib/calc/functions';

describe('the function reference formulas', () => {
  it('typeset without a KaTeX error for every function', () => {
    const failures: string[] = [];
    for (const f of LIBRARY) {
      try {
        katex.renderToString(f.doc.formula, { throwOnError: true });
      } catch (error) {
        failures.push(`${f.name}: ${(error as Error).message}`);
      }
    }
    expect(failures).toEqual([]);
  });
});
