// Error messages in the engineer's words (lib/calc/messages.ts): the examples of issue 15 ("No
// library-internal message reaches a person"), each naming the operands or argument as written,
// their units and what would work, and never mathjs's internals; "did you mean" for misspelt names.
// The physics in the hints is common practice (E₀ = mc², pc, E/c).
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { cleanMessage, didYouMean, isInternalMessage } from '../../lib/calc/messages';
import type { CellInput } from '../../lib/calc/types';

const engine = createSheetEngine();
const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (...sources: string[]) => engine.evaluate(cells(...sources), { significantFigures: 6 });
/** The error of the last statement of a one-cell sheet. */
const errorOf = (source: string): string => {
  const statements = run(source).cells[0].statements;
  const error = statements[statements.length - 1].error;
  expect(error, source).toBeTruthy();
  return error!;
};
/** Words of mathjs's internals that must never show. */
const INTERNAL_WORDS =
  /Scalar|typed|Unexpected type|Too (few|many) arguments|expected: |actual: |index: |is no angle|Units do not match|yg\b|function cot|\(char \d+\)|TypeError|Cannot compare units|DenseMatrix|identifier/;
const clean = (message: string) => {
  expect(message).not.toMatch(INTERNAL_WORDS);
  expect(isInternalMessage(message)).toBe(false);
};

describe('the examples of the issue', () => {
  it('1 MeV - 1: names both operands, the energy, and says to write the unit', () => {
    const m = errorOf('1 MeV - 1');
    clean(m);
    expect(m).toContain('`1` (a plain number)');
    expect(m).toContain('`1 MeV` (an energy)');
    expect(m).toContain('`1 MeV`');
    expect(m).toMatch(/write the unit with the number/);
  });

  it('log(1 MeV): the argument is a quantity; divide by a reference', () => {
    const m = errorOf('log(1 MeV)');
    clean(m);
    expect(m).toContain('log takes a plain number');
    expect(m).toContain('`1 MeV` (an energy)');
    expect(m).toContain('log(1 MeV / (1 MeV))');
  });

  it('sin(1 m): the argument is a length, not an angle (no "cot")', () => {
    const m = errorOf('sin(1 m)');
    clean(m);
    expect(m).toContain('sin takes an angle');
    expect(m).toContain('`1 m` (a length)');
  });

  it('m_p to MeV: a mass cannot be converted to an energy; the rest energy is m_p * c^2', () => {
    const m = errorOf('m_p to MeV');
    clean(m);
    expect(m).toMatch(/`m_p` \(a mass, 1\.672\s62 × 10⁻²⁷ kg\)/);
    expect(m).toContain('MeV (an energy)');
    expect(m).toContain('for the rest energy write `m_p * c^2 to MeV`');
    // The suggestion works: m_p c² = 938.272 MeV (CODATA 2022: 938.272 089 43 MeV).
    expect(run('m_p * c^2 to MeV').cells[0].statements[0].value?.text).toMatch(/^938\.272 MeV$/);
  });

  it('other conversions that need a power of c say which', () => {
    expect(errorOf('p_1 = 1 kg m/s\np_1 to MeV')).toContain('for pc write `p_1 * c to MeV`');
    expect(errorOf('E_1 = 1 MeV\nE_1 to kg')).toContain('`E_1 / c^2 to kg`');
    const m = errorOf('5 m to s');
    clean(m);
    expect(m).toContain('cannot convert `5 m` (a length) to s (a time)');
  });

  it('2 m + 3 s: names both operands and their dimensions', () => {
    const m = errorOf('2 m + 3 s');
    clean(m);
    expect(m).toContain('`2 m` (a length)');
    expect(m).toContain('`3 s` (a time)');
    expect(m).toMatch(/same dimension/);
  });

  it('an operand that is a name shows its value and unit', () => {
    const m = errorOf('L_1 = 2 m\nt_1 = 3 s\ny = L_1 + t_1');
    clean(m);
    expect(m).toContain('`L_1` (a length, 2 m)');
    expect(m).toContain('`t_1` (a time, 3 s)');
  });

  it('1 T m is the unit T·m (names.test.ts covers the sheet that defines m)', () => {
    expect(run('1 T m').cells[0].statements[0].value?.unit).toBe('T m');
  });
});

describe('more of mathjs’s errors, in words', () => {
  const cases: Array<[string, RegExp]> = [
    ['exp(1 m)', /exp takes a plain number; `1 m` \(a length\)/],
    ['sqrt(1 m, 2)', /sqrt takes 1 argument; `sqrt\(1 m, 2\)` has 2/],
    ['x = 1 kg + 2', /write the unit with the number \(`2 kg`\)/],
    ['max(1 m, 2 s)', /cannot compare `1 m` \(a length\) and `2 s` \(a time\)/],
    ['1 m < 2 s', /`1 m` \(a length\) and `2 s` \(a time\)/],
    ['1 m ^ (1 s)', /the exponent `1 s` \(a time\) must be a plain number/],
    ['cos(2 kg)', /`2 kg` \(a mass\) is not an angle/],
    ['abs("x")', /`"x"` is a text, not a number/],
    ['number(1 m, "s")', /cannot convert `1 m` \(a length\) to s \(a time\)/],
    ['floor(2.5 m)', /floor takes a plain number/],
    ['[1 m, 2 s] + 1', /every element of a list/],
    ['f(x) = x + 1 m\nf(2)', /in `f\(2\)`, with x = 2: cannot add `x` \(a plain number, 2\) and `1 m` \(a length\)/],
    ['2 m to', /the line ends where a value or a closing bracket is expected/],
    ['z = 1 m +* 2', /a value is expected, at character 10 \(`\* 2`\)/],
    ['y = 3 4', /"4" is not expected here/],
  ];
  for (const [source, expected] of cases) {
    it(source.replace(/\n/g, ' ⏎ '), () => {
      const m = errorOf(source);
      clean(m);
      expect(m).toMatch(expected);
    });
  }

  it('a message of the library or of the engine itself passes through unchanged', () => {
    expect(errorOf('speedFromKinetic(-5 MeV, m_p)')).toMatch(/^speedFromKinetic: /);
    expect(errorOf('lorentzFactor(0.5, 2)')).toBe('lorentzFactor takes 1 argument (v); got 2');
  });

  it('no statement of a list of failing ones shows mathjs’s words', () => {
    const failing = [
      '1 m + true',
      'sum(1 m, 2)',
      'mod(5 m, 2)',
      '"abc" + 1',
      'det([1 m, 2])',
      'concat(1, 2)',
      'log(1 MeV, 2 s)',
      'sinh(1 kg)',
      '1 MeV * 2 + 3',
      'min(1 m, 2)',
      'round(1 m)',
      'atan2(1 m, 1 s)',
      'cross([1 m], [2])',
      'x_2 = [1 m, 2 s]\nsum(x_2)',
      'hypot(1 m, 1 s)',
    ];
    for (const source of failing) {
      const statements = run(source).cells[0].statements;
      const error = statements[statements.length - 1].error;
      if (error) clean(error);
    }
  });

  it('cleanMessage says a sweep row’s mathjs error in words', () => {
    expect(
      cleanMessage(
        new TypeError(
          'Unexpected type of argument in function subtractScalar (expected: Unit, actual: number, index: 1)',
        ),
      ),
    ).not.toMatch(INTERNAL_WORDS);
    expect(cleanMessage(new Error('speedFromKinetic: T must be ≥ 0'))).toBe('speedFromKinetic: T must be ≥ 0');
  });
});

describe('did you mean', () => {
  it('suggests names in another case, and within an edit or two', () => {
    expect(errorOf('lorentzfactor(0.5)')).toBe('`lorentzfactor` is not defined; did you mean `lorentzFactor`?');
    expect(errorOf('lorenztFactor(0.5)')).toContain('did you mean `lorentzFactor`');
    expect(errorOf('T_kin = 250 MeV\nx = T_knn * 2')).toContain('did you mean `T_kin`');
    expect(errorOf('E_k = 5 Mev')).toContain('did you mean `MeV`');
    expect(errorOf('x = m_P')).toContain('did you mean `m_p`');
    expect(errorOf('x = speedFromKinetik(1 MeV, m_p)')).toContain('`speedFromKinetic`');
  });

  it('suggests nothing far away, and nothing for one-letter names', () => {
    expect(errorOf('x = qqq_zz')).toBe('`qqq_zz` is not defined');
    expect(didYouMean('q', ['p', 'Q'])).toEqual(['Q']);
    expect(didYouMean('q', ['p', 'r'])).toEqual([]);
    expect(didYouMean('gama', ['gamma', 'game', 'lambda'])).toEqual(['game', 'gamma']);
  });
});

describe('did you mean, with the cell cache', () => {
  it('follows a change of the names above (the suggestion is part of the cell’s cache key)', () => {
    const own = createSheetEngine();
    const first = own.evaluate(cells('T_kin = 250 MeV', 'x = T_knn * 2'), { significantFigures: 6 });
    expect(first.cells[1].error).toContain('did you mean `T_kin`');
    const renamed = own.evaluate(cells('T_knx = 250 MeV', 'x = T_knn * 2'), { significantFigures: 6 });
    expect(renamed.cells[1].error).toContain('did you mean `T_knx`');
  });
});
