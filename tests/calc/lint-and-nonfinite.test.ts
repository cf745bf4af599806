// The physics lint (lib/calc/lint.ts), the reduced Planck constant, and the refusal of non-finite or
// complex results (issue 15: "Silent wrong answers to end").
// Expected numbers are the hand-checked arithmetic of the statements under test (common practice);
// a physical reference value names its source beside it.
import { describe, expect, it } from 'vitest';
import { CONSTANTS } from '../../lib/calc/constants';
import { SUSPECT_NAMES } from '../../lib/calc/lint';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';
import { D, ulpError } from './reference-math';

const engine = createSheetEngine();
const cells = (...sources: string[]): CellInput[] => sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
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
    expect(st.warnings).toEqual(['`hbar` here is the hectobar (a unit of pressure, 10⁷ Pa); the reduced Planck constant is `hbar_P` (or `ħ`)']);
    // And the suggestion is right: hbar_P c = 3.161 526 77… × 10⁻²⁶ J m (CODATA 2022: ħc = 197.326 980 4… MeV fm).
    const fixed = one('x = hbar_P * c to MeV*fm');
    expect(fixed.warnings).toEqual([]);
    expect(fixed.value!.number).toBeCloseTo(197.3269804, 6);
  });

  it('warns that `e` in e * 1 V is Euler’s number, and points at q_e', () => {
    const st = one('U_1 = e * 1 V');
    expect(st.value?.number).toBeCloseTo(Math.E, 12); // 2.718… V, evaluated as written
    expect(st.warnings).toEqual(['`e` here is Euler’s number 2.718…; the elementary charge is `q_e` (Euler’s number as the base of a power, `e^x`, is fine)']);
    // `E` is Euler's number too (mathjs), and cannot be a sheet's energy.
    // A number before `e` does not make it meant: `2 e` is twice Euler's number, not two charges.
    expect(one('Q_1 = 2 e').warnings).toHaveLength(1);
    expect(one('x = 2 * E').warnings![0]).toMatch(/^`E` here is Euler’s number 2\.718…; the elementary charge is `q_e`; a quantity of the sheet \(an energy\) needs a name of its own/);
  });

  it('warns that `g` is the gram, pointing at g_n, and that `kB` is the kilobyte, pointing at boltzmann', () => {
    expect(one('F_w = 70 kg * g').warnings).toEqual(['`g` here is the gram (a unit of mass); the standard acceleration of gravity is `g_n`']);
    expect(one('E_th = kB * 300 K').warnings).toEqual(['`kB` here is the kilobyte (a unit of information, 8000 bits); the Boltzmann constant is `boltzmann`']);
  });

  it('does not warn where the name is meant: after a number, e as the base of a power or of a logarithm, after `to`, a parameter', () => {
    for (const source of ['t_1 = 2 h', 't_2 = 2*h', 't_3 = -3*h + 20 min', 'y = e^2', 'y = e^(-0.5)', 'y = log(10, e)', 'm_1 = 2 kg to g', 'f(h) = h * 2', 'p_1 = 2 hbar', 'x = 5 g']) {
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
    for (const source of ['x = h_P * c / (500 nm)', 'x = hbar_P * c', 'x = ħ * c', 'x = q_e * 1 V', 'x = 70 kg * g_n']) expect(one(source).warnings, source).toEqual([]);
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

  it('points only at names the engine has: every suggested constant evaluates', () => {
    const suggested = [...SUSPECT_NAMES.values()].flatMap((s) => [...s.intended.matchAll(/`([^`]+)`/g)].map((m) => m[1])).filter((n) => !n.includes('^') && n !== 'E_k');
    expect(suggested).toEqual(expect.arrayContaining(['h_P', 'hbar_P', 'ħ', 'q_e', 'g_n', 'boltzmann', 'gravitationConstant', 'gasConstant']));
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
    expect(hbar).toMatchObject({ unit: 'J s', uncertainty: 0, provenance: 'derived from the exact h (SI 2019): h/(2π)', tex: '\\hbar' });
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
