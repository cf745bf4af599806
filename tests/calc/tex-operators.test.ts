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
    expect(cell.statements.map((s) => s.tex).slice(1, 4)).toEqual([
      'y = 3\\cdot x',
      'z = 1\\cdot e',
      'w = m_{\\mathrm{p}}\\cdot c',
    ]);
  });

  it('gives TeX that KaTeX typesets without an error, for the formula and the values substituted', () => {
    for (const s of cell.statements) {
      expect(s.error).toBeNull();
      for (const tex of [s.tex, s.substitutedTex ?? ''])
        expect(() => katex.renderToString(tex, { throwOnError: true, strict: 'ignore' })).not.toThrow();
    }
  });
});

describe('symbols that could be read two ways', () => {
  const engine = createSheetEngine();
  const st = (source: string) =>
    engine.evaluate([{ id: 'a', kind: 'calc', source }], { significantFigures: 6 }).cells[0].statements.at(-1)!;

  it("sets Euler's number upright and the elementary charge as the italic e (ISO 80000-2: mathematical constants upright; CODATA symbol e)", () => {
    expect(st('x_1 = e * 1 V').tex).toBe('x_{\\mathrm{1}} = \\mathrm{e}\\cdot1~\\mathrm{V}');
    expect(st('x_2 = q_e * 1 V').tex).toBe('x_{\\mathrm{2}} = e\\cdot1~\\mathrm{V}');
    expect(st('x_3 = e^2').tex).toBe('x_{\\mathrm{3}} = {\\mathrm{e}}^{2}');
  });

  it('writes number(p, "MeV/c") as the quantity over the unit (ISO 80000-1, {Q} = Q/[Q]), not as a product with a string', () => {
    const s = st('p = momentumFromKinetic(250 MeV, m_p)\nn_1 = number(p, "MeV/c")');
    expect(s.tex).toBe('n_{\\mathrm{1}} = \\frac{p}{\\mathrm{MeV}/c}');
    // In SI units the momentum substituted is 729.134 MeV/c = 3.896 70 × 10⁻¹⁹ kg·m/s (CODATA 2018 e and c, exact).
    expect(s.substitutedTex).toBe(
      'n_{\\mathrm{1}} = \\frac{\\left(3.896\\,70 \\times 10^{-19}\\ \\mathrm{kg}\\cdot \\mathrm{m}/\\mathrm{s}\\right)}{\\mathrm{MeV}/c}',
    );
  });

  it('typesets hypot, which mathjs writes as the undefined control sequence \\hypot', () => {
    const s = st('h_1 = hypot(3, 4)');
    expect(s.tex).toBe('h_{\\mathrm{1}} = \\mathrm{hypot}\\left(3,4\\right)');
    expect(() => katex.renderToString(s.tex!, { throwOnError: true, strict: 'ignore' })).not.toThrow();
  });
});

describe('numbers in a formula', () => {
  const engine = createSheetEngine();
  const tex = (source: string) =>
    engine.evaluate([{ id: 'a', kind: 'calc', source }], { significantFigures: 6 }).cells[0].statements[0].tex;

  it('write powers of ten with × and no plus sign, as the result does (ISO 80000-1 §7.1.3, common practice)', () => {
    expect(tex('d_1 = 3e12 m')).toBe('d_{\\mathrm{1}} = 3\\times 10^{12}~\\mathrm{m}');
    expect(tex('r_1 = 4.5e-10')).toBe('r_{\\mathrm{1}} = 4.5\\times 10^{-10}');
    // From 10⁻⁴ to below 10⁶ the digits are written out (mathjs would write 150000 as 1.5 · 10⁺⁵).
    expect(tex('x_1 = 150000 * 2')).toBe('x_{\\mathrm{1}} = 150000\\cdot2');
    expect(tex('x_2 = 0.000125')).toBe('x_{\\mathrm{2}} = 0.000125');
    expect(tex('x_3 = 2500000')).toBe('x_{\\mathrm{3}} = 2.5\\times 10^{6}');
  });
});
