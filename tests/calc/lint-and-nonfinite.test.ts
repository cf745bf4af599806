// The physics lint (lib/calc/lint.ts), the reduced Planck constant, and the refusal of non-finite or
// complex results (issue 15: "Silent wrong answers to end").
// Expected numbers are the hand-checked arithmetic of the statements under test (common practice);
// a physical reference value names its source beside it.
import { describe, expect, it } from 'vitest';
import { CONSTANTS } from '../../lib/calc/constants';
import { LINT_EXAMPLES, SUSPECT_NAMES } from '../../lib/calc/lint';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';
import { D, ulpError } from './reference-math';

const engine = createSheetEngine();
const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (...sources: string[]) => engine.evaluate(cells(...sources), { significantFigures: 6 });
/** The one statement of a one-line sheet. */
const one = (source: string) => run(source).cells[0].statements[0];

describe('the physics lint', () => {
  it('warns that `h` in h*c/(500 nm) is the hour and points at h_P (the result is a plain number)', () => {
    const st = one('E_ph = h * c / (500 nm)');
    // mathjs reads h as the hour: 3600 s × c / 500 nm is a plain number (common practice: dimensional analysis).
    expect(st.error).toBeNull();
    expect(st.value?.kind).toBe('number');
    expect(st.warnings).toEqual(['`h` here is the hour (a unit of time); the Planck constant is `h_P`']);
  });

  it('warns that `hbar` is the hectobar and points at the reduced Planck constant hbar_P (or ħ)', () => {
    const st = one('x = hbar * c');
    expect(st.warnings).toEqual([
      '`hbar` here is the hectobar (a unit of pressure, 10⁷ Pa); the reduced Planck constant is `hbar_P` (or `ħ`)',
    ]);
    // And the suggestion is right: hbar_P c = 3.161 526 77… × 10⁻²⁶ J m (CODATA 2022: ħc = 197.326 980 4… MeV fm).
    const fixed = one('x = hbar_P * c to MeV*fm');
    expect(fixed.warnings).toEqual([]);
    expect(fixed.value!.number).toBeCloseTo(197.3269804, 6);
  });

  it('warns that `e` in e * 1 V is Euler’s number, and points at q_e', () => {
    const st = one('U_1 = e * 1 V');
    expect(st.value?.number).toBeCloseTo(Math.E, 12); // 2.718… V, evaluated as written
    expect(st.warnings).toEqual([
      '`e` here is Euler’s number 2.718…; the elementary charge is `q_e` (Euler’s number as the base of a power, `e^x`, is fine)',
    ]);
    // `E` is Euler's number too (mathjs), and cannot be a sheet's energy.
    // A number before `e` does not make it meant: `2 e` is twice Euler's number, not two charges.
    expect(one('Q_1 = 2 e').warnings).toHaveLength(1);
    expect(one('x = 2 * E').warnings![0]).toMatch(
      /^`E` here is Euler’s number 2\.718…; the elementary charge is `q_e`; a quantity of the sheet \(an energy\) needs a name of its own/,
    );
  });

  it('warns that `g` is the gram, pointing at g_n, and that `kB` is the kilobyte, pointing at boltzmann', () => {
    expect(one('F_w = 70 kg * g').warnings).toEqual([
      '`g` here is the gram (a unit of mass); the standard acceleration of gravity is `g_n`',
    ]);
    expect(one('E_th = kB * 300 K').warnings).toEqual([
      '`kB` here is the kilobyte (a unit of information, 8000 bits); the Boltzmann constant is `boltzmann`',
    ]);
  });

  it('does not warn where the name is meant: after a number, e as the base of a power or of a logarithm, after `to`, a parameter', () => {
    for (const source of [
      't_1 = 2 h',
      't_2 = 2*h',
      't_3 = -3*h + 20 min',
      'y = e^2',
      'y = e^(-0.5)',
      'y = log(10, e)',
      'm_1 = 2 kg to g',
      'f(h) = h * 2',
      'p_1 = 2 hbar',
      'x = 5 g',
    ]) {
      const st = one(source);
      expect(st.error, source).toBeNull();
      expect(st.warnings, source).toEqual([]);
    }
    // …but a product that goes on after `2*h` is the same mistake as `h*c`.
    expect(one('x = 2*h*c').warnings).toHaveLength(1);
    // Inside parentheses a name is as bare as outside them.
    expect(one('x = (h) * c').warnings).toHaveLength(1);
  });

  it('does not warn for the constants themselves (h_P, hbar_P, ħ, q_e, g_n)', () => {
    for (const source of ['x = h_P * c / (500 nm)', 'x = hbar_P * c', 'x = ħ * c', 'x = q_e * 1 V', 'x = 70 kg * g_n'])
      expect(one(source).warnings, source).toEqual([]);
  });

  it('is silenced by the sheet’s own definition of the name, wherever it stands, but not for a name that cannot be redefined', () => {
    const r = run('h = 2 m', 'A_1 = h * 3 m');
    expect(r.cells[1].statements[0].warnings).toEqual([]);
    expect(r.cells[1].statements[0].value?.number).toBe(6);
    // A definition below: the use is an error (used before defined), and the name is the sheet's.
    const below = run('x = h * c', 'h = 2 m');
    expect(below.cells[0].statements[0].warnings).toEqual([]);
    // The sheet cannot define `e`, so the warning stays beside the use (the definition is refused).
    const e = run('e = 5', 'x = e * 1 V');
    expect(e.cells[0].ok).toBe(false);
    expect(e.cells[1].statements[0].warnings).toHaveLength(1);
  });

  it('collects each cell’s warnings as "line N: …", and re-evaluation from the cache keeps them right', () => {
    const r = run('a_1 = 1\nx = h * c\ny = g * 2');
    expect(r.cells[0].warnings).toEqual([
      'line 2: `h` here is the hour (a unit of time); the Planck constant is `h_P`',
      'line 3: `g` here is the gram (a unit of mass); the standard acceleration of gravity is `g_n`',
    ]);
    // The same cell, cached, then with `h` defined by a later cell: the warning goes.
    expect(run('x = h * c').cells[0].warnings).toHaveLength(1);
    const later = run('x = h * c', 'h = 2 m');
    expect(later.cells[0].warnings).toEqual([]);
    expect(run('x = h * c').cells[0].warnings).toHaveLength(1);
  });

  it('gives exactly the documented warning for every example of the function reference', () => {
    for (const x of LINT_EXAMPLES) {
      const st = one(x.source);
      expect(st.error, x.source).toBeNull();
      expect(st.warnings, x.source).toEqual(x.warning ? [x.warning] : []);
    }
  });

  it('points only at names the engine has: every suggested constant evaluates', () => {
    const suggested = [...SUSPECT_NAMES.values()]
      .flatMap((s) => [...s.intended.matchAll(/`([^`]+)`/g)].map((m) => m[1]))
      .filter((n) => !n.includes('^') && n !== 'E_k');
    expect(suggested).toEqual(
      expect.arrayContaining(['h_P', 'hbar_P', 'ħ', 'q_e', 'g_n', 'boltzmann', 'gravitationConstant', 'gasConstant']),
    );
    for (const name of suggested) {
      const st = one(`x = ${name}`);
      expect(st.error, name).toBeNull();
      expect(st.value?.kind, name).toBe('quantity');
    }
  });
});

describe('the reduced Planck constant', () => {
  it('is h/(2π) at full double precision (CODATA 2022: ħ = 1.054 571 817… × 10⁻³⁴ J s, exact)', () => {
    const hbar = CONSTANTS.find((k) => k.name === 'hbar_P')!;
    expect(hbar).toMatchObject({
      unit: 'J s',
      uncertainty: 0,
      provenance: 'derived from the exact h (SI 2019): h/(2π)',
      tex: '\\hbar',
    });
    // CODATA 2022 gives ħ = 1.054 571 817... × 10⁻³⁴ J s: the digits given agree.
    expect(String(hbar.value)).toMatch(/^1\.054571817\d*e-34$/);
    // 50-digit reference h/(2π) with the exact h (SI Brochure, 9th ed., table 1): correctly rounded.
    const ref = new D('6.62607015e-34').div(D.acos(-1).mul(2));
    expect(ulpError(hbar.value, ref)).toBeLessThanOrEqual(0.5);
    // ħ is the same constant under its symbol.
    expect(CONSTANTS.find((k) => k.name === 'ħ')!.value).toBe(hbar.value);
  });

  it('evaluates in a sheet under both names, typeset as \\hbar', () => {
    const r = run('x = hbar_P to J*s', 'y = ħ to J*s', 'z = h_P / (2 pi) - hbar_P');
    expect(r.ok).toBe(true);
    expect(r.cells[0].statements[0].value?.number).toBe(CONSTANTS.find((k) => k.name === 'hbar_P')!.value);
    expect(r.cells[1].statements[0].value?.number).toBe(r.cells[0].statements[0].value?.number);
    expect(r.cells[0].statements[0].tex).toContain('\\hbar');
    expect(r.cells[1].statements[0].tex).toContain('\\hbar');
  });
});

describe('non-finite and complex results', () => {
  it('refuses ∞ from a division by zero, naming the divisor as written (issue 15: 1/(1 m - 1 m) gave ∞ m)', () => {
    // Common practice: 1 m − 1 m = 0 m, and x/0 has no finite value.
    expect(one('w_1 = 1/(1 m - 1 m)').error).toBe('division by zero: the divisor `1 m - 1 m` is zero');
    expect(one('1 m / 0').error).toBe('division by zero: the divisor `0` is zero');
    expect(one('0^-1').error).toBe('zero raised to a negative power (−1) is a division by zero: `0 ^ (-1)`');
  });

  it('refuses a complex length from the square root of a negative quantity (issue 15: sqrt(-4 m^2))', () => {
    // Common practice: (−4 m²)^(1/2) = 2i m has no real value.
    expect(one('L_1 = sqrt(-4 m^2)').error).toBe(
      'the square root of a negative quantity (−4 m²) is not real: `sqrt(-4 m^2)`',
    );
    expect(one('sqrt(-4)').error).toBe('the square root of a negative number (−4) is not real: `sqrt(-4)`');
    expect(one('x = (-8)^(1/3)').error).toMatch(
      /^a negative number \(−8\) raised to the non-integer power 0\.333\s?333 is not real: `\(-8\) \^ \(1 \/ 3\)`$/,
    );
    expect(one('x = log(-1)').error).toBe('the logarithm of a negative number (−1) is not real: `log(-1)`');
    expect(one('x = log(0)').error).toBe('the logarithm of zero is −∞: `log(0)`');
    expect(one('x = asin(2)').error).toBe("asin of 2 is outside the function's real domain: `asin(2)`");
    expect(one('x = 3 * i').error).toBe('`i` is the imaginary unit: a sheet computes real quantities');
  });

  it('refuses NaN and overflow', () => {
    // Common practice: 0/0 is undefined (NaN in IEEE 754); 1e308 × 10 exceeds the largest double, about 1.797 69 × 10³⁰⁸ (IEEE 754 binary64).
    expect(one('x = 0/0').error).toBe('division by zero: the divisor `0` is zero');
    expect(one('x = 2 * NaN').error).toBe('`NaN` is not a number (NaN)');
    expect(one('x = Infinity').error).toBe('`Infinity` is infinite');
    expect(one('x = 1e308 * 10').error).toBe(
      '`1e+308 * 10` overflows: its value (in SI units) is beyond the largest double-precision number, about 1.8 × 10³⁰⁸',
    );
    // A library result beyond the largest double (γ ≈ 707 times 10³⁰⁸ s): whichever layer catches
    // it (the library's adapter or this engine check), the statement is an error naming the call.
    const lib = one('t_2 = timeDilation(1e308 s, 0.999999)');
    expect(lib.value).toBeNull();
    expect(lib.error).toMatch(/timeDilation/);
    // Issue 15: electronWavelength(1e-305 V) gave NaN. The true value, h/√(2 m_e e V) ≈ 3.878 × 10¹⁴³ m
    // (nonrelativistic limit, common practice; h/√(2 m_e e · 1 V) = 1.226 43 nm, CODATA 2018 constants),
    // is finite, so it is given, in metres with a power of ten.
    const finite = one('l_2 = electronWavelength(1e-305 V)');
    expect(finite.error).toBeNull();
    expect(finite.value?.text).toBe('3.878\u202f30 × 10¹⁴³ m');
    // A function of the sheet that divides by zero: the call is named.
    const r = run('f(x) = 1/x', 'y_1 = f(0)');
    expect(r.cells[0].ok).toBe(true);
    expect(r.cells[1].error).toBe('`f(0)` is infinite');
  });

  it('refuses an element of a list, naming its position', () => {
    expect(one('v_1 = [1, 1/0]').error).toBe('element 2 of the list: division by zero: the divisor `0` is zero');
    expect(one('v_1 = [1 m, sqrt(-1 m^2)]').error).toBe(
      'element 2 of the list: the square root of a negative quantity (−1 m²) is not real: `sqrt(-1 m^2)`',
    );
    expect(one('v_1 = [[1, 2], [3, 0/0]]').error).toMatch(/^element 2, 2 of the list: /);
  });

  it('makes a definition’s dependents say what they depend on, and leaves the rest of the sheet alone', () => {
    const r = run('w_1 = 1/(1 m - 1 m)', 'y_1 = 2 * w_1', 'z_1 = 3 m');
    expect(r.cells[0].error).toBe('division by zero: the divisor `1 m - 1 m` is zero');
    expect(r.cells[1].error).toBe('depends on `w_1`, which is not available: it has an error in cell 1, line 1');
    expect(r.cells[2].ok).toBe(true);
  });

  it('leaves finite real values, booleans, criteria and functions as they were', () => {
    const r = run(
      'a_1 = 1/(2 m)',
      'b_1 = sqrt(4 m^2)',
      'c_1 = sqrt(4) > 5',
      'f(x) = 1/x',
      'd_1 = [1, 2] * 1 m',
      'p_1 = 1e308 * 1.5',
      'c_2 = 1 m < 2 m',
    );
    expect(r.ok).toBe(true);
    expect(r.cells[0].statements[0].value?.number).toBe(0.5);
    expect(r.cells[1].statements[0].value?.number).toBe(2);
    expect(r.cells[2].statements[0].value?.raw).toBe(false);
    expect(r.cells[5].statements[0].value?.number).toBe(1.5e308);
  });
});
