// A symbol typeset right after an operator's control word stays a separate symbol: `3 * x` is
// `3\cdot x`, not the undefined control sequence `\cdotx` (mathjs's own SymbolNode adds the same space).
import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';

const source = [
  'x = 2',
  'y = 3 * x',
  'z = 1 * q_e',
  'w = m_p * c',
  'u = x * 2 m',
  'x <= y',
  'v = -x + sqrt(x) * x^2',
].join('\n');

describe('statement TeX', () => {
  const [cell] = createSheetEngine().evaluate([{ id: 'a', kind: 'calc', source }], { significantFigures: 6 }).cells;

  it('keeps a space between an operator and the symbol after it', () => {
    expect(cell.statements.map((s) => s.tex).slice(1, 4)).toEqual(['y = 3\\cdot x', 'z = 1\\cdot e', 'w = m_{\\mathrm{p}}\\cdot c']);
  });

  it('gives TeX that KaTeX typesets without an error, for the formula and the values substituted', () => {
    for (const s of cell.statements) {
      expect(s.error).toBeNull();
      for (const tex of [s.tex, s.substitutedTex ?? '']) expect(() => katex.renderToString(tex, { throwOnError: true, strict: 'ignore' })).not.toThrow();
    }
  });
});
