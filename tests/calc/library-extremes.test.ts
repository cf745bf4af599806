// No silent NaN or infinity from the library (issue 15): every kernel, at every combination of
// extreme finite inputs (1e-300 … 1e300, both signs, 0, and speeds at the edges of their domain),
// returns finite numbers or refuses with a DomainError. And the cases of the issue, computed right:
// lengthContraction(1e302 m, 0.5) = 1e302·√0.75 m, electronWavelength(1e-305 V) = h/√(2 mₑ e U) ≈
// 3.9e143 m (non-relativistic limit, eU ≪ mₑc²; de Broglie relation, e.g. PDG RPP 2024 and any
// modern-physics text), both against 50-digit references.
import { describe, expect, it } from 'vitest';
import { type CalcFunction, DomainError, LIBRARY } from '../../lib/calc/functions';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { type Dec, REFERENCES, ulpError } from './reference-math';

const magnitudes = [1e-300, 1e-200, 1e-100, 1e-10, 1, 1e10, 1e100, 1e200, 1e300];
const GENERAL = [0, ...magnitudes, ...magnitudes.map((x) => -x)];
const BELOW_ONE = 1 - 2 ** -53;
const SPEEDS = [0, 1e-300, -1e-300, 1e-150, 0.5, -0.5, BELOW_ONE, -BELOW_ONE, 1, -1];
const NUMBERS = [1, 1 + 2 ** -52, 2, 1e10, 1e300, 0.5];
const ANGLES = [0, 1e-300, -1e-300, 1, -1, Math.PI, -Math.PI];

function candidates(fn: CalcFunction, index: number): number[] {
  switch (fn.params[index].kind) {
    case 'speed':
      return SPEEDS;
    case 'number':
      return NUMBERS;
    case 'angle':
      return ANGLES;
    default:
      return GENERAL;
  }
}

function* combinations(lists: number[][]): Generator<number[]> {
  if (lists.length === 0) {
    yield [];
    return;
  }
  for (const head of lists[0]) for (const rest of combinations(lists.slice(1))) yield [head, ...rest];
}

describe('extreme finite inputs', () => {
  it('give a finite result or a DomainError from every kernel, never NaN or ±Infinity', () => {
    const summary: string[] = [];
    const bad: string[] = [];
    for (const fn of LIBRARY) {
      let finite = 0;
      let refused = 0;
      for (const args of combinations(fn.params.map((_, i) => candidates(fn, i)))) {
        let result: number | [number, number];
        try {
          result = fn.kernel(...args);
        } catch (error) {
          if (error instanceof DomainError) {
            refused++;
            continue;
          }
          bad.push(`${fn.name}(${args.join(', ')}) threw ${String(error)}`);
          continue;
        }
        const values = Array.isArray(result) ? result : [result];
        if (values.every((x) => typeof x === 'number' && Number.isFinite(x))) finite++;
        else bad.push(`${fn.name}(${args.join(', ')}) = ${String(result)}`);
      }
      summary.push(
        `  ${fn.name.padEnd(34)} ${String(finite).padStart(6)} finite, ${String(refused).padStart(6)} refused`,
      );
    }
    console.log(['Extreme inputs (0, ±1e-300 … ±1e300; speeds at the edges):', ...summary].join('\n'));
    const byFunction = new Map<string, string[]>();
    for (const b of bad) {
      const name = b.slice(0, b.indexOf('('));
      byFunction.set(name, [...(byFunction.get(name) ?? []), b]);
    }
    expect(
      [...byFunction].map(([name, list]) => `${list.length} × ${name}, e.g. ${list.slice(0, 3).join('; ')}`),
    ).toEqual([]);
  });
});

describe('the cases of the issue', () => {
  const engine = createSheetEngine();
  const one = (source: string) =>
    engine.evaluate([{ id: 'x', kind: 'calc', source }], { significantFigures: 6 }).cells[0];
  const kernel = (name: string) => LIBRARY.find((f) => f.name === name)!.kernel as (...a: number[]) => number;

  it('lengthContraction(1e302 m, 0.5) is 8.66e301 m, not NaN', () => {
    const ref = REFERENCES.lengthContraction(1e302, 0.5) as Dec;
    expect(ref.toExponential(2)).toBe('8.66e+301');
    expect(ulpError(kernel('lengthContraction')(1e302, 0.5), ref)).toBeLessThanOrEqual(0.5);
    expect(
      ulpError(kernel('timeDilation')(1e302, 0.5), REFERENCES.timeDilation(1e302, 0.5) as Dec),
    ).toBeLessThanOrEqual(0.5);
    const cell = one('L = lengthContraction(1e302 m, 0.5) / (1 m)');
    expect(cell.ok).toBe(true);
    expect(ulpError(cell.statements[0].value!.number!, ref)).toBeLessThanOrEqual(0.5);
  });

  it('electronWavelength(1e-305 V) is 3.9e143 m, not NaN, and the smallest voltages stay finite', () => {
    for (const U of [1e-305, 1e-320, 5e-324, 1e-3, 1e300]) {
      const ref = REFERENCES.electronWavelength(U) as Dec;
      expect(ulpError(kernel('electronWavelength')(U), ref), `U = ${U}`).toBeLessThanOrEqual(1);
    }
    expect((REFERENCES.electronWavelength(1e-305) as Dec).toExponential(1)).toBe('3.9e+143');
    const cell = one('lambda = electronWavelength(1e-305 V) / (1 m)');
    expect(cell.ok).toBe(true);
    expect(
      ulpError(cell.statements[0].value!.number!, REFERENCES.electronWavelength(1e-305) as Dec),
    ).toBeLessThanOrEqual(1);
  });
});
