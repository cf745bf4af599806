// The sandbox: a cell that runs too long or needs too much memory ends with a clear error on that
// cell, the worker is replaced, and the rest of the sheet is still evaluated.
// Expected numbers are the hand-checked arithmetic of the statements under test (common practice),
// with unit conversions by SI prefix definitions (SI Brochure, 9th ed., §3); a physical reference
// value names its source beside it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SandboxedEvaluator } from '../../lib/calc/sandbox/evaluator';
import type { CellInput } from '../../lib/calc/types';

const evaluator = new SandboxedEvaluator({ timeoutMs: 3000, memoryMb: 96, workers: 1 });
// A cold worker compiles the engine on its first request; warm it so the time limit measures the cell.
beforeAll(async () => {
  await evaluator.evaluate([{ id: 'w', kind: 'calc', source: 'x_w = lorentzFactor(0.5) * 2 m to cm' }], { significantFigures: 6 });
});
afterAll(() => evaluator.close());

const cells = (...sources: string[]): CellInput[] => sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));

describe('limits', () => {
  it('stops a cell that exceeds the time limit and evaluates the others', async () => {
    const r = await evaluator.evaluate(
      cells('a = 1', 'f(x) = x > 0 ? f(x - 1) + f(x - 1) : 0', 'y = f(60)', 'z = a + 1', 'w = y + 1'),
      { significantFigures: 6 },
    );
    expect(r.cells.map((c) => c.ok)).toEqual([true, true, false, true, false]);
    expect(r.cells[2].error).toBe('stopped after 3 s: this cell takes longer than the time limit');
    expect(r.cells[3].statements[0].value?.number).toBe(2);
    expect(r.cells[4].error).toMatch(/^depends on `y`, which is not available/);
  });

  it('stops a cell that exceeds the memory limit and evaluates the others', async () => {
    const r = await evaluator.evaluate(cells('a = 2', 'k = kron(ones(1000, 1000), ones(1, 1000))', 'b_1 = a * 3'), { significantFigures: 6 });
    expect(r.cells[1].ok).toBe(false);
    expect(r.cells[1].error).toMatch(/^stopped: this cell needs more memory than the limit \(96 MB\)|^stopped after 3 s/);
    expect(r.cells[2].statements[0].value?.number).toBe(6);
  });

  it('serves the next request normally after a worker was replaced', async () => {
    const r = await evaluator.evaluate(cells('x = 3 m', 'y = x * 2'), { significantFigures: 6 });
    expect(r.ok).toBe(true);
    expect(r.cells[1].statements[0].value).toMatchObject({ number: 6, unit: 'm' });
  });

  it('answers concurrent requests', async () => {
    const results = await Promise.all(
      Array.from({ length: 6 }, (_, i) => evaluator.evaluate(cells(`x = ${i} s`, 'y = x * 2'), { significantFigures: 6 })),
    );
    expect(results.map((r) => r.cells[1].statements[0].value?.number)).toEqual([0, 2, 4, 6, 8, 10]);
  });
});
