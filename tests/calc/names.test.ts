// Names a sheet may use (lib/calc/names.ts, name-syntax.ts): Greek letters are letters, and a
// sheet's own definition of a built-in function's name takes precedence over the built-in for the
// whole sheet. Expected numbers are the hand-checked arithmetic of the statements (common practice);
// γ = 1/√(1 − 0.6²) = 1.25 exactly (special relativity, any textbook; e.g. Taylor & Wheeler,
// Spacetime Physics, 2nd ed., §1.10).
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { nameTex } from '../../lib/calc/tex';
import { extractUnitLiterals } from '../../lib/calc/unit-literals';
import type { CellInput } from '../../lib/calc/types';

const engine = createSheetEngine();
const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (...sources: string[]) => engine.evaluate(cells(...sources), { significantFigures: 6 });

describe('Greek names', () => {
  it('defines and uses γ, β, Δp and θ_1, with an uncertainty too', () => {
    const r = run('β = 0.6', 'γ = lorentzFactor(β)', 'Δp = 2 kg m/s * γ', 'θ_1 = 0.5 ± 0.01', 'y_1 = θ_1 * γ');
    expect(r.ok).toBe(true);
    expect(r.cells[1].statements[0].value).toMatchObject({ number: 1.25 });
    expect(r.cells[2].statements[0].value).toMatchObject({ number: 2.5 });
    expect(r.cells[4].statements[0].value).toMatchObject({ number: 0.625 });
    expect(r.cells[4].statements[0].uncertainty).toBeTruthy();
  });

  it('typesets Greek letters as their TeX control words', () => {
    expect(nameTex('γ')).toBe('\\gamma');
    expect(nameTex('β')).toBe('\\beta');
    expect(nameTex('Δp')).toBe('{\\Delta p}');
    expect(nameTex('θ_1')).toBe('\\theta_{\\mathrm{1}}');
    expect(nameTex('p_γ')).toBe('p_{\\gamma}');
    const r = run('γ = 2', 'E_1 = γ * 3 J');
    expect(r.cells[0].statements[0].tex).toBe('\\gamma = 2');
    expect(r.cells[1].statements[0].tex).toContain('\\gamma');
    expect(r.cells[1].statements[0].tex).not.toContain('γ');
  });

  it('refuses π (it reads as pi) and names of other scripts', () => {
    expect(run('π = 3').cells[0].error).toMatch(/`π` reads as the number pi/);
    expect(run('жx = 3').cells[0].error).toMatch(/names start with a letter \(Latin or Greek\)|cannot read/);
  });
});

describe("a sheet's definition takes precedence over a built-in function of that name", () => {
  it('defines gamma and beta (the reference page example gamma = lorentzFactor(0.6))', () => {
    const r = run('gamma = lorentzFactor(0.6)', 'beta = 0.6', 'E_2 = gamma * 2 J');
    expect(r.ok).toBe(true);
    expect(r.cells[0].statements[0].value).toMatchObject({ number: 1.25 });
    expect(r.cells[0].statements[0].tex).toBe('\\gamma = \\mathrm{lorentzFactor}\\left(0.6\\right)');
    expect(r.cells[2].statements[0].value).toMatchObject({ number: 2.5 });
  });

  it('a call gamma(5) after gamma = 1.25 is an error that says so, never the built-in Γ(5) = 24', () => {
    const r = run('gamma = 1.25', 'z_1 = gamma(5)', 'gamma(5)');
    expect(r.cells[0].ok).toBe(true);
    for (const c of [r.cells[1], r.cells[2]]) {
      expect(c.ok).toBe(false);
      expect(c.error).toMatch(/`gamma` is this sheet's own quantity \(defined in cell 1, line 1\), not a function/);
      expect(c.error).toMatch(/precedence over the built-in function gamma/);
    }
  });

  it('a use above the definition is "used before it is defined", not the built-in', () => {
    const r = run('z_2 = gamma(5)', 'gamma = 1.25');
    expect(r.cells[0].error).toMatch(/`gamma` is this sheet's own quantity|used before it is defined/);
    // Without the sheet's definition, the built-in: Γ(5) = 4! = 24 (common practice).
    expect(run('gamma(5)').cells[0].statements[0].value).toMatchObject({ number: 24 });
  });

  it('a sheet function named like a built-in is called, and its dependents follow it', () => {
    const r = run('sin(x) = 2 * x', 'y_2 = sin(3)');
    expect(r.cells[1].statements[0].value).toMatchObject({ number: 6 });
    expect(r.cells[1].uses).toContain('sin');
    const again = run('sin(x) = 3 * x', 'y_2 = sin(3)');
    expect(again.cells[1].statements[0].value).toMatchObject({ number: 9 });
  });

  it('calling any quantity is an error naming it', () => {
    const r = run('x = 3', 'x(2)');
    expect(r.cells[1].error).toMatch(/`x` is a quantity \(defined in cell 1, line 1\), not a function/);
  });

  it('statement forms and functions sheets may not reach stay refused as names', () => {
    expect(run('uncertain = 3').cells[0].error).toMatch(/statement form/);
    expect(run('sweep = 3').cells[0].error).toMatch(/statement form/);
    expect(run('import = 3').cells[0].error).toMatch(/reserved word/);
    expect(run('evaluate = 3').cells[0].error).toMatch(/reserved word/);
    expect(run('c = 3').cells[0].error).toMatch(/built-in constant/);
  });
});

describe('units joined by a space after a number (`1 T m`)', () => {
  it('reads 1 T m as the unit T·m', () => {
    expect(extractUnitLiterals('B_rho = 1 T m', (n) => n === 'T' || n === 'm').literals[0]).toMatchObject({
      unit: 'T*m',
      spacedNames: ['m'],
    });
    const r = run('B_rho = 1 T m');
    expect(r.cells[0].statements[0].value).toMatchObject({ number: 1, unit: 'T m' });
  });

  it('refuses it where the sheet also defines the name, saying how to write either reading', () => {
    for (const r of [run('B_rho = 1 T m', 'm = 2 kg'), run('m = 2 kg', 'B_rho = 1 T m')]) {
      const c = r.cells.find((x) => x.statements[0].source.startsWith('B_rho'))!;
      expect(c.error).toMatch(/`T m` after a number reads `m` as a unit, but this sheet also defines a quantity `m`/);
      expect(c.error).toMatch(/`T\*m`/);
      expect(c.error).not.toMatch(/used before it is defined/);
    }
    // The unambiguous spellings still work: T*m is the unit, `1 T * m` the product with the quantity.
    const r = run('m = 2 kg', 'x_1 = 1 T*m', 'x_2 = 1 T * m');
    expect(r.cells[1].statements[0].value).toMatchObject({ number: 1 });
    expect(r.cells[2].statements[0].value).toMatchObject({ number: 2 });
  });
});
