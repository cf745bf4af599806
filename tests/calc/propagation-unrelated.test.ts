// A result's propagated uncertainty follows from the statements its value is computed from, and no
// others: the measurement model of the result (JCGM 100:2008, GUM §4.1: Y = f(X1, …, XN)). A
// statement that reads the same uncertain input but that the result does not use, and that cannot
// be evaluated near the input's estimate, must not make the result's propagation fail: before, every
// statement between the input and the result that read the input was evaluated again, and the first
// error met was the result's, in first-order and Monte Carlo propagation, on SI numbers and in mathjs.
import { afterEach, describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { setNumericChain } from '../../lib/calc/studies';
import type { CellInput, SheetResult } from '../../lib/calc/types';

afterEach(() => setNumericChain(true));

const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i}`, kind: 'calc' as const, source }));

/** The propagated uncertainty of `name`, as the results give it. */
const uncertaintyOf = (r: SheetResult, name: string) => {
  const st = r.cells.flatMap((c) => c.statements).find((s) => s.name === name)!;
  return { error: st.error, value: st.value?.number, uncertainty: st.uncertainty };
};

// z is defined for x = 0.5 only (a speed of 0.5 c there, above c a step away); y = x·x does not read it.
const UNRELATED = 'z = lorentzFactor(0.5 + (x - 0.5) * (x - 0.5) * 1e20)';

describe.each([
  { path: 'on SI numbers', numeric: true },
  { path: 'in mathjs', numeric: false },
])('a propagation $path', ({ numeric }) => {
  it.each([
    { mode: 'first order', monteCarlo: undefined, y: 'y = x * x' },
    { mode: 'first order, a power', monteCarlo: undefined, y: 'y = x^2 + x' },
    { mode: 'Monte Carlo', monteCarlo: 'always' as const, y: 'y = x * x' },
    { mode: 'Monte Carlo, a power', monteCarlo: 'always' as const, y: 'y = x^2 + x' },
  ])('of $mode is not failed by a statement the result does not use', ({ monteCarlo, y }) => {
    setNumericChain(numeric);
    const options = { significantFigures: 6, monteCarlo };
    const withUnrelated = createSheetEngine().evaluate(cells('x = 0.5 ± 0.1', UNRELATED, y), options);
    const without = createSheetEngine().evaluate(cells('x = 0.5 ± 0.1', 'w = 2', y), options);
    const mine = uncertaintyOf(withUnrelated, 'y');
    expect(mine.error).toBeNull();
    expect(mine.uncertainty?.kind).toBe('propagated');
    // The same figures, to the bit, as the sheet without the unrelated statement.
    expect(mine).toEqual(uncertaintyOf(without, 'y'));
    // The unrelated statement's own propagation still fails: its model is not defined a step away.
    expect(uncertaintyOf(withUnrelated, 'z').error).toMatch(/uncertainty cannot be propagated/);
  });

  it('still fails a result computed from that statement', () => {
    setNumericChain(numeric);
    const r = createSheetEngine().evaluate(cells('x = 0.5 ± 0.1', UNRELATED, 'y = z * x'), {
      significantFigures: 6,
    });
    // z's own propagation fails, so z has no value and neither has y.
    expect(uncertaintyOf(r, 'y').error).toMatch(/depends on `z`/);
  });
});
